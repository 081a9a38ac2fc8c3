"""Tests of the well track plot (satheight.plots.track) and of writing it (workflows.figures).

All well data here is invented: smooth synthetic logs with a simple power-law
J-Sw relation, built only to exercise the plot.
"""

from __future__ import annotations

import os
from pathlib import Path
from types import SimpleNamespace

import numpy as np
import pytest
from matplotlib import cbook
from matplotlib.figure import Figure

from satheight import plots
from satheight.plots.depth_scale import LABELS_GID, OTHER_TITLE_GID
from satheight.plots.depths import zone_intervals
from satheight.workflows.figures import save_figure
from satheight.errors import DepthError, InputFileError, UnitError
from satheight.results import FLAG_BAD_POROSITY, FLAG_NO_ZONE, ShmResult, WellResult
from satheight.well import Curve, Well

# PNG signature: PNG specification (ISO/IEC 15948:2004, section 5.2; RFC 2083).
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
# PDF header: ISO 32000-1:2008, section 7.5.2 (file starts with "%PDF-").
PDF_HEADER = b"%PDF-"
# 1 mD in m^2: NIST SP 811 (2008), App. B (darcy = 9.869233e-13 m^2).
MD_IN_M2 = 9.869233e-16
# International foot in metres: NIST SP 811 (2008), App. B.
FOOT_M = 0.3048


def zone(name, top, base, fwl, hydrocarbon="oil"):
    """Stand-in for the engine's zone object (only the attributes the plot reads)."""
    return SimpleNamespace(name=name, top=top, base=base, fwl=fwl, hydrocarbon=hydrocarbon,
                           gas_oil_level=None)


def make_result(n=1200, top_md=1500.0, step=0.5, datum=25.0, gr=True, rt=True, sw_log=True,
                all_nan=False, name="Demo-1", zones=None, seed=1, tvdss=None):
    """Synthetic WellResult: vertical well, TVDSS = MD - datum, two zones."""
    rng = np.random.default_rng(seed)
    md = top_md + step * np.arange(n)
    tv = md - datum if tvdss is None else tvdss
    if zones is None:
        zones = [zone("Upper sand", top_md + 50 - datum, top_md + 180 - datum,
                      top_md + 200 - datum, "gas"),
                 zone("Lower sand", top_md + 220 - datum, top_md + 520 - datum,
                      top_md + 450 - datum, "oil")]
    # smooth porosity and a porosity-permeability trend (invented)
    noise = np.convolve(rng.normal(size=n + 40), np.ones(41) / 41, mode="valid")[:n]
    phi = np.clip(0.18 + 0.6 * noise, 0.02, 0.35)
    k_md = 10.0 ** (-1.0 + 16.0 * phi)
    k = k_md * MD_IN_M2
    zone_idx = np.full(n, -1)
    for i, z in enumerate(zones):
        zone_idx = np.where((tv >= z.top) & (tv <= z.base) & (zone_idx < 0), i, zone_idx)
    fwl = np.array([z.fwl for z in zones] + [np.nan])[zone_idx]
    h = np.where(zone_idx >= 0, fwl - tv, np.nan)
    pc = np.clip(h, 0, None) * 250.0 * 9.80665
    j = pc * np.sqrt(k / phi) / 0.026
    with np.errstate(divide="ignore"):
        sw = np.clip(0.15 + 0.12 * j ** -0.8, 0.0, 1.0)
    sw = np.where(h <= 0, 1.0, sw)
    sw = np.where(zone_idx >= 0, sw, np.nan)
    flag = np.where(zone_idx < 0, FLAG_NO_ZONE, 0)
    phi[100:110] = np.nan
    flag[100:110] |= FLAG_BAD_POROSITY
    sw_l = np.clip(np.where(np.isfinite(sw), sw, 1.0) + rng.normal(0, 0.04, n), 0, 1)
    with np.errstate(divide="ignore"):     # Sw clipped to 0 gives an infinite Rt, as intended
        rt_arr = 0.05 / (np.where(np.isfinite(phi), phi, 0.2) ** 2 * sw_l ** 2)
    gr_arr = np.clip(40 + 300 * (0.2 - phi) + rng.normal(0, 5, n), 10, 200)
    if all_nan:
        nan = np.full(n, np.nan)
        phi = k = h = pc = j = sw = sw_l = rt_arr = gr_arr = nan
    curves = {"DEPT": Curve("DEPT", "M", "depth", md.copy())}
    if gr:
        curves["Gr"] = Curve("Gr", "GAPI", "gamma ray", gr_arr)
    well = Well(name=name, source=Path("demo.las"), md=md, depth_unit="m",
                index_mnemonic="DEPT", curves=curves)
    shm = ShmResult(zone=zone_idx, hafwl=h, pc=pc, j=j, sw=sw, flag=flag)
    return WellResult(well=well, tvdss=tv, zones=zones, shm=shm, phi=phi, k=k,
                      rt=rt_arr if rt else None, sw_log=sw_l if sw_log else None,
                      sw_log_source="curve:SWE" if sw_log else "none",
                      roles={"resistivity": "RT" if rt else None}, datum_elevation=datum)


