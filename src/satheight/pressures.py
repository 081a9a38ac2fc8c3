"""Free-water level and free-oil level from formation-pressure gradients.

Per fluid, pressure versus TVDSS is a straight line ``p = c + b (z - z_ref)``
(fluid at rest: ``b = rho g``). Lines are fitted by least squares with
outlier rejection; the FWL is where the water line meets the hydrocarbon line
(oil, else gas), the free-oil level where the oil line meets the gas line.
The uncertainty of each level follows from the fit covariances by first-order
propagation (the two lines are independent fits).

All quantities SI: depth [m] TVDSS positive down, pressure [Pa], gradient [Pa/m],
density [kg/m^3].

References
----------
Hydrostatics of fluids at rest; pressure-gradient intersections for contacts
are common practice (e.g. Dake, L. P., Fundamentals of Reservoir Engineering,
chapter 1, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .constants import STANDARD_GRAVITY
from .errors import SatHeightError
from .plausible import fluid_line_problems
from .units import in_unit

__all__ = ["PressurePoints", "LineFit", "Level", "ZonePressures", "fit_gradient", "intersect", "analyse_pressures",
           "compare_levels", "DEFAULT_QUALITIES"]

#: Quality words of points used in fits by default.
DEFAULT_QUALITIES = ("good", "fair")

#: Smallest residual spread [Pa] for outlier rejection: a gauge resolution of
#: about 0.01 psi (common practice), so exact data are never rejected.
PRESSURE_RESOLUTION = 70.0


@dataclass
class PressurePoints:
    """Pressure points in SI, one entry per data row.

    Attributes
    ----------
    source : pathlib.Path
    well, fluid, quality, zone : numpy.ndarray of str
        ``zone`` is ``""`` where the file has no zone column or a blank cell.
    tvdss : numpy.ndarray
        [m], NaN where only MD was given (see :func:`satheight.io.pressures.resolve_tvdss`).
    md : numpy.ndarray
        [m], NaN where not given.
    pressure : numpy.ndarray
        [Pa].
    line : numpy.ndarray of int
        Line number in the file (1-based) of each point, for messages.
    notes : list of str
        What the reader or the MD -> TVDSS step left out or assumed, for the user.
    """

    source: Path
    well: np.ndarray
    tvdss: np.ndarray
    md: np.ndarray
    pressure: np.ndarray
    fluid: np.ndarray
    quality: np.ndarray
    zone: np.ndarray
    line: np.ndarray
    notes: list = field(default_factory=list)

    def __len__(self) -> int:
        return int(self.pressure.size)

    def subset(self, mask) -> "PressurePoints":
        """A new object with the points where ``mask`` is true."""
        m = np.asarray(mask, dtype=bool)
        return PressurePoints(self.source, self.well[m], self.tvdss[m], self.md[m],
                              self.pressure[m], self.fluid[m], self.quality[m], self.zone[m],
                              self.line[m], list(self.notes))



@dataclass
class LineFit:
    """A pressure-depth line of one fluid.

    Attributes
    ----------
    fluid : str
    gradient : float
        [Pa/m].
    gradient_se : float or None
        Standard error [Pa/m]; None with too few points (or a fixed gradient: 0).
    ref_depth : float
        Depth the intercept refers to [m] (mean depth of the used points).
    intercept : float
        Pressure at ``ref_depth`` [Pa].
    cov : numpy.ndarray
        2x2 covariance of (intercept, gradient) [Pa^2, Pa^2/m, Pa^2/m^2]; NaN if unknown.
    residual_sd : float or None
        Standard deviation of the residuals of the used points [Pa].
    dof : int
        Degrees of freedom of the fit.
    used, rejected : numpy.ndarray of int
        Indices (into the arrays given to :func:`fit_gradient`) of used and rejected points.
    fixed : bool
        True when the gradient was given, not fitted.
    """

    fluid: str
    gradient: float
    gradient_se: float | None
    ref_depth: float
    intercept: float
    cov: np.ndarray
    residual_sd: float | None
    dof: int
    used: np.ndarray
    rejected: np.ndarray
    fixed: bool = False

    @property
    def density(self) -> float:
        """Implied fluid density [kg/m^3] = gradient / g."""
        return self.gradient / STANDARD_GRAVITY

    @property
    def density_se(self) -> float | None:
        """Standard error of the implied density [kg/m^3]."""
        return None if self.gradient_se is None else self.gradient_se / STANDARD_GRAVITY

    def pressure_at(self, depth):
        """Pressure of this fluid's line at TVDSS ``depth`` [m] -> [Pa]."""
        return self.intercept + self.gradient * (np.asarray(depth, float) - self.ref_depth)

    def to_dict(self) -> dict:
        """JSON-ready summary in SI."""
        return {"fluid": self.fluid, "gradient_Pa_per_m": self.gradient,
                "gradient_se_Pa_per_m": self.gradient_se, "density_kg_m3": self.density,
                "density_se_kg_m3": self.density_se, "ref_depth_m": self.ref_depth,
                "pressure_at_ref_Pa": self.intercept, "residual_sd_Pa": self.residual_sd,
                "points_used": int(self.used.size), "points_rejected": int(self.rejected.size),
                "fixed_gradient": self.fixed}


