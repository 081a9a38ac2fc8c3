"""HTML report: content from the run summary, text from inputs escaped, written atomically."""

import html.parser
import json

from satheight.workflows.report import REPORT_NAME, render, write_report


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
    assert "script" not in p.tags and "i" not in p.tags and "b" in p.tags  # <b> of "Caution."
    text = "".join(p.text)
    assert "<script>alert(1)</script>" in text and "<b>Z</b>" in text and "a < b & c" in text
    assert "Field <i>&</i>" in text


def test_report_lists_wells_failures_and_caution(tmp_path):
    path = write_report(_summary("W-1"), tmp_path, "Demo")
    assert path.name == REPORT_NAME
    page = path.read_text(encoding="utf-8")
    assert "Results are estimates." in page
    assert "W-1" in page and "failed: x.las: file not found" in page
    assert "W_tracks.png" in page and "-0.010" in page
    assert not list(tmp_path.glob(".*"))  # no temporary file left behind


def test_demo_run_writes_report(tmp_path):
    from satheight.cli import main

    assert main(["demo", "--out", str(tmp_path), "--no-plots"]) == 0
    summary = json.loads((tmp_path / "run_summary.json").read_text())
    assert summary["report"] == REPORT_NAME
    page = (tmp_path / REPORT_NAME).read_text(encoding="utf-8")
    for w in summary["wells"]:
        assert w["name"] in page
