#!/usr/bin/env python3
"""Generate the invented core capillary-pressure data of the Vantrel demo field,
and the model file fitted to it.

EVERYTHING HERE IS INVENTED: the plugs, their depths, porosities, permeabilities and
every pressure step are made up, consistent with the invented demo logs
(``make_demo.py``), and describe no real rock.

Files written next to this script::

    core_plugs.csv       plug table: 11 plugs, 2 rock types (Upper Sand, Lower Sand)
    core_pc_steps.csv    pressure steps of the mercury-injection curves (mercury_air,
                         mercury saturation in %)
    core_plate_steps.csv pressure steps of the porous-plate curves (air_brine, Sw fraction)
    core_plug_V12.csv    a twelfth plug as a single two-column table (porous plate)
    core_dean_stark.csv  routine core analysis of two cored intervals: porosity,
                         permeability and Dean-Stark water saturation every 3 m of MD
    core_models.json     the J-Sw functions fitted to these files by ``satheight fit``
                         (the demo project file refers to it)

How the data are made (one numpy seed):

1. Plugs: six in each zone, taken in sand beds of the four demo wells (depths and
   log porosity and permeability from ``make_demo.build_field``); core porosity =
   log porosity + noise (sd 0.005), core permeability = log permeability times a
   lognormal factor (sd of ln 0.15).
2. True J-Sw function of each plug: the zone's function of the demo project
   (Upper Sand power law swirr 0.10, a 0.30, b 1.20; Lower Sand Brooks-Corey swirr
   0.12, jd 0.20, lam 2.5) with a small plug-to-plug spread (a or jd times a
   lognormal factor, sd of ln 0.05).
3. Lab Pc from J with the plug's own porosity and permeability and the lab
   sigma*cos(theta) (mercury-air 367.7 mN/m, air-brine 72 mN/m).
4. Mercury injection: 30 steps 1-20000 psi; mercury saturation = conformance
   (2-4 %, filling by 60 % of the entry pressure) + (1 - conformance) x true
   non-wetting saturation, plus noise (sd 0.5 %), kept non-decreasing.
5. Porous plate: 9 steps 1-200 psi; Sw with noise (sd 0.01), kept non-increasing.
6. Routine core analysis (``core_dean_stark.csv``, its own seed stream so the files
   above do not change): plugs every 3 m of MD over two cored intervals, VANTREL-1
   MD 2031-2139 m (TVDSS 2002.5-2110.5: cap shale into the Upper Sand, across its
   FWL) and VANTREL-5 MD 2455-2545 m (deviated: TVDSS about 2228-2299, the Lower
   Sand across its FWL). Each plug takes the log sample nearest its MD: porosity =
   log porosity + noise (sd 0.005), permeability = log permeability times a lognormal
   factor (sd of ln 0.15), Sw = the true Sw of the demo logs + noise (sd 0.02),
   clipped to [0, 1] (a Dean-Stark Sw on oil-based-mud core is taken as the in-situ
   Sw, common practice). The three plugs above TVDSS 2010 m lie outside the zones'
   plotted window, on purpose.

Run::

    python demo_wells/make_core_demo.py           # rewrite the files here
    python demo_wells/make_core_demo.py --check   # exit 1 if they differ (data files byte
                                                  # for byte, the model file by value, rel 1e-6)
"""

from __future__ import annotations

import argparse
import math
import sys
import tempfile
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
import make_demo as field_demo  # noqa: E402  (the log generator next to this file)

SEED = 20241201
PSI = field_demo.PSI
MD = field_demo.MILLIDARCY
SCT = {"mercury_air": 0.480 * abs(math.cos(math.radians(140.0))),  # textbook, from memory
       "air_brine": 0.072}                                             # textbook, from memory

#: (rock type / zone index, well index, lab system) of each plug, in order.
PLAN = [(0, 0, "mercury_air"), (0, 1, "mercury_air"), (0, 2, "mercury_air"),
        (0, 3, "mercury_air"), (0, 0, "mercury_air"), (0, 2, "air_brine"),
        (1, 0, "mercury_air"), (1, 1, "mercury_air"), (1, 2, "mercury_air"),
        (1, 3, "mercury_air"), (1, 1, "air_brine"), (1, 3, "air_brine")]
HG_STEPS = np.geomspace(1.0, 20000.0, 30)             # [psi]
PLATE_STEPS = np.array([1.0, 2.0, 4.0, 8.0, 15.0, 35.0, 60.0, 100.0, 200.0])  # [psi]
SINGLE = 11                                           # index of the plug in its own file

#: Reservoir fluids per rock type for the fit (sigma*cos(theta) text, density difference).
RESERVOIR = {}
for _z in field_demo.ZONES:
    _rw, _rh = field_demo.zone_densities(_z)
    RESERVOIR[_z["name"]] = (_z["sigma_cos_theta"], _rw - _rh)


