"""bench/run.py's pieces run on tiny inputs (no timing is checked: speed is measured by
the benchmark itself, never by tests)."""

import argparse
import importlib.util
import json
from pathlib import Path

import numpy as np
import pytest

from satheight.io.las import read_las

BENCH = Path(__file__).resolve().parents[1] / "bench" / "run.py"


@pytest.fixture(scope="module")
def bench():
    spec = importlib.util.spec_from_file_location("bench_run", BENCH)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


@pytest.fixture(scope="module")
def inputs(bench, tmp_path_factory):
    folder = tmp_path_factory.mktemp("bench")
    sizes = {"rows": 300, "engine": 1000, "wells": 3, "well_rows": 200, "repeat": 1}
    return folder, bench.build_inputs(folder, sizes)


def ns(**kw):
    base = dict(which=None, file=None, small=None, out=None, project=None, warm_project=None,
                n=1, repeat=1, workers=1)
    base.update(kw)
    return argparse.Namespace(**base)


def test_synthetic_inputs_are_read_on_the_fast_path(inputs):
    from satheight.io import las as las_mod

    folder, paths = inputs
    big = read_las(paths["big"])
    # README (Performance): the sizes bench/run.py makes its synthetic files with (smoke test, no timing)
    assert big.n_samples == 300 and len(big.curves) == 13
    assert las_mod._parse_fast(paths["big"], paths["big"].read_bytes()) is not None
    assert len(list((folder / "field").glob("*.las"))) == 3


@pytest.mark.parametrize("which", ["ours", "lasio"])
def test_read_and_write_cases(bench, inputs, which, tmp_path):
    _, paths = inputs
    r = bench.case_read(ns(which=which, file=paths["big"], small=paths["small"]))
    # README (Performance): smoke test of the bench: the case runs and reports its keys (no timing is compared);
    # the five new curves bench/run.py writes
    assert r["seconds"] > 0 and set(r) == {"seconds", "peak_mb", "base_mb"}
    out = tmp_path / "w.las"
    bench.case_write(ns(which=which, file=paths["big"], small=paths["small"], out=out))
    back = read_las(out)
    assert list(back.curves)[-5:] == [f"NEW{i}" for i in range(5)]


def test_engine_well_and_project_cases(bench, inputs, tmp_path):
    folder, paths = inputs
    e = bench.case_engine(ns(n=2000, repeat=1))
    # README (Performance): smoke test of the bench cases (no timing is compared); 3 field wells as made above
    assert e["ours"]["seconds"] > 0 and e["floor"]["seconds"] > 0
    w = bench.case_well(ns(project=paths["one_project"], warm_project=paths["warm_project"],
                           out=tmp_path / "w"))
    assert set(w) == {"load", "write", "e2e"}
    p = bench.case_project(ns(project=paths["field_project"], workers=2, out=tmp_path / "p"))
    assert p["wells"] == 3
    assert json.loads((tmp_path / "p" / "run_summary.json").read_text())["wells"][0]["ok"]


def test_floor_is_the_engine_formula(bench):
    # the floor must compute what the engine computes, or the ratio means nothing
    from satheight.engine import ZoneModel, compute_shm
    from satheight.models import build_function

    z = np.linspace(1000, 1040, 50)
    phi, k = np.full(50, 0.2), np.full(50, 1e-13)
    fn = build_function("power_law", {"swirr": 0.1, "a": 0.3, "b": 1.2}, None)
    res = compute_shm(z, phi, k, [ZoneModel("A", 900, 1100, 1050, 1080, 780, "oil", 0.026, fn)])
    h, pc, j, sw = bench.floor_numpy(z, phi, k, 1050.0, 300.0, 0.026, 0.1, 0.3, 1.2)
    # closed form written in bench/run.py's floor_numpy (hydrostatics, leverett1941, the power
    # law), plain numpy; rel 1e-12: the same formula in another order
    np.testing.assert_allclose(res.sw, sw, rtol=1e-12)
    np.testing.assert_allclose(res.j, j, rtol=1e-12)
