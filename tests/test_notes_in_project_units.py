"""Notes and printed quantities are in the project's units, rounded to what they mean, plain
numbers (no thousands separator). 1 ft = 0.3048 m exactly (international foot, nist2008)."""

from __future__ import annotations

import re

from satheight import units as U
from satheight.fwlsearch import search_fwl
from satheight.project import load_project
from satheight.workflows.well import compute_well
from test_contacts import samples_of
from tiny_field import make_field

FT = 0.3048


def test_shown_quantities_are_plain_numbers_in_the_system_unit():
    # worked by hand: 2105 m / 0.3048 = 6906.17 ft -> 0.1 ft; 1 psi = 6894.757 Pa (nist2008)
    assert U.shown(2105.0, "length", "field") == "6906.2 ft"
    assert U.shown(2105.0, "length", "metric") == "2105.00 m"
    assert U.shown(6894.757293168, "pressure", "field") == "1.00 psi"
    assert U.shown(1050.0, "density", "field") == "1.050 g/cm3"
    assert "," not in U.shown(12345678.0, "length", "metric")


def test_run_notes_of_a_feet_project_are_in_feet(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),), fwl=1010.0)
    p.write_text(p.read_text(encoding="utf-8").replace('units = "metric"', 'units = "field"'),
                 encoding="utf-8")
    project = load_project(p)
    result, notes = compute_well(project, project.wells[0])
    note = next(n for n in notes if "deepest sample" in n)
    # FWL 1010 m = 3313.6 ft; deepest sample MD 1029.9 m - EKB 25 m = 1004.9 m = 3296.9 ft
    assert "FWL (3313.6 ft TVDSS)" in note and "(3296.9 ft)" in note
    assert not re.search(r"\d m\b", note)


def test_flagged_well_note_of_the_fwl_search_follows_the_display_unit():
    s = [samples_of(0), samples_of(1), samples_of(2, fwl=2092.0)]
    r = search_fwl(s, n_boot=60, seed=2)
    w2 = next(w for w in r.wells if w.well == "W2")
    shown = r.to_dict(FT, "ft")["warnings"]
    note = next(n for n in shown if n.startswith("W2: own best FWL"))
    assert note.startswith(f"W2: own best FWL {w2.best / FT:.2f} ft [{w2.low / FT:.2f}, ")
    assert f"[{r.low / FT:.2f}, {r.high / FT:.2f}]" in note
    assert sum(n.startswith("W2: own best FWL") for n in shown) == 1    # replaced, not added
