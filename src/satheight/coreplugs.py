"""Core-plug capillary-pressure data: data model, validation, conversions, corrections.

From lab capillary-pressure curves of core plugs to points (J, Sw) ready for fitting:

1. lab fluid system of each curve (mercury-air, air-brine, oil-brine, gas-brine,
   air-oil) with its interfacial tension sigma and contact angle theta, or
   sigma*cos(theta) as one number (:data:`LAB_SYSTEMS`, textbook common values,
   overridable per dataset);
2. mercury injection: mercury saturation -> wetting-phase saturation
   (:func:`wetting_saturation_from_mercury`); closure (conformance) correction
   (:func:`closure_correction`, :func:`pick_closure_pressure`); pore-throat radius
   by Washburn (:func:`satheight.capillary.washburn_radius`);
3. lab -> reservoir capillary pressure by the sigma*cos(theta) ratio, equivalent
   height above the FWL (:mod:`satheight.capillary`, re-exported here);
4. Leverett J of every point from the plug's own porosity and permeability,
   optionally stress-corrected (:func:`stress_correct`);
5. fit one or more J-Sw families per rock type (:func:`fit_rock_types`).

Everything is SI inside: pressure [Pa], sigma*cos(theta) [N/m], permeability
[m^2], depth [m], porosity and saturation as fractions, angles [rad].
"""

from __future__ import annotations

import hashlib
import math
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from . import constants as C
from .capillary import (height_from_pc, lab_to_reservoir_pc, leverett_j,  # noqa: F401
                        sigma_cos_theta_ratio, washburn_radius)
from .errors import ModelError, SatHeightError
from .models import FAMILIES, get_family, select_family
from .plausible import require_plausible

# ----------------------------------------------------------------------------------
# fluid systems

@dataclass(frozen=True)
class FluidSystem:
    """A pair of fluids with their interfacial tension and contact angle.

    Attributes
    ----------
    name : str
        Key such as ``"mercury_air"``.
    sigma : float or None
        Interfacial tension [N/m].
    theta : float or None
        Contact angle through the wetting phase [rad].
    sigma_cos_theta_given : float or None
        sigma*cos(theta) [N/m] given as one number (then sigma, theta may be None).
    source : str
        Where the values come from.
    """

    name: str
    sigma: float | None = None
    theta: float | None = None
    sigma_cos_theta_given: float | None = None
    source: str = ""

    @property
    def sigma_cos_theta(self) -> float:
        """|sigma*cos(theta)| [N/m]: the magnitude that scales capillary pressure.

        For mercury (theta > 90 deg) the cosine is negative; as is usual, the
        magnitude is used as one number (common practice).
        """
        if self.sigma_cos_theta_given is not None:
            return abs(float(self.sigma_cos_theta_given))
        return abs(float(self.sigma) * math.cos(float(self.theta)))

    def to_dict(self) -> dict:
        """JSON-ready: sigma [mN/m], theta [deg], sigma_cos_theta [mN/m]."""
        return {"name": self.name,
                "sigma_mN_per_m": None if self.sigma is None else self.sigma * 1e3,
                "theta_deg": None if self.theta is None else math.degrees(self.theta),
                "sigma_cos_theta_mN_per_m": self.sigma_cos_theta * 1e3,
                "source": self.source}


_MEM = "textbook common value (e.g. Tiab & Donaldson, Petrophysics), from memory"

#: Lab fluid systems: textbook common values (sigma [N/m], theta [rad]); from memory.
LAB_SYSTEMS: dict[str, FluidSystem] = {
    "mercury_air": FluidSystem("mercury_air", 0.480, math.radians(140.0),
                               source=_MEM + "; Purcell (1949) Trans. AIME 186"),
    "air_brine": FluidSystem("air_brine", 0.072, 0.0, source=_MEM),
    "gas_brine": FluidSystem("gas_brine", 0.072, 0.0,
                             source=_MEM + "; lab gas (air or nitrogen) taken as air-brine"),
    "oil_brine": FluidSystem("oil_brine", 0.048, math.radians(30.0), source=_MEM),
    "air_oil": FluidSystem("air_oil", 0.024, 0.0, source=_MEM),
}

