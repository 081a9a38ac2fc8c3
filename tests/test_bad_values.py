"""Bad values, one test per row of the README table "Bad input: what happens" (values part):
each gives a defined behaviour (flag and NaN, a note, or an error naming the key).

Checks are behavioural (which samples are NaN/flagged, which messages appear); the flag bits
are the documented SHM_FLAG meanings. Trade facts: Sw = 1 at and below the FWL (common
practice); water must be denser than the hydrocarbon for a hydrocarbon column to exist
(common practice).
"""

from pathlib import Path

import numpy as np
import pytest

from satheight.compare import summarise
from satheight.errors import ProjectFileError
from satheight.logsw import archie_sw
from satheight.workflows.well import compute_well
from satheight.project import load_project
from satheight.results import (FLAG_BAD_PERMEABILITY, FLAG_BAD_POROSITY, FLAG_J_ABOVE_RANGE,
                               FLAG_J_BELOW_RANGE, FLAG_NO_ZONE)

ZONE = """
[[zones]]
name = "{name}"
top = "{top} m"
base = "{base} m"
fwl = "{fwl} m"
hydrocarbon = "oil"
water_density = "{rho_w} g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
{allow}
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
j_min = {j_min}
j_max = {j_max}
"""


def make(tmp_path: Path, phi, perm, rt=None, phi_unit="V/V", zones=None, depth=None, sw=None):
    """A LAS file (EKB 0: TVDSS = MD) and a project with the given zones; return (result, msgs).

    ``sw`` adds an SW curve (log water saturation) with these values.
    """
    n = len(phi)
    depth = np.round(1000.0 + np.arange(n), 1) if depth is None else depth
    rt = np.full(n, 20.0) if rt is None else rt
    cols = [depth, phi, perm, rt] + ([] if sw is None else [sw])
    rows = "\n".join(" ".join("-999.25" if not np.isfinite(v) else repr(float(v)) for v in r)
                     for r in zip(*cols))
    sw_line = "" if sw is None else "SW.V/V : water saturation\n"
    (tmp_path / "w.las").write_text(
        "~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\nNULL. -999.25 :\nWELL. BV-1 :\nEKB.M 0 :\n"
        f"~Curve\nDEPT.M : depth\nPHIE.{phi_unit} : porosity\nPERM.MD : permeability\n"
        f"RT.OHMM : resistivity\n{sw_line}~A\n{rows}\n")
    zones = zones if zones is not None else [dict(name="Z", top=990, base=1100, fwl=1050)]
    text = '[project]\nunits = "metric"\n[log_sw]\nrw = "0.05 ohm.m"\n[[wells]]\nlas = "w.las"\n'
    for z in zones:
        z = {"rho_w": 1.05, "j_min": 0.0001, "j_max": 1000.0, "allow": "", **z}
        text += ZONE.format(**z)
    (tmp_path / "p.toml").write_text(text)
    project = load_project(tmp_path / "p.toml")
    return compute_well(project, project.wells[0])


def test_porosity_outside_0_1_is_flagged_nan(tmp_path):
    phi = [0.2, 0.0, -0.05, 1.2, np.nan, 0.25] + [0.2] * 20      # few spikes: not percent
    result, msgs = make(tmp_path, phi, [100.0] * 26)
    flag, sw = result.shm.flag, result.shm.sw
    for i in (1, 2, 3, 4):
        # README (Bad input, Values): porosity missing, <= 0 or > 1 flagged 2, Sw NaN, with a note
        assert flag[i] & FLAG_BAD_POROSITY and np.isnan(sw[i]), i
    assert np.isfinite(sw[[0, 5]]).all() and not (flag[[0, 5]] & FLAG_BAD_POROSITY).any()
    assert any("values above 1" in m and "PHIE" in m for m in msgs)


def test_percent_looking_porosity_is_divided_by_100_with_a_note(tmp_path):
    phi = np.linspace(5.0, 30.0, 20)                                  # clearly percent
    result, msgs = make(tmp_path, phi, [100.0] * 20)
    # closed form: percent / 100 (values 5-30 can only be percent: common practice)
    np.testing.assert_allclose(result.phi, phi / 100.0)
    assert any("read as percent" in m for m in msgs)


def test_percent_unit_with_fraction_values_keeps_the_unit_with_a_note(tmp_path):
    phi = [0.2] * 10
    result, msgs = make(tmp_path, phi, [100.0] * 10, phi_unit="%")
    # closed form: 0.2 % = 0.002 as the declared unit says
    np.testing.assert_allclose(result.phi, 0.002)                    # the unit wins
    assert any("no value above 1" in m and "V/V" in m for m in msgs)


def test_permeability_not_positive_is_flagged_nan(tmp_path):
    k = [100.0, 0.0, -3.0, np.nan, 50.0]
    result, _ = make(tmp_path, [0.2] * 5, k)
    flag, sw = result.shm.flag, result.shm.sw
    # README (Bad input, Values): permeability missing or <= 0 flagged 4, Sw NaN
    assert all(flag[i] & FLAG_BAD_PERMEABILITY and np.isnan(sw[i]) for i in (1, 2, 3))
    assert np.isfinite(sw[[0, 4]]).all()


