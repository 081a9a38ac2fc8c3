"""Fuzz cases of the CSV readers: survey, tops, core data (three layouts), pressure points.

Imported at the end of ``tests/fuzzkit.py``, which registers the cases built here. Each
valid-file generator draws the numbers as integers scaled by a power of ten, writes them
as text and keeps the float of that text as the expected value, so the check can ask for
equality after unit conversion (factors below, with their sources).

Mutations work on LF text (``tests/test_fuzz_readers.py`` hands them that): the generic
ones of ``fuzzkit`` plus the CSV ones here. ``same_values`` mutations change only the
form (line ends, byte-order mark, blanks, letter case of column names): the file must
load with exactly the generated values and line numbers.

Every error of these readers must, besides naming the file in one line (``fuzzkit``
checks that), name the line or row unless it is about the whole file (see
:data:`FILE_LEVEL`).
"""

from __future__ import annotations

import math
import re

import numpy as np
from hypothesis import strategies as st

from fuzzkit import (ReaderCase, mut_bytes, mut_random_line, mut_truncate, register)
from satheight.errors import SatHeightError

# Independent unit factors (SI).
FT = 0.3048                                  # NIST SP 811: 1 ft = 0.3048 m (exact)
DEG = math.pi / 180                          # definition of the degree
PSI = 0.45359237 * 9.80665 / 0.0254 ** 2     # NIST SP 811: 1 lbf/in^2 (lb, g_n, in exact)
# SI prefixes; NIST SP 811: 1 bar = 1e5 Pa, 1 atm = 101 325 Pa (both exact)
PRESSURE = {"psi": PSI, "psia": PSI, "Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "bar": 1e5,
            "atm": 101325.0}
MILLIDARCY = 9.869233e-16                    # NIST SP 811 Appendix B: 1 darcy = 9.869233e-13 m^2
G_CM3 = 1000.0                               # SI prefixes: 1 g/cm3 = 1000 kg/m3

#: Error messages about the whole file (no line to name).
FILE_LEVEL = re.compile(
    r"not UTF-8|no header|no data rows|not found|cannot read|is empty$|empty file|"
    r"has no .*column|no column|column .* is missing|no depth column|has no unit|unknown unit|"
    r"is not a (length|pressure|angle|fraction) unit|cannot tell which core-data layout|"
    r"both sw and snw|two columns mean|appears twice|lack '# |is not a number with an optional unit|"
    r"unit .* is not a", re.I)
_LOCATED = re.compile(r"\b(line|row) \d+|\bMD [-+0-9.e]+ ")


def located(load):
    """``load`` whose SatHeightError must name a line/row unless it is about the whole file."""
    def run(path):
        try:
            return load(path)
        except SatHeightError as exc:
            msg = str(exc)
            assert _LOCATED.search(msg) or FILE_LEVEL.search(exc.what), \
                f"error names no line or row: {msg}"
            raise
    return run


# --------------------------------------------------------------------------------------
# shared pieces of the generators


def _case(draw, name):
    """``name`` in lower, upper or title case (column names are case-insensitive)."""
    return draw(st.sampled_from([name.lower(), name.upper(), name.title()]))


def _scaled(draw, lo, hi, dec_max=4):
    """(text, value) of an integer in [lo, hi] divided by 10**d."""
    d = draw(st.integers(0, dec_max))
    n = draw(st.integers(lo * 10 ** d, hi * 10 ** d))
    text = f"{n / 10 ** d:.{d}f}" if d else str(n)
    return text, float(text)


def _increasing(draw, n, start_lo, start_hi, step_hi, d):
    """n strictly increasing numbers with d decimals: (texts, values)."""
    start = draw(st.integers(start_lo * 10 ** d, start_hi * 10 ** d))
    steps = draw(st.lists(st.integers(1, step_hi * 10 ** d), min_size=n - 1, max_size=n - 1))
    ints = np.concatenate([[start], start + np.cumsum(steps, dtype=np.int64)]).astype(np.int64)
    texts = [f"{int(i) / 10 ** d:.{d}f}" if d else str(int(i)) for i in ints]
    return texts, [float(t) for t in texts]


def _layout(draw, body_rows, header, units_row=None):
    """File text with optional comments and blank lines; returns (text, line of each body row)."""
    lines = []
    for _ in range(draw(st.integers(0, 2))):
        lines.append(draw(st.sampled_from(["# written for a test", "", "   # indented note",
                                           "#", "# a, b, c"])))
    lines.append(header)
    if units_row is not None:
        lines.append(units_row)
    numbers = []
    for row in body_rows:
        if draw(st.integers(0, 9)) == 0:
            lines.append(draw(st.sampled_from(["", "# between rows", "  "])))
        lines.append(row)
        numbers.append(len(lines))
    return "\n".join(lines) + "\n", numbers


def _named(name, unit, style):
    """Header cell: name with the unit in [..] or (..) or none (unit given elsewhere)."""
    if not unit or style == "none":
        return name
    return f"{name} [{unit}]" if style == "[]" else f"{name} ({unit})"


# --------------------------------------------------------------------------------------
# survey CSV


