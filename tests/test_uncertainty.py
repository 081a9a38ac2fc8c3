"""Monte Carlo of the saturation-height model (satheight.uncertainty).

Every check compares with something outside the Monte Carlo code: the deterministic
engine (engine.compute_shm, an independent path), the comparison module's pore
thickness, closed forms worked in the docstrings, or scipy.stats.
"""

from __future__ import annotations

import dataclasses
import tracemalloc

import numpy as np
import pytest
from scipy import stats

from satheight.compare import hydrocarbon_pore_thickness, net_mask, sample_thickness
from satheight.constants import STANDARD_GRAVITY
from satheight.distributions import Distribution
from satheight.engine import ZoneModel, compute_shm
from satheight.errors import SatHeightError
from satheight.models import build_function
from satheight.models.base import JSwFunction
from satheight.random_fields import FieldStream, ar1_coefficients
from satheight.uncertainty import (LogError, MonteCarloSettings, ZoneUncertainty, monte_carlo,
                                   tornado)

MD = 9.869233e-16          # m^2 per millidarcy (NIST SP 811)


def _well(n=3000, seed=7):
    """An invented well: TVDSS 1900-2100 m, noisy porosity and permeability, two oil zones."""
    z = np.linspace(1900.0, 2100.0, n)
    rng = np.random.default_rng(seed)
    phi = np.clip(0.2 + 0.03 * rng.standard_normal(n), 0.02, 0.35)
    k = 10 ** (2 + 0.5 * rng.standard_normal(n)) * MD
    phi[10] = np.nan                       # an unusable sample above the FWL
    k[20] = 0.0
    pl = build_function("power_law", {"swirr": 0.1, "a": 0.2, "b": 1.5})
    sh = build_function("skelt_harrison", {"a": 0.85, "b": 12.0, "c": 0.0, "d": 1.5})
    zones = [ZoneModel("Upper", 1900.0, 2000.0, 2060.0, 1080.0, 750.0, "oil", 0.026, pl),
             ZoneModel("Lower", 2000.0, 2090.0, 2075.0, 1070.0, 200.0, "gas", 0.05, sh)]
    return z, phi, k, zones


def _zero_spread():
    """Every kind of input with a distribution of zero width."""
    return {"Upper": ZoneUncertainty(
                inputs={"fwl": Distribution("normal", sd=0.0),
                        "water_density": Distribution("uniform", low=1080.0, high=1080.0),
                        "hydrocarbon_density": Distribution("triangular", low=750.0, high=750.0),
                        "sigma_cos_theta": Distribution("truncated_normal", sd=0.0, low=0.02,
                                                        high=0.03),
                        "swirr": Distribution("normal", sd=0.0), "b": Distribution("normal", sd=0.0)},
                porosity_error=LogError(Distribution("normal", sd=0.0), 3.0),
                permeability_error=LogError(Distribution("normal", sd=0.0), 3.0)),
            "Lower": ZoneUncertainty(inputs={"fwl": Distribution("normal", sd=0.0),
                                             "a": Distribution("normal", sd=0.0)})}


def _spread():
    return {"Upper": ZoneUncertainty(
                inputs={"fwl": Distribution("normal", sd=5.0),
                        "swirr": Distribution("uniform", low=0.05, high=0.15),
                        "sigma_cos_theta": Distribution("triangular", low=0.02, high=0.032)},
                porosity_error=LogError(Distribution("normal", sd=0.01), 2.0),
                permeability_error=LogError(Distribution("normal", sd=0.2), 5.0)),
            "Lower": ZoneUncertainty(inputs={"fwl": Distribution("truncated_normal", sd=4.0,
                                                                 low=2068.0, high=2082.0)})}


