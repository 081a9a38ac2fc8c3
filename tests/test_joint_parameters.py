"""J-Sw parameters drawn together from a covariance (satheight.distributions.JointNormal),
its project-file keys, the covariance the model file records, and its use in the Monte Carlo.

Checks are against scipy.stats.multivariate_normal and scipy.stats.norm (library: scipy),
the sampling variances of a sample mean, covariance and quantile (anderson2003, recalled
from memory; closed forms worked beside each check), scipy.optimize.curve_fit's own
covariance (library: scipy), and the deterministic engine (engine.compute_shm).
"""

from __future__ import annotations

import dataclasses
import json
import re
import shutil
from pathlib import Path

import numpy as np
import pytest
from scipy import stats

from satheight.distributions import Distribution, JointNormal
from satheight.engine import ZoneModel, compute_shm
from satheight.errors import ProjectFileError, SatHeightError
from satheight.io.model_file import load_models, models_to_dict, save_models
from satheight.models import build_function
from satheight.models.base import JSwFunction
from satheight.models.power_law import PowerLaw
from satheight.project.reader import load_project as parse_project
from satheight.rocktypes import RockTypeRule
from satheight.uncertainty import MonteCarloSettings, ZoneUncertainty, monte_carlo, tornado

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
MD = 9.869233e-16          # m^2 per millidarcy (nist2008)
# an invented covariance of (swirr, a, b) with strong correlations, as a fit gives them
SD = np.array([0.01, 0.02, 0.05])
CORR = np.array([[1.0, -0.6, 0.5], [-0.6, 1.0, -0.9], [0.5, -0.9, 1.0]])
COV = CORR * np.outer(SD, SD)
MEAN = np.array([0.1, 0.2, 1.5])


def _joint(cov=COV, names=("swirr", "a", "b")):
    return JointNormal(names=names, covariance=tuple(map(tuple, np.asarray(cov))), source="test")


def test_draws_follow_the_multivariate_normal_of_scipy():
    n = 200_000
    q = np.random.default_rng(3).uniform(size=(n, 3))
    x = _joint().draw(MEAN, q)
    # sample mean: standard error sqrt(C_ii / n); 5 of them (anderson2003)
    np.testing.assert_array_less(np.abs(x.mean(axis=0) - MEAN), 5 * np.sqrt(np.diag(COV) / n))
    # sample covariance: Var(S_ij) = (C_ij^2 + C_ii C_jj) / (n - 1) (Wishart; anderson2003)
    s = np.cov(x, rowvar=False)
    tol = 5 * np.sqrt((COV ** 2 + np.outer(np.diag(COV), np.diag(COV))) / (n - 1))
    np.testing.assert_array_less(np.abs(s - COV), tol)
    # correlation kept: sd of a sample correlation ~ (1 - rho^2) / sqrt(n) (Fisher; anderson2003)
    r = np.corrcoef(x, rowvar=False)
    np.testing.assert_array_less(np.abs(r - CORR), 5 * (1 - CORR ** 2) / np.sqrt(n) + 1e-12)
    # the joint law itself: fractions below a few corners vs scipy's multivariate normal
    # distribution function (library: scipy); binomial sd sqrt(p (1 - p) / n)
    ref = stats.multivariate_normal(mean=MEAN, cov=COV)
    for corner in (MEAN, MEAN + SD * [1, -1, 1], MEAN + SD * [-0.5, 0.5, 0.3]):
        p = ref.cdf(corner)
        frac = np.mean(np.all(x <= corner, axis=1))
        assert abs(frac - p) < 5 * np.sqrt(p * (1 - p) / n) + 1e-3, (corner, frac, p)


