"""Fluid densities from correlations (satheight.fluids) and their project-file keys.

Outside values come from the published correlations (keys of docs/references.md:
batzle1992, sutton1985, dranchuk1975, hall1973, standing1942, standing1947), and from two general-purpose reference libraries: iapws (IAPWS-95
water) and CoolProp (methane equation of state; Melinder NaCl brine tables).
"""

from __future__ import annotations

import textwrap

import CoolProp.CoolProp as CP
import iapws
import numpy as np
import pytest

from satheight import fluids
from satheight.constants import PSI, FOOT, STANDARD_GRAVITY
from satheight.errors import ProjectFileError, SatHeightError
from satheight.project import load_project

K0 = 273.15
MPA = 1e6
#: methane gas gravity: 16.043 / 28.9647 (molar masses; common practice)
METHANE_GRAVITY = 16.043 / 28.9647


# ----------------------------------------------------------------------------------
# brine (Batzle & Wang 1992)
# ----------------------------------------------------------------------------------
@pytest.mark.parametrize("t_c, p_mpa, expected", [
    (80.0, 30.0, 985.675),     # batzle1992 eq. 27a, computed
    (20.0, 0.1, 997.14),
    (150.0, 50.0, 943.33),
    (200.0, 100.0, 921.17),
])
def test_batzle_wang_pure_water_reference_values(t_c, p_mpa, expected):
    rho = fluids.water_density_batzle_wang(p_mpa * MPA, t_c + K0)
    # batzle1992 eq. 27a (computed; values in the parametrize list)
    assert float(rho) == pytest.approx(expected, abs=0.01)


@pytest.mark.parametrize("t_c, p_mpa", [(80.0, 30.0), (20.0, 0.1), (150.0, 50.0), (200.0, 100.0)])
def test_batzle_wang_pure_water_against_iapws95(t_c, p_mpa):
    # library: iapws IAPWS-95; bound +-3 kg/m3 (batzle1992 accuracy)
    ref = iapws.IAPWS95(T=t_c + K0, P=p_mpa).rho
    rho = float(fluids.water_density_batzle_wang(p_mpa * MPA, t_c + K0))
    assert abs(rho - ref) <= 3.0


@pytest.mark.parametrize("s, expected", [(0.1, 1054.983), (0.2, 1128.627)])
def test_batzle_wang_brine_reference_values(s, expected):
    # batzle1992 eq. 27b at 80 degC, 30 MPa (one term recalled from memory; computed)
    rho = float(fluids.brine_density_batzle_wang(30 * MPA, 80 + K0, s))
    assert rho == pytest.approx(expected, abs=0.01)


@pytest.mark.parametrize("t_c", [20.0, 30.0, 38.0])
@pytest.mark.parametrize("s", [0.05, 0.1, 0.2])
def test_batzle_wang_brine_against_independent_nacl_model(t_c, s):
    # library: CoolProp incompressible NaCl(aq) (Melinder tables, valid to 40 degC);
    # (melinder2010); bound +-5 kg/m3 (batzle1992 accuracy)
    ref = CP.PropsSI("D", "T", t_c + K0, "P", 1e6, f"INCOMP::MNA[{s}]")
    rho = float(fluids.brine_density_batzle_wang(1e6, t_c + K0, s))
    assert abs(rho - ref) <= 5.0


def test_brine_with_zero_salinity_is_pure_water_and_salt_makes_it_denser():
    p, t = 20 * MPA, 70 + K0
    # batzle1992: eq. 27b with S = 0 is eq. 27a (every salinity term vanishes); rel 1e-12, not
    # exact: the two polynomials are evaluated in different orders (last-digit differences)
    assert float(fluids.brine_density_batzle_wang(p, t, 0.0)) == pytest.approx(
        float(fluids.water_density_batzle_wang(p, t)), rel=1e-12)
    rho = fluids.brine_density_batzle_wang(p, t, np.array([0.0, 0.05, 0.1, 0.2]))
    # batzle1992: brine density rises with salinity at fixed p, T (all terms in S positive here)
    assert np.all(np.diff(rho) > 0)


