"""Field cross-section: positions along the section line and the written figure.

Wells here are invented stand-ins carrying only what the section reads.
"""

from types import SimpleNamespace

import numpy as np
import pytest

from satheight.errors import DepthError, UnitError
from satheight.plots import section_plot, section_positions
from satheight.workflows.figures import save_figure

# PNG signature: PNG specification (ISO/IEC 15948:2004, section 5.2)
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def well(name, tvdss, north=None, east=None, zones=()):
    tvdss = np.asarray(tvdss, float)
    return SimpleNamespace(well=SimpleNamespace(name=name), tvdss=tvdss, north=north, east=east,
                           shm=SimpleNamespace(sw=np.linspace(0.2, 1.0, tvdss.size)),
                           zones=list(zones))


def test_map_positions_on_line_of_best_fit():
    # two vertical wells 500 m apart (3-4-5 triangle, computed) and a deviated one on the line
    z = np.linspace(1000, 1100, 11)
    a = well("A", z)
    b = well("B", z)
    c = well("C", z, north=np.linspace(0, 80, 11), east=np.linspace(0, 60, 11))
    locs = {"A": (0.0, 0.0), "B": (300.0, 400.0), "C": (150.0, 200.0)}
    d, mapped, u = section_positions([a, b, c], locs)
    assert mapped
    np.testing.assert_allclose(np.abs(u), [0.6, 0.8], atol=1e-9)
    np.testing.assert_allclose(d[1] - d[0], 500.0, atol=1e-9)
    # C starts halfway and moves 100 m along the line (computed: hypot(60, 80))
    np.testing.assert_allclose(d[2][0] - d[0][0], 250.0, atol=1e-9)
    np.testing.assert_allclose(d[2][-1] - d[2][0], 100.0, atol=1e-9)
    assert min(x.min() for x in d) == 0.0


def test_line_runs_west_to_east():
    z = np.linspace(0, 10, 3)
    d, _, u = section_positions([well("E", z), well("W", z)], {"E": (1000.0, 0.0), "W": (0.0, 0.0)})
    assert u[0] > 0 and d[1][0] < d[0][0]   # the western well is on the left


def test_schematic_without_locations():
    z = np.linspace(0, 10, 3)
    dev = well("D", z, north=np.array([0.0, 30.0, 40.0]), east=np.array([0.0, 40.0, 30.0]))
    d, mapped, _ = section_positions([well("V", z), dev], {"V": (0.0, 0.0)})
    assert not mapped
    assert np.all(d[0] == d[0][0])              # a vertical well stays a vertical line
    # the deviated well keeps its reach towards its last position: 50 m (computed)
    assert d[1][-1] - d[1][0] == pytest.approx(50.0)
    assert d[1][0] > d[0][0]                    # set beside the first well


def test_section_plot_writes_png(tmp_path):
    zone = SimpleNamespace(name="Sand $x$", top=1020.0, base=1080.0, fwl=1060.0)
    z = np.linspace(1000, 1100, 101)
    wells = [well("A", z, zones=[zone]),
             well("B", z, north=np.linspace(0, 200, 101), east=np.zeros(101), zones=[zone])]
    fig = section_plot(wells, units="field", locations={"A": (0.0, 0.0), "B": (0.0, 1000.0)})
    out = save_figure(fig, tmp_path / "s.png")
    assert out == [tmp_path / "s.png"]
    assert (tmp_path / "s.png").read_bytes()[:8] == PNG_SIGNATURE
    assert [p.name for p in tmp_path.iterdir()] == ["s.png"]   # no temp files left


def test_section_plot_errors(tmp_path):
    with pytest.raises(DepthError):
        section_plot([])
    with pytest.raises(UnitError):
        section_plot([well("A", [1.0, 2.0])], units="imperial")
