"""The hand-over files of a run: contacts.csv, shf_models.json, shf_table.csv, and the
schema_version of every JSON output.

The demo field is run once (no plots) through the public API; every number is checked
against the project file's values or the published equations written out here.
"""

from __future__ import annotations

import json
import tomllib
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from scipy import stats

import satheight
from satheight.handover import covariance, md_at_tvdss

G = 9.80665               # standard gravity [m/s2] (cgpm1901)
MILLIDARCY = 9.869233e-16  # 1 mD in m2 (nist2008)
DEMO = Path(__file__).resolve().parents[1] / "demo_wells"

#: Largest |Sw| error of the table interpolated linearly in height and in log10 k, at any
#: point of its span. Each permeability row has its entry height (where Sw leaves 1 with
#: a kink) as a node, so interpolation in height is exact there; between two rows the kink
#: costs at most (slope jump) x (row spacing)/4 = (lam/2)(1 - swirr) ln(10)/20/4 ~ 0.03 for
#: the demo's Brooks-Corey (lam 2.4), rows 20 a decade (piecewise-linear error, worked by hand).
TABLE_TOLERANCE = 0.035
#: ... and where both bracketing rows are above their entry heights (smooth), for 99 % of points.
SMOOTH_TOLERANCE = 0.005


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    report = satheight.run(satheight.demo_project(), out, plots=False)
    assert not report.failed
    return out


@pytest.fixture(scope="module")
def demo_toml():
    return tomllib.loads((DEMO / "demo_project.toml").read_text(encoding="utf-8"))


def _closed_form_sw(family: str, p: dict, j):
    """Sw of the published forms, written out here (not the package's code).

    power law: Sw = swirr + (1 - swirr) a J^-b (leverett1941 normalised form), at most 1;
    Brooks-Corey: Sw = swirr + (1 - swirr) (J/jd)^-lam for J >= jd, else 1 (brooks1964).
    """
    j = np.asarray(j, dtype=float)
    with np.errstate(divide="ignore", over="ignore"):
        if family == "power_law":
            sw = p["swirr"] + (1 - p["swirr"]) * p["a"] * j ** (-p["b"])
        elif family == "brooks_corey":
            sw = np.where(j >= p["jd"], p["swirr"] + (1 - p["swirr"]) * (j / p["jd"]) ** (-p["lam"]), 1.0)
        else:
            raise AssertionError(f"no closed form written for {family}")
    return np.clip(np.where(j > 0, sw, 1.0), 0.0, 1.0)


def _closed_form_j(h_m, k_md, phi, zone: dict):
    """J = (rho_w - rho_hc) g h sqrt(k/phi) / (sigma cos theta), SI (leverett1941)."""
    drho = zone["water_density"] - zone["hydrocarbon_density"]       # kg/m3 in a metric project
    return drho * G * h_m * np.sqrt(k_md * MILLIDARCY / phi) / (zone["sigma_cos_theta_mN_per_m"] * 1e-3)


def _table(demo_run):
    t = pd.read_csv(demo_run / "shf_table.csv")
    models = json.loads((demo_run / "shf_models.json").read_text(encoding="utf-8"))
    return t, models


def test_shf_table_nodes_follow_the_published_equations(demo_run):
    t, models = _table(demo_run)
    assert set(t["zone"]) == {"Upper Sand", "Lower Sand"}
    for (zone, rock), g in t.groupby(["zone", "rock_type"]):
        z = models["zones"][zone]
        m = z["rock_types"][rock]
        phi = g["porosity [frac]"].to_numpy()
        # the stated porosity of the zone is the one tabulated
        assert np.allclose(phi, z["table_porosity"], rtol=0, atol=1e-12)
        j = _closed_form_j(g["height above FWL [m]"].to_numpy(), g["permeability [mD]"].to_numpy(),
                           phi, z)
        # closed form (leverett1941); table J written to 7 significant digits
        assert np.allclose(g["J [-]"], j, rtol=2e-6, atol=1e-12)
        sw = _closed_form_sw(m["family"], m["params"], j)
        # closed form (leverett1941, brooks1964); table Sw written to 6 decimals
        assert np.max(np.abs(g["SW [frac]"].to_numpy() - sw)) < 2e-6


def _interpolate(g: pd.DataFrame, h, k):
    """Linear in height within each permeability row, then linear in log10 k."""
    ks = np.sort(g["permeability [mD]"].unique())
    rows = [g[g["permeability [mD]"] == kk].sort_values("height above FWL [m]") for kk in ks]
    at_h = np.array([np.interp(h, r["height above FWL [m]"], r["SW [frac]"]) for r in rows])
    i = np.clip(np.searchsorted(np.log10(ks), np.log10(k)) - 1, 0, ks.size - 2)
    w = (np.log10(k) - np.log10(ks[i])) / (np.log10(ks[i + 1]) - np.log10(ks[i]))
    cols = np.arange(h.size)
    return (1 - w) * at_h[i, cols] + w * at_h[i + 1, cols]


