"""Command line: argument parsing and printing only; each command calls one workflow function.

Exit codes: 0 everything ran; 2 bad input (file, project value, unit, missing
curve, option value) or an output that cannot or may not be written (folder of an
earlier run without ``--overwrite``, a file satheight did not write, an input as
output, another run holding the folder's lock, a full disk); 3 the project ran but
one or more wells failed; 1 an unexpected internal error (please report it with
``--verbose`` output); 130 interrupted. Text read from input files is printed with
its control characters escaped (:func:`terminal_text`).
"""

from __future__ import annotations

import argparse
import json
import os
import re
import sys
import traceback
from pathlib import Path

from . import __version__
from . import units as U
from .errors import SatHeightError
from .workflows.contacts import parse_exclude, parse_fit_bounds, run_fwl, run_pressures
from .workflows.fit import fit_table, run_fit, settings_from_options
from .workflows.inspect import inspect_las, las_description
from .workflows.run import find_demo_project, run_project
from .workflows.console import print_json, progress_wanted
from .workflows.setup import scan_lines, scan_record, start_project

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_BAD_INPUT = 2
EXIT_WELLS_FAILED = 3

DEMO_OUT = "satheight_demo_run"


def default_out(stem: str, command: str) -> str:
    """Every command's default output folder: ``./<input file name>_<command>``."""
    return f"{stem}_{command}"
JSON_HELP = "print the results as one JSON document on stdout (with schema_version)"


def build_parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="satheight",
        description=("Saturation-height modelling: from porosity and permeability logs, free-water "
                     "levels and fluid properties per zone, predict water saturation at every depth "
                     "with a Leverett J-function model, compare it with log (resistivity) "
                     "saturation, and write LAS, CSV, JSON and track plots. Results are estimates "
                     "for review by a qualified professional."),
    )
    p.add_argument("--version", action="version", version=f"satheight {__version__}")
    p.add_argument("--verbose", action="store_true",
                   help="print full details (tracebacks) of errors")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    d = sub.add_parser("demo", help="run the whole job on the bundled, invented demo field",
                       description="Run the bundled invented demo field end to end and print where "
                                   "the outputs went.")
    d.add_argument("--out", metavar="DIR", default=DEMO_OUT,
                   help=f"output folder (default: ./{DEMO_OUT}); created if missing")
    _common_run_options(d)

    r = sub.add_parser("run", help="run a project file (TOML)",
                       description="Run every well of a project file: depths in the file's unit "
                                   "system (metric: m, kPa, kg/m3, mN/m; field: ft, psi, g/cm3, "
                                   "dyn/cm) unless a value carries its own unit.")
    r.add_argument("project", metavar="PROJECT_FILE", help="path of the project file (.toml)")
    r.add_argument("--out", metavar="DIR", default=None,
                   help="output folder (default: ./<project file name>_run); created if missing")
    _common_run_options(r)

    i = sub.add_parser("inspect", help="list a LAS file's curves and the roles the tool would use",
                       description="List curves with units, depth range (file's depth unit), null "
                                   "counts and which curve would be used for porosity, "
                                   "permeability, resistivity and log Sw.")
    i.add_argument("las", metavar="FILE.las", help="LAS file to inspect")
    i.add_argument("--json", action="store_true", help="print the listing as JSON")
    _add_fit_parser(sub)
    _add_contact_commands(sub)
    st = sub.add_parser("start", help="write a commented project file from a folder of LAS files",
                        description="Find the wells, curve roles, depth units and datums in a "
                                    "folder of LAS files (and survey, tops, core and pressure "
                                    "files named so) and write a commented project file with "
                                    "FILL IN placeholders for the FWL and fluids. An existing "
                                    "project file is never replaced: the new one goes beside it.")
    st.add_argument("folder", metavar="FOLDER", help="folder holding the LAS files")
    st.add_argument("--out", metavar="FILE", default=None,
                    help="project file to write (default: FOLDER/satheight_project.toml)")
    st.add_argument("--json", action="store_true", help=JSON_HELP)
    return p