@dataclass
class Level:
    """A free-fluid level from two intersecting lines.

    Attributes
    ----------
    kind : str
        ``"FWL"`` or ``"free-oil level"``.
    depth : float
        TVDSS [m].
    se : float or None
        Standard error [m] (first-order propagation of both fits' covariances).
    low, high : float or None
        95 % interval [m] (Student t with the smaller of the two fits' degrees of freedom).
    lines : tuple[str, str]
        The fluids whose lines meet here (denser first).
    level : float or None
        Confidence level of ``low``/``high`` (None when there is no interval).
    """

    kind: str
    depth: float
    se: float | None
    low: float | None
    high: float | None
    lines: tuple[str, str]
    level: float | None = None

    def to_dict(self) -> dict:
        return {"kind": self.kind, "depth_m": self.depth, "se_m": self.se,
                "low_m": self.low, "high_m": self.high, "lines": list(self.lines)}


@dataclass
class ZonePressures:
    """Everything fitted for one zone (pressure compartment).

    Attributes
    ----------
    zone : str
        Zone name, ``""`` for all points of a file without a zone column.
    points : PressurePoints
        The zone's points (all qualities).
    lines : dict[str, LineFit]
        Per fluid (water, oil, gas) with enough points.
    fwl, free_oil_level : Level or None
    unknown_nearest : list[tuple[int, str, float]]
        For each point of fluid ``unknown``: (index in ``points``, nearest line's
        fluid, residual [Pa]).
    notes : list[str]
        Why a line or level could not be made.
    problems : list[str]
        What is implausible about the lines' densities (gradient / g): a density outside
        the range of its phase (a gradient that only makes sense in another pressure or
        depth unit), or lines out of order (see
        :func:`satheight.plausible.fluid_line_problems`). Empty when plausible.
    """

    zone: str
    points: PressurePoints
    lines: dict[str, LineFit] = field(default_factory=dict)
    fwl: Level | None = None
    free_oil_level: Level | None = None
    unknown_nearest: list = field(default_factory=list)
    notes: list = field(default_factory=list)
    problems: list = field(default_factory=list)

    def capillary_pressure_at(self, depth):
        """Pc [Pa] at TVDSS ``depth`` [m]: hydrocarbon line minus water line (oil, else gas)."""
        hc = self.lines.get("oil") or self.lines.get("gas")
        if hc is None or "water" not in self.lines:
            raise SatHeightError("no water and hydrocarbon lines to take Pc from",
                                 where=f"zone {self.zone!r}")
        return hc.pressure_at(depth) - self.lines["water"].pressure_at(depth)


