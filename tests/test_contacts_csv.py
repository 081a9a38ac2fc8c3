"""contacts.csv of the ``fwl`` and ``pressures`` commands: the same columns as the run's
(README, hand-over files), values equal to the command's own JSON summary (this checks the
writer; the FWL numbers themselves are checked against outside references in
test_contacts.py and test_pressures.py), the file in the manifest, text cells made safe."""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pandas as pd

from satheight.cli import main
from satheight.workflows.handover import write_contacts

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
PROJECT = str(DEMO / "demo_project.toml")
FT = 0.3048          # international foot [m] (nist2008)


def _columns(u: str) -> list[str]:
    # README (hand-over files, contacts.csv): the documented columns
    return ["well", "marker", "zone", "kind", f"MD [{u}]", f"TVDSS [{u}]", f"TVDSS low [{u}]",
            f"TVDSS high [{u}]", "interval level [frac]", "interval meaning", "source"]


def _manifest(folder: Path, command: str) -> str:
    return (folder / f"satheight-manifest-{command}.sha256").read_text(encoding="utf-8")


def test_fwl_command_contacts_equal_its_json_summary(tmp_path):
    out = tmp_path / "fwl"
    assert main(["fwl", PROJECT, "--zone", "Lower Sand", "--resamples", "40", "--no-plots",
                 "--out", str(out)]) == 0
    d = json.loads((out / "fwl_Lower_Sand.json").read_text(encoding="utf-8"))
    c = pd.read_csv(out / "contacts.csv")
    assert list(c.columns) == _columns("m")
    assert len(c) == 1
    r = c.iloc[0]
    assert (r["zone"], r["kind"], r["marker"]) == ("Lower Sand", "FWL", "Lower Sand FWL")
    # one level for the zone: no well, no MD (empty cells)
    assert pd.isna(r["well"]) and pd.isna(r["MD [m]"])
    # the numbers of fwl_Lower_Sand.json (written with full precision: equal to 1e-12)
    assert np.isclose(r["TVDSS [m]"], d["best_fwl"], rtol=1e-12)
    assert np.allclose([r["TVDSS low [m]"], r["TVDSS high [m]"]], d["interval"], rtol=1e-12)
    assert r["interval level [frac]"] == d["confidence_level"]
    assert "bootstrap" in r["interval meaning"] and r["source"].startswith("FWL search from log Sw")
    assert "contacts.csv" in _manifest(out, "fwl")


def _pressures(out: Path, *extra: str) -> tuple[dict, pd.DataFrame]:
    assert main(["pressures", str(DEMO / "demo_pressures.csv"), "--project", PROJECT,
                 "--no-plots", "--out", str(out), *extra]) == 0
    doc = json.loads((out / "pressures_summary.json").read_text(encoding="utf-8"))
    return doc, pd.read_csv(out / "contacts.csv")


def test_pressures_command_contacts_equal_its_json_summary(tmp_path):
    doc, c = _pressures(tmp_path / "p")
    assert list(c.columns) == _columns("m")
    assert "contacts.csv" in _manifest(tmp_path / "p", "pressures")
    n = 0
    for zone, z in doc["zones"].items():
        rows = c[c["zone"] == zone]
        want = [("pressure gradients", z["fwl"]["depth"], z["fwl"]["interval"],
                 z["fwl"]["confidence_level"]),
                ("FWL search from log Sw", z["log_fwl"]["best"], z["log_fwl"]["interval"],
                 z["log_fwl"]["confidence_level"])]
        for source, depth, interval, level in want:
            r = rows[rows["source"].str.startswith(source) & (rows["kind"] == "FWL")]
            assert len(r) == 1, (zone, source)
            r = r.iloc[0]
            assert np.isclose(r["TVDSS [m]"], depth, rtol=1e-12)
            assert np.allclose([r["TVDSS low [m]"], r["TVDSS high [m]"]], interval, rtol=1e-12)
            assert r["interval level [frac]"] == level == 0.95
            n += 1
        # the pressure FWL's interval is a Student t interval (pressures.intersect)
        fr = rows[rows["source"].str.startswith("pressure gradients")].iloc[0]
        assert "Student t" in fr["interval meaning"]
        # a free-oil level when the summary has one
        assert (rows["kind"] == "FOL").sum() == (z["free_oil_level"] is not None)
    assert n == 2 * len(doc["zones"]) and len(c) == n + sum(
        z["free_oil_level"] is not None for z in doc["zones"].values())


def test_pressures_contacts_in_feet_are_the_metre_values_over_0_3048(tmp_path):
    _, m = _pressures(tmp_path / "m")
    doc, f = _pressures(tmp_path / "f", "--units", "field")
    assert list(f.columns) == _columns("ft")
    # 1 ft = 0.3048 m exactly (nist2008); the same rows in the same order
    assert list(m["marker"]) == list(f["marker"])
    for col in ("TVDSS", "TVDSS low", "TVDSS high"):
        assert np.allclose(f[f"{col} [ft]"], m[f"{col} [m]"] / FT, rtol=1e-9)
    zone = next(iter(doc["zones"]))
    assert np.isclose(f[f["zone"] == zone]["TVDSS [ft]"].iloc[0],
                      doc["zones"][zone]["fwl"]["depth"], rtol=1e-12)


def test_zone_names_from_inputs_are_made_safe_in_contacts(tmp_path):
    # a zone name that would start a spreadsheet formula, with a line break and a tab in it:
    # one line per row, the formula start quoted (common practice against formula injection)
    rows = [{"well": "", "zone": "=HYPERLINK(1)\n\tZ", "kind": "FWL", "md": None,
             "tvdss": 2000.0, "low": None, "high": None, "level": None, "meaning": "",
             "source": "test"}]
    p = write_contacts(rows, tmp_path / "contacts.csv", "m")
    lines = p.read_text(encoding="utf-8").splitlines()
    assert len(lines) == 2
    c = pd.read_csv(p)
    assert c["zone"].iloc[0] == "'=HYPERLINK(1) Z"
    assert c["marker"].iloc[0] == "'=HYPERLINK(1) Z FWL"
