"""Fuzz harness shared by the reliability tests (``tests/test_fuzz_*.py``).

One :class:`ReaderCase` per file reader says how to call the reader, how to draw a
valid file together with what it must load as, how to check the loaded result, and
which mutations to apply. ``tests/test_fuzz_readers.py`` runs every registered case:

* valid files must load and give back the values they were written with;
* every mutation of a valid file must either load (the result passes the reader's
  sanity check) or raise a :class:`~satheight.errors.SatHeightError` whose message is
  one line naming the file; any other exception is a failure.

Adding a reader (e.g. a survey or core-data reader) is one function that builds a
``ReaderCase`` and a call to :func:`register` in this module (see DEVELOPERS.md).

The hypothesis profiles (``ci`` by default, ``long`` with ``SATHEIGHT_FUZZ=long``) are
registered in ``tests/conftest.py``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Callable, Mapping

import numpy as np
from hypothesis import strategies as st

from satheight.errors import SatHeightError

# --------------------------------------------------------------------------------------
# registry

#: A mutation takes the valid file's text and hypothesis ``data`` and returns the
#: mutated file content (text is written as UTF-8, bytes as given).
Mutation = Callable[[str, Any], "str | bytes"]


@dataclass(frozen=True)
class ReaderCase:
    """How to fuzz one file reader.

    Attributes
    ----------
    name : str
        Short name used in test ids.
    suffix : str
        File name ending, e.g. ``".las"``.
    load : callable
        ``load(path) -> result``: the reader under test.
    valid : hypothesis strategy
        Draws ``(content, expected)``: a valid file (str or bytes) and what it
        must load as.
    check_valid : callable
        ``check_valid(result, expected)``: asserts the loaded values are right.
    check_loaded : callable
        ``check_loaded(result)``: sanity of any result that loads (also of mutated
        files), e.g. strictly increasing depths and equal curve lengths.
    mutations : dict
        Name -> :data:`Mutation`.
    support_files : dict
        File name -> text of files the reader needs beside the file under test
        (e.g. the LAS file a project file names).
    same_values : dict
        Name -> :data:`Mutation` that changes only the form of a valid file (line
        ends, byte-order mark, blanks): the result must pass ``check_valid``.
    light : bool
        Fewer examples per test (``tests/test_fuzz_readers.py``): for readers with
        many mutations whose files are cheap.
    """

    name: str
    suffix: str
    load: Callable[[Path], Any]
    valid: Any
    check_valid: Callable[[Any, Any], None]
    check_loaded: Callable[[Any], None]
    mutations: Mapping[str, Mutation] = field(default_factory=dict)
    support_files: Mapping[str, str] = field(default_factory=dict)
    same_values: Mapping[str, Mutation] = field(default_factory=dict)
    light: bool = False

    def __repr__(self) -> str:                  # short test ids and failure reports
        return f"ReaderCase({self.name!r})"


READERS: dict[str, ReaderCase] = {}


def register(case: ReaderCase) -> ReaderCase:
    """Add a reader to the fuzz suite (its name must be new)."""
    assert case.name not in READERS, case.name
    READERS[case.name] = case
    return case


def write_case(path: Path, content: "str | bytes") -> None:
    if isinstance(content, str):
        path.write_bytes(content.encode("utf-8"))
    else:
        path.write_bytes(content)


def load_cleanly(load: Callable[[Path], Any], path: Path):
    """Call ``load(path)``: return ``(result, None)`` or ``(None, error)``.

    A :class:`SatHeightError` is accepted only if its message is one line naming the
    file; any other exception propagates and fails the test.
    """
    try:
        return load(path), None
    except SatHeightError as exc:
        msg = str(exc)
        assert path.name in msg, f"error does not name the file: {msg}"
        assert "\n" not in msg, f"error is not one line: {msg!r}"
        assert "Traceback" not in msg
        return None, exc


# --------------------------------------------------------------------------------------
# LAS files: a valid-file generator and mutations

MNEMONIC_CHARS = "ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_"
CURVE_UNITS = ("V/V", "MD", "OHMM", "GAPI", "G/C3", "US/F", "%", "", "DEGC", "M3/M3")
#: Values the reader turns into NaN on purpose (common null codes and the huge-value rule).
NULL_LIKE = (-999.25, -999.0, -9999.0, -99999.0)


@dataclass
class LasSpec:
    """What a generated LAS file holds (the expected values after loading)."""

    version: str
    well: str
    depth_unit: str                 # "M" or "FT"
    null: float
    depth: np.ndarray               # file values, increasing
    depth_decimals: int
    curves: list                    # [(mnemonic, unit, description, values, decimals)]
    wrap: bool = False
    extra_well: list = field(default_factory=list)   # [(mnemonic, unit, value text, descr)]


def _fmt(values: np.ndarray, decimals: int, null: float) -> list[str]:
    null_text = np.format_float_positional(null, trim="-")
    return [null_text if not math.isfinite(v) else f"{v:.{decimals}f}" for v in values]


def render_las(spec: LasSpec, newline: str = "\n") -> str:
    """LAS 1.2/2.0 text of ``spec`` (one line per depth unless ``spec.wrap``)."""
    null_text = np.format_float_positional(spec.null, trim="-")
    d0 = f"{spec.depth[0]:.{spec.depth_decimals}f}"
    d1 = f"{spec.depth[-1]:.{spec.depth_decimals}f}"
    lines = ["~Version", f"VERS.  {spec.version} : generated for a test",
             f"WRAP.  {'YES' if spec.wrap else 'NO'} : wrap mode",
             "~Well",
             f"STRT.{spec.depth_unit} {d0} : start", f"STOP.{spec.depth_unit} {d1} : stop",
             f"STEP.{spec.depth_unit} 0 : step", f"NULL.  {null_text} : null value",
             (f"WELL.  WELL : {spec.well}" if spec.version.startswith("1")   # LAS 1.2 layout
              else f"WELL.  {spec.well} : well name")]
    lines += [f"{m}.{u}  {v} : {d}" for m, u, v, d in spec.extra_well]
    lines += ["~Curve", f"DEPT.{spec.depth_unit} : depth"]
    lines += [f"{m}.{u} : {d}" for m, u, d, _, _ in spec.curves]
    lines.append("~A")
    cols = [_fmt(spec.depth, spec.depth_decimals, spec.null)]
    cols += [_fmt(v, k, spec.null) for _, _, _, v, k in spec.curves]
    for i in range(spec.depth.size):
        row = [c[i] for c in cols]
        if spec.wrap:
            lines.append(row[0])
            for j in range(1, len(row), 3):
                lines.append(" ".join(row[j:j + 3]))
        else:
            lines.append(" ".join(row))
    return newline.join(lines) + newline


@st.composite
def las_specs(draw, max_samples: int = 40, max_curves: int = 6) -> LasSpec:
    """A valid LAS file's content: increasing depths, unique mnemonics, finite values or nulls."""
    n = draw(st.integers(1, max_samples))
    dd = draw(st.integers(0, 4))
    # depths stay within the reader's plausible measured depth (30 km, io/las.py MAX_MD)
    start = draw(st.integers(-1000, 20000)) / 10 ** dd
    steps = draw(st.lists(st.integers(1, 200), min_size=n - 1, max_size=n - 1))
    depth = np.round(start + np.concatenate([[0], np.cumsum(steps)]) / 10 ** dd, dd)
    null = draw(st.sampled_from([-999.25, -9999.0, -100000.0, 9999.0]))
    names = draw(st.lists(st.text(MNEMONIC_CHARS, min_size=1, max_size=8).filter(
        # DLM is refused on purpose (lasio takes it for the LAS 3.0 delimiter item): see
        # tests/test_bad_las.py
        lambda s: s.upper() not in ("DEPT", "UNKNOWN", "DLM")), min_size=0, max_size=max_curves,
        unique_by=str.upper))
    curves = []
    for name in names:
        k = draw(st.integers(0, 6))
        scale = draw(st.sampled_from([1.0, 1e3, 1e6, 1e-3]))
        vals = draw(st.lists(st.one_of(
            st.floats(-1.0, 1.0, allow_nan=False).map(lambda x, s=scale: x * s),
            st.just(float("nan"))), min_size=n, max_size=n))
        v = np.round(np.asarray(vals, dtype=float), k)
        bad = np.isin(v, NULL_LIKE + (null,)) | (np.abs(v) >= 1e30)
        v[bad] = np.nan
        v[v == 0] = 0.0                                  # no negative zero
        unit = draw(st.sampled_from(CURVE_UNITS))
        desc = draw(st.text("abcdefgh ijklmnop-()", max_size=20)).strip()
        curves.append((name, unit, desc, v, k))
    well = draw(st.text("ABCDEFGHXYZ-0123456789 ", min_size=1, max_size=12)).strip() or "W"
    return LasSpec(version=draw(st.sampled_from(["1.2", "2.0"])), well=well,
                   depth_unit=draw(st.sampled_from(["M", "FT"])), null=null, depth=depth,
                   depth_decimals=dd, curves=curves, wrap=len(curves) >= 2 and draw(st.booleans()))