def test_a_singular_covariance_draws_on_its_line_and_zero_gives_the_mean():
    # b = 2 swirr exactly: rank one; the draws must keep the relation
    cov = np.array([[1e-4, 2e-4], [2e-4, 4e-4]])
    x = _joint(cov, ("swirr", "b")).draw([0.1, 1.5], np.random.default_rng(1).uniform(size=(5000, 2)))
    np.testing.assert_allclose(x[:, 1] - 1.5, 2 * (x[:, 0] - 0.1), atol=1e-12)
    assert abs(np.std(x[:, 0]) - 0.01) < 5 * 0.01 / np.sqrt(2 * 5000)   # sd of an sd: s/sqrt(2n)
    z = _joint(np.zeros((3, 3))).draw(MEAN, np.random.default_rng(2).uniform(size=(10, 3)))
    assert np.array_equal(z, np.repeat(MEAN[None, :], 10, axis=0))


def test_rows_drawn_together_or_apart_give_the_same_bits():
    q = np.random.default_rng(4).uniform(size=(257, 3))
    whole = _joint().draw(MEAN, q)
    parts = np.concatenate([_joint().draw(MEAN, q[:1]), _joint().draw(MEAN, q[1:100]),
                            _joint().draw(MEAN, q[100:])])
    assert np.array_equal(whole, parts)


@pytest.mark.parametrize("cov, words", [
    ([[1e-4, 0.0], [0.0, 1e-4]], "is 2 x 2, but 3 parameters"),
    ([[1e-4, 5e-5, 0.0], [0.0, 1e-4, 0.0], [0.0, 0.0, 1e-4]], "not symmetric: row 1 column 2"),
    ([[1e-4, 2e-4, 0.0], [2e-4, 1e-4, 0.0], [0.0, 0.0, 1e-4]], "not positive semi-definite"),
    ([[-1e-4, 0.0, 0.0], [0.0, 1e-4, 0.0], [0.0, 0.0, 1e-4]], "not positive semi-definite"),
    ([[np.nan, 0.0, 0.0], [0.0, 1e-4, 0.0], [0.0, 0.0, 1e-4]], "not finite"),
])
def test_a_bad_covariance_is_refused_naming_where(cov, words):
    # correlation 2 (rows 1-2 of the third case): eigenvalues 3e-4 and -1e-4 (closed form)
    with pytest.raises(SatHeightError) as e:
        _joint(cov).check("zones[Upper].uncertainty.function")
    assert words in str(e.value) and "zones[Upper].uncertainty.function" in str(e.value)


# ---------------------------------------------------------------------- the Monte Carlo

def _well(n=800):
    """Constant porosity and permeability over 1900-2000 m, one oil zone, FWL 2010 m."""
    z = np.linspace(1900.0, 2000.0, n)
    phi, k = np.full(n, 0.2), np.full(n, 100.0 * MD)
    fn = build_function("power_law", dict(zip(("swirr", "a", "b"), MEAN)))
    zones = [ZoneModel("Upper", 1890.0, 2005.0, 2010.0, 1080.0, 750.0, "oil", 0.026, fn)]
    return z, phi, k, zones


def test_zero_covariance_collapses_onto_the_deterministic_curve():
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)           # the deterministic engine, another path
    unc = {"Upper": ZoneUncertainty(joint=_joint(np.zeros((3, 3))))}
    mc = monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=30))
    for curve in mc.sw_percentiles.values():
        np.testing.assert_allclose(curve, shm.sw, rtol=0, atol=1e-12)


class _TwoTerms(JSwFunction):
    """Test family ``Sw = s0 + c J^-1.5``: linear in its two parameters."""

    name = "two_terms_test"
    param_names = ("s0", "c")
    bounds = {"s0": (0.0, 1.0), "c": (0.0, 10.0)}

    @staticmethod
    def equation(j, s0, c):
        return s0 + c * np.power(j, -1.5)


