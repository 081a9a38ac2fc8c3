"""Tests of the project-file reader (satheight.project).

Unit factors used for expected values (outside sources, written out here rather
than taken from our own code):
* 1 ft = 0.3048 m exactly (NIST SP 811, 2008, App. B).
* 1 psi = 6894.757293168 Pa (NIST SP 811, 2008, App. B).
* standard gravity g = 9.80665 m/s^2 (3rd CGPM 1901; NIST SP 811).
* 1 g/cm3 = 1000 kg/m3; 1 dyn/cm = 1 mN/m = 1e-3 N/m (CGS definitions).
"""

from __future__ import annotations

import copy
import math
import textwrap
from pathlib import Path

import numpy as np
import pytest

from satheight.errors import InputFileError, ProjectFileError, UnitError
from satheight.project import load_project, parse_project
from satheight.project.types import FunctionSpec, LogSwSpec, Project, WellSpec, ZoneSpec

FT = 0.3048              # m, NIST SP 811 (2008) App. B
PSI = 6894.757293168     # Pa, NIST SP 811 (2008) App. B
G = 9.80665              # m/s^2, 3rd CGPM (1901); NIST SP 811
G_CM3 = 1000.0           # kg/m3 per g/cm3 (definition)
DYN_CM = 1e-3            # N/m per dyn/cm (CGS definition)


# ----------------------------------------------------------------------------------
# fixtures and helpers
# ----------------------------------------------------------------------------------
def _las(path: Path) -> Path:
    """A tiny dummy LAS file: the reader only checks that it exists."""
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text("~Version\n VERS. 2.0 :\n~Well\n WELL. DUMMY :\n~A DEPT\n1000 \n")
    return path


@pytest.fixture
def proj(tmp_path) -> Path:
    """Path of a (not yet written) project file with its LAS files in place."""
    _las(tmp_path / "wells" / "A-1.las")
    _las(tmp_path / "wells" / "B-2.las")
    return tmp_path / "project.toml"


def metric_data() -> dict:
    """A valid metric project as the dict tomllib would give."""
    return {
        "project": {"name": "Example field", "units": "metric"},
        "log_sw": {"method": "auto", "a": 1.0, "m": 2.0, "n": 2.0, "rw": "0.045 ohm.m"},
        "wells": [
            {"las": "wells/A-1.las", "name": "A-1", "datum_elevation": "25 m",
             "curves": {"porosity": "PHIE", "permeability": "PERM", "resistivity": "RT", "sw": "SW"},
             "tops": {"Upper": ["2010 m", "2120 m"]}},
            {"las": "wells/B-2.las"},
        ],
        "zones": [
            {"name": "Upper", "top": "1980 m", "base": "2100 m", "fwl": "2060 m",
             "hydrocarbon": "oil", "water_density": "1.08 g/cm3",
             "hydrocarbon_density": "0.75 g/cm3", "sigma_cos_theta": "26 mN/m",
             "function": {"family": "power_law", "swirr": 0.1, "a": 0.2, "b": 1.5,
                          "j_min": 0.02, "j_max": 12}},
            {"name": "Lower", "top": 2100, "base": 2250, "fwl": 2200,
             "hydrocarbon": "gas", "water_density": "10.6 kPa/m",
             "hydrocarbon_density": 250, "sigma_cos_theta": 50,
             "function": {"family": "brooks_corey", "swirr": 0.15, "jd": 0.3, "lam": 1.2}},
        ],
    }


def zone(data: dict, name: str = "Upper") -> dict:
    return next(z for z in data["zones"] if z["name"] == name)


def expect_error(data: dict, path: Path, key: str, *words: str) -> str:
    """parse_project must raise ProjectFileError naming the file and ``key``."""
    with pytest.raises(ProjectFileError) as info:
        parse_project(data, path)
    msg = str(info.value)
    # README (Bad input, Project file): every bad value names the file and the key
    assert str(path) in msg, msg
    assert f"key {key}" in msg, msg
    for w in words:
        assert w in msg, msg
    return msg


METRIC_TOML = """\
[project]
name = "Example field"
units = "metric"

[log_sw]
method = "auto"
a = 1.0
m = 2.0
n = 2.0
rw = "0.045 ohm.m"

[[wells]]
las = "wells/A-1.las"
name = "A-1"
datum_elevation = "25 m"
curves = { porosity = "PHIE", permeability = "PERM", resistivity = "RT", sw = "SW" }
[wells.tops]
Upper = ["2010 m", "2120 m"]

[[zones]]
name = "Upper"
top = "1980 m"
base = "2100 m"
fwl = "2060 m"
hydrocarbon = "oil"
water_density = "1.08 g/cm3"
hydrocarbon_density = "0.75 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
j_min = 0.02
j_max = 12
"""