def all_xlabels(fig):
    return [ax.get_xlabel() for ax in fig.axes]


def all_texts(fig):
    out = [t.get_text() for t in fig.texts]
    for ax in fig.axes:
        out += [t.get_text() for t in ax.texts]
    return out


def legend_labels(fig):
    return [t.get_text() for leg in fig.legends for t in leg.get_texts()]


# ----------------------------------------------------------------------- files


def test_png_written_with_signature(tmp_path):
    out = tmp_path / "well.png"
    written = save_figure(plots.track_plot(make_result()), out)
    assert written == [out]
    data = out.read_bytes()
    assert len(data) > 1000
    assert data[:8] == PNG_SIGNATURE


def test_pdf_written_when_asked(tmp_path):
    png, pdf = tmp_path / "w.png", tmp_path / "w.pdf"
    written = save_figure(plots.track_plot(make_result()), png, pdf)
    assert written == [png, pdf]
    assert pdf.read_bytes()[:5] == PDF_HEADER
    assert png.read_bytes()[:8] == PNG_SIGNATURE


def test_no_pdf_unless_asked(tmp_path):
    save_figure(plots.track_plot(make_result()), tmp_path / "w.png")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["w.png"]


def test_no_temp_file_left_behind(tmp_path):
    save_figure(plots.track_plot(make_result()), tmp_path / "a.png", tmp_path / "a.pdf")
    names = sorted(os.listdir(tmp_path))
    assert names == ["a.pdf", "a.png"]
    assert not any(n.startswith(".") or n.endswith(".tmp") for n in names)


def test_existing_file_is_replaced(tmp_path):
    out = tmp_path / "w.png"
    out.write_bytes(b"old content")
    save_figure(plots.track_plot(make_result()), out)
    assert out.read_bytes()[:8] == PNG_SIGNATURE


def test_failed_save_keeps_old_file_and_leaves_no_temp(tmp_path, monkeypatch):
    png, pdf = tmp_path / "w.png", tmp_path / "w.pdf"
    png.write_bytes(b"old png")
    pdf.write_bytes(b"old pdf")

    def broken_savefig(self, *args, **kwargs):
        raise RuntimeError("disk full (simulated)")

    monkeypatch.setattr(Figure, "savefig", broken_savefig)
    with pytest.raises(RuntimeError, match="simulated"):
        save_figure(plots.track_plot(make_result()), png, pdf)
    assert png.read_bytes() == b"old png"
    assert pdf.read_bytes() == b"old pdf"
    assert sorted(os.listdir(tmp_path)) == ["w.pdf", "w.png"]


def test_failed_pdf_save_keeps_old_png_too(tmp_path, monkeypatch):
    """Both files are renamed only after both saved: a PDF failure leaves the old PNG."""
    png, pdf = tmp_path / "w.png", tmp_path / "w.pdf"
    png.write_bytes(b"old png")
    real = Figure.savefig

    def savefig_pdf_fails(self, fname, *args, **kwargs):
        if kwargs.get("format") == "pdf":
            raise RuntimeError("pdf failed (simulated)")
        return real(self, fname, *args, **kwargs)

    monkeypatch.setattr(Figure, "savefig", savefig_pdf_fails)
    with pytest.raises(RuntimeError, match="simulated"):
        save_figure(plots.track_plot(make_result()), png, pdf)
    assert png.read_bytes() == b"old png"
    assert sorted(os.listdir(tmp_path)) == ["w.png"]


def test_missing_output_folder_is_a_clear_error(tmp_path):
    with pytest.raises(InputFileError, match="does not exist"):
        save_figure(plots.track_plot(make_result()), tmp_path / "nope" / "w.png")


