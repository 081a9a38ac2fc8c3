"""From core tables to a model file and into a project run: the fit command, model files
referenced from project files, per-rock-type functions and height functions in the engine.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from satheight.cli import main
from satheight.engine import ZoneModel, compute_shm
from satheight.errors import ProjectFileError
from satheight.models import build_function
from satheight.io.model_file import load_models, models_to_dict, save_models
from satheight.project.reader import load_project, parse_project
from satheight.results import FLAG_NO_ROCK_FUNCTION
from satheight.rocktypes import RockTypeRule

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"
CORE_FILES = [DEMO / n for n in ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv",
                                 "core_plug_V12.csv")]
MD = 9.869233e-16   # NIST SP 811


def _zone(fn, **kw):
    return ZoneModel(name="Z", top=1000.0, base=1100.0, fwl=1090.0, water_density=1100.0,
                     hydrocarbon_density=800.0, hydrocarbon="oil", sigma_cos_theta=0.026,
                     function=fn, **kw)


def test_engine_per_rock_type_functions():
    fa = build_function("power_law", {"swirr": 0.1, "a": 0.3, "b": 1.2})
    fb = build_function("brooks_corey", {"swirr": 0.2, "jd": 0.3, "lam": 2.0})
    rule = RockTypeRule("permeability", None, (10 * MD, 1000 * MD), ("tight", "good", "none"))
    zone = _zone(fa, rock_functions={"tight": fb, "good": fa}, rock_classifier=rule.classify)
    z = np.full(6, 1050.0)
    phi = np.full(6, 0.2)
    k = np.array([1, 5, 50, 500, 5000, 100]) * MD
    res = compute_shm(z, phi, k, [zone])
    tight, good, none = k < 10 * MD, (k >= 10 * MD) & (k < 1000 * MD), k >= 1000 * MD
    np.testing.assert_allclose(res.sw[tight], fb.predict(res.j[tight]))
    np.testing.assert_allclose(res.sw[good], fa.predict(res.j[good]))
    assert np.all(np.isnan(res.sw[none]))
    assert np.all(res.flag[none] & FLAG_NO_ROCK_FUNCTION)
    assert not np.any(res.flag[~none] & FLAG_NO_ROCK_FUNCTION)
    # same samples with one function: the single-function path is unchanged
    single = compute_shm(z, phi, k, [_zone(fa)])
    np.testing.assert_allclose(single.sw, fa.predict(single.j))


def test_engine_height_function_gets_height():
    fn = build_function("skelt_harrison", {"a": 0.85, "b": 10.0, "c": 0.0, "d": 1.5},
                        j_range=(1.0, 30.0))
    z = np.array([1000.0, 1060.0, 1089.5, 1095.0])
    res = compute_shm(z, np.full(4, 0.2), np.full(4, 100 * MD), [_zone(fn)])
    h = 1090.0 - z
    above = h > 0
    # Sw = 1 - a exp(-(b/h)^d) at the height above the FWL (Skelt & Harrison form)
    np.testing.assert_allclose(res.sw[above], 1 - 0.85 * np.exp(-(10.0 / h[above]) ** 1.5))
    assert res.sw[3] == 1.0
    # range flags use the height range: 90 m above, 0.5 m below
    assert res.flag[0] & 16 and res.flag[2] & 8 and not res.flag[1] & 24


# --- model files in project files
BASE = {
    "project": {"units": "metric"},
    "wells": [{"las": "w.las"}],
    "zones": [{"name": "Upper", "top": 1000, "base": 1100, "fwl": 1090, "hydrocarbon": "oil",
               "water_density": 1100, "hydrocarbon_density": 800, "sigma_cos_theta": 26,
               "function": {}}],
}


def _model_file(tmp_path, rule, names=("A", "B")):
    from satheight.models import PowerLaw

    rng = np.random.default_rng(0)
    j = np.geomspace(0.1, 50, 30)
    fits = {}
    for i, n in enumerate(names):
        sw = PowerLaw.equation(j, 0.1 + 0.05 * i, 0.3, 1.2) + rng.normal(0, 0.005, j.size)
        rep = PowerLaw().fit(j, sw).fit_report()
        fits[n] = {"plugs": ["p"], "n_points": 30, "fits": {"power_law": rep},
                   "selected": "power_law", "errors": {}}
    return save_models(tmp_path / "models.json", models_to_dict(fits, rule, {})), fits


def _project(tmp_path, function):
    (tmp_path / "w.las").write_text("")
    data = json.loads(json.dumps(BASE))
    data["zones"][0]["function"] = function
    return parse_project(data, tmp_path / "p.toml")


def test_project_function_from_model_file(tmp_path):
    path, fits = _model_file(tmp_path, RockTypeRule("column", "rock_type"))
    p = _project(tmp_path, {"file": "models.json", "rock_type": "B"})
    f = p.zones[0].function
    assert f.family == "power_law" and f.rock_type == "B" and f.file == path.resolve()
    rep = fits["B"]["fits"]["power_law"]
    # the model file keeps each parameter to two digits below its standard error's first
    # digit, so what the project reads is within half a unit of that digit: <= se / 20
    assert f.params.keys() == rep.params.keys()
    for name, value in rep.params.items():
        assert abs(f.params[name] - value) <= rep.stderr[name] / 20
    assert f.j_range == pytest.approx(fits["B"]["fits"]["power_law"].j_range)
    p = _project(tmp_path, {"file": "models.json", "rock_type": "A", "j_min": 0.5, "j_max": 9})
    assert p.zones[0].function.j_range == (0.5, 9.0)


@pytest.mark.parametrize("function, key, match", [
    ({"file": "models.json", "rock_type": "C"}, "zones[Upper].function.rock_type", "no rock type 'C'"),
    ({"file": "models.json"}, "zones[Upper].function.rock_type", "logs cannot supply"),
    ({"file": "missing.json", "rock_type": "A"}, "zones[Upper].function.file", "not found"),
    ({"file": "models.json", "rock_type": "A", "family": "thomeer"},
     "zones[Upper].function.rock_type", "no fitted 'thomeer'"),
    ({"file": "models.json", "rock_type": "A", "swirr": 0.1}, "zones[Upper].function.swirr",
     "unknown key"),
])
def test_project_model_file_errors(tmp_path, function, key, match):
    _model_file(tmp_path, RockTypeRule("column", "rock_type"))
    with pytest.raises(ProjectFileError, match=match) as e:
        _project(tmp_path, function)
    assert f"key {key}" in str(e.value)


def test_project_per_depth_rock_typing(tmp_path):
    rule = RockTypeRule("fzi", None, (2.0,), ("A", "B"))
    _, fits = _model_file(tmp_path, rule)
    p = _project(tmp_path, {"file": "models.json"})
    f = p.zones[0].function
    assert set(f.by_rock_type) == {"A", "B"} and f.rock_rule == rule
    from satheight.workflows.well import _zone_model

    zm = _zone_model(p.zones[0], 1000.0, 1100.0, p.path)
    phi = np.full(2, 0.2)
    k = np.array([1.0, 500.0]) * MD          # FZI 0.50 -> A, 11.2 -> B (Amaefule form)
    res = compute_shm(np.full(2, 1050.0), phi, k, [zm])
    # the parameters as the model file keeps them (rounded to their standard errors)
    fa = build_function("power_law", f.by_rock_type["A"].params)
    fb = build_function("power_law", f.by_rock_type["B"].params)
    np.testing.assert_allclose(res.sw, [fa.predict(res.j[0]), fb.predict(res.j[1])])
    # the ROCK_ID output curve numbers the rock types in the zone's table order
    import types

    from satheight.workflows.well import rock_type_ids

    ids = rock_type_ids(types.SimpleNamespace(zones=[zm], shm=res, phi=phi, k=k))
    names = list(zm.rock_functions)
    assert [names[int(i) - 1] for i in ids] == ["A", "B"]


# --- the fit command on the invented demo core data
@pytest.fixture(scope="module")
def fitted(tmp_path_factory):
    out = tmp_path_factory.mktemp("fit")
    code = main(["fit", *map(str, CORE_FILES), "--out", str(out),
                 "--reservoir", "Upper Sand=26 mN/m,300 kg/m3",
                 "--reservoir", "Lower Sand=50 mN/m,859.5 kg/m3"])
    return code, out


def test_fit_command_writes_files(fitted, capsys):
    code, out = fitted
    assert code == 0
    for name in ("models.json", "core_points.csv", "core_j_sw.png", "core_pc.png"):
        assert (out / name).is_file() and (out / name).stat().st_size > 0, name
    assert (out / "core_j_sw.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_fit_command_recovers_generator_functions(fitted):
    _, out = fitted
    mf = load_models(out / "models.json")
    assert set(mf.rock_types) == {"Upper Sand", "Lower Sand"}
    # demo_wells/make_core_demo.py made the curves from the demo zone functions
    # (Upper Sand power law 0.10/0.30/1.20, Lower Sand Brooks-Corey 0.12/0.20/2.5)
    # with 5 % plug-to-plug spread and noise; the fit must land near them.
    up = mf.function("Upper Sand", "power_law").params_
    assert up["swirr"] == pytest.approx(0.10, abs=0.02)
    assert up["a"] == pytest.approx(0.30, rel=0.15)
    assert up["b"] == pytest.approx(1.20, rel=0.1)
    lo = mf.function("Lower Sand", "brooks_corey").params_
    assert lo["swirr"] == pytest.approx(0.12, abs=0.02)
    assert lo["jd"] == pytest.approx(0.20, rel=0.15)
    assert lo["lam"] == pytest.approx(2.5, rel=0.15)
    prov = json.loads((out / "models.json").read_text())["provenance"]
    import hashlib

    for f in CORE_FILES:
        assert prov["files"][f.name] == hashlib.sha256(f.read_bytes()).hexdigest()
    for rt in mf.rock_types.values():
        assert set(rt["fits"]) >= {"power_law", "brooks_corey", "thomeer", "van_genuchten",
                                   "skelt_harrison"}
        assert rt["fits"][rt["selected"]]["variable"] == "j"


def test_fit_command_bad_input_is_one_line(tmp_path, capsys):
    bad = tmp_path / "s.csv"
    bad.write_text("plug,pc [psi],sw\nP1,1,1.0\nP1,10,1.5\n")
    code = main(["fit", str(bad), "--system", "air_brine", "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    assert code == 2
    assert f"{bad}, row 3" in err and err.count("\n") == 1


def test_fit_command_fzi_classes(tmp_path, capsys):
    code = main(["fit", *map(str, CORE_FILES), "--out", str(tmp_path), "--fzi-classes", "3",
                 "--family", "power_law", "--no-plots"])
    assert code == 0
    mf = load_models(tmp_path / "models.json")
    assert mf.rule.method == "fzi" and set(mf.rock_types) <= {"FZI < 3 um", "FZI >= 3 um"}
    assert "FZI" in capsys.readouterr().out


def test_demo_project_uses_core_models():
    p = load_project(DEMO / "demo_project.toml")
    mf = load_models(DEMO / "core_models.json")
    for z in p.zones:
        assert z.function.file == (DEMO / "core_models.json").resolve()
        assert z.function.rock_type == z.name
        assert z.function.params == mf.function(z.name, z.function.family).params_


def _same_fit_within_errors(shipped, fresh, where=""):
    """Two model-file dicts agree: every fitted parameter within a fifth of its standard
    error (the fit's own conditioning: an ill-conditioned parameter may differ in its 7th
    digit between CPUs, far inside its error), standard errors within 5 %, other numbers
    within 1e-4 relative, texts and keys equal. Returns the differences found."""
    out = []
    if isinstance(shipped, dict) and isinstance(fresh, dict):
        if shipped.keys() != fresh.keys():
            return [f"{where}: keys {sorted(shipped)} != {sorted(fresh)}"]
        if "params" in shipped and "stderr" in shipped:
            for p, v in shipped["params"].items():
                se = shipped["stderr"][p]
                tol = 0.2 * se if se else 1e-6 * max(abs(v), 1.0)
                if abs(fresh["params"][p] - v) > tol:
                    out.append(f"{where}.params.{p}: {v} vs {fresh['params'][p]} (se {se})")
            for p, s in shipped["stderr"].items():
                f = fresh["stderr"][p]
                if (s is None) != (f is None) or (s is not None and abs(f - s) > 0.05 * s):
                    out.append(f"{where}.stderr.{p}: {s} vs {f}")
            rest = [k for k in shipped if k not in ("params", "stderr")]
        else:
            rest = list(shipped)
        for k in rest:
            out += _same_fit_within_errors(shipped[k], fresh[k], f"{where}.{k}")
        return out
    if isinstance(shipped, list) and isinstance(fresh, list):
        if len(shipped) != len(fresh):
            return [f"{where}: {len(shipped)} items vs {len(fresh)}"]
        return [d for i, (a, b) in enumerate(zip(shipped, fresh))
                for d in _same_fit_within_errors(a, b, f"{where}[{i}]")]
    if isinstance(shipped, float) or isinstance(fresh, float):
        if not (isinstance(fresh, (int, float)) and isinstance(shipped, (int, float))
                and abs(fresh - shipped) <= 1e-4 * max(abs(shipped), 1e-5)):
            return [f"{where}: {shipped} vs {fresh}"]
        return []
    return [] if shipped == fresh else [f"{where}: {shipped!r} vs {fresh!r}"]


def test_core_demo_files_up_to_date(tmp_path):
    """The demo's core files are what its generator writes now (numpy only: byte for
    byte), and core_models.json is what the fit gives now on them, compared within the
    fit's standard errors rather than digit by digit."""
    from satheight.units import parse_quantity
    from satheight.workflows.fit import FitSettings, ReservoirFluids, run_fit

    sys.path.insert(0, str(DEMO))
    try:
        import make_core_demo
    finally:
        sys.path.pop(0)
    data = make_core_demo.files()
    for name, text in data.items():
        assert (DEMO / name).read_text(encoding="utf-8") == text, f"{name} is stale"
    reservoir = {name: ReservoirFluids(parse_quantity(sct, "tension"), drho)
                 for name, (sct, drho) in make_core_demo.RESERVOIR.items()}
    run = run_fit(CORE_FILES, tmp_path, FitSettings(reservoir=reservoir, plots=False,
                                                    model_file="core_models.json"))
    shipped = json.loads((DEMO / "core_models.json").read_text(encoding="utf-8"))
    fresh = json.loads(run.model_path.read_text(encoding="utf-8"))
    assert _same_fit_within_errors(shipped, fresh) == []


