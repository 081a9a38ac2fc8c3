"""The engine's fast segment form (compute_shm) against the rules worked out sample by sample.

The reference, :func:`by_hand`, is written here in plain scalar arithmetic, one sample at a
time: zone windows (top inclusive, base exclusive, the first listed zone wins where
windows overlap), h = FWL - z, Pc = max((rho_w - rho_hc) g h, 0) (hydrostatics, tiab2004; g
cgpm1901), J = Pc sqrt(k / phi) / sigma cos theta (leverett1941), the family's equation (power
law; brooks1964), Sw = 1 at and below the FWL, and the flags of satheight.results. It runs on
random wells with shuffled depths, overlapping zones, missing values, samples below the FWL and
J outside the calibrated range. Integers (zone, flag) must match exactly; floats to rel 1e-12,
because numpy's vectorised pow and the scalar one may differ in the last digits by CPU.
"""

import numpy as np
import pytest

from satheight import constants as C
from satheight.engine import ZoneModel, compute_shm, compute_shm_masks
from satheight.models import build_function


def zones_for(rng):
    pl = build_function("power_law", {"swirr": 0.1, "a": 0.2, "b": 1.5}, (0.05, 3.0))
    bc = build_function("brooks_corey", {"swirr": 0.05, "jd": 0.3, "lam": 2.0}, None)
    return [ZoneModel("A", 1000.0, 1100.0, 1080.0, 1080.0, 780.0, "oil", 0.026, pl),
            ZoneModel("B", 1050.0, 1200.0, 1190.0, 1050.0, 200.0, "gas", 0.05, bc),   # overlaps A
            ZoneModel("C", 1250.0, 1250.0, 1300.0, 1050.0, 700.0, "oil", 0.03, pl),   # empty window
            ZoneModel("D", 1260.0, 1400.0, 1250.0, 1050.0, 700.0, "oil", 0.03, pl)]   # FWL above top


def _sw_by_hand(fn, j):
    """Sw of the two families used here (clipped to [0, 1]) and the J range flag bits."""
    p = fn.params_
    if fn.name == "power_law":                       # swirr + (1 - swirr) a J^-b
        sw = p["swirr"] + (1 - p["swirr"]) * p["a"] * j ** -p["b"]
    else:                                            # brooks1964 in J: 1 below the entry J
        sw = p["swirr"] + (1 - p["swirr"]) * (j / p["jd"]) ** -p["lam"] if j >= p["jd"] else 1.0
    bits = 0
    if fn.j_range_ is not None:
        bits |= 8 if j < fn.j_range_[0] else 0       # FLAG_J_BELOW_RANGE
        bits |= 16 if j > fn.j_range_[1] else 0      # FLAG_J_ABOVE_RANGE
    return min(max(sw, 0.0), 1.0), bits


def by_hand(tvdss, phi, k, zones):
    """The engine's rules, one sample at a time (see the module docstring)."""
    nan = float("nan")
    out = {name: [] for name in ("zone", "hafwl", "pc", "j", "sw", "flag")}
    for z, ph, kk in zip(tvdss, phi, k):
        i = next((q for q, zn in enumerate(zones) if zn.top <= z < zn.base), -1)
        if i < 0:                                    # FLAG_NO_ZONE
            row = (-1, nan, nan, nan, nan, 1)
        else:
            zn = zones[i]
            h = zn.fwl - z
            pc = max((zn.water_density - zn.hydrocarbon_density) * 9.80665 * h, 0.0)
            flag = (0 if 0 < ph <= 1 else 2) | (0 if kk > 0 else 4)   # bad porosity, permeability
            if h <= 0:
                j, sw = 0.0, 1.0
            elif flag:
                j, sw = nan, nan
            else:
                j = pc * np.sqrt(kk / ph) / zn.sigma_cos_theta
                sw, bits = _sw_by_hand(zn.function, j)
                flag |= bits
            row = (i, h, pc, j, sw, flag)
        for name, v in zip(out, row):
            out[name].append(v)
    return {name: np.asarray(v, dtype=np.int64 if name in ("zone", "flag") else float)
            for name, v in out.items()}


def same(a, b):
    for name in ("zone", "hafwl", "pc", "j", "sw", "flag"):
        x, y = getattr(a, name), b[name]
        # closed forms of by_hand (module docstring): integers exact, floats to rel 1e-12
        # (last-digit differences of pow between numpy's vector code and libm, by CPU)
        if name in ("zone", "flag"):
            np.testing.assert_array_equal(x, y, err_msg=name)
        else:
            np.testing.assert_allclose(x, y, rtol=1e-12, atol=0, equal_nan=True, err_msg=name)


@pytest.mark.parametrize("shuffle", [False, True])
@pytest.mark.parametrize("seed", [1, 2, 3])
def test_segments_equal_masks(seed, shuffle):
    rng = np.random.default_rng(seed)
    n = 5000
    z = np.sort(rng.uniform(950.0, 1450.0, n))
    z[rng.integers(0, n, 50)] = 1100.0                 # repeated depths on a zone boundary
    z = np.sort(z)
    phi = rng.uniform(-0.05, 1.1, n)
    phi[rng.random(n) < 0.05] = np.nan
    k = rng.uniform(-1.0, 2000.0, n) * C.MILLIDARCY
    k[rng.random(n) < 0.05] = np.nan
    if shuffle:
        p = rng.permutation(n)
        z, phi, k = z[p], phi[p], k[p]
        z[:3] = np.nan                                  # missing depths: in no zone
    zones = zones_for(rng)
    fast, ref = compute_shm(z, phi, k, zones), by_hand(z, phi, k, zones)
    same(fast, ref)
    # the mask form, which the engine uses for zones the segment code does not cover, obeys
    # the same rules (by_hand, closed forms)
    same(compute_shm_masks(z, phi, k, zones), ref)
    # coverage of the random well (closed form: its ranges reach every case): flags, the
    # overlapping zone, samples below a FWL
    assert (fast.flag != 0).any() and (fast.zone == 1).any() and (fast.sw == 1.0).any()


def test_no_zones_and_empty_input():
    z = np.linspace(1000, 1100, 7)
    same(compute_shm(z, np.full(7, 0.2), np.full(7, 1e-13), []),
         by_hand(z, np.full(7, 0.2), np.full(7, 1e-13), []))
    e = np.array([])
    same(compute_shm(e, e, e, zones_for(None)), by_hand(e, e, e, zones_for(None)))


def test_inputs_not_modified():
    rng = np.random.default_rng(5)
    z = rng.uniform(950, 1450, 300)
    phi, k = rng.uniform(0, 0.3, 300), rng.uniform(0, 1e-12, 300)
    before = [a.copy() for a in (z, phi, k)]
    compute_shm(z, phi, k, zones_for(rng))
    for a, b in zip((z, phi, k), before):
        # common practice (the project's rule): inputs are never modified
        np.testing.assert_array_equal(a, b)