#: Reservoir fluid systems: textbook common values; from memory.
RESERVOIR_SYSTEMS: dict[str, FluidSystem] = {
    "oil_brine": FluidSystem("oil_brine", 0.030, math.radians(30.0), source=_MEM),
    "gas_brine": FluidSystem("gas_brine", 0.050, 0.0, source=_MEM),
}

#: Systems whose saturation column is the mercury (non-wetting) saturation by default.
MERCURY_SYSTEMS = ("mercury_air",)


def fluid_system(name: str, table: dict[str, FluidSystem] | None = None, *, sigma=None,
                 theta=None, sigma_cos_theta=None, where: str = "") -> FluidSystem:
    """A fluid system from a defaults table, with optional overrides.

    Parameters
    ----------
    name : str
        Key of ``table`` (default :data:`LAB_SYSTEMS`). An unknown name is allowed
        only with ``sigma_cos_theta`` or both ``sigma`` and ``theta``.
    sigma : float, optional
        Interfacial tension [N/m].
    theta : float, optional
        Contact angle [rad].
    sigma_cos_theta : float, optional
        sigma*cos(theta) [N/m] as one number; wins over sigma and theta.

    Raises
    ------
    SatHeightError
        Unknown system without values, or non-positive values.
    """
    table = LAB_SYSTEMS if table is None else table
    base = table.get(name)
    if sigma_cos_theta is not None:
        if not sigma_cos_theta > 0:
            raise SatHeightError(f"sigma*cos(theta) of {name} must be > 0, got {sigma_cos_theta}",
                                 where=where or None, hint="give its magnitude, e.g. 26 mN/m")
        return _plausible(FluidSystem(name, None, None, float(sigma_cos_theta), source="given"),
                          table, where)
    if sigma is None and theta is None:
        if base is None:
            raise SatHeightError(f"unknown fluid system {name!r}", where=where or None,
                                 hint="use one of " + ", ".join(table)
                                      + ", or give its sigma and theta or sigma*cos(theta)")
        return base
    s = sigma if sigma is not None else (base.sigma if base else None)
    t = theta if theta is not None else (base.theta if base else None)
    if s is None or t is None:
        raise SatHeightError(f"fluid system {name!r} needs both sigma and theta",
                             where=where or None, hint="give both, or sigma*cos(theta)")
    if not s > 0:
        raise SatHeightError(f"interfacial tension of {name} must be > 0, got {s}",
                             where=where or None)
    return _plausible(FluidSystem(name, float(s), float(t), None, source="given"), table, where)


def _plausible(system: FluidSystem, table: dict, where: str) -> FluidSystem:
    """A given lab or reservoir system whose sigma*cos(theta) lies in its plausible range."""
    sct = system.sigma_cos_theta
    require_plausible("sigma_cos_theta" if table is RESERVOIR_SYSTEMS else "lab_sigma_cos_theta",
                      sct, f"sigma*cos(theta) of {system.name}", sct, "N/m", written=True,
                      where=where or None)
    return system


def conversion_ratio(lab: FluidSystem, reservoir: FluidSystem) -> float:
    """``(sigma cos theta)_res / (sigma cos theta)_lab`` [-]; multiply lab Pc by it."""
    return float(sigma_cos_theta_ratio(lab.sigma_cos_theta, reservoir.sigma_cos_theta))


# ----------------------------------------------------------------------------------
# mercury injection

def wetting_saturation_from_mercury(s_hg):
    """Wetting-phase saturation [fraction] from mercury (non-wetting) saturation.

    In a mercury-air test air is the wetting phase it displaces: ``Sw = 1 - S_Hg``.
    """
    return 1.0 - np.asarray(s_hg, dtype=float)