def _add_fit_parser(sub):
    f = sub.add_parser(
        "fit", help="fit J-Sw functions per rock type to core capillary-pressure tables",
        description="Read core capillary-pressure tables (pressure steps, plug table, or "
                    "single-plug tables), convert lab Pc to J from each plug's porosity and "
                    "permeability, group plugs into rock types, fit each function family, print "
                    "a fit table and write the model file, a points table and plots.")
    f.add_argument("files", nargs="+", metavar="CORE_FILE", help="core-data CSV files")
    f.add_argument("--out", metavar="DIR", default=None,
                   help="output folder (default: ./<first core file name>_fit); created if missing")
    f.add_argument("--model-file", default="models.json", metavar="NAME",
                   help="name of the model file in the output folder (default: models.json)")
    f.add_argument("--system", metavar="NAME", default=None,
                   help="lab fluid system of steps that name none (mercury_air, air_brine, "
                        "oil_brine, gas_brine, air_oil)")
    f.add_argument("--lab", action="append", default=[], metavar="SYSTEM=VALUE",
                   help='override a lab system: "mercury_air=480 mN/m,140 deg" or one '
                        'sigma*cos(theta) "oil_brine=26 mN/m"; repeatable')
    f.add_argument("--closure", default="auto", metavar="auto|none|PRESSURE",
                   help="mercury closure correction: picked per curve (auto, default), none, "
                        "or a pressure such as '5 psi' (bare number: psi)")
    f.add_argument("--phi-factor", type=float, default=1.0,
                   help="porosity stress-correction factor (stressed/ambient), default 1")
    f.add_argument("--k-factor", type=float, default=1.0,
                   help="permeability stress-correction factor (stressed/ambient), default 1")
    g = f.add_mutually_exclusive_group()
    g.add_argument("--group-by", metavar="COLUMN", default=None,
                   help="rock types from a plug-table column (default: rock_type when every "
                        "plug has one, else all plugs together)")
    g.add_argument("--k-classes", metavar="EDGES", default=None,
                   help="rock types by permeability classes, edges in mD, e.g. 1,10,100")
    g.add_argument("--fzi-classes", metavar="EDGES", default=None,
                   help="rock types by flow-zone-indicator classes, edges in um, e.g. 0.5,1,2")
    f.add_argument("--class-names", metavar="NAMES", default=None,
                   help="comma-separated names of the classes (one more than the edges)")
    f.add_argument("--family", action="append", default=None, metavar="NAME",
                   help="function family to fit (repeatable; default: all)")
    f.add_argument("--reservoir", action="append", default=[], metavar="[ROCK=]SCT[,DRHO]",
                   help='reservoir sigma*cos(theta) and water-hydrocarbon density difference, '
                        'e.g. "Upper Sand=26 mN/m,300 kg/m3"; without ROCK= for every rock type; '
                        "needed for reservoir Pc, the height axis and height functions")
    f.add_argument("--units", choices=("metric", "field"), default="metric",
                   help="units of core_points.csv and the notes: metric (kPa, m, default) or "
                        "field (psi, ft)")
    f.add_argument("--no-plots", action="store_true", help="skip the plots")
    _overwrite_option(f)
    _quiet_option(f)
    f.add_argument("--json", action="store_true", help=JSON_HELP)


def _fit(args, out) -> int:
    settings = settings_from_options(
        lab=args.lab, system=args.system, closure=args.closure, phi_factor=args.phi_factor,
        k_factor=args.k_factor, group_by=args.group_by, k_classes=args.k_classes,
        fzi_classes=args.fzi_classes, class_names=args.class_names, families=args.family,
        reservoir=args.reservoir, model_file=args.model_file, plots=not args.no_plots,
        units=args.units)
    out_dir = args.out or default_out(Path(args.files[0]).stem, "fit")
    run = run_fit(args.files, out_dir, settings, overwrite=args.overwrite,
                  progress=progress_wanted(sys.stderr, args.quiet))
    if args.json:  # the model file's content, the files written and the notes
        print_json("fit", {"model_file": run.model_path, "files": run.files, "notes": run.warnings,
                           "models": json.loads(Path(run.model_path).read_text(encoding="utf-8"))},
                   out)
        return EXIT_OK
    _say(out, fit_table(run.fits))
    for w in run.warnings:
        _say(out, f"note: {w}")
    _say(out, "wrote:")
    for f in run.files:
        _say(out, f"  {f}")
    _say(out, "Caution: fitted functions are estimates for review by a qualified professional.")
    return EXIT_OK


