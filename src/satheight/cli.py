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
    return p


def _common_run_options(sp):
    sp.add_argument("--pdf", action="store_true", help="also write each track plot as PDF")
    sp.add_argument("--no-plots", action="store_true", help="skip the plots (faster)")
    sp.add_argument("--overwrite", action="store_true",
                    help="replace the results of an earlier run in the output folder (without "
                         "it, a folder holding a run_summary.json is refused)")
    sp.add_argument("--verbose", action="store_true", default=argparse.SUPPRESS,
                    help="print full details (tracebacks) of errors")


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
    print(f"run summary: {report.summary_file}", file=out)
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