FIELD_TOML = """\
[project]
units = "field"

[log_sw]
method = "archie"
a = 0.62
m = 2.15
n = 2
rw = 0.05

[[wells]]
las = "A-1.las"
datum_elevation = -12
[wells.tops]
Gas = [6600, "6900 ft"]

[[zones]]
name = "Gas"
fwl = 6760
hydrocarbon = "gas"
water_density = "0.433 psi/ft"
hydrocarbon_density = 0.25
sigma_cos_theta = "26 dyn/cm"
[zones.function]
family = "brooks_corey"
swirr = 0.15
jd = 0.3
lam = 1.2

[[zones]]
name = "Oil"
top = "6900 ft"
base = 7300
fwl = "2250 m"
hydrocarbon = "Oil"
water_density = 1.05
hydrocarbon_density = "0.30 psi/ft"
sigma_cos_theta = 30
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
"""


# ----------------------------------------------------------------------------------
# valid files
# ----------------------------------------------------------------------------------
def test_valid_metric_file(proj):
    proj.write_text(METRIC_TOML)
    p = load_project(proj)
    # the file's values (METRIC_TOML) as typed; paths relative to the project file (README)
    assert isinstance(p, Project)
    assert p.path == proj.resolve() and p.path.is_absolute()
    assert p.name == "Example field"
    assert p.unit_system == "metric"
    # the file's values (METRIC_TOML); defaults a = 1, m = n = 2 are archie1942's
    assert p.log_sw == LogSwSpec(method="auto", a=1.0, m=2.0, n=2.0, rw=pytest.approx(0.045))

    (w,) = p.wells
    # the file's values (METRIC_TOML); the LAS path resolved beside the project file
    assert isinstance(w, WellSpec)
    assert w.name == "A-1"
    assert w.las == (proj.parent / "wells" / "A-1.las").resolve()
    assert w.las.is_absolute()
    # the file's values in metres (METRIC_TOML)
    assert w.datum_elevation == pytest.approx(25.0)
    assert w.curves == {"porosity": "PHIE", "permeability": "PERM", "resistivity": "RT", "sw": "SW"}
    assert w.tops == {"Upper": (pytest.approx(2010.0), pytest.approx(2120.0))}

    (z,) = p.zones
    # the file's values (METRIC_TOML)
    assert isinstance(z, ZoneSpec)
    assert z.name == "Upper"
    # the file's values; unit factors nist2008 (g/cm3, mN/m) as defined at the top
    assert (z.top, z.base, z.fwl) == (pytest.approx(1980.0), pytest.approx(2100.0),
                                      pytest.approx(2060.0))
    assert z.hydrocarbon == "oil"
    assert z.water_density == pytest.approx(1.08 * G_CM3)          # 1 g/cm3 = 1000 kg/m3
    assert z.hydrocarbon_density == pytest.approx(0.75 * G_CM3)
    assert z.sigma_cos_theta == pytest.approx(26 * DYN_CM)          # 26 mN/m = 0.026 N/m
    assert isinstance(z.function, FunctionSpec)
    assert z.function.family == "power_law"
    # the file's values (METRIC_TOML), as typed
    assert z.function.params == {"swirr": 0.1, "a": 0.2, "b": 1.5}
    assert z.function.j_range == (0.02, 12.0)


def test_valid_metric_dict_bare_numbers_and_gradient(proj):
    p = parse_project(metric_data(), proj)
    lower = p.zones[1]
    # bare numbers are metric: m, kg/m3, mN/m
    # the file's values (metric_data())
    assert (lower.top, lower.base, lower.fwl) == (2100.0, 2250.0, 2200.0)
    assert lower.hydrocarbon_density == pytest.approx(250.0)
    assert lower.sigma_cos_theta == pytest.approx(50 * DYN_CM)
    # a pressure gradient is a density: rho = (dp/dz) / g (fluid at rest; g from CGPM/NIST)
    assert lower.water_density == pytest.approx(10.6e3 / G)
    assert lower.function.j_range is None
    # the second well has defaults
    b2 = p.wells[1]
    assert b2.name is None and b2.datum_elevation is None
    assert b2.curves == {} and b2.tops == {}


