"""Core plugs and formation pressures on the track plots of a run.

The demo project names its core files and pressure file (``[project] core_files``,
``pressure_file``). Expected depths are worked here by hand: a vertical well has
TVDSS = MD - datum elevation (common practice); the deviated demo well VANTREL-5
follows a build-and-hold whose TVD is written below in closed form (circle and
straight line, `sawaryn2005`: minimum curvature is exact on a circular arc),
independent of the package's trajectory code. Counts come from reading the demo's
CSV files with the standard library's csv module.
"""

from __future__ import annotations

import csv
import io
import math
import shutil
from pathlib import Path

import numpy as np
import pytest

from satheight.errors import ProjectFileError, SatHeightError
from satheight.io.core_data import read_plug_table
from satheight.plots import DepthPoints, track_plot
from satheight.project.reader import load_project
from satheight.workflows import outputs as outputs_mod
from satheight.workflows.outputs import PlotOptions, write_outputs
from satheight.workflows.points import pressure_levels, track_points, unmatched_notes
from satheight.workflows.well import compute_well

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
CORE_FILES = ("core_plugs.csv", "core_dean_stark.csv")
EKB = {"VANTREL-1": 28.5, "VANTREL-5": 29.4}     # the LAS headers' EKB [m] (demo README)


def _rows(name: str) -> list[dict]:
    """Data rows of a demo CSV file (comment lines dropped), read with the csv module."""
    lines = [ln for ln in (DEMO / name).read_text().splitlines() if not ln.startswith("#")]
    return list(csv.DictReader(io.StringIO("\n".join(lines))))


def _plug_rows(well: str) -> list[dict]:
    """Every plug row of the demo's core files for ``well`` (the single-plug file is V12 of
    VANTREL-4, read here from its '# well =' line)."""
    rows = [r for n in CORE_FILES for r in _rows(n) if r["well"] == well]
    v12 = (DEMO / "core_plug_V12.csv").read_text()
    assert "# well = VANTREL-4" in v12
    return rows


def _hold_tvdss(md):
    """TVDSS [m] of VANTREL-5 in its hold section, worked by hand from the demo README:
    vertical to 1200 m, build 2.5 deg / 30 m to 37.5 deg (end of build MD 1650 m), hold;
    EKB 29.4 m. R = 30 / (2.5 pi / 180) = 687.549 m; TVD at the end of the build =
    1200 + R sin 37.5 deg = 1618.554 m; below it TVD grows by cos 37.5 deg per metre."""
    r = 30.0 / math.radians(2.5)
    tvd_eob = 1200.0 + r * math.sin(math.radians(37.5))
    return tvd_eob + (np.asarray(md, float) - 1650.0) * math.cos(math.radians(37.5)) - 29.4


@pytest.fixture(scope="module")
def demo():
    return load_project(DEMO / "demo_project.toml")


@pytest.fixture(scope="module")
def results(demo):
    out = {}
    for spec in demo.wells:
        result, _ = compute_well(demo, spec)
        out[result.well.name] = result
    return out


def _axes(fig, label_start: str):
    return next(ax for ax in fig.axes if ax.get_xlabel().replace("\n", " ").startswith(label_start))


def _marker_y(ax, marker: str) -> np.ndarray:
    ys = [ln.get_ydata() for ln in ax.get_lines() if ln.get_marker() == marker]
    return np.sort(np.concatenate(ys)) if ys else np.empty(0)


def test_hand_worked_hold_value():
    # worked by hand (sawaryn2005 circle geometry): MD 2455 m -> TVD 1618.554 + 805 x
    # 0.793353 = 2257.203 m -> TVDSS 2227.803 m
    assert _hold_tvdss(2455.0) == pytest.approx(2227.803, abs=1e-3)


def test_plug_sw_column_is_read(tmp_path):
    # README (Core-data files): an optional sw column, fraction or percent, blank for none;
    # 1 % = 0.01 (nist2008)
    p = tmp_path / "plugs.csv"
    p.write_text("plug,well,depth [m],porosity [frac],permeability [mD],sw [%]\n"
                 "A,W-1,2001.5,0.21,35,23.5\nB,W-1,2003.0,0.18,12,\n")
    plugs = read_plug_table(p)
    assert plugs["A"].sw == pytest.approx(0.235, abs=1e-12)
    assert plugs["B"].sw is None
    p.write_text("plug,well,depth [m],porosity [frac],permeability [mD],sw [frac]\n"
                 "A,W-1,2001.5,0.21,35,1.3\n")
    with pytest.raises(SatHeightError) as exc:
        read_plug_table(p)
    assert "row 2" in str(exc.value.where) and "1.3" in str(exc.value)


