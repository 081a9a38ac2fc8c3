"""One well's computation: datum, trajectory, zones, log Sw, the SHM and the new curves.

No files are written here (see :mod:`satheight.workflows.outputs`); reading the
well's LAS file and survey goes through :mod:`satheight.io`, the numbers come from
:mod:`satheight.engine`.
"""

from __future__ import annotations

import dataclasses
import math
import warnings
from pathlib import Path

import numpy as np

from .. import __version__
from .. import units as U
from ..datum import AGREE_TOLERANCE as DATUM_AGREE_TOLERANCE, datum_from_header
from ..engine import ZoneModel, compute_shm, zone_for_well
from ..errors import DepthError, ProjectFileError, SatHeightError
from ..io.dlis import read_log_file
from ..io.pressures import resolve_tvdss
from ..io.survey import read_survey, survey_trajectory
from ..logsw import SHALY_SAND, archie_sw
from ..project import check_fwl_near_wells
from ..project.types import Project, WellSpec, ZoneSpec
from ..results import FLAG_MEANINGS, WellPlugs, WellResult
from ..roles import ROLE_ALIASES, detect_roles, require_role, role_values
from ..trajectory import vertical
from ..well import Curve, HeaderItem, Well
from .fwl_per_well import well_fwl
from .existing import (USER_CURVES, prepare_input, role_aliases, suffixed,
                       written_by_satheight)
from .uncertainty import UNCERTAINTY_CURVES

#: Output curve mnemonics and descriptions.
NEW_CURVES = {
    "TVDSS": "True vertical depth below datum, positive down",
    "HAFWL": "Height above free-water level",
    "PC_RES": "Reservoir capillary pressure from height",
    "J": "Leverett J-function",
    "SW_SHM": "Water saturation from the saturation-height model",
    "SW_LOG": "Water saturation from resistivity (Archie)",
    "SHM_FLAG": "Quality flag bits: " + "; ".join(f"{b}={t}" for b, t in FLAG_MEANINGS.items()),
    "ZONE_ID": "Zone number (1-based order of the project file), 0 outside zones",
    "ROCK_ID": "Rock type number within its zone (see Zn_RTk parameters), 0 none",
    "TVD": "True vertical depth below the log depth reference, positive down",
    "NORTH": "Offset north of the well head (survey azimuth reference)",
    "EAST": "Offset east of the well head (survey azimuth reference)",
}

#: Decimals written for each new curve in the output LAS.
OUTPUT_DECIMALS = {"ROCK_ID": 0, "TVDSS": 4, "HAFWL": 4, "PC_RES": 4, "J": 6, "SW_SHM": 5, "SW_LOG": 5,
                   "SHM_FLAG": 0, "ZONE_ID": 0, "TVD": 4, "NORTH": 4, "EAST": 4}


# --------------------------------------------------------------------------------------
# per-well steps

def datum_elevation(well: Well, spec: WellSpec,
                    system: str = "metric") -> tuple[float, str, list[str]]:
    """Elevation of the log depth reference above the TVDSS datum [m], its source and notes.

    The project file's ``datum_elevation`` wins (a header value that differs from it is
    noted); otherwise :func:`satheight.datum.datum_from_header` searches the LAS
    ``~Well`` and ``~Parameter`` sections, refuses items that disagree and notes a
    ground-level datum.

    Returns
    -------
    value : float
        Elevation [m], positive above the datum.
    source : str
        Which item was used, e.g. ``"EKB = 28.5 M (~Well), kelly bushing (...)"``.
    notes : list[str]
        For the well's run notes.
    """
    if spec.datum_elevation is None:
        return datum_from_header(well)
    value = float(spec.datum_elevation)
    notes: list[str] = []
    try:
        header, source, _ = datum_from_header(well)
    except SatHeightError:
        header = None
    if header is not None and abs(header - value) > DATUM_AGREE_TOLERANCE:
        notes.append(f"{well.source}: datum elevation {U.shown(value, 'length', system)} from the "
                     "project file is used; "
                     f"the LAS header gives {source.split(',')[0]}")
    return value, "datum_elevation in the project file", notes