def fit_gradient(depth, pressure, fluid: str = "", *, gradient: float | None = None,
                 reject: bool = True, alpha: float = 0.05,
                 resolution: float = PRESSURE_RESOLUTION, min_points: int = 3) -> LineFit:
    """Least-squares pressure-depth line with iterative outlier rejection.

    Each round fits ``p = c + b (z - z_ref)`` and computes every point's
    externally studentised (deleted) residual ``t_i = r_i / (s_(i) sqrt(1 - h_ii))``,
    with ``s_(i)`` the residual spread without point i (never below
    ``resolution``) and ``h_ii`` its leverage. The point with the largest
    ``|t_i|`` is dropped if it exceeds the two-sided Student-t critical value at
    ``alpha / n`` (Bonferroni), while more than ``min_points`` points remain. A
    far-off point at the end of the depth range (high leverage) is caught as
    well as one in the middle; with few points only gross outliers are dropped.

    Parameters
    ----------
    depth : array_like
        TVDSS [m].
    pressure : array_like
        [Pa].
    fluid : str
        Label carried into the result.
    gradient : float, optional
        A known gradient [Pa/m]: only the intercept is fitted (for a fluid with
        one or two points).
    reject : bool
        Reject outliers (default True).
    alpha : float
        Family-wise false-rejection probability of the outlier test [-].
    resolution : float
        Smallest residual spread [Pa] (gauge resolution), so exact data are kept.
    min_points : int
        Rejection never goes below this many points.

    Returns
    -------
    LineFit

    Raises
    ------
    SatHeightError
        Fewer than 2 points (1 with a given gradient) or all at one depth.

    References
    ----------
    Cook, R. D. and Weisberg, S., 1982. Residuals and Influence in Regression.
    Chapman and Hall (externally studentised residuals; from memory).
    """
    z = np.asarray(depth, dtype=float)
    p = np.asarray(pressure, dtype=float)
    idx = np.flatnonzero(np.isfinite(z) & np.isfinite(p))
    need = 1 if gradient is not None else 2
    if idx.size < need:
        raise SatHeightError(f"{fluid or 'a fluid'} has {idx.size} usable pressure point(s); "
                             f"{need} needed for a line",
                             hint="add points or give the fluid's gradient")
    if gradient is None and np.ptp(z[idx]) <= 0:
        raise SatHeightError(f"{fluid or 'a fluid'}: all pressure points lie at one depth",
                             hint="a gradient needs points at two or more depths")
    fit, used, rejected = _fit_rejecting(z, p, idx, gradient, reject, alpha, resolution,
                                         min_points)
    c, b, zref, cov, sd, dof = fit
    se = None if gradient is None and dof <= 0 else (0.0 if gradient is not None
                                                        else float(np.sqrt(cov[1, 1])))
    return LineFit(fluid=fluid, gradient=float(b), gradient_se=se, ref_depth=float(zref),
                   intercept=float(c), cov=cov, residual_sd=sd, dof=int(dof), used=used,
                   rejected=np.array(sorted(rejected), dtype=np.int64),
                   fixed=gradient is not None)


def _fit_rejecting(z, p, idx, gradient, reject, alpha, resolution, min_points):
    """OLS fit of the points ``idx``, dropping the worst deleted-residual outlier per round.

    Returns (the :func:`_ols` tuple, used indices, rejected indices as a list).
    """
    from scipy import stats  # lazily: scipy.stats costs ~0.4 s at start

    n_par = 1 if gradient is not None else 2
    used = idx.copy()
    rejected: list[int] = []
    while True:
        fit = _ols(z[used], p[used], gradient)
        n = used.size
        if not reject or n <= max(min_points, n_par + 1):
            break
        x = z[used] - fit[2]
        r = p[used] - (fit[0] + fit[1] * x)
        lev = 1.0 / n + (0.0 if gradient is not None else x * x / float(x @ x))
        dof = n - n_par - 1
        with np.errstate(invalid="ignore", divide="ignore"):
            s2_del = (float(r @ r) - r * r / (1 - lev)) / dof
            s_del = np.maximum(np.sqrt(np.maximum(s2_del, 0.0)), resolution)
            t = np.abs(r) / (s_del * np.sqrt(np.maximum(1 - lev, 1e-12)))
        worst = int(np.nanargmax(t))
        crit = float(stats.t.ppf(1 - alpha / (2 * n), dof))
        if not t[worst] > crit:
            break
        rejected.append(int(used[worst]))
        used = np.delete(used, worst)
    return fit, used, rejected