@st.composite
def valid_survey_files(draw):
    n = draw(st.integers(1, 15))
    md_unit = draw(st.sampled_from(["m", "ft", "M", "FT", "feet"]))
    f_md = 1.0 if md_unit.lower() in ("m",) else FT
    ang_unit = draw(st.sampled_from(["", "deg", "rad", "DEG"]))
    f_ang = 1.0 if ang_unit == "rad" else DEG
    d = draw(st.integers(0, 3))
    md_t, md_v = _increasing(draw, n, 0, 4000, 300, d)
    top_inc, top_azi = (3, 6) if ang_unit == "rad" else (180, 360)
    inc = [_scaled(draw, 0, top_inc - (1 if ang_unit == "rad" else 0), 3) for _ in range(n)]
    azi = [_scaled(draw, 0, top_azi - (1 if ang_unit == "rad" else 0), 3) for _ in range(n)]
    tie_cols = draw(st.sets(st.sampled_from(["TVD", "NORTH", "EAST"])))
    tie_t = {c: _scaled(draw, -2000, 4000, 2) for c in tie_cols}
    tie_unit = {c: draw(st.sampled_from(["", "m", "ft"])) for c in tie_cols}
    style = draw(st.sampled_from(["[]", "()", "row"]))
    cols = [("md", _case(draw, draw(st.sampled_from(["MD", "DEPTH", "DEPT"]))), md_unit),
            ("inc", _case(draw, draw(st.sampled_from(["INC", "INCL", "INCLINATION", "DEVI"]))),
             ang_unit),
            ("azi", _case(draw, draw(st.sampled_from(["AZI", "AZIM", "AZIMUTH", "HAZI"]))),
             ang_unit)]
    for c in sorted(tie_cols):
        name = {"TVD": "TVD", "NORTH": draw(st.sampled_from(["NORTH", "N"])),
                "EAST": draw(st.sampled_from(["EAST", "E"]))}[c]
        cols.append((c, _case(draw, name), tie_unit[c]))
    if draw(st.booleans()):
        cols.append(("note", "comment", ""))
    order = draw(st.permutations(range(len(cols))))
    cols = [cols[i] for i in order]
    header = ",".join(_named(name, unit, "none" if style == "row" else style)
                      for _, name, unit in cols)
    units_row = ",".join(unit for _, _, unit in cols) if style == "row" else None
    rows = []
    for k in range(n):
        cells = []
        for key, _, _ in cols:
            if key == "md":
                cells.append(md_t[k])
            elif key == "inc":
                cells.append(inc[k][0])
            elif key == "azi":
                cells.append(azi[k][0])
            elif key == "note":
                cells.append(draw(st.sampled_from(["", "gyro", "MWD run 2"])))
            else:
                cells.append(tie_t[key][0] if k == 0 else draw(st.sampled_from(["", "0", "x"])))
        rows.append(",".join(cells))
    text, lines = _layout(draw, rows, header, units_row)
    tie = None
    if tie_cols:
        tie = tuple(tie_t[c][1] * ((1.0 if (tie_unit[c] or md_unit).lower() == "m" else FT))
                    if c in tie_cols else 0.0 for c in ("TVD", "NORTH", "EAST"))
    exp = {"md": np.array(md_v) * f_md, "inc": np.array([v for _, v in inc]) * f_ang,
           "azi": np.array([v for _, v in azi]) * f_ang, "tie": tie,
           "labels": [f"line {n}" for n in lines]}
    return text, exp


def check_survey_valid(s, exp):
    for key in ("md", "inc", "azi"):
        np.testing.assert_allclose(getattr(s, key), exp[key], rtol=1e-12, atol=1e-12, err_msg=key)
    if exp["tie"] is None:
        assert s.tie_in is None
    else:
        np.testing.assert_allclose(s.tie_in, exp["tie"], rtol=1e-12, atol=1e-12)
    assert s.labels == exp["labels"]


def check_survey_sane(s):
    md = np.asarray(s.md)
    assert md.ndim == 1 and md.size >= 1 and s.inc.shape == md.shape == s.azi.shape
    assert np.all(np.isfinite(md)) and np.all(md >= 0) and np.all(np.diff(md) > 0)
    assert np.all(np.isfinite(s.inc)) and np.all((s.inc >= -1e-9) & (s.inc <= math.pi + 1e-9))
    assert np.all(np.isfinite(s.azi)) and np.all((s.azi >= -1e-9) & (s.azi <= 2 * math.pi + 1e-9))
    assert len(s.labels) == md.size
    assert s.tie_in is None or (len(s.tie_in) == 3 and all(math.isfinite(v) for v in s.tie_in))


# --------------------------------------------------------------------------------------
# tops CSV

_WELLS = ("A-1", "VANTREL-2", "W 3", "Ñandú-4", "B_7")
_ZONES = ("Upper Sand", "Z1", "Lower", "Zone-3", "Ü")


