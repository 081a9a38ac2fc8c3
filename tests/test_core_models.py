"""New J-Sw families (Thomeer, van Genuchten, Skelt-Harrison), the fit report and the
JSON model store: published worked values, recovery of known parameters, file round trip.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from satheight.errors import InputFileError, ModelError, NotFittedError
from satheight.models import (FAMILIES, BrooksCorey, PowerLaw, SkeltHarrison, Thomeer,
                              VanGenuchten, build_function)
from satheight.models.store import load_models, models_to_dict, save_models
from satheight.models.thomeer import fit_thomeer_pc, thomeer_bulk_volume
from satheight.models.van_genuchten import van_genuchten_theta
from satheight.rocktypes import RockTypeRule
import scipy.constants as sc


# --- thomeer1960 (JPT 12(3)): Pd = 10, G = 0.3, Bv_inf = 20 % (values computed from the
# published equation)
@pytest.mark.parametrize("pc, expected", [(100.0, 14.8164), (20.0, 7.38281), (1000.0, 17.2142)])
def test_thomeer_worked_values(pc, expected):
    # thomeer1960 (computed from the published equation, values above)
    assert thomeer_bulk_volume(pc, 10.0, 0.3, 20.0) == pytest.approx(expected, abs=6e-5)


def test_thomeer_at_and_below_displacement_pressure_is_zero():
    # thomeer1960: no intrusion at or below Pd (Bv = 0 exactly: a where(), no arithmetic)
    np.testing.assert_array_equal(thomeer_bulk_volume([1.0, 5.0, 10.0], 10.0, 0.3, 20.0), 0.0)


def test_thomeer_family_in_j_matches_bulk_volume_form():
    # Sw = 1 - Bv/phi with Bv_inf/phi = 1 - swirr (same equation, saturation form)
    phi, bv_inf = 0.25, 0.20
    f = build_function("thomeer", {"swirr": 1 - bv_inf / phi, "jd": 10.0, "g": 0.3})
    pc = np.array([20.0, 100.0, 1000.0])
    # thomeer1960: the J form is the bulk-volume form divided by phi (closed form, docstring of
    # satheight.models.thomeer); both sides are numpy arithmetic on the same numbers
    np.testing.assert_allclose(f.predict(pc), 1 - thomeer_bulk_volume(pc, 10.0, 0.3, bv_inf) / phi,
                               rtol=1e-12)
    # 14.8164 % of bulk at Pc 100 (thomeer1960, computed) -> Sw = 1 - 0.148164/0.25
    assert f.predict(100.0) == pytest.approx(1 - 0.148164 / 0.25, abs=3e-6)


def test_thomeer_fit_in_pressure_recovers_pd_and_g():
    # synthetic plug from known parameters (thomeer1960 form, the values above), Pc in psi -> Pa
    pc_psi = np.geomspace(11.0, 5000.0, 25)
    phi = 0.25
    sw = 1 - thomeer_bulk_volume(pc_psi, 10.0, 0.3, 0.20) / phi
    f = fit_thomeer_pc(pc_psi * sc.psi, sw)
    # known generating parameters (thomeer1960 form): Pd 10 psi, G 0.3, Bv_inf/phi 0.8;
    # rel 1e-4: noise-free data, the fit's own stopping tolerance
    assert f.params_["jd"] == pytest.approx(10.0, rel=1e-4)
    assert f.params_["g"] == pytest.approx(0.3, rel=1e-4)
    assert 1 - f.params_["swirr"] == pytest.approx(0.20 / phi, rel=1e-4)


# --- vangenuchten1980 with carsel1988 parameters (from memory), m = 1 - 1/n, values
# computed from the published equation; h in cm -> m, alpha 1/cm -> 1/m
@pytest.mark.parametrize("soil, theta_r, theta_s, alpha_cm, n, h_cm, expected", [
    ("loam", 0.078, 0.43, 0.036, 1.56, 100.0, 0.24213),
    ("loam", 0.078, 0.43, 0.036, 1.56, 15000.0, 0.08838),
    ("sand", 0.045, 0.43, 0.145, 2.68, 10.0, 0.21434),
    ("sand", 0.045, 0.43, 0.145, 2.68, 100.0, 0.04931),
    ("silt loam", 0.067, 0.45, 0.020, 1.41, 100.0, 0.32969),
    ("silt loam", 0.067, 0.45, 0.020, 1.41, 1000.0, 0.17867),
])
def test_van_genuchten_carsel_parrish(soil, theta_r, theta_s, alpha_cm, n, h_cm, expected):
    # vangenuchten1980 + carsel1988 (computed)
    got = van_genuchten_theta(h_cm / 100.0, theta_r, theta_s, alpha_cm * 100.0, n)
    assert got == pytest.approx(expected, abs=6e-6), soil


def test_van_genuchten_family_is_the_normalised_form():
    # Sw = theta/theta_s with swirr = theta_r/theta_s (same equation in saturation)
    f = build_function("van_genuchten", {"swirr": 0.078 / 0.43, "alpha": 3.6, "n": 1.56})
    # vangenuchten1980 + carsel1988 loam at h = 100 cm (alpha h = 3.6): theta 0.24213 (computed)
    assert f.predict(1.0) * 0.43 == pytest.approx(0.24213, abs=6e-6)


def test_skelt_harrison_limits():
    # Skelt & Harrison 1995 (from memory): Sw -> 1 - a far above the FWL, 1 at the FWL
    f = build_function("skelt_harrison", {"a": 0.85, "b": 10.0, "c": 0.0, "d": 1.5})
    # skelt1995: a height function, Sw from h (not J)
    assert f.variable == "height"
    assert f.predict(1e6) == pytest.approx(0.15, abs=1e-6)
    # closed form (skelt1995 form): Sw = 1 at and below h + c = 0
    assert f.predict(0.0) == 1.0
    assert f.predict(-3.0) == 1.0
    # at h + c = b: Sw = 1 - a exp(-1)
    # closed form: at h + c = b, Sw = 1 - a/e (numpy exp)
    assert f.predict(10.0) == pytest.approx(1 - 0.85 * np.exp(-1.0), rel=1e-12)


def test_new_families_registered():
    for name in ("thomeer", "van_genuchten", "skelt_harrison"):
        # the families documented in the README (registry keys)
        assert name in FAMILIES


# --- fitting synthetic data from known parameters recovers them within their errors
CASES = [
    (PowerLaw, {"swirr": 0.10, "a": 0.30, "b": 1.20}),
    (BrooksCorey, {"swirr": 0.12, "jd": 0.20, "lam": 2.5}),
    (Thomeer, {"swirr": 0.15, "jd": 0.10, "g": 0.40}),
    (VanGenuchten, {"swirr": 0.10, "alpha": 3.0, "n": 2.5}),
    (SkeltHarrison, {"a": 0.85, "b": 10.0, "c": 5.0, "d": 1.5}),
]


@pytest.mark.parametrize("cls, truth", CASES, ids=[c[0].name for c in CASES])
def test_fit_recovers_known_parameters(cls, truth):
    x = np.geomspace(0.05, 100.0, 80) if cls.variable == "j" else np.linspace(0.5, 80.0, 80)
    clean = np.clip(cls.equation(x, **truth), 0, 1)
    z = []
    for seed in range(30):          # 30 noisy data sets from the same known parameters
        rng = np.random.default_rng(seed)
        sw = clean + rng.normal(0.0, 0.01, x.size)
        f = cls().fit(x, sw)
        rep = f.fit_report(groups=np.repeat(["P1", "P2"], 40))
        for p, v in truth.items():
            se = rep.stderr[p]
            # known truth v: informative errors, well below the value (common practice)
            assert np.isfinite(se) and 0 < se < 0.5 * abs(v), (p, se)
            z.append((rep.params[p] - v) / se)
    z = np.abs(np.array(z))
    # known generating parameters (truth above), normal theory (common practice):
    # standard errors that mean what they say: about 95 % of estimates within 2 SE of
    # the truth (normal theory), none beyond 4.5 SE
    assert np.mean(z < 2.0) >= 0.85, np.mean(z < 2.0)
    assert z.max() < 4.5, z.max()
    # known noise sd 0.01 put in; R2 close to 1 for that noise; 80 points, 40 per label
    assert rep.rmse == pytest.approx(0.01, rel=0.3)   # the noise sd put in
    assert rep.r2 > 0.99
    assert rep.n_points == 80
    corr = np.array(rep.correlation)
    # closed form: a correlation matrix has a unit diagonal and is symmetric
    np.testing.assert_allclose(np.diag(corr), 1.0, rtol=1e-9)
    np.testing.assert_allclose(corr, corr.T, atol=1e-12)
    # the labels given (40 each)
    assert set(rep.residuals_by_group) == {"P1", "P2"}
    assert rep.residuals_by_group["P1"]["n"] == 40
    # closed form: the range of the data given (numpy min/max)
    assert rep.j_range == (pytest.approx(x.min()), pytest.approx(x.max()))


def test_fit_report_aic_and_r2_definitions():
    # AIC = n ln(RSS/n) + 2p (Akaike 1974, least-squares form); R2 = 1 - RSS/TSS
    rng = np.random.default_rng(3)
    j = np.geomspace(0.1, 50, 40)
    sw = PowerLaw.equation(j, 0.1, 0.3, 1.2) + rng.normal(0, 0.02, j.size)
    f = PowerLaw().fit(j, sw)
    rep = f.fit_report()
    resid = f.predict(j) - sw
    rss = float(np.sum(resid ** 2))
    # akaike1974 least-squares form (burnham2002 section 2.2) and R2 = 1 - RSS/TSS, written out here
    assert rep.aic == pytest.approx(40 * np.log(rss / 40) + 2 * 3, rel=1e-9)
    assert rep.r2 == pytest.approx(1 - rss / np.sum((sw - sw.mean()) ** 2), rel=1e-9)


def test_fit_report_before_fit_is_an_error():
    with pytest.raises(NotFittedError):
        PowerLaw().fit_report()


def test_fit_report_groups_length_checked():
    f = PowerLaw().fit(np.geomspace(0.1, 10, 10), np.linspace(0.9, 0.2, 10))
    with pytest.raises(ModelError, match="one label per point"):
        f.fit_report(groups=["a"] * 3)


# --- JSON store
def _fits():
    rng = np.random.default_rng(1)
    j = np.geomspace(0.1, 50, 30)
    out = {}
    for rt, truth in (("A", (0.1, 0.3, 1.2)), ("B", (0.2, 0.5, 2.0))):
        sw = PowerLaw.equation(j, *truth) + rng.normal(0, 0.01, j.size)
        rep = PowerLaw().fit(j, sw).fit_report(groups=["p"] * j.size)
        out[rt] = {"plugs": ["p"], "n_points": j.size, "fits": {"power_law": rep},
                   "selected": "power_law", "errors": {}}
    return out


def test_store_round_trip_is_plain_json(tmp_path):
    fits = _fits()
    rule = RockTypeRule("fzi", None, (1.0,), ("A", "B"))
    path = save_models(tmp_path / "m.json", models_to_dict(fits, rule, {"files": {"x.csv": "ab"}}))
    data = json.loads(path.read_text())           # readable JSON, not pickle
    # library: json (standard library) reads the file; the numbers written are the fitted ones
    # (JSON keeps a float's repr exactly, so equality is the right check)
    assert data["rock_types"]["A"]["fits"]["power_law"]["params"] == fits["A"]["fits"]["power_law"].params
    mf = load_models(path)
    # round trip through the file (no outside value: the model file must give back what was
    # written)
    assert mf.rule == rule
    fn = mf.function("B")
    assert fn.params_ == fits["B"]["fits"]["power_law"].params
    assert fn.j_range_ == pytest.approx(fits["B"]["fits"]["power_law"].j_range)
    with pytest.raises(ModelError, match="no rock type 'C'"):
        mf.function("C")
    with pytest.raises(ModelError, match="no fitted 'thomeer'"):
        mf.function("A", "thomeer")


@pytest.mark.parametrize("text, match", [
    ("{not json", "not valid JSON"),
    ('{"format": "other"}', "not a satheight model file"),
    ('{"format": "satheight-models", "version": 99}', "version 99"),
])
def test_store_bad_files(tmp_path, text, match):
    p = tmp_path / "bad.json"
    p.write_text(text)
    with pytest.raises(InputFileError, match=match) as e:
        load_models(p)
    # common practice (the project's error rule): errors name the file
    assert str(p) in str(e.value)


def test_store_bad_parameter_names_rock_type(tmp_path):
    fits = _fits()
    data = models_to_dict(fits, RockTypeRule(), {})
    data["rock_types"]["A"]["fits"]["power_law"]["params"]["swirr"] = 1.5
    p = tmp_path / "m.json"
    p.write_text(json.dumps(data))
    with pytest.raises(ModelError, match="swirr") as e:
        load_models(p)
    # common practice (the project's error rule): errors name the key
    assert "rock_types[A]" in str(e.value)
