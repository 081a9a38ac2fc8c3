"""Each formula against an outside source, named beside the check.

Each comment names a key of docs/references.md (the published source) and says whether the
value is published, computed here from the published equation, or recalled from memory.
"""

import math

import numpy as np
import pytest
import scipy.constants as sc

from satheight import constants as C
from satheight import units as U
from satheight.capillary import (capillary_pressure_from_height, height_above_fwl, height_from_j,
                                 height_from_pc, lab_to_reservoir_pc, leverett_j, pc_from_j,
                                 sigma_cos_theta_ratio, three_phase_pc_j)
from satheight.errors import UnitError
from satheight.logsw import archie_sw, formation_factor
from satheight.models import BrooksCorey, PowerLaw, build_function


# --- units and constants -----------------------------------------------------------

def test_psi_equals_nist_and_scipy():
    # NIST SP 811 (2008) App. B: 1 psi = 6894.757 Pa; library: scipy.constants.psi
    assert C.PSI == pytest.approx(6894.757293168, rel=1e-12)
    assert C.PSI == pytest.approx(sc.psi, rel=1e-12)


def test_standard_gravity_matches_scipy():
    # 3rd CGPM (1901); library: scipy.constants.g
    assert C.STANDARD_GRAVITY == sc.g


def test_millidarcy_in_m2():
    # NIST SP 811: 1 darcy = 9.869233e-13 m^2 (nist2008, recalled from memory)
    assert C.MILLIDARCY == pytest.approx(9.869233e-16, rel=1e-12)


def test_foot_matches_scipy():
    # international foot, NIST SP 811; library: scipy.constants.foot
    assert C.FOOT == pytest.approx(sc.foot, rel=1e-15)


def test_field_unit_j_constant():
    # nist2008: derived from the psi and the darcy: 0.216601 (textbooks print 0.2166)
    assert C.J_FIELD_CONSTANT == pytest.approx(0.216601, abs=5e-7)
    assert round(C.J_FIELD_CONSTANT, 4) == 0.2166


def test_j_same_in_si_and_field_units():
    # leverett1941 + nist2008 (computed): Pc=10 psi, k=100 mD, phi=0.2, sigma cos theta = 26 dyn/cm -> J = 1.86283
    j_si = leverett_j(10 * C.PSI, 100 * C.MILLIDARCY, 0.2, 26 * C.DYNE_PER_CM)
    j_field = C.J_FIELD_CONSTANT * 10 * math.sqrt(100 / 0.2) / 26
    assert j_si == pytest.approx(1.86283, abs=5e-6)
    assert j_field == pytest.approx(j_si, rel=1e-12)


def test_pc_from_j_inverts_j():
    # leverett1941 + nist2008 (computed): J 1.86283 at k 100 mD, phi 0.2, 26 dyn/cm is Pc 10 psi
    # (the worked value above, read backwards; rel 3e-6: J is given to 6 digits)
    pc = pc_from_j(1.86283, 100 * C.MILLIDARCY, 0.2, 26 * C.DYNE_PER_CM)
    assert pc / C.PSI == pytest.approx(10.0, rel=3e-6)
    # closed form: Pc = J sigma cos theta / sqrt(k / phi), written out for other values
    k, phi, sct = 250 * C.MILLIDARCY, 0.23, 0.026
    j = np.array([0.05, 1.0, 7.5])
    assert pc_from_j(j, k, phi, sct) == pytest.approx(j * sct / np.sqrt(k / phi), rel=1e-12)


def test_pc_from_height_reference_value():
    # tiab2004 hydrostatics + cgpm1901 (computed by hand: 250 * 9.80665 * 100): delta rho 250 kg/m3, h = 100 m -> 245166.25 Pa = 35.5584 psi
    pc = capillary_pressure_from_height(100.0, 1250.0, 1000.0)
    assert pc == pytest.approx(245166.25, rel=1e-12)
    assert pc / C.PSI == pytest.approx(35.5584, abs=5e-5)


