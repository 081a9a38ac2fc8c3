"""Minimum-curvature trajectory against closed-form cases.

Reference values: sawaryn2005 (Sawaryn & Thorogood 2005, SPE 84246; equations from memory) and circle geometry computed here from first principles.
"""

import math
import warnings

import numpy as np
import pytest

from satheight.errors import DepthError
from satheight.trajectory import (direction_vectors, dogleg, interpolate, minimum_curvature,
                                  ratio_factor, vertical)

FT = 0.3048  # international foot [m], NIST SP 811
R_BUILD_FT = 1909.859  # radius of a 3 deg/100 ft build: 100 / (3 pi/180) ft (sawaryn2005; circle geometry, computed by hand)


def _build_survey(step_ft):
    md = np.unique(np.r_[np.arange(0.0, 3000.0, step_ft), 3000.0])
    inc = np.radians(md * 3.0 / 100.0)
    return md * FT, inc, np.zeros_like(md)


def test_vertical_well():
    # sawaryn2005 / closed form: vertical well, TVD = MD
    md = np.array([0.0, 250.0, 1000.0, 2500.0])
    tr = minimum_curvature(md, np.zeros(4), np.zeros(4))
    np.testing.assert_allclose(tr.tvd, md, atol=1e-12)
    # closed form: no inclination, no horizontal offset
    np.testing.assert_allclose(tr.north, 0.0, atol=1e-12)
    samples = np.linspace(0.0, 2500.0, 777)
    tvd, n, e = tr.at(samples)
    # closed form: between stations too, TVD = MD
    np.testing.assert_allclose(tvd, samples, atol=1e-9)
    assert np.all(n == 0) and np.all(e == 0)
    vt, vn, ve = vertical(samples)
    # closed form: the vertical-well shortcut is TVD = MD exactly (a copy, no arithmetic)
    np.testing.assert_array_equal(vt, samples)
    assert np.all(vn == 0) and np.all(ve == 0)


@pytest.mark.parametrize("step_ft", [3000.0, 1000.0, 100.0, 30.0, 7.0])
def test_constant_build_any_spacing(step_ft):
    # closed form (circle of radius R_BUILD_FT): 3 deg/100 ft from 0 to 90 deg over 3000 ft: TVD = displacement = 1909.859 ft
    md, inc, azi = _build_survey(step_ft)
    tr = minimum_curvature(md, inc, azi)
    assert tr.tvd[-1] / FT == pytest.approx(R_BUILD_FT, abs=1e-3)
    assert tr.north[-1] / FT == pytest.approx(R_BUILD_FT, abs=1e-3)
    # closed form: azimuth 0 keeps the well in the north-vertical plane
    assert abs(tr.east[-1]) < 1e-9
    # closed form: R sin 30, R (1 - cos 30): at MD 1000 ft (30 deg): TVD 954.930, displacement 255.873 ft,
    # here between stations (interpolated on the arc) whenever 1000 ft is not a station
    tvd, n, _ = tr.at(np.array([1000.0 * FT]))
    assert tvd[0] / FT == pytest.approx(954.930, abs=1e-3)
    assert n[0] / FT == pytest.approx(255.873, abs=1e-3)


def test_build_tells_minimum_curvature_from_balanced_tangential():
    # computed by hand (sawaryn2005 methods): balanced tangential with 100 ft stations gives TVD 1909.423 ft at 90 deg
    md, inc, azi = _build_survey(100.0)
    bt = np.sum(0.5 * np.diff(md) * (np.cos(inc[:-1]) + np.cos(inc[1:]))) / FT
    assert bt == pytest.approx(1909.423, abs=1e-3)
    # closed form (circle): R_BUILD_FT; the two methods differ by 0.44 ft (computed above)
    mc = minimum_curvature(md, inc, azi).tvd[-1] / FT
    assert mc == pytest.approx(R_BUILD_FT, abs=1e-3)
    assert abs(mc - bt) > 0.4


def test_horizontal_turn():
    # closed form (quarter circle of radius 1000 ft): I = 90 deg, azimuth 0 -> 90 deg over MD 1570.796 ft: N = E = 1000, dTVD = 0
    L = 1000.0 * math.pi / 2
    tr = minimum_curvature([0.0, L], np.radians([90.0, 90.0]), np.radians([0.0, 90.0]))
    assert tr.north[-1] == pytest.approx(1000.0, abs=1e-6)
    assert tr.east[-1] == pytest.approx(1000.0, abs=1e-6)
    assert abs(tr.tvd[-1]) < 1e-9
    # halfway along the arc (45 deg of turn), circle geometry (computed):
    # N = R sin 45, E = R (1 - cos 45)
    tvd, n, e = tr.at(np.array([L / 2]))
    assert n[0] == pytest.approx(1000.0 * math.sin(math.pi / 4), abs=1e-6)
    assert e[0] == pytest.approx(1000.0 * (1 - math.cos(math.pi / 4)), abs=1e-6)
    # closed form: a horizontal turn stays at TVD 0
    assert abs(tvd[0]) < 1e-9


