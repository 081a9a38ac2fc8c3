"""Project set-up: a commented project file written from a folder of LAS files.

The folder is scanned (not recursively) for LAS files and for CSV files whose names say what
they hold (survey, tops, core, pressures). Each LAS file is read; the file records the well
name, the depth unit, the curve picked for each role and why (the first of the role's
mnemonics, in order of preference, present in the file), and the header item the run takes the
datum elevation from (:func:`satheight.datum.datum_from_header`), or why there is none. What only the user knows (free-water level, fluids, J-Sw function) is left
as placeholders marked ``FILL IN`` in the zone block; the file loads with the project reader
once they are filled.

An existing project file is never replaced: the new one is written beside it under the next
free name, and the caller is told so.
"""

from __future__ import annotations

import os
import re
from dataclasses import dataclass, field
from pathlib import Path

from .. import __version__
from ..datum import datum_from_header
from ..errors import InputFileError, SatHeightError
from ..io.atomic import atomic_write_text
from ..io.las import read_las
from ..io.tops import read_tops
from ..roles import ROLE_ALIASES, detect_roles

#: Default name of the written project file (in the scanned folder).
DEFAULT_NAME = "satheight_project.toml"

#: Words in a CSV file's name that say what it holds (checked in this order).
FILE_KINDS = (("survey", ("survey", "deviation", "dev")), ("tops", ("tops", "top")),
              ("pressures", ("pressure", "pressures")), ("core", ("core", "plug", "plugs")))

PLACEHOLDER = "?"


@dataclass
class WellFound:
    """What the scan learnt of one LAS file."""

    las: Path
    name: str
    depth_unit: str
    start: float
    stop: float
    roles: dict[str, str | None]
    reasons: dict[str, str]
    datum: str | None
    #: Why the header gives no datum (when ``datum`` is None).
    datum_problem: str = ""
    survey: Path | None = None
    #: True when the project file must name the well (its LAS name is taken).
    named: bool = False


@dataclass
class FolderScan:
    """Everything found in a folder: wells, other files by kind, and notes."""

    folder: Path
    wells: list[WellFound] = field(default_factory=list)
    files: dict[str, list[Path]] = field(default_factory=dict)
    zones: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)

    @property
    def unit_system(self) -> str:
        """``field`` when most wells are logged in feet, else ``metric``."""
        feet = sum(1 for w in self.wells if w.depth_unit.lower() in ("ft", "f", "feet", "foot"))
        return "field" if feet * 2 > len(self.wells) else "metric"


def _one_line(text) -> str:
    """Text from an input on one line, without control characters (safe in a comment)."""
    return "".join(ch if ch.isprintable() else " " for ch in str(text)).strip()


def _key(text: str) -> str:
    return re.sub(r"[^A-Z0-9]", "", str(text).upper())


def toml_string(text) -> str:
    """A TOML basic string holding ``text`` exactly (escapes per TOML 1.0, "String")."""
    out = []
    for ch in str(text):
        if ch in '"\\':
            out.append("\\" + ch)
        elif ch == "\t" or (ch.isprintable() and ch not in "\x7f"):
            out.append(ch)
        else:
            out.append(f"\\u{ord(ch):04X}" if ord(ch) <= 0xFFFF else f"\\U{ord(ch):08X}")
    return '"' + "".join(out) + '"'


def _datum(well) -> tuple[str | None, str]:
    """The header item the run takes the datum from (as the run reads it), or None and why."""
    try:
        return _one_line(datum_from_header(well)[1]), ""
    except InputFileError as exc:
        return None, _one_line(exc.what)


def _role_reasons(found: dict[str, str | None]) -> dict[str, str]:
    """Why each role got its curve: the preference order of its mnemonics and those absent."""
    reasons = {}
    for role, aliases in ROLE_ALIASES.items():
        picked = (found.get(role) or "").upper()
        if not picked:
            reasons[role] = f"none of {', '.join(aliases)} in the file"
            continue
        earlier = aliases[:aliases.index(picked)] if picked in aliases else ()
        reasons[role] = (f"the first of {', '.join(aliases)} in the file"
                         + (f" ({', '.join(earlier)} absent)" if earlier else ""))
    return reasons