def test_brine_rejects_salinity_outside_fraction():
    with pytest.raises(SatHeightError, match="salinity"):
        fluids.brine_density_batzle_wang(1e6, 300.0, 80000)


# ----------------------------------------------------------------------------------
# gas (Sutton pseudo-criticals, DAK and Hall-Yarborough z)
# ----------------------------------------------------------------------------------
def test_dak_standing_katz_chart_point():
    # standing1942: Standing-Katz chart at Ppr 2, Tpr 1.5 reads z ~ 0.82 (from memory);
    # dranchuk1975: DAK 0.8215 (computed)
    assert float(fluids.z_factor_dak(2.0, 1.5)) == pytest.approx(0.8215, abs=5e-4)
    assert float(fluids.z_factor_dak(2.0, 1.5)) == pytest.approx(0.82, abs=0.01)
    assert float(fluids.z_factor_hall_yarborough(2.0, 1.5)) == pytest.approx(0.82, abs=0.01)


def test_z_factor_tends_to_one_at_low_pressure():
    # ideal-gas limit (common practice): z -> 1 as Ppr -> 0
    for fn in (fluids.z_factor_dak, fluids.z_factor_hall_yarborough):
        assert float(fn(0.01, 1.7)) == pytest.approx(1.0, abs=2e-3)


def test_methane_density_reference_values():
    # dranchuk1975 + sutton1985 (computed): methane 100 degC, 30 MPa: z 0.9931, rho 156.21;
    # hall1973: 156.55;
    # 60 degC, 10 MPa: DAK 64.16
    rho, z = fluids.gas_density(30 * MPA, 100 + K0, METHANE_GRAVITY, "dak")
    assert float(z) == pytest.approx(0.9931, abs=1e-4)
    assert float(rho) == pytest.approx(156.21, abs=0.02)
    rho_hy, _ = fluids.gas_density(30 * MPA, 100 + K0, METHANE_GRAVITY, "hall_yarborough")
    assert float(rho_hy) == pytest.approx(156.55, abs=0.05)
    rho2, _ = fluids.gas_density(10 * MPA, 60 + K0, METHANE_GRAVITY)
    assert float(rho2) == pytest.approx(64.16, abs=0.02)


@pytest.mark.parametrize("method", ["dak", "hall_yarborough"])
@pytest.mark.parametrize("t_c, p_mpa", [(100.0, 30.0), (60.0, 10.0), (80.0, 20.0)])
def test_methane_density_against_coolprop(method, t_c, p_mpa):
    # library: CoolProp methane reference equation of state; (setzmann1991); bound +-2 %
    ref = CP.PropsSI("D", "T", t_c + K0, "P", p_mpa * MPA, "Methane")
    rho, _ = fluids.gas_density(p_mpa * MPA, t_c + K0, METHANE_GRAVITY, method)
    assert abs(float(rho) / ref - 1) <= 0.02


def test_gas_density_is_vectorised_and_checks_inputs():
    p = np.array([5, 10, 20, 40]) * MPA
    rho, z = fluids.gas_density(p, 90 + K0, 0.65)
    # closed form: gas density rises with pressure at fixed temperature (z varies slowly)
    assert rho.shape == (4,) and np.all(np.diff(rho) > 0)
    with pytest.raises(SatHeightError, match="z-factor"):
        fluids.gas_density(1e7, 350.0, 0.65, "nonsense")
    with pytest.raises(SatHeightError, match="pressure"):
        fluids.gas_density(-1.0, 350.0, 0.65)


def test_air_density_ideal_gas():
    # ISA sea level: 1.225 kg/m3 at 101325 Pa, 15 degC (ISO 2533; common practice)
    assert float(fluids.air_density(101325.0, 288.15)) == pytest.approx(1.225, abs=1e-3)