def _add_contact_commands(sub):
    """The ``fwl`` and ``pressures`` subcommands (contacts)."""
    f = sub.add_parser("fwl", help="find the FWL of each zone from log Sw, with an interval",
                       description="Search the free-water level of each zone that best matches "
                                   "the saturation-height Sw to log Sw, jointly over the wells "
                                   "and per well, with a block-bootstrap interval. Depths in the "
                                   "project's length unit. Prints a table, writes "
                                   "fwl_<zone>.json and a misfit plot.")
    f.add_argument("project", metavar="PROJECT_FILE", nargs="?", default=None,
                   help="path of the project file (.toml)")
    f.add_argument("--zone", action="append", metavar="ZONE",
                   help="zone to search (repeat for several; default: every zone)")
    f.add_argument("--wells", nargs="+", metavar="WELL",
                   help="wells to use (default: every well with log Sw)")
    f.add_argument("--out", metavar="DIR", default=None,
                   help="output folder (default: ./<project file name>_fwl)")
    f.add_argument("--window", nargs=2, type=float, metavar=("SHALLOW", "DEEP"),
                   help="candidate FWL range, TVDSS (default: zone top to base + half the zone)")
    f.add_argument("--step", type=float, default=None, help="candidate spacing (default 0.25 m)")
    f.add_argument("--misfit", choices=("huber", "absolute"), default="huber",
                   help="robust misfit of SHM Sw - log Sw (default huber)")
    f.add_argument("--delta", type=float, default=0.05,
                   help="Huber threshold in Sw units (default 0.05)")
    f.add_argument("--resamples", type=int, default=200,
                   help="bootstrap resamples, 10-5000 (default 200)")
    f.add_argument("--block", type=int, default=None,
                   help="bootstrap block length in samples (default: from residual correlation)")
    f.add_argument("--seed", type=int, default=20240611, help="bootstrap seed")
    f.add_argument("--tolerance", type=float, default=0.0,
                   help="flag a well when its interval misses the joint one by more than this")
    f.add_argument("--shale-curve", metavar="MNEMONIC",
                   help="shale indicator curve (e.g. GR); with --max-shale")
    f.add_argument("--max-shale", type=float, help="samples above this shale value are left out")
    f.add_argument("--exclude", action="append", default=[], metavar="[WELL:]TOP:BASE",
                   help="leave out a TVDSS interval (in one well or all); repeatable")
    f.add_argument("--fit", action="append", default=[], metavar="PARAM:LOW:HIGH",
                   help="also fit this J-Sw parameter within bounds with the FWL; repeatable")
    f.add_argument("--no-plots", action="store_true", help="skip the misfit plots")
    _overwrite_option(f)
    _quiet_option(f)
    f.add_argument("--json", action="store_true", help=JSON_HELP)

    pr = sub.add_parser("pressures", help="fluid gradients, FWL and free-oil level from pressures",
                        description="Fit a pressure-depth line per fluid (least squares with "
                                    "outlier rejection), report gradients, densities, the FWL "
                                    "and free-oil level with intervals; with --project compare "
                                    "with the project's FWL and the FWL from log Sw.")
    pr.add_argument("pressure_file", metavar="PRESSURE_FILE", help="pressure-points CSV")
    pr.add_argument("--project", metavar="PROJECT_FILE",
                    help="project file: datums for MD points, FWLs and wells to compare with")
    pr.add_argument("--zone", help="project zone of the points when the file has no zone column "
                                   "(default: the project's zone when it has only one)")
    pr.add_argument("--out", metavar="DIR", default=None,
                    help="output folder (default: ./<pressure file name>_pressures)")
    pr.add_argument("--units", choices=("metric", "field"), default=None,
                    help="units of the printout and files (default: the project's, else metric)")
    pr.add_argument("--use-poor", action="store_true", help="also fit points of quality poor")
    pr.add_argument("--no-logs", action="store_true", help="skip the FWL search from log Sw")
    pr.add_argument("--no-plots", action="store_true", help="skip the pressure-depth plots")
    _overwrite_option(pr)
    _quiet_option(pr)
    pr.add_argument("--json", action="store_true", help=JSON_HELP)


