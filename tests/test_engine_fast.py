"""The segment form of the engine (compute_shm) against the plain mask form.

Both are our own code: the check is that they give the same numbers, bit for bit,
on random wells with shuffled depths, overlapping zones, missing values, samples
below the FWL and J outside the calibrated range. No value is hard-coded.
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


def same(a, b):
    for name in ("zone", "hafwl", "pc", "j", "sw", "flag"):
        x, y = getattr(a, name), getattr(b, name)
        assert x.dtype == y.dtype, name
        np.testing.assert_array_equal(x, y, err_msg=name)


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
    fast, ref = compute_shm(z, phi, k, zones), compute_shm_masks(z, phi, k, zones)
    same(fast, ref)
    assert (fast.flag != 0).any() and (fast.zone == 1).any() and (fast.sw == 1.0).any()


def test_no_zones_and_empty_input():
    z = np.linspace(1000, 1100, 7)
    same(compute_shm(z, np.full(7, 0.2), np.full(7, 1e-13), []),
         compute_shm_masks(z, np.full(7, 0.2), np.full(7, 1e-13), []))
    e = np.array([])
    same(compute_shm(e, e, e, zones_for(None)), compute_shm_masks(e, e, e, zones_for(None)))


def test_inputs_not_modified():
    rng = np.random.default_rng(5)
    z = rng.uniform(950, 1450, 300)
    phi, k = rng.uniform(0, 0.3, 300), rng.uniform(0, 1e-12, 300)
    before = [a.copy() for a in (z, phi, k)]
    compute_shm(z, phi, k, zones_for(rng))
    for a, b in zip((z, phi, k), before):
        np.testing.assert_array_equal(a, b)
