"""Fit a core dataset end to end: read, convert, group, fit, save the model file and plots.

This is what ``satheight fit`` calls. The steps are the public functions of
:mod:`satheight.coreplugs`, :mod:`satheight.io.core_data`, :mod:`satheight.rocktypes`
and :mod:`satheight.io.model_file`; this module only wires them, reads the command
line's option texts (:func:`settings_from_options`) and writes files:

- ``<model file>`` (default ``models.json``): fitted functions per rock type with
  provenance (:mod:`satheight.io.model_file`);
- ``core_points.csv``: every pressure step after conversion (lab Pc, corrected
  Sw, J, reservoir Pc, equivalent height, pore-throat radius, rock type);
- ``core_j_sw.png`` and ``core_pc.png`` (:mod:`satheight.plots.core`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .. import constants as C
from .. import units as U
from ..coreplugs import (DEFAULT_FAMILIES, LAB_SYSTEMS, CorePoints, FluidSystem, core_points,
                         fit_rock_types, fluid_system, height_from_pc, lab_to_reservoir_pc)
from ..errors import SatHeightError
from ..io.atomic import atomic_write_text
from ..io.core_data import read_core_files
from ..io.model_file import models_to_dict, save_models
from ..models import get_family
from ..plots.core import j_sw_plot, pc_plot
from ..rocktypes import RockTypeRule, check_rock_type_names, plug_rock_types
from ..units import parse_quantity
from .console import Progress
from .figures import save_figure
from .output_folder import InputFiles, OutputSession
from .console import SCHEMA_VERSION


@dataclass(frozen=True)
class ReservoirFluids:
    """Reservoir fluids of a rock type: sigma*cos(theta) [N/m] and density difference [kg/m^3]."""

    sigma_cos_theta: float
    delta_rho: float | None = None


@dataclass
class FitSettings:
    """Choices of one fit run (all SI).

    Attributes
    ----------
    default_system : str or None
        Lab system of steps that name none.
    systems : dict[str, FluidSystem] or None
        Lab systems with the dataset's overrides (default: the textbook table).
    closure : "auto", None or float
        Mercury closure correction: picked per curve, none, or a pressure [Pa].
    phi_factor, k_factor : float
        Stress-correction factors [-].
    rule : RockTypeRule or None
        Grouping; None: the plug table's ``rock_type`` column when every plug has
        one, else all plugs together.
    families : tuple of str
    reservoir : dict[str, ReservoirFluids]
        Rock-type name (or ``"*"`` for every other) -> reservoir fluids, for the
        reservoir Pc, the height axis and height functions.
    model_file : str
        Name of the model file in the output folder.
    plots : bool
    lab_names : tuple of str
        Lab systems named by ``--lab``.
    units : str
        ``"metric"`` (kPa, m) or ``"field"`` (psi, ft) for ``core_points.csv`` and notes.
    """

    default_system: str | None = None
    systems: dict | None = None
    closure: object = "auto"
    phi_factor: float = 1.0
    k_factor: float = 1.0
    rule: RockTypeRule | None = None
    families: tuple = DEFAULT_FAMILIES + ("skelt_harrison",)
    reservoir: dict = field(default_factory=dict)
    model_file: str = "models.json"
    plots: bool = True
    #: Lab systems named by ``--lab``: each must be one the core files use.
    lab_names: tuple = ()
    #: Unit system of ``core_points.csv`` and the notes (pressure and height units).
    units: str = "metric"


@dataclass
class FitRun:
    """What a fit run produced."""

    points: CorePoints
    fits: dict
    rule: RockTypeRule
    model_path: Path
    files: list
    warnings: list


def _apply_reservoir(points: CorePoints, lab_sct: np.ndarray, reservoir: dict) -> None:
    """Fill pc_res and height per rock type (vectorised per group)."""
    for rt in dict.fromkeys(points.rock_type.tolist()):
        fluids = reservoir.get(rt or "all", reservoir.get("*"))
        if fluids is None:
            continue
        m = points.rock_type == rt
        points.pc_res[m] = lab_to_reservoir_pc(points.pc_lab[m], lab_sct[m], fluids.sigma_cos_theta)
        if fluids.delta_rho is not None:
            points.height[m] = height_from_pc(points.pc_res[m], fluids.delta_rho)


def points_csv(points: CorePoints, system: str = "metric") -> str:
    """Text of ``core_points.csv``: Pc and height in the units of ``system`` (kPa and m, or
    psi and ft), radius in um, k in mD."""
    import pandas as pd

    pu, lu = U.UNIT_SYSTEMS[system]["pressure"], U.UNIT_SYSTEMS[system]["length"]
    frame = pd.DataFrame({
        "plug": points.plug, "system": points.system, "rock_type": points.rock_type,
        f"pc_lab [{pu}]": U.from_si(points.pc_lab, pu, "pressure"), "sw_raw [frac]": points.sw_raw,
        "sw [frac]": points.sw, "porosity [frac]": points.phi,
        "permeability [mD]": points.k / C.MILLIDARCY, "j [-]": points.j,
        f"pc_res [{pu}]": U.from_si(points.pc_res, pu, "pressure"),
        f"height [{lu}]": U.from_si(points.height, lu, "length"),
        "throat_radius [um]": points.throat_radius * 1e6})
    return frame.to_csv(index=False, float_format="%.6g", lineterminator="\n")


def run_fit(paths, out_dir, settings: FitSettings | None = None,
            overwrite: bool = False, progress: bool = False) -> FitRun:
    """Read core files, convert, group by rock type, fit, and write the outputs.

    Parameters
    ----------
    paths : sequence of path
        Core-data files (any of the layouts of :mod:`satheight.io.core_data`).
    out_dir : path
        Output folder, created if missing. The files are written through
        :class:`satheight.workflows.output_folder.OutputSession` (command ``fit``):
        none replaces an input or a file satheight did not write.
    settings : FitSettings, optional
    overwrite : bool
        Replace the files of an earlier ``fit`` into the same folder.
    progress : bool
        Show the steps on stderr when the fit takes more than a second
        (:class:`satheight.workflows.console.Progress`; the caller decides, e.g. only on a terminal).

    Returns
    -------
    FitRun

    Raises
    ------
    SatHeightError
        Bad input (names file and row), an unknown family, nothing to fit.
    """
    with Progress(4, unit="fit steps", enabled=progress, slow=True) as bar:
        return _run_fit(paths, out_dir, settings, overwrite, bar)


def _run_fit(paths, out_dir, settings: FitSettings | None, overwrite: bool,
             bar: Progress) -> FitRun:
    """:func:`run_fit` with its progress bar."""
    s = settings or FitSettings()
    bar.step("reading core data")
    for fam in s.families:
        get_family(fam, where="families")
    if not paths:
        raise SatHeightError("no core-data files given", hint="name the pressure-steps and plug tables")
    _check_model_file_name(s.model_file)
    inputs = InputFiles()
    for p in paths:
        inputs.add(p, "core-data file")
    ds = read_core_files(paths, default_system=s.default_system, systems=s.systems)
    warnings = ds.validate()
    _check_lab_names(s.lab_names, {c.system for c in ds.curves})
    used = {c.plug_id for c in ds.curves}
    plugs = {p: ds.plugs[p] for p in ds.plugs if p in used}
    rule = s.rule
    if rule is None:
        has_rt = all(p.rock_type for p in plugs.values())
        rule = RockTypeRule("column", "rock_type") if has_rt else None
    if rule is None:
        rock_types = {p: "all" for p in plugs}
        rule_out = RockTypeRule("column", "rock_type")
    else:
        rock_types = plug_rock_types(plugs, rule)
        rule_out = rule
    check_rock_type_names(s.reservoir, rock_types.values(), "--reservoir")
    bar.step("lab Pc to J")
    points = core_points(ds, closure=s.closure, phi_factor=s.phi_factor, k_factor=s.k_factor,
                         rock_types=rock_types)
    lab_sct = np.array([ds.systems[x].sigma_cos_theta for x in points.system])
    _apply_reservoir(points, lab_sct, s.reservoir)
    bar.step(f"fitting {len(set(points.rock_type.tolist()))} rock type(s)")
    fits = fit_rock_types(points, s.families)
    bar.step("writing")
    out = Path(out_dir)
    with OutputSession(out, "fit", overwrite, inputs) as session:
        files = _write_fit_files(session.work, s, ds, points, fits, rule_out)
        files = session.commit(files)
    for rt, e in fits.items():
        for fam, msg in e["errors"].items():
            warnings.append(f"rock type {rt!r}: {fam} not fitted: {msg}")
    warnings += _closure_note(points, ds, s.units)
    return FitRun(points=points, fits=fits, rule=rule_out, model_path=files[0], files=files,
                  warnings=warnings)


def _write_fit_files(out: Path, s: FitSettings, ds, points: CorePoints, fits: dict,
                     rule_out: RockTypeRule) -> list[Path]:
    """Write the model file, ``core_points.csv`` and the plots into ``out``; model file first."""
    provenance = {
        "files": ds.files,
        "lab_systems": {name: ds.systems[name].to_dict()
                        for name in dict.fromkeys(points.system.tolist())},
        "closure": (s.closure if s.closure in (None, "auto") else {"pressure_psi": s.closure / C.PSI}),
        "closure_picked_psi": {k: v / C.PSI for k, v in points.closure.items()},
        "stress_factors": {"porosity": s.phi_factor, "permeability": s.k_factor},
        "reservoir": {rt: {"sigma_cos_theta_mN_per_m": f.sigma_cos_theta * 1e3,
                           "delta_rho_kg_per_m3": f.delta_rho} for rt, f in s.reservoir.items()},
        "selection": "selected = among J families within 2 of the lowest AIC, the fewest "
                     "parameters, then the first in the registry; delta_aic per rock type",
    }
    models = {"schema_version": SCHEMA_VERSION, **models_to_dict(fits, rule_out, provenance)}
    files = [save_models(out / s.model_file, models)]
    pts = out / "core_points.csv"
    atomic_write_text(pts, points_csv(points, s.units))
    files.append(pts)
    if s.plots:
        files += save_figure(j_sw_plot(points, fits), out / "core_j_sw.png")
        files += save_figure(pc_plot(points, s.reservoir), out / "core_pc.png")
    return files


def _check_lab_names(named, used: set) -> None:
    """Refuse ``--lab`` systems that no curve of the core files uses (a misspelt name)."""
    unknown = [n for n in named if n not in used]
    if unknown:
        raise SatHeightError("names lab system(s) that no curve of the core files uses: "
                             + ", ".join(repr(n) for n in unknown), where="--lab",
                             hint="systems of the core files: "
                                  + ", ".join(repr(n) for n in sorted(used)))


def _check_model_file_name(name: str) -> None:
    """``--model-file`` is a plain file name in the output folder."""
    if not name or Path(name).name != name or name.startswith(".") or name in (".", ".."):
        raise SatHeightError(f"--model-file {name!r} must be a plain file name (no folder)",
                             hint="e.g. --model-file models.json; choose the folder with --out")


def _closure_note(points: CorePoints, ds, system: str = "metric") -> list[str]:
    """The closure chosen per mercury curve ('none' where nothing was corrected), in the
    pressure unit of ``system``."""
    if not points.closure:
        return []
    first = {f"{c.plug_id}/{c.system}": c.pc[0] for c in ds.curves}
    return ["closure per curve: " + ", ".join(
        f"{k} {'none' if v <= first[k] else U.shown(v, 'pressure', system)}"
        for k, v in points.closure.items())]


def fit_table(fits: dict) -> str:
    """Plain-text table of the fits: one line per rock type and family."""
    lines = [f"{'rock type':<16} {'family':<15} {'n':>5} {'RMSE':>7} {'R2':>7} {'AIC':>9} {'dAIC':>6} "
             f"{'range':>19}  parameters (± standard error)"]
    for rt, e in fits.items():
        for fam, r in e["fits"].items():
            mark = "*" if fam == e["selected"] else " "
            params = ", ".join(f"{p} {v:.4g} ± {r.stderr.get(p, float('nan')):.2g}"
                               for p, v in r.params.items())
            unit = "m" if r.variable == "height" else "J"
            rng = f"{unit} {r.j_range[0]:.3g}-{r.j_range[1]:.3g}"
            d = e.get("delta_aic", {}).get(fam)
            lines.append(f"{rt[:16]:<16} {fam + mark:<15} {r.n_points:>5} {r.rmse:>7.4f} "
                         f"{r.r2:>7.4f} {r.aic:>9.1f} {'' if d is None else f'{d:.1f}':>6} "
                         f"{rng:>19}  {params}")
    lines.append("* selected: among J families within 2 of the lowest AIC (dAIC <= 2) the one "
                 "with fewer parameters, then the first listed; ranges: J covered by data "
                 "(height [m] for height functions)")
    return "\n".join(lines)


# ----------------------------------------------------------------------------------
# option texts of the command line (units at the edge)

def _split_pair(text: str, what: str) -> tuple[str | None, str]:
    if "=" in text:
        name, value = text.split("=", 1)
        name = name.strip()
        if not name:
            raise SatHeightError(f"{what} {text!r} has an empty name before '='")
        return name, value.strip()
    return None, text.strip()


def parse_lab_override(text: str, base: dict) -> tuple[str, FluidSystem]:
    """``"mercury_air=485 mN/m,140 deg"`` or ``"oil_brine=26 mN/m"`` (sigma*cos(theta)).

    Bare numbers are mN/m and degrees.
    """
    name, value = _split_pair(text, "--lab")
    if name is None:
        raise SatHeightError(f"--lab {text!r} needs SYSTEM=VALUE",
                             hint='e.g. --lab "mercury_air=480 mN/m,140 deg" or --lab "oil_brine=26 mN/m"')
    parts = [p.strip() for p in value.split(",") if p.strip()]
    where = f"--lab {text}"
    try:
        if len(parts) == 1:
            return name, fluid_system(name, base, sigma_cos_theta=parse_quantity(parts[0], "tension", "mN/m"),
                                      where=where)
        if len(parts) == 2:
            return name, fluid_system(name, base, sigma=parse_quantity(parts[0], "tension", "mN/m"),
                                      theta=parse_quantity(parts[1], "angle", "deg"), where=where)
    except SatHeightError as exc:
        raise SatHeightError(exc.what, where=where, hint=exc.hint) from None
    raise SatHeightError(f"--lab {text!r}: give 'sigma, theta' or one sigma*cos(theta)", where=where)


def parse_reservoir(text: str) -> tuple[str, ReservoirFluids]:
    """``"[ROCK TYPE=]26 mN/m[,300 kg/m3]"``: sigma*cos(theta) and density difference.

    Without a rock-type name the fluids apply to every rock type not named
    otherwise (key ``"*"``). Bare numbers are mN/m and kg/m^3; the density
    difference may be a gradient (``"0.13 psi/ft"``).
    """
    name, value = _split_pair(text, "--reservoir")
    parts = [p.strip() for p in value.split(",") if p.strip()]
    where = f"--reservoir {text}"
    if not 1 <= len(parts) <= 2:
        raise SatHeightError("give sigma*cos(theta) and optionally the density difference",
                             where=where, hint='e.g. --reservoir "Upper Sand=26 mN/m,300 kg/m3"')
    try:
        sct = parse_quantity(parts[0], "tension", "mN/m")
        drho = parse_quantity(parts[1], "density", "kg/m3") if len(parts) == 2 else None
    except SatHeightError as exc:
        raise SatHeightError(exc.what, where=where, hint=exc.hint) from None
    if not sct > 0 or (drho is not None and not drho > 0):
        raise SatHeightError("sigma*cos(theta) and the density difference must be > 0", where=where)
    return name or "*", ReservoirFluids(sct, drho)


def parse_closure(text: str):
    """``"auto"``, ``"none"`` or a pressure (bare number psi) -> setting for FitSettings."""
    t = text.strip().lower()
    if t == "auto":
        return "auto"
    if t == "none":
        return None
    try:
        v = parse_quantity(text, "pressure", "psi")
    except SatHeightError as exc:
        raise SatHeightError(exc.what, where=f"--closure {text}",
                             hint="give auto, none or a pressure such as '5 psi'") from None
    if not v > 0:
        raise SatHeightError("closure pressure must be > 0", where=f"--closure {text}")
    return v


def parse_classes(text: str, kind: str, names: str | None) -> RockTypeRule:
    """Class edges ``"1,10,100"`` (mD for permeability, um for FZI) -> RockTypeRule."""
    opt = "--k-classes" if kind == "permeability" else "--fzi-classes"
    try:
        if kind == "permeability":
            edges = tuple(parse_quantity(x.strip(), "permeability", "mD") for x in text.split(","))
        else:
            edges = tuple(float(x) for x in text.split(","))
        nm = tuple(x.strip() for x in names.split(",")) if names else ()
        return RockTypeRule(kind, None, edges, nm)
    except (SatHeightError, ValueError) as exc:
        what = exc.what if isinstance(exc, SatHeightError) else str(exc)
        raise SatHeightError(what, where=f"{opt} {text}",
                             hint="give increasing edges such as 1,10,100") from None


def settings_from_options(*, lab=(), system=None, closure="auto", phi_factor=1.0, k_factor=1.0,
                          group_by=None, k_classes=None, fzi_classes=None, class_names=None,
                          families=None, reservoir=(), model_file="models.json",
                          plots=True, units="metric") -> FitSettings:
    """FitSettings from the option texts of ``satheight fit`` (units at the edge).

    ``lab``, ``reservoir``: texts of the repeatable ``--lab`` and ``--reservoir``;
    ``group_by``, ``k_classes``, ``fzi_classes``: at most one (the rock-type rule);
    ``families``: names, or None for the default set; ``units``: ``"metric"`` or ``"field"``.
    """
    if units not in U.UNIT_SYSTEMS:
        raise SatHeightError(f"--units {units!r} is not a unit system", hint="use metric or field")
    for opt, v in (("--phi-factor", phi_factor), ("--k-factor", k_factor)):
        if not (math.isfinite(v) and v > 0):
            raise SatHeightError(f"{opt} must be a number > 0, got {v}",
                                 hint="a stress-correction factor (stressed/ambient), e.g. 0.95")
    if class_names and not (k_classes or fzi_classes):
        raise SatHeightError("--class-names names the classes of --k-classes or --fzi-classes, "
                             "and neither is given",
                             hint="add --k-classes EDGES or --fzi-classes EDGES")
    systems = dict(LAB_SYSTEMS)
    systems_named = []
    for text in lab:
        name, fluid = parse_lab_override(text, systems)
        systems[name] = fluid
        systems_named.append(name)
    rule = None
    if group_by:
        rule = RockTypeRule("column", group_by)
    elif k_classes:
        rule = parse_classes(k_classes, "permeability", class_names)
    elif fzi_classes:
        rule = parse_classes(fzi_classes, "fzi", class_names)
    settings = FitSettings(default_system=system, systems=systems,
                           closure=parse_closure(closure), phi_factor=phi_factor,
                           k_factor=k_factor, rule=rule,
                           reservoir=dict(parse_reservoir(t) for t in reservoir),
                           model_file=model_file, plots=plots,
                           lab_names=tuple(dict.fromkeys(systems_named)), units=units)
    if families:
        settings.families = tuple(families)
    return settings
