"""Comparison statistics and hydrocarbon pore thickness on hand-computed cases."""

import types

import numpy as np
import pytest

from satheight.compare import difference_stats, hydrocarbon_pore_thickness, sample_thickness, summarise
from satheight.constants import MILLIDARCY
from satheight.engine import Zone
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


def _result(phi, k_md, sw_shm, sw_log, sw_log_unclipped=None, **zone_extra):
    n = len(phi)
    tvdss = np.arange(n, dtype=float)
    zone = Zone("Z", 0.0, float(n), float(n), 1080.0, 780.0, "oil", 0.026,
                build_function("power_law", {"swirr": 0.1, "a": 0.2, "b": 1.0}), **zone_extra)
    shm = ShmResult(zone=np.zeros(n, dtype=int), hafwl=np.full(n, 10.0), pc=np.ones(n), j=np.ones(n),
                    sw=np.asarray(sw_shm, float), flag=np.zeros(n, dtype=int))
    well = types.SimpleNamespace(name="W", source="w.las", md=tvdss)
    raw = None if sw_log_unclipped is None else np.asarray(sw_log_unclipped, float)
    return WellResult(well=well, tvdss=tvdss, zones=[zone], shm=shm, phi=np.asarray(phi, float),
                      k=np.asarray(k_md, float) * MILLIDARCY, rt=None, sw_log=np.asarray(sw_log, float),
                      sw_log_source="archie", roles={}, sw_log_unclipped=raw)


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


def test_out_of_range_log_samples_are_left_out_of_statistics_and_volumes_and_counted():
    # porosity 1.5 (above 1 after unit handling) and k = -5 mD: outside plausible ranges
    # (porosity 0-0.6, k >= 0: common practice); the two good samples give by hand
    # mean (0.3-0.3 + 0.3-0.4)/2 = -0.05 and HCPT SHM 0.2*0.7*2 = 0.28
    r = _result([0.2, 1.5, 0.2, 0.2], [100, 100, -5, 100], [0.3, 1.0, 0.3, 0.3], [0.3, 0.2, 0.2, 0.4])
    z = summarise(r)["zones"]["Z"]
    assert z["samples_out_of_range"] == 2
    assert z["samples_compared"] == 2
    assert z["mean_difference"] == pytest.approx(-0.05)
    assert z["hcpt_oil_shm"] == pytest.approx(0.28)
    assert z["status"] == "ok"


def test_zone_without_a_usable_sample_is_not_computed_with_a_note():
    # an all-null porosity curve: no statistics and no volume (None, never 0.0), and the note
    # says where log Sw came from (here Archie on the resistivity curve)
    r = _result([np.nan] * 4, [100] * 4, [np.nan] * 4, [0.5] * 4)
    z = summarise(r)["zones"]["Z"]
    assert z["status"] == "not computed"
    assert z["hcpt_shm"] is None and z["hcpt_oil_shm"] is None and z["hcpt_oil_log"] is None
    assert "porosity" in z["note"] and "Archie" in z["note"]
    assert z["samples_compared"] == 0 and z["mean_difference"] is None


def test_statistics_use_unclipped_archie_sw_and_count_the_clipped_samples():
    # Archie 1.1 and 0.9 in the water leg (SHM Sw 1): unclipped mean difference
    # ((1 - 1.1) + (1 - 0.9)) / 2 = 0 by hand; clipped it would be +0.05 (the bias removed)
    r = _result([0.2, 0.2], [100, 100], [1.0, 1.0], [1.0, 0.9], sw_log_unclipped=[1.1, 0.9])
    z = summarise(r)["zones"]["Z"]
    assert z["mean_difference"] == pytest.approx(0.0, abs=1e-12)
    assert z["samples_sw_log_clipped"] == 1


def test_hcpt_is_reported_per_phase_never_oil_plus_gas():
    # gas cap over oil: GOL at TVDSS 2 -> samples 0, 1 in gas, 2, 3 in oil (phi 0.2, dh 1 m);
    # SHM Sw 0.2, 0.2 | 0.5, 0.5: gas 2*0.2*0.8 = 0.32, oil 2*0.2*0.5 = 0.20 (by hand)
    r = _result([0.2] * 4, [100] * 4, [0.2, 0.2, 0.5, 0.5], [0.2, 0.2, 0.5, 0.5],
                gas_oil_level=2.0, gas_density=200.0, gas_sigma_cos_theta=0.05)
    s = summarise(r)
    z, w = s["zones"]["Z"], s["whole_well"]
    assert z["hcpt_gas_shm"] == pytest.approx(0.32) and z["hcpt_oil_shm"] == pytest.approx(0.20)
    assert z["hcpt_shm"] is None                       # no oil+gas sum for a gas-cap zone
    assert w["hcpt_gas_log"] == pytest.approx(0.32) and w["hcpt_oil_log"] == pytest.approx(0.20)
    assert "hcpt_shm" not in w