def test_zero_spread_collapses_onto_the_deterministic_engine():
    # the independent path: engine.compute_shm on the same inputs (the deterministic model)
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)
    mc = monte_carlo(z, phi, k, zones, shm, _zero_spread(), MonteCarloSettings(realisations=40))
    for name, curve in mc.sw_percentiles.items():
        np.testing.assert_allclose(curve, shm.sw, rtol=0, atol=1e-12, equal_nan=True, err_msg=name)
    # and the pore thickness is the comparison module's sum(phi (1 - Sw) dh) over the zone
    dh = sample_thickness(z)
    for i, zn in enumerate(zones):
        m = (shm.zone == i) & np.isfinite(shm.sw) & np.isfinite(phi) & net_mask(phi, k)
        want = hydrocarbon_pore_thickness(phi[m], shm.sw[m], dh[m])
        np.testing.assert_allclose(mc.hcpt[zn.name], want, rtol=1e-12)


def test_percentiles_are_ordered_and_spread_where_inputs_vary():
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)
    mc = monte_carlo(z, phi, k, zones, shm, _spread(), MonteCarloSettings(realisations=300, seed=3))
    p10, p50, p90 = (mc.sw_percentiles[f"SW_P{p}"] for p in (10, 50, 90))
    ok = np.isfinite(p10)
    assert ok.sum() > 0.9 * z.size
    # order of percentiles (definition of a quantile)
    assert np.all(p10[ok] <= p50[ok]) and np.all(p50[ok] <= p90[ok])
    assert np.mean(p90[ok] - p10[ok] > 1e-3) > 0.5        # inputs with spread give a band
    assert np.all((p10[ok] >= 0) & (p90[ok] <= 1))
    d = mc.hcpt_distribution()
    for block in list(d["zones"].values()) + list(d["phases"].values()):
        # volume convention (spe_prms2018): P90 <= P50 <= P10
        assert block["P90"] <= block["P50"] <= block["P10"]
    np.testing.assert_allclose(d["phases"]["oil"]["mean"], mc.hcpt["Upper"].mean())
    # the well's distribution is of the realisation-wise sums (numpy percentile of the sum)
    total = mc.hcpt["Upper"] + mc.hcpt["Lower"]
    np.testing.assert_allclose(d["well"]["P90"], np.percentile(total, 10), rtol=1e-12)
    assert d["well"]["P90"] <= d["well"]["P50"] <= d["well"]["P10"]


class _Linear(JSwFunction):
    """Test family ``Sw = s0 - c J`` (linear in J), only used where it stays in (0, 1)."""

    name = "linear_test"
    param_names = ("s0", "c")
    bounds = {"s0": (0.0, 1.0), "c": (0.0, 10.0)}

    @staticmethod
    def equation(j, s0, c):
        return s0 - c * j