def check_las_valid(well, spec: LasSpec) -> None:
    """The loaded well holds exactly the generated values, units and descriptions."""
    factor = 1.0 if spec.depth_unit == "M" else 0.3048       # NIST SP 811: 1 ft = 0.3048 m
    np.testing.assert_allclose(well.md, spec.depth * factor, rtol=1e-12, atol=1e-9)
    assert well.name == spec.well
    keys = list(well.curves)
    assert len(keys) == 1 + len(spec.curves)
    for key, (m, u, d, v, _) in zip(keys[1:], spec.curves):
        c = well.curves[key]
        assert c.mnemonic == m and c.unit == u and c.description == d
        np.testing.assert_array_equal(c.data, v, err_msg=m)


def check_well_sane(well) -> None:
    """Any Well that loads: strictly increasing finite MD, one value per depth in each curve."""
    md = np.asarray(well.md)
    assert md.ndim == 1 and md.size >= 1
    assert np.all(np.isfinite(md))
    assert np.all(np.diff(md) > 0)
    for c in well.curves.values():
        assert c.data.dtype == np.float64 and c.data.shape == md.shape, c.mnemonic
    assert isinstance(well.warnings, list)


# --- mutations: each returns the new file content ------------------------------------

def _lines(text: str) -> list[str]:
    return text.split("\n")