@st.composite
def valid_tops_files(draw):
    pairs = draw(st.lists(st.tuples(st.sampled_from(_WELLS), st.sampled_from(_ZONES)),
                          min_size=1, max_size=10, unique=True))
    unit = draw(st.sampled_from(["", "m", "ft", "FT", "metres"]))
    f = FT if unit.lower() == "ft" else 1.0
    style = draw(st.sampled_from(["[]", "()", "row"])) if unit else "none"
    has_depth = draw(st.booleans())
    cols = [("well", _case(draw, "well"), ""), ("zone", _case(draw, "zone"), ""),
            ("top", _case(draw, "top"), unit), ("base", _case(draw, "base"), unit)]
    if has_depth:
        cols.append(("depth", _case(draw, draw(st.sampled_from(["depth", "depth_type",
                                                                "reference"]))), ""))
    if draw(st.booleans()):
        cols.append(("note", "source", ""))
    order = draw(st.permutations(range(len(cols))))
    cols = [cols[i] for i in order]
    header = ",".join(_named(name, u, "none" if style == "row" else style)
                      for _, name, u in cols)
    units_row = ",".join(u for _, _, u in cols) if style == "row" else None
    rows, exp = [], []
    for well, zone in pairs:
        d = draw(st.integers(0, 3))
        top_t, top_v = _scaled(draw, -500, 5000, d)
        thick = draw(st.integers(1, 300 * 10 ** d))
        base_t = f"{(round(top_v * 10 ** d) + thick) / 10 ** d:.{d}f}"
        kind = draw(st.sampled_from(["MD", "TVDSS", "md", "tvdss", ""])) if has_depth else ""
        cell = {"well": draw(st.sampled_from([well, f" {well} "])), "zone": zone,
                "top": top_t, "base": base_t, "depth": kind,
                "note": draw(st.sampled_from(["", "pick 2", "123"]))}
        rows.append(",".join(cell[k] for k, _, _ in cols))
        exp.append((well, zone, top_v * f, float(base_t) * f, kind.upper() or "MD"))
    text, lines = _layout(draw, rows, header, units_row)
    return text, [e + (ln,) for e, ln in zip(exp, lines)]


def check_tops_valid(tops, exp):
    assert len(tops) == len(exp)
    for t, (well, zone, top, base, kind, line) in zip(tops, exp):
        assert (t.well, t.zone, t.depth_type, t.line) == (well, zone, kind, line)
        np.testing.assert_allclose([t.top, t.base], [top, base], rtol=1e-12, atol=1e-12)


def check_tops_sane(tops):
    from satheight.io.tops import DEPTH_TYPES

    assert tops
    seen = set()
    for t in tops:
        assert t.well and t.zone and t.well == t.well.strip() and t.zone == t.zone.strip()
        assert math.isfinite(t.top) and math.isfinite(t.base) and t.top < t.base
        assert t.depth_type in DEPTH_TYPES
        assert (t.well, t.zone) not in seen
        seen.add((t.well, t.zone))
    lines = [t.line for t in tops]
    assert all(b > a for a, b in zip(lines, lines[1:])) and lines[0] >= 1


# --------------------------------------------------------------------------------------
# core data: pressure steps, plug table, single plug

_SYSTEMS = ("mercury_air", "air_brine", "oil_brine", "gas_brine", "air_oil")
_PLUGS = ("P01", "P02", "13A", "plug 7", "X-9")


def _curve_steps(draw, n):
    """Pressure texts (increasing) and wetting saturations (non-increasing), 4 decimals."""
    d = draw(st.integers(0, 3))
    pc_t, pc_v = _increasing(draw, n, 1, 50, 500, d)     # drainage steps have Pc > 0
    sw0 = draw(st.integers(0, 10000))
    drops = draw(st.lists(st.integers(0, 3000), min_size=n - 1, max_size=n - 1))
    sw_int = np.maximum(sw0 - np.concatenate([[0], np.cumsum(drops)]), 0)
    return pc_t, pc_v, [int(s) for s in sw_int]


def _sat_text(sw_int, sat, sat_unit):
    """Text of a saturation given in 1/10000 of wetting phase."""
    v = sw_int if sat == "sw" else 10000 - sw_int
    return f"{v / 100:.2f}" if sat_unit in ("%", "pct") else f"{v / 10000:.4f}"


def _sat_value(text, sat, sat_unit):
    s = float(text) * (0.01 if sat_unit in ("%", "pct") else 1.0)
    return s if sat == "sw" else 1.0 - s


@st.composite
def valid_steps_files(draw):
    keys = draw(st.lists(st.tuples(st.sampled_from(_PLUGS), st.sampled_from(_SYSTEMS)),
                         min_size=1, max_size=4, unique=True))
    has_system = draw(st.booleans()) or len({p for p, _ in keys}) < len(keys)
    if not has_system:
        keys = [(p, "mercury_air") for p, _ in keys]     # the default system of the loader
    p_unit = draw(st.sampled_from(sorted(PRESSURE)))
    sat = draw(st.sampled_from(["sw", "snw"]))
    sat_unit = draw(st.sampled_from(["", "frac", "%", "pct"]))
    cols = [("plug", _case(draw, draw(st.sampled_from(["plug", "plug_id", "sample"]))), ""),
            ("pc", _case(draw, draw(st.sampled_from(["pc", "pressure"]))), p_unit),
            ("sat", _case(draw, sat), sat_unit)]
    if has_system:
        cols.append(("system", _case(draw, "system"), ""))
    if draw(st.booleans()):
        cols.append(("note", "lab note", ""))
    order = draw(st.permutations(range(len(cols))))
    cols = [cols[i] for i in order]
    header = ",".join(f"{name} [{u}]" if u else name for _, name, u in cols)
    curves, queue = [], []
    for k, (plug, system) in enumerate(keys):
        n = draw(st.integers(2, 8))
        pc_t, pc_v, sw_int = _curve_steps(draw, n)
        sys_text = system if has_system else ""
        if has_system and system == "mercury_air" and draw(st.booleans()):
            sys_text = ""                                   # blank: the default system
        for i in range(n):
            queue.append((k, {"plug": plug, "pc": pc_t[i], "sat": _sat_text(sw_int[i], sat, sat_unit),
                              "system": sys_text, "note": "ok"}))
        curves.append([plug, system, np.array(pc_v) * PRESSURE[p_unit], [], []])
    if draw(st.booleans()):                                 # interleave the curves' rows
        order = draw(st.permutations([k for k, _ in queue]))  # each curve keeps its own order
        pending = {}
        for k, c in queue:
            pending.setdefault(k, []).append(c)
        queue = [(k, pending[k].pop(0)) for k in order]
    rows = [",".join(c[key] for key, _, _ in cols) for _, c in queue]
    text, lines = _layout(draw, rows, header)
    for (k, c), ln in zip(queue, lines):
        curves[k][3].append(_sat_value(c["sat"], sat, sat_unit))
        curves[k][4].append(ln)
    first = {}
    for i, (k, _) in enumerate(queue):
        first.setdefault(k, i)
    expected = [tuple(curves[k][:3]) + (np.array(curves[k][3]), tuple(curves[k][4]))
                for k in sorted(first, key=first.get)]
    return text, expected