def test_fresh_water_gradient():
    # nist2008 + cgpm1901 (computed): 1 g/cc -> 0.433528 psi/ft (trade rule 0.433: common practice)
    rho = U.parse_quantity("1 g/cm3", "density")
    grad_psi_ft = rho * C.STANDARD_GRAVITY * C.FOOT / C.PSI
    assert grad_psi_ft == pytest.approx(0.433528, abs=5e-7)
    # and the gradient text parses back to the same density
    assert U.parse_quantity(f"{grad_psi_ft} psi/ft", "density") == pytest.approx(1000.0, rel=1e-12)


def test_height_above_fwl_sign():
    # convention (common practice): h = z_FWL - z, TVDSS positive down
    assert height_above_fwl([2000.0, 2100.0], 2050.0) == pytest.approx([50.0, -50.0])


def test_chained_mercury_to_reservoir_height():
    # tiab2004 (computed): mercury Pc 100 psi, k 100 mD, phi 0.2 (sigma cos theta 367.7 dyn/cm, Purcell 1949,
    # from memory) -> J 1.31720 -> reservoir oil-brine (25.98 dyn/cm) Pc 7.06572 psi -> 65.193 ft at 0.25 g/cc
    sct_hg = 480 * math.cos(math.radians(140)) * -1 * C.DYNE_PER_CM
    sct_res = 30 * math.cos(math.radians(30)) * C.DYNE_PER_CM
    k, phi = 100 * C.MILLIDARCY, 0.2
    j = leverett_j(100 * C.PSI, k, phi, sct_hg)
    assert j == pytest.approx(1.31720, abs=5e-5)
    pc_res = pc_from_j(j, k, phi, sct_res)
    assert pc_res / C.PSI == pytest.approx(7.06572, abs=5e-5)
    h = pc_res / (250.0 * C.STANDARD_GRAVITY)
    assert h / C.FOOT == pytest.approx(65.193, abs=1e-3)


def test_lab_to_reservoir_height_chain_in_one_module():
    """The tiab2004 chained example (values computed from its textbook sigma, theta) through capillary.py.

    Lab mercury Pc 100 psi scaled by (sigma cos theta) ratio 25.98/367.7 -> 7.06572 psi;
    h = Pc / (250 kg/m3 * g) -> 65.193 ft; and J from (k, phi) at that height gives
    the lab J back (Leverett 1941: one J curve per rock).
    """
    sct_hg = 480 * -math.cos(math.radians(140)) * C.DYNE_PER_CM
    sct_res = 30 * math.cos(math.radians(30)) * C.DYNE_PER_CM
    assert sigma_cos_theta_ratio(sct_hg, sct_res) == pytest.approx(0.070657, abs=5e-7)  # tiab2004 (computed)
    pc_res = lab_to_reservoir_pc(100 * C.PSI, sct_hg, sct_res)
    assert pc_res / C.PSI == pytest.approx(7.06572, abs=5e-5)
    h = height_from_pc(pc_res, 250.0)
    assert h / C.FOOT == pytest.approx(65.193, abs=1e-3)
    k, phi = 100 * C.MILLIDARCY, 0.2
    j_lab = leverett_j(100 * C.PSI, k, phi, sct_hg)
    assert height_from_j(j_lab, k, phi, sct_res, 250.0) == pytest.approx(h, rel=1e-12)


def test_three_phase_pc_accumulates_both_columns():
    """Hand-worked: oil column 30 m, h = 50 m, rho_w 1100, rho_o 800, rho_g 200 kg/m3.

    Pc = 300 g 30 + 900 g 20 = (9000 + 18000) g = 27000 * 9.80665 = 264779.55 Pa;
    with sqrt(k/phi) = 1e-6 m, J = 1e-6 (9000 g / 0.03 + 18000 g / 0.05) = 1e-6 * 660000 g.
    At h = 10 m (oil leg only) Pc = 300 g 10 = 29419.95 Pa (hydrostatics, common practice).
    """
    g = 9.80665  # NIST SP 811 standard gravity
    pc, j = three_phase_pc_j(np.array([10.0, 50.0]), 1e-6, 30.0, 1100.0, 800.0, 200.0,
                             0.03, 0.05)
    assert pc == pytest.approx([3000 * g, 27000 * g], rel=1e-12)
    assert j[1] == pytest.approx(1e-6 * 660000 * g, rel=1e-12)


# --- Archie --------------------------------------------------------------------------

