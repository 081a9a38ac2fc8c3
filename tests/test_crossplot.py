"""Per-zone crossplot of log Sw against height above the FWL and J (satheight.plots.crossplot).

Wells here are invented: a vertical column with a power-law J-Sw model, built only
to check what the figure draws against values worked by hand.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest
from matplotlib import cbook
from matplotlib.figure import Figure

from satheight.engine import ZoneModel
from satheight.models.power_law import PowerLaw
from satheight.plots.crossplot import (CLASS_PERCENTILES, MINOR_TICKS_GID, CrossplotWell,
                                       class_roots, crossplot_data, model_curves, zone_crossplot)
from satheight.workflows.figures import save_figure

# standard gravity [m/s^2]: CGPM 1901 (3rd CGPM), exact.
G = 9.80665
# 1 ft = 0.3048 m exactly: NIST SP 811 (2008), App. B.
FOOT_M = 0.3048
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # PNG specification (ISO/IEC 15948:2004, 5.2)
# power law of the tests: Sw = swirr + (1 - swirr) a J^-b (Leverett 1941 form; leverett1941)
SWIRR, A, B = 0.1, 0.2, 1.5


def power_zone(name="Sand A", fwl=2000.0):
    """Oil zone: water 1000, oil 800 kg/m^3, sigma cos theta 0.025 N/m (invented)."""
    fn = PowerLaw.from_params({"swirr": SWIRR, "a": A, "b": B})
    return ZoneModel(name=name, top=1800.0, base=2100.0, fwl=fwl, water_density=1000.0,
                     hydrocarbon_density=800.0, hydrocarbon="oil", sigma_cos_theta=0.025,
                     function=fn)


def closed_form_sw(h, root):
    """Sw of the power law at height h [m] for sqrt(k/phi) = root [m].

    Pc = (1000 - 800) * 9.80665 * h [Pa]; J = Pc * root / 0.025;
    Sw = 0.1 + 0.9 * 0.2 * J^-1.5, clipped to [0, 1] (and 1 at h <= 0).
    Worked by hand at h = 10 m, root = sqrt(1e-13 / 0.25) = 6.32456e-7 m:
    Pc = 19613.3 Pa, J = 19613.3 * 6.32456e-7 / 0.025 = 0.496186,
    J^-1.5 = exp(1.5 * 0.700822) = 2.86114, Sw = 0.1 + 0.18 * 2.86114 = 0.615005.
    """
    h = np.asarray(h, float)
    j = 200.0 * G * h * root / 0.025
    with np.errstate(divide="ignore", invalid="ignore"):
        sw = np.clip(SWIRR + (1 - SWIRR) * A * j ** -B, 0.0, 1.0)
    return np.where(h > 0, sw, 1.0)


def test_closed_form_worked_value():
    # the docstring's hand calculation, so the helper itself is checked (worked by hand)
    assert closed_form_sw(10.0, np.sqrt(1e-13 / 0.25)) == pytest.approx(0.615005, abs=2e-6)


def test_model_curve_equals_closed_form_power_law():
    zone = power_zone()
    h = np.array([0.0, 5.0, 10.0, 50.0, 120.0])
    roots = np.array([np.sqrt(1e-13 / 0.25), np.sqrt(1e-12 / 0.25)])
    sw = model_curves(zone, roots, 0.25, h)
    assert sw.shape == (2, 5)
    for i, r in enumerate(roots):
        np.testing.assert_allclose(sw[i], closed_form_sw(h, r), rtol=1e-12, atol=1e-14)
    assert sw[0, 2] == pytest.approx(0.615005, abs=2e-6)  # worked by hand (docstring)


def make_well(name, root, n=400, seed=0, zone=None):
    """A vertical well through the zone, log Sw = model + noise (invented)."""
    zone = zone or power_zone()
    rng = np.random.default_rng(seed)
    tvdss = np.linspace(1850.0, 2050.0, n)
    h = zone.fwl - tvdss
    phi = np.full(n, 0.25)
    k = np.full(n, root ** 2 * 0.25)
    sw_log = np.clip(closed_form_sw(h, root) + rng.normal(0, 0.02, n), 0, 1)
    j = 200 * G * np.clip(h, 0, None) * root / 0.025
    shm = SimpleNamespace(zone=np.zeros(n, int), hafwl=h, j=j, sw=closed_form_sw(h, root))
    return SimpleNamespace(well=SimpleNamespace(name=name), zones=[zone], shm=shm, phi=phi, k=k,
                           sw_log=sw_log)


def lines_with_prefix(fig, prefix):
    return [ln for ax in fig.axes for ln in ax.get_lines()
            if str(ln.get_label()).startswith(prefix)]


def test_crossplot_draws_every_well_and_the_model_classes():
    zone = power_zone()
    roots = [np.sqrt(1e-14 / 0.25), np.sqrt(1e-13 / 0.25), np.sqrt(1e-12 / 0.25)]
    wells = [crossplot_data(make_well(f"W{i}", r, seed=i)) for i, r in enumerate(roots)]
    fig = zone_crossplot(zone, wells)
    assert isinstance(fig, Figure)
    ax_h, ax_j = fig.axes[:2]
    # one scatter per well in each panel, with the well's samples
    def scatters(ax):
        return [c for c in ax.collections if c.get_gid() != MINOR_TICKS_GID]
    assert len(scatters(ax_h)) == 3 and len(scatters(ax_j)) == 3
    offs = ax_h.collections[0].get_offsets()
    np.testing.assert_allclose(offs[:, 0], wells[0].sw_log)
    np.testing.assert_allclose(offs[:, 1], wells[0].hafwl)
    # model classes: P10, P50, P90 of the pooled sqrt(k/phi) (numpy.percentile, linear)
    pooled = np.concatenate([np.full(400, r) for r in roots])
    expected = np.percentile(pooled, CLASS_PERCENTILES)
    models = lines_with_prefix(fig, "Model")
    assert len(models) == 3
    for ln, r in zip(models, expected):
        h = np.asarray(ln.get_ydata(), float)
        np.testing.assert_allclose(ln.get_xdata(), closed_form_sw(h, r), rtol=1e-12, atol=1e-14)


def test_crossplot_height_in_feet():
    zone = power_zone()
    w = crossplot_data(make_well("A", np.sqrt(1e-13 / 0.25)))
    fig = zone_crossplot(zone, [w], units="field")
    ax_h = fig.axes[0]
    np.testing.assert_allclose(ax_h.collections[0].get_offsets()[:, 1], w.hafwl / FOOT_M)
    assert ax_h.get_ylabel() == "Height above FWL [ft]"
    (ln,) = lines_with_prefix(fig, "Model, P50")
    h_m = np.asarray(ln.get_ydata(), float) * FOOT_M
    np.testing.assert_allclose(ln.get_xdata(), closed_form_sw(h_m, np.sqrt(1e-13 / 0.25)),
                               rtol=1e-9, atol=1e-12)


def test_j_panel_draws_the_zone_function():
    zone = power_zone()
    fig = zone_crossplot(zone, [crossplot_data(make_well("A", np.sqrt(1e-13 / 0.25)))])
    ax_j = fig.axes[1]
    (ln,) = [ln for ln in ax_j.get_lines()]
    j = np.asarray(ln.get_ydata(), float)
    expected = np.clip(SWIRR + (1 - SWIRR) * A * j ** -B, 0, 1)  # the power law, closed form
    np.testing.assert_allclose(ln.get_xdata(), expected, rtol=1e-12)


def test_odd_names_are_drawn_as_written(tmp_path):
    zone = power_zone(name="Sand $\\alpha$\nlower")
    w = crossplot_data(make_well("W$1$\n2", np.sqrt(1e-13 / 0.25), zone=zone))
    fig = zone_crossplot(zone, [w])
    texts = [t.get_text() for t in fig.texts]
    texts += [t.get_text() for leg in fig.legends for t in leg.get_texts()]
    assert any("W\\$1\\$ 2" == t for t in texts)
    for t in texts:
        assert "\n" not in t and not cbook.is_math_text(t)
    assert save_figure(fig, tmp_path / "c.png")[0].read_bytes()[:8] == PNG_SIGNATURE


def test_no_log_sw_gives_no_data_and_class_roots_ignore_bad_samples():
    w = make_well("A", 1e-6)
    w.sw_log = None
    assert crossplot_data(w) is None
    cw = CrossplotWell("B", [power_zone("Z")], np.array([0, 0, 0, 0]), np.ones(4), np.ones(4), np.ones(4),
                       np.array([0.25, 0.0, np.nan, 0.25]), np.array([1e-13, 1e-13, 1e-13, -1]))
    roots = class_roots([cw], [np.ones(4, bool)])
    # only the first sample is usable: sqrt(1e-13 / 0.25) (computed)
    np.testing.assert_allclose(roots, np.sqrt(1e-13 / 0.25))


def test_run_writes_one_png_per_zone_with_safe_distinct_names(tmp_path):
    from satheight.workflows.figures import save_crossplots

    a, b = power_zone("Sand/A"), power_zone("Sand A")   # both become "Sand_A" in a file name
    wa = make_well("W1", np.sqrt(1e-13 / 0.25), zone=a)
    wb = make_well("W2", np.sqrt(1e-13 / 0.25), zone=b)
    files = save_crossplots([crossplot_data(wa), None, crossplot_data(wb)], tmp_path)
    assert [p.name for p in files] == ["crossplot_Sand_A.png", "crossplot_Sand_A_2.png"]
    for p in files:
        assert p.read_bytes()[:8] == PNG_SIGNATURE
    assert sorted(x.name for x in tmp_path.iterdir()) == [p.name for p in files]


def test_minor_ticks_of_the_j_scale_where_matplotlib_puts_them():
    """The J scale's minor ticks, drawn as one line collection, sit where matplotlib's own
    log-scale minor ticks of the same limits are (library: matplotlib, a fresh axes)."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure as Fig

    zone = power_zone()
    fig = zone_crossplot(zone, [crossplot_data(make_well("A", np.sqrt(1e-13 / 0.25)))])
    ax_j = fig.axes[1]
    (coll,) = [c for c in ax_j.collections if c.get_gid() == MINOR_TICKS_GID]
    got = np.sort([seg[0, 1] for seg in coll.get_segments()])
    ref_fig = Fig()
    FigureCanvasAgg(ref_fig)
    ref = ref_fig.add_axes(ax_j.get_position().bounds)
    ref.set_yscale("log")
    ref.set_ylim(ax_j.get_ylim())
    lo, hi = sorted(ax_j.get_ylim())
    want = np.asarray(ref.yaxis.get_minorticklocs())
    want = np.sort(want[(want >= lo) & (want <= hi)])
    assert got.size > 10
    np.testing.assert_allclose(got, want, rtol=1e-12)
