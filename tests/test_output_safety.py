"""Outputs never destroy or mix anything: inputs are never replaced, names never collide, a file
satheight did not write is never replaced, two runs never write one folder at once, a killed
run's leftovers are cleaned, and the outputs appear together at the end.

Independent references: checksums with the standard library's hashlib; processes alive or dead
from subprocess (common practice on POSIX: a reaped child's pid names no process).
"""

from __future__ import annotations

import hashlib
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from satheight.cli import EXIT_BAD_INPUT, EXIT_OK, main
from satheight.workflows import run as run_module
from tiny_field import make_field, write_las

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"


def digests(folder: Path) -> dict[str, str]:
    return {p.name: hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.iterdir()) if p.is_file()}


def run(project: Path, out: Path, *extra: str) -> int:
    return main(["run", str(project), "--out", str(out), "--no-plots", *extra])


def test_output_folder_equal_to_the_input_folder_never_replaces_an_input(tmp_path, capsys):
    # the wells are named like their LAS files, so the outputs W0.las, W1.las would be the inputs
    p = make_field(tmp_path, wells=(("W0.las", "W0"), ("W1.las", "W1")))
    before = digests(tmp_path)
    for extra in ((), ("--overwrite",)):
        assert run(p, tmp_path, *extra) == EXIT_BAD_INPUT
        err = capsys.readouterr().err
        assert err.count("\n") == 1 and "input file" in err and "W0.las" in err
        assert digests(tmp_path) == before            # nothing written, nothing replaced
    assert sorted(os.listdir(tmp_path)) == sorted(before)   # no lock or work folder left


def test_fit_points_table_never_replaces_an_input_table(tmp_path, capsys):
    names = ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv", "core_plug_V12.csv")
    for n in names:
        shutil.copy(DEMO / n, tmp_path / n)
    (tmp_path / "core_pc_steps.csv").rename(tmp_path / "core_points.csv")   # fit's output name
    files = [str(tmp_path / n) for n in ("core_plugs.csv", "core_points.csv",
                                         "core_plate_steps.csv", "core_plug_V12.csv")]
    before = digests(tmp_path)
    assert main(["fit", *files, "--out", str(tmp_path), "--no-plots", "--overwrite"]) == 2
    err = capsys.readouterr().err
    assert "core_points.csv" in err and "input file" in err
    assert digests(tmp_path) == before


def test_input_changed_during_the_run_is_an_error_naming_it(tmp_path, monkeypatch, capsys):
    p = make_field(tmp_path / "in")
    real = run_module.compute_well

    def compute_and_touch(project, spec, *rest):
        if spec.las.name == "w1.las":
            with open(tmp_path / "in" / "w0.las", "a") as f:   # another program edits an input
                f.write("\n")
        return real(project, spec, *rest)

    monkeypatch.setattr(run_module, "compute_well", compute_and_touch)
    out = tmp_path / "out"
    assert run(p, out) == EXIT_BAD_INPUT
    err = capsys.readouterr().err
    assert "w0.las" in err and "changed" in err
    assert os.listdir(out) == []                       # nothing placed


def test_outputs_appear_only_when_the_run_ends(tmp_path, monkeypatch):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    seen = []
    real = run_module.compute_well

    def compute_and_look(project, spec, *rest):
        seen.append(sorted(n for n in os.listdir(out) if not n.startswith(".")))
        return real(project, spec, *rest)

    monkeypatch.setattr(run_module, "compute_well", compute_and_look)
    assert run(p, out) == EXIT_OK
    assert seen == [[], []]                           # while wells run, no visible output
    assert {"W0.las", "W1.las", "run_summary.json"} <= set(os.listdir(out))


@pytest.mark.parametrize("name", ["run", "Report", "field_section", "run_summary"])
def test_well_named_like_a_run_file_is_refused(tmp_path, capsys, name):
    p = make_field(tmp_path / "in", names=(name, None))
    out = tmp_path / "out"
    assert run(p, out) == EXIT_BAD_INPUT
    err = capsys.readouterr().err
    assert repr(name) in err and "collides" in err
    assert not out.exists() or os.listdir(out) == []


def test_well_name_from_las_colliding_with_a_run_file_fails_that_well(tmp_path):
    p = make_field(tmp_path / "in", wells=(("w0.las", "run"), ("w1.las", "W1")))
    out = tmp_path / "out"
    assert run(p, out) == 3                           # the other well ran
    summary = (out / "run_summary.json").read_text()
    assert "collides" in summary and (out / "W1.las").is_file()


def test_same_las_listed_twice_is_refused(tmp_path, capsys):
    p = make_field(tmp_path / "in", wells=(("w0.las", "W0"), ("w0.las", "W0")), names=("A", "B"))
    assert run(p, tmp_path / "out") == EXIT_BAD_INPUT
    err = capsys.readouterr().err
    assert "'A'" in err and "'B'" in err and "same LAS file" in err


