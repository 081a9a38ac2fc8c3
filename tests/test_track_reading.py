"""The track plot as a reviewer reads it: depth scales, interval shown, Sw overlay, J scale,
measured points, page sizes, odd names and thinning of long wells.

Wells are the invented synthetic wells of tests/test_plots.py.
"""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib import cbook

from satheight import plots
from satheight.plots.depth_scale import LABELS_GID, OTHER_TITLE_GID, TICKS_GID
from satheight.plots.track import MINOR_TICKS_GID, DepthPoints, depth_ticks
from test_plots import FOOT_M, all_texts, legend_labels, make_result, zone

# 1 kPa = 1000 Pa (SI prefix, BIPM SI Brochure, 9th ed., Table 7).
KPA = 1000.0
# A4: 210 mm x 297 mm (ISO 216); 1 inch = 25.4 mm exactly (NIST SP 811, App. B).
A4_INCH = (210.0 / 25.4, 297.0 / 25.4)


def drawn(fig):
    fig.canvas.draw()
    return fig


def line_labelled(fig, label):
    found = [ln for ax in fig.axes for ln in ax.get_lines() if ln.get_label() == label]
    assert len(found) == 1, label
    return found[0]


# ---------------------------------------------------------------------- depth scale


def scale_marks(fig, which):
    """A depth scale as drawn: plot depths of its ticks, and (plot depth, number) of each label.

    Read from the figure's artists (one line collection of ticks, one text per number,
    see satheight.plots.depth_scale), in the first track's depth coordinates.
    """
    ax = fig.axes[0]
    (coll,) = [c for c in ax.collections if c.get_gid() == TICKS_GID[which]]
    ticks = np.array([seg[0][1] for seg in coll.get_segments()])
    labels = [(t.get_position()[1], float(t.get_text().replace("\N{MINUS SIGN}", "-")))
              for t in fig.texts if t.get_gid() == LABELS_GID[which]]
    return ticks, np.array(labels).reshape(-1, 2)


def other_scale_name(fig):
    (name,) = [t.get_text() for t in fig.texts if t.get_gid() == OTHER_TITLE_GID]
    return name


@pytest.mark.parametrize("units, minor, major", [("metric", 10.0, 50.0), ("field", 50.0, 100.0)])
def test_depth_ticks_every_10_m_labels_every_50_m(units, minor, major):
    """Ticks every 10 m / 50 ft, labels every 50 m / 100 ft (common practice); each number
    sits at the depth it names: on the main scale (TVDSS) its own plot depth, on the MD
    scale the plot depth where the well's MD is that number (make_result: TVDSS = MD - 25,
    a vertical well; the display unit is ft in field units, 1 ft = 0.3048 m: nist2008)."""
    fig = drawn(plots.track_plot(make_result(datum=25.0), units=units))
    ax = fig.axes[0]
    lo, hi = sorted(ax.get_ylim())
    maj, labels = scale_marks(fig, "main")
    (coll,) = [c for c in ax.collections if c.get_gid() == MINOR_TICKS_GID]
    mnr = [seg[0][1] for seg in coll.get_segments()]   # minor ticks: one line collection
    assert len(maj) >= 3 and np.all((maj >= lo) & (maj <= hi))
    # every multiple of the step inside the window has its tick, none is missing at the ends
    assert maj.min() - major < lo and maj.max() + major > hi
    np.testing.assert_allclose(np.diff(maj), major)
    np.testing.assert_allclose(np.mod(maj, major), 0.0, atol=1e-9)
    assert set(np.round(np.diff(sorted(set(mnr) | set(maj))), 9)) == {minor}
    np.testing.assert_allclose(labels[:, 0], maj)          # one number per labelled tick
    np.testing.assert_allclose(labels[:, 1], labels[:, 0])  # ... naming its own depth
    ticks, md_labels = scale_marks(fig, "other")            # MD scale: its own round values
    assert len(md_labels) >= 3
    np.testing.assert_allclose(np.mod(md_labels[:, 1], major), 0.0, atol=1e-9)
    np.testing.assert_allclose(np.diff(md_labels[:, 1]), major)
    np.testing.assert_allclose(ticks, md_labels[:, 0])
    scale = FOOT_M if units == "field" else 1.0
    np.testing.assert_allclose(md_labels[:, 0], (md_labels[:, 1] * scale - 25.0) / scale)


