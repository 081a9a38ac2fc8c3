"""The public Python surface (``import satheight``): what it offers, the frames it returns
and the figures, checked against the demo project file's values and closed forms."""

from __future__ import annotations

import json
import tomllib
import warnings
from pathlib import Path

import numpy as np
import pytest
from matplotlib.figure import Figure

import satheight

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"
G = 9.80665               # standard gravity [m/s2] (cgpm1901)
MILLIDARCY = 9.869233e-16  # 1 mD in m2 (nist2008)


@pytest.fixture(scope="module")
def project():
    return satheight.demo_project()


@pytest.fixture(scope="module")
def vantrel4(project):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return satheight.run_well(project, "VANTREL-4")


def test_public_surface_names_exist_and_version_matches_pyproject():
    missing = [n for n in satheight.__all__ if not hasattr(satheight, n)]
    assert missing == []
    meta = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    # the package's version is the one pyproject.toml declares
    assert satheight.__version__ == meta["project"]["version"]


def test_result_frame_is_indexed_by_md_with_tvdss_hafwl_j_and_sw(vantrel4):
    """VANTREL-4 is vertical with datum_elevation = "31.2 m" (demo_project.toml), so
    TVDSS = MD - 31.2; in the Upper Sand (2030-2120 m TVDSS, FWL 2105 m, water 1.08 and oil
    0.78 g/cm3, sigma cos theta 26 mN/m): HAFWL = 2105 - TVDSS,
    J = (1080 - 780) g HAFWL sqrt(k/phi) / 0.026 (leverett1941) and
    Sw = swirr + (1 - swirr) a J^-b with core_models.json's power-law parameters."""
    f = vantrel4.frame()
    assert f.index.name == "MD" and f.attrs["units"]["MD"] == "m"
    for col in ("TVDSS", "HAFWL", "J", "SW_SHM", "PHIE", "PERM"):
        assert col in f.columns
    assert np.allclose(f["TVDSS"], f.index.to_numpy() - 31.2, atol=1e-9)
    up = f[(f["TVDSS"] >= 2030) & (f["TVDSS"] < 2120)].dropna(subset=["SW_SHM"])
    assert len(up) > 100
    assert np.allclose(up["HAFWL"], 2105 - up["TVDSS"], atol=1e-9)
    phi = up["PHIE"].to_numpy()          # v/v in this file
    k = up["PERM"].to_numpy() * MILLIDARCY
    h = np.clip(up["HAFWL"].to_numpy(), 0, None)
    j = (1080 - 780) * G * h * np.sqrt(k / phi) / 0.026
    assert np.allclose(up["J"], j, rtol=1e-6)
    p = json.loads((DEMO / "core_models.json").read_text(encoding="utf-8"))
    p = p["rock_types"]["Upper Sand"]["fits"]["power_law"]["params"]
    with np.errstate(divide="ignore"):
        sw = np.clip(p["swirr"] + (1 - p["swirr"]) * p["a"] * j ** -p["b"], 0, 1)
    sw = np.where(j > 0, sw, 1.0)
    assert np.allclose(up["SW_SHM"], sw, atol=1e-9)


def test_well_summary_holds_zones_and_contacts(vantrel4):
    z = vantrel4.summary["zones"]["Upper Sand"]
    # demo_project.toml: fwl = "2105 m"
    assert z["fwl_tvdss"] == pytest.approx(2105.0)
    assert z["contact"]["contact_tvdss"] < 2105.0


def test_figures_are_matplotlib_figures(project, vantrel4):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        other = satheight.run_well(project, "VANTREL-1")
    assert isinstance(vantrel4.track_plot(), Figure)
    figs = satheight.crossplots([vantrel4, other])
    assert set(figs) == {"Upper Sand", "Lower Sand"}
    assert all(isinstance(f, Figure) for f in figs.values())
    assert isinstance(satheight.section_plot([vantrel4, other]), Figure)


def test_unknown_well_is_one_clear_error_listing_the_wells(project):
    with pytest.raises(satheight.SatHeightError) as exc:
        satheight.run_well(project, "NO-SUCH-WELL")
    # README (Bad input): the error names the wells there are
    assert "VANTREL-1" in str(exc.value) and "NO-SUCH-WELL" in str(exc.value)


def test_a_project_built_in_code_runs_well_by_well_but_not_into_a_folder(tmp_path):
    data = tomllib.loads((DEMO / "demo_project.toml").read_text(encoding="utf-8"))
    data["project"].pop("tops_file")
    data["wells"] = [w for w in data["wells"] if w["las"] == "VANTREL-1.las"]
    proj = satheight.project_from_dict(data, folder=DEMO)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        w = satheight.run_well(proj, "VANTREL-1")
    assert np.isfinite(w.frame()["SW_SHM"]).sum() > 100
    with pytest.raises(satheight.SatHeightError, match="built in code"):
        satheight.run(proj, tmp_path / "out")
    assert not (tmp_path / "out").exists()


def test_quantity_reads_text_with_units():
    # 0.45 psi/ft as a density: 0.45 * 6894.757 Pa / 0.3048 m / 9.80665 m/s2 (nist2008, cgpm1901)
    assert satheight.quantity("0.45 psi/ft", "density") == pytest.approx(
        0.45 * 6894.757293 / 0.3048 / 9.80665, rel=1e-6)
    assert satheight.quantity("6529 ft", "length") == pytest.approx(6529 * 0.3048)   # nist2008
    with pytest.raises(satheight.SatHeightError):
        satheight.quantity("two metres", "length")


def test_fit_core_gives_scikit_learn_estimators(tmp_path):
    sklearn_base = pytest.importorskip("sklearn.base")
    core = satheight.fit_core([DEMO / "core_plugs.csv", DEMO / "core_pc_steps.csv"],
                              tmp_path / "fit", families=["power_law", "brooks_corey"],
                              plots=False)
    assert core.model_file.is_file()
    for rock, family in core.selected.items():
        fn = core.models[rock][family]
        assert isinstance(fn, satheight.JSwFunction) and fn.is_fitted()
        # scikit-learn's estimator convention: clone gives an unfitted copy of the same settings
        copy = sklearn_base.clone(fn)
        assert not copy.is_fitted() and copy.get_params() == fn.get_params()
        # Sw = 1 at J = 0 (at the FWL) for every family (leverett1941, common practice)
        assert fn.predict(np.array([0.0]))[0] == 1.0