def test_input_not_modified(tmp_path):
    res = make_result()
    before = {k: np.copy(getattr(res, k)) for k in ("tvdss", "phi", "k", "rt", "sw_log")}
    shm_before = {k: np.copy(getattr(res.shm, k)) for k in ("sw", "hafwl", "j", "flag", "zone")}
    md_before = res.well.md.copy()
    save_figure(plots.track_plot(res), tmp_path / "w.png")
    for k, v in before.items():
        np.testing.assert_array_equal(getattr(res, k), v)
    for k, v in shm_before.items():
        np.testing.assert_array_equal(getattr(res.shm, k), v)
    np.testing.assert_array_equal(res.well.md, md_before)


# ------------------------------------------------------------- optional inputs


def test_tracks_follow_available_curves():
    full = plots.track_plot(make_result())
    labels = " | ".join(all_xlabels(full))
    assert "Gr [GAPI]" in labels
    assert "Resistivity" in labels
    assert "Log Sw (SWE)" in legend_labels(full)

    bare = plots.track_plot(make_result(gr=False, rt=False, sw_log=False))
    labels = " | ".join(all_xlabels(bare))
    assert "Gr" not in labels and "Resistivity" not in labels
    for needed in ("Porosity", "Permeability", "Water saturation", "Height above FWL", "J"):
        assert needed in labels
    assert not any(lbl.startswith("Log Sw") for lbl in legend_labels(bare))
    # two fewer tracks: GR and resistivity
    assert len(full.axes) - len(bare.axes) == 2


def test_missing_optional_curves_write_a_png(tmp_path):
    out = tmp_path / "w.png"
    save_figure(plots.track_plot(make_result(gr=False, rt=False, sw_log=False)), out)
    assert out.read_bytes()[:8] == PNG_SIGNATURE


def test_all_nan_curves(tmp_path):
    out = tmp_path / "w.png"
    save_figure(plots.track_plot(make_result(all_nan=True)), out, tmp_path / "w.pdf")
    assert out.read_bytes()[:8] == PNG_SIGNATURE
    assert (tmp_path / "w.pdf").read_bytes()[:5] == PDF_HEADER


def test_all_nan_tvdss_md_axis_works_and_tvdss_axis_is_a_clear_error(tmp_path):
    res = make_result(tvdss=np.full(1200, np.nan))
    save_figure(plots.track_plot(res, depth_axis="md"), tmp_path / "w.png")
    with pytest.raises(DepthError, match="TVDSS"):
        save_figure(plots.track_plot(res, depth_axis="tvdss"), tmp_path / "w2.png")
    assert not (tmp_path / "w2.png").exists()


def test_no_zones(tmp_path):
    res = make_result()
    res.zones = []
    res.shm.zone[:] = -1
    save_figure(plots.track_plot(res), tmp_path / "w.png")
    assert (tmp_path / "w.png").stat().st_size > 0


# ------------------------------------------------------------------------ text


def test_dollar_and_backslash_in_names_do_not_raise(tmp_path):
    nasty = "W$\\bad{$ 1\\"
    # control: drawn as is, this text is mathtext and fails on draw, so the test can fail
    fig = Figure()
    fig.text(0.5, 0.5, nasty)
    with pytest.raises(ValueError):
        fig.savefig(tmp_path / "control.png")

    zones = [zone("Z$\\alpha{$", 1500.0, 1700.0, 1650.0)]
    res = make_result(name=nasty, zones=zones)
    res.well.curves["Gr"].mnemonic = "G$\\r{$"
    out = tmp_path / "w.png"
    save_figure(plots.track_plot(res), out, tmp_path / "w.pdf")
    assert out.read_bytes()[:8] == PNG_SIGNATURE


def test_safe_text_is_not_mathtext_and_shows_the_original():
    for raw in ["A$b$c", "x\\$y$", "$\\frac{1}{2}$", "plain"]:
        safe = plots.safe_text(raw)
        assert not cbook.is_math_text(safe)
        # matplotlib shows "\$" as "$" outside math mode (matplotlib Text docs)
        assert safe.replace("\\$", "$") == raw
    assert cbook.is_math_text("A$b$c")  # control: the raw text would be math