def test_same_las_under_another_path_is_refused(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    (tmp_path / "in" / "link.las").symlink_to(tmp_path / "in" / "w0.las")
    text = p.read_text().replace('[[zones]]', '[[wells]]\nlas = "link.las"\nname = "C"\n\n[[zones]]', 1)
    p.write_text(text)
    assert run(p, tmp_path / "out") == EXIT_BAD_INPUT
    assert "same LAS file" in capsys.readouterr().err


def test_manifest_lists_every_file_the_run_wrote_with_its_checksum(tmp_path):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    assert run(p, out) == EXIT_OK
    lines = (out / "satheight-manifest-run.sha256").read_text().splitlines()
    listed = dict(reversed(line.split("  ", 1)) for line in lines)
    visible = {n: d for n, d in digests(out).items() if not n.startswith("satheight-manifest")}
    assert listed == visible                          # sha256sum format, every output, nothing else


def test_file_satheight_did_not_write_is_never_replaced(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    out.mkdir()
    (out / "report.html").write_text("my own report")
    for extra in ((), ("--overwrite",)):
        assert run(p, out, *extra) == EXIT_BAD_INPUT
        assert "report.html" in capsys.readouterr().err
        assert (out / "report.html").read_text() == "my own report"
        assert not (out / "W0.las").exists()


def test_overwrite_never_replaces_an_output_edited_since(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    assert run(p, out) == EXIT_OK
    (out / "W0.parquet").write_text("edited by hand")
    assert run(p, out, "--overwrite") == EXIT_BAD_INPUT
    assert "W0.parquet" in capsys.readouterr().err
    assert (out / "W0.parquet").read_text() == "edited by hand"


def test_overwrite_removes_files_the_run_no_longer_writes_and_keeps_others(tmp_path):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    assert main(["run", str(p), "--out", str(out)]) == EXIT_OK          # with plots
    assert (out / "W0_tracks.png").is_file()
    (out / "notes.txt").write_text("mine")
    assert run(p, out, "--overwrite") == EXIT_OK                        # --no-plots
    assert not list(out.glob("*.png"))                                  # no stale plot
    assert (out / "notes.txt").read_text() == "mine"


def test_second_run_into_a_locked_folder_fails_at_once(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    out.mkdir()
    holder = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(60)"])
    try:
        import socket
        (out / ".satheight.lock").write_text(f"{holder.pid} {socket.gethostname()}\n")
        assert run(p, out) == EXIT_BAD_INPUT
        err = capsys.readouterr().err
        assert "another satheight run" in err and str(holder.pid) in err
        assert (out / ".satheight.lock").exists()     # the live run's lock is left alone
        assert not (out / "W0.las").exists()
    finally:
        holder.kill()
        holder.wait()


def test_stale_lock_of_a_dead_process_is_cleaned(tmp_path):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    out.mkdir()
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()                                       # reaped: its pid names no process
    import socket
    (out / ".satheight.lock").write_text(f"{dead.pid} {socket.gethostname()}\n")
    assert run(p, out) == EXIT_OK
    assert not (out / ".satheight.lock").exists()


def test_work_folders_of_killed_runs_are_cleaned_by_the_next_run(tmp_path):
    p = make_field(tmp_path / "in")
    out = tmp_path / "out"
    left = out / ".satheight-work-0123456789ab"
    left.mkdir(parents=True)
    (left / "W0.las").write_text("half a file")
    assert run(p, out) == EXIT_OK
    assert not left.exists()
    assert not [n for n in os.listdir(out) if n.startswith(".")]


def test_two_zones_with_one_file_name_are_refused(tmp_path, capsys):
    """Zones 'A B' and 'A_B' would both write fwl_A_B.json."""
    p = make_field(tmp_path / "in")
    text = p.read_text()
    zone = text[text.index("[[zones]]"):]
    two = (zone.replace('name = "S"', 'name = "A B"').replace('base = "1100 m"', 'base = "990 m"')
           + "\n" + zone.replace('name = "S"', 'name = "A_B"').replace('top = "900 m"', 'top = "990 m"'))
    p.write_text(text[:text.index("[[zones]]")] + two)
    code = main(["fwl", str(p), "--out", str(tmp_path / "o"), "--no-plots", "--resamples", "10"])
    assert code == EXIT_BAD_INPUT
    assert "same name" in capsys.readouterr().err


def test_fwl_and_pressures_refuse_a_rerun_without_overwrite(tmp_path, capsys):
    p = make_field(tmp_path / "in")
    out = tmp_path / "o"
    args = ["fwl", str(p), "--out", str(out), "--no-plots", "--resamples", "10"]
    assert main(args) == EXIT_OK
    assert main(args) == EXIT_BAD_INPUT
    assert "--overwrite" in capsys.readouterr().err
    assert main(args + ["--overwrite"]) == EXIT_OK


def test_las_file_of_a_well_is_written_once_even_when_read_from_the_output_folder(tmp_path):
    """A LAS in the output folder with another name than the outputs is read and left alone."""
    out = tmp_path / "out"
    out.mkdir()
    write_las(out / "input-w0.las", "W0")
    p = make_field(tmp_path / "in", wells=(("w1.las", "W1"),))
    p.write_text(p.read_text().replace('[[zones]]', f'[[wells]]\nlas = "{out / "input-w0.las"}"\n\n[[zones]]', 1))
    before = hashlib.sha256((out / "input-w0.las").read_bytes()).hexdigest()
    assert run(p, out) == EXIT_OK
    assert hashlib.sha256((out / "input-w0.las").read_bytes()).hexdigest() == before
    assert (out / "W0.las").is_file()
