"""The report embeds the per-zone crossplots and the tornado charts, and shows the Monte
Carlo section when a well's summary has one."""

import base64
import copy
import html.parser
import re

import matplotlib
from matplotlib.figure import Figure

from satheight.workflows.report import render
from test_report import _summary

matplotlib.use("Agg")


def _png(path):
    fig = Figure(figsize=(2, 2))
    fig.add_subplot().plot([0, 1], [1, 0])
    fig.savefig(path)


class _Cells(html.parser.HTMLParser):
    """Text of each cell of the tables of class ``cls`` (library: html.parser)."""

    def __init__(self, cls):
        super().__init__()
        self.cls, self.inside, self.rows, self.cell = cls, False, [], None

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag == "table":
            self.inside = self.cls in (a.get("class") or "").split()
        elif self.inside and tag == "tr":
            self.rows.append([])
        elif self.inside and tag == "td":
            self.cell = ""

    def handle_endtag(self, tag):
        if tag == "td" and self.cell is not None:
            self.rows[-1].append(self.cell.strip())
            self.cell = None
        elif tag == "table":
            self.inside = False

    def handle_data(self, data):
        if self.cell is not None:
            self.cell += data


def test_report_embeds_crossplots_and_tornado(tmp_path):
    summary = copy.deepcopy(_summary("W-1"))
    summary["crossplots"] = ["crossplot_Upper.png"]
    summary["wells"][0]["files"].append("W_tornado.png")
    for name in ("W_tracks.png", "W_tornado.png", "crossplot_Upper.png"):
        _png(tmp_path / name)
    page = render(summary, "Demo", out_dir=tmp_path)
    uris = re.findall(r'src="data:image/png;base64,([A-Za-z0-9+/=]+)"', page)
    # the embedded bytes are the files' bytes (base64 of the standard library, RFC 4648)
    got = {base64.b64decode(u) for u in uris}
    assert got == {(tmp_path / n).read_bytes()
                   for n in ("W_tracks.png", "W_tornado.png", "crossplot_Upper.png")}
    assert "zone Upper" in page and "Tornado chart of W-1" in page


def test_report_shows_monte_carlo_numbers_of_the_summary():
    """The P90/P50/P10 cells are the summary's numbers at 3 decimals (README: report)."""
    summary = copy.deepcopy(_summary("W-1"))
    summary["wells"][0]["summary"]["uncertainty"] = {
        "convention": "Volume convention: P90 is exceeded with 90 % probability.",
        "realisations": 200, "seed": 7, "units": {"hcpt": "m"},
        "hcpt": {"zones": {"Upper": {"phase": "oil", "P90": 1.25, "P50": 1.5, "P10": 1.875,
                                     "mean": 1.52, "sd": 0.2}},
                 "phases": {"oil": {"P90": 1.25, "P50": 1.5, "P10": 1.875, "mean": 1.52,
                                    "sd": 0.2}}, "well": None},
        "tornado": {"bars": [{"zone": "Upper", "input": "fwl", "hcpt_low_input": 1.1,
                              "hcpt_high_input": 1.9, "swing": 0.8}]}}
    page = render(summary, "Demo")
    mc = _Cells("monte-carlo")
    mc.feed(page)
    # the file's values: the numbers written into the summary above
    assert mc.rows[1] == ["zone Upper", "oil", "1.250", "1.500", "1.875", "1.520", "0.200"]
    tor = _Cells("tornado")
    tor.feed(page)
    assert tor.rows[1] == ["Upper", "fwl", "1.100", "1.900", "0.800"]
    assert "200 realisations, seed 7" in page
    # without an uncertainty key there is no such section
    assert "monte-carlo" not in render(_summary("W-1"), "Demo")


def test_track_plot_caption_names_the_band_only_with_a_monte_carlo(tmp_path):
    # README (Uncertainty): the band is in each track plot, and so in the report
    summary = copy.deepcopy(_summary("W-1"))
    _png(tmp_path / "W_tracks.png")
    assert "SW_P10" not in render(summary, "Demo", out_dir=tmp_path)
    summary["wells"][0]["summary"]["uncertainty"] = {"realisations": 10, "seed": 1, "hcpt": {}}
    page = render(summary, "Demo", out_dir=tmp_path)
    assert "grey band on the Sw track: SHM Sw from SW_P10 (low Sw) to SW_P90 (high Sw)" in page
