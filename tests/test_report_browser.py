"""The demo run's HTML report opened in a real headless browser (Debian's chromium).

How: a copy of the page gets a small script as the first element of its head (before the page's
own content-security policy, so it may run) that records console errors, failed loads and policy
violations, and on load writes what it found (images with their natural width, every table's
cell texts, the visible text) into a <pre> element. ``chromium --headless --dump-dom`` prints the
DOM after load; the test reads the findings back. The page is copied alone into an empty folder,
so an image that is not embedded cannot load.

Skipped, with the reason, only where no chromium binary exists.
"""

from __future__ import annotations

import html
import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from satheight.cli import main
from satheight.workflows.report import REPORT_NAME

CHROMIUM = next((p for p in ("/usr/bin/chromium", shutil.which("chromium"),
                             shutil.which("chromium-browser"), shutil.which("google-chrome"))
                 if p and Path(p).exists()), None)
needs_browser = pytest.mark.skipif(
    CHROMIUM is None, reason="no chromium binary (Debian: apt-get install -y chromium)")

FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]

PROBE = """<script>
(function () {
  var found = [];
  var oldError = console.error;
  console.error = function () {
    found.push('console.error: ' + Array.prototype.join.call(arguments, ' '));
    return oldError.apply(console, arguments);
  };
  window.addEventListener('error', function (e) {
    var t = e.target || {};
    found.push('error: ' + (e.message || t.src || t.href || 'resource failed to load'));
  }, true);
  document.addEventListener('securitypolicyviolation', function (e) {
    found.push('policy: ' + e.violatedDirective + ' ' + e.blockedURI);
  });
  window.addEventListener('load', function () {
    var imgs = Array.prototype.map.call(document.images, function (i) {
      return {alt: i.alt, complete: i.complete, naturalWidth: i.naturalWidth};
    });
    var tables = Array.prototype.map.call(document.querySelectorAll('table'), function (t) {
      return {id: t.id, zone: t.getAttribute('data-zone'),
              rows: Array.prototype.map.call(t.rows, function (r) {
                return Array.prototype.map.call(r.cells, function (c) { return c.textContent.trim(); });
              })};
    });
    var text = document.body.innerText;
    var pre = document.createElement('pre');
    pre.id = 'probe-findings';
    pre.textContent = JSON.stringify({errors: found, images: imgs, tables: tables, text: text});
    document.body.appendChild(pre);
  });
})();
</script>"""


def open_in_browser(page: Path, work: Path) -> dict:
    """Open ``page`` (a copy with the probe) in headless chromium; return the probe's findings."""
    work.mkdir(parents=True, exist_ok=True)
    probed = work / "probed.html"
    text = page.read_text(encoding="utf-8")
    head = re.search(r"<head[^>]*>", text, flags=re.I)
    assert head, "the page has no <head>"
    probed.write_text(text[:head.end()] + PROBE + text[head.end():], encoding="utf-8")
    profile = work / "profile"
    profile.mkdir()
    r = subprocess.run([CHROMIUM, *FLAGS, f"--user-data-dir={profile}",
                        "--virtual-time-budget=10000", "--dump-dom", probed.as_uri()],
                       capture_output=True, text=True, timeout=180)
    m = re.search(r'<pre id="probe-findings">(.*?)</pre>', r.stdout, flags=re.S)
    assert m, f"the browser printed no findings (exit {r.returncode}): {r.stderr[-2000:]}"
    return json.loads(html.unescape(m.group(1)))


@pytest.fixture(scope="module")
def demo_report(tmp_path_factory):
    """The demo run with plots; the report copied alone into an empty folder."""
    out = tmp_path_factory.mktemp("demo")
    assert main(["demo", "--out", str(out)]) == 0
    alone = tmp_path_factory.mktemp("alone")
    shutil.copy(out / REPORT_NAME, alone / REPORT_NAME)
    summary = json.loads((out / "run_summary.json").read_text(encoding="utf-8"))
    return alone / REPORT_NAME, summary, tmp_path_factory.mktemp("browser")


def _table(findings, *, id=None, zone=None):
    for t in findings["tables"]:
        if (id is not None and t["id"] == id) or (zone is not None and t["zone"] == zone):
            return t["rows"][0], {row[0]: dict(zip(t["rows"][0], row)) for row in t["rows"][1:]}
    raise AssertionError(f"no table {id or zone!r}")


def _close(shown: str, value, decimals: int) -> bool:
    """The page's text equals the JSON value rounded to the decimals shown (half a unit);
    a value not computed (None) shows as an empty cell."""
    if value is None:
        return shown.strip() == ""
    return abs(float(shown) - value) <= 0.5 * 10 ** -decimals + 1e-12


