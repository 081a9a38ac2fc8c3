"""Command line: argument parsing and printing only; the work is done by the public API.

Exit codes: 0 everything ran; 2 bad input (file, project value, unit, missing
curve); 3 the project ran but one or more wells failed; 1 an unexpected
internal error (please report it with ``--verbose`` output).
"""

from __future__ import annotations

import argparse
import os
import sys
import traceback
from pathlib import Path

from . import __version__

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_BAD_INPUT = 2
EXIT_WELLS_FAILED = 3

DEMO_OUT = "satheight-demo-out"


def find_demo_project() -> Path:
    """The bundled demo project file: installed package data first, then the source tree."""
    here = Path(__file__).resolve().parent
    candidates = [here / "demo_data" / "demo_project.toml",
                  here.parents[1] / "demo_wells" / "demo_project.toml",
                  Path.cwd() / "demo_wells" / "demo_project.toml"]
    for c in candidates:
        if c.is_file():
            return c
    from .errors import InputFileError

    raise InputFileError("the bundled demo field was not found",
                         where=", ".join(str(c) for c in candidates),
                         hint="run from the project's source folder or reinstall the package")


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
                   help="output folder (default: ./<project file name>_results); created if missing")
    _common_run_options(r)

    i = sub.add_parser("inspect", help="list a LAS file's curves and the roles the tool would use",
                       description="List curves with units, depth range (file's depth unit), null "
                                   "counts and which curve would be used for porosity, "
                                   "permeability, resistivity and log Sw.")
    i.add_argument("las", metavar="FILE.las", help="LAS file to inspect")
    i.add_argument("--json", action="store_true", help="print the listing as JSON")
    _add_fit_parser(sub)
    _add_contact_commands(sub)
    return p


def _add_fit_parser(sub):
    f = sub.add_parser(
        "fit", help="fit J-Sw functions per rock type to core capillary-pressure tables",
        description="Read core capillary-pressure tables (pressure steps, plug table, or "
                    "single-plug tables), convert lab Pc to J from each plug's porosity and "
                    "permeability, group plugs into rock types, fit each function family, print "
                    "a fit table and write the model file, a points table and plots.")
    f.add_argument("files", nargs="+", metavar="CORE_FILE", help="core-data CSV files")
    f.add_argument("--out", metavar="DIR", default="core_fit_results",
                   help="output folder (default: ./core_fit_results); created if missing")
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
    f.add_argument("--no-plots", action="store_true", help="skip the plots")


def _fit(args, out) -> int:
    from .core import LAB_SYSTEMS
    from .core_workflow import (FitSettings, fit_table, parse_classes, parse_closure,
                                parse_lab_override, parse_reservoir, run_fit)
    from .rocktypes import RockTypeRule

    systems = dict(LAB_SYSTEMS)
    for text in args.lab:
        name, system = parse_lab_override(text, systems)
        systems[name] = system
    rule = None
    if args.group_by:
        rule = RockTypeRule("column", args.group_by)
    elif args.k_classes:
        rule = parse_classes(args.k_classes, "permeability", args.class_names)
    elif args.fzi_classes:
        rule = parse_classes(args.fzi_classes, "fzi", args.class_names)
    settings = FitSettings(default_system=args.system, systems=systems,
                           closure=parse_closure(args.closure), phi_factor=args.phi_factor,
                           k_factor=args.k_factor, rule=rule,
                           reservoir=dict(parse_reservoir(t) for t in args.reservoir),
                           model_file=args.model_file, plots=not args.no_plots)
    if args.family:
        settings.families = tuple(args.family)
    run = run_fit(args.files, args.out, settings)
    print(fit_table(run.fits), file=out)
    for w in run.warnings:
        print(f"note: {w}", file=out)
    print("wrote:", file=out)
    for f in run.files:
        print(f"  {f}", file=out)
    print("Caution: fitted functions are estimates for review by a qualified professional.",
          file=out)
    return EXIT_OK