# ----------------------------------------------------------------------------------
# oil (Standing)
# ----------------------------------------------------------------------------------
def test_standing_oil_reference_values():
    # standing1947: 35 API, Rs 500 scf/STB, gas gravity 0.75, 200 degF:
    # Bo 1.29784, rho 717.5 kg/m3 (44.790 lb/ft3) (Standing, from memory; computed)
    rs = 500 * FOOT**3 / 0.158987294928          # scf/STB -> m3/m3 (1 bbl = 0.158987 m3)
    t = (200 - 32) / 1.8 + K0
    rho, bo = fluids.oil_density_standing(35.0, rs, 0.75, t)
    assert float(bo) == pytest.approx(1.29784, abs=2e-5)
    assert float(rho) == pytest.approx(717.5, abs=0.1)
    lb_ft3 = float(rho) / (0.45359237 / FOOT**3)
    assert lb_ft3 == pytest.approx(44.790, abs=0.005)


def test_api_gravity():
    # API definition: 141.5 / (131.5 + API); 10 API is water (common practice)
    assert float(fluids.api_to_specific_gravity(10.0)) == pytest.approx(1.0)


def test_conditions_from_gradients():
    # closed form: p = p0 + grad * depth = 1e5 + 1e4 * 1000; T = 288.15 + 0.03 * 2000
    assert float(fluids.pressure_from_gradient(1000.0, 10e3, 1e5)) == pytest.approx(1.01e7)
    assert float(fluids.temperature_from_gradient(2000.0, 0.03, 288.15)) == pytest.approx(348.15)


# ----------------------------------------------------------------------------------
# project-file keys
# ----------------------------------------------------------------------------------
BASE = """
[project]
units = "metric"
[[wells]]
las = "{las}"
[[zones]]
name = "Z"
top = "1000 m"
base = "1100 m"
fwl = "1080 m"
sigma_cos_theta = "26 mN/m"
{zone}
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
"""


@pytest.fixture()
def las(tmp_path):
    p = tmp_path / "w.las"
    p.write_text("~Version\nVERS. 2.0:\nWRAP. NO:\n~Well\nSTRT.M 1000:\nSTOP.M 1001:\n"
                 "STEP.M 1:\nNULL. -999.25:\nWELL. W:\n~Curve\nDEPT.M :\nPHIE.V/V :\n"
                 "~A\n1000 0.2\n1001 0.2\n")
    return p


def write(tmp_path, las, zone):
    p = tmp_path / "p.toml"
    p.write_text(BASE.format(las=las.name, zone=textwrap.dedent(zone)))
    return p


def test_project_correlation_densities(tmp_path, las):
    p = write(tmp_path, las, """
        hydrocarbon = "oil"
        water = { salinity = "100000 ppm" }
        oil = { api = 35, solution_gor = "500 scf/stb", gas_gravity = 0.75 }
        conditions = { pressure = "30 MPa", temperature = "80 degC" }
        """)
    z = load_project(p).zones[0]
    # batzle1992 eq. 27b (computed): brine S = 0.1 at 80 degC, 30 MPa: 1054.983 kg/m3
    assert z.water_density == pytest.approx(1054.983, abs=0.01)
    # standing1947 written out (closed form): 80 degC = 176 degF, oil gravity 141.5 / 166.5,
    # Bo = 0.9759 + 0.000120 [Rs (gg/go)^0.5 + 1.25 T]^1.2, rho = (62.4 go + 0.0136 Rs gg) / Bo
    # lb/ft3, 1 lb/ft3 = 0.45359237 / 0.3048^3 kg/m3 (nist2008)
    go = 141.5 / (131.5 + 35)
    bo = 0.9759 + 0.000120 * (500 * (0.75 / go) ** 0.5 + 1.25 * 176.0) ** 1.2
    rho_o = (62.4 * go + 0.0136 * 500 * 0.75) / bo * 0.45359237 / 0.3048**3
    assert z.hydrocarbon_density == pytest.approx(rho_o, rel=1e-9)
    assert z.fluids["water"]["salinity"] == pytest.approx(0.1)


