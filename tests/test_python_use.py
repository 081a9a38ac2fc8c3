"""The README's "Python use" section runs as written: every ```python block, in order, in a
temporary folder, so the documentation cannot drift from the code.

The section is read from README.md (the level-2 heading "Python use").
"""

from __future__ import annotations

import os
import re
import warnings
from pathlib import Path

import matplotlib
import pytest

ROOT = Path(__file__).resolve().parents[1]
HEADING = "## Python use"


def python_use_section() -> tuple[str, Path]:
    """The text of the "Python use" section and the file it came from."""
    for path in (ROOT / "README.md",):
        text = path.read_text(encoding="utf-8")
        lines = text.splitlines()
        starts = [i for i, line in enumerate(lines) if line.strip() == HEADING]
        if starts:
            body = []
            for line in lines[starts[0] + 1:]:
                if line.startswith("## ") or line.startswith("# "):
                    break
                body.append(line)
            return "\n".join(body), path
    raise AssertionError("no '## Python use' section in README.md")


def python_blocks(section: str) -> list[str]:
    return re.findall(r"^```python\n(.*?)^```", section, flags=re.S | re.M)


def test_the_section_has_examples_that_use_only_the_public_surface():
    section, path = python_use_section()
    # README (Python use): runnable examples of the public surface
    assert len(python_blocks(section)) >= 4, path
    private = re.findall(r"(?:from|import) satheight\.\w+", section)
    # README (Python use): everything outside satheight.__all__ is private
    assert private == [], private


@pytest.mark.parametrize("index", range(len(python_blocks(python_use_section()[0]))))
def test_python_use_example_runs(index, tmp_path, monkeypatch):
    section, path = python_use_section()
    code = python_blocks(section)[index]
    matplotlib.use("Agg")
    monkeypatch.chdir(tmp_path)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        # README (Python use): the example runs without an error
        exec(compile(code, f"{path.name}, python block {index + 1}", "exec"), {"__name__": "__main__"})
    # files the examples say they write are there
    for name in re.findall(r'savefig\("([^"{}]+)"\)', code):
        assert (tmp_path / name).stat().st_size > 0, name
    if "satheight.run(" in code:
        assert (tmp_path / "demo_results" / "contacts.csv").is_file()
    assert os.getcwd() == str(tmp_path)
