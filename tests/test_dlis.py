"""DLIS input (optional extra ``satheight[dlis]``, dlisio): files written here by dliswriter.

The numbers checked are the file's values (written by the test) and unit factors from
nist2008; a DLIS copy of a demo LAS well must give the same run as the LAS file.
"""

from __future__ import annotations

import logging
import shutil
import warnings
from pathlib import Path

import numpy as np
import pytest

pytest.importorskip("dlisio")
dliswriter = pytest.importorskip("dliswriter")

import satheight  # noqa: E402
from satheight.errors import InputFileError  # noqa: E402
from satheight.io.dlis import read_dlis  # noqa: E402
from satheight.io.las import read_las  # noqa: E402
from satheight.roles import detect_roles  # noqa: E402

DEMO = Path(__file__).resolve().parents[1] / "demo_wells"
FOOT = 0.3048   # m (nist2008)


def _write(path: Path, frames: list[tuple[str, str, list[tuple[str, np.ndarray, str]]]],
           well_name: str = "DLIS-1") -> Path:
    """A DLIS file with ``frames`` = [(name, index type, [(channel, data, unit), ...])]."""
    logging.getLogger("dliswriter").setLevel(logging.ERROR)
    df = dliswriter.DLISFile()
    lf = df.add_logical_file()
    lf.add_origin("ORIGIN", well_name=well_name)
    for fname, index_type, chans in frames:
        made = [lf.add_channel(c, data=d, units=u or None) for c, d, u in chans]
        lf.add_frame(fname, channels=made, index_type=index_type)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        df.write(str(path), output_chunk_size=2 ** 20)   # the default buffer is 4 GiB
    return path


def test_dlis_depth_frame_read_with_units_and_roles(tmp_path):
    depth_ft = np.arange(6600.0, 6700.0, 0.5)
    phi = np.linspace(0.1, 0.3, depth_ft.size)
    perm = np.geomspace(1, 1000, depth_ft.size)
    perm[5] = -999.25                      # the absent value
    f = _write(tmp_path / "one.dlis", [("MAIN", "BOREHOLE-DEPTH",
                                         [("DEPT", depth_ft, "ft"), ("PHIE", phi, ""),
                                          ("PERM", perm, "mD")])])
    well = read_dlis(f)
    assert well.name == "DLIS-1" and well.depth_unit == "ft"
    # feet to metres (nist2008)
    assert np.allclose(well.md, depth_ft * FOOT, rtol=0, atol=1e-9)
    assert well.curves["PERM"].unit == "mD"
    # the file's values, the absent value as NaN
    assert np.allclose(well.curves["PHIE"].data, phi)
    assert np.isnan(well.curves["PERM"].data[5])
    roles = detect_roles(well, {})
    assert roles["porosity"] == "PHIE" and roles["permeability"] == "PERM"


def test_dlis_two_frames_reads_the_depth_frame_and_notes_the_other(tmp_path):
    md = np.linspace(2000.0, 2050.0, 101)
    f = _write(tmp_path / "two.dlis", [
        ("TIMED", "NON-STANDARD", [("TIME", np.arange(20.0), "s"), ("TENS", np.ones(20), "N")]),
        ("MAIN", "BOREHOLE-DEPTH", [("DEPT", md, "m"), ("PHIE", np.full(md.size, 0.2), ""),
                                     ("PERM", np.full(md.size, 50.0), "mD")])])
    well = read_dlis(f)
    assert np.allclose(well.md, md) and list(well.curves) == ["DEPT", "PHIE", "PERM"]
    # README (Bad input): what was not read is named in a note
    assert any("TIMED" in n and "TENS" in n for n in well.warnings)


def test_dlis_without_a_depth_index_is_one_clear_error(tmp_path):
    f = _write(tmp_path / "time.dlis", [("TIMED", "NON-STANDARD",
                                          [("TIME", np.arange(20.0), "s"),
                                           ("GR", np.ones(20), "gAPI")])])
    with pytest.raises(InputFileError) as exc:
        read_dlis(f)
    # README (Bad input): the error names the file, the frame and its index
    text = str(exc.value)
    assert "time.dlis" in text and "TIMED" in text and "TIME" in text and "depth" in text


def test_dlis_well_runs_like_its_las_file(tmp_path):
    """VANTREL-4 written as DLIS (its LAS file's values, depth in m) gives the same SW_SHM."""
    las = read_las(DEMO / "VANTREL-4.las")
    chans = [(c.mnemonic, c.data, c.unit) for c in las.curves.values()]
    _write(tmp_path / "VANTREL-4.dlis", [("MAIN", "BOREHOLE-DEPTH", chans)],
           well_name="VANTREL-4")
    for name in ("core_models.json", "demo_tops.csv", "demo_pressures.csv", "core_plugs.csv",
                 "core_plug_V12.csv", "core_dean_stark.csv"):
        shutil.copy(DEMO / name, tmp_path / name)
    text = (DEMO / "demo_project.toml").read_text(encoding="utf-8")
    text = text.replace('las = "VANTREL-4.las"', 'las = "VANTREL-4.dlis"')
    (tmp_path / "p.toml").write_text(text, encoding="utf-8")
    for n in ("VANTREL-1", "VANTREL-2", "VANTREL-3", "VANTREL-5"):
        shutil.copy(DEMO / f"{n}.las", tmp_path / f"{n}.las")
    shutil.copy(DEMO / "VANTREL-5_survey.csv", tmp_path / "VANTREL-5_survey.csv")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        from_dlis = satheight.run_well(satheight.open_project(tmp_path / "p.toml"), "VANTREL-4")
        from_las = satheight.run_well(satheight.demo_project(), "VANTREL-4")
    a, b = from_dlis.frame(), from_las.frame()
    # the same file values through two formats: the same results
    assert np.allclose(a.index, b.index) and np.allclose(a["SW_SHM"], b["SW_SHM"], equal_nan=True)
    report = satheight.run(tmp_path / "p.toml", tmp_path / "out", plots=False)
    assert not report.failed
    assert (tmp_path / "out" / "VANTREL-4.las").is_file()