def _fwl(args, out) -> int:
    project = Path(args.project)
    rep = run_fwl(project, args.out or default_out(project.stem, "fwl"), zones=args.zone, wells=args.wells,
                  plot=not args.no_plots, overwrite=args.overwrite,
                  progress=progress_wanted(sys.stderr, args.quiet), window=args.window, step=args.step,
                  misfit=args.misfit, delta=args.delta, n_boot=args.resamples,
                  block_length=args.block, seed=args.seed, tolerance=args.tolerance,
                  shale_curve=args.shale_curve, max_shale=args.max_shale,
                  exclude=parse_exclude(args.exclude),
                  fit_parameters=parse_fit_bounds(args.fit) or None)
    if args.json:
        print_json("fwl", rep, out)
        return EXIT_OK
    u = rep["units"]
    _say(out, f"project: {rep['project']}")
    for name, d in rep["zones"].items():
        lo, hi = d["interval"]
        at_project = ("no project FWL" if d["project_fwl"] is None else
                      f"project FWL {_num(d['project_fwl'], u)} {u}")
        misfit = f"misfit best {d['misfit_at_best']:.5f}" + (
            "" if d["misfit_at_project_fwl"] is None
            else f", at project FWL {d['misfit_at_project_fwl']:.5f}")
        _say(out, f"zone {name}: best FWL {_num(d['best_fwl'], u)} {u}, "
              f"{int(round(d['confidence_level'] * 100))} % interval {_num(lo, u)} - "
              f"{_num(hi, u)} {u}; {at_project}; {misfit} ({d['samples']} samples)")
        _say(out, f"  {'well':<16} {'samples':>7} {'best FWL':>10} {'low':>10} {'high':>10}  flag")
        for w in d["wells"]:
            if w["best_fwl"] is None:
                _say(out, f"  {w['well']:<16} {w['samples']:>7} {'-':>10}")
                continue
            _say(out, f"  {w['well']:<16} {w['samples']:>7} {_num(w['best_fwl'], u):>10} "
                  f"{_num(w['interval'][0], u):>10} {_num(w['interval'][1], u):>10}  "
                  f"{'OUTSIDE' if w['flagged'] else ''}")
        p = d.get("parameters")
        if p:
            vals = ", ".join(f"{k} {v:.4g}" for k, v in p["values"].items())
            iv = p.get("interval")
            se = (f" [{_num(iv[0], u)}, {_num(iv[1], u)}], se {_num(p['standard_error'], u)} {u}"
                  if iv else "")
            _say(out, f"  joint fit: FWL {_num(p['fwl'], u)} {u}{se}, {vals}")
            if p.get("correlation"):
                names = p["names"]
                for i, row in enumerate(p["correlation"]):
                    _say(out, "    corr " + f"{names[i]:<8}" + " ".join(f"{v:+.2f}" for v in row))
        for m in d["warnings"]:
            _say(out, f"  note: {m}")
    for m in rep["notes"]:
        _say(out, f"note: {m}")
    for fpath in rep["files"]:
        _say(out, f"wrote {fpath}")
    return EXIT_OK


