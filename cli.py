#!/usr/bin/env python3
"""Launcher: ``python cli.py ...`` does exactly what the ``satheight`` command does.

From a source checkout the package in ``src/`` is used (no install needed).
"""

import sys
from pathlib import Path

_src = Path(__file__).resolve().parent / "src"
if (_src / "satheight").is_dir():
    sys.path.insert(0, str(_src))

from satheight.cli import main  # noqa: E402

if __name__ == "__main__":
    sys.exit(main())
