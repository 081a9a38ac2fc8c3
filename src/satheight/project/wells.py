"""The ``[[wells]]`` entries of a project file and the formation-tops file merged into them."""

from __future__ import annotations

import dataclasses as _dc
from pathlib import Path

from ..errors import InputFileError
from ..io.tops import read_tops
from .types import WellSpec
from .values import ALLOW_KEY, _label, _show, did_you_mean

_WELL_KEYS = ("las", "name", "datum_elevation", "curves", "tops", "survey", "survey_format",
              "location", "fwl", ALLOW_KEY)
_SURVEY_FORMATS = ("csv", "las")
_CURVE_ROLES = ("porosity", "permeability", "resistivity", "sw", "shale")


def read_well(reader, raw: dict, index: int, zone_names: list[str]) -> WellSpec:
    key = f"wells[{_label(raw, ('name', 'las'), index)}]"
    t = reader.table(raw, key, _WELL_KEYS, required=("las",))
    las_text = reader.text(t["las"], f"{key}.las")
    base_dir = reader.path.parent.resolve()
    las = (base_dir / las_text).resolve()
    if not las.is_file():
        found = "a folder" if las.exists() else "nothing"
        raise reader.error(f"{key}.las", f"LAS file {las_text!r} not found: looked for {las} "
                         f"and found {found}",
                         hint=f"paths are relative to the project file's folder {base_dir}")
    name = reader.text(t["name"], f"{key}.name") if "name" in t else None
    datum = (reader.quantity(t["datum_elevation"], f"{key}.datum_elevation", "length")
             if "datum_elevation" in t else None)
    if datum is not None:
        reader.plausible("datum_elevation", datum, f"{key}.datum_elevation",
                         t["datum_elevation"],
                         allowed=reader.allow_list(t, key, ("datum_elevation", "fwl")))

    curves: dict[str, str] = {}
    if "curves" in t:
        c = reader.table(t["curves"], f"{key}.curves", _CURVE_ROLES,
                       what="a table of role = mnemonic")
        for role, mnem in c.items():
            curves[role] = reader.text(mnem, f"{key}.curves.{role}")

    tops: dict[str, tuple[float, float]] = {}
    if "tops" in t:
        tt = t["tops"]
        if not isinstance(tt, dict):
            raise reader.error(f"{key}.tops", f"expected a table of zone = [top, base], "
                             f"found {_show(tt)}", hint="write it as a [wells.tops] section")
        for zone, pair in tt.items():
            zkey = f"{key}.tops.{zone}"
            if zone not in zone_names:
                raise reader.error(zkey, f"tops name zone {zone!r}, which no [[zones]] entry "
                                 "defines",
                                 hint=did_you_mean(zone, zone_names)
                                 + "known zones: " + ", ".join(zone_names))
            if not isinstance(pair, list) or len(pair) != 2:
                raise reader.error(zkey, f"expected [top, base], found {_show(pair)}",
                                 hint='write e.g. Upper = ["2010 m", "2120 m"] (measured depth)')
            top = reader.quantity(pair[0], zkey, "length")
            base = reader.quantity(pair[1], zkey, "length")
            if not top < base:
                raise reader.error(zkey, f"top {pair[0]!r} is not above base {pair[1]!r} "
                                 "(measured depth)", hint="write [top, base] with top < base")
            tops[zone] = (top, base)
        reader.check_overlaps(tops, lambda z: f"{key}.tops.{z}", "measured depth")
    survey = survey_format = location = None
    if "survey" in t:
        survey = reader.existing_file(t["survey"], f"{key}.survey", "survey")
    if "survey_format" in t:
        if survey is None:
            raise reader.error(f"{key}.survey_format", "survey_format is given but survey is not",
                             hint='add survey = "<file>" or remove survey_format')
        survey_format = reader.text(t["survey_format"], f"{key}.survey_format", _SURVEY_FORMATS)
    if "location" in t:
        loc = reader.table(t["location"], f"{key}.location", ("east", "north"),
                         required=("east", "north"), what="a table { east = ..., north = ... }")
        location = (reader.quantity(loc["east"], f"{key}.location.east", "length"),
                    reader.quantity(loc["north"], f"{key}.location.north", "length"))
    fwl = _read_fwl(reader, t, key, zone_names)
    return WellSpec(name=name, las=las, datum_elevation=datum, curves=curves, tops=tops,
                    survey=survey, survey_format=survey_format, location=location, fwl=fwl)


