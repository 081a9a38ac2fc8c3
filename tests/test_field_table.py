"""Field summary and all-wells tables (Parquet and CSV): read back with pandas, pyarrow and csv."""

from __future__ import annotations

import csv
import json
import shutil
from pathlib import Path

import lasio
import numpy as np
import pandas as pd
import pyarrow.parquet as pq
import pytest

from satheight.errors import SatHeightError
from satheight.io.tables import merge_tables, safe_cell, write_table

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
FT = 0.3048                     # m per international foot (NIST SP 811)


def test_table_round_trips_through_pandas_and_csv(tmp_path):
    cols = {"WELL": ["A-1", "=cmd|' /C calc'!A0", "B\n2"], "MD [m]": [1.0, 2.5, np.nan],
            "N": np.array([1, 2, 3])}
    files = write_table(cols, tmp_path / "t.parquet", tmp_path / "t.csv", metadata={"unit": "m"})
    assert [f.name for f in files] == ["t.parquet", "t.csv"]
    frame = pd.read_parquet(tmp_path / "t.parquet")           # pandas reads it back
    assert list(frame.columns) == ["WELL", "MD [m]", "N"]
    np.testing.assert_array_equal(frame["MD [m]"].to_numpy()[:2], [1.0, 2.5])
    assert pd.isna(frame["MD [m]"].iloc[2])                    # NaN written as null
    assert pq.read_schema(tmp_path / "t.parquet").metadata[b"unit"] == b"m"
    with open(tmp_path / "t.csv", newline="", encoding="utf-8") as f:
        rows = list(csv.reader(f))                              # the standard library's parser
    assert rows[0] == ["WELL", "MD [m]", "N"]
    # a cell that would start a spreadsheet formula stays text (common practice), line breaks go
    assert rows[2][0] == "'=cmd|' /C calc'!A0" and rows[3][0] == "B 2"
    assert rows[3][1] == "" and float(rows[2][1]) == 2.5


def test_safe_cell_leaves_plain_names_alone():
    assert safe_cell("Upper Sand") == "Upper Sand"
    assert safe_cell("-5 m") == "'-5 m" and safe_cell("@x") == "'@x"


def test_merge_keeps_the_union_of_columns_in_order(tmp_path):
    write_table({"WELL": ["A", "A"], "X": [1.0, 2.0]}, tmp_path / "a.parquet")
    write_table({"WELL": ["B"], "Y": [5.0], "X": [3.0]}, tmp_path / "b.parquet")
    merge_tables([tmp_path / "a.parquet", tmp_path / "b.parquet"], tmp_path / "all.parquet",
                 tmp_path / "all.csv")
    frame = pd.read_parquet(tmp_path / "all.parquet")
    assert list(frame.columns) == ["WELL", "X", "Y"]
    assert frame["WELL"].tolist() == ["A", "A", "B"]
    np.testing.assert_array_equal(frame["X"], [1.0, 2.0, 3.0])
    assert frame["Y"].isna().tolist() == [True, True, False]
    text = pd.read_csv(tmp_path / "all.csv")
    pd.testing.assert_frame_equal(text, frame, check_dtype=False)      # CSV writes 1.0 as 1


def test_merge_refuses_a_column_of_text_in_one_part_and_numbers_in_another(tmp_path):
    write_table({"X": [1.0]}, tmp_path / "a.parquet")
    write_table({"X": ["one"]}, tmp_path / "b.parquet")
    with pytest.raises(SatHeightError, match="'X'"):
        merge_tables([tmp_path / "a.parquet", tmp_path / "b.parquet"], tmp_path / "m.parquet", None)
    assert not (tmp_path / "m.parquet").exists()             # nothing half-written


def test_run_writes_field_summary_and_all_wells_tables(tmp_path):
    from satheight.workflows.run import run_project

    folder = tmp_path / "demo"
    shutil.copytree(DEMO, folder)
    out = tmp_path / "out"
    report = run_project(folder / "demo_project.toml", out, plot=False, csv=True)
    ok = [w for w in report.wells if w.ok]
    assert len(ok) == 5
    run = json.loads((out / "run_summary.json").read_text())
    assert set(run["tables"]) == {"field_summary.parquet", "field_summary.csv",
                                  "all_wells.parquet", "all_wells.csv"}
    assert all((out / f"{w.name}.csv").is_file() for w in ok)
    summary = pd.read_parquet(out / "field_summary.parquet")
    assert len(summary) == 5 * 2                                  # every well and zone
    pd.testing.assert_frame_equal(pd.read_csv(out / "field_summary.csv"), summary,
                                  check_dtype=False)
    for w in ok:
        for zone, block in w.summary["zones"].items():
            row = summary[(summary.WELL == w.name) & (summary.ZONE == zone)].iloc[0]
            assert row["FWL_SOURCE"] == "project file"
            assert row["FWL_TVDSS [m]"] == pytest.approx(block["fwl_tvdss"])
            assert row["HCPT_SHM [m]"] == pytest.approx(block["hcpt_shm"])
            assert row["PHASE"] == block["hydrocarbon"]
    long = pd.read_parquet(out / "all_wells.parquet")
    sizes = {w.name: len(lasio.read(out / f"{w.name}.las").index) for w in ok}
    assert long.groupby("WELL", sort=False).size().to_dict() == sizes
    assert list(long["WELL"].unique()) == [w.name for w in ok]     # project order
    # the foot well: MD in the project's metres from its feet (exact foot)
    las3 = lasio.read(out / "VANTREL-3.las")
    rows3 = long[long.WELL == "VANTREL-3"]
    np.testing.assert_allclose(rows3["MD [m]"], las3.index * FT, rtol=1e-12)
    np.testing.assert_allclose(rows3["TVDSS [m]"], las3["TVDSS"] * FT, atol=1e-3)
    np.testing.assert_allclose(rows3["SW_SHM [v/v]"], las3["SW_SHM"], atol=1e-5, equal_nan=True)
    assert set(rows3["ZONE"]) <= {"Upper Sand", "Lower Sand", ""}
    assert len(pd.read_csv(out / "all_wells.csv", usecols=["WELL"])) == len(long)


def test_samples_are_written_as_csv_only_when_asked(tmp_path):
    """README "Outputs": each well's samples and all_wells go to Parquet; CSV copies of them
    only with --csv (csv=True); the small field summary is written in both formats."""
    from satheight.workflows.run import run_project

    folder = tmp_path / "demo"
    shutil.copytree(DEMO, folder)
    out = tmp_path / "out"
    report = run_project(folder / "demo_project.toml", out, plot=False)
    names = {p.name for p in out.iterdir()}
    assert {"field_summary.csv", "field_summary.parquet", "all_wells.parquet"} <= names
    assert "all_wells.csv" not in names
    for w in report.wells:
        assert f"{w.name}.parquet" in names and f"{w.name}.las" in names
        assert f"{w.name}.csv" not in names
        assert all(f.suffix != ".csv" for f in w.files)
    run = json.loads((out / "run_summary.json").read_text())
    assert set(run["tables"]) == {"field_summary.parquet", "field_summary.csv", "all_wells.parquet"}