#: Curves that satheight writes: a LAS file holding them is a result, not an input.
OUTPUT_CURVES = {"SW_SHM", "HAFWL", "SHM_FLAG"}


def _scan_las(path: Path) -> WellFound | None:
    """What one LAS file holds; None for a LAS file written by satheight itself."""
    well = read_las(path)
    if OUTPUT_CURVES <= {k.upper() for k in well.curves}:
        return None
    found = detect_roles(well)
    datum, problem = _datum(well)
    md = well.curves[well.index_mnemonic].data
    return WellFound(las=path, name=_one_line(well.name) or path.stem,
                     depth_unit=_one_line(well.depth_unit) or "m",
                     start=float(md[0]), stop=float(md[-1]), roles=dict(found),
                     reasons=_role_reasons(found), datum=datum, datum_problem=problem)


def _kind_of(path: Path) -> str | None:
    words = set(re.split(r"[^a-z]+", path.stem.lower()))
    for kind, names in FILE_KINDS:
        if words & set(names):
            return kind
    return None


def scan_folder(folder) -> FolderScan:
    """Find the wells and the other input files of a folder (see the module docstring)."""
    folder = Path(folder)
    if not folder.is_dir():
        raise InputFileError("not a folder", where=str(folder),
                             hint="give the folder that holds the LAS files")
    scan = FolderScan(folder=folder.resolve())
    entries = sorted((p for p in folder.iterdir() if p.is_file()), key=lambda p: p.name.lower())
    for p in entries:
        if p.suffix.lower() == ".las":
            try:
                found = _scan_las(p.resolve())
            except SatHeightError as exc:
                scan.notes.append(f"{p.name} left out: {_one_line(exc)}")
                continue
            if found is None:
                scan.notes.append(f"{p.name} left out: it holds satheight results "
                                  f"({', '.join(sorted(OUTPUT_CURVES))})")
            else:
                scan.wells.append(found)
        elif p.suffix.lower() in (".csv", ".txt"):
            kind = _kind_of(p)
            if kind is None:
                scan.notes.append(f"{p.name}: not recognised by its name (survey, tops, core, "
                                  "pressure); left out")
            else:
                scan.files.setdefault(kind, []).append(p.resolve())
    if not scan.wells:
        raise InputFileError("no readable LAS file in the folder", where=str(folder),
                             hint="put the wells' LAS files (.las) in this folder")
    _match_surveys(scan)
    _zone_names(scan)
    _distinct_names(scan)
    return scan


def _distinct_names(scan: FolderScan) -> None:
    """A well whose name another LAS file already has is named after its file."""
    seen: set[str] = set()
    for w in scan.wells:
        if _key(w.name) in seen:
            scan.notes.append(f"{w.las.name}: well name {w.name} already taken by another file; "
                              f"named {w.las.stem} in the project file")
            w.name, w.named = w.las.stem, True
        seen.add(_key(w.name))


def _match_surveys(scan: FolderScan) -> None:
    """Give each well the survey file whose name holds its well name or LAS file name."""
    for s in scan.files.get("survey", []):
        hits = [w for w in scan.wells
                if _key(w.name) and (_key(w.name) in _key(s.stem) or _key(w.las.stem) in _key(s.stem))]
        hits.sort(key=lambda w: -len(_key(w.name)))     # the longest name wins (A-10 over A-1)
        if hits and hits[0].survey is None:
            hits[0].survey = s
        else:
            scan.notes.append(f"survey {s.name}: no well matched by name; add it to a well by hand")


def _zone_names(scan: FolderScan) -> None:
    """Zone names from the first tops file, in order of first appearance."""
    tops = scan.files.get("tops", [])
    if len(tops) > 1:
        scan.notes.append("several tops files: the first, " + tops[0].name + ", is used")
    if not tops:
        return
    try:
        rows = read_tops(tops[0])
    except SatHeightError as exc:
        scan.notes.append(f"tops file {tops[0].name} not used: {_one_line(exc)}")
        scan.files["tops"] = []
        return
    for r in rows:
        if r.zone not in scan.zones:
            scan.zones.append(r.zone)


# --------------------------------------------------------------------------------------
# the project file's text

def _rel(path: Path, base: Path) -> str:
    return Path(os.path.relpath(path, base)).as_posix()


