"""Per-well FWL values and a tilted (planar) FWL, through the project file and the engine."""

import pytest

from satheight.compare import summarise
from satheight.engine import fwl_on_plane
from satheight.errors import ProjectFileError
from satheight.project import load_project
from satheight.workflows.well import compute_well
from tiny_field import PROJECT, write_las


def test_fwl_plane_closed_form():
    """z = fwl0 + ge (E - E0) + gn (N - N0): with fwl0 = 2000 m at (100, 200) m,
    ge = 0.01, gn = -0.005: at (600, 200) -> 2000 + 5 = 2005 m; at (100, 1200) ->
    2000 - 5 = 1995 m; at (1100, 2200) -> 2000 + 10 - 10 = 2000 m."""
    # closed form worked in the docstring (plane geometry)
    got = fwl_on_plane(2000.0, 100.0, 200.0, 0.01, -0.005, [600, 100, 1100], [200, 1200, 2200])
    assert list(got) == pytest.approx([2005.0, 1995.0, 2000.0], abs=1e-9)


def _project(tmp_path, wells: str, plane: str = "") -> object:
    for i in (0, 1):
        write_las(tmp_path / f"w{i}.las", f"W{i}", seed=i + 1)
    text = PROJECT.format(wells=wells, fwl=1000)
    text = text.replace('fwl = "1000 m"\n', 'fwl = "1000 m"\n' + plane)
    p = tmp_path / "p.toml"
    p.write_text(text, encoding="utf-8")
    return load_project(p)


def test_well_fwl_overrides_the_zone_fwl(tmp_path):
    """W0 gives S = 990 m under [wells.fwl]; W1 keeps the zone's 1000 m. The tiny field is
    vertical with EKB 25 m, so the first sample (1000 m MD) is at 975 m TVDSS and its height
    above the FWL is 990 - 975 = 15 m in W0, 1000 - 975 = 25 m in W1 (closed form)."""
    project = _project(tmp_path, '[[wells]]\nlas = "w0.las"\n[wells.fwl]\nS = "990 m"\n'
                                 '[[wells]]\nlas = "w1.las"\n')
    r0, _ = compute_well(project, project.wells[0])
    r1, _ = compute_well(project, project.wells[1])
    # closed form worked in the docstring
    assert r0.shm.hafwl[0] == pytest.approx(15.0, abs=1e-9)
    assert r1.shm.hafwl[0] == pytest.approx(25.0, abs=1e-9)
    s0, s1 = summarise(r0)["zones"]["S"], summarise(r1)["zones"]["S"]
    assert s0["fwl_tvdss"] == pytest.approx(990.0) and "wells[" in s0["fwl_source"]
    assert s1["fwl_tvdss"] == pytest.approx(1000.0) and s1["fwl_source"] == "project file"


def test_tilted_fwl_is_evaluated_at_each_well_head(tmp_path):
    """Plane through 1000 m at (0, 0), gradient_east 0.01, gradient_north 0.002: W0 at
    (500, 0) m -> 1005 m; W1 at (-1000, 2500) m -> 1000 - 10 + 5 = 995 m (closed form)."""
    plane = "fwl_plane = { east = 0, north = 0, gradient_east = 0.01, gradient_north = 0.002 }\n"
    project = _project(tmp_path, '[[wells]]\nlas = "w0.las"\nlocation = { east = 500, north = 0 }\n'
                                 '[[wells]]\nlas = "w1.las"\n'
                                 'location = { east = -1000, north = 2500 }\n', plane)
    r0, _ = compute_well(project, project.wells[0])
    r1, _ = compute_well(project, project.wells[1])
    # closed form worked in the docstring
    assert r0.zones[0].fwl == pytest.approx(1005.0, abs=1e-9)
    assert r1.zones[0].fwl == pytest.approx(995.0, abs=1e-9)
    assert r1.shm.hafwl[0] == pytest.approx(995.0 - 975.0, abs=1e-9)
    assert "fwl_plane" in summarise(r1)["zones"]["S"]["fwl_source"]


def test_tilted_fwl_needs_the_well_location(tmp_path):
    """README (project file): a plane without a well location is an error naming the key."""
    plane = "fwl_plane = { east = 0, north = 0, gradient_east = 0.01, gradient_north = 0 }\n"
    project = _project(tmp_path, '[[wells]]\nlas = "w0.las"\n', plane)
    with pytest.raises(ProjectFileError) as e:
        compute_well(project, project.wells[0])
    assert "location" in str(e.value)


def test_steep_fwl_plane_and_unknown_zone_are_refused(tmp_path):
    """README (plausible ranges): a tilt above 0.05 m/m is refused unless allowed; an FWL
    for a zone no [[zones]] entry defines is refused with the key."""
    plane = "fwl_plane = { east = 0, north = 0, gradient_east = 0.2, gradient_north = 0 }\n"
    with pytest.raises(ProjectFileError) as e:
        _project(tmp_path, '[[wells]]\nlas = "w0.las"\n', plane)
    assert "fwl_plane" in str(e.value)
    with pytest.raises(ProjectFileError) as e:
        _project(tmp_path, '[[wells]]\nlas = "w0.las"\n[wells.fwl]\nT = "990 m"\n')
    assert "wells[w0.las].fwl.T" in str(e.value)
