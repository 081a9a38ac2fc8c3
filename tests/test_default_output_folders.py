"""Every command's default output folder follows one rule: ``./<input file name>_<command>``
(README "Usage")."""

from __future__ import annotations

from pathlib import Path

from satheight.cli import main
from tiny_field import make_field

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"


def test_run_and_pressures_write_into_input_name_underscore_command(tmp_path, monkeypatch):
    project = make_field(tmp_path / "field", wells=(("w0.las", "W0"),))
    monkeypatch.chdir(tmp_path)
    assert main(["run", str(project), "--no-plots", "--quiet"]) == 0
    # README (Usage): ./<project>_run
    assert (tmp_path / f"{project.stem}_run" / "W0.las").is_file()
    assert main(["pressures", str(DEMO / "demo_pressures.csv"), "--no-plots"]) == 0
    # README (Usage): ./<pressure file>_pressures
    assert (tmp_path / "demo_pressures_pressures" / "pressures_summary.json").is_file()
    assert main(["fit", str(DEMO / "core_plugs.csv"), str(DEMO / "core_pc_steps.csv"),
                 "--no-plots"]) == 0
    # README (Usage): ./<first core file>_fit
    assert (tmp_path / "core_plugs_fit" / "models.json").is_file()