def test_archie_worked_numbers():
    # Archie 1942, Trans. AIME 146 (archie1942, computed): a=1, m=2, n=2, phi 0.2, Rw 0.05, Rt 20
    assert formation_factor(0.2, 1.0, 2.0) == pytest.approx(25.0)
    assert archie_sw(20.0, 0.2, 0.05, 1.0, 2.0, 2.0) == pytest.approx(0.25, abs=1e-12)
    assert archie_sw(20.0, 0.2, 0.05, 1.0, 2.0, 2.5) == pytest.approx(0.32988, abs=5e-6)


def test_archie_winsauer_constants():
    # Winsauer et al. 1952 a=0.62, m=2.15 (winsauer1952, from memory; computed F 19.7323, Sw 0.22211)
    assert formation_factor(0.2, 0.62, 2.15) == pytest.approx(19.7323, abs=5e-4)
    assert archie_sw(20.0, 0.2, 0.05, 0.62, 2.15, 2.0) == pytest.approx(0.22211, abs=5e-6)


def test_archie_bad_values_give_nan():
    sw = archie_sw(np.array([0.0, -1.0, np.nan, 10.0]), np.array([0.2, 0.2, 0.2, 0.0]), 0.05)
    # closed form: Rt <= 0, NaN or phi <= 0 have no Archie saturation (archie1942 needs Rt, phi > 0)
    assert np.isnan(sw).all()


# --- J-Sw functions ---------------------------------------------------------------

def test_brooks_corey_reference():
    # Brooks & Corey 1964, Hydrology Paper 3 (brooks1964, computed): Pd 5, lambda 2, Swr 0.2,
    # Pc 20 -> Se 0.0625, Sw 0.25; Sw 0.5 -> Pc 8.16497. The same form in J with jd = Pd.
    f = build_function("brooks_corey", {"swirr": 0.2, "jd": 5.0, "lam": 2.0})
    assert f.predict([20.0]) == pytest.approx([0.25], abs=1e-12)
    assert f.predict([8.16497]) == pytest.approx([0.5], abs=1e-5)
    # below entry the rock stays water-full
    # brooks1964: Se = 1 below the displacement value
    assert f.predict([4.9, 1.0]) == pytest.approx([1.0, 1.0])


def test_power_law_shape():
    # Sw = swirr + (1 - swirr) a J^-b: normalised saturation halves for each 2^(1/b) in J
    f = build_function("power_law", {"swirr": 0.1, "a": 0.3, "b": 2.0})
    sw = f.predict(np.array([1.0, math.sqrt(2.0), 1e6, 0.0, -3.0]))
    se = (sw - 0.1) / 0.9
    # closed form: Se = a J^-b = 0.3 at J = 1, 0.15 at J = sqrt(2) (b = 2), -> 0 at J = 1e6;
    # Sw = 1 at and below the FWL (J <= 0)
    assert se[0] == pytest.approx(0.3)
    assert se[1] == pytest.approx(0.15)
    assert sw[2] == pytest.approx(0.1, abs=1e-9)
    assert sw[3] == 1.0 and sw[4] == 1.0  # at and below FWL


@pytest.mark.parametrize("cls,params", [
    (PowerLaw, {"swirr": 0.12, "a": 0.35, "b": 1.4}),
    (BrooksCorey, {"swirr": 0.08, "jd": 0.15, "lam": 1.2}),
])
def test_fit_recovers_parameters(cls, params):
    # synthetic data from known parameters with noise; recovered within 4 standard errors
    rng = np.random.default_rng(7)
    j = np.geomspace(0.2, 20, 120)
    sw = np.clip(cls.equation(j, **params), 0, 1) + rng.normal(0, 0.01, j.size)
    f = cls().fit(j, sw)
    for p, v in params.items():
        # known generating parameters (params), within 4 standard errors (normal theory)
        assert abs(f.params_[p] - v) < 4 * f.stderr_[p] + 1e-9, (p, f.params_, f.stderr_)
    # known noise sd 0.01 put in; the J range of the data given (geomspace(0.2, 20))
    assert f.rmse_ == pytest.approx(0.01, rel=0.3)
    assert f.j_range_ == (pytest.approx(0.2), pytest.approx(20.0))


def test_predict_before_fit_is_an_error():
    from satheight.errors import NotFittedError

    with pytest.raises(NotFittedError):
        PowerLaw().predict([1.0])


