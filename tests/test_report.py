"""HTML report: content from the run summary, text from inputs escaped, written atomically,
figures embedded, inputs with checksums, project parameters in the project's units."""

import base64
import hashlib
import html.parser
import json
import re
from pathlib import Path

import matplotlib
from matplotlib.figure import Figure

from satheight.project.reader import load_project
from satheight.workflows.report import REPORT_NAME, input_files, render, write_report

matplotlib.use("Agg")
DEMO = Path(__file__).resolve().parents[1] / "demo_wells"


class _Collect(html.parser.HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.text = [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)

    def handle_data(self, data):
        self.text.append(data)


def _summary(name):
    return {"program": "satheight test", "project": "p.toml", "caution": "Results are estimates.",
            "wells": [{"name": name, "ok": True, "error": None, "warnings": ["a < b & c"],
                       "files": ["W.las", "W_tracks.png"],
                       "summary": {"sw_log_source": "archie", "units": {"thickness": "m"},
                                   "whole_well": {"mean_difference": -0.01, "rms_difference": 0.05,
                                                  "hcpt_shm": 10.0, "hcpt_log": 9.5},
                                   "zones": {"<b>Z</b>": {"hydrocarbon": "oil", "fwl_tvdss": 2105.0,
                                                          "function": "power_law",
                                                          "parameters": {"a": 0.3},
                                                          "samples": 10, "samples_net": 8,
                                                          "samples_flagged": 1,
                                                          "samples_compared": 8,
                                                          "mean_difference": -0.01,
                                                          "rms_difference": 0.05, "hcpt_shm": 1.0,
                                                          "hcpt_log": 0.9,
                                                          "net_vertical_thickness": 4.0}}}},
                      {"name": "BAD", "ok": False, "error": "x.las: file not found",
                       "files": [], "summary": None}]}


def test_text_from_inputs_is_escaped():
    page = render(_summary("<script>alert(1)</script>"), "Field <i>&</i>")
    p = _Collect()
    p.feed(page)
    # no tag from the inputs became markup: only our own tags appear
    # README (Outputs, report.html): text from input files is escaped; library: html.parser
    # (standard library) reads the page
    assert "script" not in p.tags and "i" not in p.tags and "b" in p.tags  # <b> of "Caution."
    text = "".join(p.text)
    assert "<script>alert(1)</script>" in text and "<b>Z</b>" in text and "a < b & c" in text
    assert "Field <i>&</i>" in text


def test_report_lists_wells_failures_and_caution(tmp_path):
    path = write_report(_summary("W-1"), tmp_path, "Demo")
    # README (Outputs, report.html): the caution, the wells, failures and files; written
    # through a temporary file (README: io/atomic.py)
    assert path.name == REPORT_NAME
    page = path.read_text(encoding="utf-8")
    assert "qualified professional" in page and "regulations" in page
    assert "W-1" in page and "x.las: file not found" in page and ">failed<" in page
    assert "-0.010" in page
    assert not list(tmp_path.glob(".*"))  # no temporary file left behind


def test_demo_run_writes_report(tmp_path):
    from satheight.cli import main

    # README (Outputs, Demo field): the demo writes report.html naming every well
    assert main(["demo", "--out", str(tmp_path), "--no-plots"]) == 0
    summary = json.loads((tmp_path / "run_summary.json").read_text())
    assert summary["report"] == REPORT_NAME
    page = (tmp_path / REPORT_NAME).read_text(encoding="utf-8")
    for w in summary["wells"]:
        assert w["name"] in page


def _visible_text(page: str) -> str:
    p = _Collect()
    p.feed(page)
    return "".join(p.text)


def test_figures_are_embedded_so_the_page_needs_no_file_beside_it(tmp_path):
    fig = Figure(figsize=(2, 2))
    fig.add_subplot().plot([0, 1], [0, 1])
    fig.savefig(tmp_path / "W_tracks.png")
    page = render(_summary("W-1"), "Demo", out_dir=tmp_path)
    uris = re.findall(r'src="data:image/png;base64,([A-Za-z0-9+/=]+)"', page)
    assert len(uris) == 1
    # the embedded bytes are the file's bytes (base64 of the standard library, RFC 4648)
    assert base64.b64decode(uris[0]) == (tmp_path / "W_tracks.png").read_bytes()
    assert 'src="W_tracks.png"' not in page and "href=" not in page


def test_log_sw_source_is_shown_in_words_not_as_a_code():
    s = _summary("W-1")
    s["wells"][0]["summary"]["sw_log_source"] = "curve:SW"
    text = _visible_text(render(s, "Demo"))
    assert "curve:SW" not in text and "Sw curve SW of the LAS file" in text


def test_report_carries_date_version_and_cautions():
    text = _visible_text(render(_summary("W-1"), "Demo"))
    assert re.search(r"Run date\s*\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC", text)
    assert "satheight test" in text                       # the program named in the summary
    assert "qualified professional" in text and "regulations" in text
    assert "Save as PDF" in text                          # how to print it


def test_input_files_lists_every_input_with_its_checksum():
    project = load_project(DEMO / "demo_project.toml")
    rows = input_files(project)
    by_kind = {}
    for r in rows:
        by_kind.setdefault(r["kind"], []).append(r)
    assert len(by_kind["LAS"]) == 5 and len(by_kind["survey"]) == 1
    assert len(by_kind["tops"]) == 1 and len(by_kind["model file"]) == 1
    # the demo's four fitted core files: two named by core_files too (listed once, as core
    # data, with the Dean-Stark table), two only through the model file
    assert len(by_kind["core data"]) == 3 and len(by_kind["pressures"]) == 1
    assert len(by_kind["core data (recorded in the model file)"]) == 2
    for r in rows:
        if r["kind"].startswith("core"):
            continue
        # SHA-256 of the file's bytes by hashlib (FIPS 180-4), read here independently
        assert r["sha256"] == hashlib.sha256(Path(r["path"]).read_bytes()).hexdigest()
    paths = [r["path"] for r in rows]
    assert len(paths) == len(set(paths))                  # each file once


def test_project_parameters_are_shown_in_the_project_units(tmp_path):
    """FWL 2105 m of the demo shown in a field-unit project: 2105 / 0.3048 = 6906.17 ft
    (international foot 0.3048 m, NIST SP 811); water density 0.468 psi/ft in a metric project:
    0.468 * 6894.757 Pa / 0.3048 m / 9.80665 m/s2 = 1079.5 kg/m3 (NIST SP 811 factors)."""
    metric = load_project(DEMO / "demo_project.toml")
    text = _visible_text(render(_summary("W-1"), "Demo", project=metric))
    assert "FWL TVDSS2105.00 m" in text
    assert "Water density1079 kg/m3" in text or "Water density1080 kg/m3" in text
    src = (DEMO / "demo_project.toml").read_text(encoding="utf-8")
    src = src.replace('units = "metric"', 'units = "field"')
    for key in ("las", "survey", "file", "tops_file", "pressure_file"):
        src = re.sub(rf'^{key} = "', f'{key} = "{DEMO.as_posix()}/', src, flags=re.M)
    src = re.sub(r'^core_files = .*$', "", src, flags=re.M)      # not shown among the parameters
    (tmp_path / "field.toml").write_text(src, encoding="utf-8")
    field = load_project(tmp_path / "field.toml")
    text = _visible_text(render(_summary("W-1"), "Demo", project=field))
    assert "FWL TVDSS6906.17 ft" in text