def _data_start(lines: list[str]) -> int:
    return next(i for i, ln in enumerate(lines) if ln.startswith("~A")) + 1


def _pick(data, seq, label):
    return data.draw(st.sampled_from(list(seq)), label=label)


def mut_truncate(text, data):
    cut = data.draw(st.integers(0, len(text)), label="cut")
    return text[:cut]


def mut_drop_value(text, data):
    ls = _lines(text)
    i = _pick(data, range(_data_start(ls), len(ls) - 1), "row")
    parts = ls[i].split()
    if len(parts) > 1:
        parts.pop(data.draw(st.integers(0, len(parts) - 1), label="col"))
    else:
        parts = []
    ls[i] = " ".join(parts)
    return "\n".join(ls)


def mut_extra_value(text, data):
    ls = _lines(text)
    i = _pick(data, range(_data_start(ls), len(ls) - 1), "row")
    ls[i] += " " + data.draw(st.sampled_from(["1", "0.5", "-999.25", "x"]), label="extra")
    return "\n".join(ls)


def mut_text_in_number(text, data):
    ls = _lines(text)
    i = _pick(data, range(_data_start(ls), len(ls) - 1), "row")
    parts = ls[i].split()
    j = data.draw(st.integers(0, len(parts) - 1), label="col")
    parts[j] = data.draw(st.sampled_from(["abc", "1,5", "--", "1e", "NaN", "inf", "-", "1.2.3",
                                          "0x10", "1_000", "\u00bd", "TRUE"]), label="word")
    ls[i] = " ".join(parts)
    return "\n".join(ls)


