"""Done-criterion of the deviated-well work: a deviated well with a survey and tops gives the
same Sw profile in TVDSS as a vertical well through the same rock.

Both wells are made here from one rock model that depends on TVDSS only (a flat
layer-cake). The deviated well's path is a build-and-hold whose TVD and offsets are written
in closed form (circle and straight line, computed), independent of the package's
minimum-curvature code.
"""

import math

import lasio
import numpy as np
import pytest

from satheight.workflows.run import run_project
from satheight.workflows.well import compute_well
from satheight.project import load_project

KOP, BUILD, HOLD_DEG, AZI_DEG = 500.0, math.radians(3.0) / 30.0, 40.0, 120.0  # 3 deg / 30 m
R = 1.0 / BUILD
EOB = KOP + math.radians(HOLD_DEG) / BUILD
ELEV_DEV, ELEV_VERT = 27.0, 31.5
ZONE_TOP, ZONE_BASE, FWL = 1950.0, 2080.0, 2060.0


def path_closed_form(md):
    """TVD and horizontal displacement [m] of the build-and-hold (circle geometry, computed)."""
    md = np.asarray(md, float)
    th = np.clip((md - KOP) * BUILD, 0.0, math.radians(HOLD_DEG))
    tvd_arc = KOP + R * np.sin(th)
    hd_arc = R * (1 - np.cos(th))
    past = np.clip(md - EOB, 0.0, None)
    tvd = np.where(md <= KOP, md, tvd_arc + past * math.cos(math.radians(HOLD_DEG)))
    hd = np.where(md <= KOP, 0.0, hd_arc + past * math.sin(math.radians(HOLD_DEG)))
    return tvd, hd


def md_at_tvd(tvd):
    """MD [m] of the hold section at a TVD [m] (inverse of the straight part, computed)."""
    tvd_eob = KOP + R * math.sin(math.radians(HOLD_DEG))
    return EOB + (tvd - tvd_eob) / math.cos(math.radians(HOLD_DEG))


def rock(tvdss):
    """Porosity [fraction] and permeability [mD] as functions of TVDSS only (invented)."""
    phi = 0.18 + 0.06 * np.sin(2 * np.pi * tvdss / 7.3)
    return np.round(phi, 6), np.round(10 ** (-2.6 + 19.0 * phi), 6)


def las_text(name, md, phi, k, elev):
    rows = "\n".join(f"{d:.6f} {p:.6f} {q:.6f}" for d, p, q in zip(md, phi, k))
    return f"""~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M {md[0]:.6f} :
STOP.M {md[-1]:.6f} :
STEP.M 0 :
NULL. -999.25 :
WELL. {name} :
EKB .M {elev} : kelly bushing elevation
~Curve
DEPT.M : measured depth
PHIE.V/V : porosity
PERM.MD : permeability
~A
{rows}
"""


PROJECT = """
[project]
units = "metric"
{tops}

[[wells]]
las = "vert.las"

[[wells]]
las = "dev.las"
{survey}

[[zones]]
name = "Sand"
top = "{top} m"
base = "{base} m"
fwl = "{fwl} m"
hydrocarbon = "oil"
water_density = "1.07 g/cm3"
hydrocarbon_density = "0.80 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
"""


@pytest.fixture(scope="module")
def field(tmp_path_factory):
    d = tmp_path_factory.mktemp("deviated")
    md_dev = np.round(np.arange(2250.0, 2580.0, 0.1524), 6)
    tvd_dev, _ = path_closed_form(md_dev)
    tvdss = tvd_dev - ELEV_DEV
    phi, k = rock(tvdss)
    (d / "dev.las").write_text(las_text("DEV-1", md_dev, phi, k, ELEV_DEV))
    md_vert = np.round(tvdss + ELEV_VERT, 6)   # the vertical twin samples the same TVDSS
    (d / "vert.las").write_text(las_text("VERT-1", md_vert, phi, k, ELEV_VERT))
    # stations at the kick-off point and the end of build, so the survey describes the path exactly
    st = np.r_[0.0, 250.0, np.arange(KOP, 3001.0, 20.0)]
    # closed form: the end of build is a station (KOP + 40 deg / BUILD, computed above)
    assert np.any(np.isclose(st, EOB))
    inc = np.degrees(np.clip((st - KOP) * BUILD, 0.0, math.radians(HOLD_DEG)))
    (d / "dev_survey.csv").write_text("MD [m],INC [deg],AZI [deg]\n" + "".join(
        f"{m:.1f},{i:.6f},{AZI_DEG:.1f}\n" for m, i in zip(st, inc)))
    # zone tops of the deviated well in MD (the field-wide window is for the vertical well too)
    (d / "tops.csv").write_text("well,zone,top [m],base [m],depth\n"
                                f"DEV-1,Sand,{md_at_tvd(ZONE_TOP + ELEV_DEV):.6f},"
                                f"{md_at_tvd(ZONE_BASE + ELEV_DEV):.6f},MD\n")
    fmt = dict(top=ZONE_TOP - 40, base=ZONE_BASE + 40, fwl=FWL)
    (d / "p.toml").write_text(PROJECT.format(tops='tops_file = "tops.csv"',
                                             survey='survey = "dev_survey.csv"', **fmt))
    (d / "p_nosurvey.toml").write_text(PROJECT.format(tops="", survey="", **fmt))
    return d


