"""Plain typed objects a project file is read into. All quantities are SI.

See :mod:`satheight.project` for the reader and the README for the file format.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from ..engine import Zone


@dataclass(frozen=True)
class FunctionSpec:
    """A J-Sw function as named in a project file.

    Attributes
    ----------
    family : str
        Registry key in :data:`satheight.models.FAMILIES` (``"power_law"``, ``"brooks_corey"``).
    params : dict[str, float]
        The family's parameters, dimensionless.
    j_range : tuple[float, float] or None
        J range the function was calibrated on; samples outside it are flagged.
    file : pathlib.Path or None
        Model file the function came from (``[zones.function] file = ...``).
    rock_type : str or None
        Rock type of the model file used for the whole zone.
    by_rock_type : dict[str, FunctionSpec] or None
        Per-depth rock typing: one function per rock type of the model file; the
        rock type of each sample follows ``rock_rule`` from the log phi and k.
        ``family``/``params`` then hold the first rock type's function.
    rock_rule : satheight.rocktypes.RockTypeRule or None
    """

    family: str
    params: dict[str, float]
    j_range: tuple[float, float] | None = None
    file: Path | None = None
    rock_type: str | None = None
    by_rock_type: dict | None = None
    rock_rule: object | None = None


#: A ``[[zones]]`` entry as read: :class:`satheight.engine.Zone` with ``function`` a
#: :class:`FunctionSpec` (one zone record for the project file and the engine).
ZoneSpec = Zone


@dataclass(frozen=True)
class WellSpec:
    """One well of the project.

    Attributes
    ----------
    name : str
        Name used in outputs (defaults to the LAS file's WELL item or stem).
    las : pathlib.Path
        Absolute path of the LAS file (resolved relative to the project file).
    datum_elevation : float or None
        Elevation of the log depth reference (KB, drill floor, ground) above the
        TVDSS datum [m]. ``None``: take it from the LAS header.
    curves : dict[str, str]
        Role -> mnemonic overrides (roles: porosity, permeability, resistivity, sw).
    tops : dict[str, tuple[float, float]]
        Zone name -> (top, base) in this well's measured depth [m].
    survey : pathlib.Path or None
        Absolute path of the deviation survey (CSV or LAS); ``None``: vertical well.
    survey_format : str or None
        ``"csv"`` or ``"las"``; ``None``: from the file ending.
    tops_tvdss : dict[str, tuple[float, float]]
        Zone name -> (top, base) in TVDSS [m], positive down (from the tops file).
    location : tuple[float, float] or None
        Well-head position (east, north) [m] in the field's map coordinates, for
        the field cross-section and a tilted FWL (``fwl_plane``); ``None`` if not given.
    fwl : dict[str, float]
        Zone name -> this well's own FWL TVDSS [m] (``[wells.fwl]``), overriding the
        zone's ``fwl`` and ``fwl_plane`` in this well (a compartment, a stepped contact).
    """

    name: str | None
    las: Path
    datum_elevation: float | None = None
    curves: dict[str, str] = field(default_factory=dict)
    tops: dict[str, tuple[float, float]] = field(default_factory=dict)
    survey: Path | None = None
    survey_format: str | None = None
    tops_tvdss: dict[str, tuple[float, float]] = field(default_factory=dict)
    location: tuple[float, float] | None = None
    fwl: dict[str, float] = field(default_factory=dict)


@dataclass(frozen=True)
class LogSwSpec:
    """How log water saturation is obtained.

    Attributes
    ----------
    method : str
        ``"curve"`` (use the well's Sw curve), ``"archie"`` (compute from Rt and
        porosity), ``"auto"`` (curve if the well has one, else Archie), or a shaly-sand
        equation from Rt, porosity and the shale-volume curve: ``"simandoux"``,
        ``"indonesia"`` (:data:`satheight.logsw.SHALY_SAND`).
    a, m, n : float
        Archie tortuosity factor, cementation and saturation exponents.
    rw : float or None
        Formation-water resistivity at formation temperature [ohm.m].
    rsh : float or None
        Shale resistivity [ohm.m]; required by the shaly-sand methods.
    """

    method: str = "auto"
    a: float = 1.0
    m: float = 2.0
    n: float = 2.0
    rw: float | None = None
    rsh: float | None = None


@dataclass(frozen=True)
class ComparisonSpec:
    """Which samples count as reservoir when SHM Sw is compared with log Sw.

    Attributes
    ----------
    min_porosity : float
        Samples with porosity below this [fraction] are left out of the
        difference statistics and hydrocarbon pore thickness (net reservoir cutoff).
    min_permeability : float
        Samples with permeability below this [m^2] are left out likewise.
    max_shale : float or None
        Samples with shale volume (the ``shale`` curve role) above this [fraction]
        are left out likewise; ``None``: no shale cutoff.
    """

    min_porosity: float = 0.0
    min_permeability: float = 0.0
    max_shale: float | None = None


@dataclass(frozen=True)
class Project:
    """A whole project file, validated.

    Attributes
    ----------
    path : pathlib.Path
        The project file.
    name : str
    unit_system : str
        ``"metric"`` or ``"field"``: units of bare numbers in the file and of outputs.
    wells : list[WellSpec]
    zones : list[Zone]
    log_sw : LogSwSpec
    comparison : ComparisonSpec
    tops_file : pathlib.Path or None
        The formation-tops CSV named by ``[project] tops_file`` (already merged
        into the wells' ``tops`` and ``tops_tvdss``), or ``None``.
    tops_pending : dict[str, list]
        Tops-file rows (:class:`satheight.io.tops.TopRow`) of well names that no
        well has by ``name`` or LAS file stem; matched to a well without an explicit
        name by the WELL item of its LAS file when the well is read.
    """

    path: Path
    name: str
    unit_system: str
    wells: list[WellSpec]
    zones: list[Zone]
    log_sw: LogSwSpec
    comparison: ComparisonSpec = field(default_factory=lambda: ComparisonSpec())
    tops_file: Path | None = None
    tops_pending: dict = field(default_factory=dict)
    #: Monte Carlo settings and per-zone uncertain inputs
    #: (:class:`satheight.project.uncertainty_keys.UncertaintySpec`), or None.
    uncertainty: object | None = None
    #: Core plugs and formation-pressure points named by ``[project] core_files`` and
    #: ``pressure_file`` (:class:`satheight.project.measured.Measured`), or None.
    measured: object | None = None