def _ols(z, p, gradient):
    """(c, b, z_ref, cov, residual sd, dof) of p = c + b (z - z_ref)."""
    n = z.size
    zref = float(z.mean())
    x = z - zref
    if gradient is not None:
        b = float(gradient)
        c = float(np.mean(p - b * x))
        dof = n - 1
        r = p - (c + b * x)
        s2 = float(r @ r) / dof if dof > 0 else np.nan
        cov = np.array([[s2 / n, 0.0], [0.0, 0.0]])
    else:
        sxx = float(x @ x)
        b = float(x @ (p - p.mean())) / sxx
        c = float(p.mean())
        dof = n - 2
        r = p - (c + b * x)
        s2 = float(r @ r) / dof if dof > 0 else np.nan
        cov = np.array([[s2 / n, 0.0], [0.0, s2 / sxx]])   # centred: c and b uncorrelated
    sd = float(np.sqrt(s2)) if dof > 0 else None
    return c, b, zref, cov, sd, dof


def intersect(dense: LineFit, light: LineFit, kind: str = "FWL", level: float = 0.95) -> Level:
    """Depth where two pressure lines meet, with its propagated uncertainty.

    Solves ``c1 + b1 (z - r1) = c2 + b2 (z - r2)``; the variance of z follows
    from the gradient of z with respect to (c1, b1, c2, b2) and the two fits'
    covariances (independent fits).

    Parameters
    ----------
    dense, light : LineFit
        The denser fluid's line (steeper gradient) and the lighter one's.
    kind : str
        Label of the level.
    level : float
        Confidence level of the interval.

    Returns
    -------
    Level

    Raises
    ------
    SatHeightError
        If the two gradients are equal (parallel lines never meet).
    """
    db = dense.gradient - light.gradient
    if not abs(db) > 1e-12 * max(abs(dense.gradient), abs(light.gradient), 1.0):
        raise SatHeightError(f"the {dense.fluid} and {light.fluid} lines are parallel: no {kind}",
                             hint="check the fluid labels of the points")
    z = (light.intercept - dense.intercept + dense.gradient * dense.ref_depth
         - light.gradient * light.ref_depth) / db
    # F(z) = c1 - c2 + b1 (z - r1) - b2 (z - r2); dz/dtheta = -dF/dtheta / dF/dz
    g1 = -np.array([1.0, z - dense.ref_depth]) / db
    g2 = np.array([1.0, z - light.ref_depth]) / db
    var = float(g1 @ dense.cov @ g1 + g2 @ light.cov @ g2)
    if not np.isfinite(var):
        return Level(kind, float(z), None, None, None, (dense.fluid, light.fluid))
    se = float(np.sqrt(max(var, 0.0)))
    dof = min(d for d in (dense.dof, light.dof))
    from scipy import stats  # lazily: scipy.stats costs ~0.4 s at start

    q = float(stats.t.ppf(0.5 + level / 2, dof)) if dof > 0 else float("nan")
    if not np.isfinite(q):
        return Level(kind, float(z), se, None, None, (dense.fluid, light.fluid))
    return Level(kind, float(z), se, float(z - q * se), float(z + q * se),
                 (dense.fluid, light.fluid), level)


def _free_levels(res: ZonePressures, density_unit: str = "kg/m3") -> None:
    """FWL (water line meets the oil, else gas, line) and free-oil level (oil meets gas).

    A level is refused (not computed, a note says why, densities in ``density_unit``) when
    the denser phase's line is not denser than the lighter one's: the lines would meet at a
    level that does not exist.
    """
    def rho(v):
        return in_unit(v, density_unit, "density")

    w, o, g = (res.lines.get(f) for f in ("water", "oil", "gas"))
    for dense, light, kind in ((w, o or g, "FWL"), (o, g, "free-oil level")):
        if dense is None or light is None:
            continue
        if not dense.density > light.density:
            res.notes.append(f"no {kind}: the {dense.fluid} line ({rho(dense.density)}) is "
                             f"not denser than the {light.fluid} line ({rho(light.density)}); "
                             "check the fluid labels and units of the points")
            continue
        try:
            lvl = intersect(dense, light, kind)
        except SatHeightError as exc:
            res.notes.append(exc.what)
            continue
        if kind == "FWL":
            res.fwl = lvl
        else:
            res.free_oil_level = lvl
    if w is None or (o or g) is None:
        res.notes.append("no FWL: needs a water line and an oil or gas line")