def test_md_scale_on_a_deviated_well():
    """60 degree hole (TVDSS = 1000 m + (MD - 1500 m) cos 60 = 1000 + (MD - 1500) / 2, worked
    by hand): the MD number m sits at plot TVDSS 1000 + (m - 1500) / 2, so the MD labels
    (the same step of 50 m, on MD) are half as far apart on the page as the TVDSS labels."""
    md = 1500.0 + 0.5 * np.arange(1200)
    fig = drawn(plots.track_plot(make_result(tvdss=1000.0 + (md - 1500.0) * 0.5, zones=[]),
                                 interval="all"))
    _, tv_labels = scale_marks(fig, "main")
    _, md_labels = scale_marks(fig, "other")
    assert len(md_labels) >= 3
    np.testing.assert_allclose(md_labels[:, 0], 1000.0 + (md_labels[:, 1] - 1500.0) / 2.0)
    np.testing.assert_allclose(np.diff(md_labels[:, 0]), 0.5 * np.diff(tv_labels[:, 0])[0])
    assert md_labels[:, 1].min() >= md.min() and md_labels[:, 1].max() <= md.max()


def test_depth_ticks_grow_when_labels_would_crowd():
    # 10,000 m on 10 inch: labels every 50 m would be 0.05 inch apart; the step grows by
    # 10 to 500 m (0.5 inch, the first of x2, x5, x10 at or above 0.3 inch): worked by hand
    assert depth_ticks("metric", 10_000.0, 10.0) == (100.0, 500.0)
    assert depth_ticks("metric", 400.0, 16.0) == (10.0, 50.0)
    assert depth_ticks("field", 1000.0, 16.0) == (50.0, 100.0)


def test_main_scale_is_tvdss_with_md_beside_it_labelled_md():
    fig = plots.track_plot(make_result())
    assert fig.axes[0].get_ylabel() == "TVDSS [m]"
    assert other_scale_name(fig) == "MD [m]"


# ------------------------------------------------------------------- interval shown


def test_default_shows_the_zones_and_levels_with_20_m_margin():
    """Zones at TVDSS 1525-1655 and 1695-1995 m, FWLs 1675 and 1925 m, log 1475-2074.5 m
    (make_result: MD 1500 + 0.5 i, datum 25 m): window 1525 - 20 to 1995 + 20 m."""
    fig = plots.track_plot(make_result())
    assert fig.axes[0].get_ylim() == pytest.approx((2015.0, 1505.0))
    whole = plots.track_plot(make_result(), interval="all")
    assert whole.axes[0].get_ylim() == pytest.approx((2074.5, 1475.0))
    # MD axis: the same window in MD (vertical well: MD = TVDSS + 25 m)
    md = plots.track_plot(make_result(), depth_axis="md")
    assert md.axes[0].get_ylim() == pytest.approx((2040.0, 1530.0))


def test_no_zones_shows_the_whole_log():
    res = make_result()
    res.zones = []
    res.shm.zone[:] = -1
    assert plots.track_plot(res).axes[0].get_ylim() == pytest.approx((2074.5, 1475.0))


# --------------------------------------------------------------------- saturation


def test_log_sw_is_drawn_over_the_thicker_shm_sw_and_the_gap_is_shaded():
    fig = plots.track_plot(make_result(), interval="all")
    shm, log = line_labelled(fig, "SHM Sw"), line_labelled(fig, "Log Sw")
    assert log.get_zorder() > shm.get_zorder()
    assert shm.get_linewidth() > log.get_linewidth()
    labels = legend_labels(fig)
    assert "Log Sw above SHM Sw" in labels and "Log Sw below SHM Sw" in labels
    sw_ax = shm.axes
    fills = [c for c in [*sw_ax.collections, *sw_ax.patches]
             if c.get_alpha() is not None and c.get_alpha() >= 0.6]
    assert len(fills) >= 2              # both gap fills, clearly opaque


