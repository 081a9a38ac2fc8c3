"""Densities derived from pressure lines are checked: a water line lighter than the oil line
has no FWL (refused), a gradient that fits no phase (another pressure unit) is flagged in the
summary JSON and printed. Densities worked by hand: rho = gradient / g, g = 9.80665 m/s2
(nist2008)."""

from __future__ import annotations

import json

from satheight.cli import main

G = 9.80665


def _write(path, lines: dict, unit: str = "kPa", scatter: float = 1.0) -> None:
    """Points (TVDSS [m], pressure) on straight lines: {fluid: (gradient, p at 2000 m, depths)}."""
    rows = ["well,tvdss [m],pressure [" + unit + "],fluid,zone"]
    for fluid, (grad, p0, depths) in lines.items():
        # a small fixed scatter so the fit has a standard error
        rows += [f"W,{z},{p0 + grad * (z - 2000) + scatter * e:.4f},{fluid},S"
                 for z, e in zip(depths, (0.3, -0.2, 0.1, -0.3, 0.2))]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")


def test_water_line_lighter_than_oil_line_has_no_fwl(tmp_path, capsys):
    csv = tmp_path / "p.csv"
    # water 7.0 kPa/m (714 kg/m3) and oil 9.5 kPa/m (969 kg/m3): labels swapped
    _write(csv, {"water": (7.0, 20000.0, [2050, 2060, 2070, 2080, 2090]),
                 "oil": (9.5, 20000.0, [1950, 1960, 1970, 1980, 1990])})
    assert main(["pressures", str(csv), "--no-plots", "--out", str(tmp_path / "o")]) == 0
    printed = capsys.readouterr().out
    doc = json.loads((tmp_path / "o" / "pressures_summary.json").read_text(encoding="utf-8"))
    z = doc["zones"]["S"]
    assert z["fwl"] is None                                   # refused, not a level
    assert any("not denser" in p for p in z["implausible"])
    assert "IMPLAUSIBLE" in printed and "no FWL" in printed


def test_gradient_in_another_pressure_unit_is_flagged(tmp_path, capsys):
    csv = tmp_path / "p.csv"
    # 0.433 and 0.33 "bar/m" are 43.3 and 33 kPa/m: 4415 and 3365 kg/m3, no phase fits
    # (they are psi/ft numbers: water about 1000 kg/m3 and oil about 760 kg/m3 in psi/ft)
    _write(csv, {"water": (0.433, 300.0, [2050, 2060, 2070, 2080, 2090]),
                 "oil": (0.33, 300.0, [1950, 1960, 1970, 1980, 1990])}, unit="bar", scatter=0.01)
    assert main(["pressures", str(csv), "--no-plots", "--out", str(tmp_path / "o")]) == 0
    printed = capsys.readouterr().out
    doc = json.loads((tmp_path / "o" / "pressures_summary.json").read_text(encoding="utf-8"))
    problems = doc["zones"]["S"]["implausible"]
    assert any("water" in p and "no phase fits" in p for p in problems)
    assert any("oil" in p and "no phase fits" in p for p in problems)
    assert printed.count("IMPLAUSIBLE") == 2
    # the densities themselves, by hand: 0.433 bar/m = 43300 Pa/m, / g
    assert abs(doc["zones"]["S"]["lines"]["water"]["density_g_cm3"] - 43300 / G / 1000) < 1e-3


def test_plausible_lines_are_not_flagged(tmp_path, capsys):
    csv = tmp_path / "p.csv"
    # water 10.3 kPa/m (1050 kg/m3), oil 7.8 kPa/m (795 kg/m3): common practice ranges
    _write(csv, {"water": (10.3, 20000.0, [2050, 2060, 2070, 2080, 2090]),
                 "oil": (7.8, 20000.0, [1950, 1960, 1970, 1980, 1990])})
    assert main(["pressures", str(csv), "--no-plots", "--out", str(tmp_path / "o")]) == 0
    doc = json.loads((tmp_path / "o" / "pressures_summary.json").read_text(encoding="utf-8"))
    assert doc["zones"]["S"]["implausible"] == []
    # the lines meet where they were made to: both pass 20000 kPa at 2000 m
    assert abs(doc["zones"]["S"]["fwl"]["depth"] - 2000.0) < 0.5
    printed = capsys.readouterr().out
    assert "IMPLAUSIBLE" not in printed
    # metric printout: densities in kg/m3 to 1 (10300 / 9.80665 = 1050.3; 7800 / g = 795.4)
    assert "density 1050 +- " in printed and "density 795 +- " in printed


def test_zone_option_not_needed_when_the_project_has_one_zone(tmp_path):
    from tiny_field import make_field

    project = make_field(tmp_path / "f", wells=(("w0.las", "W0"),))
    csv = tmp_path / "p.csv"
    # water 10.3 kPa/m, oil 7.8 kPa/m meeting at 1000 m TVDSS (in the tiny field's zone S)
    rows = ["well,tvdss [m],pressure [kPa],fluid"]
    rows += [f"W0,{z},{10000 + 10.3 * (z - 1000) + e:.3f},water"
             for z, e in zip((1010, 1020, 1030, 1040), (0.3, -0.2, 0.1, -0.3))]
    rows += [f"W0,{z},{10000 + 7.8 * (z - 1000) + e:.3f},oil"
             for z, e in zip((960, 970, 980, 990), (0.2, -0.1, 0.3, -0.2))]
    csv.write_text("\n".join(rows) + "\n", encoding="utf-8")
    assert main(["pressures", str(csv), "--project", str(project), "--no-plots", "--no-logs",
                 "--out", str(tmp_path / "o")]) == 0
    doc = json.loads((tmp_path / "o" / "pressures_summary.json").read_text(encoding="utf-8"))
    assert list(doc["zones"]) == ["S"]
    assert abs(doc["zones"]["S"]["fwl"]["depth"] - 1000.0) < 0.5   # where the lines were made to meet
    assert doc["zones"]["S"]["project_fwl"] == 1000.0              # tiny field's fwl = "1000 m"


def test_line_densities_of_a_field_summary_are_in_g_per_cm3(tmp_path):
    import re

    csv = tmp_path / "p.csv"
    # the swapped labels above: water 7.0 kPa/m, oil 9.5 kPa/m; with --units field the
    # messages give the densities in g/cm3: 7000 / g / 1000 = 0.713801 and 9500 / g / 1000 =
    # 0.968730 g/cm3 (g = 9.80665 m/s2, 1 g/cm3 = 1000 kg/m3, nist2008)
    _write(csv, {"water": (7.0, 20000.0, [2050, 2060, 2070, 2080, 2090]),
                 "oil": (9.5, 20000.0, [1950, 1960, 1970, 1980, 1990])})
    assert main(["pressures", str(csv), "--no-plots", "--units", "field",
                 "--out", str(tmp_path / "o")]) == 0
    doc = json.loads((tmp_path / "o" / "pressures_summary.json").read_text(encoding="utf-8"))
    z = doc["zones"]["S"]
    text = " ".join(z["implausible"] + z["notes"])
    assert "kg/m3" not in text
    order = next(p for p in z["implausible"] if "not denser" in p)
    water, oil = (float(x) for x in re.findall(r"\(([\d.]+) g/cm3\)", order))
    # the fitted lines carry the points' scatter: to 0.5 % of the density
    assert abs(water - 7000 / G / 1000) < 0.005 * water
    assert abs(oil - 9500 / G / 1000) < 0.005 * oil
    # each value in the messages is the summary's own density of that line
    assert abs(water - z["lines"]["water"]["density_g_cm3"]) < 1e-5
