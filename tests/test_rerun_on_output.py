"""A run on a folder of satheight's own output: computed curves replaced, or new ones suffixed.

The tiny field (tests/tiny_field.py) is vertical with EKB 25 m, so TVDSS = MD - 25 m
(closed form), and its log Sw is Archie with a = 1, m = n = 2, Rw = 0.05 ohm.m
(archie1942): Sw = sqrt(0.05 / (PHIE^2 RT)), clipped to [0, 1].
"""

import hashlib
import json

import lasio
import numpy as np
import pytest

from satheight.workflows.run import run_project
from tiny_field import make_field


def _archie(las):
    phi, rt = las["PHIE"], las["RT"]
    return np.clip(np.sqrt(0.05 / (phi**2 * rt)), 0, 1)


@pytest.fixture(scope="module")
def first_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("field")
    project = make_field(folder)
    run_project(project, folder / "out1", plot=False)
    text = project.read_text(encoding="utf-8").replace('las = "w0.las"', 'las = "out1/W0.las"')
    again = folder / "again.toml"
    again.write_text(text.replace('las = "w1.las"', 'las = "out1/W1.las"'), encoding="utf-8")
    return folder, again


def _sha(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_rerun_replaces_computed_curves_with_a_note(first_run):
    folder, again = first_run
    before = _sha(folder / "out1" / "W0.las")
    report = run_project(again, folder / "out2", plot=False)
    assert not report.failed
    las = lasio.read(folder / "out2" / "W0.las")
    names = [c.mnemonic for c in las.curves]
    assert len(names) == len(set(names)), names        # each curve once (README: outputs)
    # closed form: vertical well, EKB 25 m -> TVDSS = MD - 25 m
    np.testing.assert_allclose(las["TVDSS"], las["DEPT"] - 25.0, atol=1e-4)
    # archie1942: log Sw from RT again, not the earlier run's SW_LOG taken as a Sw curve
    np.testing.assert_allclose(las["SW_LOG"], _archie(las), atol=1e-5)
    summary = json.loads((folder / "out2" / "W0_summary.json").read_text(encoding="utf-8"))
    assert summary["sw_log_source"] == "archie"
    params = [p.mnemonic for p in las.params]
    assert params.count("SHM_VERSION") == 1 and params.count("Z1_FWL") == 1
    notes = json.dumps(json.loads((folder / "out2" / "run_summary.json").read_text("utf-8")))
    assert "replaced by the newly computed ones" in notes
    # README (safety): inputs are never modified
    assert _sha(folder / "out1" / "W0.las") == before


def test_rerun_with_suffix_keeps_both(first_run):
    folder, again = first_run
    report = run_project(again, folder / "out3", plot=False, existing="suffix")
    assert not report.failed
    las = lasio.read(folder / "out3" / "W0.las")
    # closed form: both the earlier and the new TVDSS are MD - 25 m
    np.testing.assert_allclose(las["TVDSS"], las["DEPT"] - 25.0, atol=1e-4)
    np.testing.assert_allclose(las["TVDSS_2"], las["DEPT"] - 25.0, atol=1e-4)
    np.testing.assert_allclose(las["SW_LOG_2"], _archie(las), atol=1e-5)   # archie1942
    notes = (folder / "out3" / "run_summary.json").read_text("utf-8")
    assert "TVDSS -> TVDSS_2" in notes


def test_users_own_sw_log_curve_is_kept_as_log_sw(tmp_path):
    """A LAS file not written by satheight with a curve SW_LOG: with method auto it is the
    user's log Sw (an alias of the sw role), kept and used, never replaced by Archie."""
    project = make_field(tmp_path)
    las = tmp_path / "w0.las"
    text = las.read_text(encoding="utf-8").replace("RT.OHMM : resistivity\n",
                                                   "RT.OHMM : resistivity\nSW_LOG.V/V : log Sw\n")
    head, data = text.split("~A\n")
    rows = [r + " 0.3" for r in data.strip().splitlines()]
    las.write_text(head + "~A\n" + "\n".join(rows) + "\n", encoding="utf-8")
    run_project(project, tmp_path / "out", plot=False)
    summary = json.loads((tmp_path / "out" / "W0_summary.json").read_text(encoding="utf-8"))
    assert summary["sw_log_source"] == "curve:SW_LOG"
    out = lasio.read(tmp_path / "out" / "W0.las")
    # the file's values: 0.3 written above, kept as read
    assert np.allclose(out["SW_LOG"], 0.3)