def require_fwls(project: Project) -> None:
    """Refuse a project with a zone without an FWL before a run starts (one error, not one
    per well)."""
    for zs in project.zones:
        if zs.fwl is None:
            raise ProjectFileError(f"zone {zs.name!r} has no fwl: the run needs its free-water "
                                   "level", where=f"{project.path}, key zones[{zs.name}].fwl",
                                   hint='give fwl = "<TVDSS> m"; satheight fwl finds it from '
                                        "the logs, satheight pressures from pressure points")


def zones_for_well(project: Project, spec: WellSpec, md: np.ndarray, tvdss: np.ndarray,
                   md_to_tvdss=None, need_fwl: bool = True) -> list[ZoneModel]:
    """Engine zones for one well: the well's own tops (MD, turned into TVDSS; or TVDSS
    from the tops file) or the field-wide window.

    ``md_to_tvdss``, if given, maps MD [m] to TVDSS [m] (positive down) along the
    well's trajectory and is used for MD tops instead of interpolating between samples.
    A zone without an FWL is refused when ``need_fwl``; otherwise (the FWL search, which
    looks for it) its FWL is NaN.
    """
    out = []
    for zs in project.zones:
        if zs.name in spec.tops_tvdss:
            top, base = spec.tops_tvdss[zs.name]
        elif zs.name in spec.tops and md_to_tvdss is not None:
            top, base = (float(v) for v in md_to_tvdss(np.asarray(spec.tops[zs.name], dtype=float)))
        elif zs.name in spec.tops:
            top_md, base_md = spec.tops[zs.name]
            top, base = np.interp([top_md, base_md], md, tvdss, left=np.nan, right=np.nan)
            # tops outside the logged interval: extend linearly with the end offsets
            if np.isnan(top):
                top = top_md - (md[0] - tvdss[0])
            if np.isnan(base):
                base = base_md - (md[-1] - tvdss[-1])
        elif zs.top is not None and zs.base is not None:
            top, base = zs.top, zs.base
        else:
            continue
        if zs.fwl is None and zs.name not in spec.fwl:
            if need_fwl:
                require_fwls(project)
            zs = dataclasses.replace(zs, fwl=math.nan)
        fwl, fwl_source = well_fwl(project, spec, zs)   # the well's own or a tilted FWL
        out.append(_zone_model(zs, float(top), float(base), project.path, fwl, fwl_source))
    return out


def _zone_model(zs: ZoneSpec, top: float, base: float, path: Path, fwl=None,
                fwl_source=None) -> ZoneModel:
    return zone_for_well(zs, top, base, where=f"{path}, key zones[{zs.name}].function",
                         fwl=fwl, fwl_source=fwl_source)


#: Log-Sw sources computed here from Rt (not a curve of the LAS file).
COMPUTED_SW = ("archie",) + tuple(SHALY_SAND)


def log_saturation(project: Project, well: Well, roles: dict, phi: np.ndarray, vsh=None):
    """Log water saturation and where it came from: the well's Sw curve, or Archie or a
    shaly-sand equation (with ``vsh`` [fraction], the shale-volume curve) from Rt."""
    cfg = project.log_sw
    msgs: list[str] = []
    if cfg.method in ("curve", "auto") and roles.get("sw"):
        sw, w = role_values(well, "sw", roles["sw"])
        msgs += w
        if np.isfinite(sw).any() or cfg.method == "curve":
            return sw, f"curve:{roles['sw']}", msgs
        msgs.append(f"Sw curve {roles['sw']} holds no value: falling back to Archie from the "
                    "resistivity curve")
    if cfg.method == "curve":
        require_role(well, "sw", None)
    if roles.get("resistivity") is None:
        if cfg.method in COMPUTED_SW:
            require_role(well, "resistivity", None)
        msgs.append("no Sw curve and no resistivity curve: no log Sw to compare with")
        return None, "none", msgs
    if cfg.rw is None:
        msgs.append("no Sw curve and no rw in [log_sw]: Archie Sw not computed")
        return None, "none", msgs
    rt, w = role_values(well, "resistivity", roles["resistivity"])
    msgs += w
    if cfg.method in SHALY_SAND:
        if vsh is None:
            require_role(well, "shale", None)
        return (SHALY_SAND[cfg.method](rt, phi, vsh, cfg.rw, cfg.rsh, cfg.a, cfg.m, cfg.n,
                                       clip=False), cfg.method, msgs)
    # unclipped: the comparison statistics use it; compute_well clips the exported curve
    return archie_sw(rt, phi, cfg.rw, cfg.a, cfg.m, cfg.n, clip=False), "archie", msgs