def _pressures(args, out) -> int:
    src = Path(args.pressure_file)
    quals = ("good", "fair", "poor") if args.use_poor else ("good", "fair")
    rep = run_pressures(src, args.out or default_out(src.stem, "pressures"), project_path=args.project,
                        zone=args.zone, units=args.units, qualities=quals,
                        with_logs=not args.no_logs, plot=not args.no_plots,
                        overwrite=args.overwrite, progress=progress_wanted(sys.stderr, args.quiet))
    if args.json:
        print_json("pressures", rep, out)
        return EXIT_OK
    u = rep["units"]
    dz = u["depth"]
    system = "field" if dz == "ft" else "metric"
    du = U.UNIT_SYSTEMS[system]["density"]
    gd = 4 if system == "field" else 2       # 0.0001 psi/ft, 0.01 kPa/m

    def rho(v):
        return _num(float(U.from_si(v * 1000.0, du, "density")), du)   # g/cm3 -> system unit

    _say(out, f"pressure file: {rep['file']}")
    for name, d in rep["zones"].items():
        _say(out, f"zone {name or '(all points)'}: {d['points']} points")
        for fluid, ln in d["lines"].items():
            se = "" if ln["gradient_se"] is None else f" +- {ln['gradient_se']:.{gd}f}"
            dse = "" if ln["density_se_g_cm3"] is None else f" +- {rho(ln['density_se_g_cm3'])}"
            _say(out, f"  {fluid:<6} gradient {ln['gradient']:.{gd}f}{se} {u['gradient']}, density "
                  f"{rho(ln['density_g_cm3'])}{dse} {du}, {ln['points_used']} used, "
                  f"{ln['points_rejected']} rejected")
        for key, label in (("fwl", "FWL"), ("free_oil_level", "free-oil level")):
            lv = d.get(key)
            if lv:
                iv = lv["interval"]
                rng = "" if iv[0] is None else f" ({_num(iv[0], dz)} - {_num(iv[1], dz)})"
                _say(out, f"  {label} {_num(lv['depth'], dz)} {dz}{rng}")
        if "versus_project_fwl" in d:
            c = d["versus_project_fwl"]
            _say(out, f"  project FWL {_num(d['project_fwl'], dz)} {dz}: "
                  f"{'within' if c['consistent'] else 'outside'} the pressure interval")
        if "versus_log_fwl" in d:
            c = d["versus_log_fwl"]
            lg = d["log_fwl"]
            _say(out, f"  FWL from log Sw {_num(lg['best'], dz)} ({_num(lg['interval'][0], dz)} - "
                  f"{_num(lg['interval'][1], dz)}) {dz}: "
                  f"{'consistent' if c['consistent'] else 'INCONSISTENT'}")
        for m in d["implausible"]:
            _say(out, f"  IMPLAUSIBLE: {m}")
        for m in d["notes"]:
            _say(out, f"  note: {m}")
    for m in rep["notes"]:
        _say(out, f"note: {m}")
    for fpath in rep["files"]:
        _say(out, f"wrote {fpath}")
    return EXIT_OK


def _common_run_options(sp):
    sp.add_argument("--pdf", action="store_true", help="also write each track plot as PDF")
    sp.add_argument("--no-plots", action="store_true", help="skip the plots (faster)")
    sp.add_argument("--csv", action="store_true",
                    help="also write each well's samples as WELL.csv and all wells as "
                         "all_wells.csv (the Parquet tables are always written)")
    sp.add_argument("--depth-axis", choices=("md", "tvdss"), default="tvdss",
                    help="main depth scale of the track plots: TVDSS (true vertical depth below "
                         "datum, default) or measured depth; the other is the second scale")
    sp.add_argument("--whole-log", action="store_true",
                    help="track plots show the whole log (default: the zones with 20 m above "
                         "and below)")
    sp.add_argument("--workers", metavar="N|auto", type=_workers, default=1,
                    help="run N wells at a time in separate processes (default 1; auto: one per "
                         "available core)")
    sp.add_argument("--existing", choices=("replace", "suffix"), default="replace",
                    help="input LAS curves named like a computed curve (TVDSS, SW_SHM... of an "
                         "earlier run's output): replace them with a note (default), or keep "
                         "them and give the new curves a suffix (TVDSS_2)")
    sp.add_argument("--scheduler", metavar="ADDRESS", default=None,
                    help="run the wells on the Dask cluster at ADDRESS (e.g. tcp://host:8786; "
                         "needs pip install satheight[dask]; the output folder must be shared "
                         "with its workers)")
    _overwrite_option(sp)
    sp.add_argument("--verbose", action="store_true", default=argparse.SUPPRESS,
                    help="print full details (tracebacks) of errors")
    sp.add_argument("--quiet", action="store_true",
                    help="no progress on stderr (it is shown only on a terminal anyway)")
    sp.add_argument("--json", action="store_true", help=JSON_HELP)