def check_curves(curves, expected):
    assert len(curves) == len(expected)
    for c, (plug, system, pc, sw, rows) in zip(curves, expected):
        assert (c.plug_id, c.system, tuple(c.rows)) == (plug, system, rows)
        np.testing.assert_allclose(c.pc, pc, rtol=1e-12)
        np.testing.assert_allclose(c.sw, sw, rtol=0, atol=1e-12)


def check_curve_sane(c):
    assert c.pc.size >= 2 and c.pc.shape == c.sw.shape and len(c.rows) == c.pc.size
    assert np.all(np.isfinite(c.pc)) and np.all(c.pc > 0) and np.all(np.diff(c.pc) > 0)
    assert np.all(np.isfinite(c.sw)) and np.all((c.sw >= 0) & (c.sw <= 1))
    assert np.all(np.diff(c.sw) <= 1e-9)
    assert c.plug_id and c.system


def check_curves_sane(curves):
    assert curves
    for c in curves:
        check_curve_sane(c)


_ROCK = ("Upper Sand", "Lower Sand", "RT2", "")


@st.composite
def _plug_values(draw):
    """Text and SI value of depth, porosity, permeability, grain density of one plug."""
    depth_t, depth_v = _scaled(draw, -100, 5000, 3)
    phi_unit = draw(st.sampled_from(["", "frac", "%"]))
    phi_int = draw(st.integers(1, 9999))
    phi_t = f"{phi_int / 100:.2f}" if phi_unit == "%" else f"{phi_int / 10000:.4f}"
    k_unit = draw(st.sampled_from(["", "mD", "D", "md"]))
    k_t, k_v = _scaled(draw, 0, 20000, 3)
    if k_v == 0:
        k_t, k_v = "0.5", 0.5
    k_si = k_v * MILLIDARCY * (1000 if k_unit == "D" else 1)
    rho_unit = draw(st.sampled_from(["", "g/cm3", "kg/m3"]))
    rho_t, rho_v = (_scaled(draw, 2, 3, 3) if rho_unit != "kg/m3" else _scaled(draw, 2000, 3000, 1))
    rho_si = rho_v * (1.0 if rho_unit == "kg/m3" else G_CM3)
    return dict(depth_t=depth_t, depth=depth_v, phi_unit=phi_unit, phi_t=phi_t,
                phi=float(phi_t) * (0.01 if phi_unit == "%" else 1), k_unit=k_unit, k_t=k_t,
                k=k_si, rho_unit=rho_unit, rho_t=rho_t, rho=rho_si)


@st.composite
def valid_plug_files(draw):
    ids = draw(st.lists(st.sampled_from(_PLUGS + ("P10", "P11", "Q")), min_size=1, max_size=7,
                        unique=True))
    depth_unit = draw(st.sampled_from(["m", "ft", "M"]))
    f_d = FT if depth_unit == "ft" else 1.0
    vals = [draw(_plug_values()) for _ in ids]
    phi_unit, k_unit, rho_unit = vals[0]["phi_unit"], vals[0]["k_unit"], vals[0]["rho_unit"]
    vals = [dict(v, phi_unit=phi_unit, k_unit=k_unit, rho_unit=rho_unit) for v in vals]
    for v in vals:                                      # one unit per column
        v["phi"] = float(v["phi_t"]) * (0.01 if phi_unit == "%" else 1)
        if phi_unit == "%" and not 0 < v["phi"] < 1:
            v["phi_t"], v["phi"] = "20", 0.2
        if phi_unit != "%" and float(v["phi_t"]) >= 1:
            v["phi_t"], v["phi"] = "0.2", 0.2
    has_rho, has_rt, has_extra = draw(st.booleans()), draw(st.booleans()), draw(st.booleans())
    cols = [("plug", _case(draw, "plug"), ""), ("well", _case(draw, "well"), ""),
            ("depth", _case(draw, draw(st.sampled_from(["depth", "md"]))), depth_unit),
            ("phi", _case(draw, draw(st.sampled_from(["porosity", "phi", "por"]))), phi_unit),
            ("k", _case(draw, draw(st.sampled_from(["permeability", "k", "perm"]))), k_unit)]
    if has_rho:
        cols.append(("rho", "grain_density", rho_unit))
    if has_rt:
        cols.append(("rt", _case(draw, "rock_type"), ""))
    if has_extra:
        cols.append(("facies", "facies", ""))
    order = draw(st.permutations(range(len(cols))))
    cols = [cols[i] for i in order]
    header = ",".join(f"{name} [{u}]" if u else name for _, name, u in cols)
    rows, exp = [], {}
    for pid, v in zip(ids, vals):
        well = draw(st.sampled_from(_WELLS))
        rho_blank = has_rho and draw(st.integers(0, 4)) == 0
        rt = draw(st.sampled_from(_ROCK)) if has_rt else ""
        facies = draw(st.sampled_from(["", "shoreface", "17"]))
        cell = {"plug": pid, "well": well, "depth": v["depth_t"], "phi": v["phi_t"],
                "k": v["k_t"], "rho": "" if rho_blank else v["rho_t"], "rt": rt,
                "facies": facies}
        rows.append(",".join(cell[k] for k, _, _ in cols))
        exp[pid] = dict(well=well, depth=v["depth"] * f_d, phi=v["phi"],
                        k=float(v["k_t"]) * MILLIDARCY * (1000 if k_unit == "D" else 1),
                        rho=None if (rho_blank or not has_rho) else
                        float(v["rho_t"]) * (1.0 if rho_unit == "kg/m3" else G_CM3),
                        rt=rt or None, extra={"facies": facies} if has_extra else {})
    text, lines = _layout(draw, rows, header)
    for pid, ln in zip(ids, lines):
        exp[pid]["line"] = ln
    return text, exp


