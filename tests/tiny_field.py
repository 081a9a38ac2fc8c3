"""A tiny invented field for command-line tests: vertical wells of a few hundred samples.

Depths 1000 m MD onward, EKB 25 m, so TVDSS = MD - 25 m; one zone "S" (900-1100 m TVDSS)
with its FWL inside the logged range; porosity, permeability and resistivity random but
fixed (seeded), log Sw from Archie (rw given).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

PROJECT = """[project]
units = "metric"
[log_sw]
rw = "0.05 ohm.m"
{wells}
[[zones]]
name = "S"
top = "900 m"
base = "1100 m"
fwl = "{fwl} m"
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


def write_las(path: Path, well: str, n: int = 300, seed: int = 1) -> Path:
    """An invented LAS 2.0 file with DEPT, PHIE, PERM, RT and the ~Well item WELL = ``well``."""
    rng = np.random.default_rng(seed)
    d = 1000 + 0.1 * np.arange(n)
    cols = np.column_stack([d, rng.uniform(0.05, 0.3, n), 10 ** rng.uniform(-1, 3, n),
                            10 ** rng.uniform(0, 2, n)])
    head = ("~Version\nVERS. 2.0 :\nWRAP. NO :\n~Well\nSTRT.M 1000 :\n"
            f"STOP.M {d[-1]:.1f} :\nSTEP.M 0.1 :\nNULL. -999.25 :\nWELL. {well} :\nEKB.M 25 :\n"
            "~Curve\nDEPT.M : depth\nPHIE.V/V : porosity\nPERM.MD : permeability\n"
            "RT.OHMM : resistivity\n~A\n")
    with open(path, "w", encoding="utf-8") as f:
        f.write(head)
        np.savetxt(f, cols, fmt=["%.1f", "%.4f", "%.3f", "%.3f"])
    return path


def make_field(folder: Path, wells=(("w0.las", "W0"), ("w1.las", "W1")), names=None,
               fwl: float = 1000.0, project: str = "p.toml") -> Path:
    """LAS files ``wells`` ((file, WELL item), ...) and a project file listing them.

    ``names``: the ``name`` given to each well in the project file (None: none given,
    the LAS WELL item is used). A file listed twice is written once.
    """
    folder.mkdir(parents=True, exist_ok=True)
    blocks = []
    for i, (las, well) in enumerate(wells):
        if not (folder / las).exists():
            write_las(folder / las, well, seed=i + 1)
        name = "" if names is None or names[i] is None else f'name = "{names[i]}"\n'
        blocks.append(f'[[wells]]\nlas = "{las}"\n{name}')
    p = folder / project
    p.write_text(PROJECT.format(wells="\n".join(blocks), fwl=fwl), encoding="utf-8")
    return p