def mut_null(text, data):
    new = data.draw(st.sampled_from(["NaN", "none", "", "0", "1e30", "-1e308", "abc", "-999.25 m",
                                     "1e400", "-0"]), label="null")
    ls = [(f"NULL.  {new} : null value" if ln.startswith("NULL.") else ln) for ln in _lines(text)]
    return "\n".join(ls)


def mut_mnemonic(text, data):
    ls = _lines(text)
    c0 = ls.index("~Curve")
    a0 = _data_start(ls) - 1
    i = _pick(data, range(c0 + 1, a0), "curve line")
    kind = data.draw(st.sampled_from(["empty", "duplicate", "space", "colon", "unicode", "lower"]),
                     label="kind")
    rest = ls[i][ls[i].index("."):]
    if kind == "empty":
        ls[i] = rest
    elif kind == "duplicate":
        other = ls[_pick(data, range(c0 + 1, a0), "other")]
        ls[i] = other[:other.index(".")] + rest
    elif kind == "space":
        ls[i] = "A B" + rest
    elif kind == "colon":
        ls[i] = "A:B" + rest
    elif kind == "unicode":
        ls[i] = "\u00c9\u4e2d" + rest
    else:
        ls[i] = ls[i].lower()
    return "\n".join(ls)


def mut_wrap_flag(text, data):
    flip = "YES" if "WRAP.  NO" in text else "NO"
    return text.replace("WRAP.  YES", "WRAP.  @").replace("WRAP.  NO", f"WRAP.  {flip}").replace(
        "WRAP.  @", f"WRAP.  {flip}")


def mut_line_ends(text, data):
    nl = data.draw(st.sampled_from(["\r\n", "\r", "\n\n", "\n \n"]), label="newline")
    return text.replace("\n", nl)


def mut_latin1(text, data):
    word = data.draw(st.sampled_from(["Pozo Ñandú", "Bohrung Größe", "Puits é ç", "°C µm"]),
                     label="word")
    text = text.replace(" : well name", f" : {word}", 1).replace(" : depth", f" : {word}", 1)
    return text.encode("latin-1")


def mut_number_size(text, data):
    ls = _lines(text)
    i = _pick(data, range(_data_start(ls), len(ls) - 1), "row")
    parts = ls[i].split()
    j = data.draw(st.integers(0, len(parts) - 1), label="col")
    parts[j] = data.draw(st.sampled_from(["1e308", "-1e308", "1e400", "1e-320", "5e-324", "1e29",
                                          "-1e29", "123456789012345678901234567890", "1e-30",
                                          "0.000000000001", "-0.0"]), label="number")
    ls[i] = " ".join(parts)
    return "\n".join(ls)


def mut_drop_section(text, data):
    ls = _lines(text)
    starts = [i for i, ln in enumerate(ls) if ln.startswith("~")] + [len(ls)]
    k = data.draw(st.integers(0, len(starts) - 2), label="section")
    title_only = data.draw(st.booleans(), label="title only")
    if title_only:
        del ls[starts[k]]
    else:
        del ls[starts[k]:starts[k + 1]]
    return "\n".join(ls)


def mut_empty_data(text, data):
    ls = _lines(text)
    return "\n".join(ls[:_data_start(ls)]) + "\n"