def _well_block(w: WellFound, base: Path) -> list[str]:
    lines = ["[[wells]]", f"las = {toml_string(_rel(w.las, base))}",
             *([f"name = {toml_string(w.name)}   # the LAS file's well name is taken"]
               if w.named else []),
             f"# well {_one_line(w.name)}; depths in {w.depth_unit}, {w.start:g} to {w.stop:g}"]
    for role in ROLE_ALIASES:
        mn = w.roles.get(role)
        need = " (REQUIRED: name the curve in curves below)" if role in ("porosity", "permeability") and not mn else ""
        lines.append(f"# {role}: {_one_line(mn) if mn else 'none'}, {w.reasons[role]}{need}")
    picked = {r: m for r, m in w.roles.items() if m}
    if picked:
        lines.append("curves = { " + ", ".join(f"{r} = {toml_string(m)}" for r, m in picked.items())
                     + " }   # the curves picked above; change any of them here")
    if w.datum:
        lines.append(f"# datum: {w.datum}; the run takes it from the LAS header "
                     "(or give datum_elevation here)")
    else:
        lines.append(f"# datum: {w.datum_problem}: FILL IN")
        lines.append(f'datum_elevation = "{PLACEHOLDER}"   # FILL IN: depth reference (KB) '
                     'elevation above the datum, e.g. "25 m"')
    if w.survey is not None:
        lines.append(f"survey = {toml_string(_rel(w.survey, base))}   # matched by its file name")
    else:
        lines.append("# no survey file found for this well: taken as vertical")
    return lines + [""]


def _zone_block(name: str, with_tops: bool, unit: str) -> list[str]:
    lines = ["[[zones]]", f"name = {toml_string(name)}"]
    lines += [f'top = "{PLACEHOLDER}"                # FILL IN: zone top, TVDSS, e.g. "2030 {unit}"',
              f'base = "{PLACEHOLDER}"               # FILL IN: zone base, TVDSS, e.g. "2120 {unit}"']
    if with_tops:
        lines.append("# the tops file gives this zone's top and base in the wells it lists; delete "
                     "top and base above if it lists every well")
    lines += [
        f'fwl = "{PLACEHOLDER}"                # FILL IN: free-water level, TVDSS, e.g. "2105 {unit}"',
        f'hydrocarbon = "{PLACEHOLDER}"        # FILL IN: "oil", "gas" or "air"',
        f'water_density = "{PLACEHOLDER}"      # FILL IN: reservoir brine, e.g. "1.08 g/cm3" or "0.468 psi/ft"',
        f'hydrocarbon_density = "{PLACEHOLDER}"   # FILL IN: e.g. "0.78 g/cm3"',
        f'sigma_cos_theta = "{PLACEHOLDER}"    # FILL IN: reservoir sigma*cos(theta), e.g. "26 mN/m"',
        "[zones.function]",
        'family = "power_law"          # J-Sw function; or file = "models.json" from satheight fit',
        f'swirr = "{PLACEHOLDER}"              # FILL IN: plain numbers, e.g. 0.1',
        f'a = "{PLACEHOLDER}"                  # FILL IN: e.g. 0.2',
        f'b = "{PLACEHOLDER}"                  # FILL IN: e.g. 1.5', ""]
    return lines


