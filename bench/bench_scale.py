"""Cases of bench/run.py on plots and on a Dask cluster (each run in its own process).

``case_plots``: the demo run with and without plots, and the bench well's track plot;
``case_dask``: a project's wells on a local Dask cluster, outputs compared with a local run.
"""

from __future__ import annotations

import re
import time
from pathlib import Path

from bench_measure import _measure


def case_plots(args) -> dict:
    """The demo run without and with plots, and the track plot (drawn and written as PNG) of
    the bench well; each after one warm-up run, so library imports are not counted."""
    from satheight.workflows.run import find_demo_project
    from satheight.plots import track_plot
    from satheight.workflows import well as W
    from satheight.workflows.figures import save_figure
    from satheight.workflows.run import run_project
    from satheight.project import load_project

    demo, out = find_demo_project(), Path(args.out)
    res = {}
    for key, plot in (("demo_no_plots", False), ("demo_plots", True)):
        run_project(demo, out / key, plot=plot, overwrite=True)
        res[key] = _measure(lambda: run_project(demo, out / key, plot=plot, overwrite=True),
                            args.repeat)
    project = load_project(args.project)
    result, _ = W.compute_well(project, project.wells[0])

    def track():
        fig = track_plot(result, units=project.unit_system)
        return save_figure(fig, out / "track.png")

    track()
    res["track"] = _measure(track, args.repeat)
    return res


def _comparable(path: Path) -> bytes:
    """A result file's bytes, but for the run's date and time in the report (minute
    resolution) and the report's checksum in the manifest: provenance, not results."""
    data = path.read_bytes()
    if path.name == "report.html":
        return re.sub(rb"\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC", b"<run time>", data)
    if path.name.startswith("satheight-manifest-"):
        return b"".join(ln for ln in data.splitlines(keepends=True)
                        if not ln.rstrip().endswith(b"report.html"))
    return data


def case_dask(args) -> dict:
    """The project's wells on a local Dask cluster (2 worker processes, one thread each),
    cluster start-up not counted; its outputs compared byte by byte with ``args.file``'s
    folder (the run with 2 worker processes)."""
    from distributed import LocalCluster

    from satheight.workflows.run import run_project

    out = Path(args.out)
    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                      dashboard_address=None) as cluster:
        t = time.perf_counter()
        report = run_project(args.project, out, plot=False, scheduler=cluster.scheduler_address)
        seconds = time.perf_counter() - t
    assert not report.failed, [w.error for w in report.failed]
    ref = Path(args.file)
    names = sorted(p.name for p in out.iterdir() if p.is_file())
    same = names == sorted(p.name for p in ref.iterdir() if p.is_file()) and all(
        _comparable(out / n) == _comparable(ref / n) for n in names)
    return {"seconds": seconds, "identical": same, "files": len(names)}