def mut_depth_order(text, data):
    ls = _lines(text)
    a = _data_start(ls)
    rows = ls[a:-1]
    kind = data.draw(st.sampled_from(["reverse", "repeat", "swap", "nan"]), label="kind")
    if "WRAP.  YES" in text and kind != "reverse":
        kind = "reverse"
    if kind == "reverse" and "WRAP.  YES" not in text:
        rows = rows[::-1]
    elif kind == "repeat" and rows:
        i = data.draw(st.integers(0, len(rows) - 1), label="row")
        rows.insert(i, rows[i])
    elif kind == "swap" and len(rows) > 1:
        i = data.draw(st.integers(0, len(rows) - 2), label="row")
        rows[i], rows[i + 1] = rows[i + 1], rows[i]
    elif kind == "nan" and rows:
        i = data.draw(st.integers(0, len(rows) - 1), label="row")
        parts = rows[i].split()
        parts[0] = data.draw(st.sampled_from(["-999.25", "nan", "x", "1e400"]), label="depth")
        rows[i] = " ".join(parts)
    return "\n".join(ls[:a] + rows + [""])


def mut_version(text, data):
    v = data.draw(st.sampled_from(["1.2", "2.0", "3.0", "3", "4.0", "abc", "", "2"]),
                  label="version")
    ls = [(f"VERS.  {v} : version" if ln.startswith("VERS.") else ln) for ln in _lines(text)]
    if v.startswith("3"):
        ls.insert(ls.index("~Curve"), "~Log_Parameter")
    return "\n".join(ls)


def mut_duplicate_section(text, data):
    ls = _lines(text)
    starts = [i for i, ln in enumerate(ls) if ln.startswith("~")] + [len(ls)]
    k = data.draw(st.integers(0, len(starts) - 2), label="section")
    block = ls[starts[k]:starts[k + 1]]
    return "\n".join(ls + block)


def mut_random_line(text, data):
    ls = _lines(text)
    i = data.draw(st.integers(0, len(ls)), label="at")
    ls.insert(i, data.draw(st.text(max_size=30), label="line"))
    return "\n".join(ls)


def mut_bytes(text, data):
    raw = bytearray(text.encode("utf-8"))
    for _ in range(data.draw(st.integers(1, 4), label="flips")):
        if not raw:
            break
        i = data.draw(st.integers(0, len(raw) - 1), label="at")
        raw[i] = data.draw(st.integers(1, 255), label="byte")
    return bytes(raw)


def mut_depth_unit(text, data):
    u = data.draw(st.sampled_from(["", "S", "F", "FEET", "m", "KM", "IN", ".1IN"]), label="unit")
    return text.replace("DEPT.M ", f"DEPT.{u} ").replace("DEPT.FT ", f"DEPT.{u} ")


LAS_MUTATIONS: dict[str, Mutation] = {
    "truncate": mut_truncate,
    "drop_value": mut_drop_value,
    "extra_value": mut_extra_value,
    "text_in_number": mut_text_in_number,
    "odd_null": mut_null,
    "mnemonic": mut_mnemonic,
    "wrap_flag": mut_wrap_flag,
    "line_ends": mut_line_ends,
    "latin1": mut_latin1,
    "number_size": mut_number_size,
    "drop_section": mut_drop_section,
    "empty_data": mut_empty_data,
    "depth_order": mut_depth_order,
    "version": mut_version,
    "duplicate_section": mut_duplicate_section,
    "random_line": mut_random_line,
    "random_bytes": mut_bytes,
    "depth_unit": mut_depth_unit,
}


@st.composite
def valid_las_files(draw):
    spec = draw(las_specs())
    newline = draw(st.sampled_from(["\n", "\r\n"]))
    return render_las(spec, newline), spec


def _las_reader_case() -> ReaderCase:
    from satheight.io.las import read_las

    return ReaderCase(name="las", suffix=".las", load=read_las, valid=valid_las_files(),
                      check_valid=check_las_valid, check_loaded=check_well_sane,
                      mutations=LAS_MUTATIONS)


register(_las_reader_case())


# --------------------------------------------------------------------------------------
# project files (TOML): valid-file generator and mutations