def test_vertical_well_plugs_at_md_minus_datum(results):
    plugs = results["VANTREL-1"].plugs
    rows = _plug_rows("VANTREL-1")
    assert plugs.plug.size == len(rows)                       # every row of the files
    md = np.array([float(r["depth [m]"]) for r in rows])
    np.testing.assert_allclose(np.sort(plugs.md), np.sort(md), atol=1e-9)
    # common practice: a vertical well's TVDSS = MD - datum elevation (EKB 28.5 m)
    np.testing.assert_allclose(plugs.tvdss, plugs.md - EKB["VANTREL-1"], atol=1e-9)
    with_sw = [r for r in rows if r.get("sw [frac]")]
    assert np.isfinite(plugs.sw).sum() == len(with_sw)


def test_deviated_well_plugs_follow_the_closed_form_path(results):
    plugs = results["VANTREL-5"].plugs
    rows = _plug_rows("VANTREL-5")
    assert plugs.plug.size == len(rows) > 0
    assert plugs.md.min() > 1650.0                         # all in the hold section
    # sawaryn2005 circle geometry worked by hand; 1e-3 m: survey text rounding (as in
    # test_pressures' MD-only points of this well)
    np.testing.assert_allclose(plugs.tvdss, _hold_tvdss(plugs.md), atol=1e-3)


def test_points_drawn_at_their_depths_and_counted(demo, results):
    result = results["VANTREL-1"]
    notes: list[str] = []
    levels, rejected = pressure_levels(demo, notes)
    fig = track_plot(result, **track_points(result, "tvdss", levels, rejected))
    rows = _plug_rows("VANTREL-1")
    hand = np.sort(np.array([float(r["depth [m]"]) for r in rows]) - EKB["VANTREL-1"])
    # plug Sw diamonds on the Sw track: one per row with an Sw, at MD - 28.5 m
    sw_rows = [r for r in rows if r.get("sw [frac]")]
    y_sw = _marker_y(_axes(fig, "Water saturation"), "D")
    np.testing.assert_allclose(y_sw, np.sort([float(r["depth [m]"]) - 28.5 for r in sw_rows]),
                               atol=1e-9)
    # plug porosity triangles on the porosity track: every plug row
    np.testing.assert_allclose(_marker_y(_axes(fig, "Porosity"), "^"), hand, atol=1e-9)
    # pressure points: every row of the file for the well, at its TVDSS (MD - 28.5 m for
    # the row that gives only MD)
    prow = [r for r in _rows("demo_pressures.csv") if r["well"] == "VANTREL-1"]
    p_hand = np.sort([float(r["tvdss [m]"]) if r["tvdss [m]"] else float(r["md [m]"]) - 28.5
                      for r in prow])
    np.testing.assert_allclose(_marker_y(_axes(fig, "Pressure"), "o"), p_hand, atol=1e-9)
    # plotted window: the zones (2030-2310 m TVDSS) with 20 m above and below (README);
    # plugs shallower than 2010 m are counted in the note, not dropped silently
    outside = int(np.count_nonzero((hand < 2010.0) | (hand > 2330.0)))
    assert outside == 3
    texts = [t.get_text() for ax in fig.axes for t in ax.texts]
    assert any(f"{outside} core plugs\noutside the plotted depths" in t for t in texts)


def test_fwl_from_pressures_is_drawn_near_the_invented_truth(demo, results):
    # the demo pressures were made on lines meeting at FWL 2105 m (Upper Sand) and 2290 m
    # (Lower Sand) (known generating values, demo_wells/make_pressures.py), gauge noise 3 kPa
    levels, _ = pressure_levels(demo, [])
    by_label = {label: (depth, low, high) for label, depth, low, high in levels}
    for zone, truth in (("Upper Sand", 2105.0), ("Lower Sand", 2290.0)):
        depth, low, high = by_label[f"FWL {zone} (pressures)"]
        assert low <= truth <= high and abs(depth - truth) < 3.0
    result = results["VANTREL-1"]
    fig = track_plot(result, **track_points(result, "tvdss", levels))
    ax = _axes(fig, "Pressure")
    drawn = [ln.get_ydata()[0] for ln in ax.get_lines() if ln.get_linestyle() == "-."]
    np.testing.assert_allclose(sorted(drawn), sorted(d for d, _, _ in by_label.values()))


def test_run_passes_the_points_to_the_track_plot(demo, results, tmp_path, monkeypatch):
    seen = {}

    def spy(result, **kw):
        seen.update(kw)
        return track_plot(result, **kw)

    monkeypatch.setattr(outputs_mod.plots, "track_plot", spy)
    write_outputs(results["VANTREL-5"], demo, tmp_path, PlotOptions())
    assert seen["core_sw"].value.size == len(_plug_rows("VANTREL-5"))
    assert "pressures" not in seen                # VANTREL-5 has no pressure rows


