"""run_project with worker processes gives the run of one worker: files, failures, summary.

The project is the demo field plus a well whose file is not LAS and a second copy
of a well's file under another file name, with the same WELL name (the copy must fail: its
outputs would collide).
Everything is compared between workers=1 and workers=2; nothing is hard-coded.
"""

import json
import shutil
from pathlib import Path

import pytest

from satheight.cli import main
from satheight.errors import SatHeightError
from satheight.workflows.run import run_project

from run_outputs import run_files

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"


@pytest.fixture(scope="module")
def project(tmp_path_factory):
    d = tmp_path_factory.mktemp("proj")
    for f in DEMO.iterdir():
        if f.suffix in (".las", ".csv", ".json"):
            shutil.copy(f, d / f.name)
    (d / "BROKEN.las").write_text("not a log file\n")
    shutil.copy(DEMO / "VANTREL-1.las", d / "VANTREL-1-copy.las")
    text = (DEMO / "demo_project.toml").read_text()
    extra = ('\n[[wells]]\nlas = "BROKEN.las"\n'
             '\n[[wells]]\nlas = "VANTREL-1-copy.las"\n')     # same WELL name as the first well
    head, zones = text.split("[[zones]]", 1)
    (d / "p.toml").write_text(head + extra + "\n[[zones]]" + zones)
    return d / "p.toml"


def run(project, out, workers):
    report = run_project(project, out, plot=False, workers=workers)
    return report, json.loads((out / "run_summary.json").read_text())


def test_two_workers_same_as_one(project, tmp_path):
    r1, s1 = run(project, tmp_path / "one", 1)
    r2, s2 = run(project, tmp_path / "two", 2)
    # README (Usage, --workers): the outputs and well order are the same as with one process
    # (an invariance between two runs on one machine, not a value check); BROKEN.las and the
    # colliding name are the two bad wells this fixture adds
    assert [(w.name, w.ok, w.error) for w in r1.wells] == [(w.name, w.ok, w.error) for w in r2.wells]
    n_demo = len(list(DEMO.glob("*.las")))
    assert [w.ok for w in r1.wells] == [True] * n_demo + [False, False]
    assert "BROKEN.las" in r2.wells[n_demo].error and "outputs would collide" in r2.wells[n_demo + 1].error
    assert s1["wells"] == s2["wells"]
    files1 = sorted(p.name for p in (tmp_path / "one").iterdir())
    files2 = sorted(p.name for p in (tmp_path / "two").iterdir())
    assert files1 == files2                      # no work folder left behind
    # every file byte for byte but for the run time in the report and its manifest line
    # (the two runs may straddle a minute) and run_summary.json (compared above)
    one, two = run_files(tmp_path / "one"), run_files(tmp_path / "two")
    for name in files1:
        if name != "run_summary.json":
            assert one[name] == two[name], name
    for w in r2.wells:
        assert all(f.parent == tmp_path / "two" and f.exists() for f in w.files)
        assert w.result is None
    assert [w.summary for w in r1.wells] == [w.summary for w in r2.wells]


@pytest.mark.parametrize("bad", [0, -1, 1.5, True])
def test_bad_worker_count(project, tmp_path, bad):
    with pytest.raises(SatHeightError):
        run_project(project, tmp_path, workers=bad)


def test_cli_workers_option(project, tmp_path, capsys):
    # README (Bad input): a failed well gives exit code 3; a bad option exit code 2
    assert main(["run", str(project), "--out", str(tmp_path / "o"), "--no-plots",
                 "--workers", "2"]) == 3              # two wells failed
    cap = capsys.readouterr()  # results on stdout, per-well failures on stderr
    assert "VANTREL-4: ok" in cap.out and "FAILED" in cap.err
    with pytest.raises(SystemExit) as exc:
        main(["run", str(project), "--workers", "0"])
    assert exc.value.code == 2


def test_two_workers_draw_the_field_section(project, tmp_path):
    report = run_project(project, tmp_path / "sec", plot=True, workers=2)
    # README (Outputs): field_section.png is drawn whatever the number of workers
    assert report.section_file is not None and report.section_file.stat().st_size > 0
    assert all(w.result is None for w in report.wells)