def _add_contact_commands(sub):
    """The ``fwl`` and ``pressures`` subcommands (contacts)."""
    f = sub.add_parser("fwl", help="find the FWL of each zone from log Sw, with an interval",
                       description="Search the free-water level of each zone that best matches "
                                   "the saturation-height Sw to log Sw, jointly over the wells "
                                   "and per well, with a block-bootstrap interval. Depths in the "
                                   "project's length unit. Prints a table, writes "
                                   "fwl_<zone>.json and a misfit plot.")
    f.add_argument("project", metavar="PROJECT_FILE", help="path of the project file (.toml)")
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

    pr = sub.add_parser("pressures", help="fluid gradients, FWL and free-oil level from pressures",
                        description="Fit a pressure-depth line per fluid (least squares with "
                                    "outlier rejection), report gradients, densities, the FWL "
                                    "and free-oil level with intervals; with --project compare "
                                    "with the project's FWL and the FWL from log Sw.")
    pr.add_argument("pressure_file", metavar="PRESSURE_FILE", help="pressure-points CSV")
    pr.add_argument("--project", metavar="PROJECT_FILE",
                    help="project file: datums for MD points, FWLs and wells to compare with")
    pr.add_argument("--zone", help="project zone of the points when the file has no zone column")
    pr.add_argument("--out", metavar="DIR", default=None,
                    help="output folder (default: ./<pressure file name>_pressures)")
    pr.add_argument("--units", choices=("metric", "field"), default=None,
                    help="units of the printout and files (default: the project's, else metric)")
    pr.add_argument("--use-poor", action="store_true", help="also fit points of quality poor")
    pr.add_argument("--no-logs", action="store_true", help="skip the FWL search from log Sw")
    pr.add_argument("--no-plots", action="store_true", help="skip the pressure-depth plots")


def _parse_exclude(items):
    from .errors import SatHeightError

    out = []
    for it in items:
        parts = it.split(":")
        try:
            if len(parts) == 2:
                out.append((None, float(parts[0]), float(parts[1])))
            elif len(parts) == 3:
                out.append((parts[0], float(parts[1]), float(parts[2])))
            else:
                raise ValueError
        except ValueError:
            raise SatHeightError(f"--exclude {it!r} is not [WELL:]TOP:BASE",
                                 hint="e.g. --exclude VANTREL-2:2060:2062") from None
    return out


def _parse_fit(items):
    from .errors import SatHeightError

    out = {}
    for it in items:
        parts = it.split(":")
        try:
            name, lo, hi = parts[0], float(parts[1]), float(parts[2])
        except (ValueError, IndexError):
            raise SatHeightError(f"--fit {it!r} is not PARAM:LOW:HIGH",
                                 hint="e.g. --fit swirr:0:0.3") from None
        out[name] = (lo, hi)
    return out


def _fwl(args, out) -> int:
    from .contacts_run import run_fwl

    project = Path(args.project)
    rep = run_fwl(project, args.out or f"{project.stem}_fwl", zones=args.zone, wells=args.wells,
                  plot=not args.no_plots, window=args.window, step=args.step,
                  misfit=args.misfit, delta=args.delta, n_boot=args.resamples,
                  block_length=args.block, seed=args.seed, tolerance=args.tolerance,
                  shale_curve=args.shale_curve, max_shale=args.max_shale,
                  exclude=_parse_exclude(args.exclude), fit_parameters=_parse_fit(args.fit) or None)
    u = rep["units"]
    print(f"project: {rep['project']}", file=out)
    for name, d in rep["zones"].items():
        lo, hi = d["interval"]
        print(f"zone {name}: best FWL {d['best_fwl']:.2f} {u}, "
              f"{int(round(d['confidence_level'] * 100))} % interval {lo:.2f} - {hi:.2f} {u}; "
              f"project FWL {d['project_fwl']:.2f} {u}; misfit best {d['misfit_at_best']:.5f}, "
              f"at project FWL {d['misfit_at_project_fwl']:.5f} ({d['samples']} samples)", file=out)
        print(f"  {'well':<16} {'samples':>7} {'best FWL':>10} {'low':>10} {'high':>10}  flag",
              file=out)
        for w in d["wells"]:
            if w["best_fwl"] is None:
                print(f"  {w['well']:<16} {w['samples']:>7} {'-':>10}", file=out)
                continue
            print(f"  {w['well']:<16} {w['samples']:>7} {w['best_fwl']:>10.2f} "
                  f"{w['interval'][0]:>10.2f} {w['interval'][1]:>10.2f}  "
                  f"{'OUTSIDE' if w['flagged'] else ''}", file=out)
        p = d.get("parameters")
        if p:
            vals = ", ".join(f"{k} {v:.4g}" for k, v in p["values"].items())
            print(f"  joint fit: FWL {p['fwl']:.2f} {u}, {vals}", file=out)
            if p.get("correlation"):
                names = p["names"]
                for i, row in enumerate(p["correlation"]):
                    print("    corr " + f"{names[i]:<8}" + " ".join(f"{v:+.2f}" for v in row),
                          file=out)
        for m in d["warnings"]:
            print(f"  note: {m}", file=out)
    for m in rep["notes"]:
        print(f"note: {m}", file=out)
    for fpath in rep["files"]:
        print(f"wrote {fpath}", file=out)
    return EXIT_OK


