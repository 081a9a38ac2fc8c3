"""Capillary arithmetic: height above the FWL <-> capillary pressure <-> Leverett J.

The one place where these conversions are written. Everything else (the per-depth
engine, core-plug conversion, contacts, plots) calls these functions.

* ``h = z_FWL - z``: height above the free-water level [m] (TVDSS positive down);
* ``Pc = (rho_w - rho_hc) g h``: two continuous fluid columns at rest that meet at the
  FWL (hydrostatics, common practice);
* ``J = Pc sqrt(k / phi) / (sigma cos theta)``: Leverett (1941);
* ``Pc_res = Pc_lab (sigma cos theta)_res / (sigma cos theta)_lab``: one rock has one
  J curve whatever the fluid pair (Leverett 1941);
* a gas cap over an oil leg: Pc and J accumulated over the two columns;
* ``r = 2 |sigma cos theta| / Pc``: the pore-throat radius entered at Pc (Washburn 1921).

Everything is SI: depth and height [m], pressure [Pa], density [kg/m^3],
permeability [m^2], sigma*cos(theta) [N/m], porosity as a fraction. Functions take
scalars or arrays (broadcast by numpy); where a result array may be written in
place, ``out`` is accepted as in numpy's ufuncs. Floating-point errors (division by
zero porosity, square roots of negative values) are the caller's to silence.

References
----------
Leverett, M. C., 1941. Capillary behavior in porous solids. Trans. AIME 142, 152-169
(key ``leverett1941``).
"""

from __future__ import annotations

import numpy as np

from .constants import STANDARD_GRAVITY

__all__ = ["height_above_fwl", "capillary_pressure_from_height", "height_from_pc",
           "leverett_j", "pc_from_j", "height_from_j", "sqrt_k_over_phi", "lab_to_reservoir_pc",
           "sigma_cos_theta_ratio", "pc_per_height", "three_phase_pc_j", "washburn_radius"]


def height_above_fwl(tvdss, fwl, out=None):
    """Height above the free-water level [m]: ``fwl - tvdss``, negative below the FWL.

    Parameters
    ----------
    tvdss : array_like
        True vertical depth below the datum of each sample [m], positive down.
    fwl : float or array_like
        Free-water level, TVDSS [m].
    out : numpy.ndarray, optional
        Where to write the result.
    """
    return np.subtract(np.asarray(fwl, dtype=float), np.asarray(tvdss, dtype=float), out=out)


def pc_per_height(rho_water, rho_hydrocarbon, g=STANDARD_GRAVITY):
    """Capillary pressure per metre above the FWL [Pa/m]: ``(rho_w - rho_hc) g``.

    Parameters
    ----------
    rho_water, rho_hydrocarbon : float or array_like
        Densities at reservoir conditions [kg/m^3].
    g : float
        Acceleration of gravity [m/s^2]; standard gravity 9.80665 (NIST SP 811).
    """
    return (np.asarray(rho_water, dtype=float) - np.asarray(rho_hydrocarbon, dtype=float)) * g


def capillary_pressure_from_height(h, rho_water, rho_hydrocarbon, g=STANDARD_GRAVITY, out=None):
    """Reservoir capillary pressure from height above the FWL [Pa].

    ``Pc = (rho_w - rho_hc) g h``: the pressure difference between the two
    continuous fluid columns at rest, which meet at the FWL (Pc = 0 there).
    Negative below the FWL; callers clip it where they need to.

    Parameters
    ----------
    h : array_like
        Height above the FWL [m].
    rho_water, rho_hydrocarbon : float or array_like
        Densities at reservoir conditions [kg/m^3].
    g : float
        Acceleration of gravity [m/s^2], standard gravity 9.80665 (3rd CGPM 1901).
    out : numpy.ndarray, optional
        Where to write the result.

    References
    ----------
    Hydrostatics of two immiscible fluids at rest (common practice).
    """
    return np.multiply(np.asarray(h, dtype=float), pc_per_height(rho_water, rho_hydrocarbon, g),
                       out=out)


def height_from_pc(pc, delta_rho, g=STANDARD_GRAVITY):
    """Height above the FWL [m] equivalent to reservoir Pc [Pa]: ``h = Pc / (delta_rho g)``.

    Parameters
    ----------
    pc : array_like
        Reservoir capillary pressure [Pa].
    delta_rho : float or array_like
        Water minus hydrocarbon density at reservoir conditions [kg/m^3], > 0.
    g : float
        Acceleration of gravity [m/s^2].
    """
    return np.asarray(pc, dtype=float) / (np.asarray(delta_rho, dtype=float) * g)


def sqrt_k_over_phi(k, phi, out=None):
    """``sqrt(k / phi)`` [m], the Leverett length scale of the pore throats.

    Parameters
    ----------
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction].
    out : numpy.ndarray, optional
        Where to write the result.
    """
    root = np.divide(np.asarray(k, dtype=float), np.asarray(phi, dtype=float), out=out)
    return np.sqrt(root, out=out)