def test_fit_comparison_follows_the_standard_error_not_the_digits():
    # c = 2.26 +- 2.8 differing in the 7th digit between two CPUs is the same fit;
    # the same parameter 0.6 standard errors away is not
    a = {"params": {"c": 2.26}, "stderr": {"c": 2.8}, "aic": -688.8}
    assert _same_fit_within_errors(a, {"params": {"c": 2.2600001}, "stderr": {"c": 2.8},
                                       "aic": -688.8}) == []
    assert _same_fit_within_errors(a, {"params": {"c": 2.26 + 0.6 * 2.8}, "stderr": {"c": 2.8},
                                       "aic": -688.8}) != []


def test_demo_run_records_model_file(tmp_path):
    import lasio

    assert main(["demo", "--out", str(tmp_path), "--no-plots"]) == 0
    las = lasio.read(str(tmp_path / "VANTREL-1.las"))
    assert las.params["Z1_MFILE"].value == "core_models.json"
    assert las.params["Z1_ROCK"].value == "Upper Sand"
    assert las.params["Z2_ROCK"].value == "Lower Sand"


# --- option texts of the fit command
def test_fit_option_parsing():
    import math

    from satheight.coreplugs import LAB_SYSTEMS
    from satheight.workflows.fit import (parse_classes, parse_closure, parse_lab_override,
                                         parse_reservoir)
    from satheight.errors import SatHeightError

    name, s = parse_lab_override("mercury_air=485 mN/m,130 deg", LAB_SYSTEMS)
    assert name == "mercury_air"
    assert s.sigma_cos_theta == pytest.approx(0.485 * abs(math.cos(math.radians(130))))
    assert parse_lab_override("oil_brine=26", LAB_SYSTEMS)[1].sigma_cos_theta == pytest.approx(0.026)
    rt, f = parse_reservoir("Upper Sand=26 mN/m,0.13 psi/ft")
    # 0.13 psi/ft as a density: 0.13 * 6894.757 / 0.3048 / 9.80665 (NIST SP 811 factors)
    assert rt == "Upper Sand" and f.delta_rho == pytest.approx(0.13 * 6894.757293168 / 0.3048 / 9.80665)
    assert parse_reservoir("50 mN/m")[0] == "*"
    assert parse_closure("auto") == "auto" and parse_closure("none") is None
    assert parse_closure("5") == pytest.approx(5 * 6894.757293168)
    assert parse_classes("1,10", "permeability", None).edges == pytest.approx((MD, 10 * MD))
    for bad, fn in (("oil_brine", lambda t: parse_lab_override(t, LAB_SYSTEMS)),
                    ("x=26 furlongs", lambda t: parse_lab_override(t, LAB_SYSTEMS)),
                    ("26 mN/m,-3 kg/m3", parse_reservoir), ("-2 psi", parse_closure),
                    ("10,1", lambda t: parse_classes(t, "fzi", None))):
        with pytest.raises(SatHeightError):
            fn(bad)