def test_normal_fwl_error_through_a_linear_model_gives_the_analytic_spread():
    """Closed form worked by hand.

    With constant porosity phi, permeability k, sigma*cos(theta) s and density difference
    d, ``J = d g (FWL - z) sqrt(k/phi) / s = K (FWL - z)`` and ``Sw = s0 - c K (FWL - z)``.
    With ``FWL ~ N(F, sigma^2)`` and no clipping, Sw at depth z is normal with mean
    ``s0 - c K (F - z)`` and standard deviation ``|dSw/dFWL| sigma = c K sigma``; its 10th
    and 90th percentiles are ``mean -+ 1.2816 c K sigma`` (standard normal quantile 0.9,
    scipy.stats.norm.ppf). Here phi = 0.25, k = 100 mD, s = 0.026 N/m, d = 300 kg/m^3,
    c = 0.01: K = 300 * 9.80665 * sqrt(9.869e-14 / 0.25) / 0.026 = 0.7110 per m, and
    Sw runs from 0.9 - 0.0071 * 10 = 0.829 to 0.9 - 0.0071 * 60 = 0.473 over 10-60 m
    above the FWL; FWL sd 2 m gives Sw sd 0.01422, far inside (0, 1).
    """
    n = 51
    z = np.linspace(2000.0, 2050.0, n)
    phi, k = np.full(n, 0.25), np.full(n, 100 * MD)
    fn = _Linear.from_params({"s0": 0.9, "c": 0.01})
    zones = [ZoneModel("Z", 1990.0, 2060.0, 2060.0, 1050.0, 750.0, "oil", 0.026, fn)]
    shm = compute_shm(z, phi, k, zones)
    sigma = 2.0
    unc = {"Z": ZoneUncertainty(inputs={"fwl": Distribution("normal", sd=sigma)})}
    R = 20000
    mc = monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=R, seed=11,
                                                                    memory_mb=1000))
    K = 300.0 * STANDARD_GRAVITY * np.sqrt(100 * MD / 0.25) / 0.026
    sd = 0.01 * K * sigma
    mean = 0.9 - 0.01 * K * (2060.0 - z)
    q = stats.norm.ppf(0.9)                       # 1.2816 (scipy.stats)
    # sample-quantile sd ~ sqrt(p (1-p) / R) / pdf(q) * sd = 0.012 sd (asymptotic, from memory)
    tol = 5 * 0.012 * sd
    np.testing.assert_allclose(mc.sw_percentiles["SW_P50"], mean, atol=tol)
    np.testing.assert_allclose(mc.sw_percentiles["SW_P10"], mean - q * sd, atol=tol)
    np.testing.assert_allclose(mc.sw_percentiles["SW_P90"], mean + q * sd, atol=tol)
    np.testing.assert_allclose(np.mean(mc.sw_percentiles["SW_P90"] - mc.sw_percentiles["SW_P10"]),
                               2 * q * sd, rtol=0.02)


def test_seeded_runs_are_bit_reproducible_and_chunking_does_not_change_a_bit():
    z, phi, k, zones = _well(n=2000)
    shm = compute_shm(z, phi, k, zones)
    runs = [monte_carlo(z, phi, k, zones, shm, _spread(),
                        MonteCarloSettings(realisations=200, seed=5, memory_mb=mb))
            for mb in (8.0, 8.0, 200.0)]
    assert runs[0].block_samples < z.size <= runs[2].block_samples   # many chunks vs one
    for other in runs[1:]:
        for name in runs[0].sw_percentiles:
            assert np.array_equal(runs[0].sw_percentiles[name], other.sw_percentiles[name],
                                  equal_nan=True)
        for zone in runs[0].hcpt:
            assert np.array_equal(runs[0].hcpt[zone], other.hcpt[zone])
    third = monte_carlo(z, phi, k, zones, shm, _spread(), MonteCarloSettings(realisations=200, seed=6))
    assert not np.array_equal(third.hcpt["Upper"], runs[0].hcpt["Upper"])


def test_a_realisation_does_not_depend_on_how_many_run():
    z, phi, k, zones = _well(n=1500)
    shm = compute_shm(z, phi, k, zones)
    few = monte_carlo(z, phi, k, zones, shm, _spread(), MonteCarloSettings(realisations=50, seed=9))
    many = monte_carlo(z, phi, k, zones, shm, _spread(), MonteCarloSettings(realisations=120, seed=9))
    for zone in few.hcpt:
        assert np.array_equal(few.hcpt[zone], many.hcpt[zone][:50])


def test_peak_memory_stays_under_the_stated_bound():
    """Bound stated in monte_carlo's notes: memory_mb for the working arrays, plus arrays of
    the well's length (taken here as 40 float64 per sample) and the generators (2 kB per
    realisation and stream, generous), measured with tracemalloc (numpy reports to it)."""
    z, phi, k, zones = _well(n=20000)
    shm = compute_shm(z, phi, k, zones)
    R, mb = 1000, 48.0
    bound = mb * 1e6 + 40 * 8 * z.size + 3 * 2000 * R
    tracemalloc.start()
    try:
        monte_carlo(z, phi, k, zones, shm, _spread(), MonteCarloSettings(realisations=R, seed=1,
                                                                         memory_mb=mb))
        peak = tracemalloc.get_traced_memory()[1]
    finally:
        tracemalloc.stop()
    assert peak < bound
    # the whole realisations x samples Sw matrix alone would be 160 MB
    assert peak < R * z.size * 8 / 2