def compute_well(project: Project, spec: WellSpec,
                 existing: str = "replace", need_fwl: bool = True) -> tuple[WellResult, list[str]]:
    """Load one well and compute everything (no files written).

    ``existing``: input curves named like a computed one are dropped (``"replace"``) or
    kept (``"suffix"``: the new ones are renamed when written), with a note.
    ``need_fwl=False`` (the FWL search) lets zones without an FWL through, with NaN SHM
    results (see :func:`zones_for_well`).
    """
    well = read_log_file(spec.las)     # LAS, or DLIS by its ending
    labels = well_labels((spec.name, spec.las.stem, well.name))   # for core and pressure rows
    if spec.name:
        well.name = spec.name
    else:
        spec = pending_tops(project, spec, well.name)
    msgs = list(well.warnings)
    computed = set(NEW_CURVES) | set(UNCERTAINTY_CURVES)
    keep = set(spec.curves.values())    # curves the project names are input, never dropped
    if project.log_sw.method in ("curve", "auto") and not written_by_satheight(well):
        keep.add("SW_LOG")              # a user's log Sw curve of that name
    well, notes = prepare_input(well, computed, existing, keep)
    if existing == "suffix":
        notes = suffixed([Curve(mn, "", "", well.md) for mn in sorted(computed - USER_CURVES)],
                         well)[2]
    msgs += notes
    roles = detect_roles(well, spec.curves, role_aliases(ROLE_ALIASES, well, computed))
    phi_mn = require_role(well, "porosity", roles.get("porosity"))
    k_mn = require_role(well, "permeability", roles.get("permeability"))
    phi, w1 = role_values(well, "porosity", phi_mn)
    k, w2 = role_values(well, "permeability", k_mn)
    msgs += w1 + w2
    rt = None
    if roles.get("resistivity"):
        rt, w3 = role_values(well, "resistivity", roles["resistivity"])
        msgs += w3
    vsh = None
    if roles.get("shale"):
        vsh, w7 = role_values(well, "shale", roles["shale"])
        msgs += w7
    elev, datum_source, w6 = datum_elevation(well, spec, project.unit_system)
    msgs += w6
    tvd, north, east, md_to_tvdss, w5 = well_path(spec, well, elev, project.unit_system)
    msgs += w5
    tvdss = tvd - elev  # TVDSS = TVD - datum elevation, positive down
    clash = sorted({"TVD", "NORTH", "EAST"} & {k.upper() for k in well.curves})
    if clash:
        msgs.append("the LAS file already has curve(s) " + ", ".join(clash) + ": kept as read; "
                    "the computed ones are not written (TVDSS is)")
    zones = zones_for_well(project, spec, well.md, tvdss, md_to_tvdss, need_fwl)
    for zn in zones:  # a FWL far outside this well's logs, or above its surface, is refused
        if not math.isnan(zn.fwl):
            check_fwl_near_wells(project.path, zn, tvdss, -elev, project.unit_system, spec.las)
    if not zones:
        msgs.append("no zone of the project lies in this well")
    shm = compute_shm(tvdss, phi, k, zones)
    sw_log, source, w4 = log_saturation(project, well, roles, phi, vsh)
    msgs += w4
    sw_raw = sw_log if source in COMPUTED_SW else None
    if sw_raw is not None:
        sw_log = np.clip(sw_raw, 0.0, 1.0)
    if md_to_tvdss is None:         # a vertical well: TVD = MD
        def md_to_tvdss(md):
            return np.asarray(md, dtype=float) - elev
    result = WellResult(well=well, tvdss=tvdss, zones=zones, shm=shm, phi=phi, k=k, rt=rt,
                        sw_log=sw_log, sw_log_source=source, roles=roles, datum_elevation=elev,
                        datum_source=datum_source, tvd=tvd, north=north, east=east,
                        survey=spec.survey, sw_log_unclipped=sw_raw, vsh=vsh,
                        plugs=place_plugs(project, labels, md_to_tvdss),
                        pressures=place_pressures(project, labels, md_to_tvdss))
    msgs += value_warnings(result, project.unit_system)
    return result, msgs


