"""The README's tables say what the code does: the plausible-range table is the code's table.

Source of the ranges: satheight.plausible.RANGES, each row naming its own source ("common
practice" or a docs/references.md key); this test only checks the README shows the same rows.
"""

from __future__ import annotations

import re
from pathlib import Path

from satheight.plausible import RANGES

README = Path(__file__).resolve().parents[1] / "README.md"


def _readme_range_rows() -> dict[str, list[str]]:
    text = README.read_text(encoding="utf-8")
    section = text[text.index("### Plausible ranges"):]
    table = section[section.index("| key |"):].split("\n\n")[0]     # the first table only
    rows = {}
    for line in table.splitlines():
        m = re.match(r"\| `(\w+)` \|(.*)\|\s*$", line)
        if m:
            rows[m.group(1)] = [c.strip() for c in m.group(2).split("|")]
    return rows


def test_readme_plausible_ranges_are_the_code_table():
    rows = _readme_range_rows()
    assert list(rows) == list(RANGES)      # every key, in the code's order
    for key, r in RANGES.items():
        assert rows[key] == [r.what, r.text(), r.source], key