def test_correlated_field_has_unit_variance_and_exponential_correlation():
    """Closed form: the field's covariance at lag dz is exp(-dz / L) (gillespie1996).

    Irregular spacing (0.1 to 0.5 m) over 256-sample blocks; 4000 realisations give
    sample correlations with sd about 1/sqrt(4000) = 0.016.
    """
    rng = np.random.default_rng(0)
    z = np.cumsum(rng.uniform(0.1, 0.5, 700))
    L = 3.0
    a = ar1_coefficients(z, np.full(z.size, L))
    g = FieldStream(1, 4000, a, 1).chunk(0, 512)
    g = np.concatenate([g, FieldStream(1, 4000, a, 1).chunk(0, 700)[:, 512:]], axis=1)
    np.testing.assert_allclose(g.var(axis=0).mean(), 1.0, atol=0.02)
    for i, j in ((100, 101), (100, 110), (250, 260), (255, 256), (500, 520)):
        r = np.corrcoef(g[:, i], g[:, j])[0, 1]
        assert abs(r - np.exp(-(z[j] - z[i]) / L)) < 0.06, (i, j)


@pytest.mark.parametrize("dist, ref", [
    (Distribution("normal", mean=2.0, sd=0.5), stats.norm(2.0, 0.5)),
    (Distribution("truncated_normal", mean=1.0, sd=2.0, low=0.0, high=3.0),
     stats.truncnorm(-0.5, 1.0, loc=1.0, scale=2.0)),
    (Distribution("triangular", low=1.0, mode=1.5, high=4.0), stats.triang(0.5 / 3.0, loc=1.0, scale=3.0)),
    (Distribution("uniform", low=-1.0, high=3.0), stats.uniform(-1.0, 4.0)),
])
def test_inverse_distribution_functions_match_scipy(dist, ref):
    q = np.array([1e-6, 0.1, 0.3, 0.5, 0.9, 0.999])
    np.testing.assert_allclose(dist.ppf(q), ref.ppf(q), rtol=1e-9, atol=1e-12)


def test_tornado_bar_is_the_engine_at_the_input_percentiles():
    """The FWL bar: HCPT from engine.compute_shm with the FWL at its 10th and 90th
    percentiles (scipy.stats.norm.ppf) and the swirr at its median, independent of the
    tornado's own path; a zero-width input gives no swing."""
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)
    unc = {"Upper": ZoneUncertainty(inputs={"fwl": Distribution("normal", sd=5.0),
                                            "swirr": Distribution("uniform", low=0.06, high=0.1),
                                            "b": Distribution("normal", sd=0.0)})}
    base, bars = tornado(z, phi, k, zones, shm, unc)
    dh = sample_thickness(z)

    def hcpt(zone):
        r = compute_shm(z, phi, k, [zone, zones[1]])
        m = (r.zone == 0) & np.isfinite(r.sw) & np.isfinite(phi)
        return hydrocarbon_pore_thickness(phi[m], r.sw[m], dh[m])

    lower = compute_shm(z, phi, k, zones)
    m1 = (lower.zone == 1) & np.isfinite(lower.sw) & np.isfinite(phi)
    ignored = hydrocarbon_pore_thickness(phi[m1], lower.sw[m1], dh[m1])   # no table: not counted
    assert ignored > 0
    mid = dataclasses.replace(zones[0], function=build_function(
        "power_law", {"swirr": 0.08, "a": 0.2, "b": 1.5}))
    np.testing.assert_allclose(base, hcpt(mid), rtol=1e-12)
    fwl_bar = [b for b in bars if b.input == "fwl"][0]
    for p, value, got in ((0.1, fwl_bar.value_low, fwl_bar.hcpt_low),
                          (0.9, fwl_bar.value_high, fwl_bar.hcpt_high)):
        np.testing.assert_allclose(value, 2060.0 + 5.0 * stats.norm.ppf(p), rtol=1e-12)
        np.testing.assert_allclose(got, hcpt(dataclasses.replace(mid, fwl=value)), rtol=1e-12)
    assert [b.swing for b in bars] == sorted((b.swing for b in bars), reverse=True)
    assert [b for b in bars if b.input == "b"][0].swing == 0.0