def test_spread_of_sw_is_the_linear_combination_of_the_correlated_parameters():
    """Closed form: Sw = s0 + c g with g = J^-1.5 is linear in (s0, c), so at each depth Sw is
    normal with variance C_00 + 2 g C_01 + g^2 C_11; P90 - P10 of Sw is 2 * 1.2816 times its
    sd (scipy.stats.norm.ppf(0.9)), and the negative s0-c correlation makes it narrower than
    independent draws would."""
    z, phi, k, zones = _well(60)
    zones = [dataclasses.replace(zones[0], function=_TwoTerms.from_params({"s0": 0.1, "c": 0.2}))]
    cov = COV[:2, :2]                                   # sd 0.01 and 0.02, correlation -0.6
    shm = compute_shm(z, phi, k, zones)
    R = 5000
    mc = monte_carlo(z, phi, k, zones, shm,
                     {"Upper": ZoneUncertainty(joint=_joint(cov, ("s0", "c")))},
                     MonteCarloSettings(realisations=R, seed=5, memory_mb=200))
    g = shm.j ** -1.5
    sd = np.sqrt(cov[0, 0] + 2 * g * cov[0, 1] + g ** 2 * cov[1, 1])
    width = mc.sw_percentiles["SW_P90"] - mc.sw_percentiles["SW_P10"]
    expected = 2 * stats.norm.ppf(0.9) * sd
    # sd of a sample quantile: sqrt(p (1 - p) / R) / pdf(quantile) (anderson2003), both ends
    tol = 5 * np.sqrt(2 * 0.09 / R) / stats.norm.pdf(stats.norm.ppf(0.9)) * sd
    inside = shm.sw + 5 * sd < 1.0                # draws stay far from the clip at 1
    assert inside.sum() > 40
    np.testing.assert_array_less(np.abs(width - expected)[inside], tol[inside])
    independent = 2 * stats.norm.ppf(0.9) * np.sqrt(cov[0, 0] + g ** 2 * cov[1, 1])
    apart = inside & (independent - expected > 2 * tol)     # where the correlation shows
    assert apart.sum() > 10
    assert np.all(np.abs(width - expected)[apart] < np.abs(width - independent)[apart])
    np.testing.assert_allclose(mc.sw_percentiles["SW_P50"][inside], shm.sw[inside],
                               atol=float(np.max(tol)))


def test_seeded_runs_are_bit_reproducible_whatever_the_chunks_and_the_count():
    z, phi, k, zones = _well(3000)
    shm = compute_shm(z, phi, k, zones)
    unc = {"Upper": ZoneUncertainty(inputs={"fwl": Distribution("normal", sd=3.0)},
                                    joint=_joint())}
    big = monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=64, seed=9))
    small = monte_carlo(z, phi, k, zones, shm, unc,
                        MonteCarloSettings(realisations=64, seed=9, memory_mb=2.5))
    assert small.block_samples < big.block_samples       # really cut into several chunks
    for name in big.sw_percentiles:
        assert np.array_equal(big.sw_percentiles[name], small.sw_percentiles[name], equal_nan=True)
    assert np.array_equal(big.hcpt["Upper"], small.hcpt["Upper"])
    fewer = monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=20, seed=9))
    assert np.array_equal(fewer.hcpt["Upper"], big.hcpt["Upper"][:20])
    other = monte_carlo(z, phi, k, zones, shm, unc, MonteCarloSettings(realisations=64, seed=10))
    assert not np.array_equal(other.hcpt["Upper"], big.hcpt["Upper"])


def test_tornado_of_independent_joint_parameters_equals_their_own_normals():
    # with a diagonal covariance the conditional mean of the others is their mean, so the
    # bars must be those of independent normals of the same sd (the tested one-by-one path)
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)
    diag = np.diag(np.diag(COV))
    a = tornado(z, phi, k, zones, shm, {"Upper": ZoneUncertainty(joint=_joint(diag))})
    b = tornado(z, phi, k, zones, shm, {"Upper": ZoneUncertainty(inputs={
        n: Distribution("normal", sd=float(s)) for n, s in zip(("swirr", "a", "b"), SD)})})
    assert a[0] == b[0]
    assert [(x.input, x.hcpt_low, x.hcpt_high) for x in a[1]] == \
           [(x.input, x.hcpt_low, x.hcpt_high) for x in b[1]]
    # correlated: the swirr bar moves a and b too, by C_j,swirr / C_swirr,swirr per unit
    _, bars = tornado(z, phi, k, zones, shm, {"Upper": ZoneUncertainty(joint=_joint())})
    assert {x.input for x in bars} == {"swirr", "a", "b"}