def test_shf_table_interpolation_reproduces_the_model(demo_run):
    t, models = _table(demo_run)
    rng = np.random.default_rng(7)
    for (zone, rock), g in t.groupby(["zone", "rock_type"]):
        z = models["zones"][zone]
        m = z["rock_types"][rock]
        h = rng.uniform(0.0, g["height above FWL [m]"].max(), 4000)
        k = 10 ** rng.uniform(np.log10(g["permeability [mD]"].min()),
                              np.log10(g["permeability [mD]"].max()), 4000)
        exact = _closed_form_sw(m["family"], m["params"], _closed_form_j(h, k, z["table_porosity"], z))
        err = np.abs(_interpolate(g, h, k) - exact)
        # closed form (leverett1941, brooks1964) against the table: the stated tolerances
        assert err.max() < TABLE_TOLERANCE, (zone, err.max())
        ks = np.sort(g["permeability [mD]"].unique())
        i = np.clip(np.searchsorted(ks, k) - 1, 0, ks.size - 2)
        phi = z["table_porosity"]
        below = [_closed_form_sw(m["family"], m["params"], _closed_form_j(h, kk, phi, z))
                 for kk in (ks[i], ks[i + 1])]
        smooth = (below[0] < 1.0) & (below[1] < 1.0)
        assert smooth.sum() > 1000
        assert np.quantile(err[smooth], 0.99) < SMOOTH_TOLERANCE, (zone, np.quantile(err[smooth], 0.99))


def test_shf_models_carry_model_file_covariance(demo_run):
    _, models = _table(demo_run)
    core = json.loads((DEMO / "core_models.json").read_text(encoding="utf-8"))
    assert models["schema_version"] == 1
    for zone, z in models["zones"].items():
        for rock, m in z["rock_types"].items():
            fit = core["rock_types"][rock]["fits"][m["family"]]
            names = list(fit["params"])
            assert m["params"] == fit["params"] and m["stderr"] == fit["stderr"]
            cov = np.array(m["covariance"])
            # the hand-over file carries the fit's own covariance as the model file stores it
            assert m["covariance"] == fit["covariance"]
            s = np.array([fit["stderr"][n] for n in names])
            # definition of the correlation coefficient: C_ij = r_ij s_i s_j (common practice),
            # within the rounding of the stored standard errors and correlations (two
            # significant digits: up to 5 % on s, so about 10 % on s^2; worked by hand)
            scale = np.sqrt(np.outer(np.diag(cov), np.diag(cov)))
            assert np.allclose(np.diag(cov), s ** 2, rtol=0.11)
            assert np.all(np.abs(cov - np.array(fit["correlation"]) * np.outer(s, s))
                          <= 0.12 * scale)
            assert np.array_equal(cov, cov.T)
            # a covariance matrix is positive semi-definite (common practice)
            assert np.linalg.eigvalsh(cov).min() > -1e-12 * np.abs(cov).max()


def test_covariance_from_stderr_and_correlation():
    """s = (2, 3), r12 = 0.5: C = [[4, 3], [3, 9]] (worked by hand)."""
    assert np.allclose(covariance([2.0, 3.0], [[1.0, 0.5], [0.5, 1.0]]), [[4, 3], [3, 9]])


