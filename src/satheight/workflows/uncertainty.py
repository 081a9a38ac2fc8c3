"""The Monte Carlo step of a run: percentile curves, volume distributions and the tornado.

Given a project (its ``[uncertainty]`` and ``[zones.uncertainty]`` keys) and a computed
well (:class:`satheight.results.WellResult`), :func:`well_uncertainty` runs
:func:`satheight.uncertainty.monte_carlo` and :func:`satheight.uncertainty.tornado`;
:func:`uncertainty_curves`, :func:`uncertainty_section` and :func:`write_tornado` turn
the result into what the run writes (LAS/CSV curves, a JSON section, a figure).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .. import units as U
from ..plots.tornado import tornado_figure
from ..results import WellResult
from ..uncertainty import (MonteCarloResult, TornadoBar, check_zone_uncertainty, monte_carlo,
                           tornado)
from ..well import Curve
from .figures import save_figure

#: The percentile curves written beside the SHM curves, and their descriptions.
UNCERTAINTY_CURVES = {
    "SW_P10": "Sw 10th percentile over realisations (low Sw: P10, high-volume case)",
    "SW_P50": "Sw 50th percentile over realisations (median)",
    "SW_P90": "Sw 90th percentile over realisations (high Sw: P90, low-volume case)",
}
#: Decimals written for the percentile curves in the output LAS.
UNCERTAINTY_DECIMALS = {name: 5 for name in UNCERTAINTY_CURVES}

#: The percentile convention, written into every JSON section.
CONVENTION = ("Volume convention: P90 is the value exceeded with 90 % probability (the low "
              "case), P10 the value exceeded with 10 % probability (the high case). For Sw this "
              "means SW_P90 is the 90th percentile of Sw at each depth (high Sw, low hydrocarbon) "
              "and SW_P10 the 10th percentile; HCPT P90 is the 10th percentile of the "
              "realisations' hydrocarbon pore thickness. Percentile curves are depth by depth: "
              "summing one does not give that percentile of the volume.")


@dataclass
class WellUncertainty:
    """The Monte Carlo of one well and its tornado (``bars`` empty when not asked for)."""

    result: MonteCarloResult
    base_hcpt: float | None = None
    bars: list[TornadoBar] = field(default_factory=list)
    inputs: dict = field(default_factory=dict)      # zone name -> ZoneUncertainty drawn


def well_uncertainty(project, result: WellResult) -> WellUncertainty | None:
    """Monte Carlo of one computed well, or None when the project declares no uncertainty
    for any zone of this well.

    Raises
    ------
    SatHeightError
        An uncertain input the Monte Carlo cannot use with this zone (a gas cap, per-depth
        rock types, a J-Sw parameter the function does not have, draws outside the
        function's bounds...), naming the project file and key.
    """
    spec = project.uncertainty
    if spec is None or not spec.zones:
        return None
    here = {zn.name: zn for zn in result.zones}
    unc = {name: z for name, z in spec.zones.items() if name in here}
    if not unc:
        return None
    for name, z in unc.items():
        check_zone_uncertainty(here[name], z, where=f"{project.path}, key zones[{name}].uncertainty",
                               units=U.UNIT_SYSTEMS[project.unit_system])
    cut = project.comparison
    mc = monte_carlo(result.tvdss, result.phi, result.k, result.zones, result.shm, unc,
                     spec.settings, cut.min_porosity, cut.min_permeability, well=result.well.name)
    out = WellUncertainty(result=mc, inputs=unc)
    if spec.tornado:
        out.base_hcpt, out.bars = tornado(result.tvdss, result.phi, result.k, result.zones,
                                          result.shm, unc, cut.min_porosity, cut.min_permeability,
                                          memory_mb=spec.settings.memory_mb)
    return out


def uncertainty_curves(wu: WellUncertainty | None) -> list[Curve]:
    """SW_P10, SW_P50, SW_P90 [v/v] as output curves (none without a Monte Carlo)."""
    if wu is None:
        return []
    return [Curve(name, "v/v", text, np.asarray(wu.result.sw_percentiles[name], dtype=float).copy())
            for name, text in UNCERTAINTY_CURVES.items()]


def uncertainty_section(wu: WellUncertainty, length_unit: str = "m") -> dict:
    """The JSON-ready Monte Carlo section of a well's summary (thicknesses in ``length_unit``)."""
    f = U.factor(length_unit, "length")
    mc = wu.result
    dist = mc.hcpt_distribution()

    def scale(block):
        return {k: v / f for k, v in block.items()}

    s = mc.settings
    out = {"convention": CONVENTION,
           "realisations": int(s.realisations), "seed": int(s.seed),
           "memory_mb": float(s.memory_mb), "samples_per_chunk": int(mc.block_samples),
           "porosity_values_clipped": int(mc.porosity_clipped),
           "units": {"hcpt": length_unit},
           "hcpt": {"zones": {z: {"phase": mc.phases[z], **scale(b)}
                              for z, b in dist["zones"].items()},
                    "phases": {p: scale(b) for p, b in dist["phases"].items()},
                    "well": scale(dist["well"]) if "well" in dist else None}}
    out["inputs"] = {zone: _drawn(z) for zone, z in wu.inputs.items()}
    if wu.bars:
        out["tornado"] = {
            "hcpt_all_medians": wu.base_hcpt / f,
            "bars": [{"zone": b.zone, "input": b.input, "value_at_p10_of_input": b.value_low,
                      "value_at_p90_of_input": b.value_high, "hcpt_low_input": b.hcpt_low / f,
                      "hcpt_high_input": b.hcpt_high / f, "swing": b.swing / f}
                     for b in wu.bars],
            "note": "input values in SI (m, kg/m3, N/m; log errors: porosity fraction, "
                    "permeability decades)"}
    return out


def _drawn(z) -> dict:
    """What a zone's Monte Carlo draws: each input's distribution, the log errors, and the
    J-Sw parameters drawn together with where their covariance came from."""
    out = {"inputs": {name: d.kind for name, d in sorted(z.inputs.items())},
           "porosity_error": None if z.porosity_error is None else z.porosity_error.distribution.kind,
           "permeability_error": (None if z.permeability_error is None
                                  else z.permeability_error.distribution.kind),
           "joint": None}
    if z.joint is not None:
        out["joint"] = {"parameters": list(z.joint.names), "covariance_from": z.joint.source}
    return out


def write_tornado(wu: WellUncertainty | None, path: Path, title: str,
                  length_unit: str = "m") -> list[Path]:
    """Write the well's tornado chart (PNG) if it has one; return the files written."""
    if wu is None or not wu.bars:
        return []
    fig = tornado_figure(wu.base_hcpt, wu.bars, title=title, length_unit=length_unit,
                         length_factor=U.factor(length_unit, "length"))
    return save_figure(fig, path)
