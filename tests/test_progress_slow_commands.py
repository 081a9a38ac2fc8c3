"""Progress on stderr for fit, fwl and pressures (shown after SLOW_SECONDS; 0 here so the
test does not depend on how fast the machine is)."""

from pathlib import Path

import pytest

from satheight.project import load_project
from satheight.workflows import console
from satheight.workflows.console import Progress
from satheight.workflows.contacts import run_fwl, run_pressures
from satheight.workflows.fit import run_fit

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"


@pytest.fixture
def no_delay(monkeypatch):
    monkeypatch.setattr(console, "SLOW_SECONDS", 0.0)


def test_progress_steps_count_each_step_once(capsys, no_delay):
    """Three steps: the bar ends at 3/3 (closed form: one count per step)."""
    with Progress(3, unit="things", enabled=True, slow=True) as bar:
        for name in ("a", "b", "c"):
            bar.step(name)
    err = capsys.readouterr().err
    assert "things 3/3" in err and "elapsed" in err and "remaining" in err


def test_fit_shows_its_steps(tmp_path, capsys, no_delay):
    run_fit([DEMO / "core_pc_steps.csv", DEMO / "core_plugs.csv"], tmp_path / "fit",
            progress=True)
    err = capsys.readouterr().err
    # README (progress): steps done / total on stderr
    assert "fit steps 4/4" in err and "fitting" in err


def test_fwl_shows_wells_and_zones(tmp_path, capsys, no_delay):
    rep = run_fwl(DEMO / "demo_project.toml", tmp_path / "fwl", plot=False, progress=True,
                  n_boot=20)
    err = capsys.readouterr().err
    # README (progress): one step per well read and per zone searched (5 wells + zones)
    project = load_project(DEMO / "demo_project.toml")
    total = len(project.wells) + len(project.zones)
    assert f"fwl steps {total}/{total}" in err and "zone" in err
    assert rep["zones"]


def test_pressures_show_steps_and_quiet_shows_nothing(tmp_path, capsys, no_delay):
    run_pressures(DEMO / "demo_pressures.csv", tmp_path / "p", with_logs=False, plot=False,
                  progress=True)
    assert "pressures steps 4/4" in capsys.readouterr().err
    run_pressures(DEMO / "demo_pressures.csv", tmp_path / "q", with_logs=False, plot=False)
    assert "steps" not in capsys.readouterr().err