def test_contacts_csv_lists_given_fwl_and_model_contacts(demo_run, demo_toml):
    c = pd.read_csv(demo_run / "contacts.csv")
    # README (hand-over files): the documented columns, in the project's length unit
    assert list(c.columns) == ["well", "marker", "zone", "kind", "MD [m]", "TVDSS [m]",
                               "TVDSS low [m]", "TVDSS high [m]", "interval level [frac]",
                               "interval meaning", "source"]
    fwl = {z["name"]: float(z["fwl"].split()[0]) for z in demo_toml["zones"]}   # "2105 m"
    kinds = {"oil": "OWC", "gas": "GWC"}
    for z in demo_toml["zones"]:
        rows = c[c["zone"] == z["name"]]
        f = rows[rows["kind"] == "FWL"]
        assert len(f) == 5 and (f["source"] == "project file").all()
        # the project file's FWL (demo_project.toml)
        assert np.allclose(f["TVDSS [m]"], fwl[z["name"]], atol=1e-9)
        # its Monte Carlo FWL is normal with sd "3 m" (demo_project.toml): P10 and P90 are
        # fwl -+ 3 m x norm.ppf(0.9) (scipy.stats, reference library)
        sd = float(z["uncertainty"]["fwl"]["sd"].split()[0])
        q = stats.norm.ppf(0.9) * sd
        assert np.allclose(f["TVDSS low [m]"], fwl[z["name"]] - q, atol=1e-9)
        assert np.allclose(f["TVDSS high [m]"], fwl[z["name"]] + q, atol=1e-9)
        assert (f["interval level [frac]"] == 0.8).all()
        assert f["interval meaning"].str.startswith("P10 to P90 of the project's Monte Carlo "
                                                    "FWL distribution (normal)").all()
        oc = rows[rows["kind"] == kinds[z["hydrocarbon"]]]
        assert len(oc) == 5
        # a contact lies above its FWL by the entry height: a few metres in this field
        # (common practice; the demo's entry heights are 5-10 m)
        assert ((oc["TVDSS [m]"] < fwl[z["name"]]) & (oc["TVDSS [m]"] > fwl[z["name"]] - 30)).all()
        # no stated uncertainty for a contact from the entry height: no interval
        assert oc[["TVDSS low [m]", "TVDSS high [m]", "interval level [frac]"]].isna().all().all()
    # VANTREL-4 is vertical with datum_elevation = "31.2 m" in the project file: MD = TVDSS + 31.2
    v4 = c[c["well"] == "VANTREL-4"]
    assert np.allclose(v4["MD [m]"], v4["TVDSS [m]"] + 31.2, atol=1e-6)
    # VANTREL-5 is deviated: its MD exceeds TVDSS + datum by more than a vertical well's would
    v5 = c[c["well"] == "VANTREL-5"]
    assert (v5["MD [m]"] - v5["TVDSS [m]"] > 100).all()


def test_md_at_tvdss_takes_the_first_crossing():
    """A path down to 1000 m TVDSS at MD 1000, then back up (a well that turns up):
    MD = [0, 500, 1000, 1500], TVDSS = [0, 500, 1000, 500]. Level 750 is reached first at
    MD 750 (and again at MD 1250); level 1000 exactly at MD 1000; level 1200 never (worked
    by hand)."""
    md = np.array([0.0, 500.0, 1000.0, 1500.0])
    tv = np.array([0.0, 500.0, 1000.0, 500.0])
    assert md_at_tvdss(md, tv, 750.0) == pytest.approx(750.0)
    assert md_at_tvdss(md, tv, 1000.0) == pytest.approx(1000.0)
    assert md_at_tvdss(md, tv, 1200.0) is None
    # NaN samples are skipped: the bracket is then (500, 1000)
    assert md_at_tvdss(np.r_[md, 1600.0], np.r_[tv, np.nan], 600.0) == pytest.approx(600.0)


def test_every_run_json_output_carries_schema_version(demo_run):
    for f in sorted(demo_run.glob("*.json")):
        doc = json.loads(f.read_text(encoding="utf-8"))
        # README (outputs): every JSON output carries schema_version
        assert doc.get("schema_version") == 1, f.name


def test_fwl_pressures_and_fit_json_carry_schema_version(tmp_path):
    from satheight.cli import main

    assert main(["pressures", str(DEMO / "demo_pressures.csv"), "--project",
                 str(DEMO / "demo_project.toml"), "--no-logs", "--no-plots",
                 "--out", str(tmp_path / "p")]) == 0
    assert main(["fit", str(DEMO / "core_plugs.csv"), str(DEMO / "core_pc_steps.csv"),
                 "--no-plots", "--family", "power_law", "--out", str(tmp_path / "f")]) == 0
    for f in [*(tmp_path / "p").glob("*.json"), *(tmp_path / "f").glob("*.json")]:
        # README (outputs): every JSON output carries schema_version
        assert json.loads(f.read_text(encoding="utf-8")).get("schema_version") == 1, f.name


def test_contact_rows_of_a_gas_cap_zone_list_the_free_oil_level():
    """A zone with a gas cap over its oil leg: FWL 2100 m, free-oil level 2050 m (given),
    oil-water contact 2095 m (entry height 5 m): three rows, in that order (known truth)."""
    from satheight.workflows.handover import contact_rows

    summary = {"well": "W", "zones": {"Z": {"hydrocarbon": "oil", "contact": {
        "fwl_tvdss": 2100.0, "fwl_md": 2130.0, "gas_oil_level_tvdss": 2050.0,
        "gas_oil_level_md": 2080.0, "contact_tvdss": 2095.0, "contact_md": None}}}}
    rows = contact_rows([summary])
    assert [(r["kind"], r["tvdss"], r["md"]) for r in rows] == [
        ("FWL", 2100.0, 2130.0), ("FOL", 2050.0, 2080.0), ("OWC", 2095.0, None)]
