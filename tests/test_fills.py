"""Filled areas drawn as one compound path (satheight.plots.fills).

Reference (library: matplotlib): ``Axes.fill_betweenx`` builds the polygons of the
same area one run at a time; its vertices and path codes, and the Agg renderer's
picture of its polygons, are what the compound path must reproduce.
"""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from satheight.plots.fills import fill_depth, fill_outline


def _axes(height_in=6.0):
    fig = Figure(figsize=(2.0, height_in), dpi=110)
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0, 0, 1, 1))
    ax.axis("off")
    return fig, ax


@pytest.fixture
def gappy():
    """20,000 samples (invented): a noisy curve with null runs and a mask with short holes."""
    rng = np.random.default_rng(11)
    n = 20_000
    y = np.linspace(1000.0, 1400.0, n)
    x1 = np.clip(0.5 + 0.2 * np.sin(y / 9.0) + 0.05 * rng.normal(size=n), 0.0, 1.0)
    x1[rng.random(n) < 0.004] = np.nan
    where = rng.random(n) > 0.01
    where[5000:5003] = [False, True, False]          # an isolated sample: no area
    return y, x1, where


@pytest.mark.parametrize("second", ["constant", "curve"])
def test_same_vertices_and_codes_as_fill_betweenx(gappy, second):
    y, x1, where = gappy
    x2 = 1.0 if second == "constant" else x1 + 0.1 * np.cos(y)
    _, ax = _axes()
    ref = ax.fill_betweenx(y, x1, x2, where=where).get_paths()
    verts, codes = fill_outline(y, x1, x2, where)
    assert len(ref) > 100                               # many separate runs
    np.testing.assert_array_equal(verts, np.concatenate([p.vertices for p in ref]))
    np.testing.assert_array_equal(codes, np.concatenate([p.codes for p in ref]))


def test_nothing_to_fill_gives_an_empty_path():
    y = np.arange(10.0)
    verts, codes = fill_outline(y, np.full(10, np.nan), 1.0)
    assert verts.shape == (0, 2) and codes.shape == (0,)
    _, ax = _axes()
    fill_depth(ax, y, np.full(10, np.nan), 1.0, color="k")   # draws nothing, no error
    ax.figure.canvas.draw()


def _pixels(fig):
    fig.canvas.draw()
    return np.asarray(fig.canvas.buffer_rgba())[..., :3].astype(int)


def test_picture_matches_fill_betweenx_where_runs_are_apart():
    """Runs several pixels apart: the one path and the separate polygons look the same."""
    n = 4000
    y = np.linspace(0.0, 100.0, n)
    x1 = 0.3 + 0.2 * np.sin(y / 3.0)
    where = (np.arange(n) // 200) % 2 == 0               # 10 runs, 5 units apart
    figs = []
    for draw in ("reference", "ours"):
        fig, ax = _axes()
        kw = dict(color="#E69F00", alpha=0.35, lw=0)
        if draw == "reference":
            ax.fill_betweenx(y, x1, 1.0, where=where, **kw)
        else:
            fill_depth(ax, y, x1, 1.0, where=where, **kw)
        ax.set_xlim(0.0, 1.0)
        ax.set_ylim(100.0, 0.0)
        figs.append(_pixels(fig))
    differ = np.abs(figs[0] - figs[1]).max(axis=2) > 8
    assert differ.mean() < 0.001


def test_depths_going_back_up_fall_back_to_separate_polygons():
    """A well that climbs again: parts could overlap, so each run stays its own polygon."""
    y = np.concatenate([np.linspace(0.0, 50.0, 100), np.linspace(50.0, 20.0, 60)])
    x1 = np.full(y.size, 0.2)
    where = np.ones(y.size, bool)
    where[100] = False
    _, ax = _axes()
    art = fill_depth(ax, y, x1, 1.0, where=where, color="k")
    assert len(art.get_paths()) == 2


def test_strip_between_constant_edges_looks_like_fill_betweenx():
    """A flag strip (constant edges) with runs thinner than a pixel: snapped to the pixel
    grid like matplotlib's separate polygons, so thin runs look alike in both."""
    rng = np.random.default_rng(5)
    n = 30_000
    y = np.linspace(0.0, 3000.0, n)                      # about 4.5 samples per pixel row
    where = np.convolve(rng.random(n) < 0.003, np.ones(3), "same") > 0
    figs = []
    for draw in ("reference", "ours"):
        fig, ax = _axes()
        if draw == "reference":
            ax.fill_betweenx(y, 0.0, 0.5, where=where, color="#333333", lw=0)
        else:
            fill_depth(ax, y, 0.0, 0.5, where=where, color="#333333", lw=0)
        ax.set_xlim(0.0, 1.0)
        ax.set_ylim(3000.0, 0.0)
        figs.append(_pixels(fig))
    differ = np.abs(figs[0] - figs[1]).max(axis=2) > 64
    assert (figs[0] < 128).any()                         # the runs are drawn at all
    assert differ.mean() < 0.001                         # unsnapped parts: about 0.5 %
