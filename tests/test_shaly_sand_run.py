"""Shaly-sand log Sw and the shale-volume cutoff through the project file and one well."""

import numpy as np
import pytest

from satheight.compare import summarise
from satheight.errors import ProjectFileError, SatHeightError
from satheight.project import load_project
from satheight.workflows.well import compute_well, output_curves

PROJECT = """[project]
units = "metric"
[log_sw]
{log_sw}
[comparison]
{comparison}
[[wells]]
las = "w.las"
{curves}
[[zones]]
name = "S"
top = "975 m"
base = "1075 m"
fwl = "1100 m"
hydrocarbon = "oil"
water_density = "1.05 g/cm3"
hydrocarbon_density = "0.8 g/cm3"
sigma_cos_theta = "26 mN/m"
[zones.function]
family = "power_law"
swirr = 0.1
a = 0.2
b = 1.5
"""


def _field(tmp_path, log_sw, comparison="", curves="", vsh_name="VSH"):
    """Depth 1000-1099.9 m MD, EKB 25 m; PHIE 0.2, PERM 100 mD, RT 20 ohm.m everywhere;
    the shale curve alternates 0.2 and 0.6 (sample 0 is 0.2)."""
    n = 1000
    d = 1000 + 0.1 * np.arange(n)
    vsh = np.where(np.arange(n) % 2 == 0, 0.2, 0.6)
    cols = np.column_stack([d, np.full(n, 0.2), np.full(n, 100.0), np.full(n, 20.0), vsh])
    head = ("~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\nSTRT.M 1000 :\n"
            f"STOP.M {d[-1]:.1f} :\nSTEP.M 0.1 :\nNULL. -999.25 :\nWELL. W :\nEKB.M 25 :\n"
            "~Curve\nDEPT.M : depth\nPHIE.V/V : porosity\nPERM.MD : permeability\n"
            f"RT.OHMM : resistivity\n{vsh_name}.V/V : shale volume\n~A\n")
    with open(tmp_path / "w.las", "w", encoding="utf-8") as f:
        f.write(head)
        np.savetxt(f, cols, fmt=["%.1f", "%.4f", "%.3f", "%.3f", "%.3f"])
    p = tmp_path / "p.toml"
    p.write_text(PROJECT.format(log_sw=log_sw, comparison=comparison, curves=curves),
                 encoding="utf-8")
    return p


def test_simandoux_log_sw_from_project_file(tmp_path):
    """method = "simandoux" with rsh = 2 ohm.m: at Vsh = 0.2 the root worked by hand in
    tests/test_shaly_sand.py, 0.1951941 (simandoux1963, computed); the exported curve is
    named for the method."""
    p = _field(tmp_path, 'method = "simandoux"\nrw = "0.05 ohm.m"\nrsh = "2 ohm.m"')
    result, _ = compute_well(load_project(p), load_project(p).wells[0])
    assert result.sw_log_source == "simandoux"
    # simandoux1963: computed worked example (closed form in tests/test_shaly_sand.py)
    assert result.sw_log[0] == pytest.approx(0.1951941, abs=1e-6)
    curve = next(c for c in output_curves(result, load_project(p)) if c.mnemonic == "SW_LOG")
    assert "Simandoux" in curve.description


def test_indonesia_log_sw_with_named_shale_curve(tmp_path):
    """The shale curve named under curves (role shale): Indonesia at Vsh = 0.2 is 0.2108417
    (poupon1971, computed in tests/test_shaly_sand.py)."""
    p = _field(tmp_path, 'method = "indonesia"\nrw = "0.05 ohm.m"\nrsh = "2 ohm.m"',
               curves='curves = { shale = "CLAYV" }', vsh_name="CLAYV")
    project = load_project(p)
    result, _ = compute_well(project, project.wells[0])
    # poupon1971: computed worked example
    assert result.sw_log[0] == pytest.approx(0.2108417, abs=1e-6)


def test_shaly_sand_method_needs_rsh(tmp_path):
    """README (log Sw): a shaly-sand method without rsh is refused, naming the key."""
    p = _field(tmp_path, 'method = "indonesia"\nrw = "0.05 ohm.m"')
    with pytest.raises(ProjectFileError) as e:
        load_project(p)
    assert "log_sw.rsh" in str(e.value)


def test_shale_cutoff_leaves_shaly_samples_out_of_net(tmp_path):
    """max_shale = 0.4: of the zone's samples (TVDSS 975-1075 m, i.e. all 1000 samples
    1000-1099.9 m MD), the half with Vsh = 0.6 are not net (closed form: 1000 / 2 = 500)."""
    p = _field(tmp_path, 'rw = "0.05 ohm.m"', comparison="max_shale = 0.4")
    project = load_project(p)
    result, _ = compute_well(project, project.wells[0])
    s = summarise(result, max_shale=project.comparison.max_shale)
    # closed form worked in the docstring
    assert s["zones"]["S"]["samples"] == 1000
    assert s["zones"]["S"]["samples_net"] == 500
    assert s["cutoffs"]["max_shale"] == 0.4
    assert summarise(result)["zones"]["S"]["samples_net"] == 1000


def test_shale_cutoff_without_shale_curve_is_refused(tmp_path):
    """README (comparison): max_shale with no shale curve is an error, never ignored."""
    p = _field(tmp_path, 'rw = "0.05 ohm.m"', comparison="max_shale = 0.4", vsh_name="GRX")
    project = load_project(p)
    result, _ = compute_well(project, project.wells[0])
    with pytest.raises(SatHeightError) as e:
        summarise(result, max_shale=0.4)
    assert "shale" in str(e.value)