def check_plug(p, e):
    assert p.well == e["well"] and p.rock_type == e["rt"]
    np.testing.assert_allclose([p.depth, p.porosity, p.permeability], [e["depth"], e["phi"], e["k"]],
                               rtol=1e-12, atol=1e-12)
    if e["rho"] is None:
        assert p.grain_density is None
    else:
        np.testing.assert_allclose(p.grain_density, e["rho"], rtol=1e-12)
    assert p.source.endswith(f", row {e['line']}")


def check_plugs_valid(plugs, exp):
    assert list(plugs) == list(exp)
    for pid, e in exp.items():
        check_plug(plugs[pid], e)
        # other columns are kept under their header text (any letter case)
        assert {k.lower(): v for k, v in plugs[pid].extra.items()} == e["extra"]


def check_plug_sane(p):
    assert p.plug_id
    assert math.isfinite(p.depth)
    assert 0 < p.porosity < 1
    assert math.isfinite(p.permeability) and p.permeability > 0
    assert p.grain_density is None or (math.isfinite(p.grain_density) and p.grain_density > 0)


def check_plugs_sane(plugs):
    assert plugs
    for pid, p in plugs.items():
        assert pid == p.plug_id
        check_plug_sane(p)


@st.composite
def valid_single_files(draw):
    plug = draw(st.sampled_from(_PLUGS))
    system = draw(st.sampled_from(_SYSTEMS + (None,)))
    props = draw(st.booleans())
    lines = [f"# plug = {plug}"]
    v = draw(_plug_values())
    well = draw(st.sampled_from(_WELLS))
    rt = draw(st.sampled_from(_ROCK[:-1] + (None,)))
    depth_unit = draw(st.sampled_from(["m", "ft"]))
    if system is not None:
        lines.append(f"# system = {system}")
    if props:
        lines += [f"# well = {well}", f"# depth = {v['depth_t']} {depth_unit}",
                  f"# porosity = {v['phi_t']} {v['phi_unit']}".rstrip(),
                  f"# permeability = {v['k_t']} {v['k_unit']}".rstrip()]
        if draw(st.booleans()):
            lines.append(f"# grain_density = {v['rho_t']} {v['rho_unit']}".rstrip())
        else:
            v["rho"] = None
        if rt is not None:
            lines.append(f"# rock_type = {rt}")
    order = draw(st.permutations(range(len(lines))))
    lines = [lines[i] for i in order]
    p_unit = draw(st.sampled_from(sorted(PRESSURE)))
    sat = draw(st.sampled_from(["sw", "snw"]))
    sat_unit = draw(st.sampled_from(["", "frac", "%"]))
    n = draw(st.integers(2, 12))
    pc_t, pc_v, sw_int = _curve_steps(draw, n)
    swap = draw(st.booleans())
    head = [f"pc [{p_unit}]", f"{sat} [{sat_unit}]" if sat_unit else sat]
    lines.append(",".join(head[::-1] if swap else head))
    rows = []
    for i in range(n):
        cells = [pc_t[i], _sat_text(sw_int[i], sat, sat_unit)]
        lines.append(",".join(cells[::-1] if swap else cells))
        rows.append(len(lines))
    sw = [_sat_value(_sat_text(s, sat, sat_unit), sat, sat_unit) for s in sw_int]
    curve = (plug, system or "mercury_air", np.array(pc_v) * PRESSURE[p_unit], np.array(sw),
             tuple(rows))
    plug_exp = None
    if props:
        plug_exp = dict(well=well, depth=v["depth"] * (FT if depth_unit == "ft" else 1.0),
                        phi=v["phi"], k=v["k"], rho=v["rho"], rt=rt,
                        line=1 + next(i for i, ln in enumerate(lines) if "porosity" in ln))
    return "\n".join(lines) + "\n", (plug_exp, curve)


def check_single_valid(result, exp):
    plug, curve = result
    plug_exp, curve_exp = exp
    check_curves([curve], [curve_exp])
    if plug_exp is None:
        assert plug is None
    else:
        assert plug.plug_id == curve_exp[0]
        check_plug(plug, plug_exp)