def test_project_conditions_from_gradients_at_fwl(tmp_path, las):
    p = write(tmp_path, las, """
        hydrocarbon = "gas"
        water_density = "1.05 g/cm3"
        gas = { gravity = 0.6, z_method = "hall_yarborough" }
        conditions = { pressure_gradient = "0.45 psi/ft", temperature_gradient = "30 degC/km", surface_temperature = "10 degC" }
        """)
    z = load_project(p).zones[0]
    depth = 1080.0                                    # the zone's FWL
    pres = 101325.0 + 0.45 * PSI / FOOT * depth        # default surface pressure 1 atm
    temp = 283.15 + 0.030 * depth
    # library: CoolProp, a methane-ethane mixture of gravity 0.6 (x_CH4 = 0.9048 from the molar
    # masses 16.043, 30.069, 28.9647 g/mol; kunz2012) at those conditions; bound +-3 %: the
    # correlation's accuracy for lean gases (sutton1985, hall1973), measured -1.0 % here
    x = (30.069 - 0.6 * 28.9647) / (30.069 - 16.043)
    ref = CP.PropsSI("D", "T", temp, "P", pres, f"HEOS::Methane[{x}]&Ethane[{1 - x}]")
    assert z.hydrocarbon_density == pytest.approx(ref, rel=0.03)
    assert z.fluids["conditions"]["pressure_Pa"] == pytest.approx(pres)
    assert z.fluids["conditions"]["temperature_K"] == pytest.approx(temp)


def test_project_field_units_temperature_gradient(tmp_path, las):
    p = write(tmp_path, las, """
        hydrocarbon = "air"
        water_density = "1.0 g/cm3"
        conditions = { pressure = "0.1 MPa", temperature_gradient = "1.6 degF/100ft", depth = "0 m", surface_temperature = "20 degC" }
        """)
    z = load_project(p).zones[0]
    # closed form: ideal gas rho = p M / (R T), M = 28.9647 g/mol (dry air, common practice),
    # R = 8.314462618 J/(mol K) (codata2018), at the surface: 0.1 MPa and 20 degC
    assert z.hydrocarbon_density == pytest.approx(1e5 * 0.0289647 / (8.314462618 * 293.15), rel=1e-6)


@pytest.mark.parametrize("zone, key, words", [
    ("""hydrocarbon = "oil"
        hydrocarbon_density = 780""", "zones[Z].water_density", "missing"),
    ("""hydrocarbon = "oil"
        water_density = 1080
        water = { salinity = 0.05 }
        hydrocarbon_density = 780""", "zones[Z].water", "both"),
    ("""hydrocarbon = "oil"
        water = { salinity = 0.05 }
        hydrocarbon_density = 780""", "zones[Z].conditions", "conditions"),
    ("""hydrocarbon = "oil"
        water = { salinity = 80000 }
        hydrocarbon_density = 780
        conditions = { pressure = "30 MPa", temperature = "80 degC" }""", "zones[Z].water.salinity", "ppm"),
    ("""hydrocarbon = "oil"
        water = { salinity = "8 mg/l" }
        hydrocarbon_density = 780
        conditions = { pressure = "30 MPa", temperature = "80 degC" }""", "zones[Z].water.salinity", "salinity unit"),
    ("""hydrocarbon = "gas"
        water_density = 1080
        oil = { api = 35, solution_gor = 0, gas_gravity = 0.7 }""", "zones[Z].oil", "hydrocarbon"),
    ("""hydrocarbon = "oil"
        water_density = 1080
        oil = { api = 35 }
        conditions = { pressure = "30 MPa", temperature = "80 degC" }""", "zones[Z].oil.solution_gor", "missing"),
    ("""hydrocarbon = "oil"
        water_density = 1080
        oil = { api = 35, solution_gor = "5 bananas", gas_gravity = 0.7 }
        conditions = { pressure = "30 MPa", temperature = "80 degC" }""", "zones[Z].oil.solution_gor", "gas-oil ratio"),
    ("""hydrocarbon = "gas"
        water_density = 1080
        gas = { gravity = 0.6 }
        conditions = { pressure = "30 MPa" }""", "zones[Z].conditions.temperature", "temperature"),
    ("""hydrocarbon = "gas"
        water_density = 1080
        gas = { gravity = 0.6 }
        conditions = { pressure = "30 MPa", temperature_gradient = "30 degC" }""", "zones[Z].conditions.temperature_gradient", "gradient"),
    ("""hydrocarbon = "gas"
        water_density = 1080
        gas = { gravity = 0.6, z_method = "guess" }
        conditions = { pressure = "30 MPa", temperature = "80 degC" }""", "zones[Z].gas.z_method", "choice"),
])
def test_project_fluid_errors_name_the_key(tmp_path, las, zone, key, words):
    p = write(tmp_path, las, zone)
    with pytest.raises(ProjectFileError) as ei:
        load_project(p)
    msg = str(ei.value)
    # README (Bad input, Project file): every bad value names the file and the key
    assert key in msg and str(p) in msg
    assert words in msg