def test_title_is_the_well_name_unless_given():
    fig = plots.track_plot(make_result(name="Well $A$"))
    assert "Well \\$A\\$" in all_texts(fig)
    fig = plots.track_plot(make_result(name="Well A"), title="My title")
    texts = all_texts(fig)
    assert "My title" in texts and "Well A" not in texts


# ---------------------------------------------------------------- depth axes


@pytest.mark.parametrize("depth_axis", ["md", "tvdss"])
def test_both_depth_axes(tmp_path, depth_axis):
    res = make_result(datum=25.0)
    out = tmp_path / f"{depth_axis}.png"
    save_figure(plots.track_plot(res, depth_axis=depth_axis), out)
    assert out.read_bytes()[:8] == PNG_SIGNATURE

    fig = plots.track_plot(res, depth_axis=depth_axis, interval="all")
    ax = fig.axes[0]
    depth = res.well.md if depth_axis == "md" else res.tvdss
    lo, hi = ax.get_ylim()
    assert lo == pytest.approx(depth.max()) and hi == pytest.approx(depth.min())  # depth down
    assert ax.get_ylabel() == ("MD [m]" if depth_axis == "md" else "TVDSS [m]")
    other = [t.get_text() for t in fig.texts if t.get_gid() == OTHER_TITLE_GID]
    assert other == ["TVDSS [m]" if depth_axis == "md" else "MD [m]"]


def test_field_units_in_feet():
    res = make_result()
    fig = plots.track_plot(res, units="field", depth_axis="md", interval="all")
    ax = fig.axes[0]
    lo, hi = ax.get_ylim()
    assert lo == pytest.approx(res.well.md.max() / FOOT_M)
    assert hi == pytest.approx(res.well.md.min() / FOOT_M)
    assert ax.get_ylabel() == "MD [ft]"
    assert "Height above FWL [ft]" in all_xlabels(fig)


def test_secondary_axis_maps_md_to_tvdss():
    """MD main scale, datum 40 m, vertical well: TVDSS = MD - 40 (make_result, worked by
    hand), so the TVDSS number t sits at plot MD t + 40, every 50 m of TVDSS."""
    res = make_result(datum=40.0)
    fig = plots.track_plot(res, depth_axis="md")
    fig.canvas.draw()
    lo, hi = sorted(fig.axes[0].get_ylim())
    labels = np.array([(t.get_position()[1], float(t.get_text().replace("\N{MINUS SIGN}", "-")))
                       for t in fig.texts if t.get_gid() == LABELS_GID["other"]])
    assert len(labels) >= 3
    np.testing.assert_allclose(labels[:, 0], labels[:, 1] + 40.0)
    np.testing.assert_allclose(np.mod(labels[:, 1], 50.0), 0.0, atol=1e-9)
    assert np.all((labels[:, 0] >= lo) & (labels[:, 0] <= hi))
    assert labels[:, 0].min() - 50.0 < lo and labels[:, 0].max() + 50.0 > hi   # none left out


def test_bad_arguments():
    res = make_result()
    with pytest.raises(DepthError, match="depth axis"):
        plots.track_plot(res, depth_axis="tvd")
    with pytest.raises(UnitError, match="unit system"):
        plots.track_plot(res, units="imperial")


# ------------------------------------------------------------- zones and FWL


def test_zone_intervals_vertical_and_deviated():
    md = np.linspace(1000.0, 2000.0, 1001)
    # vertical: TVDSS = MD - 30 (computed)
    ivs = zone_intervals(md, md - 30.0, 1200.0, 1300.5)
    assert ivs == [pytest.approx((1230.0, 1330.5))]
    # constant 60 deg inclination: TVDSS = MD cos 60 = MD / 2 (computed)
    ivs = zone_intervals(md, md * 0.5, 600.0, 700.0)
    assert ivs == [pytest.approx((1200.0, 1400.0))]
    # window running past the log stops at the log ends
    assert zone_intervals(md, md, 500.0, 1100.0) == [pytest.approx((1000.0, 1100.0))]
    # window outside the log
    assert zone_intervals(md, md, 2500.0, 2600.0) == []


def test_zone_intervals_well_passing_window_twice():
    md = np.linspace(0.0, 400.0, 401)
    tv = np.where(md <= 200.0, md, 400.0 - md)  # down to 200 then back up (invented)
    ivs = zone_intervals(md, tv, 150.0, 250.0)
    assert ivs == [pytest.approx((150.0, 250.0))]
    ivs = zone_intervals(md, tv, 100.0, 150.0)
    assert ivs == [pytest.approx((100.0, 150.0)), pytest.approx((250.0, 300.0))]