PROJECT_LAS = """~Version
VERS. 2.0 :
WRAP. NO :
~Well
STRT.M 1000.0 :
STOP.M 1000.2 :
STEP.M 0.1 :
NULL. -999.25 :
WELL. FZ-1 :
EKB .M 25.0 :
~Curve
DEPT.M : depth
PHIE.V/V : porosity
PERM.MD : permeability
RT.OHMM : resistivity
~A
1000.0 0.2 10 20
1000.1 0.21 12 21
1000.2 0.22 15 22
"""


@dataclass
class ProjectSpec:
    units: str
    fwl_m: float
    top_m: float
    base_m: float
    rho_w: float          # g/cm3
    rho_h: float
    sigma: float          # mN/m
    swirr: float
    a: float
    b: float


def render_project(spec: ProjectSpec, las_name: str = "fz.las") -> str:
    f = 1.0 if spec.units == "metric" else 1 / 0.3048
    u = "m" if spec.units == "metric" else "ft"
    return f"""[project]
name = "Fuzz"
units = "{spec.units}"

[log_sw]
method = "auto"
rw = "0.05 ohm.m"

[[wells]]
las = "{las_name}"
name = "FZ-1"

[[zones]]
name = "Z1"
top = {spec.top_m * f!r}
base = {spec.base_m * f!r}
fwl = "{spec.fwl_m * f!r} {u}"
hydrocarbon = "oil"
water_density = "{spec.rho_w!r} g/cm3"
hydrocarbon_density = "{spec.rho_h!r} g/cm3"
sigma_cos_theta = "{spec.sigma!r} mN/m"

[zones.function]
family = "power_law"
swirr = {spec.swirr!r}
a = {spec.a!r}
b = {spec.b!r}
"""


@st.composite
def project_specs(draw) -> ProjectSpec:
    top = draw(st.floats(0, 5000, allow_nan=False))
    thick = draw(st.floats(1, 500, allow_nan=False))
    # valid files hold plausible values (README "Plausible ranges"; common practice): an oil
    # zone, oil 0.5-0.94 g/cm3 under brine 0.95-1.25 g/cm3, FWL 0-6000 m TVDSS
    rho_h = draw(st.floats(0.5, 0.94, allow_nan=False))
    return ProjectSpec(units=draw(st.sampled_from(["metric", "field"])),
                       fwl_m=draw(st.floats(0, 6000, allow_nan=False)), top_m=top,
                       base_m=top + thick, rho_w=draw(st.floats(0.95, 1.25)),
                       rho_h=rho_h, sigma=draw(st.floats(1, 80)),
                       swirr=draw(st.floats(0, 0.5)), a=draw(st.floats(0.01, 1)),
                       b=draw(st.floats(0.2, 5)))


def check_project_valid(project, spec: ProjectSpec) -> None:
    z = project.zones[0]
    np.testing.assert_allclose([z.top, z.base, z.fwl], [spec.top_m, spec.base_m, spec.fwl_m],
                               rtol=1e-9, atol=1e-7)
    # 1 g/cm3 = 1000 kg/m3; 1 mN/m = 1e-3 N/m (SI prefixes)
    np.testing.assert_allclose([z.water_density, z.hydrocarbon_density, z.sigma_cos_theta],
                               [spec.rho_w * 1000, spec.rho_h * 1000, spec.sigma * 1e-3],
                               rtol=1e-9)
    assert project.wells[0].las.is_absolute() and project.wells[0].las.is_file()


def check_project_sane(project) -> None:
    assert project.wells and project.zones
    for z in project.zones:
        assert z.water_density > z.hydrocarbon_density
        assert z.sigma_cos_theta > 0
        if z.top is not None:
            assert z.top < z.base


@st.composite
def valid_project_files(draw):
    spec = draw(project_specs())
    return render_project(spec), spec


_PROJECT_VALUES = ["", "nan", "inf", "-1", "0", "1e400", "\"1 parsec\"", "\"abc\"", "true",
                   "[1, 2]", "{}", "1979-05-27", "\"__import__('os').system('echo hi')\"",
                   "\"${HOME}\"", "\"2 m m\"", "\"-5 g/cm3\"", "\"1e-30 mN/m\"", "\"../../etc\""]


