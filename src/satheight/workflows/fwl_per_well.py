"""The FWL of a zone in one well: the well's own value, a tilted plane, or the zone's.

Order of precedence: ``[wells.fwl]`` of the well (a compartment, a stepped contact), then
the zone's ``fwl_plane`` evaluated at the well's ``location`` (a tilted contact), then the
zone's ``fwl``. The plane is evaluated at the well head: for a deviated well the contact
depth under the zone's penetration differs by the gradient times the horizontal offset,
which the source text says.
"""

from __future__ import annotations

from .. import units as U
from ..engine import fwl_on_plane
from ..errors import ProjectFileError
from ..project.types import Project, WellSpec, ZoneSpec


def well_fwl(project: Project, spec: WellSpec, zs: ZoneSpec) -> tuple[float | None, str | None]:
    """``(FWL TVDSS [m], source in words)`` of zone ``zs`` in this well, or ``(None, None)``
    when the zone's own ``fwl`` applies.

    Raises
    ------
    ProjectFileError
        If the zone has an ``fwl_plane`` and the well no ``location``.
    """
    label = spec.name or spec.las.stem
    if zs.name in spec.fwl:
        return spec.fwl[zs.name], f"well value (wells[{label}].fwl.{zs.name})"
    if zs.fwl_plane is None:
        return None, None
    if spec.location is None:
        raise ProjectFileError(f"zone {zs.name!r} has a tilted FWL (fwl_plane) but well "
                               f"{label!r} has no location to evaluate it at",
                               where=f"{project.path}, key wells[{label}].location",
                               hint="add location = { east = ..., north = ... } (well head, map "
                                    f"coordinates) to the well, or give its own FWL under "
                                    f"[wells.fwl] {zs.name} = ...")
    east0, north0, ge, gn = zs.fwl_plane
    east, north = spec.location
    z = float(fwl_on_plane(zs.fwl, east0, north0, ge, gn, east, north))
    unit = U.UNIT_SYSTEMS[project.unit_system]["length"]

    def show(v):
        return f"{U.from_si(v, unit, 'length'):.2f} {unit}"

    return z, (f"plane zones[{zs.name}].fwl_plane at the well head (east {show(east)}, "
               f"north {show(north)})")