def test_same_sw_in_tvdss_as_vertical_twin(field):
    proj = load_project(field / "p.toml")
    vert, _ = compute_well(proj, proj.wells[0])
    dev, msgs = compute_well(proj, proj.wells[1])
    # TVDSS from the survey matches the closed-form path (circle + straight line, computed)
    tvd_cf, hd_cf = path_closed_form(dev.well.md)
    # closed form (path_closed_form: circle + straight line, worked in its docstring);
    # atol 1e-6 m: stations lie on the exact arc, so only rounding remains (sawaryn2005)
    np.testing.assert_allclose(dev.tvdss, tvd_cf - ELEV_DEV, atol=1e-6)
    np.testing.assert_allclose(np.hypot(dev.north, dev.east), hd_cf, atol=1e-6)
    np.testing.assert_allclose(np.degrees(np.arctan2(dev.east, dev.north)), AZI_DEG, atol=1e-6)
    # closed form: the twin was sampled at the same TVDSS (md_vert = tvdss + ELEV_VERT)
    np.testing.assert_allclose(dev.tvdss, vert.tvdss, atol=1e-5)
    # the zone follows the tops in the deviated well: same TVDSS window as given
    # the TVDSS window given through the MD tops (ZONE_TOP, ZONE_BASE)
    assert dev.zones[0].top == pytest.approx(ZONE_TOP, abs=1e-5)
    assert dev.zones[0].base == pytest.approx(ZONE_BASE, abs=1e-5)
    # same Sw profile; vertical well zone is wider, so compare where the deviated well is zoned
    inz = dev.shm.zone == 0
    # closed form: (ZONE_BASE - ZONE_TOP) / cos 40 / 0.1524 m samples lie in the zone;
    # the power law (a 0.3, b 1.2) falls below 0.4 within the zone's height above the FWL
    assert inz.sum() > 800 and np.isfinite(dev.shm.sw[inz]).all()
    assert dev.shm.sw[inz].min() < 0.4      # a real transition zone is compared, not all water
    # closed form: Pc = drho g h depends on the vertical height only (hydrostatics, tiab2004),
    # so the same rock at the same TVDSS has the same Sw in both wells
    np.testing.assert_allclose(dev.shm.sw[inz], vert.shm.sw[inz], atol=1e-6)
    np.testing.assert_allclose(dev.shm.hafwl[inz], vert.shm.hafwl[inz], atol=1e-5)


def test_without_survey_the_profile_differs(field):
    # the same deviated logs treated as vertical put the rock tens of metres too deep
    proj = load_project(field / "p_nosurvey.toml")
    vert, _ = compute_well(proj, proj.wells[0])
    dev, _ = compute_well(proj, proj.wells[1])
    # closed form: MD - TVD of the build-and-hold path reaches tens of metres (path_closed_form)
    assert np.nanmax(np.abs(dev.tvdss - vert.tvdss)) > 50
    zoned = (vert.shm.zone == 0) & (vert.shm.sw < 0.9)
    differ = ~(np.abs(dev.shm.sw - vert.shm.sw) <= 1e-3)   # NaN (outside every zone) differs too
    # closed form: wrong TVDSS -> wrong height above the FWL -> another Sw (hydrostatics)
    assert zoned.sum() > 300 and differ[zoned].mean() > 0.9