def project_text(scan: FolderScan, target: Path) -> str:
    """The commented project file for ``scan``, with paths relative to ``target``'s folder."""
    base = target.resolve().parent
    system = scan.unit_system
    unit = "ft" if system == "field" else "m"
    tops = scan.files.get("tops", [])
    lines = [f"# Project file written by satheight {__version__} start from the folder",
             f"# {_one_line(scan.folder)}.",
             "# Fill in every value marked FILL IN (search for it), then: satheight run THIS_FILE",
             "# Results are estimates for review by a qualified professional.", "",
             "[project]", f"name = {toml_string(scan.folder.name)}",
             f'units = "{system}"   # {"most wells are logged in feet" if system == "field" else "most wells are logged in metres"}: bare numbers below are {unit}']
    if tops:
        lines.append(f"tops_file = {toml_string(_rel(tops[0], base))}   # found by its name")
    core, press = scan.files.get("core", []), scan.files.get("pressures", [])
    if core:    # plug tables carry well and depth: keep those to draw plugs on the track plots
        lines.append("# core_files = [" + ", ".join(toml_string(_rel(p, base)) for p in core)
                     + "]   # found by their names: keep the plug tables to draw their plugs")
    if press:
        lines.append(f"# pressure_file = {toml_string(_rel(press[0], base))}   # found by its "
                     "name: uncomment to draw its points on the track plots")
    lines += ["", "[log_sw]", 'method = "auto"   # a well\'s Sw curve if it has one, else Archie '
              "from resistivity (needs rw)",
              '# rw = "0.05 ohm.m"   # formation-water resistivity at formation temperature', ""]
    for w in scan.wells:
        lines += _well_block(w, base)
    for z in (scan.zones or ["Zone 1"]):
        lines += _zone_block(z, with_tops=bool(tops), unit=unit)
    for kind, how in (("core", "fit J-Sw functions with: satheight fit FILES, then set "
                               "[zones.function] file = the model file"),
                      ("pressures", "compare contacts with: satheight pressures FILE --project "
                                    "THIS_FILE")):
        for p in scan.files.get(kind, []):
            lines.append(f"# {kind} file {_rel(p, base)}: {how}")
    lines += [f"# note: {_one_line(n)}" for n in scan.notes]
    return "\n".join(lines).rstrip() + "\n"


def free_target(path: Path) -> Path:
    """``path`` if no file is there, else the first free ``NAME.new.toml``, ``NAME.new2.toml``..."""
    if not path.exists():
        return path
    stem = path.name[:-len(path.suffix)] if path.suffix else path.name
    for i in range(1, 1000):
        cand = path.with_name(f"{stem}.new{'' if i == 1 else i}{path.suffix}")
        if not cand.exists():
            return cand
    raise SatHeightError("no free file name beside the existing project file", where=str(path),
                         hint="give another file name with --out")


def start_project(folder, out=None) -> tuple[FolderScan, Path, bool]:
    """Scan ``folder`` and write its project file; never replaces an existing file.

    Returns the scan, the path written and whether it had to be written beside an
    existing file (the wanted name was taken).
    """
    scan = scan_folder(folder)
    wanted = Path(out) if out is not None else Path(folder) / DEFAULT_NAME
    target = free_target(wanted)
    text = project_text(scan, target)
    atomic_write_text(target, text)
    return scan, target, target != wanted


def scan_record(scan: FolderScan, written: Path, beside: bool) -> dict:
    """The scan as plain values (for printing and ``--json``)."""
    return {"folder": str(scan.folder), "project_file": str(written),
            "written_beside_existing_file": beside, "unit_system": scan.unit_system,
            "wells": [{"name": w.name, "las": str(w.las), "depth_unit": w.depth_unit,
                       "roles": w.roles, "why": w.reasons, "datum": w.datum,
                       "survey": str(w.survey) if w.survey else None} for w in scan.wells],
            "files": {k: [str(p) for p in v] for k, v in scan.files.items()},
            "zones": scan.zones, "notes": scan.notes}


def scan_lines(record: dict) -> list[str]:
    """What the set-up found and wrote, as lines for the terminal (from :func:`scan_record`)."""
    out = [f"folder: {record['folder']}", f"unit system: {record['unit_system']}"]
    for w in record["wells"]:
        out.append(f"well {w['name']} ({Path(w['las']).name}, depths in {w['depth_unit']}):")
        for role, mn in w["roles"].items():
            out.append(f"  {role:<13} {mn or 'none'}: {w['why'][role]}")
        out.append(f"  datum         {w['datum'] or 'not in the header: FILL IN'}")
        out.append(f"  survey        {Path(w['survey']).name if w['survey'] else 'none (vertical)'}")
    for kind, paths in record["files"].items():
        out += [f"{kind} file: {Path(p).name}" for p in paths]
    out += [f"note: {n}" for n in record["notes"]]
    if record["written_beside_existing_file"]:
        out.append("note: a project file of that name exists and was left as it is; "
                   "the new one was written beside it")
    out.append(f"wrote {record['project_file']}")
    out.append("next: fill in every value marked FILL IN, then: satheight run "
               f"{record['project_file']}")
    return [_one_line(line) if not line.startswith("  ") else "  " + _one_line(line)
            for line in out]