def pending_tops(project: Project, spec: WellSpec, well_name: str) -> WellSpec:
    """``spec`` with the tops-file rows of ``well_name`` (the LAS file's well name) added.

    Raises
    ------
    ProjectFileError
        If a zone of those rows is also given under ``[wells.tops]`` of this well.
    """
    rows = project.tops_pending.get(well_name)
    if not rows:
        return spec
    md_tops, tv_tops = dict(spec.tops), dict(spec.tops_tvdss)
    for r in rows:
        if r.zone in md_tops or r.zone in tv_tops:
            raise ProjectFileError(f"zone {r.zone!r} of well {well_name!r} is given both under "
                                   f"[wells.tops] and in the tops file ({project.tops_file}, line {r.line})",
                                   where=f"{project.path}, key wells[{spec.las.name}].tops.{r.zone}",
                                   hint="give each well's zone window in one place only")
        (md_tops if r.depth_type == "MD" else tv_tops)[r.zone] = (r.top, r.base)
    return dataclasses.replace(spec, tops=md_tops, tops_tvdss=tv_tops)


def well_path(spec: WellSpec, well: Well, elev: float, system: str = "metric"):
    """Trajectory of one well at its log samples.

    Returns
    -------
    tvd, north, east : numpy.ndarray
        TVD below the log depth reference [m] (positive down) and offsets from the
        well head [m] at every sample: minimum curvature through the survey if the
        well has one, else a vertical well (TVD = MD, no offset).
    md_to_tvdss : callable or None
        MD [m] -> TVDSS [m] along the trajectory (None for a vertical well).
    warnings : list[str]
        Survey notes (added tie-in station, samples below the last station; depths in
        the length unit of ``system``).
    """
    if spec.survey is None:
        tvd, north, east = vertical(well.md)
        return tvd, north, east, None, []
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        survey = read_survey(spec.survey, spec.survey_format)
        md0 = float(np.nanmin(well.md)) if well.md.size else None
        traj = survey_trajectory(survey, md0, str(well.source), well.depth_unit)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")     # said below in the project's length unit
        tvd, north, east = traj.at(well.md)
    msgs = list(survey.warnings) + [str(c.message) for c in caught]
    below = int(np.count_nonzero(well.md > traj.md[-1] + 1e-9))
    if below:
        msgs.append(f"{traj.source or spec.survey}: {below} depths below the last survey station "
                    f"(MD {U.shown(traj.md[-1], 'length', system)}) were continued straight "
                    "along the last station's direction")

    def md_to_tvdss(md):
        above = np.asarray(md, dtype=float) < traj.md[0] - 1e-9
        if np.any(above):        # said here in the project's length unit, not the survey's metres
            raise DepthError(f"MD {U.shown(float(np.min(np.asarray(md)[above])), 'length', system)} "
                             f"lies above the first survey station (MD "
                             f"{U.shown(traj.md[0], 'length', system)})", where=str(spec.survey),
                             hint="add survey stations above it or a tie-in station at MD 0")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            return traj.at(md)[0] - elev

    return tvd, north, east, md_to_tvdss, msgs


def depth_maps(project: Project, wells: set, notes: list[str] | None = None) -> dict:
    """Per well named in ``wells``: its datum elevation [m], or MD -> TVDSS [m] for a
    surveyed well (for points a file gives only in MD).

    The elevation is the run's (:func:`datum_elevation`); its notes go to ``notes``.
    """
    out = {}
    for spec in project.wells:
        if spec.name is not None and spec.name not in wells:
            continue
        well = read_log_file(spec.las)
        name = spec.name or well.name
        if name in wells:
            elev, _, more = datum_elevation(well, spec, project.unit_system)
            if notes is not None:
                notes += more
            md_to_tvdss = well_path(spec, well, elev, project.unit_system)[3]
            out[name] = elev if md_to_tvdss is None else md_to_tvdss
    return out