def test_rt_not_positive_gives_no_archie_sw(tmp_path):
    rt = [20.0, 0.0, -1.0, np.nan, 5.0]
    result, _ = make(tmp_path, [0.2] * 5, [100.0] * 5, rt=rt)
    # README (Bad input, Values): Rt <= 0 or missing gives Archie log Sw NaN there
    assert result.sw_log_source == "archie"
    assert np.isnan(result.sw_log[[1, 2, 3]]).all()
    # Archie 1942 with a=1, m=2, n=2: Sw = sqrt(Rw / (phi^2 Rt)) (archie1942; computed by hand)
    np.testing.assert_allclose(result.sw_log[[0, 4]], np.sqrt(0.05 / (0.04 * np.array([20, 5]))))
    assert np.isnan(archie_sw(np.array([0.0, -2.0]), np.array([0.2, 0.2]), 0.05)).all()


def test_nan_runs_stay_nan_and_a_zone_without_usable_samples_is_noted(tmp_path):
    phi = [0.2] * 5 + [np.nan] * 30 + [0.2] * 5
    zones = [dict(name="Up", top=990, base=1005, fwl=1060),
             dict(name="Mid", top=1005, base=1035, fwl=1060),
             dict(name="Low", top=1035, base=1050, fwl=1060)]
    result, msgs = make(tmp_path, phi, [100.0] * 40, zones=zones)
    sw = result.shm.sw
    # README (Bad input, Values): runs of missing values: each sample NaN; a zone with no usable
    # sample gives a note
    assert np.isnan(sw[5:35]).all() and np.isfinite(sw[:5]).all() and np.isfinite(sw[35:]).all()
    assert any("'Mid'" in m and "no SHM Sw" in m for m in msgs)
    assert not any("'Up'" in m and "no SHM Sw" in m for m in msgs)


def test_fwl_above_the_zone_gives_sw_one_with_a_note(tmp_path):
    result, msgs = make(tmp_path, [0.2] * 20, [100.0] * 20,
                        zones=[dict(name="Z", top=990, base=1100, fwl=900)])
    # closed form: the whole zone lies below its FWL, so Sw = 1 (hydrostatics, tiab2004)
    assert np.all(result.shm.sw == 1.0)
    assert any("at or above its shallowest sample" in m for m in msgs)


def test_fwl_below_the_well_is_noted(tmp_path):
    result, msgs = make(tmp_path, [0.2] * 20, [100.0] * 20,
                        zones=[dict(name="Z", top=990, base=1100, fwl=1900)])
    # closed form: the whole zone lies far above its FWL: h > 0, Sw < 1
    assert np.all(result.shm.hafwl > 0) and np.all(result.shm.sw < 1.0)
    assert any("below its deepest sample" in m for m in msgs)


def test_fwl_far_below_the_logs_is_refused_unless_allowed(tmp_path):
    # logged TVDSS 1000-1019 m; FWL 3000 m is ~2 km below them (plausible.RANGES fwl_margin
    # 1000 m, common practice): refused naming the key, accepted with allow_unusual = ["fwl"]
    with pytest.raises(ProjectFileError, match=r"zones\[Z\]\.fwl.*outside the logged TVDSS"):
        make(tmp_path, [0.2] * 20, [100.0] * 20, zones=[dict(name="Z", top=990, base=1100, fwl=3000)])
    result, _ = make(tmp_path, [0.2] * 20, [100.0] * 20,
                     zones=[dict(name="Z", top=990, base=1100, fwl=3000,
                                 allow='allow_unusual = ["fwl"]')])
    assert result.shm.hafwl[0] == pytest.approx(2000.0)      # 3000 - 1000 m, by hand


def test_fwl_above_the_surface_is_refused(tmp_path):
    # EKB 0 in the test LAS: the depth reference is at 0 m TVDSS; a FWL at -5 m is above it
    with pytest.raises(ProjectFileError, match=r"zones\[Z\]\.fwl"):
        make(tmp_path, [0.2] * 20, [100.0] * 20, zones=[dict(name="Z", top=990, base=1100, fwl=-5,
                                                             allow="")])


def test_zone_gap_samples_are_outside_every_zone(tmp_path):
    zones = [dict(name="A", top=990, base=1005, fwl=1060),
             dict(name="B", top=1010, base=1030, fwl=1060)]
    result, _ = make(tmp_path, [0.2] * 40, [100.0] * 40, zones=zones)
    gap = (result.tvdss >= 1005) & (result.tvdss < 1010)
    # README (Bad input, Values): gaps between zones flagged 1, no SHM values; closed form:
    # 5 one-metre samples lie in the 1005-1010 m gap
    assert gap.sum() == 5
    assert np.all(result.shm.flag[gap] & FLAG_NO_ZONE)
    assert np.isnan(result.shm.sw[gap]).all() and np.isnan(result.shm.j[gap]).all()


