"""Monte Carlo of the saturation-height model: percentile curves, volume distributions, tornado.

Pure vectorised numpy (no I/O, no plotting). Uncertain inputs are declared per zone:

* the zone's scalars ``fwl`` [m TVDSS], ``water_density`` and ``hydrocarbon_density``
  [kg/m^3], ``sigma_cos_theta`` [N/m] and any parameter of its J-Sw function (by the
  family's parameter name), each with a :class:`Distribution`; or the J-Sw parameters
  together, with a :class:`JointNormal` (a multivariate normal around the fitted values,
  e.g. with the fit's own parameter covariance);
* two log errors (:class:`LogError`): an additive porosity error [fraction] and a
  permeability error in decades (``k * 10**e``, a multiplicative error), each a
  stationary random field along TVDSS with an exponential correlation
  ``exp(-|dz| / L)`` over the correlation length ``L`` [m] the user gives.

Each realisation ``r`` draws from its own random streams,
``numpy.random.SeedSequence(seed, spawn_key=(r, stream, key))``: stream 0 keyed by the
zone's name for the zone scalars (one uniform per input, turned into a value by the
inverse distribution function, then one per jointly drawn parameter; so realisation ``r`` has the same FWL in every well),
streams 1 and 2 keyed by the well's name for the porosity and permeability fields
(independent between wells). A realisation's numbers therefore depend only on the
seed, its index and these names, not on how many realisations run, in which process,
nor on how the samples are cut into chunks: the fields are
built on fixed blocks of :data:`BLOCK` samples (absolute positions in TVDSS order),
chunks are whole blocks, and sums over samples are taken per block and then over the
blocks, so one chunk or many give the same bits.

The exponential correlation is sampled exactly at any spacing by the first-order
autoregression of the Ornstein-Uhlenbeck process, ``g_i = a_i g_(i-1) + sqrt(1 - a_i^2) w_i``
with ``a_i = exp(-(z_i - z_(i-1)) / L)`` and white standard normal ``w`` (gillespie1996);
the recursion is evaluated as a parallel prefix scan over each block (blelloch1990),
vectorised over realisations. A non-normal error distribution is reached from the
normal field through its inverse distribution function (Gaussian copula).

Percentile convention (spe_prms2018 volume convention): the P90 volume is the value
exceeded with 90 % probability, i.e. the 10th percentile of the hydrocarbon pore
thickness; high water saturation means low hydrocarbon volume, so ``SW_P90`` is the
90th percentile of Sw at each depth (the pessimistic, high-Sw curve) and ``SW_P10`` the
10th percentile (the optimistic, low-Sw curve): ``SW_P10 <= SW_P50 <= SW_P90``.
Percentiles are numpy's linear interpolation between order statistics (definition 7
of hyndman1996). The curves are depth by depth: summing a percentile curve does not
give that percentile of the volume, which comes from the realisations' own sums.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from .compare import net_mask, sample_thickness
from .constants import STANDARD_GRAVITY
from .engine import ZoneModel
from .errors import SatHeightError
from .random_fields import BLOCK, FieldStream, ar1_coefficients, generator, open_uniforms, text_key
from .results import ShmResult
from .uncertainty_inputs import (LOG_ERRORS, ZONE_INPUTS, LogError, ZoneUncertainty,
                                 check_zone_uncertainty, deterministic_value)

__all__ = ["ZONE_INPUTS", "LOG_ERRORS", "LogError", "ZoneUncertainty", "check_zone_uncertainty",
           "MonteCarloSettings", "MonteCarloResult", "monte_carlo", "TornadoBar", "tornado"]

#: Arrays of realisations x chunk samples alive at once in the Monte Carlo (memory sizing).
_ARRAYS_PER_CHUNK = 18
_STREAM_SCALARS, _STREAM_POROSITY, _STREAM_PERMEABILITY = 0, 1, 2


@dataclass(frozen=True)
class MonteCarloSettings:
    """How many realisations, the seed, and the memory bound [MB] of the working arrays."""

    realisations: int = 1000
    seed: int = 0
    memory_mb: float = 256.0


@dataclass
class MonteCarloResult:
    """Monte Carlo of one well.

    Attributes
    ----------
    sw_percentiles : dict[str, numpy.ndarray]
        ``"SW_P10"``, ``"SW_P50"``, ``"SW_P90"``: the 10th, 50th and 90th percentiles of
        Sw over the realisations at each sample [fraction], in input sample order (see
        the module docstring for the convention).
    hcpt : dict[str, numpy.ndarray]
        Zone name -> hydrocarbon pore thickness of each realisation [m], ``(R,)``.
    phases : dict[str, str]
        Zone name -> hydrocarbon phase (``"oil"``, ``"gas"``, ``"air"``).
    block_samples : int
        Samples per chunk used (a multiple of :data:`BLOCK`).
    porosity_clipped : int
        Number of perturbed porosity values set to 0 or 1 (draws outside [0, 1]).
    """

    sw_percentiles: dict
    hcpt: dict
    phases: dict
    settings: MonteCarloSettings
    block_samples: int
    porosity_clipped: int = 0

    def hcpt_distribution(self) -> dict:
        """P90 / P50 / P10 (volume convention), mean and sd of HCPT [m] per zone and per phase.

        Returns ``{"zones": {zone: {...}}, "phases": {phase: {...}}, "well": {...}}``; a phase
        (and the well, all phases) sums its zones realisation by realisation before taking
        percentiles.
        """
        def stats(v):
            p = np.percentile(v, [10.0, 50.0, 90.0])
            return {"P90": float(p[0]), "P50": float(p[1]), "P10": float(p[2]),
                    "mean": float(np.mean(v)), "sd": float(np.std(v))}

        phases: dict[str, np.ndarray] = {}
        for zone, v in self.hcpt.items():
            ph = self.phases[zone]
            phases[ph] = v.copy() if ph not in phases else phases[ph] + v
        out = {"zones": {z: stats(v) for z, v in self.hcpt.items()},
               "phases": {p: stats(v) for p, v in phases.items()}}
        if self.hcpt:
            out["well"] = stats(sum(self.hcpt.values()))
        return out


# --------------------------------------------------------------------------------------
# --------------------------------------------------------------------------------------
# the well, prepared once in TVDSS order

@dataclass
class _Well:
    """The inputs in TVDSS order and the zones that carry an uncertainty table."""

    order: np.ndarray
    z: np.ndarray
    phi: np.ndarray
    k: np.ndarray
    contrib: np.ndarray            # dh where the sample counts in HCPT (net), else 0
    zone: np.ndarray
    usable: np.ndarray
    sw_det: np.ndarray
    zones: list                    # [(index, ZoneModel, ZoneUncertainty)]


def _prepare(tvdss, phi, k, zones, shm: ShmResult, uncertainty: dict, min_porosity: float,
             min_permeability: float) -> _Well:
    z = np.asarray(tvdss, dtype=float)
    phi = np.asarray(phi, dtype=float)
    k = np.asarray(k, dtype=float)
    if not (z.shape == phi.shape == k.shape == shm.sw.shape) or z.ndim != 1:
        raise SatHeightError(f"tvdss, phi, k and the SHM result must be 1-D of one length, got "
                             f"{z.shape}, {phi.shape}, {k.shape}, {shm.sw.shape}")
    unknown = sorted(set(uncertainty) - {zn.name for zn in zones})
    if unknown:
        raise SatHeightError("uncertainty given for zone(s) not in this well: " + ", ".join(unknown))
    mc = []
    for i, zn in enumerate(zones):
        if zn.name in uncertainty:
            check_zone_uncertainty(zn, uncertainty[zn.name])
            mc.append((i, zn, uncertainty[zn.name]))
    order = np.argsort(z, kind="stable")
    dh = sample_thickness(z)            # in sample order, as the comparison takes it
    net = net_mask(phi, k, min_porosity, min_permeability)
    with np.errstate(invalid="ignore"):
        usable = (phi > 0) & (phi <= 1) & (k > 0)
    return _Well(order=order, z=z[order], phi=phi[order], k=k[order],
                 contrib=np.where(net, dh, 0.0)[order], zone=np.asarray(shm.zone)[order],
                 usable=usable[order], sw_det=np.asarray(shm.sw, dtype=float)[order], zones=mc)


def _input_names(zone: ZoneModel, spec: ZoneUncertainty) -> list[str]:
    """The uncertain scalar inputs of a zone drawn one by one, in their fixed draw order."""
    return [n for n in ZONE_INPUTS + tuple(zone.function.param_names) if n in spec.inputs]


def _joint_names(spec: ZoneUncertainty) -> list[str]:
    """The J-Sw parameters drawn together (after the others in each realisation's stream)."""
    return [] if spec.joint is None else list(spec.joint.names)


def _joint_means(zone: ZoneModel, spec: ZoneUncertainty) -> np.ndarray:
    return np.array([deterministic_value(zone, n) for n in spec.joint.names])


def _all_values(zone: ZoneModel, given: dict, n: int) -> dict:
    """Every scalar input of a zone as an ``(n,)`` array: the given ones, else deterministic."""
    names = ZONE_INPUTS + tuple(zone.function.param_names)
    return {nm: given[nm] if nm in given else np.full(n, deterministic_value(zone, nm)) for nm in names}


def _draw_values(well: _Well, settings: MonteCarloSettings) -> list[dict]:
    """Per Monte Carlo zone, ``{input: (R,) values}`` from each realisation's scalar stream.

    The stream of a zone is keyed by the zone's name, not by the well: realisation ``r``
    draws the same zone inputs (the same FWL...) in every well of a field.
    """
    R = settings.realisations
    out = []
    for _, zn, spec in well.zones:
        names, joint = _input_names(zn, spec), _joint_names(spec)
        given = {}
        if names or joint:
            key = text_key(zn.name)
            n = len(names) + len(joint)
            u = np.stack([open_uniforms(generator(settings.seed, r, _STREAM_SCALARS, key), n)
                          for r in range(R)])        # one small draw per realisation, not per sample
            for col, nm in enumerate(names):
                given[nm] = spec.inputs[nm].centred(deterministic_value(zn, nm)).ppf(u[:, col])
            if joint:
                x = spec.joint.draw(_joint_means(zn, spec), u[:, len(names):])
                given.update({nm: x[:, col] for col, nm in enumerate(joint)})
        out.append(_all_values(zn, given, R))
    return out


def _zone_sw(zone: ZoneModel, vals: dict, z, phi, k, usable, e_phi, e_k):
    """Sw ``(R, M)``, perturbed porosity and the count of porosity values clipped to [0, 1].

    The engine's arithmetic (engine.compute_shm) with per-realisation scalars:
    ``h = FWL - z``, ``Pc = max(h (rho_w - rho_hc) g, 0)``, ``J = Pc sqrt(k/phi) / sigma cos theta``,
    Sw from the J-Sw function (or from h for a height function), clipped to [0, 1],
    Sw = 1 at and below the FWL and where the perturbed porosity is 0; NaN where the
    logged porosity or permeability is unusable (above the FWL).
    """
    col = {nm: v[:, None] for nm, v in vals.items()}
    h = col["fwl"] - z
    pc = np.maximum(h * ((col["water_density"] - col["hydrocarbon_density"]) * STANDARD_GRAVITY), 0.0)
    phi_r = np.broadcast_to(phi, h.shape) if e_phi is None else phi + e_phi
    with np.errstate(invalid="ignore"):
        clipped = int(np.count_nonzero((phi_r < 0) | (phi_r > 1)))
    phi_r = np.clip(phi_r, 0.0, 1.0)
    k_r = k if e_k is None else k * np.power(10.0, e_k)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        j = pc * np.sqrt(k_r / phi_r) / col["sigma_cos_theta"]
        j = np.where(usable, j, np.nan)
        fn = zone.function
        x = np.where(usable, h, np.nan) if fn.variable == "height" else j
        sw = fn.equation(x, **{p: col[p] for p in fn.param_names})
    sw = np.clip(sw, 0.0, 1.0)
    with np.errstate(invalid="ignore"):
        sw[(x <= 0) | (phi_r <= 0) | (h <= 0)] = 1.0
    return sw, phi_r, clipped


class _FieldErrors:
    """Monte Carlo log errors: correlated fields mapped to each zone's marginal."""

    def __init__(self, well: _Well, settings: MonteCarloSettings, well_key: int):
        self.fields = {}
        for kind, stream in (("porosity_error", _STREAM_POROSITY),
                             ("permeability_error", _STREAM_PERMEABILITY)):
            lengths = np.zeros(well.z.size)
            used = False
            for i, _, spec in well.zones:
                err = getattr(spec, kind)
                if err is not None:
                    lengths[well.zone == i] = err.correlation_length
                    used = True
            if used:
                a = ar1_coefficients(well.z, lengths)
                self.fields[kind] = FieldStream(settings.seed, settings.realisations, a, stream,
                                                well_key)
        self.current = {}

    def start_chunk(self, lo: int, hi: int) -> None:
        self.current = {kind: f.chunk(lo, hi) for kind, f in self.fields.items()}

    def error(self, zone: str, spec: ZoneUncertainty, kind: str, cols) -> np.ndarray | None:
        err = getattr(spec, kind)
        if err is None:
            return None
        from scipy.special import ndtr

        d = err.distribution.centred(0.0)
        g = self.current[kind][:, cols]
        return d.mean + d.sd * g if d.kind == "normal" else d.ppf(ndtr(g))


class _ShiftErrors:
    """Tornado log errors: one constant error per case and zone (the whole zone shifted)."""

    def __init__(self, shifts: dict):
        self.shifts = shifts                    # (zone name, kind) -> (R,) errors

    def start_chunk(self, lo: int, hi: int) -> None:
        return None

    def error(self, zone: str, spec: ZoneUncertainty, kind: str, cols) -> np.ndarray | None:
        v = self.shifts.get((zone, kind))
        return None if v is None else v[:, None]


def _chunk_samples(realisations: int, memory_mb: float, n: int) -> int:
    """Samples per chunk: whole blocks, as many as the memory bound allows (at least one block)."""
    per_block = realisations * BLOCK * 8 * _ARRAYS_PER_CHUNK / 1e6
    if per_block > memory_mb:
        raise SatHeightError(f"{realisations} realisations need at least {per_block:.0f} MB of "
                             f"working arrays, more than the bound of {memory_mb:g} MB",
                             hint=f"raise memory_mb to {np.ceil(per_block):.0f} or run fewer "
                                  "realisations")
    blocks = max(1, int(memory_mb // per_block))
    return min(blocks * BLOCK, -(-max(n, 1) // BLOCK) * BLOCK)


def _run(well: _Well, values: list[dict], errors, realisations: int, chunk: int,
         percentiles: bool):
    """Sw percentiles ``(3, N)`` (sorted order; None unless asked), per-zone HCPT ``(R,)``
    and the number of clipped porosities, chunk by chunk over the samples."""
    n = well.z.size
    pct = np.repeat(well.sw_det[None, :], 3, axis=0) if percentiles else None
    partials = {zn.name: [] for _, zn, _ in well.zones}
    clipped = 0
    for lo in range(0, n, chunk):
        hi = min(lo + chunk, n)
        errors.start_chunk(lo, hi)
        width = -(-(hi - lo) // BLOCK) * BLOCK
        for (i, zn, spec), vals in zip(well.zones, values):
            cols = np.flatnonzero(well.zone[lo:hi] == i)
            acc = np.zeros((realisations, width))
            if cols.size:
                s = cols + lo
                sw, phi_r, c = _zone_sw(zn, vals, well.z[s], well.phi[s], well.k[s], well.usable[s],
                                        errors.error(zn.name, spec, "porosity_error", cols),
                                        errors.error(zn.name, spec, "permeability_error", cols))
                clipped += c
                with np.errstate(invalid="ignore"):
                    v = phi_r * (1.0 - sw) * well.contrib[s]
                acc[:, cols] = np.where(np.isfinite(v), v, 0.0)
                if percentiles:
                    pct[:, s] = np.percentile(sw, [10.0, 50.0, 90.0], axis=0)
            # per-block sums: the same blocks whatever the chunk size, hence the same bits
            partials[zn.name].append(acc.reshape(realisations, -1, BLOCK).sum(axis=2))
    hcpt = {name: np.concatenate(p, axis=1).sum(axis=1) for name, p in partials.items()}
    return pct, hcpt, clipped


def monte_carlo(tvdss, phi, k, zones: Sequence[ZoneModel], shm: ShmResult, uncertainty: dict,
                settings: MonteCarloSettings = MonteCarloSettings(), min_porosity: float = 0.0,
                min_permeability: float = 0.0, well: str = "") -> MonteCarloResult:
    """Monte Carlo of the saturation-height model of one well.

    Parameters
    ----------
    tvdss : array_like
        TVDSS of each sample [m], positive down (any order).
    phi, k : array_like
        Logged porosity [fraction] and permeability [m^2].
    zones : sequence of ZoneModel
        The well's zones, as given to :func:`satheight.engine.compute_shm`.
    shm : ShmResult
        The deterministic result of ``compute_shm(tvdss, phi, k, zones)``: its zone of
        each sample is used, and zones without an uncertainty table keep its Sw.
    uncertainty : dict[str, ZoneUncertainty]
        Zone name -> uncertain inputs (see :func:`check_zone_uncertainty`).
    settings : MonteCarloSettings
    min_porosity, min_permeability : float
        Net-reservoir cutoffs on the logged values [fraction], [m^2], as in
        :func:`satheight.compare.summarise`: only net samples enter the HCPT.
    well : str
        The well's name: keys the streams of its log errors, so that wells get
        independent log errors while a zone's scalar inputs (keyed by zone name) take
        the same value in realisation ``r`` of every well.

    Returns
    -------
    MonteCarloResult
        SW_P10 / SW_P50 / SW_P90 curves (the 10th, 50th, 90th percentiles of Sw at each
        sample: SW_P90 is the high-Sw curve of the P90 volume) and the hydrocarbon pore
        thickness ``sum(phi (1 - Sw) dh)`` [m] of every realisation per zone.

    Notes
    -----
    Memory: the working arrays of realisations x chunk samples stay under
    ``settings.memory_mb``; beside them the run holds a few arrays of the well's length
    and one random generator per realisation and stream. Realisation ``r`` depends only
    on ``(settings.seed, r)``; the chunk size does not change any number.
    """
    R = int(settings.realisations)
    if R < 1:
        raise SatHeightError(f"realisations must be >= 1, got {settings.realisations!r}")
    w = _prepare(tvdss, phi, k, zones, shm, uncertainty, min_porosity, min_permeability)
    chunk = _chunk_samples(R, settings.memory_mb, w.z.size)
    values = _draw_values(w, settings)
    pct, hcpt, clipped = _run(w, values, _FieldErrors(w, settings, text_key(well)), R, chunk, True)
    out = np.empty_like(pct)
    out[:, w.order] = pct
    curves = {"SW_P10": out[0], "SW_P50": out[1], "SW_P90": out[2]}
    return MonteCarloResult(sw_percentiles=curves, hcpt=hcpt,
                            phases={zn.name: zn.hydrocarbon for _, zn, _ in w.zones},
                            settings=settings, block_samples=chunk, porosity_clipped=clipped)


@dataclass(frozen=True)
class TornadoBar:
    """One input moved from its 10th to its 90th percentile, every other input at its median.

    ``value_low`` / ``value_high`` are the input's values there (SI; for the log errors
    the error, applied as one shift over the whole zone), ``hcpt_low`` / ``hcpt_high``
    the well's hydrocarbon pore thickness [m] (all zones with a table), ``swing`` their
    absolute difference [m].
    """

    zone: str
    input: str
    value_low: float
    value_high: float
    hcpt_low: float
    hcpt_high: float

    @property
    def swing(self) -> float:
        return abs(self.hcpt_high - self.hcpt_low)


def _tornado_medians(well: _Well, R: int) -> tuple[list[dict], dict]:
    """Every input of every Monte Carlo zone at its median, ``R`` copies (the tornado's cases)."""
    values, shifts = [], {}
    for _, zn, spec in well.zones:
        given = {nm: np.full(R, float(spec.inputs[nm].centred(deterministic_value(zn, nm)).ppf(0.5)))
                 for nm in _input_names(zn, spec)}
        given.update({nm: np.full(R, deterministic_value(zn, nm)) for nm in _joint_names(spec)})
        values.append(_all_values(zn, given, R))
        for kind in LOG_ERRORS:
            if getattr(spec, kind) is not None:
                shifts[(zn.name, kind)] = np.full(
                    R, float(getattr(spec, kind).distribution.centred(0.0).ppf(0.5)))
    return values, shifts


def tornado(tvdss, phi, k, zones: Sequence[ZoneModel], shm: ShmResult, uncertainty: dict,
            min_porosity: float = 0.0, min_permeability: float = 0.0,
            memory_mb: float = 256.0) -> tuple[float, list[TornadoBar]]:
    """Which input moves the volume most: one at a time from its P10 to P90 value.

    Every uncertain input (zone scalars, J-Sw parameters, log errors) is set to the
    value at probability 0.1 and 0.9 of its distribution while all others sit at their
    medians (probability 0.5); the well's HCPT [m] is computed for each case. A log
    error is moved as one constant shift over its zone (its fully correlated limit).
    A parameter drawn jointly (:class:`JointNormal`) moves to the 0.1 and 0.9 points of
    its own normal while the other joint parameters follow at their mean given it (the
    normal's conditional mean), so the bar keeps the correlation the fit found.

    Returns
    -------
    (float, list[TornadoBar])
        HCPT with every input at its median [m], and the bars, largest swing first.
    """
    well = _prepare(tvdss, phi, k, zones, shm, uncertainty, min_porosity, min_permeability)
    movers = [(p, zn, spec, nm) for p, (_, zn, spec) in enumerate(well.zones)
              for nm in _input_names(zn, spec) + _joint_names(spec)]
    movers += [(p, zn, spec, kind) for p, (_, zn, spec) in enumerate(well.zones)
               for kind in LOG_ERRORS if getattr(spec, kind) is not None]
    R = 1 + 2 * len(movers)
    values, shifts = _tornado_medians(well, R)
    lows_highs = []
    for m, (pos, zn, spec, nm) in enumerate(movers):
        rows = [1 + 2 * m, 2 + 2 * m]
        if spec.joint is not None and nm in spec.joint.names:
            i, means = spec.joint.names.index(nm), _joint_means(zn, spec)
            lo, hi = (float(v) for v in spec.joint.marginal(i, means[i]).ppf(np.array([0.1, 0.9])))
            for row, v in zip(rows, (lo, hi)):
                for name, x in zip(spec.joint.names, spec.joint.conditional(i, v, means)):
                    values[pos][name][row] = x
            lows_highs.append((lo, hi))
            continue
        d = (getattr(spec, nm).distribution.centred(0.0) if nm in LOG_ERRORS
             else spec.inputs[nm].centred(deterministic_value(zn, nm)))
        lo, hi = (float(v) for v in d.ppf(np.array([0.1, 0.9])))
        target = shifts[(zn.name, nm)] if nm in LOG_ERRORS else values[pos][nm]
        target[rows[0]], target[rows[1]] = lo, hi
        lows_highs.append((lo, hi))
    chunk = _chunk_samples(R, memory_mb, well.z.size)
    _, hcpt, _ = _run(well, values, _ShiftErrors(shifts), R, chunk, False)
    total = sum(hcpt.values()) if hcpt else np.zeros(R)
    bars = [TornadoBar(zone=zn.name, input=nm, value_low=lh[0], value_high=lh[1],
                       hcpt_low=float(total[1 + 2 * m]), hcpt_high=float(total[2 + 2 * m]))
            for m, ((_, zn, _, nm), lh) in enumerate(zip(movers, lows_highs))]
    bars.sort(key=lambda b: -b.swing)
    return float(total[0]), bars