def closure_correction(pc, s_nw, closure_pc):
    """Remove the apparent intrusion below the closure pressure and renormalise.

    At low pressure mercury first fills the rough surface and the space around the
    plug (conformance), which is not pore volume. With ``s_c`` the non-wetting
    saturation at the closure pressure (interpolated in log Pc),
    ``s_corr = (s_nw - s_c) / (1 - s_c)``, and 0 at and below closure.

    Parameters
    ----------
    pc : array_like
        Injection pressures of one curve [Pa], increasing.
    s_nw : array_like
        Non-wetting (mercury) saturation [fraction].
    closure_pc : float
        Closure pressure [Pa]; at or below the first step nothing changes.

    Returns
    -------
    numpy.ndarray
        Corrected non-wetting saturation [fraction], in [0, 1].
    """
    pc = np.asarray(pc, dtype=float)
    s = np.asarray(s_nw, dtype=float)
    if not closure_pc > pc[0]:
        return s.copy()
    s_c = float(np.interp(np.log(closure_pc), np.log(pc), s))
    if s_c >= 1.0:
        raise SatHeightError(f"closure pressure {closure_pc / C.PSI:g} psi is past full intrusion",
                             hint="pick a lower closure pressure")
    out = (s - s_c) / (1.0 - s_c)
    return np.clip(np.where(pc <= closure_pc, 0.0, out), 0.0, 1.0)


#: Smallest conformance [fraction of pore volume] taken as a closure plateau: below
#: it the curve is left as measured (a rule of our own; noise of about 0.5 % is usual).
MIN_CONFORMANCE = 0.01


def pick_closure_pressure(pc, s_nw) -> float:
    """Pick the closure pressure of a mercury curve [Pa] (a simple rule of our own).

    The main entry into the pore system is the step with the largest intrusion per
    decade of pressure. Below it, conformance shows as a rise followed by a
    plateau of small intrusion; closure is taken at the top of the flattest step
    below the entry (the highest of equally flat ones: the end of the plateau).
    Where the data show no plateau, nothing is corrected (the first pressure is
    returned): no step below the entry, or the mercury saturation at that step is
    below :data:`MIN_CONFORMANCE` or within three times the scatter of the
    saturation below the entry (a clean curve with noise has no conformance).

    Parameters
    ----------
    pc : array_like
        Injection pressures [Pa], increasing.
    s_nw : array_like
        Mercury saturation [fraction].
    """
    pc = np.asarray(pc, dtype=float)
    s = np.asarray(s_nw, dtype=float)
    if pc.size < 3:
        return float(pc[0])
    rate = np.diff(s) / np.diff(np.log10(pc))     # intrusion per decade, per interval
    entry = int(np.argmax(rate))
    if entry == 0:
        return float(pc[0])
    knee = entry - 1 - int(np.argmin(rate[:entry][::-1]))
    steps = np.diff(s[:entry + 1])
    scatter = 1.4826 * float(np.median(np.abs(steps - np.median(steps)))) / np.sqrt(2.0)
    if not s[knee + 1] > max(MIN_CONFORMANCE, 3.0 * scatter):
        return float(pc[0])
    return float(pc[knee + 1])


def stress_correct(phi, k, phi_factor: float = 1.0, k_factor: float = 1.0):
    """Porosity and permeability at reservoir stress from lab values: multiply by factors.

    Parameters
    ----------
    phi : array_like
        Lab (ambient) porosity [fraction].
    k : array_like
        Lab permeability [m^2].
    phi_factor, k_factor : float
        Ratios stressed/ambient [-], in (0, 1.5] (typically 0.9-1.0 and 0.5-1.0).
    """
    for name, f in (("porosity", phi_factor), ("permeability", k_factor)):
        if not 0 < f <= 1.5:
            raise SatHeightError(f"{name} stress factor {f} is outside (0, 1.5]",
                                 hint="give the ratio of stressed to ambient value, e.g. 0.95")
    return np.asarray(phi, dtype=float) * phi_factor, np.asarray(k, dtype=float) * k_factor


# ----------------------------------------------------------------------------------
# data model

@dataclass(frozen=True)
class Plug:
    """One core plug.

    Attributes
    ----------
    plug_id : str
    well : str
    depth : float
        Sample depth [m] (as measured in the well, MD).
    porosity : float
        [fraction], 0 < phi < 1.
    permeability : float
        [m^2], > 0.
    grain_density : float or None
        [kg/m^3].
    rock_type : str or None
    extra : dict[str, str]
        Other plug-table columns (available for grouping).
    source : str
        File and row the plug was read from.
    sw : float or None
        Water saturation measured on the plug (e.g. Dean-Stark) [fraction], if given.
    """

    plug_id: str
    well: str
    depth: float
    porosity: float
    permeability: float
    grain_density: float | None = None
    rock_type: str | None = None
    extra: dict = field(default_factory=dict)
    source: str = ""
    sw: float | None = None