def test_parameters_out_of_the_family_bounds_or_drawn_twice_are_refused():
    z, phi, k, zones = _well()
    shm = compute_shm(z, phi, k, zones)
    wide = np.diag([0.05 ** 2, 1e-4, 1e-4])          # swirr 0.1 +- 8 x 0.05 reaches below 0
    with pytest.raises(SatHeightError, match="outside the power_law bounds"):
        monte_carlo(z, phi, k, zones, shm, {"Upper": ZoneUncertainty(joint=_joint(wide))})
    twice = ZoneUncertainty(inputs={"swirr": Distribution("normal", sd=0.01)}, joint=_joint())
    with pytest.raises(SatHeightError, match="also drawn with the others"):
        monte_carlo(z, phi, k, zones, shm, {"Upper": twice})


# ---------------------------------------------------------------------- model file

def test_the_model_file_records_curve_fits_covariance_and_reads_old_files(tmp_path):
    j = np.geomspace(1.0, 30.0, 40)           # Sw 0.12-0.37: no clipping at 1
    sw = 0.12 + 0.25 * j ** -1.3 + 0.004 * np.sin(7 * np.arange(40))     # known generating values
    fn = PowerLaw().fit(j, sw)
    rep = fn.fit_report()
    # closed form: the covariance of least squares, s^2 (J^T J)^-1 with s^2 = RSS / (n - p) and
    # J the Jacobian at the optimum (here by central differences of Sw = swirr + (1 - swirr)
    # a J^-b, the published power-law form); what scipy.optimize.curve_fit documents for pcov
    p = np.array(list(rep.params.values()))
    f = lambda q: q[0] + (1 - q[0]) * q[1] * j ** -q[2]                    # noqa: E731
    jac = np.stack([(f(p + e) - f(p - e)) / (2 * e.sum()) for e in np.diag(p * 1e-6)], axis=1)
    r = f(p) - sw
    pcov = r @ r / (j.size - 3) * np.linalg.inv(jac.T @ jac)
    np.testing.assert_allclose(rep.covariance, pcov, rtol=1e-4)
    data = models_to_dict({"Sand": {"plugs": ["P1"], "n_points": 40, "selected": "power_law",
                                    "fits": {"power_law": rep}}}, RockTypeRule(), {})
    path = save_models(tmp_path / "m.json", data)
    names, rows, where = load_models(path).covariance("Sand")
    assert names == ("swirr", "a", "b") and "rock_types[Sand].fits[power_law]" in where
    np.testing.assert_allclose(rows, pcov, rtol=1e-5)                     # six digits stored
    # a file written before the covariance was stored: stderr x correlation x stderr
    old = json.loads(path.read_text())
    del old["rock_types"]["Sand"]["fits"]["power_law"]["covariance"]
    (tmp_path / "old.json").write_text(json.dumps(old))
    _, rows_old, _ = load_models(tmp_path / "old.json").covariance("Sand")
    np.testing.assert_allclose(rows_old, pcov, rtol=0.06)                # stderr has two digits


# ---------------------------------------------------------------------- project file

UPPER = """
[zones.uncertainty]
fwl = {{ distribution = "normal", sd = "2 m" }}
[zones.uncertainty.function]
distribution = "joint_normal"
{cov}
"""