def _small_project(folder: Path, extra: str = "") -> Path:
    """A one-well project (VANTREL-2 of the demo, the Upper Sand with the demo's invented
    truth inline) with ``extra`` lines in [project]."""
    shutil.copy(DEMO / "VANTREL-2.las", folder / "VANTREL-2.las")
    path = folder / "p.toml"
    path.write_text(f"""[project]
units = "metric"
{extra}
[log_sw]
rw = "0.045 ohm.m"
[[wells]]
las = "VANTREL-2.las"
curves = {{ porosity = "PHIE", permeability = "PERM" }}
[[zones]]
name = "Upper Sand"
top = "2030 m"
base = "2120 m"
fwl = "2105 m"
hydrocarbon = "oil"
water_density = "1.08 g/cm3"
hydrocarbon_density = "0.78 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
""")
    return path


def test_well_without_points_is_drawn_as_before(tmp_path):
    # a core file that names only VANTREL-1 and VANTREL-5 (the Dean-Stark table) and no
    # pressure file: VANTREL-2's plot is the plot of the same project without them
    shutil.copy(DEMO / "core_dean_stark.csv", tmp_path / "core_dean_stark.csv")
    pngs = []
    for extra in ("", 'core_files = "core_dean_stark.csv"'):
        project = load_project(_small_project(tmp_path, extra))
        (spec,) = project.wells
        result, _ = compute_well(project, spec)
        assert result.plugs is None and result.pressures is None
        kw = track_points(result)
        assert kw == {}
        buf = io.BytesIO()
        track_plot(result, **kw).savefig(buf, format="png")
        pngs.append(buf.getvalue())
    assert pngs[0] == pngs[1]


def test_rows_of_unknown_wells_are_noted(tmp_path):
    (tmp_path / "plugs.csv").write_text(
        "plug,well,depth [m],porosity [frac],permeability [mD]\nX1,NO-SUCH-WELL,2050,0.2,10\n")
    project = load_project(_small_project(tmp_path, 'core_files = ["plugs.csv"]'))
    notes = unmatched_notes(project, frozenset({"VANTREL-2"}))
    assert len(notes) == 1 and "'NO-SUCH-WELL'" in notes[0] and "plugs.csv" in notes[0]


@pytest.mark.parametrize("value, expect", [
    ("3", "expected a file name or a list"),
    ('["missing.csv"]', "not found"),
])
def test_bad_core_files_key_names_it(tmp_path, value, expect):
    # README (Bad input): the error names the key and the value
    with pytest.raises(ProjectFileError) as exc:
        load_project(_small_project(tmp_path, f"core_files = {value}"))
    assert "project.core_files" in str(exc.value.where) and expect in str(exc.value)


def test_bad_row_in_a_core_file_names_key_file_and_row(tmp_path):
    (tmp_path / "plugs.csv").write_text(
        "plug,well,depth [m],porosity [frac],permeability [mD],sw [frac]\nA,W,2000,0.2,10,abc\n")
    with pytest.raises(ProjectFileError) as exc:
        load_project(_small_project(tmp_path, 'core_files = "plugs.csv"'))
    msg = str(exc.value)
    assert "project.core_files" in msg and "plugs.csv, row 2" in msg and "abc" in msg


def test_labels_from_input_text_are_escaped(results):
    # a zone name with '$' (input text) in the FWL label: shown as written, not as mathtext
    result = results["VANTREL-2"]
    kw = track_points(result, "tvdss", (("FWL $x$ (pressures)", 2105.0, 2103.0, 2107.0),))
    fig = track_plot(result, **kw)
    labels = [ln.get_label() for ln in _axes(fig, "Pressure").get_lines()]
    assert r"FWL \$x\$ (pressures)" in labels
    fig.canvas.draw()                         # mathtext would fail or eat the dollars


def test_depth_points_default_fields_keep_the_old_call():
    # the two new fields are optional: the earlier positional form still builds
    p = DepthPoints(np.array([2000.0]), np.array([0.3]), "tvdss", "Core plug")
    assert p.kind is None and p.unused is None


def test_python_surface_draws_the_points_too():
    # README (Python use): a well's track_plot() shows its plugs as a run does
    import satheight

    well = satheight.run_well(satheight.open_project(DEMO / "demo_project.toml"), "VANTREL-1")
    fig = well.track_plot()
    with_sw = [r for r in _plug_rows("VANTREL-1") if r.get("sw [frac]")]
    assert _marker_y(_axes(fig, "Water saturation"), "D").size == len(with_sw)
    prow = [r for r in _rows("demo_pressures.csv") if r["well"] == "VANTREL-1"]
    assert _marker_y(_axes(fig, "Pressure"), "o").size == len(prow)