def test_fwl_line_and_zone_name_drawn_at_md_of_fwl():
    datum = 25.0
    zones = [zone("Sand A", 1600.0, 1800.0, 1750.0, "oil")]
    res = make_result(datum=datum, zones=zones)
    fig = plots.track_plot(res, depth_axis="md")
    texts = all_texts(fig)
    assert "FWL Sand A" in texts and "Sand A" in texts
    fwl_md = 1750.0 + datum  # vertical well: MD = TVDSS + datum elevation
    for ax in fig.axes[:1]:
        ys = [ln.get_ydata()[0] for ln in ax.get_lines()
              if len(ln.get_ydata()) == 2 and ln.get_ydata()[0] == ln.get_ydata()[1]]
        assert any(y == pytest.approx(fwl_md) for y in ys)


def test_free_oil_level_drawn_for_gas_cap_zone():
    datum = 25.0
    z = zone("Cap", 1600.0, 1800.0, 1750.0, "oil")
    z.gas_oil_level = 1680.0
    res = make_result(datum=datum, zones=[z])
    fig = plots.track_plot(res, depth_axis="md")
    assert "Free-oil level Cap" in all_texts(fig)
    ys = [ln.get_ydata()[0] for ln in fig.axes[0].get_lines()
          if len(ln.get_ydata()) == 2 and ln.get_ydata()[0] == ln.get_ydata()[1]]
    assert any(y == pytest.approx(1680.0 + datum) for y in ys)  # vertical: MD = TVDSS + datum


def test_fwl_below_log_gets_a_note():
    zones = [zone("Deep", 1600.0, 1800.0, 5000.0, "gas")]
    fig = plots.track_plot(make_result(zones=zones))
    assert any("FWL Deep below the log" in t for t in all_texts(fig))


def test_hydrocarbon_fill_and_flags_in_legend():
    fig = plots.track_plot(make_result())
    labels = legend_labels(fig)
    assert any(lbl.startswith("Gas") for lbl in labels)
    assert any(lbl.startswith("Oil") for lbl in labels)
    assert "Outside every zone" in labels
    assert any(lbl.startswith("Flagged") for lbl in labels)

    res = make_result()
    res.shm.flag[:] = 0
    labels = legend_labels(plots.track_plot(res))
    assert not any(lbl.startswith("Flagged") or lbl == "Outside every zone" for lbl in labels)


def test_permeability_plotted_in_millidarcy():
    res = make_result()
    fig = plots.track_plot(res, interval="all")
    lines = [ln for ax in fig.axes for ln in ax.get_lines() if ln.get_label() == "Permeability"]
    assert len(lines) == 1
    k_md = np.asarray(lines[0].get_xdata(), dtype=float)
    np.testing.assert_allclose(k_md, res.k / MD_IN_M2, rtol=1e-12)


def test_every_figure_file_is_fsynced_through_atomic(tmp_path, monkeypatch):
    """Figures go through io/atomic.py: each written file is fsynced before its rename."""
    import stat

    from satheight.io import atomic

    synced = []
    real_fsync = os.fsync

    def counting_fsync(fd):
        if stat.S_ISREG(os.fstat(fd).st_mode):       # files, not the folder fsync after a rename
            synced.append(fd)
        return real_fsync(fd)

    monkeypatch.setattr(atomic.os, "fsync", counting_fsync)
    png, pdf = tmp_path / "w.png", tmp_path / "w.pdf"
    save_figure(plots.track_plot(make_result()), png, pdf)
    assert len(synced) == 2
    fig = Figure()
    fig.add_subplot().plot([0, 1], [1, 0])
    save_figure(fig, tmp_path / "x.png")
    assert len(synced) == 3
    assert (tmp_path / "x.png").read_bytes()[:8] == PNG_SIGNATURE
    assert sorted(os.listdir(tmp_path)) == ["w.pdf", "w.png", "x.png"]


def test_plots_return_figures_and_write_nothing(tmp_path, monkeypatch):
    """The plot functions only build figures: no file appears (the caller writes)."""
    monkeypatch.chdir(tmp_path)
    fig = plots.track_plot(make_result())
    assert isinstance(fig, Figure)
    assert os.listdir(tmp_path) == []