def test_overlapping_zones_are_an_error_naming_the_key(tmp_path):
    zones = [dict(name="A", top=990, base=1010, fwl=1060),
             dict(name="B", top=1005, base=1030, fwl=1060)]
    with pytest.raises(ProjectFileError, match=r"p\.toml, key zones\[B\].*overlaps"):
        make(tmp_path, [0.2] * 10, [100.0] * 10, zones=zones)


def test_j_outside_calibrated_range_is_flagged_and_sw_kept(tmp_path):
    k = [0.001, 100.0, 1e6] * 3
    result, _ = make(tmp_path, [0.2] * 9, k,
                     zones=[dict(name="Z", top=990, base=1100, fwl=1050, j_min=0.5, j_max=5.0)])
    j, flag, sw = result.shm.j, result.shm.flag, result.shm.sw
    lo, hi = (j > 0) & (j < 0.5), j > 5.0
    # README (Bad input, Values): J outside j_min..j_max flagged 8 or 16, Sw kept; closed form:
    # J is proportional to sqrt(k) (leverett1941): k from 0.001 mD to 1e6 mD spans both sides
    assert lo.any() and hi.any()
    assert np.all(flag[lo] & FLAG_J_BELOW_RANGE) and np.all(flag[hi] & FLAG_J_ABOVE_RANGE)
    assert np.isfinite(sw[lo | hi]).all()
    ok = (j >= 0.5) & (j <= 5.0)
    assert not (flag[ok] & (FLAG_J_BELOW_RANGE | FLAG_J_ABOVE_RANGE)).any()


@pytest.mark.parametrize("rho_w", [0.8, 0.5])
def test_delta_rho_not_positive_is_an_error_naming_the_key(tmp_path, rho_w):
    with pytest.raises(ProjectFileError, match=r"key zones\[Z\]\.water_density.*denser"):
        make(tmp_path, [0.2] * 5, [100.0] * 5,
             zones=[dict(name="Z", top=990, base=1100, fwl=1050, rho_w=rho_w,
                         allow='allow_unusual = ["water_density"]')])


def test_zone_without_usable_samples_is_not_computed_in_the_summary(tmp_path):
    # the middle zone's porosity is all null: "not computed" with a note, no 0.0 volume
    phi = [0.2] * 5 + [np.nan] * 30 + [0.2] * 5
    zones = [dict(name="Up", top=990, base=1005, fwl=1060),
             dict(name="Mid", top=1005, base=1035, fwl=1060)]
    result, _ = make(tmp_path, phi, [100.0] * 40, zones=zones)
    s = summarise(result)
    mid, up = s["zones"]["Mid"], s["zones"]["Up"]
    assert mid["status"] == "not computed" and "porosity" in mid["note"]
    assert mid["hcpt_shm"] is None and mid["hcpt_oil_log"] is None
    assert up["status"] == "ok" and up["hcpt_oil_shm"] > 0


def test_archie_exported_curve_is_clipped_statistics_use_unclipped(tmp_path):
    """Water leg (FWL 990 m above every sample: SHM Sw = 1, common practice).

    Archie (archie1942, a=1, m=2, n=2): Sw = sqrt(0.05 / (0.2^2 Rt)); Rt = 0.5 ohm.m gives
    sqrt(2.5) = 1.58114 (exported as 1), Rt = 20 gives 0.25. By hand, the mean of SHM minus
    log over 5 + 5 samples is ((1 - 1.58114) + (1 - 0.25)) / 2 = 0.084431 unclipped, where
    the clipped values would give (0 + 0.75) / 2 = 0.375.
    """
    rt = [0.5] * 5 + [20.0] * 5
    result, _ = make(tmp_path, [0.2] * 10, [100.0] * 10, rt=rt,
                     zones=[dict(name="Z", top=990, base=1100, fwl=990)])
    assert result.sw_log[:5] == pytest.approx([1.0] * 5)
    assert result.sw_log_unclipped[:5] == pytest.approx([np.sqrt(2.5)] * 5, rel=1e-12)
    z = summarise(result)["zones"]["Z"]
    assert z["samples_sw_log_clipped"] == 5
    assert z["mean_difference"] == pytest.approx((1 - np.sqrt(2.5) + 0.75) / 2, rel=1e-9)


def test_all_null_sw_curve_falls_back_to_archie_with_a_note(tmp_path):
    result, msgs = make(tmp_path, [0.2] * 10, [100.0] * 10, sw=[np.nan] * 10)
    assert result.sw_log_source == "archie"
    assert any("holds no value" in m and "Archie" in m for m in msgs)
    # Archie with Rt 20, Rw 0.05, phi 0.2: sqrt(0.05 / (0.04 * 20)) = 0.25 (by hand)
    assert result.sw_log == pytest.approx([0.25] * 10, rel=1e-12)