@dataclass(frozen=True)
class PcCurve:
    """One capillary-pressure curve of one plug in one lab system.

    Attributes
    ----------
    plug_id : str
    system : str
        Lab fluid-system key (:data:`LAB_SYSTEMS` or a dataset override).
    pc : numpy.ndarray
        Capillary pressure of each step [Pa], strictly increasing.
    sw : numpy.ndarray
        Wetting-phase saturation [fraction], non-increasing.
    rows : tuple of int
        File line of each step.
    source : str
        The file.
    """

    plug_id: str
    system: str
    pc: np.ndarray
    sw: np.ndarray
    rows: tuple = ()
    source: str = ""


def make_curve(plug_id, system, pc, sw, rows, source, unit: tuple = ("Pa", 1.0)) -> PcCurve:
    """Validated :class:`PcCurve` (drainage: Pc strictly increasing, Sw non-increasing);
    ``unit``: the file's pressure unit and its size [Pa], to show steps as read.

    Raises
    ------
    SatHeightError
        Naming the file and the row of the first offending step.
    """
    pc = np.asarray(pc, dtype=float)
    sw = np.asarray(sw, dtype=float)
    rows = tuple(int(r) for r in rows)
    if pc.size < 2:
        raise SatHeightError(f"plug {plug_id!r} ({system}) has {pc.size} pressure step(s)",
                             where=f"{source}, row {rows[0]}" if rows else source,
                             hint="give at least two steps per curve")
    bad = np.flatnonzero(np.diff(pc) <= 0)
    if bad.size:
        i = bad[0] + 1
        a, b = (f"{pc[j] / unit[1]:.6g} {unit[0]}" for j in (i - 1, i))
        raise SatHeightError(f"plug {plug_id!r}: pressure steps are not increasing ({a} then {b})",
                             where=f"{source}, row {rows[i]}",
                             hint="list the drainage steps of a plug in increasing pressure, "
                                  "without repeats")
    bad = np.flatnonzero(np.diff(sw) > 1e-9)
    if bad.size:
        i = bad[0] + 1
        raise SatHeightError(f"plug {plug_id!r}: wetting saturation rises from {sw[i - 1]:.4g} to "
                             f"{sw[i]:.4g} as pressure increases",
                             where=f"{source}, row {rows[i]}",
                             hint="a drainage curve must not gain wetting phase; check the row "
                                  "or whether the column holds the other phase")
    return PcCurve(str(plug_id), str(system), pc, sw, rows, str(source))


@dataclass
class CoreDataset:
    """Plugs and their capillary-pressure curves, with where they came from.

    Attributes
    ----------
    plugs : dict[str, Plug]
    curves : list[PcCurve]
    files : dict[str, str]
        File name -> sha256 hex digest of its bytes (provenance).
    systems : dict[str, FluidSystem]
        Lab systems used by the curves (defaults plus dataset overrides).
    """

    plugs: dict
    curves: list
    files: dict = field(default_factory=dict)
    systems: dict = field(default_factory=lambda: dict(LAB_SYSTEMS))

    def validate(self) -> list[str]:
        """Check every curve's plug exists and every plug has a curve.

        Returns
        -------
        list[str]
            Warnings (plugs without curves).

        Raises
        ------
        SatHeightError
            A curve whose plug is missing from the plug table (names file and row),
            or a curve in an unknown lab system.
        """
        for c in self.curves:
            if c.plug_id not in self.plugs:
                raise SatHeightError(f"plug {c.plug_id!r} has pressure steps but is not in any "
                                     "plug table",
                                     where=f"{c.source}, row {c.rows[0]}" if c.rows else c.source,
                                     hint="add the plug (porosity, permeability) to the plug table")
            if c.system not in self.systems:
                raise SatHeightError(f"unknown lab fluid system {c.system!r}",
                                     where=f"{c.source}, row {c.rows[0]}" if c.rows else c.source,
                                     hint="use one of " + ", ".join(self.systems)
                                          + " or give its sigma and theta")
        with_curves = {c.plug_id for c in self.curves}
        return [f"plug {p!r} ({self.plugs[p].source}) has no capillary-pressure curve"
                for p in self.plugs if p not in with_curves]