def test_valid_field_file(tmp_path):
    _las(tmp_path / "A-1.las")
    path = tmp_path / "north_field.toml"
    path.write_text(FIELD_TOML)
    p = load_project(path)
    # the file's values (FIELD_TOML); README (Project file): the name defaults to the file stem
    assert p.name == "north_field"               # default: file stem
    assert p.unit_system == "field"
    assert p.log_sw.method == "archie"
    # the file's values (FIELD_TOML; winsauer1952 constants as typed)
    assert (p.log_sw.a, p.log_sw.m, p.log_sw.n) == (0.62, 2.15, 2.0)
    assert p.log_sw.rw == pytest.approx(0.05)    # ohm.m in both systems

    (w,) = p.wells
    # the file's values (FIELD_TOML)
    assert w.name is None
    # the file's values, ft -> m by nist2008 (FT above)
    assert w.datum_elevation == pytest.approx(-12 * FT)         # may be negative
    assert w.tops["Gas"] == (pytest.approx(6600 * FT), pytest.approx(6900 * FT))

    gas, oil = p.zones
    # the file's values (FIELD_TOML): the zone takes its window from the well's tops
    assert gas.top is None and gas.base is None                 # tops come from the well
    # the file's value, ft -> m (nist2008)
    assert gas.fwl == pytest.approx(6760 * FT)
    # 0.433 psi/ft -> kg/m3 = psi/ft / g. The trade rule "0.433 psi/ft is fresh water"
    # (common practice) gives about 998.8 kg/m3 with these exact factors.
    expected_rho_w = 0.433 * PSI / FT / G
    assert gas.water_density == pytest.approx(expected_rho_w, rel=1e-12)
    assert gas.water_density == pytest.approx(998.78, abs=0.01)
    assert gas.hydrocarbon_density == pytest.approx(0.25 * G_CM3)   # bare number: g/cm3
    assert gas.sigma_cos_theta == pytest.approx(0.026)              # 26 dyn/cm = 0.026 N/m
    assert gas.function.family == "brooks_corey"
    assert gas.function.params == {"swirr": 0.15, "jd": 0.3, "lam": 1.2}

    # the file's values; ft -> m, psi/ft / g -> kg/m3 (nist2008, cgpm1901), dyn/cm -> N/m
    assert oil.top == pytest.approx(6900 * FT) and oil.base == pytest.approx(7300 * FT)
    assert oil.fwl == pytest.approx(2250.0)                     # explicit unit wins
    assert oil.hydrocarbon == "oil"                             # choices case-insensitive
    assert oil.water_density == pytest.approx(1.05 * G_CM3)
    assert oil.hydrocarbon_density == pytest.approx(0.30 * PSI / FT / G, rel=1e-12)
    assert oil.sigma_cos_theta == pytest.approx(30 * DYN_CM)


def test_defaults_when_optional_tables_missing(proj):
    data = metric_data()
    del data["log_sw"]
    del data["project"]["name"]
    p = parse_project(data, proj)
    # defaults of the README: a = 1, m = n = 2 (archie1942), no Rw
    assert p.log_sw == LogSwSpec(method="auto", a=1.0, m=2.0, n=2.0, rw=None)
    assert p.name == "project"


def test_input_dict_is_not_modified(proj):
    data = metric_data()
    before = copy.deepcopy(data)
    parse_project(data, proj)
    # common practice (the project's rule): inputs are never modified
    assert data == before


def test_fwl_outside_zone_window_is_allowed(proj):
    data = metric_data()
    zone(data)["fwl"] = "1900 m"      # whole zone below its FWL
    zone(data, "Lower")["fwl"] = 3000  # whole zone above its FWL
    p = parse_project(data, proj)
    # the values given above (metres)
    assert p.zones[0].fwl == 1900.0 and p.zones[1].fwl == 3000.0


def test_zones_may_touch(proj):
    data = metric_data()
    # the values of metric_data(): zones that touch are not an overlap (README: Bad input)
    assert zone(data)["base"] == "2100 m" and zone(data, "Lower")["top"] == 2100
    assert len(parse_project(data, proj).zones) == 2


def test_las_path_relative_to_project_folder(tmp_path, monkeypatch):
    sub = tmp_path / "proj"
    _las(sub / "logs" / "A-1.las")
    path = sub / "p.toml"
    path.write_text(METRIC_TOML.replace("wells/A-1.las", "logs/A-1.las"))
    monkeypatch.chdir(tmp_path)      # current folder differs from the project folder
    p = load_project(Path("proj") / "p.toml")
    # README (Outputs): paths are relative to the project file, whatever the current folder
    assert p.wells[0].las == (sub / "logs" / "A-1.las").resolve()
    assert p.path == path.resolve()


# ----------------------------------------------------------------------------------
# file-level errors
# ----------------------------------------------------------------------------------
def test_missing_file(tmp_path):
    path = tmp_path / "nope.toml"
    with pytest.raises(InputFileError) as info:
        load_project(path)
    assert str(path) in str(info.value)


