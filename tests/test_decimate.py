"""Thinning of long logs before drawing (satheight.plots.decimate.envelope_indices).

The reference for "the same picture" is the plain per-bin minimum and maximum
computed here with numpy's ufunc.at (a general-purpose library), and for the
rendered check, matplotlib's own Agg rendering of all samples.
"""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from satheight.plots.decimate import BINS_PER_INCH, envelope_indices


def per_bin_extremes(y, x, lo, hi, bins):
    """Reference: min and max of x in each depth bin, by numpy's unbuffered ufunc.at."""
    b = np.clip(np.floor((y - lo) / (hi - lo) * bins), -1, bins).astype(int) + 1
    mn = np.full(bins + 2, np.inf)
    mx = np.full(bins + 2, -np.inf)
    ok = np.isfinite(x)
    np.minimum.at(mn, b[ok], x[ok])
    np.maximum.at(mx, b[ok], x[ok])
    return mn, mx


@pytest.fixture
def spiky():
    """200,000 samples of a smooth curve with 40 one-sample spikes up and 40 down (invented)."""
    rng = np.random.default_rng(7)
    n = 200_000
    y = np.linspace(1000.0, 3000.0, n)
    x = np.sin(y / 37.0) + 0.05 * rng.normal(size=n)
    up = rng.choice(n, 40, replace=False)
    down = rng.choice(np.setdiff1d(np.arange(n), up), 40, replace=False)
    x[up] = 5.0 + np.arange(40)
    x[down] = -5.0 - np.arange(40)
    return y, x, up, down


def test_every_bin_keeps_its_extremes_and_every_spike(spiky):
    y, x, up, down = spiky
    lo, hi, bins = 1000.0, 3000.0, 2000
    i = envelope_indices(y, [x], lo, hi, bins)
    assert i.size < y.size / 10          # really thinned (8 points per bin at most)
    assert np.all(np.diff(i) > 0)
    ref_mn, ref_mx = per_bin_extremes(y, x, lo, hi, bins)
    got_mn, got_mx = per_bin_extremes(y[i], x[i], lo, hi, bins)
    np.testing.assert_array_equal(got_mn, ref_mn)
    np.testing.assert_array_equal(got_mx, ref_mx)
    # each spike is the extreme of its bin unless a larger spike shares the bin
    assert x[i].max() == x.max() and x[i].min() == x.min()
    bin_of = np.floor((y - lo) / (hi - lo) * bins).astype(int) + 1
    kept = set(i.tolist())
    for s in up:   # spike values are distinct, so the spike is the only sample holding them
        assert s in kept or x[s] < ref_mx[bin_of[s]]
    for s in down:
        assert s in kept or x[s] > ref_mn[bin_of[s]]
    assert sum(s in kept for s in up) >= 35     # most spikes are alone in their bin


def test_lines_join_the_same_samples_across_bin_edges(spiky):
    y, x, _, _ = spiky
    lo, hi, bins = 1000.0, 3000.0, 2000
    i = set(envelope_indices(y, [x], lo, hi, bins).tolist())
    b = np.floor((y - lo) / (hi - lo) * bins)
    edges = np.flatnonzero(b[1:] != b[:-1])   # sample edges where the bin changes
    assert all(e in i and e + 1 in i for e in edges)


def test_gaps_and_fill_mask_changes_stay_where_they_are():
    n = 100_000
    y = np.linspace(0.0, 1000.0, n)
    x = np.cos(y)
    x[30_000:30_500] = np.nan
    mask = (np.arange(n) // 7_777) % 2 == 0
    i = set(envelope_indices(y, [x], 0.0, 1000.0, 500, categories=mask).tolist())
    assert {29_999, 30_000, 30_499, 30_500} <= i        # both ends of the gap
    changes = np.flatnonzero(mask[1:] != mask[:-1])
    assert all(c in i and c + 1 in i for c in changes)


def test_short_input_is_left_whole():
    y = np.arange(100.0)
    np.testing.assert_array_equal(envelope_indices(y, [y], 0.0, 99.0, 1000), np.arange(100))
    np.testing.assert_array_equal(envelope_indices(np.empty(0), [np.empty(0)], 0, 1, 10),
                                  np.empty(0, int))


def _render(y, x, height_in=10.0):
    fig = Figure(figsize=(2.0, height_in), dpi=110)
    canvas = FigureCanvasAgg(fig)
    ax = fig.add_axes((0, 0, 1, 1))
    ax.plot(x, y, color="black", lw=0.8)
    ax.set_ylim(y.max(), y.min())
    ax.set_xlim(-6.0, 45.0)
    ax.axis("off")
    canvas.draw()
    return np.asarray(canvas.buffer_rgba())[..., 0].astype(int)


def test_thinned_line_renders_like_the_whole_line(spiky):
    """Agg's picture of the thinned curve matches that of all 200,000 samples."""
    y, x, _, _ = spiky
    bins = int(10.0 * BINS_PER_INCH)               # the plot's own thinning on 10 inch
    i = envelope_indices(y, [x], y.min(), y.max(), bins)
    full, thin = _render(y, x), _render(y[i], x[i])
    differ = np.abs(full - thin) > 64              # more than a quarter of the grey scale
    assert differ.mean() < 0.01                    # fewer than 1 % of the pixels
