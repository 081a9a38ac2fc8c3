"""Fluid densities at reservoir conditions from published correlations.

Everything is SI at the interface: pressure [Pa], temperature [K], density
[kg/m^3], salinity as a NaCl mass fraction [fraction]. The correlations are
written in the units their authors used (MPa and degC, psia and degR, degF and
scf/STB) and converted inside each function.

* Brine: Batzle, M. and Wang, Z., 1992. Seismic properties of pore fluids.
  Geophysics 57(11), 1396-1408, equations 27a (pure water) and 27b (NaCl brine).
* Hydrocarbon gas: pseudo-critical properties from gas gravity by Sutton, R. P.,
  1985, SPE 14265; z-factor by Dranchuk, P. M. and Abou-Kassem, J. H., 1975,
  J. Can. Pet. Tech. 14(3) (the 11-constant fit of the Standing-Katz chart), or
  by Hall, K. R. and Yarborough, L., 1973, Oil & Gas Journal 71(25).
* Oil: Standing, M. B., 1947 / 1981, formation volume factor of saturated oil
  from solution gas-oil ratio, gas gravity, oil gravity and temperature;
  density from the mass of stock-tank oil plus dissolved gas per reservoir volume.
* Air: ideal gas (a water table in the vadose zone).

Where pressure and temperature are not given they follow from gradients
(:func:`pressure_from_gradient`, :func:`temperature_from_gradient`).

All functions are vectorised (numpy broadcasting); the iterative z-factor
solvers run a fixed small number of Newton steps on whole arrays.
"""

from __future__ import annotations

import numpy as np

from .constants import FOOT, PSI, STANDARD_GRAVITY
from .errors import SatHeightError

#: Molar gas constant [J/(mol K)]. CODATA 2018 (exact since the 2019 SI).
GAS_CONSTANT = 8.314462618

#: Molar mass of dry air [kg/mol] used to turn gas gravity into molar mass
#: (common practice: 28.9647 g/mol, e.g. ISO 2533 standard atmosphere).
AIR_MOLAR_MASS = 0.0289647

#: Density of fresh water at standard conditions used in Standing's oil density,
#: 62.4 lb/ft^3 (as in Standing's form; common practice).
WATER_LB_FT3 = 62.4

_RANKINE_PER_KELVIN = 1.8

__all__ = [
    "GAS_CONSTANT", "AIR_MOLAR_MASS",
    "brine_density_batzle_wang", "water_density_batzle_wang",
    "sutton_pseudo_critical", "z_factor_dak", "z_factor_hall_yarborough", "gas_density",
    "oil_density_standing", "standing_bo", "api_to_specific_gravity", "air_density",
    "pressure_from_gradient", "temperature_from_gradient", "Z_METHODS",
]


def _check_positive(name, value):
    v = np.asarray(value, dtype=float)
    if np.any(~(v > 0)):
        raise SatHeightError(f"{name} must be greater than zero, got {value!r}",
                             hint=f"give {name} in SI units (Pa, K) and positive")
    return v


# ----------------------------------------------------------------------------------
# water and brine
# ----------------------------------------------------------------------------------
def water_density_batzle_wang(pressure, temperature):
    """Density of pure water [kg/m^3] by Batzle & Wang (1992) eq. 27a.

    Parameters
    ----------
    pressure : float or array_like
        Pore pressure [Pa] (the fit covers about 0-100 MPa).
    temperature : float or array_like
        Temperature [K] (the fit covers about 20-350 degC).

    Returns
    -------
    numpy.ndarray
        Density [kg/m^3].

    References
    ----------
    Batzle, M. and Wang, Z., 1992. Seismic properties of pore fluids.
    Geophysics 57(11), 1396-1408, eq. 27a (T in degC, P in MPa, density in g/cm^3).
    """
    p = np.asarray(pressure, dtype=float) / 1e6
    t = np.asarray(temperature, dtype=float) - 273.15
    rho = 1.0 + 1e-6 * (-80.0 * t - 3.3 * t**2 + 0.00175 * t**3 + 489.0 * p - 2.0 * t * p
                        + 0.016 * t**2 * p - 1.3e-5 * t**3 * p - 0.333 * p**2
                        - 0.002 * t * p**2)
    return rho * 1000.0