def well_labels(names) -> frozenset:
    """The names a core or pressure file row may give a well by (blanks dropped, outer
    spaces stripped): its project name, LAS file name without ending, LAS WELL item."""
    return frozenset(str(n).strip() for n in names if n is not None and str(n).strip())


def place_plugs(project: Project, labels: frozenset, md_to_tvdss) -> WellPlugs | None:
    """The project's plugs of the well called by ``labels``, with TVDSS from
    ``md_to_tvdss`` (MD [m] -> TVDSS [m], the function the log samples went through);
    None when the well has none."""
    measured = project.measured
    if measured is None:
        return None
    plugs = [p for p in measured.plugs.values() if str(p.well).strip() in labels]
    if not plugs:
        return None
    md = np.array([p.depth for p in plugs], dtype=float)
    return WellPlugs(plug=np.array([p.plug_id for p in plugs], dtype=object), md=md,
                     tvdss=np.asarray(md_to_tvdss(md), dtype=float),
                     sw=np.array([np.nan if p.sw is None else p.sw for p in plugs], dtype=float),
                     porosity=np.array([p.porosity for p in plugs], dtype=float),
                     permeability=np.array([p.permeability for p in plugs], dtype=float))


def place_pressures(project: Project, labels: frozenset, md_to_tvdss):
    """The project's pressure points of the well called by ``labels``, every TVDSS filled
    (MD-only points through ``md_to_tvdss``); None when the well has none."""
    measured = project.measured
    if measured is None or measured.pressures is None:
        return None
    pts = measured.pressures
    mine = np.isin(pts.well.astype(str), sorted(labels))
    if not mine.any():
        return None
    sub = pts.subset(mine)
    return resolve_tvdss(sub, {w: md_to_tvdss for w in set(sub.well)})


# --------------------------------------------------------------------------------------
# the new curves and the ~Parameter items that record how they were made

def _output_units(project: Project, well: Well) -> dict[str, str]:
    sysu = U.UNIT_SYSTEMS[project.unit_system]
    return {"depth": well.depth_unit, "pressure": sysu["pressure"],
            "length": sysu["length"], "density": sysu["density"], "tension": sysu["tension"]}


def output_curves(result: WellResult, project: Project) -> list[Curve]:
    """The new curves written beside the input curves, in output units."""
    u = _output_units(project, result.well)
    shm = result.shm
    dz = u["depth"]
    curves = [
        Curve("TVDSS", dz, NEW_CURVES["TVDSS"], U.from_si(result.tvdss, dz, "length")),
    ]
    if result.tvd is not None:
        # an input curve of the same name (a TVD curve in the LAS file) is kept and ours left out
        have = {k.upper() for k in result.well.curves}
        curves += [Curve(mn, dz, NEW_CURVES[mn], U.from_si(v, dz, "length"))
                   for mn, v in (("TVD", result.tvd), ("NORTH", result.north), ("EAST", result.east))
                   if mn not in have]
    curves += [
        Curve("HAFWL", dz, NEW_CURVES["HAFWL"], U.from_si(shm.hafwl, dz, "length")),
        Curve("PC_RES", u["pressure"], NEW_CURVES["PC_RES"], U.from_si(shm.pc, u["pressure"], "pressure")),
        Curve("J", "", NEW_CURVES["J"], shm.j.copy()),
        Curve("SW_SHM", "v/v", NEW_CURVES["SW_SHM"], shm.sw.copy()),
    ]
    if result.sw_log_source in COMPUTED_SW:
        curves.append(Curve("SW_LOG", "v/v", NEW_CURVES["SW_LOG"].replace(
            "Archie", result.sw_log_source.capitalize()), result.sw_log.copy()))
    curves.append(Curve("SHM_FLAG", "", NEW_CURVES["SHM_FLAG"], shm.flag.astype(float)))
    curves.append(Curve("ZONE_ID", "", NEW_CURVES["ZONE_ID"], (shm.zone + 1).astype(float)))
    rock = rock_type_ids(result)
    if rock is not None:
        curves.append(Curve("ROCK_ID", "", NEW_CURVES["ROCK_ID"], rock))
    return curves