def test_hold_45():
    # closed form (1000 cos 45): hold 45 deg, dTVD = 707.107 per 1000 ft
    tr = minimum_curvature([0.0, 1000.0, 3000.0], np.radians([45.0] * 3), np.radians([30.0] * 3))
    assert tr.tvd[1] == pytest.approx(707.107, abs=1e-3)
    # closed form (2000 cos 45)
    assert tr.tvd[2] - tr.tvd[1] == pytest.approx(2 * 707.107, abs=2e-3)
    tvd, n, e = tr.at(np.array([500.0, 2000.0]))
    # closed form: 500 cos 45 and 2000 cos 45 (computed by hand)
    np.testing.assert_allclose(tvd, [353.5534, 1414.2136], atol=1e-4)
    # horizontal offset along azimuth 30 deg (computed: 1000 sin 45 cos 30, sin 30)
    assert n[1] == pytest.approx(2000 * math.sin(math.pi / 4) * math.cos(math.pi / 6), abs=1e-9)
    assert e[1] == pytest.approx(2000 * math.sin(math.pi / 4) * math.sin(math.pi / 6), abs=1e-9)


def _circle(s, kappa, t0, n0):
    """Closed-form circular arc from the origin (computed): tangent and position at length s."""
    ks = kappa * s[:, None]
    t = np.cos(ks) * t0 + np.sin(ks) * n0
    r = (np.sin(ks) * t0 + (1 - np.cos(ks)) * n0) / kappa
    return t, r


@pytest.mark.parametrize("station_step", [600.0, 150.0, 37.0])
def test_arc_in_3d_independent_of_spacing_between_stations(station_step):
    # a circular arc that builds and turns at once; stations taken on the exact arc,
    # samples between them must lie on the same arc whatever the station spacing
    t0 = direction_vectors(math.radians(20.0), math.radians(40.0))
    side = np.cross(t0, [0.0, 0.0, 1.0])
    n0 = np.cross(side, t0) * 0.6 + side / np.linalg.norm(side) * 0.8
    n0 -= t0 * np.dot(n0, t0)
    n0 /= np.linalg.norm(n0)
    kappa = math.radians(2.5) / 30.0   # 2.5 deg per 30 m
    md = np.unique(np.r_[np.arange(0.0, 1200.0, station_step), 1200.0])
    t, _ = _circle(md, kappa, t0, n0)
    inc = np.arccos(np.clip(t[:, 2], -1, 1))
    azi = np.mod(np.arctan2(t[:, 1], t[:, 0]), 2 * np.pi)
    tr = minimum_curvature(md, inc, azi)
    samples = np.linspace(0.0, 1200.0, 4001)
    tvd, n, e = interpolate(tr, samples)
    _, r = _circle(samples, kappa, t0, n0)
    # closed form (_circle, worked in its docstring): positions on the exact arc;
    # atol 1e-7 m: a few hundred rounding steps of 1e-16 relative on 1200 m, far below a survey's precision
    np.testing.assert_allclose(n, r[:, 0], atol=1e-7)
    np.testing.assert_allclose(e, r[:, 1], atol=1e-7)
    np.testing.assert_allclose(tvd, r[:, 2], atol=1e-7)


def test_not_linear_interpolation_between_stations():
    # one 3000 ft build interval: linear interpolation of TVD at 1000 ft would give 636.6 ft,
    # the arc gives 954.930 ft (closed form R sin 30)
    md, inc, azi = _build_survey(3000.0)
    tr = minimum_curvature(md, inc, azi)
    lin = np.interp(1000.0 * FT, tr.md, tr.tvd) / FT
    arc = tr.at(np.array([1000.0 * FT]))[0][0] / FT
    assert arc == pytest.approx(954.930, abs=1e-3)
    # closed form: R sin 30 = 954.930 vs the chord's 636.6 (computed by hand)
    assert abs(arc - lin) > 100


