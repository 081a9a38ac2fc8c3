"""Text from input files never injects lines into what the tool writes.

A zone named with a line break, a LAS section title and a terminal escape (``"S\\n~A x\\x1b[31m"``)
must stay one header value in the exported LAS (LAS 2.0 standard, cwls1992: a header line is
``MNEM.UNIT VALUE : DESCRIPTION`` and a line starting with ``~`` opens a section), one JSON key,
and escaped text on the terminal.
"""

from __future__ import annotations

import json

import lasio

from satheight.cli import main
from tiny_field import make_field

ODD = "S\n~A x\x1b[31m"


def _field(tmp_path):
    project = make_field(tmp_path / "f", wells=(("w0.las", "W0"),))
    text = project.read_text(encoding="utf-8").replace('name = "S"', 'name = "S\\n~A x\\u001b[31m"')
    project.write_text(text, encoding="utf-8")
    return project


def test_zone_name_with_a_line_break_stays_one_las_header_value(tmp_path, capsys):
    project = _field(tmp_path)
    out = tmp_path / "o"
    assert main(["run", str(project), "--out", str(out), "--no-plots"]) == 0
    las_text = (out / "W0.las").read_text(encoding="utf-8")
    # cwls1992: one ~A section, opened by the only line that starts with "~A"
    assert [ln[:2] for ln in las_text.splitlines() if ln.startswith("~")].count("~A") == 1
    assert "\x1b" not in las_text
    # general-purpose reader (lasio) finds the zone name as one parameter value, on one line
    las = lasio.read(str(out / "W0.las"))
    names = [p.value for p in las.params if p.mnemonic.endswith("_NAME")]
    assert len(names) == 1 and "\n" not in str(names[0]) and "~A x" in str(names[0])
    # the JSON summary keeps the name as a key, escaped by the JSON writer (standard library json)
    summary = json.loads((out / "W0_summary.json").read_text(encoding="utf-8"))
    assert ODD in summary["zones"]
    # terminal: the escape character is printed as text, never raw
    printed = capsys.readouterr()
    assert "\x1b" not in printed.out + printed.err
