"""Three-phase columns (gas cap over oil over water), gas-water and air-water columns.

Physics checked: hydrostatics of fluids at rest (common practice): below the
free-oil level the oil-water capillary pressure (rho_w - rho_o) g h; above it the
gas-water capillary pressure accumulated over both columns,
(rho_w - rho_o) g (FWL - GOL) + (rho_w - rho_g) g (GOL - z).
"""

from __future__ import annotations

import textwrap
from pathlib import Path

import lasio
import numpy as np
import pytest

from satheight.constants import MILLIDARCY, STANDARD_GRAVITY as G
from satheight.engine import ZoneModel, column_pc_j, compute_shm
from satheight.errors import ProjectFileError
from satheight.models import build_function
from satheight.pipeline import run_project
from satheight.project import load_project

FWL, GOL = 2100.0, 2060.0
RHO_W, RHO_O, RHO_G = 1080.0, 780.0, 200.0
SCT_OW, SCT_GW = 0.026, 0.050


def zone(three_phase=True, family="power_law", params=None):
    fn = build_function(family, params or {"swirr": 0.1, "a": 0.3, "b": 1.2})
    extra = dict(gas_oil_level=GOL, gas_density=RHO_G, gas_sigma_cos_theta=SCT_GW) if three_phase else {}
    return ZoneModel("Z", 2000.0, 2120.0, FWL, RHO_W, RHO_O, "oil", SCT_OW, fn, **extra)


def profile(zn, z):
    n = z.size
    return compute_shm(z, np.full(n, 0.2), np.full(n, 50 * MILLIDARCY), [zn])


@pytest.mark.parametrize("family, params", [
    ("power_law", {"swirr": 0.1, "a": 0.3, "b": 1.2}),
    ("brooks_corey", {"swirr": 0.12, "jd": 0.2, "lam": 2.5}),
])
def test_gas_cap_sw_continuous_across_free_oil_level(family, params):
    eps = np.array([1e-3, 1e-4, 1e-6])
    zn = zone(family=family, params=params)
    above = profile(zn, GOL - eps)
    below = profile(zn, GOL + eps)
    at = profile(zn, np.array([GOL]))
    # the jump shrinks with the distance: continuity, not just closeness
    jumps = np.abs(above.sw - below.sw)
    assert jumps[-1] < 1e-6 and jumps[-1] <= jumps[0]
    assert abs(above.sw[-1] - at.sw[0]) < 1e-6
    np.testing.assert_allclose(above.j, below.j, rtol=1e-4)
    np.testing.assert_allclose(above.pc, below.pc, rtol=2e-4)
    # the whole profile: Sw never rises going up the column
    z = np.linspace(2000.0, 2119.0, 3000)
    sw = profile(zn, z).sw
    assert np.all(np.diff(sw) >= -1e-12)        # depth increases -> Sw does not decrease


def test_oil_leg_is_the_two_phase_model():
    z = np.linspace(GOL + 0.01, 2119.0, 500)
    a = profile(zone(True), z)
    b = profile(zone(False), z)
    np.testing.assert_allclose(a.sw, b.sw, rtol=1e-13)
    np.testing.assert_allclose(a.pc, b.pc, rtol=1e-13)
    np.testing.assert_allclose(a.j, b.j, rtol=1e-13)


def test_gas_cap_pc_and_j_accumulate_over_both_columns():
    z = np.array([2000.0, 2030.0, 2059.0])
    res = profile(zone(True), z)
    # hydrostatics (common practice): Pc_gw = (rw - ro) g (FWL - GOL) + (rw - rg) g (GOL - z)
    pc = (RHO_W - RHO_O) * G * (FWL - GOL) + (RHO_W - RHO_G) * G * (GOL - z)
    np.testing.assert_allclose(res.pc, pc, rtol=1e-12)
    root = np.sqrt(50 * MILLIDARCY / 0.2)
    j = root * ((RHO_W - RHO_O) * G * (FWL - GOL) / SCT_OW + (RHO_W - RHO_G) * G * (GOL - z) / SCT_GW)
    np.testing.assert_allclose(res.j, j, rtol=1e-12)
    # a gas cap holds less water than an oil column of the same height would
    two = profile(zone(False), z)
    assert np.all(res.sw <= two.sw + 1e-12)


def test_column_pc_j_broadcasts_over_candidates():
    zn = zone(True)
    h = np.array([[0.0], [20.0], [60.0]]) + np.zeros((1, 4))
    pc, j = column_pc_j(h, np.full(4, 10 * MILLIDARCY), np.full(4, 0.2), zn)
    assert pc.shape == (3, 4) and np.all(pc[0] == 0) and np.all(np.diff(pc[:, 0]) > 0)


def test_existing_two_phase_behaviour_unchanged():
    # a zone without the new fields: Pc = drho g h and Sw = 1 below the FWL (tiab2004 hydrostatics; common practice)
    zn = zone(False)
    z = np.array([2050.0, 2100.0, 2110.0])
    res = profile(zn, z)
    assert res.pc[0] == pytest.approx((RHO_W - RHO_O) * G * 50.0)
    assert res.sw[1] == 1.0 and res.sw[2] == 1.0
    assert not zn.three_phase


