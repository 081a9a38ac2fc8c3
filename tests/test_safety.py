"""Safety of what the tool reads: the project file is data only (TOML, nothing evaluated,
no pickle), paths in it are resolved relative to its folder and reported in run_summary.json.
(Escaping of input text in plot titles is tested in test_plots.py.)
"""

import ast
import json
import os
from pathlib import Path

from satheight.cli import main
from satheight.project import load_project

ROOT = Path(__file__).resolve().parents[1]
SRC = ROOT / "src" / "satheight"

LAS = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
NULL. -999.25 :
WELL. S-1 :
EKB.M 0 :
~Curve
DEPT.M : depth
PHIE.V/V : porosity
PERM.MD : permeability
~A
1000.0 0.2 10
1000.1 0.21 12
"""

PROJECT = """[project]
name = "{name}"
units = "metric"
[[wells]]
las = "{las}"
[[zones]]
name = "Z"
top = 990
base = 1100
fwl = 1050
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
"""

BANNED_CALLS = {"eval", "exec", "compile", "__import__"}
BANNED_MODULES = {"pickle", "cPickle", "marshal", "shelve", "dill", "yaml", "subprocess"}


def test_source_evaluates_nothing_and_unpickles_nothing():
    """Static scan of the package: no eval/exec/compile, no pickle-like or shell modules."""
    files = sorted(SRC.rglob("*.py"))
    # README (Bad input, Project file): data only, read with tomllib, nothing evaluated or unpickled
    assert len(files) > 10
    for f in files:
        tree = ast.parse(f.read_text(), filename=str(f))
        for node in ast.walk(tree):
            if isinstance(node, ast.Call) and isinstance(node.func, ast.Name):
                assert node.func.id not in BANNED_CALLS, (f, node.lineno)
            if isinstance(node, ast.Import):
                assert not {a.name.split(".")[0] for a in node.names} & BANNED_MODULES, f
            if isinstance(node, ast.ImportFrom) and node.module:
                assert node.module.split(".")[0] not in BANNED_MODULES, (f, node.lineno)
    assert "tomllib" in (SRC / "project" / "reader.py").read_text()


def test_code_like_text_stays_text(tmp_path):
    marker = tmp_path / "pwned"
    name = f"__import__('os').system('touch {marker}')"
    (tmp_path / "w.las").write_text(LAS)
    (tmp_path / "p.toml").write_text(PROJECT.format(name=name, las="w.las"))
    project = load_project(tmp_path / "p.toml")
    # README (Bad input, Project file): text stays text (nothing evaluated)
    assert project.name == name
    assert main(["run", str(tmp_path / "p.toml"), "--out", str(tmp_path / "o"), "--no-plots"]) == 0
    assert not marker.exists()


def test_paths_relative_to_project_file_and_reported(tmp_path, monkeypatch):
    proj_dir = tmp_path / "proj"
    (proj_dir / "logs").mkdir(parents=True)
    (proj_dir / "logs" / "w.las").write_text(LAS)
    (proj_dir / "p.toml").write_text(PROJECT.format(name="Rel", las="logs/w.las"))
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    (elsewhere / "logs").mkdir()
    (elsewhere / "logs" / "w.las").write_text("not the file to read")
    monkeypatch.chdir(elsewhere)                 # the current folder must not matter
    # README (Outputs): paths are relative to the project file; inputs recorded with their
    # SHA-256 (FIPS 180-4: 64 hex characters)
    assert main(["run", os.path.join("..", "proj", "p.toml"), "--out", "o", "--no-plots"]) == 0
    summary = json.loads((elsewhere / "o" / "run_summary.json").read_text())
    inputs = summary["inputs"]
    assert inputs["project_file"]["path"] == str((proj_dir / "p.toml").resolve())
    assert inputs["wells"][0]["las"] == str((proj_dir / "logs" / "w.las").resolve())
    assert len(inputs["wells"][0]["sha256"]) == 64
    assert summary["wells"][0]["ok"]