def test_same_j_scale_in_every_well():
    a = make_result()
    b = make_result(seed=3)
    b.shm.j[:] = a.shm.j * 1000.0      # a well with J three decades higher
    lims = []
    for res in (a, b):
        fig = plots.track_plot(res)
        (j_ax,) = [ax for ax in fig.axes if ax.get_xlabel() == "J [-]"]
        lims.append(j_ax.get_xlim())
    assert lims[0] == pytest.approx(lims[1])
    assert lims[0] == pytest.approx((1e-3, 1e2))   # the plot's stated fixed J scale


# ----------------------------------------------------------------- measured points


def test_core_plug_sw_and_pressures_on_their_tracks():
    res = make_result(datum=25.0)
    core = DepthPoints(depth=np.array([1600.0, 1750.0]), value=np.array([0.3, 0.6]),
                       reference="md", label="Core $plug$ Sw")
    press = DepthPoints(depth=np.array([1600.0, 1700.0]), value=np.array([18.0e6, 18.2e6]),
                        reference="tvdss")
    fig = plots.track_plot(res, core_sw=core, pressures=press)
    marks = [ln for ax in fig.axes for ln in ax.get_lines() if ln.get_linestyle() == "None"]
    assert len(marks) == 2
    by_len = {tuple(np.round(np.asarray(ln.get_xdata(), float), 6)): ln for ln in marks}
    core_line = by_len[(0.3, 0.6)]
    # vertical well: TVDSS = MD - datum (make_result)
    np.testing.assert_allclose(core_line.get_ydata(), [1575.0, 1725.0])
    p_line = by_len[tuple(np.round(np.array([18.0e6, 18.2e6]) / KPA, 6))]   # Pa -> kPa (SI)
    np.testing.assert_allclose(p_line.get_ydata(), [1600.0, 1700.0])
    assert "Pressure [kPa]" in [ax.get_xlabel() for ax in fig.axes]
    assert "Core \\$plug\\$ Sw" in legend_labels(fig)


# ------------------------------------------------------------------ page and text


def test_a4_page_size():
    fig = plots.track_plot(make_result(), page="a4")
    np.testing.assert_allclose(fig.get_size_inches(), A4_INCH)
    for ax in fig.axes:                       # every track inside the page
        x0, _, x1, _ = ax.get_position().extents
        assert 0.0 <= x0 < x1 <= 1.0


def test_odd_names_are_escaped_everywhere():
    zones = [zone("Z$\\alpha$\nB", 1500.0, 1700.0, 1650.0)]
    res = make_result(name="W$1$\tnew\nline", zones=zones)
    res.well.curves["Gr"].mnemonic = "G$r$\n"
    res.sw_log_source = "curve:S$W$\n"
    fig = drawn(plots.track_plot(res))
    texts = all_texts(fig) + legend_labels(fig) + [ax.get_xlabel() for ax in fig.axes]
    for t in texts:
        assert "\n" not in t and "\t" not in t
        assert not cbook.is_math_text(t), t
    assert "W\\$1\\$ new line" in texts


# --------------------------------------------------------------------- long wells


def test_long_well_is_thinned_and_keeps_its_spike():
    n = 300_000
    res = make_result(n=n, step=0.002)
    res.well.curves["Gr"].data[123_457] = 199.0   # one-sample spike (invented)
    res.well.curves["Gr"].data[123_458:123_460] = 10.0
    fig = plots.track_plot(res, interval="all")
    (gr_ax,) = [ax for ax in fig.axes if ax.get_xlabel().startswith("Gr")]
    gr = max(gr_ax.get_lines(), key=lambda ln: len(ln.get_xdata()))   # not the level lines
    x = np.asarray(gr.get_xdata())
    assert x.size < n / 10
    assert np.nanmax(x) == 199.0 and np.nanmin(x) == pytest.approx(
        np.nanmin(res.well.curves["Gr"].data))