@needs_browser
def test_browser_probe_sees_a_broken_image_and_a_console_error(tmp_path):
    """The harness itself can fail: a page with a missing image and a console error is caught."""
    page = tmp_path / "bad.html"
    page.write_text("<!DOCTYPE html><html><head><title>x</title></head><body>"
                    "<img src='missing.png' alt='gone'><table id='t'><tr><td>1</td></tr></table>"
                    "<script>console.error('boom')</script></body></html>", encoding="utf-8")
    found = open_in_browser(page, tmp_path)
    assert any("boom" in e for e in found["errors"])
    assert any("missing.png" in e for e in found["errors"])
    assert found["images"] == [{"alt": "gone", "complete": True, "naturalWidth": 0}]


@needs_browser
def test_report_opens_without_console_errors_and_every_image_loads(demo_report):
    page, summary, work = demo_report
    found = open_in_browser(page, work / "a")
    assert found["errors"] == []
    # one track plot per computed well and the field section, all embedded (the page is alone)
    n_ok = sum(1 for w in summary["wells"] if w["ok"])
    assert len(found["images"]) >= n_ok + 1
    assert all(i["complete"] and i["naturalWidth"] > 0 for i in found["images"]), found["images"]


@needs_browser
def test_report_numbers_equal_the_run_summary(demo_report):
    page, summary, work = demo_report
    found = open_in_browser(page, work / "b")
    head, rows = _table(found, id="wells")
    thick = summary["wells"][0]["summary"]["units"]["thickness"]
    for w in summary["wells"]:
        s = w["summary"]["whole_well"]
        row = rows[w["name"]]
        assert int(row["Samples compared"]) == s["samples_compared"]
        assert _close(row["Mean SHM − log Sw"], s["mean_difference"], 3)
        assert _close(row["RMS SHM − log Sw"], s["rms_difference"], 3)
        for phase in ("oil", "gas"):       # pore thickness per phase, never oil + gas added
            for source in ("shm", "log"):
                assert _close(row[f"HCPT {phase} {source.upper() if source == 'shm' else source} "
                                  f"[{thick}]"], s[f"hcpt_{phase}_{source}"], 2)
        for zname, z in w["summary"]["zones"].items():
            zrow = _table(found, zone=zname)[1][w["name"]]
            assert _close(zrow[f"FWL TVDSS [{thick}]"], z["fwl_tvdss"], 2)
            assert _close(zrow[f"Contact TVDSS [{thick}]"], z["contact"]["contact_tvdss"], 2)
            assert int(zrow["Samples compared"]) == z["samples_compared"]
            assert int(zrow["Flagged samples"]) == z["samples_flagged"]
            assert _close(zrow["Mean SHM − log Sw"], z["mean_difference"], 3)
            assert _close(zrow["RMS SHM − log Sw"], z["rms_difference"], 3)
            assert _close(zrow[f"HCPT SHM [{thick}]"], z["hcpt_shm"], 2)
            assert _close(zrow[f"HCPT log [{thick}]"], z["hcpt_log"], 2)
            assert _close(zrow[f"Net thickness [{thick}]"], z["net_vertical_thickness"], 1)
            assert zrow["Phase"] == z["hydrocarbon"]


@needs_browser
def test_report_shows_inputs_with_checksums_and_no_internal_tokens(demo_report):
    page, summary, work = demo_report
    found = open_in_browser(page, work / "c")
    _, rows = _table(found, id="inputs")
    kinds = {r["Kind"] for r in rows.values()}
    assert {"project file", "LAS", "survey", "tops", "model file"} <= kinds
    for f in summary["inputs"]["files"]:
        assert re.fullmatch(r"[0-9a-f]{64}", f["sha256"])
    text = found["text"]
    for token in ("curve:", "None", "nan", "{{", "{%"):
        assert token not in text, token
    assert "qualified professional" in text and "regulations" in text
    assert "Save as PDF" in text


@needs_browser
def test_report_prints_to_pdf_in_the_browser(demo_report, tmp_path):
    """The printing route the report describes works: the browser makes a multi-page PDF."""
    page, _, _ = demo_report
    pdf = tmp_path / "report.pdf"
    profile = tmp_path / "profile"
    profile.mkdir()
    subprocess.run([CHROMIUM, *FLAGS, f"--user-data-dir={profile}", "--no-pdf-header-footer",
                    f"--print-to-pdf={pdf}", page.as_uri()], capture_output=True, timeout=180)
    data = pdf.read_bytes()
    assert data.startswith(b"%PDF-")   # PDF header (ISO 32000-1, 7.5.2)
    assert len(re.findall(rb"/Type\s*/Page\b", data)) > 1
