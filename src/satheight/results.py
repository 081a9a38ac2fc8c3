"""Containers that carry one well's computed results between engine, writers and plots."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .well import Well

# Bit flags of the SHM_FLAG curve. A sample may carry several (sum of bits).
FLAG_NO_ZONE = 1          #: sample lies in no zone: no SHM saturation computed
FLAG_BAD_POROSITY = 2     #: porosity missing, zero, negative or above 1: Sw is NaN
FLAG_BAD_PERMEABILITY = 4  #: permeability missing, zero or negative: Sw is NaN
FLAG_J_BELOW_RANGE = 8    #: J above zero but below the calibrated range of the function
FLAG_J_ABOVE_RANGE = 16   #: J above the calibrated range of the function (extrapolated)
FLAG_NO_ROCK_FUNCTION = 32  #: the sample's rock type has no fitted function: Sw is NaN

FLAG_MEANINGS = {
    FLAG_NO_ZONE: "outside every zone",
    FLAG_BAD_POROSITY: "porosity missing or outside (0, 1]",
    FLAG_BAD_PERMEABILITY: "permeability missing or not positive",
    FLAG_J_BELOW_RANGE: "J below the calibrated range of the J-Sw function",
    FLAG_J_ABOVE_RANGE: "J above the calibrated range of the J-Sw function",
    FLAG_NO_ROCK_FUNCTION: "rock type of the sample has no fitted function",
}


@dataclass
class ShmResult:
    """Per-sample saturation-height results, all SI float64 arrays of one length.

    Attributes
    ----------
    zone : numpy.ndarray of int
        Index of the zone each sample falls in, -1 where none.
    hafwl : numpy.ndarray
        Height above the free-water level [m] (negative below it), NaN outside zones.
    pc : numpy.ndarray
        Reservoir capillary pressure [Pa], 0 at and below the FWL, NaN outside zones.
    j : numpy.ndarray
        Leverett J [-], NaN where porosity or permeability is unusable.
    sw : numpy.ndarray
        Predicted water saturation [fraction], 1 at and below the FWL.
    flag : numpy.ndarray of int
        Sum of the FLAG_* bits above.
    """

    zone: np.ndarray
    hafwl: np.ndarray
    pc: np.ndarray
    j: np.ndarray
    sw: np.ndarray
    flag: np.ndarray


@dataclass(frozen=True)
class WellPlugs:
    """The core plugs of one well placed in depth (SI): what its track plot draws.

    Attributes
    ----------
    plug : numpy.ndarray of str
        Plug ids, in the order of the files.
    md : numpy.ndarray
        Measured depth of each plug [m], as the core file gives it.
    tvdss : numpy.ndarray
        TVDSS [m], positive down: the MD turned into TVDSS through the well's
        trajectory and datum exactly as the log samples are.
    sw : numpy.ndarray
        Water saturation measured on the plug (e.g. Dean-Stark) [fraction], NaN
        where the file gives none.
    porosity, permeability : numpy.ndarray
        [fraction], [m^2].
    """

    plug: np.ndarray
    md: np.ndarray
    tvdss: np.ndarray
    sw: np.ndarray
    porosity: np.ndarray
    permeability: np.ndarray


@dataclass
class WellResult:
    """Everything computed for one well: what writers, summaries and plots read.

    Attributes
    ----------
    well : Well
        The loaded input well (unchanged).
    tvdss : numpy.ndarray
        True vertical depth below the depth datum (sea level) [m], positive down.
    zones : list
        The :class:`satheight.engine.Zone` records used for this well (with
        this well's top and base).
    shm : ShmResult
        Saturation-height results.
    phi, k : numpy.ndarray
        Porosity [fraction] and permeability [m^2] used, in SI.
    rt : numpy.ndarray or None
        Deep resistivity [ohm.m] if present.
    sw_log : numpy.ndarray or None
        Log (resistivity-derived or given) water saturation [fraction].
    sw_log_source : str
        ``"curve:<MNEMONIC>"`` or ``"archie"`` or ``"none"``.
    roles : dict[str, str | None]
        Mnemonic used for each role (porosity, permeability, resistivity, sw).
    summary : dict
        The JSON-ready per-well and per-zone comparison (filled by
        :func:`satheight.compare.summarise`).
    tvd : numpy.ndarray or None
        True vertical depth below the log depth reference [m], positive down
        (= MD for a well without a survey).
    north, east : numpy.ndarray or None
        Horizontal offsets of each sample from the well head [m] (0 for a well
        without a survey).
    survey : pathlib.Path or None
        The deviation survey used, if any.
    datum_elevation : float
        Elevation of the log depth reference above the TVDSS datum [m].
    datum_source : str
        Where ``datum_elevation`` came from (the project file, or which LAS header item).
    sw_log_unclipped : numpy.ndarray or None
        Archie log Sw before clipping to [0, 1] [fraction] (``None`` when log Sw is a
        curve of the LAS file): the comparison statistics use it; ``sw_log`` (clipped)
        is what is exported.
    vsh : numpy.ndarray or None
        Shale volume [fraction] from the well's ``shale`` curve, if it has one.
    plugs : WellPlugs or None
        The well's core plugs from the project's ``core_files`` (None: none).
    pressures : satheight.pressures.PressurePoints or None
        The well's formation-pressure points from the project's ``pressure_file``,
        every TVDSS filled (None: none).
    """

    well: Well
    tvdss: np.ndarray
    zones: list
    shm: ShmResult
    phi: np.ndarray
    k: np.ndarray
    rt: np.ndarray | None
    sw_log: np.ndarray | None
    sw_log_source: str
    roles: dict[str, str | None]
    datum_elevation: float = 0.0
    datum_source: str = ""
    summary: dict[str, Any] = field(default_factory=dict)
    tvd: np.ndarray | None = None
    north: np.ndarray | None = None
    east: np.ndarray | None = None
    survey: Any = None
    sw_log_unclipped: np.ndarray | None = None
    vsh: np.ndarray | None = None
    plugs: WellPlugs | None = None
    pressures: Any = None