def true_sw(zone: int, j, spread: float):
    z = field_demo.ZONES[zone]
    p = dict(z["params"])
    if z["family"] == "power_law":
        p["a"] *= spread
    else:
        p["jd"] *= spread
    return field_demo.SW_FUNCTIONS[z["family"]](j, **p)


def make_plugs(rng):
    """Plug properties from the demo logs (sand beds, above and below the FWL alike)."""
    field = field_demo.build_field()
    plugs = []
    for n, (iz, iw, system) in enumerate(PLAN):
        spec = field_demo.WELLS[iw]
        w = field[spec["name"]]
        sel = np.flatnonzero((w["zone"] == iz) & w["sand"] & np.isfinite(w["PHIE"])
                             & np.isfinite(w["PERM"]))
        i = sel[rng.integers(sel.size)]
        md = float(w["tvdss"][i] + (spec["ekb"] if spec["ekb"] is not None else spec["datum"]))
        phi = float(np.clip(w["PHIE"][i] + rng.normal(0, 0.005), 0.05, 0.35))
        k = float(w["PERM"][i] * math.exp(rng.normal(0, 0.15)))
        plugs.append({"plug": f"V{n + 1:02d}", "well": spec["name"], "depth": md,
                      "phi": round(phi, 4), "k": round(k, 3 if k < 10 else 2),
                      "rho_g": round(float(rng.normal(2.65, 0.01)), 3),
                      "rock_type": field_demo.ZONES[iz]["name"], "zone": iz, "system": system,
                      "spread": math.exp(rng.normal(0, 0.05))})
    return plugs


def curve(plug, rng):
    """(pressures [psi], saturation) of one plug: mercury saturation [%] or Sw [fraction]."""
    system = plug["system"]
    steps = HG_STEPS if system == "mercury_air" else PLATE_STEPS
    scale = math.sqrt(plug["k"] * MD / plug["phi"]) / SCT[system]
    j = steps * PSI * scale
    sw = true_sw(plug["zone"], j, plug["spread"])
    if system == "mercury_air":
        s_true = 1.0 - sw
        conf = rng.uniform(0.02, 0.04)
        entry = steps[np.argmax(s_true > 0)] if (s_true > 0).any() else steps[-1]
        p_close = 0.6 * entry
        s_conf = conf * np.clip(np.log(steps) / math.log(max(p_close, 1.5)), 0.0, 1.0)
        s_hg = s_conf + (1.0 - conf) * s_true + rng.normal(0, 0.005, steps.size)
        s_hg = np.maximum.accumulate(np.clip(s_hg, 0.0, 1.0))
        return steps, np.round(100.0 * s_hg, 2)
    sw_obs = np.minimum.accumulate(np.clip(sw + rng.normal(0, 0.01, steps.size), 0.0, 1.0))
    return steps, np.round(sw_obs, 4)


HEAD = ("# INVENTED DEMO DATA (Vantrel demo field): every plug and number is made up by\n"
        "# demo_wells/make_core_demo.py and describes no real rock.\n")


#: Cored intervals of the routine core analysis: (well index, first MD, last MD) [m].
CORED = ((0, 2031.0, 2139.0), (4, 2455.0, 2545.0))


def dean_stark_text() -> str:
    """The routine-core-analysis table: porosity, permeability and Dean-Stark Sw."""
    rng = np.random.default_rng([SEED, 6])      # its own stream: the other files stay
    field = field_demo.build_field()
    rows = [HEAD + "plug,well,depth [m],porosity [frac],permeability [mD],sw [frac]"]
    for iw, first, last in CORED:
        spec = field_demo.WELLS[iw]
        w = field[spec["name"]]
        _, md_log, _, _ = field_demo.depth_axis(spec)
        md = np.arange(first, last + 1e-9, 3.0)
        i = np.abs(md_log[None, :] - md[:, None]).argmin(axis=1)   # nearest log sample
        phi = np.clip(w["PHIE"][i] + rng.normal(0, 0.005, md.size), 0.01, 0.35)
        k = np.clip(w["PERM"][i] * np.exp(rng.normal(0, 0.15, md.size)), 0.01, None)
        sw = np.clip(w["sw_true"][i] + rng.normal(0, 0.02, md.size), 0.0, 1.0)
        tag = spec["name"].rsplit("-", 1)[-1]
        rows += [f"D{tag}-{n + 1:02d},{spec['name']},{md[n]:.2f},{phi[n]:.4f},"
                 f"{k[n]:.3f},{sw[n]:.3f}" for n in range(md.size)]
    return "\n".join(rows) + "\n"


