"""Comparison statistics and hydrocarbon pore thickness on hand-computed cases."""

import types

import numpy as np
import pytest

from satheight.compare import difference_stats, hydrocarbon_pore_thickness, sample_thickness, summarise
from satheight.constants import MILLIDARCY
from satheight.models import build_function
from satheight.results import ShmResult, WellResult


def test_sample_thickness_uniform_and_uneven():
    # each interior sample stands for half the distance to each neighbour (common practice)
    assert sample_thickness([0.0, 1.0, 2.0, 3.0]) == pytest.approx([1.0, 1.0, 1.0, 1.0])
    assert sample_thickness([0.0, 1.0, 3.0]) == pytest.approx([1.0, 1.5, 2.0])


def test_hcpt_by_hand():
    # closed form by hand: sum(phi (1 - Sw) dh): 0.2*0.75*1 + 0.1*0.5*2 = 0.15 + 0.10 (NaN sample skipped)
    assert hydrocarbon_pore_thickness([0.2, 0.1, np.nan], [0.25, 0.5, 0.3], [1.0, 2.0, 1.0]) == pytest.approx(0.25)


def test_difference_stats_by_hand():
    s = difference_stats(np.array([0.3, 0.5, np.nan]), np.array([0.2, 0.7, 0.1]))
    # closed form by hand: differences 0.1 and -0.2 (NaN pair skipped): mean -0.05, rms sqrt(0.025)
    assert s["samples_compared"] == 2
    assert s["mean_difference"] == pytest.approx(-0.05)
    assert s["rms_difference"] == pytest.approx(np.sqrt((0.01 + 0.04) / 2))


def _result(phi, k_md, sw_shm, sw_log):
    n = len(phi)
    tvdss = np.arange(n, dtype=float)
    zone = types.SimpleNamespace(name="Z", top=0.0, base=float(n), fwl=float(n), hydrocarbon="oil",
                                 function=build_function("power_law", {"swirr": 0.1, "a": 0.2, "b": 1.0}))
    shm = ShmResult(zone=np.zeros(n, dtype=int), hafwl=np.full(n, 10.0), pc=np.ones(n), j=np.ones(n),
                    sw=np.asarray(sw_shm, float), flag=np.zeros(n, dtype=int))
    well = types.SimpleNamespace(name="W", source="w.las", md=tvdss)
    return WellResult(well=well, tvdss=tvdss, zones=[zone], shm=shm, phi=np.asarray(phi, float),
                      k=np.asarray(k_md, float) * MILLIDARCY, rt=None, sw_log=np.asarray(sw_log, float),
                      sw_log_source="archie", roles={})


def test_cutoffs_leave_out_tight_samples():
    r = _result([0.2, 0.2, 0.05, 0.2], [100, 100, 100, 0.01], [0.3, 0.3, 0.9, 0.9], [0.3, 0.4, 1.0, 1.0])
    s_all = summarise(r)
    s_net = summarise(r, min_porosity=0.1, min_permeability=1 * MILLIDARCY)
    # closed form by hand: samples 3 (phi 0.05) and 4 (0.01 mD) fail the cutoffs; the net pair
    # differs by 0 and -0.1: mean -0.05
    assert s_all["zones"]["Z"]["samples_compared"] == 4
    assert s_net["zones"]["Z"]["samples_compared"] == 2
    assert s_net["zones"]["Z"]["samples_net"] == 2
    assert s_net["zones"]["Z"]["mean_difference"] == pytest.approx(-0.05)
    # closed form by hand: HCPT over the net samples only: 0.2*0.7 + 0.2*0.7 (SHM); 0.2*0.7 + 0.2*0.6 (log)
    assert s_net["zones"]["Z"]["hcpt_shm"] == pytest.approx(0.28)
    assert s_net["zones"]["Z"]["hcpt_log"] == pytest.approx(0.26)
    assert s_net["whole_well"]["samples"] == 4