def rock_type_ids(result: WellResult) -> np.ndarray | None:
    """Per sample, the 1-based number of its rock type in its zone's rock-type table.

    Only for wells with a zone whose J-Sw function is chosen per depth by rock type
    (numbers as listed by the ``Zn_RTk`` items of ~Parameter); 0 where a sample has
    no rock type with a function (or lies in a zone without per-depth rock typing),
    NaN outside every zone. None when no zone of the well uses rock typing.
    """
    zones = [(i, zn) for i, zn in enumerate(result.zones) if zn.rock_functions]
    if not zones:
        return None
    ids = np.where(result.shm.zone >= 0, 0.0, np.nan)
    for i, zn in zones:  # one pass per zone and rock type, not per sample
        m = result.shm.zone == i
        labels = np.asarray(zn.rock_classifier(result.phi[m], result.k[m]), dtype=object)
        out = np.zeros(labels.shape)
        for number, name in enumerate(zn.rock_functions, start=1):
            out[labels == name] = number
        ids[m] = out
    return ids


def run_parameters(result: WellResult, project: Project) -> list[HeaderItem]:
    """~Parameter items recording how the new curves were made."""
    u = _output_units(project, result.well)
    items = [HeaderItem("SHM_VERSION", "", f"satheight {__version__}", "Program that wrote the new curves"),
             HeaderItem("SHM_PROJECT", "", project.path.name, "Project file"),
             HeaderItem("SHM_DATUM", u["depth"], round(U.from_si(result.datum_elevation, u["depth"], "length"), 4),
                        "Depth reference elevation above TVDSS datum"),
             HeaderItem("SHM_SWSRC", "", result.sw_log_source, "Source of log Sw")]
    if result.survey is not None:
        items.append(HeaderItem("SHM_SURVEY", "", Path(result.survey).name,
                                "Deviation survey (minimum curvature)"))
    if result.sw_log_source in COMPUTED_SW:
        c = project.log_sw
        if c.rsh is not None:
            items.append(HeaderItem("RSH", "ohm.m", c.rsh, "Shale resistivity"))
        items += [HeaderItem("ARCHIE_A", "", c.a, "Archie tortuosity factor a"),
                  HeaderItem("ARCHIE_M", "", c.m, "Archie cementation exponent m"),
                  HeaderItem("ARCHIE_N", "", c.n, "Archie saturation exponent n"),
                  HeaderItem("ARCHIE_RW", "ohm.m", c.rw, "Archie formation-water resistivity at formation temperature")]
    for i, zn in enumerate(result.zones, start=1):
        p = f"Z{i}_"
        items += [
            HeaderItem(p + "NAME", "", zn.name, f"Zone {i} name"),
            HeaderItem(p + "TOP", u["depth"], round(U.from_si(zn.top, u["depth"], "length"), 4), f"Zone {i} top TVDSS"),
            HeaderItem(p + "BASE", u["depth"], round(U.from_si(zn.base, u["depth"], "length"), 4), f"Zone {i} base TVDSS"),
            HeaderItem(p + "FWL", u["depth"], round(U.from_si(zn.fwl, u["depth"], "length"), 4), f"Zone {i} free-water level TVDSS"),
            HeaderItem(p + "RHOW", u["density"], round(U.from_si(zn.water_density, u["density"], "density"), 6), f"Zone {i} water density"),
            HeaderItem(p + "RHOH", u["density"], round(U.from_si(zn.hydrocarbon_density, u["density"], "density"), 6), f"Zone {i} {zn.hydrocarbon} density"),
            HeaderItem(p + "SIGCOS", u["tension"], round(U.from_si(zn.sigma_cos_theta, u["tension"], "tension"), 6), f"Zone {i} sigma*cos(theta)"),
            HeaderItem(p + "FUNC", "", zn.function.name, f"Zone {i} J-Sw function: {zn.function.description}"),
        ]
        if zn.gas_oil_level is not None:   # three-phase column
            items += [
                HeaderItem(p + "GOL", u["depth"], round(U.from_si(zn.gas_oil_level, u["depth"], "length"), 4), f"Zone {i} free-oil (gas-oil) level TVDSS"),
                HeaderItem(p + "RHOG", u["density"], round(U.from_si(zn.gas_density, u["density"], "density"), 6), f"Zone {i} gas density"),
                HeaderItem(p + "SIGCOSG", u["tension"], round(U.from_si(zn.gas_sigma_cos_theta, u["tension"], "tension"), 6), f"Zone {i} gas-water sigma*cos(theta)"),
            ]
        for pname, pval in zn.function.params_.items():
            items.append(HeaderItem(f"{p}{pname.upper()}", "", pval, f"Zone {i} function parameter {pname}"))
        if zn.function.j_range_ is not None:
            items += [HeaderItem(p + "JMIN", "", zn.function.j_range_[0], f"Zone {i} calibrated J minimum"),
                      HeaderItem(p + "JMAX", "", zn.function.j_range_[1], f"Zone {i} calibrated J maximum")]
        items += _model_file_parameters(project, zn, p, i)
        for number, (name, fn) in enumerate((zn.rock_functions or {}).items(), start=1):
            q = f"{p}RT{number}"
            items += [HeaderItem(q, "", name, f"Zone {i} rock type {number} (ROCK_ID = {number})"),
                      HeaderItem(q + "_FUNC", "", fn.name, f"Zone {i} rock type {number} J-Sw function")]
            items += [HeaderItem(f"{q}_{pn.upper()}", "", pv,
                                 f"Zone {i} rock type {number} function parameter {pn}")
                      for pn, pv in fn.params_.items()]
    return items


