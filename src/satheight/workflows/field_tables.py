"""Tables of a whole run: a field summary of every well and zone, and all wells in one long table.

* :func:`write_well_table`: one well's samples as ``<well>.parquet`` (well, MD, TVDSS and
  zone name, then every input and output curve, as in the well's CSV), the part the
  all-wells table is merged from (written by the worker that computed the well);
* :func:`write_field_tables`: at the end of a run, ``field_summary.csv`` /
  ``field_summary.parquet`` (one row per well and zone: FWL used and its source, pore
  thickness per phase from the SHM and from the logs, with the Monte Carlo P90 / P50 /
  P10 where the project has uncertainty keys, and the SHM-minus-log Sw statistics) and
  ``all_wells.parquet`` (every well's table, in project order; ``all_wells.csv`` too when
  asked for).

Lengths are in the project's length unit (``m`` or ``ft``), named in each column.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from .. import units as U
from ..io.tables import CodedText, merge_tables, write_table
from ..results import WellResult

#: Columns of the field summary taken from each zone block of a well summary:
#: (column, key in the block, True when it is a length in the project's unit).
SUMMARY_COLUMNS = (("FWL_TVDSS", "fwl_tvdss", True), ("HCPT_SHM", "hcpt_shm", True),
                   ("HCPT_LOG", "hcpt_log", True), ("SW_MEAN_DIFFERENCE", "mean_difference", False),
                   ("SW_RMS_DIFFERENCE", "rms_difference", False),
                   ("SAMPLES_COMPARED", "samples_compared", False),
                   ("NET_VERTICAL_THICKNESS", "net_vertical_thickness", True))
#: Where the FWL of a run comes from (the run uses the project file's value).
FWL_SOURCE = "project file"


def well_table_columns(result: WellResult, project, new_curves) -> dict:
    """Ordered columns of one well's long table.

    ``WELL``, ``MD [unit]`` and ``TVDSS [unit]`` in the project's length unit, ``ZONE``
    (the zone's name, empty outside zones), then every input curve and every new curve
    as ``MNEMONIC [unit]`` in the units of the well's files (as in its CSV).
    """
    unit = U.UNIT_SYSTEMS[project.unit_system]["length"]
    n = result.well.md.size
    zone = np.asarray(result.shm.zone)
    cols = {"WELL": CodedText([result.well.name], np.zeros(n, dtype=np.int64)),
            f"MD [{unit}]": U.from_si(result.well.md, unit, "length"),
            f"TVDSS [{unit}]": U.from_si(result.tvdss, unit, "length"),
            "ZONE": CodedText([zn.name for zn in result.zones] + [""],     # -1: outside, ""
                              np.where(zone < 0, len(result.zones), zone))}
    for c in list(result.well.curves.values()) + list(new_curves):
        label = f"{c.mnemonic} [{c.unit}]" if c.unit else c.mnemonic
        if label in cols or c.mnemonic == "TVDSS":        # TVDSS is above, in the project unit
            continue
        cols[label] = c.data
    return cols


def write_well_table(result: WellResult, project, new_curves, path: Path) -> list[Path]:
    """Write one well's long table as Parquet (the part the all-wells table is merged from)."""
    return write_table(well_table_columns(result, project, new_curves), parquet_path=path,
                       metadata={"well": result.well.name, "source": str(result.well.source)})


def _unc_block(block: dict) -> dict:
    return (block.get("uncertainty") or {}).get("hcpt", {}).get("zones", {})


def field_summary_columns(summaries: list[dict], length_unit: str) -> dict:
    """One row per well and zone from the wells' summaries (as in ``run_summary.json``)."""
    rows = []
    for s in summaries:
        mc = _unc_block(s)
        for zone, b in s.get("zones", {}).items():
            row = {"WELL": s.get("well"), "ZONE": zone, "PHASE": b.get("hydrocarbon"),
                   "FWL_SOURCE": b.get("fwl_source", FWL_SOURCE), "SW_LOG_SOURCE": s.get("sw_log_source")}
            for col, key, is_len in SUMMARY_COLUMNS:
                v = b.get(key)
                row[f"{col} [{length_unit}]" if is_len else col] = np.nan if v is None else v
            dist = mc.get(zone, {})
            for p in ("P90", "P50", "P10"):
                row[f"HCPT_SHM_{p} [{length_unit}]"] = dist.get(p, np.nan)
            rows.append(row)
    if not rows:
        return {}
    return {k: [r[k] for r in rows] for k in rows[0]}


def write_field_tables(summaries: list[dict], well_tables: list[Path], out_dir: Path,
                       project, csv: bool = False) -> list[Path]:
    """Write the field summary (CSV and Parquet) and the all-wells table (Parquet, and CSV
    when ``csv``); return the files.

    Parameters
    ----------
    summaries : list[dict]
        The computed wells' summaries in project order.
    well_tables : list[pathlib.Path]
        Their ``<well>.parquet`` tables, in project order.
    """
    unit = U.UNIT_SYSTEMS[project.unit_system]["length"]
    meta = {"project": project.name, "length_unit": unit,
            "caution": "Results are estimates for review by a qualified professional."}
    files = []
    cols = field_summary_columns(summaries, unit)
    if cols:
        files += write_table(cols, out_dir / "field_summary.parquet", out_dir / "field_summary.csv",
                             metadata=meta)
    files += merge_tables(well_tables, out_dir / "all_wells.parquet",
                          out_dir / "all_wells.csv" if csv else None, metadata=meta)
    return files