def _project(tmp: Path, cov: str, wells=("VANTREL-1",), realisations=60) -> Path:
    """The demo project, its own Monte Carlo tables replaced by a joint normal on Upper Sand."""
    folder = tmp / "p"
    shutil.copytree(DEMO, folder)
    text = (folder / "demo_project.toml").read_text(encoding="utf-8")
    text = re.sub(r"^\[(zones\.)?uncertainty\][^\n]*\n(?:(?!\[).*\n)*", "", text, flags=re.M)
    i = text.index("[[zones]]")
    pre, zones = text[:i], text[i:]
    head, lower = zones.split('[[zones]]\nname = "Lower Sand"')
    zones = head + UPPER.format(cov=cov) + '[[zones]]\nname = "Lower Sand"' + lower
    blocks = pre.split("[[wells]]")
    keep = [b for b in blocks[1:] if any(f'"{w}.las"' in b for w in wells)]
    text = (blocks[0] + f"[uncertainty]\nrealisations = {realisations}\nseed = 4\n"
            + "".join("[[wells]]" + b for b in keep) + zones)
    path = folder / "demo_project.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_model_file_covariance_is_read_for_the_zone(tmp_path):
    p = parse_project(_project(tmp_path, 'covariance = "model file"'))
    joint = p.uncertainty.zones["Upper Sand"].joint
    rec = json.loads((DEMO / "core_models.json").read_text())["rock_types"]["Upper Sand"]["fits"]["power_law"]
    se = np.array([rec["stderr"][n] for n in joint.names])
    # the demo file's own numbers: C = diag(se) R diag(se) (or its stored covariance)
    expected = rec.get("covariance") or np.asarray(rec["correlation"]) * np.outer(se, se)
    np.testing.assert_allclose(joint.covariance, expected, rtol=1e-12)
    assert joint.names == ("swirr", "a", "b")


@pytest.mark.parametrize("cov, key, words", [
    ("covariance = [[1e-6, 0.0], [0.0, 1e-6]]", "function.covariance", "is 2 x 2, but 3"),
    ("covariance = [[1e-6, 2e-6], [2e-6, 1e-6]]\nparameters = [\"swirr\", \"b\"]",
     "function.covariance", "not positive semi-definite"),
    ("covariance = [[1e-6, 1e-7], [0.0, 1e-6]]\nparameters = [\"swirr\", \"b\"]",
     "function.covariance", "not symmetric"),
    ("covariance = \"the fit\"", "function.covariance", "expected 'model file' or rows"),
    ("covariance = [[1e-6, \"x\"], [0.0, 1e-6]]\nparameters = [\"swirr\", \"b\"]",
     "function.covariance[1][2]", "plain finite number"),
    ("parameters = [\"swirr\"]", "function.covariance", "'covariance' is missing"),
])
def test_bad_covariance_keys_name_the_file_and_key(tmp_path, cov, key, words):
    path = _project(tmp_path, cov)
    with pytest.raises(ProjectFileError) as e:
        parse_project(path)
    msg = str(e.value)
    assert f"zones[Upper Sand].uncertainty.{key}" in msg and words in msg and str(path) in msg


def test_a_non_positive_model_file_covariance_names_the_file(tmp_path):
    path = _project(tmp_path, 'covariance = "model file"')
    models = path.parent / "core_models.json"
    data = json.loads(models.read_text())
    data["rock_types"]["Upper Sand"]["fits"]["power_law"]["covariance"] = [
        [1e-6, 2e-6, 0.0], [2e-6, 1e-6, 0.0], [0.0, 0.0, 1e-6]]
    models.write_text(json.dumps(data))
    with pytest.raises(ProjectFileError) as e:
        parse_project(path)
    msg = str(e.value)
    assert "not positive semi-definite" in msg and "core_models.json" in msg
    assert "rock_types[Upper Sand].fits[power_law]" in msg


# ---------------------------------------------------------------------- the band in the track plot

