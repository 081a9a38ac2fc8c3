"""Every mnemonic of the exported LAS ~Parameter section appears once: a reader (lasio here,
a general-purpose library) would otherwise see two values under one name."""

from __future__ import annotations

from collections import Counter

import lasio
import pytest

from satheight.cli import main
from satheight.errors import SatHeightError
from satheight.io.las import read_las
from satheight.io.las_write import write_las
from satheight.well import HeaderItem
from tiny_field import make_field


def test_exported_parameter_section_has_rw_once(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    las = tmp_path / "w0.las"
    las.write_text(las.read_text(encoding="utf-8").replace(
        "~Curve\n", "~Parameter\nRW.OHMM 0.045 : water resistivity of the logging company\n~Curve\n"),
        encoding="utf-8")
    out = tmp_path / "out"
    assert main(["run", str(p), "--no-plots", "--quiet", "--out", str(out)]) == 0
    # lasio reads LAS 2.0 ~Parameter lines as they are written (duplicates too)
    params = [it.mnemonic.split(":")[0] for it in lasio.read(out / "W0.las").params]
    assert [m for m, n in Counter(params).items() if n > 1] == []
    got = {it.mnemonic: it.value for it in lasio.read(out / "W0.las").params}
    assert float(got["RW"]) == pytest.approx(0.045)          # the input's item, kept as read
    assert float(got["ARCHIE_RW"]) == pytest.approx(0.05)    # rw of the project file's [log_sw]


def test_writer_refuses_a_parameter_already_in_the_input(tmp_path):
    p = make_field(tmp_path, wells=(("w0.las", "W0"),))
    las = tmp_path / "w0.las"
    las.write_text(las.read_text(encoding="utf-8").replace(
        "~Curve\n", "~Parameter\nRW.OHMM 0.045 :\n~Curve\n"), encoding="utf-8")
    well = read_las(las)
    with pytest.raises(SatHeightError) as e:
        write_las(tmp_path / "x.las", well, parameters=[HeaderItem("RW", "ohm.m", 0.05, "rw")])
    assert "RW" in str(e.value) and not (tmp_path / "x.las").exists()