def brine_density_batzle_wang(pressure, temperature, salinity):
    """Density of NaCl brine [kg/m^3] by Batzle & Wang (1992) eq. 27b.

    Parameters
    ----------
    pressure : float or array_like
        Pore pressure [Pa].
    temperature : float or array_like
        Temperature [K].
    salinity : float or array_like
        NaCl mass fraction [fraction] (ppm / 1e6); 0 gives pure water.

    Returns
    -------
    numpy.ndarray
        Density [kg/m^3].

    References
    ----------
    Batzle, M. and Wang, Z., 1992. Geophysics 57(11), eq. 27b:
    rho_B = rho_w + S {0.668 + 0.44 S + 1e-6 [300 P - 2400 P S
    + T (80 + 3 T - 3300 S - 13 P + 47 P S)]}, T degC, P MPa, rho g/cm^3.
    """
    s = np.asarray(salinity, dtype=float)
    if np.any((s < 0) | (s >= 1)):
        raise SatHeightError(f"salinity must be a mass fraction in [0, 1), got {salinity!r}",
                             hint='give it as a fraction (0.08), in ppm ("80000 ppm") or '
                                  'percent ("8 %")')
    p = np.asarray(pressure, dtype=float) / 1e6
    t = np.asarray(temperature, dtype=float) - 273.15
    rho_w = water_density_batzle_wang(pressure, temperature) / 1000.0
    rho = rho_w + s * (0.668 + 0.44 * s + 1e-6 * (300.0 * p - 2400.0 * p * s
                                                   + t * (80.0 + 3.0 * t - 3300.0 * s
                                                          - 13.0 * p + 47.0 * p * s)))
    return rho * 1000.0


# ----------------------------------------------------------------------------------
# gas
# ----------------------------------------------------------------------------------
def sutton_pseudo_critical(gas_gravity):
    """Pseudo-critical temperature [K] and pressure [Pa] of a hydrocarbon gas.

    Parameters
    ----------
    gas_gravity : float or array_like
        Gas specific gravity relative to air [-].

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        ``(Tpc [K], Ppc [Pa])``.

    References
    ----------
    Sutton, R. P., 1985. Compressibility factors for high-molecular-weight
    reservoir gases. SPE 14265: Tpc = 169.2 + 349.5 g - 74.0 g^2 [degR],
    Ppc = 756.8 - 131.0 g - 3.6 g^2 [psia] (coefficients from memory).
    """
    g = _check_positive("gas_gravity", gas_gravity)
    tpc_r = 169.2 + 349.5 * g - 74.0 * g**2
    ppc_psia = 756.8 - 131.0 * g - 3.6 * g**2
    return tpc_r / _RANKINE_PER_KELVIN, ppc_psia * PSI


_DAK = (0.3265, -1.0700, -0.5339, 0.01569, -0.05165, 0.5475, -0.7361, 0.1844, 0.1056,
        0.6134, 0.7210)


def z_factor_dak(ppr, tpr, iterations: int = 30):
    """Gas compressibility factor z [-] by Dranchuk & Abou-Kassem (1975).

    Solves the 11-constant equation for the reduced density
    ``rho_r = 0.27 Ppr / (z Tpr)`` with Newton steps on the whole array.

    Parameters
    ----------
    ppr : float or array_like
        Pseudo-reduced pressure [-] (valid about 0.2-30).
    tpr : float or array_like
        Pseudo-reduced temperature [-] (valid about 1.0-3.0).
    iterations : int
        Newton steps (fixed; 30 converges to machine precision in the valid range).

    Returns
    -------
    numpy.ndarray
        z [-].

    References
    ----------
    Dranchuk, P. M. and Abou-Kassem, J. H., 1975. Calculation of Z factors for
    natural gases using equations of state. J. Can. Pet. Tech. 14(3), 34-36.
    """
    a1, a2, a3, a4, a5, a6, a7, a8, a9, a10, a11 = _DAK
    ppr, tpr = np.broadcast_arrays(np.asarray(ppr, dtype=float), np.asarray(tpr, dtype=float))
    c1 = a1 + a2 / tpr + a3 / tpr**3 + a4 / tpr**4 + a5 / tpr**5
    c2 = a6 + a7 / tpr + a8 / tpr**2
    c3 = a9 * (a7 / tpr + a8 / tpr**2)
    c4 = a10 / tpr**3
    target = 0.27 * ppr / tpr
    rho = target.copy()                       # z = 1 start
    for _ in range(iterations):
        e = np.exp(-a11 * rho**2)
        z = 1 + c1 * rho + c2 * rho**2 - c3 * rho**5 + c4 * (1 + a11 * rho**2) * rho**2 * e
        f = rho * z - target
        dz = (c1 + 2 * c2 * rho - 5 * c3 * rho**4
              + c4 * e * (2 * rho + 4 * a11 * rho**3 - 2 * a11 * rho * (1 + a11 * rho**2) * rho**2))
        df = z + rho * dz
        rho = np.maximum(rho - f / df, 1e-12)
    e = np.exp(-a11 * rho**2)
    return 1 + c1 * rho + c2 * rho**2 - c3 * rho**5 + c4 * (1 + a11 * rho**2) * rho**2 * e


