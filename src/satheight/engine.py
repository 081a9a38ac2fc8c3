"""Pure per-depth saturation-height computation: no I/O, no plotting.

For every sample of a well:

1. zone membership from TVDSS and each zone's top and base;
2. height above the free-water level ``h = z_FWL - z`` (TVDSS, positive down);
3. reservoir capillary pressure ``Pc = (rho_w - rho_hc) * g * h``;
4. Leverett J ``J = Pc * sqrt(k / phi) / (sigma cos theta)``;
5. water saturation from the zone's J-Sw function, Sw = 1 at and below the FWL;
6. flags where porosity or permeability are unusable (Sw NaN there) and where J
   lies outside the range the function was calibrated on.

Everything is SI: depths [m], pressure [Pa], density [kg/m^3], permeability [m^2],
sigma*cos(theta) [N/m], porosity and saturation as fractions. Zones are handled
by masks (one numpy pass per zone), never by a Python loop over samples. The
height, Pc and J arithmetic is :mod:`satheight.capillary`'s (its functions are
also importable from here, as before).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Any, Callable, Sequence

import numpy as np

from .capillary import (capillary_pressure_from_height, height_above_fwl, leverett_j,  # noqa: F401
                        pc_from_j, sqrt_k_over_phi, three_phase_pc_j)
from .errors import SatHeightError
from .models import build_function
from .models.base import JSwFunction
from .results import (FLAG_BAD_PERMEABILITY, FLAG_BAD_POROSITY, FLAG_J_ABOVE_RANGE,
                      FLAG_J_BELOW_RANGE, FLAG_NO_ROCK_FUNCTION, FLAG_NO_ZONE, ShmResult)


@dataclass(frozen=True)
class Zone:
    """One zone: its window, free-water level, fluids and J-Sw function.

    The one zone record of the package. The project reader makes it from a
    ``[[zones]]`` entry (``function`` is then the
    :class:`satheight.project.types.FunctionSpec` as read, ``top``/``base`` the
    field-wide window or ``None``); :func:`zone_for_well` makes the per-well form the
    engine evaluates (this well's window, a ready :class:`JSwFunction`).

    Attributes
    ----------
    name : str
    top, base : float or None
        Zone window in TVDSS [m] (top inclusive, base exclusive); in the project-file
        form ``None`` when every well gives its own tops.
    fwl : float or None
        Free-water level TVDSS [m]; None when the project file gives none (the FWL
        search looks for it; a run refuses the zone).
    water_density, hydrocarbon_density : float
        [kg/m^3] at reservoir conditions.
    hydrocarbon : str
        ``"oil"``, ``"gas"`` or ``"air"``.
    sigma_cos_theta : float
        [N/m] at reservoir conditions.
    function : JSwFunction or FunctionSpec
        Ready-to-predict J-Sw function (per-well form) or its specification (as read).
    rock_functions : dict[str, JSwFunction] or None
        Optional per-rock-type functions: when given, each sample's rock type is
        found by ``rock_classifier(phi, k)`` and that type's function is used
        (``function`` is then not used for Sw). Samples whose type has no function
        get Sw NaN and FLAG_NO_ROCK_FUNCTION.
    rock_classifier : callable or None
        ``(phi [fraction], k [m^2]) -> array of rock-type names``, vectorised
        (e.g. :meth:`satheight.rocktypes.RockTypeRule.classify`).
    gas_oil_level, gas_density, gas_sigma_cos_theta : float or None
        Three-phase column (gas cap over oil over water), all optional: the free-oil
        (gas-oil) level TVDSS [m], gas density [kg/m^3] and gas-water
        sigma*cos(theta) [N/m]. With gas_oil_level set, ``hydrocarbon`` is the oil
        of the oil leg.
    fluids : dict
        How each density was obtained: ``{"water": {...}, "hydrocarbon": {...},
        "gas": {...}, "conditions": {...}}``, JSON-ready.
    allow_unusual : frozenset of str
        Names of this zone's values the project file allows outside their plausible
        range (:mod:`satheight.plausible`), e.g. ``{"fwl"}``.
    fwl_plane : tuple of float or None
        A tilted FWL: ``(east0 [m], north0 [m], gradient_east [-], gradient_north [-])``,
        the plane through ``fwl`` at map point (east0, north0) (see :func:`fwl_on_plane`).
        In the per-well form ``fwl`` is already this well's value.
    fwl_source : str
        Where ``fwl`` came from, in words (JSON summaries and report).
    """

    name: str
    top: float | None
    base: float | None
    fwl: float | None
    water_density: float
    hydrocarbon_density: float
    hydrocarbon: str
    sigma_cos_theta: float
    function: Any
    rock_functions: dict | None = None
    rock_classifier: Callable | None = None
    gas_oil_level: float | None = None
    gas_density: float | None = None
    gas_sigma_cos_theta: float | None = None
    fluids: dict = field(default_factory=dict)
    allow_unusual: frozenset = frozenset()
    fwl_plane: tuple | None = None
    fwl_source: str = "project file"

    @property
    def delta_rho(self) -> float:
        """Density difference water minus hydrocarbon [kg/m^3]."""
        return self.water_density - self.hydrocarbon_density

    @property
    def three_phase(self) -> bool:
        """True when the zone has a gas cap over its oil leg (gas_oil_level given)."""
        return self.gas_oil_level is not None


#: The per-well form of :class:`Zone` (the same record; the name other modules use).
ZoneModel = Zone


def fwl_on_plane(fwl0, east0, north0, gradient_east, gradient_north, east, north):
    """Depth of a tilted (planar) free-water level at map points [m], TVDSS positive down.

    ``z = fwl0 + gradient_east * (east - east0) + gradient_north * (north - north0)``:
    the plane through depth ``fwl0`` at the reference point (east0, north0), deepening
    by ``gradient_east`` metres per metre towards the east and ``gradient_north`` towards
    the north. A dip angle d towards azimuth b (clockwise from north) gives
    ``gradient_east = tan(d) sin(b)``, ``gradient_north = tan(d) cos(b)``.

    Parameters
    ----------
    fwl0 : float
        FWL TVDSS at the reference point [m].
    east0, north0 : float
        Reference point in map coordinates [m].
    gradient_east, gradient_north : float
        Depth change per horizontal distance [m/m], positive deeper.
    east, north : array_like
        Map points [m].

    References
    ----------
    Plane geometry (closed form); tilted contacts from hydrodynamic flow: common practice.
    """
    return (fwl0 + gradient_east * (np.asarray(east, dtype=float) - east0)
            + gradient_north * (np.asarray(north, dtype=float) - north0))


def zone_for_well(zone: Zone, top: float, base: float, where: str = "",
                  fwl: float | None = None, fwl_source: str | None = None) -> Zone:
    """The per-well form of a project zone: this well's window, ready J-Sw functions
    and, when given, this well's FWL TVDSS [m] and where it came from.

    Parameters
    ----------
    zone : Zone
        As read from the project file (``function`` a FunctionSpec).
    top, base : float
        This well's zone window, TVDSS [m].
    where : str
        Named in errors of the function parameters (file and key).
    """
    spec = zone.function
    fn = build_function(spec.family, spec.params, spec.j_range, where=where)
    rock_functions = classifier = None
    if spec.by_rock_type:  # per-depth rock typing from a model file
        rock_functions = {rt: build_function(f.family, f.params, f.j_range, where=where)
                          for rt, f in spec.by_rock_type.items()}
        classifier = spec.rock_rule.classify
    own = {} if fwl is None else {"fwl": float(fwl), "fwl_source": fwl_source or zone.fwl_source}
    return replace(zone, top=top, base=base, function=fn, rock_functions=rock_functions,
                   rock_classifier=classifier, **own)


def assign_zones(tvdss, zones: Sequence[Zone]) -> np.ndarray:
    """Index of the zone each sample falls in (top <= z < base), -1 where none.

    Where windows overlap the first zone in the list wins (the project reader
    rejects overlapping field-wide windows; per-well tops are checked by the caller).
    """
    z = np.asarray(tvdss, dtype=float)
    idx = np.full(z.shape, -1, dtype=np.int64)
    for i in range(len(zones) - 1, -1, -1):
        zn = zones[i]
        idx[(z >= zn.top) & (z < zn.base)] = i
    return idx


def _columns(tvdss, phi, k):
    """The three inputs as float64 arrays, checked to be 1-D and of one length."""
    z = np.asarray(tvdss, dtype=float)
    phi = np.asarray(phi, dtype=float)
    k = np.asarray(k, dtype=float)
    if not (z.shape == phi.shape == k.shape) or z.ndim != 1:
        raise SatHeightError(f"tvdss, phi and k must be 1-D arrays of one length, got "
                             f"{z.shape}, {phi.shape}, {k.shape}")
    return z, phi, k


def compute_shm(tvdss, phi, k, zones: Sequence[Zone]) -> ShmResult:
    """Saturation-height model at every sample.

    Parameters
    ----------
    tvdss : array_like
        TVDSS of each sample [m], positive down.
    phi : array_like
        Porosity [fraction]. NaN, <= 0 or > 1 gives Sw NaN and FLAG_BAD_POROSITY.
    k : array_like
        Permeability [m^2]. NaN or <= 0 gives Sw NaN and FLAG_BAD_PERMEABILITY.
    zones : sequence of Zone

    Returns
    -------
    ShmResult
        Arrays of the input length. Outside every zone all values are NaN and
        the flag carries FLAG_NO_ZONE. At and below the FWL Pc = 0, J = 0 and
        Sw = 1 whatever the porosity and permeability (they are still flagged).
        J outside the function's calibrated range keeps its Sw but is flagged.

    Notes
    -----
    Zones are handled as sorted segments: with TVDSS non-decreasing (the usual
    case) each zone window ``top <= z < base`` is one contiguous slice found by
    binary search, and every quantity is computed on that slice in place, without
    masks over the whole well or gathered copies. Otherwise the samples are
    visited in sorted order (a stable argsort) and the results put back. Where
    windows overlap the first zone wins, as in :func:`assign_zones`. The results
    equal those of :func:`compute_shm_masks`.
    """
    z, phi, k = _columns(tvdss, phi, k)
    order = None
    if z.size > 1 and not bool(np.all(z[1:] >= z[:-1])):
        order = np.argsort(z, kind="stable")          # NaN depths sort last: in no zone
        z, phi, k = z[order], phi[order], k[order]
    res = _compute_sorted(z, phi, k, zones)
    if order is None:
        return res
    back = np.empty_like(order)
    back[order] = np.arange(order.size)
    return ShmResult(zone=res.zone[back], hafwl=res.hafwl[back], pc=res.pc[back], j=res.j[back],
                     sw=res.sw[back], flag=res.flag[back])


def _compute_sorted(z, phi, k, zones: Sequence[Zone]) -> ShmResult:
    """:func:`compute_shm` for non-decreasing ``z`` (NaN only at the end)."""
    n = z.size
    # not filled here: every sample is written once, by its zone or as "no zone" below
    zone = np.empty(n, dtype=np.int64)
    hafwl, pc, j, sw = (np.empty(n) for _ in range(4))
    flag = np.empty(n, dtype=np.int64)
    spans = []                                        # [lo, hi) of every zone segment
    # last zone first, so that where windows overlap the first zone's values stay
    for i in range(len(zones) - 1, -1, -1):
        zn = zones[i]
        lo, hi = (int(v) for v in np.searchsorted(z, [zn.top, zn.base], side="left"))
        if hi <= lo:
            continue
        s = slice(lo, hi)
        if _needs_general_path(zn):
            # gas cap, per-depth rock types or a height function: the general mask form
            # on this zone's slice (every sample of the slice lies in the zone window)
            r = compute_shm_masks(z[s], phi[s], k[s], [zn])
            hafwl[s], pc[s], j[s], sw[s], flag[s] = r.hafwl, r.pc, r.j, r.sw, r.flag
        else:
            _zone_segment(zn, z[s], phi[s], k[s], hafwl[s], pc[s], j[s], sw[s], flag[s])
        zone[s] = i
        spans.append((lo, hi))
    # the gaps between the (merged) segments are outside every zone
    start = 0
    for lo, hi in sorted(spans) + [(n, n)]:
        if lo > start:
            gap = slice(start, lo)
            zone[gap] = -1
            for a in (hafwl, pc, j, sw):
                a[gap] = np.nan
            flag[gap] = FLAG_NO_ZONE
        start = max(start, hi)
    return ShmResult(zone=zone, hafwl=hafwl, pc=pc, j=j, sw=sw, flag=flag)


def _needs_general_path(zn: Zone) -> bool:
    """True for zones the in-place segment code does not cover (see :func:`_zone_segment`)."""
    return zn.three_phase or bool(zn.rock_functions) or zn.function.variable == "height"


def _zone_segment(zn: Zone, z, phi, k, h, pc, j, sw, flag) -> None:
    """Fill the output slices ``h, pc, j, sw, flag`` of one zone in place.

    The same arithmetic, in the same order, as :func:`compute_shm_masks`:
    ``h = fwl - z``, ``Pc = max(drho*g*h, 0)``, ``J = Pc*sqrt(k/phi)/sigma_cos_theta``
    where porosity and permeability are usable, J = 0 at and below the FWL.
    """
    height_above_fwl(z, zn.fwl, out=h)
    capillary_pressure_from_height(h, zn.water_density, zn.hydrocarbon_density, out=pc)
    np.maximum(pc, 0.0, out=pc)
    with np.errstate(invalid="ignore", divide="ignore"):
        ok_phi = phi > 0
        np.logical_and(ok_phi, phi <= 1, out=ok_phi)
        ok_k = k > 0
        usable = ok_phi & ok_k
        below = h <= 0
        leverett_j(pc, k, phi, zn.sigma_cos_theta, out=j)
    unusable = np.logical_not(usable, out=usable)     # the same buffer, inverted
    np.copyto(j, np.nan, where=unusable)
    np.copyto(j, 0.0, where=below)
    fn = zn.function
    if type(fn).predict is JSwFunction.predict and fn.params_ is not None:
        # JSwFunction.predict written out on this slice, without its copies: the
        # equation where J > 0, Sw = 1 where J <= 0 (at and below the FWL), clipped
        # to [0, 1], NaN where J is NaN (porosity or permeability unusable)
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            np.clip(fn.equation(j, **fn.params_), 0.0, 1.0, out=sw)
        with np.errstate(invalid="ignore"):
            np.copyto(sw, 1.0, where=j <= 0)
        np.copyto(sw, np.nan, where=np.isnan(j))
    else:
        sw[...] = fn.predict(j)       # elementwise: J = 0 gives Sw = 1, NaN gives NaN
    # flag bits in one byte per sample, widened once at the end
    bits = np.where(ok_phi, np.uint8(0), np.uint8(FLAG_BAD_POROSITY))
    bits |= np.where(ok_k, np.uint8(0), np.uint8(FLAG_BAD_PERMEABILITY))
    rng = zn.function.j_range_
    if rng is not None:
        # J is NaN where porosity or permeability is unusable (every comparison false)
        # and 0 at and below the FWL: there "above the range" cannot hold (j_max > 0),
        # "below the range" is masked out
        with np.errstate(invalid="ignore"):
            low = j < rng[0]
            low &= ~below
            bits |= low.view(np.uint8) * np.uint8(FLAG_J_BELOW_RANGE)
            if rng[1] >= 0:
                high = np.greater(j, rng[1], out=low)
            else:
                high = (j > rng[1]) & ~below & ~unusable
            bits |= high.view(np.uint8) * np.uint8(FLAG_J_ABOVE_RANGE)
    flag[...] = bits


def compute_shm_masks(tvdss, phi, k, zones: Sequence[Zone]) -> ShmResult:
    """Saturation-height model at every sample, straightforward mask form.

    Same parameters and results as :func:`compute_shm` (which the tests check
    against this function) but slower on large wells: every zone is a boolean mask
    over all samples and every value is gathered through it. It also serves the
    zones the in-place segment code does not cover (see :func:`_needs_general_path`).
    """
    z, phi, k = _columns(tvdss, phi, k)
    n = z.size
    zone = assign_zones(z, zones)
    in_zone = zone >= 0

    # per-sample zone parameters by fancy indexing (NaN where no zone)
    def per_sample(values):
        table = np.append(np.asarray(values, dtype=float), np.nan)
        return table[zone]  # index -1 picks the trailing NaN

    fwl = per_sample([zn.fwl for zn in zones])
    rho_w = per_sample([zn.water_density for zn in zones])
    rho_h = per_sample([zn.hydrocarbon_density for zn in zones])
    sct = per_sample([zn.sigma_cos_theta for zn in zones])

    h = height_above_fwl(z, fwl)
    pc = np.maximum(capillary_pressure_from_height(h, rho_w, rho_h), 0.0)
    with np.errstate(invalid="ignore"):
        bad_phi = ~((phi > 0) & (phi <= 1))
        bad_k = ~(k > 0)
    flag = np.zeros(n, dtype=np.int64)
    flag[~in_zone] |= FLAG_NO_ZONE
    flag[in_zone & bad_phi] |= FLAG_BAD_POROSITY
    flag[in_zone & bad_k] |= FLAG_BAD_PERMEABILITY

    usable = ~(bad_phi | bad_k)
    below = in_zone & (h <= 0)
    with np.errstate(invalid="ignore", divide="ignore"):
        j = np.where(in_zone & usable, leverett_j(pc, k, phi, sct), np.nan)
    j[below] = 0.0

    # three-phase zones: Pc and J over both columns (see column_pc_j)
    for i, zn in enumerate(zones):
        if not zn.three_phase:
            continue
        m = (zone == i) & ~below
        if m.any():
            pc_i, j_i = column_pc_j(h[m], k[m], phi[m], zn)
            pc[m] = pc_i
            j[m] = np.where(usable[m], j_i, np.nan)

    sw = np.full(n, np.nan)
    sw[below] = 1.0
    for i, zn in enumerate(zones):
        m = (zone == i) & usable & ~below
        if not m.any():
            continue
        if zn.rock_functions:
            sw[m], flag[m] = _predict_by_rock_type(zn, j[m], h[m], phi[m], k[m], flag[m])
            continue
        sw_i, bits = _predict(zn.function, j[m], h[m])
        sw[m] = sw_i
        flag[m] |= bits
    return ShmResult(zone=zone, hafwl=h, pc=pc, j=j, sw=sw, flag=flag)


def _predict(fn: JSwFunction, j, h):
    """Sw and range-flag bits of one function; a height function gets h [m], others J."""
    x = h if fn.variable == "height" else j
    sw = fn.predict(x)
    bits = np.zeros(x.shape, dtype=np.int64)
    rng = fn.j_range_
    if rng is not None:
        bits |= np.where(x < rng[0], FLAG_J_BELOW_RANGE, 0)
        bits |= np.where(x > rng[1], FLAG_J_ABOVE_RANGE, 0)
    return sw, bits


def _predict_by_rock_type(zn: Zone, j, h, phi, k, flag):
    """Sw per sample from the function of each sample's rock type (loop over rock types)."""
    labels = np.asarray(zn.rock_classifier(phi, k), dtype=object)
    sw = np.full(j.shape, np.nan)
    flag = flag.copy()
    known = np.zeros(j.shape, dtype=bool)
    for name, fn in zn.rock_functions.items():
        m = labels == name
        if not m.any():
            continue
        known |= m
        sw[m], bits = _predict(fn, j[m], h[m])
        flag[m] |= bits
    flag[~known] |= FLAG_NO_ROCK_FUNCTION
    return sw, flag


def column_pc_j(h, k, phi, zone: Zone, oil_column=None):
    """Capillary pressure [Pa] and J [-] at height ``h`` above the FWL, any column type.

    Two-phase zone (no ``gas_oil_level``): ``Pc = (rho_w - rho_hc) g h`` and
    ``J = Pc sqrt(k/phi) / (sigma cos theta)``, both 0 at and below the FWL.

    Three-phase zone (gas cap over oil over water): with the oil column
    ``t = FWL - gas_oil_level`` [m], ``h_o = clip(h, 0, t)`` and
    ``h_g = max(h - t, 0)``:

    * Pc is the oil-water capillary pressure in the oil leg and, above the free-oil
      level, the gas-water capillary pressure accumulated over both columns,
      ``Pc = (rho_w - rho_o) g h_o + (rho_w - rho_g) g h_g``;
    * J accumulates the same two pieces, each scaled by its own sigma*cos(theta),
      ``J = sqrt(k/phi) [(rho_w - rho_o) g h_o / sct_ow + (rho_w - rho_g) g h_g / sct_gw]``,
      so J and Sw are continuous across the free-oil level and the gas cap follows
      the gas-water capillary scaling above it.

    Parameters
    ----------
    h : array_like
        Height above the FWL [m]; any shape (e.g. candidates x samples).
    k : array_like
        Permeability [m^2], broadcastable to ``h``.
    phi : array_like
        Porosity [fraction], broadcastable to ``h``.
    zone : Zone
    oil_column : float or array_like, optional
        Oil column thickness [m] (broadcastable to ``h``); default
        ``zone.fwl - zone.gas_oil_level``. Ignored for two-phase zones.

    Returns
    -------
    (numpy.ndarray, numpy.ndarray)
        ``(Pc [Pa], J [-])`` of the broadcast shape; NaN J where k or phi is unusable.

    References
    ----------
    Hydrostatics of three immiscible phases at rest; Leverett, M. C., 1941,
    Trans. AIME 142 (J scaling); common practice for gas caps over oil legs.
    """
    h = np.asarray(h, dtype=float)
    k = np.asarray(k, dtype=float)
    phi = np.asarray(phi, dtype=float)
    with np.errstate(invalid="ignore", divide="ignore"):
        root = np.where((k > 0) & (phi > 0) & (phi <= 1), sqrt_k_over_phi(k, phi), np.nan)
    if not zone.three_phase:
        pc = np.maximum(capillary_pressure_from_height(h, zone.water_density,
                                                       zone.hydrocarbon_density), 0.0)
        return pc, pc * root / zone.sigma_cos_theta
    if zone.gas_density is None or zone.gas_sigma_cos_theta is None:
        raise SatHeightError(f"zone {zone.name!r} has a gas_oil_level but no gas density or "
                             "gas-water sigma*cos(theta)",
                             hint="give gas_density and gas_sigma_cos_theta for this zone")
    t = (zone.fwl - zone.gas_oil_level) if oil_column is None else oil_column
    return three_phase_pc_j(h, root, t, zone.water_density, zone.hydrocarbon_density,
                            zone.gas_density, zone.sigma_cos_theta, zone.gas_sigma_cos_theta)