def analyse_pressures(points: PressurePoints, *, qualities=DEFAULT_QUALITIES,
                      gradients: dict[str, float] | None = None, reject: bool = True,
                      alpha: float = 0.05,
                      density_unit: str = "kg/m3") -> dict[str, ZonePressures]:
    """Fit lines and find free levels per zone of a pressure file.

    Parameters
    ----------
    points : PressurePoints
        With every TVDSS filled (see :func:`satheight.io.pressures.resolve_tvdss`).
    qualities : tuple of str
        Quality words whose points are fitted.
    gradients : dict[str, float], optional
        Known gradients [Pa/m] per fluid, used for a fluid with fewer than 3
        points (only its intercept is then fitted).
    reject, alpha :
        Outlier rejection (see :func:`fit_gradient`).
    density_unit : str
        Unit of the densities in the notes and problems (the user's, e.g. ``"g/cm3"``).

    Returns
    -------
    dict[str, ZonePressures]
        By zone name (``""`` when the file has no zone column).
    """
    if np.any(np.isnan(points.tvdss)):
        raise SatHeightError("some pressure points have no TVDSS", where=str(points.source),
                             hint="resolve MD to TVDSS first (give --project)")
    gradients = dict(gradients or {})
    out: dict[str, ZonePressures] = {}
    for zone in sorted(set(points.zone)):
        zp = points.subset(points.zone == zone)
        res = ZonePressures(zone=zone, points=zp)
        ok_q = np.isin(zp.quality, list(qualities))
        for fluid in ("water", "oil", "gas"):
            sel = np.flatnonzero((zp.fluid == fluid) & ok_q)
            if sel.size == 0:
                continue
            grad = gradients.get(fluid) if sel.size < 3 else None
            try:
                lf = fit_gradient(zp.tvdss[sel], zp.pressure[sel], fluid, gradient=grad,
                                  reject=reject, alpha=alpha)
            except SatHeightError as exc:
                res.notes.append(f"{fluid}: {exc.what}")
                continue
            lf.used, lf.rejected = sel[lf.used], sel[lf.rejected]
            res.lines[fluid] = lf
        res.problems = fluid_line_problems({f: ln.density for f, ln in res.lines.items()},
                                           density_unit)
        _free_levels(res, density_unit)
        unk = np.flatnonzero(zp.fluid == "unknown")
        if unk.size and res.lines:
            names = list(res.lines)
            resid = np.array([zp.pressure[unk] - res.lines[f].pressure_at(zp.tvdss[unk])
                              for f in names])
            best = np.argmin(np.abs(resid), axis=0)
            res.unknown_nearest = [(int(i), names[b], float(resid[b, j]))
                                   for j, (i, b) in enumerate(zip(unk, best))]
        out[zone] = res
    return out


def compare_levels(a_depth: float, a_low: float | None, a_high: float | None,
                   b_depth: float, b_low: float | None, b_high: float | None) -> dict:
    """Whether two estimates of one level agree: their intervals overlap.

    Parameters
    ----------
    a_depth, a_low, a_high : float
        First estimate and its interval, TVDSS [m] (e.g. from pressures).
    b_depth, b_low, b_high : float
        Second estimate and its interval [m] (e.g. from log Sw). A missing
        interval is taken as the point itself.

    Returns
    -------
    dict
        ``{"difference_m": b - a, "consistent": bool, "gap_m": float}`` where the
        gap is the distance between the two intervals (0 if they overlap).
    """
    alo = a_depth if a_low is None else a_low
    ahi = a_depth if a_high is None else a_high
    blo = b_depth if b_low is None else b_low
    bhi = b_depth if b_high is None else b_high
    gap = max(0.0, max(alo, blo) - min(ahi, bhi))
    return {"difference_m": float(b_depth - a_depth), "consistent": bool(gap == 0.0),
            "gap_m": float(gap)}