def test_outputs_and_vertical_thickness(field, tmp_path):
    report = run_project(field / "p.toml", tmp_path / "out", plot=False, csv=True)
    # README (Outputs): every well computed (none failed); its files checked below with lasio
    assert not report.failed
    out = lasio.read(tmp_path / "out" / "DEV-1.las")
    md = out.index
    tvd_cf, hd_cf = path_closed_form(md)
    # library: lasio reads the output; closed form path_closed_form; atol 2e-4 m: the LAS
    # text keeps 4 decimals of metres
    np.testing.assert_allclose(out["TVD"], tvd_cf, atol=2e-4)
    np.testing.assert_allclose(out["TVDSS"], tvd_cf - ELEV_DEV, atol=2e-4)
    np.testing.assert_allclose(np.hypot(out["NORTH"], out["EAST"]), hd_cf, atol=3e-4)
    # the survey file given in the project
    assert out.params["SHM_SURVEY"].value == "dev_survey.csv"
    vert = lasio.read(tmp_path / "out" / "VERT-1.las")
    # closed form: no survey -> vertical well, no horizontal offset
    np.testing.assert_allclose(vert["TVD"], vert.index, atol=1e-4)   # vertical: TVD = MD
    assert np.all(vert["NORTH"] == 0) and np.all(vert["EAST"] == 0)
    # true vertical thickness of the zone in the deviated well: base - top, although the
    # hole is 1/cos(40 deg) = 1.31 times longer through it (computed)
    w = {x.name: x for x in report.wells}["DEV-1"].result.summary
    zone = w["zones"][0] if isinstance(w["zones"], list) else w["zones"]["Sand"]
    # closed form: vertical thickness = base - top in TVDSS; abs 0.3 m: two sample steps
    # of 0.1524 m cos 40 at the zone's ends
    assert zone["vertical_thickness"] == pytest.approx(ZONE_BASE - ZONE_TOP, abs=0.3)
    csv_head = (tmp_path / "out" / "DEV-1.csv").read_text().splitlines()[0]
    assert "TVD [M]" in csv_head.upper() and "NORTH" in csv_head and "EAST" in csv_head


def test_demo_deviated_well_matches_its_generator():
    # the demo generator places VANTREL-5 on a closed-form build-and-hold (its own code, no
    # minimum curvature); the tool's TVDSS from the survey file must agree, and the zone
    # windows from the tops file (one in MD, one in TVDSS) must land on the layer-cake
    import importlib.util
    from pathlib import Path

    demo = Path(__file__).resolve().parents[1] / "demo_wells"
    spec_ = importlib.util.spec_from_file_location("make_demo_for_test", demo / "make_demo.py")
    mk = importlib.util.module_from_spec(spec_)
    spec_.loader.exec_module(mk)
    wspec = next(w for w in mk.WELLS if w["name"] == "VANTREL-5")
    _, md, tvdss_true, _ = mk.depth_axis(wspec)
    proj = load_project(demo / "demo_project.toml")
    pw = next(w for w in proj.wells if w.las.stem == "VANTREL-5")
    res, _ = compute_well(proj, pw)
    # known generator values: demo_wells/make_demo.py's closed-form build-and-hold (its own code,
    # no minimum curvature); atol 1e-3 m: LAS text rounding and survey station spacing
    np.testing.assert_allclose(res.well.md, md, atol=1e-9)
    np.testing.assert_allclose(res.tvdss, tvdss_true, atol=1e-3)
    for zs, zm in zip(mk.ZONES, res.zones):
        # known generator values (make_demo.ZONES, TVDSS layer cake)
        assert zm.top == pytest.approx(zs["top"], abs=2e-3)
        assert zm.base == pytest.approx(zs["base"], abs=2e-3)
    # closed form: a vertical well would give 1.0; a hold at tens of degrees gives cos(inc)
    assert np.nanmax(res.tvdss) - np.nanmin(res.tvdss) < 0.8 * (md[-1] - md[0])  # really deviated


def test_cli_depth_axis_and_field_section(field, tmp_path, monkeypatch):
    import json

    from satheight.cli import main
    from satheight import plots

    seen = []
    original = plots.track_plot

    def spy(*args, **kwargs):
        seen.append(kwargs.get("depth_axis"))
        return original(*args, **kwargs)

    monkeypatch.setattr(plots, "track_plot", spy)
    code = main(["run", str(field / "p.toml"), "--out", str(tmp_path / "o"), "--depth-axis", "tvdss"])
    assert code == 0
    # the option given (--depth-axis tvdss), once per well
    assert seen == ["tvdss", "tvdss"]
    summary = json.loads((tmp_path / "o" / "run_summary.json").read_text())
    assert summary["field_section"] == "field_section.png"
    # rfc2083: the PNG signature
    assert (tmp_path / "o" / "field_section.png").read_bytes()[:4] == b"\x89PNG"
    with pytest.raises(SystemExit):
        main(["run", str(field / "p.toml"), "--depth-axis", "tvd"])