def test_zero_dogleg_without_division():
    md = np.array([0.0, 100.0, 200.0, 300.0])
    inc = np.radians([0.0, 0.0, 10.0, 10.0])
    azi = np.radians([0.0, 0.0, 50.0, 50.0])
    with np.errstate(all="raise"), warnings.catch_warnings():
        warnings.simplefilter("error")
        tr = minimum_curvature(md, inc, azi)
        tvd, n, e = tr.at(np.linspace(0.0, 300.0, 301))
    # closed form: RF(0) = 1, nothing divides by the zero dogleg
    assert np.all(np.isfinite(tvd) & np.isfinite(n) & np.isfinite(e))
    # straight 10-deg segment 200 -> 300 m: dTVD = 100 cos 10 (computed)
    assert tr.tvd[3] - tr.tvd[2] == pytest.approx(100 * math.cos(math.radians(10)), abs=1e-9)
    # closed form: the vertical top 100 m has TVD = MD
    np.testing.assert_allclose(tvd[:101], np.linspace(0.0, 100.0, 101), atol=1e-12)


def test_ratio_factor_series_matches_exact():
    # RF = tan(b/2)/(b/2) (Sawaryn & Thorogood 2005, from memory); the series must join the
    # exact form smoothly at its switch-over and give 1 at 0
    # closed form: lim tan(b/2)/(b/2) = 1 at b = 0 (sawaryn2005)
    assert ratio_factor(0.0) == 1.0
    for b in (1e-8, 1e-4, 0.0099, 0.0101, 0.3, 2.0):
        # closed form computed with the standard library's math.tan; rel 1e-14: both well
        # conditioned, the series is truncated where its next term is below 1e-16
        exact = math.tan(b / 2) / (b / 2)
        assert ratio_factor(b) == pytest.approx(exact, rel=1e-14)


def test_dogleg_small_and_large():
    t1 = direction_vectors(0.0, 0.0)
    for deg in (1e-6, 0.5, 90.0, 170.0):
        t2 = direction_vectors(math.radians(deg), 1.0)
        # closed form: the angle between directions (0, 0) and (deg, 1 rad) is deg (sawaryn2005 dogleg);
        # rel 1e-9: the chord form keeps ~1e-16 * 1/deg, far below 1e-9 even at 1e-6 deg
        assert dogleg(t1, t2) == pytest.approx(math.radians(deg), rel=1e-9)


def test_below_last_station_is_straight_and_warns():
    tr = minimum_curvature([0.0, 1000.0], np.radians([0.0, 30.0]), [0.0, 0.0])
    with pytest.warns(UserWarning, match="below the last survey station"):
        tvd, n, _ = tr.at(np.array([1100.0]))
    # closed form: straight 100 m at 30 deg: dTVD = 100 cos 30, dN = 100 sin 30
    assert tvd[0] - tr.tvd[-1] == pytest.approx(100 * math.cos(math.radians(30)), abs=1e-9)
    assert n[0] - tr.north[-1] == pytest.approx(100 * math.sin(math.radians(30)), abs=1e-9)


def test_above_first_station_is_an_error():
    tr = minimum_curvature([500.0, 1000.0], [0.0, 0.1], [0.0, 0.0], tie_in=(500.0, 0.0, 0.0),
                           source="s.csv")
    with pytest.raises(DepthError, match="above the first survey station") as ei:
        tr.at(np.array([400.0, 600.0]))
    # common practice (the project's error rule): errors name the file
    assert "s.csv" in str(ei.value)


def test_bad_station_sequences():
    with pytest.raises(DepthError, match="does not increase"):
        minimum_curvature([0.0, 100.0, 100.0], [0, 0, 0], [0, 0, 0], source="x.csv")
    with pytest.raises(DepthError, match="reverses"):
        minimum_curvature([0.0, 100.0], [0.0, math.pi], [0, 0])


def test_tie_in_offsets_positions_and_inputs_untouched():
    md = np.array([1000.0, 1500.0])
    inc = np.radians([10.0, 20.0])
    azi = np.radians([90.0, 90.0])
    keep = (md.copy(), inc.copy(), azi.copy())
    a = minimum_curvature(md, inc, azi)
    b = minimum_curvature(md, inc, azi, tie_in=(990.0, 5.0, -3.0))
    # closed form: a tie-in point translates every position by itself
    np.testing.assert_allclose(b.tvd - a.tvd, 990.0)
    np.testing.assert_allclose(b.north - a.north, 5.0)
    np.testing.assert_allclose(b.east - a.east, -3.0)
    for x, y in zip((md, inc, azi), keep):
        # common practice (the project's rule): inputs are never modified
        np.testing.assert_array_equal(x, y)


def test_nan_depths_give_nan():
    tr = minimum_curvature([0.0, 100.0], [0.0, 0.0], [0.0, 0.0])
    tvd, n, e = tr.at(np.array([np.nan, 50.0]))
    # closed form: NaN in, NaN out; vertical well TVD = MD
    assert np.isnan(tvd[0]) and tvd[1] == pytest.approx(50.0)