@dataclass
class CorePoints:
    """Every pressure step of a dataset as flat arrays (one element per point).

    Attributes
    ----------
    plug, system, rock_type : numpy.ndarray of str
    pc_lab : numpy.ndarray
        Lab capillary pressure [Pa].
    sw : numpy.ndarray
        Wetting saturation after closure correction [fraction].
    sw_raw : numpy.ndarray
        Wetting saturation as read [fraction].
    phi, k : numpy.ndarray
        Plug porosity [fraction] and permeability [m^2] used (stress-corrected).
    j : numpy.ndarray
        Leverett J [-] from the lab Pc, the lab sigma*cos(theta) and the plug's phi, k.
    pc_res : numpy.ndarray
        Reservoir capillary pressure [Pa] (NaN without a reservoir system).
    height : numpy.ndarray
        Equivalent height above the FWL [m] (NaN without delta_rho).
    throat_radius : numpy.ndarray
        Washburn pore-throat radius [m], mercury curves only (NaN otherwise).
    closure : dict[str, float]
        Closure pressure used per mercury curve ``"plug/system"`` [Pa].
    """

    plug: np.ndarray
    system: np.ndarray
    rock_type: np.ndarray
    pc_lab: np.ndarray
    sw: np.ndarray
    sw_raw: np.ndarray
    phi: np.ndarray
    k: np.ndarray
    j: np.ndarray
    pc_res: np.ndarray
    height: np.ndarray
    throat_radius: np.ndarray
    closure: dict = field(default_factory=dict)


def core_points(dataset: CoreDataset, *, closure="auto", phi_factor: float = 1.0,
                k_factor: float = 1.0, reservoir: FluidSystem | None = None,
                delta_rho: float | None = None, rock_types: dict | None = None) -> CorePoints:
    """Convert and correct every curve of a dataset into points for fitting.

    Parameters
    ----------
    dataset : CoreDataset
        Validated with :meth:`CoreDataset.validate` first (done here too).
    closure : "auto", None or float
        Closure correction of mercury curves: ``"auto"`` picks it per curve
        (:func:`pick_closure_pressure`), ``None`` skips it, a number is the closure
        pressure [Pa] for every mercury curve.
    phi_factor, k_factor : float
        Stress-correction factors [-] (:func:`stress_correct`).
    reservoir : FluidSystem, optional
        Reservoir system for the lab -> reservoir Pc conversion.
    delta_rho : float, optional
        Reservoir water-hydrocarbon density difference [kg/m^3] for the height.
    rock_types : dict, optional
        Plug id -> rock-type name (see :func:`satheight.rocktypes.plug_rock_types`).

    Returns
    -------
    CorePoints
    """
    dataset.validate()
    if delta_rho is not None and not delta_rho > 0:
        raise SatHeightError(f"density difference must be > 0, got {delta_rho} kg/m3",
                             hint="give water minus hydrocarbon density at reservoir conditions")
    if delta_rho is not None:
        require_plausible("delta_rho", delta_rho, "the density difference", delta_rho, "kg/m3")
    cols: dict[str, list] = {k: [] for k in ("plug", "system", "rock", "pc", "sw", "sw_raw",
                                             "phi", "k", "j", "pc_res", "r")}
    closures = {}
    for c in dataset.curves:  # loop over curves (plugs), each vectorised
        plug = dataset.plugs[c.plug_id]
        system = dataset.systems[c.system]
        phi, k = stress_correct(plug.porosity, plug.permeability, phi_factor, k_factor)
        sw = c.sw
        r = np.full(c.pc.size, np.nan)
        if c.system in MERCURY_SYSTEMS:
            s_nw = 1.0 - c.sw
            if closure is not None:
                cp = pick_closure_pressure(c.pc, s_nw) if closure == "auto" else float(closure)
                closures[f"{c.plug_id}/{c.system}"] = cp
                s_nw = closure_correction(c.pc, s_nw, cp)
            sw = wetting_saturation_from_mercury(s_nw)
            r = washburn_radius(c.pc, system.sigma_cos_theta)
        n = c.pc.size
        cols["plug"] += [c.plug_id] * n
        cols["system"] += [c.system] * n
        cols["rock"] += [(rock_types or {}).get(c.plug_id, "")] * n
        cols["pc"].append(c.pc)
        cols["sw"].append(sw)
        cols["sw_raw"].append(c.sw)
        cols["phi"].append(np.full(n, phi))
        cols["k"].append(np.full(n, k))
        cols["j"].append(leverett_j(c.pc, k, phi, system.sigma_cos_theta))
        cols["pc_res"].append(lab_to_reservoir_pc(c.pc, system.sigma_cos_theta,
                                                  reservoir.sigma_cos_theta)
                              if reservoir is not None else np.full(n, np.nan))
        cols["r"].append(r)
    cat = lambda key: np.concatenate(cols[key]) if cols[key] else np.zeros(0)  # noqa: E731
    pc_res = cat("pc_res")
    height = height_from_pc(pc_res, delta_rho) if delta_rho is not None else np.full(pc_res.size, np.nan)
    return CorePoints(plug=np.array(cols["plug"], dtype=object),
                      system=np.array(cols["system"], dtype=object),
                      rock_type=np.array(cols["rock"], dtype=object),
                      pc_lab=cat("pc"), sw=cat("sw"), sw_raw=cat("sw_raw"), phi=cat("phi"),
                      k=cat("k"), j=cat("j"), pc_res=pc_res, height=height,
                      throat_radius=cat("r"), closure=closures)