def mut_project_value(text, data):
    ls = _lines(text)
    idx = [i for i, ln in enumerate(ls) if " = " in ln]
    i = _pick(data, idx, "line")
    key = ls[i].split(" = ")[0]
    ls[i] = f"{key} = {data.draw(st.sampled_from(_PROJECT_VALUES), label='value')}"
    return "\n".join(ls)


def mut_project_drop_line(text, data):
    ls = _lines(text)
    i = data.draw(st.integers(0, len(ls) - 1), label="line")
    del ls[i]
    return "\n".join(ls)


def mut_project_key(text, data):
    ls = _lines(text)
    idx = [i for i, ln in enumerate(ls) if " = " in ln]
    i = _pick(data, idx, "line")
    key, value = ls[i].split(" = ", 1)
    new = data.draw(st.sampled_from([key.upper(), key + "x", "", "\"\"", "a.b", key]), label="key")
    ls[i] = f"{new} = {value}"
    if new == key:
        ls.insert(i, ls[i])                   # duplicated key
    return "\n".join(ls)


def mut_project_table(text, data):
    ls = _lines(text)
    idx = [i for i, ln in enumerate(ls) if ln.startswith("[")]
    i = _pick(data, idx, "table")
    ls[i] = data.draw(st.sampled_from(["[[zones]]", "[[wells]]", "[zones]", "[project]", "[x]",
                                       "[zones.function]", "[[zones.function]]", "["]),
                      label="title")
    return "\n".join(ls)


def mut_project_well(text, data):
    kind = data.draw(st.sampled_from(["missing", "folder", "absolute", "second_well",
                                      "overlap_zone", "tops"]), label="kind")
    if kind == "missing":
        return text.replace('"fz.las"', '"nope.las"')
    if kind == "folder":
        return text.replace('"fz.las"', '"."')
    if kind == "absolute":
        return text.replace('"fz.las"', '"/nonexistent/fz.las"')
    if kind == "second_well":
        return text.replace("[[zones]]", '[[wells]]\nlas = "fz.las"\nname = "FZ-1"\n\n[[zones]]', 1)
    if kind == "overlap_zone":
        return text + "\n" + text[text.index("[[zones]]"):].replace('"Z1"', '"Z2"')
    return text.replace('name = "FZ-1"\n', 'name = "FZ-1"\n[wells.tops]\nZ1 = [1000.1, 1000.0]\n')


PROJECT_MUTATIONS: dict[str, Mutation] = {
    "truncate": mut_truncate,
    "value": mut_project_value,
    "drop_line": mut_project_drop_line,
    "key": mut_project_key,
    "table": mut_project_table,
    "wells_and_zones": mut_project_well,
    "random_line": mut_random_line,
    "random_bytes": mut_bytes,
    "latin1": lambda text, data: text.replace('"Fuzz"', '"Fuzz Ñandú"').encode("latin-1"),
    "line_ends": mut_line_ends,
}


def _project_reader_case() -> ReaderCase:
    from satheight.project import load_project

    return ReaderCase(name="project", suffix=".toml", load=load_project,
                      valid=valid_project_files(), check_valid=check_project_valid,
                      check_loaded=check_project_sane, mutations=PROJECT_MUTATIONS,
                      support_files={"fz.las": PROJECT_LAS})


register(_project_reader_case())


# --------------------------------------------------------------------------------------
# budget

def fuzz_examples(n_ci: int) -> int:
    """Examples for one fuzz test: ``n_ci`` in the default "ci" profile, 20x with
    ``SATHEIGHT_FUZZ=long``."""
    import os

    return n_ci * (20 if os.environ.get("SATHEIGHT_FUZZ") == "long" else 1)


# --------------------------------------------------------------------------------------
# CSV readers (survey, tops, core data, pressure points): registered by their module

import fuzz_tables  # noqa: E402,F401