def test_track_plot_band_edges_are_the_percentile_curves_written_to_the_las(tmp_path):
    """The band is drawn when percentiles exist and not otherwise; its dashed edges and the
    fill's outline hold exactly the SW_P10 / SW_P90 values the run wrote to the LAS (the
    file's values, read back with lasio), at the samples kept by the thinning."""
    import lasio
    from matplotlib.collections import PolyCollection
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path as MplPath

    from satheight.plots import track_plot
    from satheight.plots.track_curves import BAND_LABEL
    from satheight.workflows.outputs import PlotOptions, write_outputs
    from satheight.api import run_well
    from satheight.workflows.uncertainty import well_uncertainty

    project = parse_project(_project(tmp_path, 'covariance = "model file"'))
    result = run_well(project, "VANTREL-1").result
    write_outputs(result, project, tmp_path / "out", PlotOptions(draw=False))
    las = lasio.read(tmp_path / "out" / "VANTREL-1.las")
    mc = well_uncertainty(project, result)
    # the LAS holds the run's curves to 5 decimals; the figure is drawn from the same run
    np.testing.assert_allclose(las["SW_P90"], mc.result.sw_percentiles["SW_P90"], atol=5e-6)
    fig = track_plot(result, sw_band=mc.result.sw_percentiles)
    ax = [a for a in fig.axes if any(ln.get_label() == "SW_P10" for ln in a.get_lines())]
    assert len(ax) == 1
    lines = {ln.get_label(): ln for ln in ax[0].get_lines() if ln.get_label() in ("SW_P10", "SW_P90")}
    tvdss = np.asarray(result.tvdss)
    for name, ln in lines.items():
        x, y = (np.asarray(v, dtype=float) for v in ln.get_data())
        ok = np.isfinite(x)
        assert ok.sum() > 100
        idx = np.searchsorted(tvdss, y[ok])                # TVDSS increases in this well
        np.testing.assert_array_equal(tvdss[idx], y[ok])
        np.testing.assert_allclose(x[ok], las[name][idx], atol=5e-6, err_msg=name)
    # the fill: every outline vertex lies on one of the two curves at its depth
    # (one compound patch, or matplotlib's own PolyCollection where depths turn back)
    grey = [0x55 / 255] * 3
    band = [c for c in ax[0].collections if isinstance(c, PolyCollection)
            and np.allclose(c.get_facecolor()[0][:3], grey)]
    band += [p for p in ax[0].patches if isinstance(p, PathPatch)
             and np.allclose(p.get_facecolor()[:3], grey)]
    assert len(band) == 1
    paths = band[0].get_paths() if isinstance(band[0], PolyCollection) else [band[0].get_path()]
    verts = np.concatenate([p.vertices[p.codes != MplPath.CLOSEPOLY] if p.codes is not None
                            else p.vertices for p in paths])
    idx = np.searchsorted(tvdss, verts[:, 1])
    on_edge = (np.abs(verts[:, 0] - las["SW_P10"][idx]) < 5e-6) | \
              (np.abs(verts[:, 0] - las["SW_P90"][idx]) < 5e-6)
    assert on_edge.all()
    labels = [t.get_text() for t in fig.legends[0].get_texts()]
    assert BAND_LABEL in labels and "P90 = high Sw" in BAND_LABEL
    # without percentiles: no band, no legend entry
    plain = track_plot(result)
    assert BAND_LABEL not in [t.get_text() for t in plain.legends[0].get_texts()]
    assert not any(ln.get_label() in ("SW_P10", "SW_P90") for a in plain.axes for ln in a.get_lines())
    with pytest.raises(SatHeightError, match="sw_band needs SW_P10 with one value per sample"):
        track_plot(result, sw_band={"SW_P10": np.zeros(3), "SW_P90": np.zeros(3)})


def test_joint_draws_give_the_same_files_with_one_or_two_workers(tmp_path):
    from satheight.workflows.run import run_project

    project = _project(tmp_path, 'covariance = "model file"', wells=("VANTREL-1", "VANTREL-2"),
                       realisations=40)
    run_project(project, tmp_path / "one", plot=False, workers=1)
    run_project(project, tmp_path / "two", plot=False, workers=2)
    for name in ("VANTREL-1", "VANTREL-2"):
        for suffix in (".las", ".parquet", "_summary.json"):
            a = (tmp_path / "one" / f"{name}{suffix}").read_bytes()
            b = (tmp_path / "two" / f"{name}{suffix}").read_bytes()
            assert a == b, name + suffix
    summary = json.loads((tmp_path / "one" / "VANTREL-1_summary.json").read_text())
    assert {"swirr", "a", "b"} <= {b["input"] for b in summary["uncertainty"]["tornado"]["bars"]}
    # the summary says what was drawn together and from where (README: Uncertainty); the
    # parameter names are the demo model file's own for its power-law fit
    drawn = summary["uncertainty"]["inputs"]["Upper Sand"]
    assert drawn["joint"]["parameters"] == ["swirr", "a", "b"]
    assert "core_models.json" in drawn["joint"]["covariance_from"]
    assert not set(drawn["inputs"]) & {"swirr", "a", "b"}