def check_single_sane(result):
    plug, curve = result
    check_curve_sane(curve)
    if plug is not None:
        check_plug_sane(plug)
        assert plug.plug_id == curve.plug_id


# --------------------------------------------------------------------------------------
# pressure points


@st.composite
def valid_pressure_files(draw):
    from satheight.io.pressures import FLUIDS, QUALITIES

    n = draw(st.integers(1, 12))
    depth_cols = draw(st.sampled_from([("tvdss",), ("md",), ("tvdss", "md")]))
    d_unit = {c: draw(st.sampled_from(["m", "ft", "M", "FT"])) for c in depth_cols}
    p_unit = draw(st.sampled_from(sorted(PRESSURE)))
    has_zone = draw(st.booleans())
    cols = [("well", _case(draw, "well"), ""), ("pressure", _case(draw, "pressure"), p_unit),
            ("fluid", _case(draw, "fluid"), ""), ("quality", _case(draw, "quality"), "")]
    cols += [(c, _case(draw, c), d_unit[c]) for c in depth_cols]
    if has_zone:
        cols.append(("zone", _case(draw, "zone"), ""))
    order = draw(st.permutations(range(len(cols))))
    cols = [cols[i] for i in order]
    header = ",".join(f"{name} [{u}]" if u else name for _, name, u in cols)
    rows, exp = [], []
    for _ in range(n):
        cell = {"well": draw(st.sampled_from(_WELLS)),
                "pressure": _scaled(draw, 1, 20000, 3)[0],
                "fluid": _case(draw, draw(st.sampled_from(FLUIDS))),
                "quality": _case(draw, draw(st.sampled_from(QUALITIES))),
                "zone": draw(st.sampled_from(_ZONES + ("",)))}
        blank = draw(st.sampled_from(depth_cols)) if len(depth_cols) == 2 and draw(
            st.booleans()) else None
        for c in depth_cols:
            cell[c] = "" if c == blank else _scaled(draw, -100, 5000, 2)[0]
        rows.append(",".join(cell[k] for k, _, _ in cols))
        depth = {c: (math.nan if cell.get(c, "") == "" else
                     float(cell[c]) * (FT if d_unit[c].lower() == "ft" else 1.0))
                 for c in ("tvdss", "md") if c in depth_cols}
        exp.append(dict(well=cell["well"], tvdss=depth.get("tvdss", math.nan),
                        md=depth.get("md", math.nan),
                        pressure=float(cell["pressure"]) * PRESSURE[p_unit],
                        fluid=cell["fluid"].lower(), quality=cell["quality"].lower(),
                        zone=cell["zone"] if has_zone else ""))
    text, lines = _layout(draw, rows, header)
    for e, ln in zip(exp, lines):
        e["line"] = ln
    return text, exp


def check_pressure_valid(pp, exp):
    assert len(pp) == len(exp)
    for key in ("well", "fluid", "quality", "zone", "line"):
        assert list(getattr(pp, key)) == [e[key] for e in exp], key
    for key in ("tvdss", "md", "pressure"):
        np.testing.assert_allclose(getattr(pp, key), [e[key] for e in exp], rtol=1e-12,
                                   atol=1e-12, err_msg=key)


def check_pressure_sane(pp):
    from satheight.io.pressures import FLUIDS, QUALITIES

    n = len(pp)
    assert n >= 1
    for key in ("well", "tvdss", "md", "pressure", "fluid", "quality", "zone", "line"):
        assert getattr(pp, key).shape == (n,), key
    assert np.all(np.isfinite(pp.pressure)) and np.all(pp.pressure > 0)
    assert not np.any(np.isinf(pp.tvdss)) and not np.any(np.isinf(pp.md))
    assert np.all(np.isfinite(pp.tvdss) | np.isfinite(pp.md))
    assert set(pp.fluid) <= set(FLUIDS) and set(pp.quality) <= set(QUALITIES)
    assert all(w for w in pp.well) and np.all(np.diff(pp.line) > 0)


# --------------------------------------------------------------------------------------
# CSV mutations (on LF text)


def _content(ls):
    """Indices of the lines that are neither blank nor comments."""
    return [i for i, ln in enumerate(ls) if ln.strip() and not ln.lstrip().startswith("#")]


def _is_number(cell):
    try:
        float(cell)
        return True
    except ValueError:
        return False


def _data_cell(text, data, numeric):
    """(lines, line index, cells, cell index) of a data cell that is (not) a number."""
    ls = text.split("\n")
    body = _content(ls)[1:]
    picks = [(i, j) for i in body for j, c in enumerate(ls[i].split(","))
             if _is_number(c) == numeric and (numeric or c.strip())]
    if not picks:
        return ls, None, None, None
    i, j = data.draw(st.sampled_from(picks), label="cell")
    return ls, i, ls[i].split(","), j


_WORDS = ["abc", "1,5", "--", "1e", "nan", "NaN", "inf", "-inf", "Infinity", "1_000", "0x10",
          "\u00bd", "TRUE", "1.2.3", " ", "", "\u0661\u0662", "1e400", "-1e400", "1 000",
          "\"1\"", "1;2", "+", "."]


def mut_csv_text_in_number(text, data):
    ls, i, cells, j = _data_cell(text, data, True)
    if i is None:
        return text
    cells[j] = data.draw(st.sampled_from(_WORDS), label="word")
    ls[i] = ",".join(cells)
    return "\n".join(ls)