def test_hydrostatic_gradient_round_trip():
    # 1 g/cc fresh water: 0.433528 psi/ft (nist2008 + cgpm1901, computed: 1000 * 9.80665 * 0.3048 / 6894.757)
    g = float(fluids.hydrostatic_gradient(1000.0))
    assert g / (PSI / FOOT) == pytest.approx(0.433528, abs=1e-6)
    assert g == pytest.approx(1000.0 * STANDARD_GRAVITY)


def test_unit_parsers_of_fluid_keys():
    from satheight.project.fluid_keys import parse_gor, parse_salinity, parse_temperature_gradient

    # 1.6 degF per 100 ft = 1.6 * 5/9 K per 30.48 m (unit definitions)
    assert parse_temperature_gradient("1.6 degF/100ft", "degC/km") == pytest.approx(
        1.6 * 5 / 9 / 30.48)
    assert parse_temperature_gradient(30, "degC/km") == pytest.approx(0.030)
    assert parse_salinity("80000 ppm") == pytest.approx(0.08)
    assert parse_salinity("8 %") == pytest.approx(0.08)
    # 1 m3/m3 = 5.614583 scf/STB (1 bbl = 0.158987 m3, 1 ft3 = 0.0283168 m3)
    assert parse_gor("5.614583 scf/stb", "m3/m3") == pytest.approx(1.0, rel=1e-6)
    assert parse_gor(100, "m3/m3") == pytest.approx(100.0)


# --- densities derived from pressure lines, and lab sigma*cos(theta) (plausible.RANGES) ------

def test_pressure_line_densities_outside_their_phase_or_out_of_order_are_named():
    from satheight.plausible import fluid_line_problems
    # 0.433 psi/ft water (NIST SP 811 psi, ft; / g): 999.5 kg/m3; oil 0.33 psi/ft: 761.7 kg/m3
    psi_ft = 6894.757293168 / 0.3048 / 9.80665
    assert fluid_line_problems({"water": 0.433 * psi_ft, "oil": 0.33 * psi_ft}) == []
    # a gradient read in kPa/m where psi/ft was meant: 0.433 kPa/m -> 44.2 kg/m3, fits no phase
    probs = fluid_line_problems({"water": 433.0 / 9.80665, "oil": 0.33 * psi_ft})
    assert any("water line" in p and "no phase fits" in p for p in probs)
    assert any("not denser" in p for p in probs)
    # a "water" line lighter than the "oil" line, both in range of some phase
    probs = fluid_line_problems({"water": 980.0, "oil": 990.0})
    assert probs == ["the water line (980 kg/m3) is not denser than the oil line (990 kg/m3)"]


def test_lab_sigma_cos_theta_and_density_difference_outside_their_ranges_are_refused():
    from satheight.coreplugs import RESERVOIR_SYSTEMS, fluid_system
    from satheight.errors import SatHeightError
    # 367.7 mN/m (mercury, purcell1949 values 480 mN/m, 140 deg) is a plausible lab value
    assert fluid_system("mercury_air", sigma=0.480).sigma_cos_theta == pytest.approx(0.3677, abs=1e-4)
    with pytest.raises(SatHeightError, match="did you mean 26 mN/m"):
        fluid_system("oil_brine", sigma_cos_theta=26.0)          # 26 N/m: mN/m meant
    with pytest.raises(SatHeightError, match="outside the plausible range 1 to 100 mN/m"):
        fluid_system("oil_brine", RESERVOIR_SYSTEMS, sigma_cos_theta=0.3)