# ----------------------------------------------------------------------------------
# fitting per rock type

#: Families fitted by default (J families; height functions need reservoir fluids).
DEFAULT_FAMILIES = ("power_law", "brooks_corey", "thomeer", "van_genuchten")


def fit_rock_types(points: CorePoints, families=DEFAULT_FAMILIES) -> dict:
    """Fit each family to all points of each rock type together.

    Parameters
    ----------
    points : CorePoints
        With ``rock_type`` filled (one group ``""`` is named ``"all"``).
    families : sequence of str
        Keys of :data:`satheight.models.FAMILIES`. A height family
        (``variable == "height"``) is fitted to Sw versus ``points.height``.

    Returns
    -------
    dict
        Rock-type name -> ``{"plugs": [...], "n_points": int, "fits": {family:
        FitReport}, "selected": family, "errors": {family: message}}``. The
        selected family is chosen among the J families by
        :func:`satheight.models.select_family` (fewest parameters among fits within
        2 of the lowest AIC); ``"delta_aic"`` holds each J family's AIC minus the lowest.
    """
    out: dict = {}
    names = [str(x) or "all" for x in points.rock_type]
    labels = np.array(names, dtype=object)
    for rt in dict.fromkeys(names):  # loop over rock types
        m = labels == rt
        entry = {"plugs": sorted(dict.fromkeys(points.plug[m].tolist())),
                 "n_points": int(m.sum()), "fits": {}, "errors": {}, "selected": None}
        for fam in families:
            cls = get_family(fam, where="families")
            x = points.height[m] if cls.variable == "height" else points.j[m]
            if cls.variable == "height" and not np.isfinite(x).any():
                entry["errors"][fam] = "needs reservoir fluids (sigma cos theta and density difference)"
                continue
            try:
                with warnings.catch_warnings():
                    warnings.simplefilter("ignore")
                    fn = cls().fit(x, points.sw[m])
                    entry["fits"][fam] = fn.fit_report(groups=points.plug[m])
            except (ModelError, RuntimeError, ValueError) as exc:
                entry["errors"][fam] = str(exc)
        j_fits = {f: r for f, r in entry["fits"].items() if r.variable == "j"}
        entry["selected"], entry["delta_aic"] = select_family(j_fits, order=FAMILIES)
        out[rt] = entry
    return out


def sha256_of(path) -> str:
    """sha256 hex digest of a file's bytes."""
    h = hashlib.sha256()
    with open(Path(path), "rb") as f:
        for block in iter(lambda: f.read(1 << 16), b""):
            h.update(block)
    return h.hexdigest()