def files() -> dict[str, str]:
    rng = np.random.default_rng(SEED)
    plugs = make_plugs(rng)
    table = [HEAD + "plug,well,depth [m],porosity [frac],permeability [mD],"
             "grain_density [g/cm3],rock_type"]
    single = ""
    step_rows = [HEAD.rstrip("\n"), "plug,system,pc [psi],snw [%]"]
    plate_rows = []
    for n, p in enumerate(plugs):  # a dozen plugs
        pc, s = curve(p, rng)
        if n == SINGLE:
            single = (HEAD + f"# plug = {p['plug']}\n# well = {p['well']}\n"
                      f"# depth = {p['depth']:.2f} m\n# porosity = {p['phi']}\n"
                      f"# permeability = {p['k']} mD\n# grain_density = {p['rho_g']} g/cm3\n"
                      f"# system = {p['system']}\n# rock_type = {p['rock_type']}\n"
                      "pc [psi],sw [frac]\n"
                      + "".join(f"{a:g},{b:.4f}\n" for a, b in zip(pc, s)))
            continue
        table.append(f"{p['plug']},{p['well']},{p['depth']:.2f},{p['phi']},{p['k']},"
                     f"{p['rho_g']},{p['rock_type']}")
        if p["system"] == "mercury_air":
            step_rows += [f"{p['plug']},{p['system']},{a:.4g},{b:.2f}" for a, b in zip(pc, s)]
        else:
            plate_rows.append((p, pc, s))
    # porous-plate curves go in their own steps file column layout: Sw fraction
    plate = [HEAD.rstrip("\n"), "plug,system,pc [psi],sw [frac]"]
    for p, pc, s in plate_rows:
        plate += [f"{p['plug']},{p['system']},{a:g},{b:.4f}" for a, b in zip(pc, s)]
    return {"core_plugs.csv": "\n".join(table) + "\n",
            "core_pc_steps.csv": "\n".join(step_rows) + "\n",
            "core_plate_steps.csv": "\n".join(plate) + "\n",
            "core_plug_V12.csv": single,
            "core_dean_stark.csv": dean_stark_text()}


def fitted_model_text(folder: Path) -> str:
    """Fit the core files in ``folder`` with the package and return the model file text."""
    sys.path.insert(0, str(HERE.parent / "src"))
    from satheight.workflows.fit import FitSettings, ReservoirFluids, run_fit
    from satheight.units import parse_quantity

    reservoir = {name: ReservoirFluids(parse_quantity(sct, "tension"), drho)
                 for name, (sct, drho) in RESERVOIR.items()}
    with tempfile.TemporaryDirectory() as tmp:
        run = run_fit([folder / n for n in DATA_FILES], tmp,
                      FitSettings(reservoir=reservoir, plots=False, model_file="core_models.json"))
        return run.model_path.read_text(encoding="utf-8")


DATA_FILES = ("core_plugs.csv", "core_pc_steps.csv", "core_plate_steps.csv", "core_plug_V12.csv")


def _close(a, b, rtol=1e-6) -> bool:
    """Same JSON structure, numbers equal within rtol (fits may differ in the last digits
    between linear-algebra libraries)."""
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(_close(a[k], b[k], rtol) for k in a)
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(_close(x, y, rtol) for x, y in zip(a, b))
    if isinstance(a, float) or isinstance(b, float):
        return isinstance(a, (int, float)) and isinstance(b, (int, float)) and \
            math.isclose(a, b, rel_tol=rtol, abs_tol=1e-9)
    return a == b


def _same(name: str, old: str, new: str) -> bool:
    """Data files byte for byte; the model file by value (see _close)."""
    if name.endswith(".json"):
        import json

        return _close(json.loads(old), json.loads(new))
    return old == new


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description="Generate the invented Vantrel core data.")
    ap.add_argument("--out", type=Path, default=HERE, help="folder to write into")
    ap.add_argument("--check", action="store_true",
                    help="do not write; exit 1 if the files in --out differ")
    args = ap.parse_args(argv)
    data = files()
    if args.check:
        with tempfile.TemporaryDirectory() as tmp:
            for name, text in data.items():
                (Path(tmp) / name).write_text(text, encoding="ascii")
            data["core_models.json"] = fitted_model_text(Path(tmp))
        stale = [n for n, t in data.items()
                 if not (args.out / n).is_file()
                 or not _same(n, (args.out / n).read_text(encoding="utf-8"), t)]
        if stale:
            print("stale or missing: " + ", ".join(stale), file=sys.stderr)
            return 1
        print(f"{len(data)} files up to date in {args.out}")
        return 0
    args.out.mkdir(parents=True, exist_ok=True)
    for name, text in data.items():
        field_demo.write_atomic(args.out / name, text)
    model = fitted_model_text(args.out)
    field_demo.write_atomic(args.out / "core_models.json", model)
    print(f"wrote {len(data) + 1} files to {args.out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