def _quiet_option(sp) -> None:
    sp.add_argument("--quiet", action="store_true",
                    help="no progress on stderr (shown only on a terminal, and only when the "
                         "command takes more than a second)")


def _overwrite_option(sp) -> None:
    sp.add_argument("--overwrite", action="store_true",
                    help="replace the files an earlier run of this command wrote into the output "
                         "folder (listed in its satheight-manifest-*.sha256); files satheight "
                         "did not write are never replaced")


def available_cores() -> int:
    """Cores this process may run on (its CPU affinity where the system tells it)."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return max(1, os.cpu_count() or 1)


def _workers(text: str) -> int:
    """``--workers``: a whole number >= 1, or ``auto`` (the cores available)."""
    if text.strip().lower() == "auto":
        return available_cores()
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number or auto, got {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"must be 1 or more (or auto), got {value}")
    return value


def _parse(parser: argparse.ArgumentParser, argv) -> argparse.Namespace:
    """Parse ``argv``; ``fwl --wells A B PROJECT_FILE`` keeps its project file.

    ``--wells`` takes several names, so argparse would take a project file written after
    them as one more well: when no PROJECT_FILE is left, the last ``--wells`` value is
    the project file if it names an existing file.
    """
    args = parser.parse_args(argv)
    if args.command == "fwl" and args.project is None:
        if args.wells and Path(args.wells[-1]).is_file():
            args.project = args.wells.pop()
        if args.project is None:
            parser.error("fwl: the following arguments are required: PROJECT_FILE")
        if args.wells == []:
            parser.error("fwl: argument --wells: expected at least one well name")
    return args


def _print_run(report, out) -> int:
    _say(out, f"project: {report.project.path}")
    _say(out, f"output folder: {report.out_dir.resolve()}")
    for w in report.wells:
        if w.ok:
            _say(out, f"  {w.name}: ok")
            full = w.summary or (w.result.summary if w.result else None) or {}
            s = full.get("whole_well", {})
            if s.get("samples_compared"):
                hcpt = "; ".join(f"HCPT {ph} SHM {s[f'hcpt_{ph}_shm']:.2f}, log {s[f'hcpt_{ph}_log']:.2f}"
                                 for ph in ("oil", "gas") if s.get(f"hcpt_{ph}_log") is not None)
                _say(out, f"    SHM - log Sw: mean {s['mean_difference']:+.3f}, RMS {s['rms_difference']:.3f} "
                      f"over {s['samples_compared']} samples; {hcpt} {full['units']['thickness']}")
            for f in w.files:
                _say(out, f"    {f}")
            for m in w.warnings:
                _say(sys.stderr, f"    note ({w.name}): {m}")  # warnings on stderr
        else:
            _say(sys.stderr, f"  {w.name}: FAILED: {w.error}")  # failures on stderr
    if report.section_file is not None:
        _say(out, f"field section: {report.section_file}")
    for note in report.notes:
        _say(sys.stderr, f"note: {note}")  # warnings on stderr
    _say(out, f"run summary: {report.summary_file}")
    _say(out, f"report: {report.out_dir / 'report.html'}")
    _say(out, "Caution: results are estimates for review by a qualified professional; local "
          "regulations and reserves-reporting rules govern their use.")
    return EXIT_WELLS_FAILED if report.failed else EXIT_OK


def _inspect(path: str, as_json: bool, out) -> int:
    if as_json:
        print_json("inspect", las_description(path), out)
        return EXIT_OK
    _say(out, inspect_las(path))
    return EXIT_OK


def _one_line(exc: BaseException) -> str:
    """The error text on one line (text quoted from input files may hold line breaks)."""
    return " ".join(ln.strip() for ln in str(exc).splitlines() if ln.strip())


#: Control characters (C0 but tab and newline, DEL, C1) and bidirectional-text controls:
#: shown escaped, so text read from input files cannot move the cursor, recolour or
#: rewrite the terminal (an ANSI escape sequence loses its ESC and is printed as text).
_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")


def terminal_text(text: str) -> str:
    """``text`` with every control character shown as an escape (``\\x1b``, ``\\u202e``)."""
    return _CONTROL.sub(lambda m: (f"\\x{ord(m.group()):02x}" if ord(m.group()) < 0x100
                                   else f"\\u{ord(m.group()):04x}"), text)


def _num(value: float, unit: str) -> str:
    """A value already in ``unit``, to the decimals the unit means (``units.SHOWN_DECIMALS``);
    a plain number without thousands separator."""
    return f"{value:.{U.SHOWN_DECIMALS.get(unit.lower(), 2)}f}"


def _say(out, text="") -> None:
    """Print one or more lines of our own text, sanitised (see :func:`terminal_text`)."""
    for line in str(text).split("\n"):
        print(terminal_text(line), file=out)


def _error(text: str) -> None:
    print(terminal_text(f"satheight: {text}"), file=sys.stderr)


def _dispatch(args) -> int:
    """Run the command of ``args`` (parsed) and print what it did."""
    if args.command == "inspect":
        return _inspect(args.las, args.json, sys.stdout)
    if args.command == "fit":
        return _fit(args, sys.stdout)
    if args.command == "fwl":
        return _fwl(args, sys.stdout)
    if args.command == "pressures":
        return _pressures(args, sys.stdout)
    if args.command == "start":
        record = scan_record(*start_project(args.folder, args.out))
        if args.json:
            print_json("start", record)
        else:
            _say(sys.stdout, "\n".join(scan_lines(record)))
        return EXIT_OK
    if args.command == "demo":
        project = find_demo_project()
        out = args.out
    else:
        project = Path(args.project)
        out = args.out or default_out(project.stem, "run")
    report = run_project(project, out, pdf=args.pdf, plot=not args.no_plots,
                         depth_axis=args.depth_axis, workers=args.workers,
                         keep_results=False, overwrite=args.overwrite,
                         progress=progress_wanted(sys.stderr, args.quiet),
                         plot_interval="all" if args.whole_log else "zones",
                         existing=args.existing, scheduler=args.scheduler, csv=args.csv)
    if args.json:
        print_json(args.command, json.loads(report.summary_file.read_text(encoding="utf-8")))
        return EXIT_WELLS_FAILED if report.failed else EXIT_OK
    return _print_run(report, sys.stdout)


def main(argv=None) -> int:
    """The command line; returns the exit status (see the module docstring)."""
    parser = build_parser()
    args = _parse(parser, argv)
    if args.command is None:
        parser.print_help()
        return EXIT_BAD_INPUT
    try:
        return _dispatch(args)
    except SatHeightError as exc:
        if args.verbose:
            traceback.print_exc()
        _error(f"error: {_one_line(exc)}")
        return exc.exit_code
    except KeyboardInterrupt:
        _error("interrupted")
        return 130
    except BrokenPipeError:  # output piped into e.g. `head`: not an error of ours
        try:
            sys.stdout = open(os.devnull, "w")
        except OSError:
            pass
        return EXIT_OK
    except OSError as exc:   # the file system refused (permissions, full disk, a path loop)
        if args.verbose:
            traceback.print_exc()
        where = f"{exc.filename}: " if exc.filename else ""
        _error(f"error: {where}{exc.strerror or _one_line(exc)} (check the path, its "
               "permissions and free disk space)")
        return EXIT_BAD_INPUT
    except Exception as exc:  # noqa: BLE001 - last line of defence for the command line
        if args.verbose:
            traceback.print_exc()
        _error(f"internal error: {type(exc).__name__}: {_one_line(exc)} "
               "(rerun with --verbose and report it)")
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