def _pressures(args, out) -> int:
    from .contacts_run import run_pressures

    src = Path(args.pressure_file)
    quals = ("good", "fair", "poor") if args.use_poor else ("good", "fair")
    rep = run_pressures(src, args.out or f"{src.stem}_pressures", project_path=args.project,
                        zone=args.zone, units=args.units, qualities=quals,
                        with_logs=not args.no_logs, plot=not args.no_plots)
    u = rep["units"]
    print(f"pressure file: {rep['file']}", file=out)
    for name, d in rep["zones"].items():
        print(f"zone {name or '(all points)'}: {d['points']} points", file=out)
        for fluid, ln in d["lines"].items():
            se = "" if ln["gradient_se"] is None else f" +- {ln['gradient_se']:.4f}"
            dse = "" if ln["density_se_g_cm3"] is None else f" +- {ln['density_se_g_cm3']:.4f}"
            print(f"  {fluid:<6} gradient {ln['gradient']:.4f}{se} {u['gradient']}, density "
                  f"{ln['density_g_cm3']:.4f}{dse} g/cm3, {ln['points_used']} used, "
                  f"{ln['points_rejected']} rejected", file=out)
        for key, label in (("fwl", "FWL"), ("free_oil_level", "free-oil level")):
            lv = d.get(key)
            if lv:
                iv = lv["interval"]
                rng = "" if iv[0] is None else f" ({iv[0]:.2f} - {iv[1]:.2f})"
                print(f"  {label} {lv['depth']:.2f} {u['depth']}{rng}", file=out)
        if "versus_project_fwl" in d:
            c = d["versus_project_fwl"]
            print(f"  project FWL {d['project_fwl']:.2f} {u['depth']}: "
                  f"{'within' if c['consistent'] else 'outside'} the pressure interval", file=out)
        if "versus_log_fwl" in d:
            c = d["versus_log_fwl"]
            lg = d["log_fwl"]
            print(f"  FWL from log Sw {lg['best']:.2f} ({lg['interval'][0]:.2f} - "
                  f"{lg['interval'][1]:.2f}) {u['depth']}: "
                  f"{'consistent' if c['consistent'] else 'INCONSISTENT'}", file=out)
        for m in d["notes"]:
            print(f"  note: {m}", file=out)
    for m in rep["notes"]:
        print(f"note: {m}", file=out)
    for fpath in rep["files"]:
        print(f"wrote {fpath}", file=out)
    return EXIT_OK


def _common_run_options(sp):
    sp.add_argument("--pdf", action="store_true", help="also write each track plot as PDF")
    sp.add_argument("--no-plots", action="store_true", help="skip the plots (faster)")
    sp.add_argument("--depth-axis", choices=("md", "tvdss"), default="tvdss",
                    help="main depth scale of the track plots: TVDSS (true vertical depth below "
                         "datum, default) or measured depth; the other is the second scale")
    sp.add_argument("--whole-log", action="store_true",
                    help="track plots show the whole log (default: the zones with 20 m above "
                         "and below)")
    sp.add_argument("--workers", metavar="N", type=_positive_int, default=1,
                    help="run N wells at a time in separate processes (default 1)")
    sp.add_argument("--overwrite", action="store_true",
                    help="replace the results of an earlier run in the output folder (without "
                         "it, a folder holding a run_summary.json is refused)")
    sp.add_argument("--verbose", action="store_true", default=argparse.SUPPRESS,
                    help="print full details (tracebacks) of errors")


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"must be 1 or more, got {value}")
    return value