_ODD_NUMBERS = ["-1", "0", "-0", "0.0", "1.5", "101", "181", "361", "-361", "1e308", "-1e308",
                "5e-324", "1e-300", "1e29", "123456789012345678901234567890", "0.0000001",
                "99999", "-999.25", "6.3", "3.2"]


def mut_csv_odd_value(text, data):
    """A number out of its range (saturations, angles, negative pressure, overflow, tiny)."""
    ls, i, cells, j = _data_cell(text, data, True)
    if i is None:
        return text
    cells[j] = data.draw(st.sampled_from(_ODD_NUMBERS), label="number")
    ls[i] = ",".join(cells)
    return "\n".join(ls)


_ODD_TEXT = ["", " ", "x" * 300, "'quoted'", "\"a,b\"", "=1+1", "<b>bold</b>", "Ñ", "mercury_air",
             "no_such_system", "#not a comment", "\t", "\"", "a\"b", "MD", "TVDSS", "tvdss ",
             "oil", "bad", "unknown", "None", "$x$"]


def mut_csv_odd_text(text, data):
    ls, i, cells, j = _data_cell(text, data, False)
    if i is None:
        return text
    cells[j] = data.draw(st.sampled_from(_ODD_TEXT), label="text")
    ls[i] = ",".join(cells)
    return "\n".join(ls)


def mut_csv_cell_count(text, data):
    ls = text.split("\n")
    idx = _content(ls)
    i = data.draw(st.sampled_from(idx), label="line")
    cells = ls[i].split(",")
    kind = data.draw(st.sampled_from(["drop", "extra", "trailing_comma", "empty_extra"]),
                     label="kind")
    if kind == "drop" and len(cells) > 1:
        cells.pop(data.draw(st.integers(0, len(cells) - 1), label="col"))
    elif kind == "extra":
        cells.insert(data.draw(st.integers(0, len(cells)), label="col"),
                     data.draw(st.sampled_from(["1", "x", "-5"]), label="value"))
    elif kind == "trailing_comma":
        cells.append("")
    else:
        cells += ["", " "]
    ls[i] = ",".join(cells)
    return "\n".join(ls)


def mut_csv_column(text, data):
    """Drop, duplicate or rename a whole column, or add one."""
    ls = text.split("\n")
    idx = _content(ls)
    width = len(ls[idx[0]].split(","))
    j = data.draw(st.integers(0, width - 1), label="col")
    kind = data.draw(st.sampled_from(["drop", "duplicate", "rename", "add", "swap_names"]),
                     label="kind")
    for n, i in enumerate(idx):
        cells = ls[i].split(",")
        if j >= len(cells):
            continue
        if kind == "drop":
            cells.pop(j)
        elif kind == "duplicate":
            cells.insert(j, cells[j])
        elif kind == "rename" and n == 0:
            cells[j] = data.draw(st.sampled_from(["", "x", "pc [psi]", "sw", "snw", "md [m]",
                                                  "[m]", "top [m] [ft]", "well", "plug"]),
                                 label="name")
        elif kind == "add":
            cells.append("extra" if n == 0 else "7")
        elif kind == "swap_names" and n == 0 and width > 1:
            k = (j + 1) % width
            cells[j], cells[k] = cells[k], cells[j]
        ls[i] = ",".join(cells)
    return "\n".join(ls)


def mut_csv_unit(text, data):
    ls = text.split("\n")
    i = _content(ls)[0]
    cells = ls[i].split(",")
    j = data.draw(st.integers(0, len(cells) - 1), label="col")
    name = re.sub(r"\s*[\[(].*$", "", cells[j])
    unit = data.draw(st.sampled_from(["", "parsec", "m m", "ft/s", "%%", "psi", "m", "deg", "frac",
                                      "kg", "°", "rad", "%", "D", "mD", "bar", "KM"]), label="unit")
    form = data.draw(st.sampled_from(["[u]", "(u)", "none", "[u", "u]"]), label="form")
    cells[j] = {"[u]": f"{name} [{unit}]", "(u)": f"{name} ({unit})", "none": name,
                "[u": f"{name} [{unit}", "u]": f"{name} {unit}]"}[form]
    ls[i] = ",".join(cells)
    return "\n".join(ls)


def mut_csv_rows(text, data):
    """Duplicate, swap, reverse, drop or move data rows (order, repeats)."""
    ls = text.split("\n")
    body = _content(ls)[1:]
    if not body:
        return text
    kind = data.draw(st.sampled_from(["duplicate", "swap", "reverse", "drop", "to_top"]),
                     label="kind")
    i = data.draw(st.sampled_from(body), label="row")
    if kind == "duplicate":
        ls.insert(i, ls[i])
    elif kind == "swap" and len(body) > 1:
        k = body[(body.index(i) + 1) % len(body)]
        ls[i], ls[k] = ls[k], ls[i]
    elif kind == "reverse":
        rows = [ls[k] for k in body][::-1]
        for k, r in zip(body, rows):
            ls[k] = r
    elif kind == "drop":
        del ls[i]
    else:
        row = ls.pop(i)
        ls.insert(_content(ls)[0], row)                    # above the header
    return "\n".join(ls)


