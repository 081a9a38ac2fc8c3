"""Every command-line option is validated: zero, negative, reversed or unmatched values are
refused with the option named (exit status 2), options may stand anywhere, ``--workers auto``
takes the cores available, and text from input files reaches the terminal without control
characters.

Independent references: os.sched_getaffinity / os.cpu_count for the cores (standard library);
the ECMA-48 escape character ESC (0x1b) that starts an ANSI sequence (common practice).
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from satheight.cli import available_cores, main, terminal_text
from tiny_field import make_field, write_las

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells"
CORE = [str(DEMO / n) for n in ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv",
                                "core_plug_V12.csv")]


@pytest.fixture
def field(tmp_path):
    return make_field(tmp_path / "in")


def refused(capsys, option: str) -> None:
    err = capsys.readouterr().err
    assert option in err, err
    assert "internal error" not in err and "Traceback" not in err


@pytest.mark.parametrize("args,option", [
    (["--step", "0"], "--step"),
    (["--step", "-0.5"], "--step"),
    (["--resamples", "0"], "--resamples"),
    (["--resamples", "9"], "--resamples"),          # the help says 10-5000
    (["--resamples", "5001"], "--resamples"),
    (["--window", "1010", "990"], "--window"),       # reversed
    (["--window", "1000", "1000"], "--window"),      # empty
    (["--delta", "0"], "--delta"),
    (["--block", "0"], "--block"),
    (["--seed", "-1"], "--seed"),
    (["--tolerance", "-1"], "--tolerance"),
    (["--shale-curve", "GR"], "--shale-curve"),      # no cutoff: would filter nothing
    (["--max-shale", "80"], "--max-shale"),          # no curve
    (["--exclude", "1000:990"], "--exclude"),        # reversed
    (["--exclude", "NOPE:990:1000"], "--exclude"),   # names no well
    (["--wells", "NOPE"], "--wells"),                # matches no well
    (["--fit", "swirr:0.3:0.1"], "--fit"),           # reversed bounds
    (["--zone", "NOPE"], "NOPE"),
])
def test_fwl_option_values_refused_with_the_option_named(field, tmp_path, capsys, args, option):
    code = main(["fwl", str(field), "--out", str(tmp_path / "o"), "--no-plots",
                 "--resamples", "10", *args])
    assert code == 2
    refused(capsys, option)
    assert not (tmp_path / "o").exists() or not list((tmp_path / "o").glob("fwl_*"))


def test_wells_option_does_not_swallow_the_project_file(field, tmp_path, capsys):
    out = tmp_path / "o"
    assert main(["fwl", "--wells", "W0", "W1", str(field), "--out", str(out), "--no-plots",
                 "--resamples", "10"]) == 0
    assert (out / "fwl_S.json").is_file()
    assert main(["fwl", "--wells", "W0", "NOPE", str(field), "--out", str(tmp_path / "p")]) == 2
    refused(capsys, "NOPE")


def test_fwl_without_project_file_is_a_usage_error(tmp_path, capsys):
    with pytest.raises(SystemExit) as exc:
        main(["fwl", "--wells", "W0", "W1"])
    assert exc.value.code == 2
    assert "PROJECT_FILE" in capsys.readouterr().err


@pytest.mark.parametrize("value", ["0", "-2", "1.5", "many"])
def test_workers_zero_negative_or_not_a_number_refused(field, capsys, value):
    with pytest.raises(SystemExit) as exc:
        main(["run", str(field), "--workers", value])
    assert exc.value.code == 2
    refused(capsys, "--workers")


def test_workers_auto_uses_the_cores_available():
    expected = (len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity")
                else os.cpu_count())
    assert available_cores() == expected


def test_workers_auto_runs(field, tmp_path):
    assert main(["run", str(field), "--out", str(tmp_path / "o"), "--no-plots",
                 "--workers", "auto"]) == 0
    assert (tmp_path / "o" / "W1.las").is_file()


@pytest.mark.parametrize("args,option", [
    (["--phi-factor", "0"], "--phi-factor"),
    (["--k-factor", "-1"], "--k-factor"),
    (["--class-names", "a,b"], "--class-names"),     # no classes to name
    (["--k-classes", "100,10"], "--k-classes"),      # reversed edges
    (["--model-file", "../models.json"], "--model-file"),
    (["--reservoir", "Uper Sand=26 mN/m"], "--reservoir"),   # misspelt rock type
])
def test_fit_option_values_refused_with_the_option_named(tmp_path, capsys, args, option):
    assert main(["fit", *CORE, "--out", str(tmp_path / "o"), "--no-plots", *args]) == 2
    refused(capsys, option)
    assert not (tmp_path / "o").exists()


def test_pressures_zone_that_is_not_a_project_zone_is_refused(tmp_path, capsys):
    code = main(["pressures", str(DEMO / "demo_pressures.csv"), "--project",
                 str(DEMO / "demo_project.toml"), "--zone", "Nope", "--out", str(tmp_path / "o"),
                 "--no-plots", "--no-logs"])
    assert code == 2
    refused(capsys, "--zone")


def test_pressures_zone_that_fills_no_point_is_refused(tmp_path, capsys):
    # every point of the demo file names its zone: --zone would change nothing
    code = main(["pressures", str(DEMO / "demo_pressures.csv"), "--zone", "Upper Sand",
                 "--out", str(tmp_path / "o"), "--no-plots"])
    assert code == 2
    refused(capsys, "--zone")


def test_terminal_text_escapes_control_characters():
    # ESC (0x1b) starts every ANSI sequence; CR rewrites the line; U+202E reverses the text
    shown = terminal_text("A\x1b[31mB\rC\u202eD\tE")
    assert shown == "A\\x1b[31mB\\x0dC\\u202eD\tE"


def test_well_name_with_ansi_escape_is_printed_escaped(tmp_path, capsys):
    folder = tmp_path / "in"
    p = make_field(folder)
    write_las(folder / "w0.las", "W0\x1b[2J\x1b[31m")    # clear screen, then red
    assert main(["run", str(p), "--out", str(tmp_path / "o"), "--no-plots"]) in (0, 3)
    out = capsys.readouterr().out
    assert "\x1b" not in out
    assert "\\x1b[2J" in out