def _print_run(report, out) -> int:
    print(f"project: {report.project.path}", file=out)
    print(f"output folder: {report.out_dir.resolve()}", file=out)
    for w in report.wells:
        if w.ok:
            print(f"  {w.name}: ok", file=out)
            full = w.summary or (w.result.summary if w.result else None) or {}
            s = full.get("whole_well", {})
            if s.get("samples_compared"):
                print(f"    SHM - log Sw: mean {s['mean_difference']:+.3f}, RMS {s['rms_difference']:.3f} "
                      f"over {s['samples_compared']} samples; HCPT SHM {s['hcpt_shm']:.2f}, "
                      f"log {s['hcpt_log']:.2f} {full['units']['thickness']}", file=out)
            for f in w.files:
                print(f"    {f}", file=out)
            for m in w.warnings:
                print(f"    note: {m}", file=out)
        else:
            print(f"  {w.name}: FAILED: {w.error}", file=out)
    if getattr(report, "section_file", None) is not None:
        print(f"field section: {report.section_file}", file=out)
    for note in getattr(report, "notes", []):
        print(f"note: {note}", file=out)
    print(f"run summary: {report.summary_file}", file=out)
    print(f"report: {report.out_dir / 'report.html'}", file=out)
    print("Caution: results are estimates for review by a qualified professional; local "
          "regulations and reserves-reporting rules govern their use.", file=out)
    return EXIT_WELLS_FAILED if report.failed else EXIT_OK


def _inspect(path: str, as_json: bool, out) -> int:
    from .io.las import describe_las

    info = describe_las(path)
    if as_json:
        import json

        print(json.dumps(info, indent=2, default=str), file=out)
        return EXIT_OK
    _print_description(info, out)
    return EXIT_OK


def _print_description(info: dict, out) -> None:
    print(f"file: {info.get('path')}", file=out)
    print(f"well: {info.get('well')}", file=out)
    dr = info.get("depth", {})
    print(f"depth: {dr.get('start')} to {dr.get('stop')} {dr.get('unit')}, step {dr.get('step')}, "
          f"{info.get('n_samples')} samples", file=out)
    print(f"{'curve':<12} {'unit':<10} {'nulls':>7} {'min':>12} {'max':>12}  description", file=out)
    for c in info.get("curves", []):
        lo = "" if c.get("min") is None else f"{c['min']:.6g}"
        hi = "" if c.get("max") is None else f"{c['max']:.6g}"
        print(f"{c['mnemonic']:<12} {c.get('unit') or '':<10} {c.get('n_null', 0):>7} {lo:>12} {hi:>12}  "
              f"{c.get('description') or ''}", file=out)
    print("roles:", file=out)
    for role, r in info.get("roles", {}).items():
        if isinstance(r, dict):
            chosen = r.get("mnemonic")
            if chosen:
                print(f"  {role:<13} {chosen}", file=out)
            else:
                print(f"  {role:<13} none (tried {', '.join(r.get('aliases_tried', []))})", file=out)
        else:
            print(f"  {role:<13} {r}", file=out)
    for w in info.get("warnings", []):
        print(f"note: {w}", file=out)


def _one_line(exc: BaseException) -> str:
    """The error text on one line (text quoted from input files may hold line breaks)."""
    return " ".join(ln.strip() for ln in str(exc).splitlines() if ln.strip())


def main(argv=None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return EXIT_BAD_INPUT
    from .errors import SatHeightError

    try:
        if args.command == "inspect":
            return _inspect(args.las, args.json, sys.stdout)
        if args.command == "fit":
            return _fit(args, sys.stdout)
        if args.command == "fwl":
            return _fwl(args, sys.stdout)
        if args.command == "pressures":
            return _pressures(args, sys.stdout)
        from .pipeline import run_project

        if args.command == "demo":
            project = find_demo_project()
            out = args.out
        else:
            project = Path(args.project)
            out = args.out or f"{project.stem}_results"
        from .pipeline import check_output_folder

        check_output_folder(out, args.overwrite)
        report = run_project(project, out, pdf=args.pdf, plot=not args.no_plots,
                             depth_axis=args.depth_axis, workers=args.workers,
                             plot_interval="all" if args.whole_log else "zones",
                             keep_results=False)
        return _print_run(report, sys.stdout)
    except SatHeightError as exc:
        if args.verbose:
            traceback.print_exc()
        print(f"satheight: error: {_one_line(exc)}", file=sys.stderr)
        return getattr(exc, "exit_code", EXIT_BAD_INPUT)
    except KeyboardInterrupt:
        print("satheight: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:  # output piped into e.g. `head`: not an error of ours
        try:
            sys.stdout = open(os.devnull, "w")
        except OSError:
            pass
        return EXIT_OK
    except Exception as exc:  # noqa: BLE001 - last line of defence for the command line
        if args.verbose:
            traceback.print_exc()
        print(f"satheight: internal error: {type(exc).__name__}: {_one_line(exc)} "
              "(rerun with --verbose and report it)", file=sys.stderr)
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