def _read_fwl(reader, t: dict, key: str, zone_names: list[str]) -> dict[str, float]:
    """``[wells.fwl]``: zone name -> this well's FWL TVDSS [m], each in its plausible range."""
    if "fwl" not in t:
        return {}
    tt = t["fwl"]
    if not isinstance(tt, dict):
        raise reader.error(f"{key}.fwl", f"expected a table of zone = FWL, found {_show(tt)}",
                           hint='write it as a [wells.fwl] section, e.g. Upper = "2065 m"')
    allowed = reader.allow_list(t, key, ("datum_elevation", "fwl"))
    out = {}
    for zone, value in tt.items():
        zkey = f"{key}.fwl.{zone}"
        if zone not in zone_names:
            raise reader.error(zkey, f"an FWL is given for zone {zone!r}, which no [[zones]] "
                               "entry defines", hint=did_you_mean(zone, zone_names)
                               + "known zones: " + ", ".join(zone_names))
        out[zone] = reader.quantity(value, zkey, "length")
        reader.plausible("fwl", out[zone], zkey, value, allowed=allowed)
    return out

def merge_tops_file(reader, tops_file: Path, wells: list[WellSpec],
                    zone_names: list[str]):
    """Add the tops file's rows to the wells; a zone given twice for a well is an error.

    Rows are matched to a well by its ``name`` or its LAS file stem. Rows of other
    well names are returned as pending (well name -> rows): they may match a well
    whose name comes from its LAS file's WELL item, known only when it is read.
    """
    try:
        rows = read_tops(tops_file, reader.units["length"])
    except InputFileError as exc:
        raise reader.error("project.tops_file", f"{exc.where}: {exc.what}", hint=exc.hint) from None
    by_name: dict[str, int] = {}
    for i, w in enumerate(wells):
        for label in {w.name, w.las.stem} - {None}:
            by_name.setdefault(label, i)
    md_tops = [dict(w.tops) for w in wells]
    tv_tops = [dict(w.tops_tvdss) for w in wells]
    pending: dict[str, list] = {}
    unnamed = any(w.name is None for w in wells)
    for r in rows:
        where = f"{tops_file}, line {r.line}"
        if r.well not in by_name and not unnamed:
            raise reader.error("project.tops_file", f"{where}: well {r.well!r} matches no [[wells]] "
                             "entry (by name or LAS file name)",
                             hint=did_you_mean(r.well, by_name)
                             + "remove the row or add the well to the project")
        if r.zone not in zone_names:
            raise reader.error("project.tops_file", f"{where}: zone {r.zone!r} is not a [[zones]] name",
                             hint=did_you_mean(r.zone, zone_names)
                             + "known zones: " + ", ".join(zone_names))
        if r.well not in by_name:
            pending.setdefault(r.well, []).append(r)
            continue
        i = by_name[r.well]
        if r.zone in md_tops[i] or r.zone in tv_tops[i]:
            raise reader.error(f"wells[{wells[i].name or wells[i].las.stem}].tops.{r.zone}",
                             f"zone {r.zone!r} of well {r.well!r} is given both here and in the "
                             f"tops file ({where})",
                             hint="give each well's zone window in one place only")
        (md_tops if r.depth_type == "MD" else tv_tops)[i][r.zone] = (r.top, r.base)
    out = []
    for w, mt, tt in zip(wells, md_tops, tv_tops):
        label = w.name or w.las.stem
        reader.check_overlaps(mt, lambda z, lb=label: f"wells[{lb}].tops.{z}", "measured depth")
        reader.check_overlaps(tt, lambda z, lb=label: f"wells[{lb}].tops.{z} (tops file)", "TVDSS")
        out.append(_dc.replace(w, tops=mt, tops_tvdss=tt))
    return out, pending