def leverett_j(pc, k, phi, sigma_cos_theta, out=None):
    """Leverett J-function [-]: ``J = Pc sqrt(k / phi) / (sigma cos theta)``.

    Parameters
    ----------
    pc : array_like
        Capillary pressure [Pa].
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction].
    sigma_cos_theta : float or array_like
        Interfacial tension times cosine of the contact angle [N/m].
    out : numpy.ndarray, optional
        Where to write the result (may not be ``pc``).

    Returns
    -------
    numpy.ndarray
        J. In field units (Pc psi, k mD, sigma dyn/cm) the same J is
        ``0.2166 Pc sqrt(k/phi) / (sigma cos theta)`` (:data:`satheight.constants.J_FIELD_CONSTANT`).

    References
    ----------
    Leverett, M. C., 1941. Capillary behavior in porous solids. Trans. AIME 142, 152-169.
    """
    j = sqrt_k_over_phi(k, phi, out=out)
    j = np.multiply(np.asarray(pc, dtype=float), j, out=out)
    return np.divide(j, np.asarray(sigma_cos_theta, dtype=float), out=out)


def pc_from_j(j, k, phi, sigma_cos_theta):
    """Capillary pressure [Pa] from Leverett J [-]; the inverse of :func:`leverett_j`."""
    return np.asarray(j, dtype=float) * np.asarray(sigma_cos_theta, dtype=float) / \
        sqrt_k_over_phi(k, phi)


def height_from_j(j, k, phi, sigma_cos_theta, delta_rho, g=STANDARD_GRAVITY):
    """Height above the FWL [m] where a rock of ``k``, ``phi`` reaches Leverett ``j``.

    ``h = J (sigma cos theta) / (sqrt(k / phi) (rho_w - rho_hc) g)``: :func:`leverett_j`
    and :func:`capillary_pressure_from_height` solved for h.

    Parameters
    ----------
    j : float or array_like
        Leverett J [-].
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction].
    sigma_cos_theta : float
        [N/m].
    delta_rho : float
        Water minus hydrocarbon density [kg/m^3].
    g : float
        Acceleration of gravity [m/s^2].
    """
    return np.asarray(j, dtype=float) * sigma_cos_theta / (sqrt_k_over_phi(k, phi) * delta_rho * g)


def sigma_cos_theta_ratio(sct_lab, sct_res):
    """``(sigma cos theta)_res / (sigma cos theta)_lab`` [-]: multiply lab Pc by it."""
    return np.asarray(sct_res, dtype=float) / np.asarray(sct_lab, dtype=float)


def lab_to_reservoir_pc(pc_lab, sct_lab, sct_res):
    """Reservoir capillary pressure [Pa] from lab capillary pressure of the same rock.

    ``Pc_res = Pc_lab (sigma cos theta)_res / (sigma cos theta)_lab``: the J curve of
    one rock is the same in both systems (Leverett 1941).

    Parameters
    ----------
    pc_lab : array_like
        Lab capillary pressure [Pa].
    sct_lab, sct_res : float or array_like
        |sigma*cos(theta)| of the lab and reservoir systems [N/m].
    """
    return np.asarray(pc_lab, dtype=float) * sigma_cos_theta_ratio(sct_lab, sct_res)


def three_phase_pc_j(h, root, oil_column, rho_water, rho_oil, rho_gas, sct_ow, sct_gw,
                     g=STANDARD_GRAVITY):
    """Pc [Pa] and J [-] at height ``h`` above the FWL in a gas cap over an oil leg.

    With the oil column ``t`` [m] (FWL minus free-oil level), ``h_o = clip(h, 0, t)``
    and ``h_g = max(h - t, 0)``:

    * ``Pc = (rho_w - rho_o) g h_o + (rho_w - rho_g) g h_g``: the oil-water capillary
      pressure in the oil leg and, above the free-oil level, the gas-water capillary
      pressure accumulated over both columns;
    * ``J = sqrt(k/phi) [(rho_w - rho_o) g h_o / sct_ow + (rho_w - rho_g) g h_g / sct_gw]``,
      so J is continuous across the free-oil level and the gas cap follows the
      gas-water capillary scaling above it.

    Parameters
    ----------
    h : array_like
        Height above the FWL [m].
    root : array_like
        ``sqrt(k / phi)`` [m] (:func:`sqrt_k_over_phi`), NaN where unusable.
    oil_column : float or array_like
        Oil column thickness [m]; negative values count as 0.
    rho_water, rho_oil, rho_gas : float
        Densities [kg/m^3].
    sct_ow, sct_gw : float
        Oil-water and gas-water sigma*cos(theta) [N/m].

    References
    ----------
    Hydrostatics of three immiscible phases at rest; Leverett (1941) for the J
    scaling; common practice for gas caps over oil legs.
    """
    t = np.maximum(np.asarray(oil_column, dtype=float), 0.0)
    h_pos = np.maximum(np.asarray(h, dtype=float), 0.0)
    h_o = np.minimum(h_pos, t)
    h_g = h_pos - h_o
    pc_o = (rho_water - rho_oil) * g * h_o
    pc_g = (rho_water - rho_gas) * g * h_g
    return pc_o + pc_g, root * (pc_o / sct_ow + pc_g / sct_gw)


def washburn_radius(pc, sigma_cos_theta):
    """Pore-throat radius [m] entered at capillary pressure ``pc`` (Washburn 1921).

    ``r = 2 |sigma cos theta| / Pc``. With mercury sigma 480 mN/m and theta 140 deg,
    ``r[um] = 106.66 / Pc[psi]``.

    Parameters
    ----------
    pc : array_like
        Capillary pressure [Pa], > 0.
    sigma_cos_theta : float
        |sigma*cos(theta)| [N/m].

    References
    ----------
    Washburn, E. W., 1921. The dynamics of capillary flow. Physical Review 17, 273-283.
    """
    pc = np.asarray(pc, dtype=float)
    with np.errstate(divide="ignore"):
        return np.where(pc > 0, 2.0 * abs(float(sigma_cos_theta)) / pc, np.inf)
