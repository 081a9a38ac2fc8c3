"""A run on a Dask cluster writes the same files, byte for byte, as the run in one process.

The cluster is Dask's own LocalCluster started in this process (threads, no worker
processes), so the test needs no network and no other machine. The reference is the
ordinary run of the same project in this process: every file of the output folder
(per-well LAS, CSV, Parquet and summary JSON, the field tables, run_summary.json,
the report and the manifest) must be present in both and identical, but for the run's date
and time in the report (minutes apart when the two runs straddle a minute) and the report's
checksum in the manifest.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from satheight.errors import SatHeightError
from satheight.workflows.run import run_project

from run_outputs import run_files

SKIP = "Dask is not installed (optional extra: pip install satheight[dask])"
dask = pytest.importorskip("dask", reason=SKIP)
distributed = pytest.importorskip("distributed", reason=SKIP)

pytestmark = pytest.mark.slow   # run by .ci/run's second step (README: tests)
ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_wells" / "demo_project.toml"




def test_dask_cluster_run_writes_the_files_of_a_local_run(tmp_path):
    local, on_dask = tmp_path / "local", tmp_path / "dask"
    run_project(DEMO, local, plot=False)
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=False,
                                  dashboard_address=None) as cluster:
        report = run_project(DEMO, on_dask, plot=False, scheduler=cluster.scheduler_address)
    assert not report.failed, [w.error for w in report.failed]
    a, b = run_files(local), run_files(on_dask)
    # the same file names (outputs partitioned by well, the summary and tables merged at the end)
    assert sorted(a) == sorted(b)
    assert any(n.endswith(".las") for n in a) and "run_summary.json" in a
    # every file byte-identical to the local run's (the local run is the reference)
    different = [n for n in a if a[n] != b[n]]
    assert different == []
    # no work folder is left behind in the output folder
    assert not [p for p in on_dask.iterdir() if p.is_dir()]


def test_unreachable_scheduler_is_one_clear_error(tmp_path):
    # port 9 (discard) on the loopback: nothing listens there on a test machine
    with dask.config.set({"distributed.comm.timeouts.connect": "2s"}), \
            pytest.raises(SatHeightError, match="Dask scheduler"):
        run_project(DEMO, tmp_path / "out", plot=False, scheduler="tcp://127.0.0.1:9")
    assert not (tmp_path / "out").exists() or not any((tmp_path / "out").iterdir())