def test_unreadable_file_is_input_error(tmp_path):
    folder = tmp_path / "a_folder.toml"
    folder.mkdir()
    with pytest.raises(InputFileError) as info:
        load_project(folder)
    # README (Bad input): errors name the file
    assert str(folder) in str(info.value)


def test_not_utf8_is_input_error(tmp_path):
    path = tmp_path / "latin1.toml"
    path.write_bytes(b'[project]\nname = "Caf\xe9"\nunits = "metric"\n')
    with pytest.raises(InputFileError) as info:
        load_project(path)
    # README (Bad input, Project file): a file that is not UTF-8 is an error
    assert str(path) in str(info.value) and "UTF-8" in str(info.value)


def test_toml_syntax_error_names_line_and_column(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text('[project]\nunits = "metric"\nname = Example field\n')
    with pytest.raises(ProjectFileError) as info:
        load_project(path)
    msg = str(info.value)
    # README (Bad input, Project file): TOML syntax errors name the line and column
    assert str(path) in msg and "line 3, column" in msg, msg


def test_toml_syntax_error_at_end_of_file(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text('[project]\nunits = "metric"\nname = ')
    with pytest.raises(ProjectFileError) as info:
        load_project(path)
    # README (Bad input, Project file): TOML syntax errors name the line
    assert str(path) in str(info.value) and "line 3" in str(info.value)


# ----------------------------------------------------------------------------------
# unknown keys (typos)
# ----------------------------------------------------------------------------------
def _set(data, where, key, value):
    where(data)[key] = value


@pytest.mark.parametrize("where, typo, key, allowed_word", [
    (lambda d: d, "zone", "zone", "zones"),
    (lambda d: d["project"], "unit", "project.unit", "units"),
    (lambda d: d["log_sw"], "Rw", "log_sw.Rw", "rw"),
    (lambda d: d["wells"][0], "datum", "wells[A-1].datum", "datum_elevation"),
    (lambda d: d["wells"][1], "nam", "wells[wells/B-2.las].nam", "name"),
    (lambda d: zone(d), "fwll", "zones[Upper].fwll", "fwl"),
    (lambda d: zone(d)["function"], "j_mx", "zones[Upper].function.j_mx", "j_max"),
    (lambda d: zone(d)["function"], "jd", "zones[Upper].function.jd", "swirr"),
])
def test_unknown_key(proj, where, typo, key, allowed_word):
    data = metric_data()
    _set(data, where, typo, 1)
    msg = expect_error(data, proj, key, "unknown key", allowed_word)
    # README (Project file): an unknown key is an error listing the allowed keys
    assert "allowed keys" in msg


def test_unknown_key_suggests_close_match(proj):
    data = metric_data()
    zone(data)["sigma_cos_tetha"] = 26
    expect_error(data, proj, "zones[Upper].sigma_cos_tetha", "did you mean 'sigma_cos_theta'")


def test_unknown_curve_role(proj):
    data = metric_data()
    data["wells"][0]["curves"]["density"] = "RHOB"
    expect_error(data, proj, "wells[A-1].curves.density", "unknown key",
                 "porosity, permeability, resistivity, sw")


# ----------------------------------------------------------------------------------
# missing required keys
# ----------------------------------------------------------------------------------
@pytest.mark.parametrize("where, drop, key", [
    (lambda d: d, "project", "project"),
    (lambda d: d, "wells", "wells"),
    (lambda d: d, "zones", "zones"),
    (lambda d: d["project"], "units", "project.units"),
    (lambda d: d["wells"][0], "las", "wells[A-1].las"),
    (lambda d: zone(d), "name", "zones[#1].name"),
    (lambda d: zone(d), "hydrocarbon", "zones[Upper].hydrocarbon"),
    (lambda d: zone(d), "water_density", "zones[Upper].water_density"),
    (lambda d: zone(d), "hydrocarbon_density", "zones[Upper].hydrocarbon_density"),
    (lambda d: zone(d), "sigma_cos_theta", "zones[Upper].sigma_cos_theta"),
    (lambda d: zone(d), "function", "zones[Upper].function"),
    (lambda d: zone(d)["function"], "family", "zones[Upper].function.family"),
])
def test_missing_required_key(proj, where, drop, key):
    data = metric_data()
    del where(data)[drop]
    expect_error(data, proj, key, "missing")


def test_zone_top_without_base(proj):
    data = metric_data()
    del zone(data)["base"]
    expect_error(data, proj, "zones[Upper].base", "missing", "both top and base")


# ----------------------------------------------------------------------------------
# wrong types
# ----------------------------------------------------------------------------------
@pytest.mark.parametrize("where, name, value, key", [
    (lambda d: d["project"], "name", 5, "project.name"),
    (lambda d: d["log_sw"], "a", "1.0", "log_sw.a"),
    (lambda d: d["log_sw"], "m", True, "log_sw.m"),
    (lambda d: d["wells"][0], "las", 3, "wells[A-1].las"),
    (lambda d: d["wells"][0], "curves", "PHIE", "wells[A-1].curves"),
    (lambda d: d["wells"][0]["curves"], "porosity", 3, "wells[A-1].curves.porosity"),
    (lambda d: d["wells"][0], "tops", ["2010 m", "2120 m"], "wells[A-1].tops"),
    (lambda d: d["wells"][0]["tops"], "Upper", "2010 m", "wells[A-1].tops.Upper"),
    (lambda d: d["wells"][0]["tops"], "Upper", [2010], "wells[A-1].tops.Upper"),
    (lambda d: zone(d), "fwl", True, "zones[Upper].fwl"),
    (lambda d: zone(d), "top", [1980, 2100], "zones[Upper].top"),
    (lambda d: zone(d), "hydrocarbon", 1, "zones[Upper].hydrocarbon"),
    (lambda d: zone(d), "function", "power_law", "zones[Upper].function"),
    (lambda d: zone(d)["function"], "a", "0.2", "zones[Upper].function.a"),
    (lambda d: zone(d)["function"], "j_max", "12", "zones[Upper].function.j_max"),
])
def test_wrong_type(proj, where, name, value, key):
    data = metric_data()
    where(data)[name] = value
    expect_error(data, proj, key, "found")


def test_wells_must_be_array_of_tables(proj):
    data = metric_data()
    data["wells"] = {"las": "wells/A-1.las"}
    expect_error(data, proj, "wells", "list of tables", "[[wells]]")


# ----------------------------------------------------------------------------------
# units
# ----------------------------------------------------------------------------------
def test_unknown_unit_system(proj):
    data = metric_data()
    data["project"]["units"] = "imperial"
    expect_error(data, proj, "project.units", "'imperial'", "'metric'", "'field'")


@pytest.mark.parametrize("where, name, value, key", [
    (lambda d: zone(d), "fwl", "2060 furlongs", "zones[Upper].fwl"),
    (lambda d: zone(d), "water_density", "1.08 g/m3", "zones[Upper].water_density"),
    (lambda d: zone(d), "sigma_cos_theta", "26 psi", "zones[Upper].sigma_cos_theta"),
    (lambda d: zone(d), "top", "about 1980 m", "zones[Upper].top"),
    (lambda d: d["wells"][0], "datum_elevation", "25 fathoms", "wells[A-1].datum_elevation"),
    (lambda d: d["wells"][0]["tops"], "Upper", ["2010 m", "2120 yd"], "wells[A-1].tops.Upper"),
    (lambda d: d["log_sw"], "rw", "0.045 ohm.cm", "log_sw.rw"),
])
def test_bad_unit_text_is_wrapped(proj, where, name, value, key):
    data = metric_data()
    where(data)[name] = value
    with pytest.raises(ProjectFileError) as info:
        parse_project(data, proj)
    # README (Bad input, Project file): every bad value names the key (a ProjectFileError)
    assert not isinstance(info.value, UnitError)
    msg = str(info.value)
    bad = value[-1] if isinstance(value, list) else value
    assert str(proj) in msg and f"key {key}" in msg and repr(bad) in msg, msg


# ----------------------------------------------------------------------------------
# values
# ----------------------------------------------------------------------------------
@pytest.mark.parametrize("name, value", [
    ("water_density", 0), ("water_density", "-1 g/cm3"),
    ("hydrocarbon_density", 0), ("hydrocarbon_density", "-0.1 g/cm3"),
])
def test_non_positive_density(proj, name, value):
    data = metric_data()
    zone(data)[name] = value
    expect_error(data, proj, f"zones[Upper].{name}", "greater than zero")


@pytest.mark.parametrize("value", [0, "-26 mN/m", "0 dyn/cm"])
def test_non_positive_sigma_cos_theta(proj, value):
    data = metric_data()
    zone(data)["sigma_cos_theta"] = value
    expect_error(data, proj, "zones[Upper].sigma_cos_theta", "greater than zero")


@pytest.mark.parametrize("rho_w", ["0.96 g/cm3", "0.98 g/cm3"])
def test_water_not_denser_than_hydrocarbon(proj, rho_w):
    # both inside their plausible ranges (brine 950-1250, oil 500-1000 kg/m3, common practice)
    data = metric_data()
    zone(data)["water_density"] = rho_w
    zone(data)["hydrocarbon_density"] = "0.98 g/cm3"
    expect_error(data, proj, "zones[Upper].water_density", rho_w, "0.98 g/cm3",
                 "water must be denser than the hydrocarbon")


def test_unknown_hydrocarbon(proj):
    data = metric_data()
    zone(data)["hydrocarbon"] = "condensate"
    expect_error(data, proj, "zones[Upper].hydrocarbon", "'condensate'", "'oil'", "'gas'", "'air'")


def test_duplicate_zone_names(proj):
    data = metric_data()
    zone(data, "Lower")["name"] = "Upper"
    zone_list = data["zones"]
    zone_list[1]["top"], zone_list[1]["base"] = 2300, 2400
    expect_error(data, proj, "zones[Upper].name", "more than one zone")


@pytest.mark.parametrize("top, base", [("2100 m", "2100 m"), ("2100 m", "1980 m")])
def test_zone_top_not_above_base(proj, top, base):
    data = metric_data()
    zone(data)["top"], zone(data)["base"] = top, base
    expect_error(data, proj, "zones[Upper].top", "not above base")


def test_overlapping_zones(proj):
    data = metric_data()
    zone(data, "Lower")["top"] = 2050
    expect_error(data, proj, "zones[Lower]", "'Lower'", "'Upper'", "overlaps")


def test_zone_without_window_or_tops(proj):
    data = metric_data()
    lower = zone(data, "Lower")
    del lower["top"], lower["base"]
    expect_error(data, proj, "zones[Lower].top", "no well gives tops")


def test_zone_without_window_but_with_tops_is_fine(proj):
    data = metric_data()
    lower = zone(data, "Lower")
    del lower["top"], lower["base"]
    data["wells"][1]["tops"] = {"Lower": [2150, 2300]}
    p = parse_project(data, proj)
    # the values given above (metres)
    assert p.zones[1].top is None and p.wells[1].tops == {"Lower": (2150.0, 2300.0)}


def test_tops_unknown_zone(proj):
    data = metric_data()
    data["wells"][0]["tops"]["Uper"] = [2200, 2300]
    expect_error(data, proj, "wells[A-1].tops.Uper", "'Uper'", "did you mean 'Upper'")


@pytest.mark.parametrize("pair", [["2120 m", "2010 m"], [2010, 2010]])
def test_tops_top_not_above_base(proj, pair):
    data = metric_data()
    data["wells"][0]["tops"]["Upper"] = pair
    expect_error(data, proj, "wells[A-1].tops.Upper", "not above base")


def test_tops_overlapping_in_one_well(proj):
    data = metric_data()
    data["wells"][0]["tops"]["Lower"] = [2100, 2300]
    expect_error(data, proj, "wells[A-1].tops.Lower", "'Lower'", "'Upper'", "overlaps")


@pytest.mark.parametrize("which", ["wells", "zones"])
def test_empty_list(proj, which):
    data = metric_data()
    data[which] = []
    expect_error(data, proj, which, "empty")


def test_las_file_missing_names_resolved_path(proj):
    data = metric_data()
    data["wells"][0]["las"] = "wells/../wells/C-3.las"
    msg = expect_error(data, proj, "wells[A-1].las", "not found")
    # README (Bad input): a missing LAS file is named with its resolved path
    assert str((proj.parent / "wells" / "C-3.las").resolve()) in msg


def test_duplicate_well_names(proj):
    data = metric_data()
    data["wells"][1]["name"] = "A-1"
    expect_error(data, proj, "wells[A-1].name", "more than one well")


# ----------------------------------------------------------------------------------
# J-Sw function
# ----------------------------------------------------------------------------------
@pytest.mark.parametrize("change, key, word", [
    ({"family": "cubic"}, "zones[Upper].function.family", "power_law"),
    ({"swirr": 1.5}, "zones[Upper].function", "swirr"),
    ({"b": 0.0}, "zones[Upper].function", "b"),
    ({"j_min": 12, "j_max": 2}, "zones[Upper].function.j_min", "j_min < j_max"),
    ({"j_min": -1}, "zones[Upper].function.j_min", "0 <= j_min"),
])
def test_function_errors(proj, change, key, word):
    data = metric_data()
    zone(data)["function"].update(change)
    with pytest.raises(ProjectFileError) as info:
        parse_project(data, proj)
    msg = str(info.value)
    # README (Bad input, Project file): every bad value names the file and the key
    assert str(proj) in msg and f"key {key}" in msg and word in msg, msg


def test_function_missing_parameter(proj):
    data = metric_data()
    del zone(data)["function"]["b"]
    expect_error(data, proj, "zones[Upper].function", "b")


def test_function_only_one_j_bound(proj):
    data = metric_data()
    del zone(data)["function"]["j_max"]
    expect_error(data, proj, "zones[Upper].function.j_max", "missing", "both j_min and j_max")


# ----------------------------------------------------------------------------------
# log Sw
# ----------------------------------------------------------------------------------
def test_log_sw_unknown_method(proj):
    data = metric_data()
    data["log_sw"]["method"] = "dual_water"
    expect_error(data, proj, "log_sw.method", "'dual_water'", "'curve'", "'archie'", "'auto'",
                 "'simandoux'", "'indonesia'")


def test_archie_without_rw(proj):
    data = metric_data()
    data["log_sw"]["method"] = "archie"
    del data["log_sw"]["rw"]
    expect_error(data, proj, "log_sw.rw", "archie", "rw")


def test_auto_without_rw_is_fine(proj):
    data = metric_data()
    del data["log_sw"]["rw"]
    # README (Project file): Rw is optional unless Archie is asked for
    assert parse_project(data, proj).log_sw.rw is None


@pytest.mark.parametrize("name", ["a", "m", "n"])
@pytest.mark.parametrize("value", [0, -2.0])
def test_archie_parameters_must_be_positive(proj, name, value):
    data = metric_data()
    data["log_sw"][name] = value
    expect_error(data, proj, f"log_sw.{name}", "greater than zero")


@pytest.mark.parametrize("value", [0, "-0.045 ohm.m"])
def test_rw_must_be_positive(proj, value):
    data = metric_data()
    data["log_sw"]["rw"] = value
    expect_error(data, proj, "log_sw.rw", "greater than zero")


# --- [comparison] cutoffs -----------------------------------------------------------

def _with_comparison(tmp_path, table):
    las = tmp_path / "w.las"
    las.write_text("dummy")
    text = f'''[project]
units = "metric"
[comparison]
{table}
[[wells]]
las = "w.las"
[[zones]]
name = "Z"
top = 1000
base = 1100
fwl = 1090
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
'''
    p = tmp_path / "c.toml"
    p.write_text(text)
    return p


def test_comparison_cutoffs_parsed(tmp_path):
    from satheight.project import load_project

    p = load_project(_with_comparison(tmp_path, 'min_porosity = "8 %"\nmin_permeability = 0.5'))
    # the file's values: 8 % = 0.08 (closed form)
    assert p.comparison.min_porosity == pytest.approx(0.08)
    # bare permeability is mD in both unit systems; 1 mD = 9.869233e-16 m^2 (NIST SP 811)
    assert p.comparison.min_permeability == pytest.approx(0.5 * 9.869233e-16)


@pytest.mark.parametrize("table,key", [("min_porosity = 1.5", "comparison.min_porosity"),
                                       ('min_permeability = "-1 mD"', "comparison.min_permeability"),
                                       ("max_gr = 80", "comparison")])
def test_comparison_errors_name_key(tmp_path, table, key):
    from satheight.errors import ProjectFileError
    from satheight.project import load_project

    with pytest.raises(ProjectFileError) as e:
        load_project(_with_comparison(tmp_path, table))
    # README (Bad input, Project file): every bad value names the file and the key
    assert "c.toml" in str(e.value) and key in str(e.value)


def test_one_zone_record_from_project_file_to_engine(proj):
    """The project zone and the per-well engine zone are one record type.

    Upper: rho_w 1080, rho_o 750 kg/m3 (read above), FWL 2060 m, sigma cos theta 0.026 N/m,
    power law (swirr 0.1, a 0.2, b 1.5). Worked by hand at 2000 m TVDSS, k = 100 mD
    (9.869233e-14 m2, NIST SP 811), phi = 0.2: h = 60 m, Pc = 330 * 9.80665 * 60 =
    194171.67 Pa, J = Pc sqrt(k/phi) / 0.026, power law Sw = swirr + (1 - swirr) a J^-b.
    """
    from satheight.engine import Zone, compute_shm, zone_for_well

    p = parse_project(metric_data(), proj)
    z = p.zones[0]
    assert type(z) is Zone
    zw = zone_for_well(z, 1990.0, 2050.0)
    assert type(zw) is Zone and (zw.top, zw.base) == (1990.0, 2050.0)
    assert zw.fwl == z.fwl and zw.fluids == z.fluids     # fluids carried, not copied by hand
    k, phi = 100 * 9.869233e-16, 0.2
    pc = 330.0 * G * 60.0
    j = pc * math.sqrt(k / phi) / 0.026
    r = compute_shm(np.array([2000.0]), np.array([phi]), np.array([k]), [zw])
    assert r.pc[0] == pytest.approx(pc, rel=1e-9)
    assert r.sw[0] == pytest.approx(0.1 + 0.9 * 0.2 * j ** -1.5, rel=1e-9)


# ----------------------------------------------------------------------------------
# plausible ranges (satheight.plausible.RANGES; ranges are common practice, see README)
# ----------------------------------------------------------------------------------
def test_water_density_read_in_the_wrong_unit_is_refused_with_the_likely_unit(proj):
    # 1.08 as a bare metric number is 1.08 kg/m3 (brine 950-1250 kg/m3): 1.08 g/cm3 was meant
    data = metric_data()
    zone(data)["water_density"] = 1.08
    expect_error(data, proj, "zones[Upper].water_density", "1.08", "kg/m3", "950 to 1250",
                 "did you mean 1.08 g/cm3?", "allow_unusual")


def test_sigma_cos_theta_in_n_per_m_read_as_mn_per_m_is_refused(proj):
    # 0.026 bare metric = 0.026 mN/m (range 1-100 mN/m): 0.026 N/m = 26 mN/m was meant
    data = metric_data()
    zone(data)["sigma_cos_theta"] = 0.026
    expect_error(data, proj, "zones[Upper].sigma_cos_theta", "0.026", "did you mean 0.026 N/m?")


def test_gradient_in_another_pressure_unit_is_refused_with_the_likely_unit(proj):
    # 0.468 kPa/m -> 47.7 kg/m3; 0.468 psi/ft -> 1078 kg/m3 (NIST SP 811 psi and foot)
    data = metric_data()
    zone(data)["water_density"] = "0.468 kPa/m"
    expect_error(data, proj, "zones[Upper].water_density", '"0.468 kPa/m"',
                 "did you mean 0.468 psi/ft?")


def test_density_that_does_not_fit_its_phase_is_refused(proj):
    # gas zone with an oil density (750 kg/m3; gas 50-400) and oil zone at 220 kg/m3 (oil 500-1000)
    data = metric_data()
    zone(data, "Lower")["hydrocarbon_density"] = "0.75 g/cm3"
    expect_error(data, proj, "zones[Lower].hydrocarbon_density", "gas density",
                 'is hydrocarbon = "oil" meant?')
    data = metric_data()
    zone(data)["hydrocarbon_density"] = "220 kg/m3"
    expect_error(data, proj, "zones[Upper].hydrocarbon_density", "oil density",
                 'is hydrocarbon = "gas" meant?')


def test_deliberate_unusual_value_is_accepted_with_allow_unusual(proj):
    data = metric_data()
    zone(data)["hydrocarbon_density"] = "220 kg/m3"
    zone(data)["allow_unusual"] = ["hydrocarbon_density"]
    p = parse_project(data, proj)
    assert p.zones[0].hydrocarbon_density == pytest.approx(220.0)
    assert "hydrocarbon_density" in p.zones[0].allow_unusual


def test_allow_unusual_with_an_unknown_name_is_refused(proj):
    data = metric_data()
    zone(data)["allow_unusual"] = ["water_densty"]
    expect_error(data, proj, "zones[Upper].allow_unusual", "'water_densty'",
                 "did you mean 'water_density'?")


def test_negative_fwl_is_refused(proj):
    # TVDSS positive down; a FWL above sea level needs allow_unusual (range 0-10000 m)
    data = metric_data()
    zone(data)["fwl"] = "-2060 m"
    expect_error(data, proj, "zones[Upper].fwl", '"-2060 m"', "0 to 10000 m")


def test_archie_rw_and_cutoffs_outside_their_ranges_are_refused(proj):
    for table, key, value, words in (
            ("log_sw", "m", 20.0, ("1 to 4",)),
            ("log_sw", "rw", 45, ("0.005 to 20 ohm.m",)),
            ("comparison", "min_porosity", 0.8, ("0 to 0.6", "did you mean 0.8 %?")),
            ("comparison", "min_permeability", "5e6 mD", ("0.0001 to 100000 mD",))):
        data = metric_data()
        data.setdefault(table, {})[key] = value
        expect_error(data, proj, f"{table}.{key}", *words)
    data = metric_data()
    data["log_sw"].update(m=20.0, allow_unusual=["m"])
    assert parse_project(data, proj).log_sw.m == 20.0


def test_reservoir_pressure_in_the_wrong_unit_is_refused(proj):
    # 30 kPa is below 0.1 MPa; 30 MPa was meant (range 0.1-250 MPa, common practice)
    data = metric_data()
    z = zone(data)
    del z["water_density"]
    z["water"] = {"salinity": "80000 ppm"}
    z["conditions"] = {"pressure": "30 kPa", "temperature": "80 degC"}
    expect_error(data, proj, "zones[Upper].conditions.pressure", "did you mean 30 MPa?")