def _model_file_parameters(project: Project, zn: ZoneModel, p: str, i: int) -> list[HeaderItem]:
    """~Parameter items naming the model file and rock type a zone's function came from."""
    spec = next((z for z in project.zones if z.name == zn.name), None)
    if spec is None or spec.function.file is None:
        return []
    fs = spec.function
    if fs.by_rock_type:
        rock = f"per depth by {fs.rock_rule.method} classes: " + ", ".join(fs.by_rock_type)
    else:
        rock = fs.rock_type or ""
    return [HeaderItem(p + "MFILE", "", fs.file.name, f"Zone {i} J-Sw model file"),
            HeaderItem(p + "ROCK", "", rock, f"Zone {i} rock type of the model file")]


def value_warnings(result: WellResult, system: str = "metric") -> list[str]:
    """Notes on zones of one well whose values give no or one-sided SHM results.

    One note per zone that: holds no sample of the well; has its FWL at or above its
    shallowest sample (the whole zone is at or below the FWL: Sw = 1 throughout); has
    its FWL below its deepest sample (no sample reaches the FWL: normal for an
    undrilled contact, noted so it is seen); or has no sample with a usable porosity
    and permeability (no SHM Sw at all). Depths in the notes are TVDSS in the length
    unit of ``system`` (the project's unit system).
    """
    out: list[str] = []
    src = result.well.source
    z = np.asarray(result.tvdss, dtype=float)
    shm = result.shm

    def d(v: float) -> str:
        return U.shown(v, "length", system)

    for i, zn in enumerate(result.zones):
        m = shm.zone == i
        if not m.any():
            out.append(f"{src}: zone {zn.name!r} ({d(zn.top)} to {d(zn.base)} TVDSS) holds no "
                       "sample of this well")
            continue
        shallow, deep = float(z[m].min()), float(z[m].max())
        if zn.fwl <= shallow:
            out.append(f"{src}: zone {zn.name!r}: the FWL ({d(zn.fwl)} TVDSS) lies at or above "
                       f"its shallowest sample ({d(shallow)}): Sw = 1 throughout the zone")
        elif zn.fwl > deep:
            out.append(f"{src}: zone {zn.name!r}: the FWL ({d(zn.fwl)} TVDSS) lies below its "
                       f"deepest sample ({d(deep)}): every sample is above the FWL")
        if not np.isfinite(shm.sw[m]).any():
            out.append(f"{src}: zone {zn.name!r}: no sample has a usable porosity and "
                       "permeability, so no SHM Sw (see SHM_FLAG)")
    return out
