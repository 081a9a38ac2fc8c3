"""HTML report of a project run: one self-contained page beside the other outputs.

The page summarises every well and zone (SHM versus log Sw, hydrocarbon pore
thickness, flagged samples, FWL, function), shows the track plots and the field
section (linked files in the same folder), lists notes and failures, and carries
the caution. All text that comes from input files (well, zone and file names,
messages) is HTML-escaped; nothing from an input is ever written as markup.
"""

from __future__ import annotations

import html
from pathlib import Path

from ..io.atomic import atomic_write_text

#: File name of the report in the output folder.
REPORT_NAME = "report.html"

_STYLE = """
body { font-family: sans-serif; margin: 1.5em 2em; color: #1b1b1b; max-width: 75em; }
h1 { font-size: 1.5em; } h2 { font-size: 1.2em; margin-top: 1.6em; } h3 { font-size: 1.05em; }
table { border-collapse: collapse; margin: 0.5em 0 1em 0; font-size: 0.92em; }
th, td { border: 1px solid #c8c8c8; padding: 0.25em 0.6em; text-align: right; }
th { background: #eef2f6; } td.text, th.text { text-align: left; }
.caution { border-left: 4px solid #d55e00; background: #fff6ef; padding: 0.6em 1em; }
.failed { color: #a3000b; } .note { color: #555; font-size: 0.92em; }
img { max-width: 100%; border: 1px solid #ddd; margin: 0.4em 0; }
"""


def _e(value) -> str:
    """Escaped text of any value (None as an empty cell)."""
    return "" if value is None else html.escape(str(value), quote=True)


def _num(value, fmt: str = ".3f") -> str:
    if value is None:
        return ""
    try:
        return format(float(value), fmt)
    except (TypeError, ValueError):
        return _e(value)


def _link(name: str) -> str:
    """A relative link to an output file (file names are ours, still escaped)."""
    return html.escape(Path(name).name, quote=True)


def _zone_rows(summary: dict) -> list[str]:
    rows = []
    thick = _e(summary.get("units", {}).get("thickness", "m"))
    for zname, z in (summary.get("zones") or {}).items():
        params = ", ".join(f"{_e(k)} {_num(v, '.4g')}" for k, v in (z.get("parameters") or {}).items())
        rows.append(
            "<tr>"
            f"<td class='text'>{_e(zname)}</td><td class='text'>{_e(z.get('hydrocarbon'))}</td>"
            f"<td>{_num(z.get('fwl_tvdss'), '.2f')}</td>"
            f"<td class='text'>{_e(z.get('function'))}: {params}</td>"
            f"<td>{_e(z.get('samples'))}</td><td>{_e(z.get('samples_net'))}</td>"
            f"<td>{_e(z.get('samples_flagged'))}</td><td>{_e(z.get('samples_compared'))}</td>"
            f"<td>{_num(z.get('mean_difference'), '+.3f')}</td><td>{_num(z.get('rms_difference'))}</td>"
            f"<td>{_num(z.get('hcpt_shm'), '.2f')}</td><td>{_num(z.get('hcpt_log'), '.2f')}</td>"
            f"<td>{_num(z.get('net_vertical_thickness'), '.1f')}</td>"
            "</tr>")
    header = ("<tr><th class='text'>Zone</th><th class='text'>Fluid</th>"
              f"<th>FWL TVDSS [{thick}]</th><th class='text'>J–Sw function</th><th>Samples</th>"
              "<th>Net</th><th>Flagged</th><th>Compared</th><th>Mean SHM − log Sw</th>"
              f"<th>RMS</th><th>HCPT SHM [{thick}]</th><th>HCPT log [{thick}]</th>"
              f"<th>Net thickness [{thick}]</th></tr>")
    return [header] + rows