# ----------------------------------------------------------------------------------
# project file and a whole run
# ----------------------------------------------------------------------------------
def write_las(path: Path, z0=2000.0, n=600, step=0.2):
    las = lasio.LASFile()
    las.well["WELL"].value = "GC-1"
    las.well.append(lasio.HeaderItem("EKB", "m", 0.0, "kelly bushing"))
    md = z0 + np.arange(n) * step
    las.append_curve("DEPT", md, unit="M")
    las.append_curve("PHIE", np.full(n, 0.2), unit="V/V")
    las.append_curve("PERM", np.full(n, 50.0), unit="MD")
    las.write(str(path), version=2.0)


PROJECT = """
[project]
units = "metric"
[[wells]]
las = "gc.las"
[[zones]]
name = "Z"
top = "2000 m"
base = "2119 m"
fwl = "2100 m"
hydrocarbon = "oil"
water_density = "1.08 g/cm3"
hydrocarbon_density = "0.78 g/cm3"
sigma_cos_theta = "26 mN/m"
{extra}
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.3
b = 1.2
"""


def project(tmp_path, extra):
    write_las(tmp_path / "gc.las")
    p = tmp_path / "p.toml"
    p.write_text(PROJECT.format(extra=textwrap.dedent(extra)))
    return p


def test_three_phase_project_run(tmp_path):
    p = project(tmp_path, """
        gas_oil_level = "2060 m"
        gas_density = "0.2 g/cm3"
        gas_sigma_cos_theta = "50 mN/m"
        """)
    proj = load_project(p)
    z = proj.zones[0]
    assert (z.gas_oil_level, z.gas_density, z.gas_sigma_cos_theta) == (2060.0, 200.0, 0.050)
    rep = run_project(proj, tmp_path / "out", plot=False)
    assert not rep.failed
    las = lasio.read(str(tmp_path / "out" / "GC-1.las"))
    assert las.params["Z1_GOL"].value == pytest.approx(2060.0)
    tvd = las["TVDSS"]
    pc = las["PC_RES"] * 1e3                               # kPa -> Pa (metric output)
    i = int(np.argmin(np.abs(tvd - 2030.0)))
    expect = (RHO_W - RHO_O) * G * 40.0 + (RHO_W - RHO_G) * G * (2060.0 - tvd[i])
    assert pc[i] == pytest.approx(expect, rel=1e-5)
    sw = las["SW_SHM"]
    assert np.all(np.diff(sw[np.isfinite(sw)]) >= -1e-4)    # 5 decimals in the file


def test_gas_cap_with_correlation_gas(tmp_path):
    p = project(tmp_path, """
        gas_oil_level = "2060 m"
        gas = { gravity = 0.65 }
        conditions = { pressure = "21 MPa", temperature = "85 degC" }
        gas_sigma_cos_theta = "50 mN/m"
        """)
    from satheight import fluids

    z = load_project(p).zones[0]
    rho, _ = fluids.gas_density(21e6, 85 + 273.15, 0.65)
    assert z.gas_density == pytest.approx(float(rho))


@pytest.mark.parametrize("extra, key, words", [
    ("""gas_oil_level = "2110 m"
        gas_density = 200
        gas_sigma_cos_theta = 50""", "zones[Z].gas_oil_level", "not above the fwl"),
    ("""gas_oil_level = "2060 m"
        gas_density = "0.9 g/cm3"
        gas_sigma_cos_theta = 50""", "zones[Z].gas_density", "not less"),
    ("""gas_oil_level = "2060 m"
        gas_density = 200""", "zones[Z].gas_sigma_cos_theta", "missing"),
    ("""gas_oil_level = "2060 m"
        gas_sigma_cos_theta = 50""", "zones[Z].gas_density", "gas density"),
    ("""gas_density = 200""", "zones[Z].gas_density", "without gas_oil_level"),
])
def test_three_phase_errors(tmp_path, extra, key, words):
    p = project(tmp_path, extra)
    with pytest.raises(ProjectFileError) as ei:
        load_project(p)
    assert key in str(ei.value) and words in str(ei.value)


def test_gas_oil_level_needs_an_oil_leg(tmp_path):
    p = project(tmp_path, """
        gas_oil_level = "2060 m"
        gas_density = 200
        gas_sigma_cos_theta = 50
        """)
    p.write_text(p.read_text().replace('hydrocarbon = "oil"', 'hydrocarbon = "gas"')
                 .replace('hydrocarbon_density = "0.78 g/cm3"', 'hydrocarbon_density = "0.2 g/cm3"'))
    with pytest.raises(ProjectFileError, match="needs hydrocarbon = 'oil'"):
        load_project(p)


def test_air_water_column_with_computed_air(tmp_path):
    p = project(tmp_path, """conditions = { pressure = "0.1 MPa", temperature = "15 degC" }""")
    text = (p.read_text().replace('hydrocarbon = "oil"', 'hydrocarbon = "air"')
            .replace('hydrocarbon_density = "0.78 g/cm3"\n', ''))
    p.write_text(text)
    z = load_project(p).zones[0]
    # ideal-gas air at 0.1 MPa, 15 degC: p M / (R T) with M 28.9647 g/mol (common practice)
    assert z.hydrocarbon_density == pytest.approx(1e5 * 0.0289647 / (8.314462618 * 288.15))
    rep = run_project(p, tmp_path / "o", plot=False)
    assert not rep.failed
    c = rep.wells[0].result.summary["zones"]["Z"]["contact"]
    assert c["contact_kind"] == "top of the capillary fringe"
