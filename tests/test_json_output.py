"""``--json`` on every command: one strict JSON document on stdout with ``schema_version``."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from satheight.cli import build_parser, main

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
CORE = [DEMO / n for n in ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv",
                           "core_plug_V12.csv")]


def _no_nan(text):
    raise ValueError(f"not strict JSON: {text}")   # RFC 8259 has no NaN or Infinity


def _commands(tmp: Path) -> dict[str, list]:
    folder = tmp / "folder"
    shutil.copytree(DEMO, folder, ignore=shutil.ignore_patterns("*.toml", "*.py", "*.json"))
    project = DEMO / "demo_project.toml"
    return {
        "inspect": ["inspect", DEMO / "VANTREL-1.las"],
        "demo": ["demo", "--no-plots", "--out", tmp / "demo"],
        "run": ["run", project, "--no-plots", "--quiet", "--out", tmp / "run"],
        "fit": ["fit", *CORE, "--no-plots", "--out", tmp / "fit"],
        "fwl": ["fwl", project, "--zone", "Lower Sand", "--resamples", "20", "--no-plots",
                "--out", tmp / "fwl"],
        "pressures": ["pressures", DEMO / "demo_pressures.csv", "--project", project, "--no-plots",
                      "--no-logs",
                      "--out", tmp / "pressures"],
        "start": ["start", folder],
    }


def test_every_command_accepts_json():
    sub = next(a for a in build_parser()._actions if a.dest == "command")
    missing = [name for name, p in sub.choices.items()
               if "--json" not in {o for a in p._actions for o in a.option_strings}]
    assert missing == []


@pytest.mark.parametrize("command", ["inspect", "demo", "run", "fit", "fwl", "pressures", "start"])
def test_json_output_is_strict_json_with_schema_version(command, tmp_path, capsys):
    args = _commands(tmp_path)[command]
    assert main([*map(str, args), "--json"]) == 0
    out = capsys.readouterr().out
    doc = json.loads(out, parse_constant=_no_nan)
    assert isinstance(doc["schema_version"], int) and doc["schema_version"] >= 1
    assert doc["command"] == command
    if command in ("demo", "run"):
        written = json.loads((tmp_path / command / "run_summary.json").read_text())
        assert written["schema_version"] == doc["schema_version"]
        assert [w["name"] for w in doc["wells"]] == [w["name"] for w in written["wells"]]
    if command == "fit":
        assert doc["models"]["format"] == "satheight-models"
    if command == "start":
        assert Path(doc["project_file"]).exists()