def test_bad_parameters_named():
    from satheight.errors import ModelError

    with pytest.raises(ModelError, match="lam"):
        build_function("brooks_corey", {"swirr": 0.1, "jd": 0.2}, where="zones[A].function")
    with pytest.raises(ModelError, match="unknown J-Sw function family"):
        build_function("nope", {})
    with pytest.raises(ModelError, match="outside its allowed range"):
        build_function("power_law", {"swirr": 1.5, "a": 0.2, "b": 1.0})


# --- units practitioners meet (bara, barg, psig, kgf/cm2, ppg, nD, uD, US survey foot) ----------

def test_us_survey_foot_is_not_the_international_foot():
    # NIST SP 811 (2008) App. B: survey foot = 1200/3937 m; library: scipy.constants.survey_foot
    assert U.parse_quantity("1000 usft", "length") == pytest.approx(1000 * sc.survey_foot, rel=1e-15)
    assert U.parse_quantity("1000 ftUS", "length") == pytest.approx(304.8006096012, rel=1e-12)
    # 2 ppm apart (1200/3937 / 0.3048 = 1.000002): 10000 ft = 3048 m differ by 6.1 mm
    assert U.parse_quantity("10000 us ft", "length") - U.parse_quantity("10000 ft", "length") \
        == pytest.approx(3048 * 2e-6, abs=1e-5)


def test_absolute_pressure_units_match_scipy():
    # library: scipy.constants.bar, psi, kgf (9.80665 N); NIST SP 811: 1 kgf/cm2 = 98066.5 Pa
    assert U.parse_quantity("3 bara", "pressure") == pytest.approx(3 * sc.bar, rel=1e-15)
    assert U.parse_quantity("100 psia", "pressure") == pytest.approx(100 * sc.psi, rel=1e-12)
    assert U.parse_quantity("2 kgf/cm2", "pressure") == pytest.approx(2 * sc.kgf / 1e-4, rel=1e-15)
    assert U.parse_quantity("1 kgf/cm2", "pressure") == pytest.approx(98066.5, rel=1e-15)


def test_gauge_pressure_adds_one_atmosphere_and_is_never_taken_as_absolute():
    # NIST SP 811: 1 atm = 101325 Pa (scipy.constants.atm); gauge = absolute - 1 atm
    assert U.parse_quantity("0 psig", "pressure") == pytest.approx(sc.atm, rel=1e-15)
    assert U.parse_quantity("100 psig", "pressure") == pytest.approx(100 * sc.psi + sc.atm, rel=1e-12)
    assert U.parse_quantity("10 barg", "pressure") == pytest.approx(10 * sc.bar + sc.atm, rel=1e-15)
    assert U.from_si(sc.atm + 5 * sc.bar, "barg", "pressure") == pytest.approx(5.0, rel=1e-12)
    assert U.parse_quantity("100 psig", "pressure") != U.parse_quantity("100 psia", "pressure")
    with pytest.raises(UnitError, match="gauge"):
        U.factor("psig", "pressure")      # a bare factor would drop the atmosphere


def test_mud_weight_ppg_is_a_density_and_its_gradient():
    # NIST SP 811: lb = 0.45359237 kg, US gallon = 3.785411784 L (scipy.constants.pound, gallon);
    # trade rule (common practice): 1 ppg = 0.052 psi/ft
    rho = U.parse_quantity("10 ppg", "density")
    assert rho == pytest.approx(10 * sc.pound / sc.gallon, rel=1e-12)
    assert rho == pytest.approx(1198.264, abs=1e-3)
    assert rho / 10 * C.STANDARD_GRAVITY * C.FOOT / C.PSI == pytest.approx(0.051948, abs=1e-6)


def test_nano_and_micro_darcy():
    # 1 mD = 9.869233e-16 m2 (NIST SP 811 darcy); nD = 1e-6 mD, uD = 1e-3 mD (SI prefixes)
    assert U.parse_quantity("250 nD", "permeability") == pytest.approx(250e-6 * 9.869233e-16, rel=1e-12)
    for text in ("3 uD", "3 µD", "3 μD"):
        assert U.parse_quantity(text, "permeability") == pytest.approx(3e-3 * 9.869233e-16, rel=1e-12)