def test_fixed_closure_pressure_used_for_every_mercury_curve(tmp_path):
    from satheight.coreplugs import core_points
    from satheight.io.core_data import read_core_files

    ds = read_core_files(CORE_FILES[:2])
    pts = core_points(ds, closure=50 * 6894.757293168)
    hg = pts.system == "mercury_air"
    assert set(pts.closure.values()) == {50 * 6894.757293168}
    # at and below the closure pressure the corrected mercury saturation is 0 (Sw = 1)
    assert np.all(pts.sw[hg & (pts.pc_lab <= 50 * 6894.757293168)] == 1.0)
    raw = core_points(ds, closure=None)
    np.testing.assert_allclose(raw.sw, raw.sw_raw, rtol=0, atol=1e-15)



def test_core_and_pressure_plots_draw_names_with_dollar_signs(tmp_path):
    # text from input files (rock types, zone and well names) reaches legends and titles;
    # an unescaped "$\foo$" would make matplotlib fail when the figure is drawn
    odd = r"Upper $\foo$ Sand"
    files = []
    for f in CORE_FILES:
        t = tmp_path / f.name
        t.write_text(f.read_text().replace("Upper Sand", odd))
        files.append(str(t))
    out = tmp_path / "fit"
    code = main(["fit", *files, "--out", str(out), "--reservoir", f"{odd}=26 mN/m,300 kg/m3"])
    assert code == 0
    for name in ("core_j_sw.png", "core_pc.png"):
        assert (out / name).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    pressures = tmp_path / "p.csv"
    lines = (DEMO / "demo_pressures.csv").read_text().replace("Upper Sand", odd).splitlines()
    # points given by TVDSS only (MD-only points need the project's datums)
    keep = [ln for ln in lines if ln.startswith(("#", "well,")) or ln.split(",")[1] != ""]
    pressures.write_text("\n".join(keep) + "\n")
    code = main(["pressures", str(pressures), "--out", str(tmp_path / "pr")])
    assert code == 0
    assert list((tmp_path / "pr").glob("*.png"))