def z_factor_hall_yarborough(ppr, tpr, iterations: int = 50):
    """Gas compressibility factor z [-] by Hall & Yarborough (1973).

    Parameters
    ----------
    ppr, tpr : float or array_like
        Pseudo-reduced pressure and temperature [-] (Tpr >= 1).
    iterations : int
        Newton steps on the reduced density y (fixed).

    Returns
    -------
    numpy.ndarray
        z [-].

    References
    ----------
    Hall, K. R. and Yarborough, L., 1973. A new equation of state for
    Z-factor calculations. Oil & Gas Journal 71(25), 82-92 (Starling-Carnahan
    form, constants from memory).
    """
    ppr, tpr = np.broadcast_arrays(np.asarray(ppr, dtype=float), np.asarray(tpr, dtype=float))
    t = 1.0 / tpr
    a = 0.06125 * t * np.exp(-1.2 * (1 - t) ** 2)
    b = 14.76 * t - 9.76 * t**2 + 4.58 * t**3
    c = 90.7 * t - 242.2 * t**2 + 42.4 * t**3
    d = 2.18 + 2.82 * t
    y = np.full(ppr.shape, 0.001)
    for _ in range(iterations):
        f = -a * ppr + (y + y**2 + y**3 - y**4) / (1 - y) ** 3 - b * y**2 + c * y**d
        df = ((1 + 4 * y + 4 * y**2 - 4 * y**3 + y**4) / (1 - y) ** 4
              - 2 * b * y + c * d * y ** (d - 1))
        y = np.clip(y - f / df, 1e-12, 0.99)
    return a * ppr / y


#: z-factor methods by name (used by project files: ``z_method``).
Z_METHODS = {"dak": z_factor_dak, "hall_yarborough": z_factor_hall_yarborough}


def gas_density(pressure, temperature, gas_gravity, method: str = "dak"):
    """Density of a hydrocarbon gas [kg/m^3] from the real-gas law.

    ``rho = p M / (z R T)`` with ``M = gas_gravity * 28.9647 g/mol`` and z from
    Sutton pseudo-criticals and the chosen z-factor correlation.

    Parameters
    ----------
    pressure : float or array_like
        [Pa].
    temperature : float or array_like
        [K].
    gas_gravity : float or array_like
        Specific gravity relative to air [-] (methane 0.5539).
    method : str
        ``"dak"`` (Dranchuk & Abou-Kassem) or ``"hall_yarborough"``.

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        ``(density [kg/m^3], z [-])``.
    """
    if method not in Z_METHODS:
        raise SatHeightError(f"unknown z-factor method {method!r}",
                             hint="use one of " + ", ".join(Z_METHODS))
    p = _check_positive("pressure", pressure)
    t = _check_positive("temperature", temperature)
    tpc, ppc = sutton_pseudo_critical(gas_gravity)
    z = Z_METHODS[method](p / ppc, t / tpc)
    m = np.asarray(gas_gravity, dtype=float) * AIR_MOLAR_MASS
    return p * m / (z * GAS_CONSTANT * t), z


def air_density(pressure, temperature):
    """Density of dry air [kg/m^3] as an ideal gas (z = 1).

    Parameters
    ----------
    pressure : float or array_like
        [Pa].
    temperature : float or array_like
        [K].
    """
    p = _check_positive("pressure", pressure)
    t = _check_positive("temperature", temperature)
    return p * AIR_MOLAR_MASS / (GAS_CONSTANT * t)


