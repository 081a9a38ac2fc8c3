"""Well trajectory from a deviation survey by the minimum-curvature method.

Conventions (used everywhere in this module):

* Measured depth ``md`` [m] is the along-hole length from the log depth reference
  (kelly bushing, drill floor or ground level), increasing downhole.
* True vertical depth ``tvd`` [m] is the vertical distance below that same
  reference, **positive down**. ``tvdss = tvd - datum_elevation`` [m] is the true
  vertical depth below the TVDSS datum (sea level), also positive down; the datum
  elevation is the height of the depth reference above the datum [m].
* ``north`` and ``east`` [m] are horizontal offsets from the well head (the point
  below the depth reference), positive to the north and to the east of the
  survey's azimuth reference (grid or true north: whatever the survey used; no
  convergence or declination correction is applied).
* Inclination [rad] is measured from vertical down (0 vertical, pi/2 horizontal,
  > pi/2 drilling upwards); azimuth [rad] clockwise from north.

Method
------
Between two stations the hole is taken as a circular arc tangent to the unit
direction vectors ``t1`` and ``t2`` of the two stations. With the dogleg angle
``beta`` between them and the course length ``L``:

* dogleg ``beta = 2 asin(|t2 - t1| / 2)`` (the chord form, accurate for small
  and large angles alike);
* ratio factor ``RF = tan(beta / 2) / (beta / 2)``, taken from its series
  ``1 + beta^2/12 + beta^4/120 + 17 beta^6/20160`` for small ``beta``, so that a
  straight segment (``beta = 0``, ``RF = 1``) divides by nothing;
* displacement over the course ``dr = L / 2 * (t1 + t2) * RF``.

Between stations, a sample at course length ``s`` along the arc has the
direction ``t(s)`` interpolated on the great circle (spherical linear
interpolation, ``t = [sin((1-f) beta) t1 + sin(f beta) t2] / sin(beta)`` with
``f = s / L``, written with ``sinc`` so that it stays finite at ``beta = 0``), and
its position is the same ratio-factor formula applied from station 1 to that
point over the length ``s`` and dogleg ``f beta``. Points between stations
therefore lie exactly on the circular arc, not on a straight line between the
station positions.

Below the last station the hole is continued straight along the last station's
direction (with a warning); above the first station nothing is assumed: callers
must tie the survey in (see :mod:`satheight.io.survey`).

References
----------
Sawaryn, S.J. and Thorogood, J.L., 2005. A compendium of directional
calculations based on the minimum curvature method. SPE Drilling & Completion
20(1), SPE 84246. (Equations as recalled from memory, re-derived here from the
circular-arc geometry above.)
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

import numpy as np

from .errors import DepthError

__all__ = ["Trajectory", "direction_vectors", "dogleg", "ratio_factor", "minimum_curvature",
           "interpolate", "vertical"]

#: Below this dogleg [rad] the ratio factor is taken from its series expansion.
_SMALL_DOGLEG = 1e-2


def direction_vectors(inc, azi):
    """Unit along-hole direction vectors (north, east, down) [-].

    Parameters
    ----------
    inc : array_like
        Inclination from vertical [rad], 0 = straight down.
    azi : array_like
        Azimuth clockwise from north [rad].

    Returns
    -------
    numpy.ndarray, shape (..., 3)
        Components (north, east, down), positive down.
    """
    inc = np.asarray(inc, dtype=float)
    azi = np.asarray(azi, dtype=float)
    s = np.sin(inc)
    return np.stack([s * np.cos(azi), s * np.sin(azi), np.cos(inc)], axis=-1)


def dogleg(t1, t2):
    """Dogleg angle between unit direction vectors [rad], ``2 asin(|t2 - t1| / 2)``.

    Parameters
    ----------
    t1, t2 : array_like, shape (..., 3)
        Unit direction vectors (north, east, down) [-].
    """
    d = np.linalg.norm(np.asarray(t2, float) - np.asarray(t1, float), axis=-1)
    return 2.0 * np.arcsin(np.clip(0.5 * d, 0.0, 1.0))


def ratio_factor(beta):
    """Minimum-curvature ratio factor ``tan(beta/2) / (beta/2)`` [-].

    Parameters
    ----------
    beta : array_like
        Dogleg angle [rad], 0 <= beta < pi.

    Returns
    -------
    numpy.ndarray
        1 for a straight segment; the series ``1 + b^2/12 + b^4/120 + 17 b^6/20160``
        is used below a dogleg of 0.01 rad (truncation error below 1e-16).
    """
    b = np.asarray(beta, dtype=float)
    small = b < _SMALL_DOGLEG
    b2 = b * b
    series = 1.0 + b2 / 12.0 + b2 * b2 / 120.0 + 17.0 * b2 ** 3 / 20160.0
    half = np.where(small, 1.0, 0.5 * b)  # placeholder where the series is used
    with np.errstate(divide="ignore", invalid="ignore"):
        exact = np.tan(half) / half
    return np.where(small, series, exact)


def _sinc(x):
    """``sin(x) / x`` with the value 1 at 0 [-]."""
    return np.sinc(np.asarray(x, float) / math.pi)


@dataclass(frozen=True)
class Trajectory:
    """Survey stations with their positions, ready for interpolation.

    Attributes
    ----------
    md : numpy.ndarray
        Station measured depths [m], strictly increasing.
    inc, azi : numpy.ndarray
        Station inclination and azimuth [rad].
    tvd, north, east : numpy.ndarray
        Station true vertical depth below the depth reference [m] (positive down)
        and horizontal offsets from the well head [m].
    source : str
        Where the survey came from (file name), for messages.
    """

    md: np.ndarray
    inc: np.ndarray
    azi: np.ndarray
    tvd: np.ndarray
    north: np.ndarray
    east: np.ndarray
    source: str = ""

    def at(self, md) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """``(tvd, north, east)`` [m] at any measured depths [m]; see :func:`interpolate`."""
        return interpolate(self, md)


def minimum_curvature(md, inc, azi, tie_in=(0.0, 0.0, 0.0), source: str = "") -> Trajectory:
    """Positions of survey stations by minimum curvature.

    Parameters
    ----------
    md : array_like
        Station measured depths [m], strictly increasing.
    inc : array_like
        Station inclinations [rad] in [0, pi].
    azi : array_like
        Station azimuths [rad].
    tie_in : tuple of float
        ``(tvd, north, east)`` [m] of the first station: TVD below the depth
        reference (positive down) and offsets from the well head. ``(0, 0, 0)``
        when the first station is the depth reference itself (MD 0).
    source : str
        Name of the survey (file) for error messages.

    Returns
    -------
    Trajectory

    Raises
    ------
    DepthError
        Fewer than one station, non-increasing MD, or a dogleg of 180 degrees
        between two stations (direction reversal: the arc is undefined).

    References
    ----------
    Sawaryn & Thorogood 2005, SPE 84246 (from memory); see the module docstring.
    """
    md = np.asarray(md, dtype=float).ravel()
    inc = np.asarray(inc, dtype=float).ravel()
    azi = np.asarray(azi, dtype=float).ravel()
    if not (md.size == inc.size == azi.size) or md.size < 1:
        raise DepthError("a survey needs at least one station with MD, inclination and azimuth",
                         where=source or None, hint="check the survey file")
    steps = np.diff(md)
    if np.any(~(steps > 0)):
        i = int(np.argmax(~(steps > 0))) + 1
        raise DepthError(f"survey MD does not increase at station {i + 1} "
                         f"({md[i - 1]:g} m then {md[i]:g} m)", where=source or None,
                         hint="stations must be in order of strictly increasing MD")
    t = direction_vectors(inc, azi)
    beta = dogleg(t[:-1], t[1:])
    if np.any(beta > math.pi - 1e-9):
        i = int(np.argmax(beta > math.pi - 1e-9)) + 1
        raise DepthError(f"the hole reverses direction between survey stations {i} and {i + 1}",
                         where=source or None, hint="check inclination and azimuth of these stations")
    rf = ratio_factor(beta)
    d = 0.5 * steps[:, None] * (t[:-1] + t[1:]) * rf[:, None]
    start = np.asarray(tie_in, dtype=float).reshape(1, 3)
    pos = np.concatenate([start[:, [1, 2, 0]], d]).cumsum(axis=0)  # (north, east, down)
    return Trajectory(md=md, inc=inc, azi=azi, tvd=pos[:, 2], north=pos[:, 0], east=pos[:, 1],
                      source=source)


def interpolate(traj: Trajectory, md) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """``(tvd, north, east)`` [m] at measured depths along the minimum-curvature arcs.

    Parameters
    ----------
    traj : Trajectory
        Stations and their positions (from :func:`minimum_curvature`).
    md : array_like
        Measured depths [m] of the points wanted (any order; NaN gives NaN).

    Returns
    -------
    tvd, north, east : numpy.ndarray
        TVD below the depth reference [m], positive down, and horizontal offsets
        from the well head [m], each of the shape of ``md``.

    Raises
    ------
    DepthError
        If a point lies above the first station (the survey does not reach it).

    Warns
    -----
    UserWarning
        If points lie below the last station: they are placed on a straight line
        along the last station's direction.
    """
    x = np.asarray(md, dtype=float)
    shape = x.shape
    x = x.ravel()
    fin = np.isfinite(x)
    if np.any(x[fin] < traj.md[0] - 1e-9):
        raise DepthError(f"depth {np.min(x[fin]):g} m lies above the first survey station "
                         f"({traj.md[0]:g} m)", where=traj.source or None,
                         hint="add survey stations above the top of the log or a tie-in "
                              "station at MD 0")
    below = fin & (x > traj.md[-1] + 1e-9)
    if np.any(below):
        warnings.warn(f"{traj.source or 'survey'}: {int(below.sum())} depths below the last "
                      f"survey station ({traj.md[-1]:g} m) were continued straight along the last "
                      "station's direction", stacklevel=2)
    t_all = direction_vectors(traj.inc, traj.azi)
    pos_all = np.stack([traj.north, traj.east, traj.tvd], axis=-1)
    n = traj.md.size
    xs = np.where(fin, x, traj.md[0])
    if n == 1:
        i = np.zeros(xs.size, dtype=int)
    else:
        i = np.clip(np.searchsorted(traj.md, xs, side="right") - 1, 0, n - 2)
    p1 = pos_all[i]
    t1 = t_all[i]
    s = xs - traj.md[i]
    if n == 1:
        out = p1 + s[:, None] * t1
    else:
        t2 = t_all[i + 1]
        length = traj.md[i + 1] - traj.md[i]
        beta = dogleg(t1, t2)
        inside = s <= length
        f = np.where(inside, s / length, 0.0)
        # spherical interpolation of the direction, finite at beta = 0
        den = _sinc(beta)
        a = (1.0 - f) * _sinc((1.0 - f) * beta) / den
        b = f * _sinc(f * beta) / den
        tf = a[:, None] * t1 + b[:, None] * t2
        tf /= np.linalg.norm(tf, axis=-1, keepdims=True)
        rf = ratio_factor(f * beta)
        arc = p1 + 0.5 * s[:, None] * (t1 + tf) * rf[:, None]
        # beyond the last station: straight along the last direction
        past = xs - traj.md[-1]
        straight = pos_all[-1] + past[:, None] * t_all[-1]
        out = np.where(inside[:, None], arc, straight)
    out[~fin] = np.nan
    return (out[:, 2].reshape(shape), out[:, 0].reshape(shape), out[:, 1].reshape(shape))


def vertical(md) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """``(tvd, north, east)`` [m] of a vertical well: TVD = MD, no horizontal offset."""
    x = np.asarray(md, dtype=float)
    return x.copy(), np.zeros_like(x), np.zeros_like(x)
