"""Engine behaviour: zones, heights, Pc, J, Sw and flags on synthetic columns."""

import numpy as np
import pytest

from satheight import constants as C
from satheight.engine import ZoneModel, assign_zones, compute_shm, leverett_j
from satheight.models import build_function
from satheight.results import (FLAG_BAD_PERMEABILITY, FLAG_BAD_POROSITY, FLAG_J_ABOVE_RANGE,
                               FLAG_J_BELOW_RANGE, FLAG_NO_ZONE)


def zone(name="A", top=1000.0, base=1200.0, fwl=1150.0, rho_w=1080.0, rho_h=780.0, sct=0.026,
         family="power_law", params=None, j_range=None):
    params = params or {"swirr": 0.1, "a": 0.2, "b": 1.5}
    return ZoneModel(name, top, base, fwl, rho_w, rho_h, "oil", sct,
                     build_function(family, params, j_range))


def test_sw_one_below_fwl_and_decreasing_above():
    z = np.arange(1000.0, 1200.0, 0.1524)
    phi = np.full(z.size, 0.22)
    k = np.full(z.size, 150 * C.MILLIDARCY)
    r = compute_shm(z, phi, k, [zone()])
    below = z >= 1150.0
    # closed form: at and below the FWL Sw = 1 and Pc = 0 exactly (no arithmetic)
    assert np.all(r.sw[below] == 1.0)
    assert np.all(r.pc[below] == 0.0)
    # constant k/phi: Sw non-increasing with height (common practice: drainage profile)
    above = ~below
    sw_up = r.sw[above][::-1]  # from FWL upward
    assert np.all(np.diff(sw_up) <= 1e-15)
    assert r.sw[0] < 0.5


def test_pc_over_height_is_delta_rho_g():
    # Pc = (rho_w - rho_h) g h (hydrostatics, tiab2004; common practice)
    z = np.linspace(1000, 1149, 50)
    r = compute_shm(z, np.full(50, 0.2), np.full(50, 1e-13), [zone()])
    # closed form: (1080 - 780) kg/m3 * g (cgpm1901)
    assert r.pc / r.hafwl == pytest.approx(np.full(50, 300.0 * C.STANDARD_GRAVITY), rel=1e-12)
    # leverett1941 written out: J = 300 g (1150 - z) sqrt(1e-13 / 0.2) / 0.026
    assert r.j == pytest.approx(300.0 * 9.80665 * (1150.0 - z) * np.sqrt(1e-13 / 0.2) / 0.026, rel=1e-12)


def test_bad_porosity_and_permeability_flagged_nan():
    z = np.array([1100.0, 1100.0, 1100.0, 1100.0, 1100.0, 1100.0])
    phi = np.array([0.2, np.nan, 0.0, -0.1, 1.5, 0.2])
    k = np.array([1e-13, 1e-13, 1e-13, 1e-13, 1e-13, 0.0])
    r = compute_shm(z, phi, k, [zone()])
    # the flag rules of satheight.results (porosity in (0, 1], permeability > 0)
    # README (Bad input, Values): porosity outside (0, 1] flagged 2, permeability <= 0 flagged 4
    assert np.isfinite(r.sw[0]) and r.flag[0] == 0
    assert np.all(np.isnan(r.sw[1:]))
    assert np.all(r.flag[1:5] & FLAG_BAD_POROSITY)
    assert r.flag[5] & FLAG_BAD_PERMEABILITY


def test_outside_zones_and_multi_zone():
    z = np.array([900.0, 1100.0, 1250.0, 1350.0, 1500.0])
    zones = [zone("A"), zone("B", top=1300.0, base=1400.0, fwl=1340.0, rho_h=200.0, sct=0.05,
                          family="brooks_corey", params={"swirr": 0.05, "jd": 0.3, "lam": 2.0})]
    r = compute_shm(z, np.full(5, 0.2), np.full(5, 1e-13), zones)
    # closed form: the windows given (A 1000-1200, B 1300-1400); heights FWL - z
    assert list(r.zone) == [-1, 0, -1, 1, -1]
    assert np.isnan(r.sw[[0, 2, 4]]).all()
    assert np.all(r.flag[[0, 2, 4]] == FLAG_NO_ZONE)
    assert r.sw[3] == 1.0  # below gas FWL
    assert r.hafwl[1] == pytest.approx(50.0) and r.hafwl[3] == pytest.approx(-10.0)


def test_j_range_flags_extrapolation():
    z = np.array([1000.0, 1140.0, 1149.9])
    r = compute_shm(z, np.full(3, 0.2), np.full(3, 1e-13), [zone(j_range=(0.05, 1.0))])
    # closed form: J at 150 m and 0.1 m above the FWL vs the range (0.05, 1) given
    # (J = 300 g h sqrt(1e-13/0.2)/0.026: 12.6 and 0.0084)
    assert r.flag[0] & FLAG_J_ABOVE_RANGE
    assert r.flag[1] == 0 or r.flag[1] & FLAG_J_BELOW_RANGE == 0
    assert r.flag[2] & FLAG_J_BELOW_RANGE
    assert np.isfinite(r.sw).all()


def test_assign_zones_top_inclusive_base_exclusive():
    zones = [zone("A", top=10, base=20), zone("B", top=20, base=30)]
    # closed form: top inclusive, base exclusive (README convention)
    assert list(assign_zones([9.99, 10, 19.99, 20, 30], zones)) == [-1, 0, 0, 1, -1]


def test_inputs_not_modified():
    z = np.linspace(1000, 1190, 20)
    phi = np.full(20, 0.2); phi[3] = np.nan
    k = np.full(20, 1e-13)
    copies = [a.copy() for a in (z, phi, k)]
    compute_shm(z, phi, k, [zone()])
    for a, b in zip((z, phi, k), copies):
        # common practice (the project's rule): inputs are never modified
        np.testing.assert_array_equal(a, b)
