"""Core capillary-pressure data: conversions against published textbook values, corrections,
readers and their errors (file and row), rock typing (Amaefule et al. 1993).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.constants as sc

from satheight.coreplugs import (LAB_SYSTEMS, RESERVOIR_SYSTEMS, CoreDataset, Plug, closure_correction,
                            conversion_ratio, core_points, fluid_system, height_from_pc,
                            lab_to_reservoir_pc, make_curve, pick_closure_pressure,
                            stress_correct, washburn_radius, wetting_saturation_from_mercury)
from satheight.engine import leverett_j
from satheight.errors import InputFileError, SatHeightError, UnitError
from satheight.io.core_data import (file_kind, read_core_files, read_plug_table,
                                    read_pressure_steps, read_single_plug)
from satheight.rocktypes import (RockTypeRule, check_rock_type_names, fzi, normalised_porosity,
                                plug_rock_types, rqi)

MD = 9.869233e-16   # 1 mD in m^2, NIST SP 811 (darcy = 9.869233e-13 m^2)
PSI = sc.psi        # NIST SP 811, via scipy.constants
HG = LAB_SYSTEMS["mercury_air"]
OIL_RES = RESERVOIR_SYSTEMS["oil_brine"]


# --- sigma cos theta and lab -> reservoir (tiab2004, purcell1949: textbook values from memory)
def test_textbook_sigma_cos_theta_values():
    # purcell1949 (recalled from memory): mercury-air 480 dyn/cm, 140 deg -> 367.7
    assert HG.sigma_cos_theta * 1e3 == pytest.approx(367.7, abs=0.05)
    # tiab2004 (recalled from memory): oil-brine 48 dyn/cm at 30 deg -> 41.6; air-brine 72 at 0 deg;
    # reservoir oil-brine 30 at 30 deg -> 25.98; reservoir gas-brine 50 at 0 deg
    assert LAB_SYSTEMS["oil_brine"].sigma_cos_theta * 1e3 == pytest.approx(41.6, abs=0.05)
    assert LAB_SYSTEMS["air_brine"].sigma_cos_theta * 1e3 == pytest.approx(72.0)
    assert OIL_RES.sigma_cos_theta * 1e3 == pytest.approx(25.98, abs=0.005)
    assert RESERVOIR_SYSTEMS["gas_brine"].sigma_cos_theta * 1e3 == pytest.approx(50.0)


def test_conversion_ratios_from_reference_table():
    # tiab2004 + purcell1949: ratios of sigma cos theta (computed from the textbook values)
    assert conversion_ratio(HG, OIL_RES) == pytest.approx(0.070657, abs=5e-7)
    assert conversion_ratio(HG, LAB_SYSTEMS["air_brine"]) == pytest.approx(0.19581, abs=5e-6)
    assert conversion_ratio(LAB_SYSTEMS["air_brine"], OIL_RES) == pytest.approx(0.36084, abs=5e-6)


def test_chained_mercury_to_height_example():
    # tiab2004 chained example (computed), leverett1941 J, nist2008 units: Hg Pc 100 psi, k 100 mD, phi 0.2 -> J 1.31720 -> reservoir oil-brine
    # Pc 7.06572 psi -> with delta rho 0.25 g/cc, h = 19.871 m (65.193 ft)
    pc = 100 * PSI
    j = leverett_j(pc, 100 * MD, 0.2, HG.sigma_cos_theta)
    assert float(j) == pytest.approx(1.31720, abs=5e-5)
    pc_res = lab_to_reservoir_pc(pc, HG.sigma_cos_theta, OIL_RES.sigma_cos_theta)
    assert float(pc_res) / PSI == pytest.approx(7.06572, abs=5e-5)
    h = height_from_pc(pc_res, 250.0)
    assert float(h) == pytest.approx(19.871, abs=5e-4)
    assert float(h) / 0.3048 == pytest.approx(65.193, abs=5e-3)
    # leverett1941: the J of the same rock is the same in the reservoir: J 1.31720 again
    # (tiab2004 chained example, computed)
    assert float(leverett_j(pc_res, 100 * MD, 0.2, OIL_RES.sigma_cos_theta)) == pytest.approx(1.31720, abs=5e-5)


def test_washburn_radius():
    # washburn1921 r = 2 sigma cos theta / Pc with purcell1949's mercury values (computed):
    # with 480 dyn/cm and 140 deg, r[um] = 106.66 / Pc[psi]
    pc_psi = np.array([1.0, 10.0, 1000.0])
    r_um = washburn_radius(pc_psi * PSI, HG.sigma_cos_theta) * 1e6
    np.testing.assert_allclose(r_um, 106.66 / pc_psi, rtol=1e-4)


def test_fluid_system_overrides_and_errors():
    s = fluid_system("mercury_air", sigma=0.485)              # keeps 140 deg
    # closed form: sigma |cos theta| with the given sigma and purcell1949's 140 deg
    assert s.sigma_cos_theta == pytest.approx(0.485 * abs(math.cos(math.radians(140))))
    assert fluid_system("oil_brine", sigma_cos_theta=0.026).sigma_cos_theta == 0.026
    with pytest.raises(SatHeightError, match="unknown fluid system 'kerosene_air'"):
        fluid_system("kerosene_air")
    assert fluid_system("kerosene_air", sigma=0.025, theta=0.0).sigma_cos_theta == 0.025
    with pytest.raises(SatHeightError, match="> 0"):
        fluid_system("oil_brine", sigma_cos_theta=-1.0)


# --- mercury corrections
def test_wetting_saturation_from_mercury():
    # closed form: Sw = 1 - S_Hg (two phases fill the pores)
    np.testing.assert_allclose(wetting_saturation_from_mercury([0.0, 0.3, 1.0]), [1.0, 0.7, 0.0])


def test_closure_correction_recovers_true_intrusion():
    # closed form worked here: inverting s_obs = c + (1 - c) s_true gives s_true back;
    # conformance c fills before closure; above it s_obs = c + (1 - c) s_true
    pc = np.geomspace(1, 1000, 31) * PSI
    s_true = np.clip((np.log10(pc / PSI) - 1.5) / 1.5, 0, 1) ** 2
    c, closure = 0.04, pc[13]                      # a measured step, 10^1.3 = 19.95 psi
    s_obs = np.where(pc <= closure, c * np.log(pc / PSI) / np.log(closure / PSI),
                     c + (1 - c) * s_true)
    corrected = closure_correction(pc, s_obs, closure)
    np.testing.assert_allclose(corrected[pc > closure], s_true[pc > closure], atol=1e-12)
    assert np.all(corrected[pc <= closure] == 0)
    # the rule picks the knee between conformance and entry (20-31.6 psi here)
    picked = pick_closure_pressure(pc, s_obs)
    assert 15 * PSI <= picked <= 32 * PSI
    # nothing to correct below the first step
    # closed form: a closure below the first step changes nothing (c = 0)
    np.testing.assert_array_equal(closure_correction(pc, s_obs, 0.5 * PSI), s_obs)


def _brooks_corey_mercury(j, swirr=0.12, jd=0.2, lam=2.5):
    """Mercury saturation of a Brooks-Corey rock (Brooks and Corey 1964): 0 below the
    entry J, ``1 - swirr - (1 - swirr) (J/jd)^-lam`` above it."""
    sw = np.where(j >= jd, swirr + (1 - swirr) * (np.maximum(j, jd) / jd) ** -lam, 1.0)
    return 1.0 - sw


def test_auto_closure_leaves_clean_mercury_data_without_closure_as_measured():
    # a clean mercury curve with no conformance: nothing before the entry but noise.
    # The auto closure must apply (close to) none: the Brooks-Corey fit after it stays
    # within half a standard error of the fit of the data as measured.
    from satheight.models import BrooksCorey

    pc = np.geomspace(1, 20000, 30) * PSI
    j = leverett_j(pc, 30 * MD, 0.2, HG.sigma_cos_theta)
    for seed in range(12):
        s = _brooks_corey_mercury(j)
        if seed:                                   # seed 0: exact data
            s = s + np.random.default_rng(seed).normal(0.0, 0.005, j.size)   # 0.5 % noise
        cp = pick_closure_pressure(pc, s)
        raw = BrooksCorey().fit(j, 1 - s)
        auto = BrooksCorey().fit(j, 1 - closure_correction(pc, s, cp))
        moved = max(abs(auto.params_[p] - raw.params_[p]) / raw.stderr_[p] for p in raw.params_)
        assert moved < 0.5, (seed, cp / PSI, moved)


def test_auto_closure_takes_the_end_of_a_conformance_plateau():
    # conformance of 2.7 % fills by 11 psi, then a plateau to the entry near 60 psi (the
    # shape of the demo's mercury curves): closure is picked at the top of the plateau,
    # not at its first flat step, so the whole conformance is removed
    pc = np.array([1, 1.407, 1.98, 2.786, 3.92, 5.515, 7.76, 10.92, 15.36, 21.62, 30.42, 42.8,
                   60.22, 84.73, 119.2, 167.8, 236, 332.1]) * PSI
    s = np.array([0, 1.02, 1.02, 1.45, 1.45, 1.45, 1.45, 2.71, 2.71, 2.71, 2.71, 2.71, 3.27,
                  12.2, 38.18, 55.5, 67.51, 75.36]) / 100
    assert pick_closure_pressure(pc, s) == pytest.approx(42.8 * PSI)


def test_auto_closure_is_reported_per_curve():
    # one entry per mercury curve; a clean curve gets its first pressure (nothing removed)
    pc = np.geomspace(1, 20000, 30) * PSI
    j = leverett_j(pc, 30 * MD, 0.2, HG.sigma_cos_theta)
    plugs = {"A": Plug("A", "W", 2000.0, 0.2, 30 * MD)}
    curve = make_curve("A", "mercury_air", pc, 1 - _brooks_corey_mercury(j), range(30), "x.csv")
    ds = CoreDataset(plugs=plugs, curves=[curve], files={})
    pts = core_points(ds, closure="auto")
    assert pts.closure == {"A/mercury_air": pytest.approx(pc[0])}


def test_stress_correction_factors():
    phi, k = stress_correct(0.2, 100 * MD, 0.95, 0.7)
    # closed form: factors multiply, 0.2 * 0.95 and 100 mD * 0.7
    assert phi == pytest.approx(0.19) and k == pytest.approx(70 * MD)
    with pytest.raises(SatHeightError, match="stress factor"):
        stress_correct(0.2, 1.0, 0.0, 1.0)


# --- RQI / FZI (amaefule1993, SPE 26436; values computed from the published definitions)
def test_rqi_constant_and_values():
    # amaefule1993 (computed with nist2008's darcy):
    # 0.0314 = sqrt(1 mD in um^2): 0.0314153
    assert rqi(MD, 1.0) == pytest.approx(0.0314153, abs=5e-8)
    rounded = 0.0314 / 0.0314153   # the paper's rounded constant vs our exact SI form
    assert rqi(100 * MD, 0.20) * rounded == pytest.approx(0.70213, abs=5e-6)
    assert normalised_porosity(0.20) == pytest.approx(0.25)
    assert fzi(100 * MD, 0.20) * rounded == pytest.approx(2.80850, abs=5e-5)
    assert rqi(1 * MD, 0.10) * rounded == pytest.approx(0.099296, abs=5e-7)
    assert fzi(1 * MD, 0.10) * rounded == pytest.approx(0.89366, abs=5e-6)


def test_fzi_classes_same_rule_on_plugs_and_logs():
    rule = RockTypeRule("fzi", None, (1.0, 2.5), ("poor", "fair", "good"))
    phi = np.array([0.10, 0.20, 0.20, np.nan, 0.2])
    k = np.array([1.0, 100.0, 20.0, 10.0, -1.0]) * MD
    # amaefule1993 (computed by hand):
    # FZI 0.894 -> poor, 2.81 -> good, sqrt(20/0.2)*0.0314153/0.25 = 1.2566 -> fair
    np.testing.assert_array_equal(rule.classify(phi, k), ["poor", "good", "fair", "", ""])
    plugs = {f"P{i}": Plug(f"P{i}", "W", 0.0, float(phi[i]), float(k[i])) for i in range(3)}
    # amaefule1993: the same FZI classes as the logs above (computed by hand)
    assert plug_rock_types(plugs, rule) == {"P0": "poor", "P1": "good", "P2": "fair"}
    # round trip: no outside value, the rule must survive being written and read
    # round trip through the model file form
    assert RockTypeRule.from_dict(rule.to_dict()) == rule


def test_permeability_classes_default_names():
    rule = RockTypeRule("permeability", None, (1 * MD, 10 * MD))
    # the names documented in the README (class edges in mD, nist2008); 0.5 < 1 <= 1 < 10 <= 50
    assert rule.names == ("k < 1 mD", "k 1-10 mD", "k >= 10 mD")
    np.testing.assert_array_equal(rule.classify([0.2, 0.2, 0.2], np.array([0.5, 1.0, 50]) * MD),
                                  ["k < 1 mD", "k 1-10 mD", "k >= 10 mD"])


def test_column_rule_cannot_classify_logs_and_needs_values():
    rule = RockTypeRule("column", "facies")
    with pytest.raises(SatHeightError, match="cannot be computed from logs"):
        rule.classify([0.2], [1e-13])
    plugs = {"P1": Plug("P1", "W", 0.0, 0.2, 1e-13, extra={"facies": ""}, source="plugs.csv, row 4")}
    with pytest.raises(SatHeightError, match="plugs.csv, row 4"):
        plug_rock_types(plugs, rule)


def test_bad_class_edges():
    with pytest.raises(SatHeightError, match="increasing"):
        RockTypeRule("fzi", None, (2.0, 1.0))
    with pytest.raises(SatHeightError, match="class names"):
        RockTypeRule("fzi", None, (1.0,), ("a",))


# --- readers
STEPS = """# test data
plug,system,pc [psi],snw [%]
P1,mercury_air,1,0
P1,mercury_air,10,5
P1,mercury_air,100,60
P1,mercury_air,1000,88
P2,air_brine,2,0
P2,air_brine,20,40
"""
PLUGS = """plug,well,depth [ft],porosity [%],permeability [mD],grain_density [g/cm3],rock_type,facies
P1,W-1,6500,21.0,120,2.65,A,channel
P2,W-1,6510.5,18.5,15,,B,bar
"""


def _write(tmp_path, name, text):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def test_read_steps_and_plugs(tmp_path):
    steps = _write(tmp_path, "steps.csv", STEPS)
    plugs = _write(tmp_path, "plugs.csv", PLUGS)
    # README (Core-data files): the layout of each file is told by its columns
    assert file_kind(steps) == "steps" and file_kind(plugs) == "plugs"
    curves = read_pressure_steps(steps)
    c1 = curves[0]
    # nist2008: psi -> Pa; Sw = 1 - snw/100 (closed form, the table's % values)
    np.testing.assert_allclose(c1.pc, np.array([1, 10, 100, 1000]) * PSI)
    np.testing.assert_allclose(c1.sw, [1.0, 0.95, 0.40, 0.12])
    assert c1.rows == (3, 4, 5, 6) and c1.system == "mercury_air"
    table = read_plug_table(plugs)
    # nist2008: ft -> m, % -> fraction, mD -> m^2, g/cm3 -> kg/m3 of the table's row P1
    assert table["P1"].depth == pytest.approx(6500 * 0.3048)
    assert table["P1"].porosity == pytest.approx(0.21)
    assert table["P1"].permeability == pytest.approx(120 * MD)
    assert table["P1"].grain_density == pytest.approx(2650.0)
    assert table["P2"].grain_density is None
    assert table["P1"].extra == {"facies": "channel"}
    ds = read_core_files([steps, plugs])
    # SHA-256 (FIPS 180-4): a hex digest has 64 characters
    assert set(ds.files) == {"steps.csv", "plugs.csv"} and all(len(h) == 64 for h in ds.files.values())
    pts = core_points(ds, closure=None, reservoir=OIL_RES, delta_rho=300.0,
                      rock_types=plug_rock_types(ds.plugs, RockTypeRule("column", "facies")))
    # J from each plug's own phi and k (leverett1941, SI), written out here:
    # J = Pc sqrt(k / phi) / (sigma cos theta), P1: k 120 mD, phi 0.21, mercury-air 0.3677 N/m
    np.testing.assert_allclose(pts.j[:4], c1.pc * math.sqrt(120 * MD / 0.21) / HG.sigma_cos_theta,
                               rtol=1e-12)
    assert list(pts.rock_type[[0, 4]]) == ["channel", "bar"]
    # tiab2004 + purcell1949: mercury -> reservoir oil-brine ratio 0.070657 (computed)
    np.testing.assert_allclose(pts.pc_res[:4], c1.pc * 0.070657, rtol=1e-5)   # reference ratio
    # washburn1921 applies to mercury curves only (air-brine plug P2: NaN)
    assert np.isnan(pts.throat_radius[4]) and np.isfinite(pts.throat_radius[0])


def test_single_plug_file(tmp_path):
    p = _write(tmp_path, "one.csv", "# plug = S1\n# well = W-2\n# depth = 2000 m\n"
                                    "# porosity = 0.2\n# permeability = 0.05 D\n"
                                    "# system = air_brine\npc [kPa],sw [%]\n10,100\n50,45\n200,20\n")
    # README (Core-data files): a single-plug file with # key = value lines
    assert file_kind(p) == "single"
    plug, curve = read_single_plug(p)
    # nist2008: 0.05 D = 50 mD; kPa -> Pa; % -> fraction (the file's values)
    assert plug.plug_id == "S1" and plug.permeability == pytest.approx(50 * MD)
    np.testing.assert_allclose(curve.sw, [1.0, 0.45, 0.2])
    np.testing.assert_allclose(curve.pc, [1e4, 5e4, 2e5])
    ds = read_core_files([p])
    assert list(ds.plugs) == ["S1"]


@pytest.mark.parametrize("text, match, row", [
    ("plug,pc [psi],snw [%]\nP1,1,0\nP1,10,50\nP1,5,60\n", "not increasing", 4),
    ("plug,pc [psi],sw [frac]\nP1,1,1.0\nP1,10,0.5\nP1,20,0.7\n", "rises", 4),
    ("plug,pc [psi],sw [frac]\nP1,1,1.0\nP1,10,1.4\n", r"outside \[0, 1\]", 3),
    ("plug,pc [psi],sw\nP1,1,1.0\nP1,ten,0.5\n", "not a number", 3),
    ("plug,pc [psi],sw\nP1,1,1.0\nP1,10\n", "fields", 3),
    ("plug,pc [psi],sw\nP1,1,1.0\nP1,0,0.5\n", "not positive", 3),
    ("plug,pc [furlong],sw\nP1,1,1.0\n", "unknown unit 'furlong'", 1),
    ("plug,pc,sw\nP1,1,1.0\n", "no unit", 1),
])
def test_step_errors_name_file_and_row(tmp_path, text, match, row):
    p = _write(tmp_path, "bad.csv", text)
    with pytest.raises(SatHeightError, match=match) as e:
        read_pressure_steps(p, default_system="air_brine")
    # README (Bad input, CSV files): core steps errors name the file and row
    assert f"{p}, row {row}" in str(e.value)


def test_missing_plug_names_file_and_row(tmp_path):
    steps = _write(tmp_path, "steps.csv", STEPS)
    plugs = _write(tmp_path, "plugs.csv", PLUGS.replace("P2,W-1", "P9,W-1"))
    with pytest.raises(SatHeightError, match="'P2' has pressure steps but is not in any plug table") as e:
        read_core_files([steps, plugs])
    # README (Bad input, CSV files): the row of the first step of the missing plug (P2, row 7)
    assert f"{steps}, row 7" in str(e.value)


def test_plug_table_errors(tmp_path):
    p = _write(tmp_path, "plugs.csv", PLUGS.replace("21.0", "210"))
    with pytest.raises(SatHeightError, match=r"porosity 210 is outside \(0, 1\)") as e:
        read_plug_table(p)
    # README (Bad input, CSV files): core plugs: porosity outside (0, 1), a plug listed twice:
    # error naming the row
    assert f"{p}, row 2" in str(e.value)
    p = _write(tmp_path, "plugs2.csv", PLUGS + "P1,W-1,6520,20,10,,A,x\n")
    with pytest.raises(SatHeightError, match="listed twice") as e:
        read_plug_table(p)
    assert f"{p}, row 4" in str(e.value)
    p = _write(tmp_path, "plugs3.csv", "plug,well,porosity,permeability [mD]\nP1,W,0.2,10\n")
    with pytest.raises(InputFileError, match="no column depth") as e:
        read_plug_table(p)
    assert f"{p}, row 1" in str(e.value)
    p = _write(tmp_path, "plugs4.csv", "plug,well,depth [m],porosity,permeability [mD/s]\nP1,W,1,0.2,10\n")
    with pytest.raises(UnitError, match="mD/s"):
        read_plug_table(p)


def test_unknown_system_and_missing_file(tmp_path):
    steps = _write(tmp_path, "s.csv", "plug,system,pc [psi],sw\nP1,kerosene,1,1\nP1,kerosene,2,0.5\n")
    plugs = _write(tmp_path, "p.csv", PLUGS)
    with pytest.raises(SatHeightError, match="unknown lab fluid system 'kerosene'") as e:
        read_core_files([steps, plugs])
    # README (Bad input, CSV files): an unknown fluid system names the row
    assert f"{steps}, row 2" in str(e.value)
    with pytest.raises(InputFileError, match="not found"):
        read_core_files([tmp_path / "nope.csv"])


def test_unrecognised_layout(tmp_path):
    p = _write(tmp_path, "x.csv", "a,b\n1,2\n")
    with pytest.raises(InputFileError, match="layout") as e:
        read_core_files([p])
    assert f"{p}, row 1" in str(e.value)


def test_inputs_untouched(tmp_path):
    steps = _write(tmp_path, "steps.csv", STEPS)
    plugs = _write(tmp_path, "plugs.csv", PLUGS)
    before = (steps.read_bytes(), plugs.read_bytes())
    ds = read_core_files([steps, plugs])
    core_points(ds)
    # common practice (the project's rule): inputs are never modified
    assert (steps.read_bytes(), plugs.read_bytes()) == before


def test_make_curve_needs_two_steps():
    with pytest.raises(SatHeightError, match="2 steps|at least two"):
        make_curve("P", "air_brine", [1.0], [1.0], [5], "f.csv")


def test_dataset_warns_about_plugs_without_curves():
    ds = CoreDataset(plugs={"P": Plug("P", "W", 0, 0.2, 1e-13, source="p.csv, row 2")}, curves=[])
    # README (Fitting): a plug without a curve is noted
    assert "has no capillary-pressure curve" in ds.validate()[0]


def test_option_naming_a_rock_type_that_matches_nothing_is_refused_with_known_names():
    known = ["Lower Sand", "Upper Sand"]
    check_rock_type_names(["Upper Sand", "*"], known, "--reservoir")      # fine
    with pytest.raises(SatHeightError) as e:
        check_rock_type_names(["Uper Sand", "Upper Sand"], known, "--reservoir")
    msg = str(e.value)
    assert "'Uper Sand'" in msg and "--reservoir" in msg
    assert "'Lower Sand'" in msg and "'Upper Sand'" in msg        # the known names listed
    with pytest.raises(SatHeightError, match="'\\*'"):
        check_rock_type_names(["*"], known, "--models", wildcard=None)