def mut_csv_empty(text, data):
    ls = text.split("\n")
    idx = _content(ls)
    kind = data.draw(st.sampled_from(["empty", "blank", "comments", "header_only",
                                      "header_units", "bom", "nul"]), label="kind")
    if kind == "empty":
        return ""
    if kind == "blank":
        return "\n \n\t\n"
    if kind == "comments":
        return "\n".join(ln for ln in ls if ln.lstrip().startswith("#")) + "\n# only comments\n"
    if kind == "header_only":
        return "\n".join(ls[:idx[0] + 1]) + "\n"
    if kind == "header_units":
        return "\n".join(ls[:idx[0] + 1] + ["m,deg,deg,psi,frac"]) + "\n"
    if kind == "bom":
        return "\ufeff"
    return text.replace(",", "\x00", 1)


def mut_csv_latin1(text, data):
    word = data.draw(st.sampled_from(["Größe", "Ñandú", "°C", "µm"]), label="word")
    where = data.draw(st.sampled_from(["comment", "cell"]), label="where")
    if where == "comment":
        return (f"# {word}\n" + text).encode("latin-1", errors="replace")
    ls = text.split("\n")
    i = _content(ls)[-1]
    ls[i] = ls[i] + "," + word if "," not in ls[i] else word + ls[i][ls[i].index(","):]
    return "\n".join(ls).encode("latin-1", errors="replace")


def mut_csv_line_ends(text, data):
    nl = data.draw(st.sampled_from(["\r\n", "\r", "\n\n", "\n \n", "\n\r\n"]), label="newline")
    return text.replace("\n", nl)


def mut_csv_quotes(text, data):
    """Quoted cells, an unclosed quote, a huge field."""
    ls = text.split("\n")
    idx = _content(ls)
    i = data.draw(st.sampled_from(idx), label="line")
    kind = data.draw(st.sampled_from(["quote_all", "unclosed", "huge", "semicolons", "tabs"]),
                     label="kind")
    if kind == "quote_all":
        ls[i] = ",".join(f'"{c}"' for c in ls[i].split(","))
    elif kind == "unclosed":
        ls[i] = '"' + ls[i]
    elif kind == "huge":
        ls[i] = ls[i] + "," + "9" * 200_000
    elif kind == "semicolons":
        ls[i] = ls[i].replace(",", ";")
    else:
        ls[i] = ls[i].replace(",", "\t")
    return "\n".join(ls)


CSV_MUTATIONS = {
    "truncate": mut_truncate,
    "random_line": mut_random_line,
    "random_bytes": mut_bytes,
    "line_ends": mut_csv_line_ends,
    "latin1": mut_csv_latin1,
    "text_in_number": mut_csv_text_in_number,
    "odd_value": mut_csv_odd_value,
    "odd_text": mut_csv_odd_text,
    "cell_count": mut_csv_cell_count,
    "column": mut_csv_column,
    "unit": mut_csv_unit,
    "rows": mut_csv_rows,
    "empty": mut_csv_empty,
    "quotes": mut_csv_quotes,
}


# --- form-only changes: the values must stay the same --------------------------------

def same_crlf(text, data):
    return text.replace("\n", data.draw(st.sampled_from(["\r\n", "\r"]), label="newline"))


def same_bom(text, data):
    return ("\ufeff" + text).encode("utf-8")


def same_blanks(text, data):
    """Blanks around data cells (not inside quotes: the generated files have none)."""
    ls = text.split("\n")
    body = _content(ls)[1:]
    for i in body:
        if data.draw(st.booleans(), label="pad"):
            ls[i] = ",".join(f" {c}\t" if c else c for c in ls[i].split(","))
    return "\n".join(ls)


def same_trailing(text, data):
    return text + data.draw(st.sampled_from(["\n", "\n\n", "   \n", "# end\n", "\n#\n"]),
                            label="tail")


def same_header_case(text, data):
    ls = text.split("\n")
    i = _content(ls)[0]
    ls[i] = data.draw(st.sampled_from([str.upper, str.lower]), label="case")(ls[i]).replace(
        "[PA]", "[Pa]").replace("[pa]", "[Pa]")
    return "\n".join(ls)


SAME_VALUES = {"crlf": same_crlf, "bom": same_bom, "blanks": same_blanks,
               "trailing": same_trailing, "header_case": same_header_case}


# --------------------------------------------------------------------------------------
# registration


def _cases():
    from satheight.io.core_data import read_plug_table, read_pressure_steps, read_single_plug
    from satheight.io.pressures import read_pressure_points
    from satheight.io.survey import read_survey
    from satheight.io.tops import read_tops

    def steps(p):
        return read_pressure_steps(p, default_system="mercury_air")

    def single(p):
        return read_single_plug(p, default_system="mercury_air")

    specs = [
        ("survey", read_survey, valid_survey_files(), check_survey_valid, check_survey_sane),
        ("tops", read_tops, valid_tops_files(), check_tops_valid, check_tops_sane),
        ("core_steps", steps, valid_steps_files(), check_curves, check_curves_sane),
        ("core_plugs", read_plug_table, valid_plug_files(), check_plugs_valid, check_plugs_sane),
        ("core_single", single, valid_single_files(), check_single_valid, check_single_sane),
        ("pressure_points", read_pressure_points, valid_pressure_files(), check_pressure_valid,
         check_pressure_sane),
    ]
    for name, load, valid, check_valid, check_loaded in specs:
        register(ReaderCase(name=name, suffix=".csv", load=located(load), valid=valid,
                            check_valid=check_valid, check_loaded=check_loaded,
                            mutations=CSV_MUTATIONS, same_values=SAME_VALUES, light=True))


_cases()