# ----------------------------------------------------------------------------------
# oil
# ----------------------------------------------------------------------------------
def api_to_specific_gravity(api):
    """Stock-tank oil specific gravity [-] from API gravity [deg API]: 141.5 / (131.5 + API)."""
    return 141.5 / (131.5 + np.asarray(api, dtype=float))


def standing_bo(solution_gor, gas_gravity, oil_gravity, temperature):
    """Oil formation volume factor [-] of saturated oil by Standing.

    Parameters
    ----------
    solution_gor : float or array_like
        Solution gas-oil ratio Rs [m^3/m^3] (standard volumes; 1 m^3/m^3 = 5.6146 scf/STB).
    gas_gravity : float or array_like
        Dissolved-gas specific gravity relative to air [-].
    oil_gravity : float or array_like
        Stock-tank oil specific gravity relative to water [-].
    temperature : float or array_like
        [K].

    Returns
    -------
    numpy.ndarray
        Bo [reservoir volume / stock-tank volume].

    References
    ----------
    Standing, M. B., 1947. A pressure-volume-temperature correlation for mixtures
    of California oils and gases. Drill. & Prod. Prac., API. Bo = 0.9759 +
    0.000120 [Rs (gg/go)^0.5 + 1.25 T]^1.2, Rs scf/STB, T degF (from memory).
    """
    rs = np.asarray(solution_gor, dtype=float) * _SCF_PER_STB_PER_M3M3
    t_f = (np.asarray(temperature, dtype=float) - 273.15) * 1.8 + 32.0
    f = rs * np.sqrt(np.asarray(gas_gravity, float) / np.asarray(oil_gravity, float)) + 1.25 * t_f
    return 0.9759 + 0.000120 * np.power(f, 1.2)


#: scf/STB per m^3/m^3: (1 bbl = 0.158987294928 m^3, 1 ft^3 = 0.3048^3 m^3).
_SCF_PER_STB_PER_M3M3 = 0.158987294928 / FOOT**3


def oil_density_standing(api, solution_gor, gas_gravity, temperature):
    """Density of saturated oil at reservoir conditions [kg/m^3] (Standing).

    ``rho_o = (62.4 go + 0.0136 Rs gg) / Bo`` [lb/ft^3] with Rs in scf/STB:
    stock-tank oil plus dissolved gas per reservoir volume.

    Parameters
    ----------
    api : float or array_like
        Stock-tank oil gravity [deg API].
    solution_gor : float or array_like
        Rs [m^3/m^3] (standard volumes).
    gas_gravity : float or array_like
        Dissolved-gas gravity relative to air [-].
    temperature : float or array_like
        [K].

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        ``(density [kg/m^3], Bo [-])``.
    """
    go = api_to_specific_gravity(api)
    if np.any(~(go > 0)):
        raise SatHeightError(f"API gravity {api!r} gives no positive oil gravity",
                             hint="give API gravity in degrees, e.g. 35")
    bo = standing_bo(solution_gor, gas_gravity, go, temperature)
    rs = np.asarray(solution_gor, dtype=float) * _SCF_PER_STB_PER_M3M3
    rho_lb_ft3 = (WATER_LB_FT3 * go + 0.0136 * rs * np.asarray(gas_gravity, float)) / bo
    return rho_lb_ft3 * (0.45359237 / FOOT**3), bo


# ----------------------------------------------------------------------------------
# conditions from gradients
# ----------------------------------------------------------------------------------
def pressure_from_gradient(depth, gradient, surface_pressure=101325.0):
    """Pore pressure [Pa] at TVDSS ``depth`` [m] from a gradient [Pa/m].

    ``p = surface_pressure + gradient * depth`` (hydrostatic, common practice).
    A density gradient may be written as ``rho * g`` [kg/m^3 * m/s^2].
    """
    return np.asarray(surface_pressure, float) + np.asarray(gradient, float) * np.asarray(depth, float)


def temperature_from_gradient(depth, gradient, surface_temperature=288.15):
    """Temperature [K] at TVDSS ``depth`` [m] from a geothermal gradient [K/m].

    ``T = surface_temperature + gradient * depth`` (common practice).
    """
    return (np.asarray(surface_temperature, float)
            + np.asarray(gradient, float) * np.asarray(depth, float))


def hydrostatic_gradient(density, g=STANDARD_GRAVITY):
    """Pressure gradient [Pa/m] of a fluid column at rest: ``rho * g``."""
    return np.asarray(density, float) * g