def render(run_summary: dict, title: str) -> str:
    """The report page as text, from the content of ``run_summary.json``.

    Parameters
    ----------
    run_summary : dict
        What :func:`satheight.pipeline.run_project` writes to ``run_summary.json``.
    title : str
        Page title (the project name; escaped here).
    """
    wells = run_summary.get("wells", [])
    parts = ["<!DOCTYPE html>", "<html lang='en'><head><meta charset='utf-8'>",
             f"<title>{_e(title)}: saturation-height results</title>",
             f"<style>{_STYLE}</style></head><body>",
             f"<h1>{_e(title)}: saturation-height results</h1>",
             f"<p class='caution'><b>Caution.</b> {_e(run_summary.get('caution'))}</p>",
             f"<p class='note'>{_e(run_summary.get('program'))}; project file "
             f"{_e(run_summary.get('project'))}</p>"]
    n_ok = sum(1 for w in wells if w.get("ok"))
    parts.append(f"<p>{n_ok} of {len(wells)} wells computed.</p>")
    thick = next((_e((w.get("summary") or {}).get("units", {}).get("thickness"))
                  for w in wells if w.get("summary")), "m")
    parts.append("<table><tr><th class='text'>Well</th><th class='text'>Log Sw from</th>"
                 "<th>Mean SHM − log Sw</th><th>RMS</th>"
                 f"<th>HCPT SHM [{thick}]</th><th>HCPT log [{thick}]</th>"
                 "<th class='text'>Files</th></tr>")
    for w in wells:
        s = w.get("summary") or {}
        whole = s.get("whole_well", {})
        files = " ".join(f"<a href='{_link(f)}'>{_e(Path(f).suffix.lstrip('.') or f)}</a>"
                         for f in w.get("files", []))
        if w.get("ok"):
            parts.append(f"<tr><td class='text'><a href='#well-{_e(w['name'])}'>{_e(w['name'])}</a></td>"
                         f"<td class='text'>{_e(s.get('sw_log_source'))}</td>"
                         f"<td>{_num(whole.get('mean_difference'), '+.3f')}</td>"
                         f"<td>{_num(whole.get('rms_difference'))}</td>"
                         f"<td>{_num(whole.get('hcpt_shm'), '.2f')}</td>"
                         f"<td>{_num(whole.get('hcpt_log'), '.2f')}</td>"
                         f"<td class='text'>{files}</td></tr>")
        else:
            parts.append(f"<tr><td class='text failed'>{_e(w.get('name'))}</td>"
                         f"<td class='text failed' colspan='6'>failed: {_e(w.get('error'))}</td></tr>")
    parts.append("</table>")
    if run_summary.get("field_section"):
        name = _link(run_summary["field_section"])
        parts += ["<h2>Field section</h2>", f"<img src='{name}' alt='field section'>"]
    for w in wells:
        if not w.get("ok"):
            continue
        s = w.get("summary") or {}
        parts.append(f"<h2 id='well-{_e(w['name'])}'>{_e(w['name'])}</h2>")
        parts.append("<table>" + "".join(_zone_rows(s)) + "</table>")
        for f in w.get("files", []):
            if f.endswith(".png"):
                parts.append(f"<img src='{_link(f)}' alt='track plot of {_e(w['name'])}'>")
        for m in w.get("warnings", []):
            parts.append(f"<p class='note'>note: {_e(m)}</p>")
    for m in run_summary.get("notes", []):
        parts.append(f"<p class='note'>note: {_e(m)}</p>")
    parts.append("<p class='note'>Mean and RMS: SHM Sw minus log Sw over net samples (fraction). "
                 "HCPT: hydrocarbon pore thickness, the sum of φ(1 − Sw)·Δh over the same "
                 "samples (Δh true vertical thickness).</p>")
    parts.append("</body></html>")
    return "\n".join(parts) + "\n"


def write_report(run_summary: dict, out_dir, title: str) -> Path:
    """Write ``report.html`` into ``out_dir`` atomically; return its path."""
    path = Path(out_dir) / REPORT_NAME
    atomic_write_text(path, render(run_summary, title))
    return path