def test_what_the_monte_carlo_cannot_do_is_refused():
    z, phi, k, zones = _well(n=600)
    shm = compute_shm(z, phi, k, zones)
    cases = [
        ({"Upper": ZoneUncertainty(inputs={"swirr": Distribution("normal", sd=0.2)})}, "bounds"),
        ({"Upper": ZoneUncertainty(inputs={"sigma": Distribution("normal", sd=0.2)})}, "unknown"),
        ({"Upper": ZoneUncertainty(inputs={"hydrocarbon_density": Distribution(
            "uniform", low=700.0, high=1100.0)})}, "water density"),
        ({"Nowhere": ZoneUncertainty()}, "not in this well"),
        ({"Upper": ZoneUncertainty(inputs={"fwl": Distribution("triangular", low=2050.0, mode=2070.0,
                                                               high=2065.0)})}, "low"),
    ]
    for unc, words in cases:
        with pytest.raises(SatHeightError, match=words):
            monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=10))
    gas_cap = [dataclasses.replace(zones[0], gas_oil_level=2040.0, gas_density=200.0,
                                   gas_sigma_cos_theta=0.05), zones[1]]
    with pytest.raises(SatHeightError, match="two-phase"):
        monte_carlo(z, phi, k, gas_cap, compute_shm(z, phi, k, gas_cap),
                    {"Upper": ZoneUncertainty()}, MonteCarloSettings(realisations=10))
    with pytest.raises(SatHeightError, match="memory_mb"):
        monte_carlo(z, phi, k, zones, shm, _spread(),
                    MonteCarloSettings(realisations=100000, memory_mb=10))


def test_zone_inputs_are_shared_between_wells_and_log_errors_are_not():
    """Realisation r draws a zone's FWL from a stream keyed by the zone's name, and the log
    errors from streams keyed by the well's name. Two wells in one linear zone: each
    well's HCPT is then an exact linear function of the FWL draw (closed form of the test
    family), so with only the FWL uncertain the two wells' HCPT correlate with r = 1; with
    only an independent porosity error their correlation is near 0 (sd 1/sqrt(R))."""
    fn = _Linear.from_params({"s0": 0.9, "c": 0.01})
    zones = [ZoneModel("Z", 1990.0, 2060.0, 2060.0, 1050.0, 750.0, "oil", 0.026, fn)]

    def run(unc, z, name):
        phi, k = np.full(z.size, 0.25), np.full(z.size, 100 * MD)
        return monte_carlo(z, phi, k, zones, compute_shm(z, phi, k, zones), unc,
                           MonteCarloSettings(realisations=2000, seed=4), well=name).hcpt["Z"]

    fwl = {"Z": ZoneUncertainty(inputs={"fwl": Distribution("normal", sd=1.0)})}
    a = run(fwl, np.linspace(2000.0, 2010.0, 11), "A-1")
    b = run(fwl, np.linspace(2020.0, 2040.0, 31), "B-2")
    assert np.corrcoef(a, b)[0, 1] > 1 - 1e-9
    err = {"Z": ZoneUncertainty(porosity_error=LogError(Distribution("normal", sd=0.01), 100.0))}
    a = run(err, np.linspace(2000.0, 2010.0, 11), "A-1")
    b = run(err, np.linspace(2000.0, 2010.0, 11), "B-2")
    assert abs(np.corrcoef(a, b)[0, 1]) < 5 / np.sqrt(2000)
