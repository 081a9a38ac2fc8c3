#!/usr/bin/env python3
"""Generate the invented Vantrel demo field: four vertical wells and one deviated
well as LAS 2.0 files, the deviated well's survey, a tops file and the project file
that describes them.

Everything here is made up: the field, the wells, the operator, the location and
every number. Nothing is taken from a real field.

The script is deterministic (one fixed numpy seed) and uses only numpy and the
Python standard library, so it runs without the rest of the package::

    python demo_wells/make_demo.py            # rewrite the files next to this script
    python demo_wells/make_demo.py --out DIR  # write them somewhere else
    python demo_wells/make_demo.py --check    # exit 1 if the committed files are stale

How a well is made (see README.md in this folder for the story):

1. A flat layer-cake of beds in TVDSS [m]: shales, two sand packages (the zones)
   and thin wet sands in the cap shale. Bed thicknesses 0.5-5 m in the sands.
2. Blocky porosity, gamma ray and shale resistivity per bed, smoothed by a short
   Gaussian tool response, plus small per-sample noise -> GR, PHIE.
3. Permeability from porosity: log10(k[mD]) = C0 + C1 * phi + bed scatter + sample scatter.
4. True Sw from the same saturation-height model the project file declares
   (h = FWL - TVDSS, Pc = drho g h, J = Pc sqrt(k/phi) / sigma cos theta, then
   the zone's J-Sw function), with slightly different function parameters per
   well, computed from the porosity and permeability exactly as written to file.
5. RT from Archie with that Sw, mixed with the shale resistivity where the
   smoothed shale fraction is above zero, times a lognormal noise (5 %).
6. The SW curve (one well only) is Archie Sw from the noisy RT, as an
   interpreter would have computed it.
"""

from __future__ import annotations

import argparse
import io
import math
import os
import re
import sys
import tempfile
from pathlib import Path

import numpy as np

# --- constants (SI) ----------------------------------------------------------------
SEED = 20240611                      #: the one seed everything is drawn from
G = 9.80665                          #: standard gravity [m/s^2], 3rd CGPM (1901)
FOOT = 0.3048                        #: international foot [m]
PSI = 0.45359237 * G / 0.0254 ** 2   #: pound-force per square inch [Pa]
MILLIDARCY = 9.869233e-16            #: [m^2] (1 darcy = 9.869233e-13 m^2)
NULL = -999.25                       #: LAS null value written for missing samples
STEP_M = 0.1524                      #: sample step [m] (= 0.5 ft exactly)

FIELD = "Vantrel"
COMPANY = "Demo Operator Ltd (invented)"
LOCATION = "Invented block V-7, no real location"
SERVICE = "invented"

#: Archie parameters used to make RT and the SW curve (a, m, n [-]; rw [ohm.m]).
ARCHIE = {"a": 1.0, "m": 2.0, "n": 2.0, "rw": 0.045}
RT_NOISE = 0.05                      #: sd of ln(RT) multiplicative noise [-]
RSH_RANGE = (2.0, 4.0)               #: shale resistivity range [ohm.m]

#: Porosity-permeability transform: log10(k[mD]) = c0 + c1 * phi + noise.
PORO_PERM = {"c0": -2.6, "c1": 19.0, "sd_bed": 0.22, "sd_sample": 0.12,
             "k_min": 0.01, "k_max": 3000.0}

# --- zones: text values are what the project file says, the truth parses the same text
ZONES = [
    {
        "name": "Upper Sand", "top": 2030.0, "base": 2120.0, "fwl": 2105.0,
        "hydrocarbon": "oil",
        "water_density": "1.08 g/cm3", "hydrocarbon_density": "0.78 g/cm3",
        "sigma_cos_theta": "26 mN/m",
        "family": "power_law", "params": {"swirr": 0.10, "a": 0.30, "b": 1.20},
        "j_min": 0.1, "j_max": 15.0,
        "sand_phi": (0.215, 0.040, 0.12, 0.30),   # mean, sd, low, high
        "shale_break_prob": 0.22,
    },
    {
        "name": "Lower Sand", "top": 2200.0, "base": 2310.0, "fwl": 2290.0,
        "hydrocarbon": "gas",
        "water_density": "0.468 psi/ft", "hydrocarbon_density": "0.22 g/cm3",
        "sigma_cos_theta": "50 mN/m",
        "family": "brooks_corey", "params": {"swirr": 0.12, "jd": 0.20, "lam": 2.5},
        "j_min": 0.1, "j_max": 20.0,
        "sand_phi": (0.180, 0.035, 0.12, 0.26),
        "shale_break_prob": 0.15,
    },
]

#: Model file the project's zones refer to (written by make_core_demo.py from the
#: invented core data); "" writes the zone functions inline instead.
CORE_MODEL_FILE = "core_models.json"

#: Thin wet sands in the cap shale (outside every zone): (top, base) TVDSS [m], porosity.
STRINGERS = [(1961.8, 1964.3, 0.17), (1997.5, 1998.9, 0.15)]
LOG_TOP, LOG_BASE = 1900.0, 2440.0   #: TVDSS span the bed model covers [m]

# --- wells ------------------------------------------------------------------------
#: ``ekb`` is written to the header as EKB [m]; ``datum`` is the elevation the
#: project file must give for a well whose header has no EKB. ``truth`` holds the
#: J-Sw parameters that made this well's true Sw (the project file holds the
#: field-wide ones). ``nulls`` are (curves, top, base in TVDSS [m]).
WELLS = [
    {
        "name": "VANTREL-1", "depth_unit": "m", "strt": 1960.0, "n": 3120, "ekb": 28.5,
        "porosity_unit": "v/v", "sw_curve": True, "date": "2019-03-14",
        "truth": [{}, {}],
        "nulls": [(("RT",), 2252.0, 2253.6)],
        "note": "carries the interpreter's SW curve",
    },
    {
        "name": "VANTREL-2", "depth_unit": "m", "strt": 1985.0, "n": 3060, "ekb": 31.0,
        "porosity_unit": "%", "sw_curve": False, "date": "2020-08-02",
        "truth": [{"swirr": 0.12, "a": 0.33}, {"swirr": 0.13, "jd": 0.22}],
        "nulls": [(("PHIE", "PERM"), 2060.2, 2061.8)],
        "note": "porosity in percent; a bad-hole interval without porosity in the upper zone",
    },
    {
        "name": "VANTREL-3", "depth_unit": "ft", "strt": 6400.0, "n": 3100, "ekb": 26.8,
        "porosity_unit": "v/v", "sw_curve": False, "date": "2021-11-19",
        "truth": [{"swirr": 0.09, "a": 0.28, "b": 1.25}, {"swirr": 0.11, "lam": 2.8}],
        "nulls": [(("RT",), 2084.4, 2085.6)],
        "note": "depths in feet, 0.5 ft sampling",
    },
    {
        "name": "VANTREL-4", "depth_unit": "m", "strt": 1995.0, "n": 2950, "ekb": None,
        "datum": 31.2,
        "porosity_unit": "v/v", "sw_curve": False, "date": "2022-05-27",
        "truth": [{"a": 0.315, "b": 1.15}, {"jd": 0.18}],
        "nulls": [(("GR",), 1963.0, 1972.0)],
        "note": "no EKB in the header: the project file gives datum_elevation",
    },
    {
        "name": "VANTREL-5", "depth_unit": "m", "strt": 2080.0, "n": 4060, "ekb": 29.4,
        "porosity_unit": "v/v", "sw_curve": False, "date": "2023-09-08",
        "truth": [{"swirr": 0.11, "a": 0.31}, {"lam": 2.6}],
        "nulls": [],
        "note": "deviated (build to 37.5 deg): survey, and zone tops in the tops file",
        # build-and-hold path: vertical to the kick-off MD, constant build rate to the hold
        # inclination, then straight; stations every `station_step` m in the build and hold
        "path": {"kop": 1200.0, "build_deg_per_30m": 2.5, "hold_deg": 37.5, "azimuth_deg": 65.0,
                 "station_step": 30.0, "td": 2790.0},
    },
]

#: Well-head map positions (east, north) [m] in an invented local grid, for the
#: field cross-section plot.
LOCATIONS = {"VANTREL-1": (1000.0, 2000.0), "VANTREL-2": (2400.0, 2600.0),
             "VANTREL-3": (3900.0, 3100.0), "VANTREL-4": (5200.0, 3900.0),
             "VANTREL-5": (2450.0, 2300.0)}

#: Zone windows of VANTREL-5 in the tops file: Upper Sand in MD, Lower Sand in TVDSS.
TOPS_DEPTH_TYPE = {"Upper Sand": "MD", "Lower Sand": "TVDSS"}


# --- small unit parser for the few texts used above ---------------------------------
_UNIT_SI = {"m": ("length", 1.0), "ft": ("length", FOOT),
            "g/cm3": ("density", 1000.0), "kg/m3": ("density", 1.0),
            "psi/ft": ("gradient", PSI / FOOT), "kpa/m": ("gradient", 1e3),
            "mn/m": ("tension", 1e-3), "n/m": ("tension", 1.0),
            "ohm.m": ("resistivity", 1.0)}


def si(text: str) -> float:
    """SI value of a text quantity such as ``"1.08 g/cm3"`` or ``"0.468 psi/ft"``.

    A pressure gradient is turned into a density by dividing by g (fluid at rest).
    Returns m, kg/m^3, N/m or ohm.m.
    """
    m = re.fullmatch(r"\s*([-+0-9.eE]+)\s*(\S+)\s*", text)
    if not m or m.group(2).lower() not in _UNIT_SI:
        raise ValueError(f"cannot read quantity {text!r}")
    kind, fac = _UNIT_SI[m.group(2).lower()]
    value = float(m.group(1)) * fac
    return value / G if kind == "gradient" else value


# --- physics (pure, vectorised) ------------------------------------------------------
def leverett_j(h, drho, phi, k_md, sigma_cos_theta):
    """Leverett J [-] from height above FWL h [m], density difference drho [kg/m^3],
    porosity phi [fraction], permeability k_md [mD] and sigma cos theta [N/m].

    J = (drho * g * h) * sqrt(k / phi) / sigma_cos_theta with k in m^2; negative
    below the FWL.
    """
    pc = drho * G * np.asarray(h, dtype=float)
    return pc * np.sqrt(np.asarray(k_md, float) * MILLIDARCY / np.asarray(phi, float)) / sigma_cos_theta


def sw_power_law(j, swirr, a, b):
    """Sw [fraction] = swirr + (1 - swirr) * a * J^-b clipped to [swirr, 1]; 1 where J <= 0."""
    j = np.asarray(j, dtype=float)
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        sw = swirr + (1.0 - swirr) * a * np.power(np.where(j > 0, j, 1.0), -b)
    return np.where(j > 0, np.clip(sw, swirr, 1.0), 1.0)


def sw_brooks_corey(j, swirr, jd, lam):
    """Sw [fraction] = swirr + (1 - swirr) * (J/jd)^-lam for J >= jd, else 1."""
    j = np.asarray(j, dtype=float)
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        se = np.power(np.where(j >= jd, j, jd) / jd, -lam)
    return np.where(j >= jd, swirr + (1.0 - swirr) * se, 1.0)


SW_FUNCTIONS = {"power_law": sw_power_law, "brooks_corey": sw_brooks_corey}


def zone_densities(zone) -> tuple[float, float]:
    """(water, hydrocarbon) density of a zone [kg/m^3] from its texts."""
    return si(zone["water_density"]), si(zone["hydrocarbon_density"])


def true_sw(tvdss, phi, k_md, params_by_zone=None):
    """True water saturation [fraction] at TVDSS [m] from the zone models.

    Parameters
    ----------
    tvdss, phi, k_md : array_like
        Depth below sea level [m], porosity [fraction], permeability [mD].
    params_by_zone : list of dict, optional
        Per-zone overrides of the J-Sw parameters (a well's ``truth``); empty or
        None gives exactly the field-wide model of the project file.

    Returns
    -------
    sw, j, zone : numpy.ndarray
        Sw (1 outside every zone and below the FWL), J (NaN outside zones) and
        zone index (-1 outside zones).
    """
    tvdss = np.asarray(tvdss, float)
    sw = np.ones_like(tvdss)
    jall = np.full_like(tvdss, np.nan)
    zone_idx = np.full(tvdss.shape, -1)
    for iz, zone in enumerate(ZONES):           # loop over zones, not samples
        inside = (tvdss >= zone["top"]) & (tvdss < zone["base"])
        rho_w, rho_h = zone_densities(zone)
        j = leverett_j(zone["fwl"] - tvdss, rho_w - rho_h, phi, k_md, si(zone["sigma_cos_theta"]))
        params = dict(zone["params"])
        if params_by_zone:
            params.update(params_by_zone[iz])
        s = SW_FUNCTIONS[zone["family"]](j, **params)
        sw = np.where(inside, s, sw)
        jall = np.where(inside, j, jall)
        zone_idx = np.where(inside, iz, zone_idx)
    return sw, jall, zone_idx


def archie_rt(phi, sw, a=ARCHIE["a"], m=ARCHIE["m"], n=ARCHIE["n"], rw=ARCHIE["rw"]):
    """Archie true resistivity [ohm.m]: Rt = a * Rw / (phi^m * Sw^n)."""
    return a * rw / (np.power(phi, m) * np.power(sw, n))


def archie_sw(phi, rt, a=ARCHIE["a"], m=ARCHIE["m"], n=ARCHIE["n"], rw=ARCHIE["rw"]):
    """Archie water saturation [fraction] from porosity [fraction] and Rt [ohm.m], clipped to [0, 1]."""
    with np.errstate(divide="ignore", invalid="ignore"):
        sw = np.power(a * rw / (np.power(phi, m) * rt), 1.0 / n)
    return np.clip(sw, 0.0, 1.0)


# --- deviated path (closed form, circle and straight line) ----------------------------
def path_position(path, md):
    """TVD below KB [m] (positive down), north and east [m] of a build-and-hold path.

    Vertical to ``kop``; a circular arc of radius R = 30 m / build rate [rad] up to the
    hold inclination; then a straight hold. Closed form (circle geometry), so the
    stations of :func:`survey_stations` describe it exactly by minimum curvature.
    """
    md = np.asarray(md, dtype=float)
    rate = math.radians(path["build_deg_per_30m"]) / 30.0
    hold = math.radians(path["hold_deg"])
    eob = path["kop"] + hold / rate
    th = np.clip((md - path["kop"]) * rate, 0.0, hold)
    past = np.clip(md - eob, 0.0, None)
    tvd = np.where(md <= path["kop"], md, path["kop"] + np.sin(th) / rate + past * math.cos(hold))
    hd = np.where(md <= path["kop"], 0.0, (1.0 - np.cos(th)) / rate + past * math.sin(hold))
    az = math.radians(path["azimuth_deg"])
    return tvd, hd * math.cos(az), hd * math.sin(az)


def survey_stations(path):
    """(MD [m], inclination [deg], azimuth [deg]) of the survey: surface, kick-off, every
    ``station_step`` m down to TD (the end of the build falls on a station)."""
    rate = path["build_deg_per_30m"] / 30.0
    md = np.r_[0.0, np.arange(path["kop"], path["td"] + 1e-9, path["station_step"])]
    inc = np.clip((md - path["kop"]) * rate, 0.0, path["hold_deg"])
    return md, inc, np.where(md > path["kop"], path["azimuth_deg"], 0.0)


def md_at_tvd(path, tvd):
    """MD [m] where the hold section of ``path`` reaches TVD ``tvd`` [m] (below the build)."""
    rate = math.radians(path["build_deg_per_30m"]) / 30.0
    hold = math.radians(path["hold_deg"])
    eob = path["kop"] + hold / rate
    tvd_eob = path["kop"] + math.sin(hold) / rate
    if tvd < tvd_eob:
        raise ValueError("only depths in the hold section are supported")
    return eob + (tvd - tvd_eob) / math.cos(hold)


# --- bed model -----------------------------------------------------------------------
def _shale_beds(rng, top, base):
    """Shale beds 2-8 m thick filling [top, base) TVDSS [m]."""
    th = rng.uniform(2.0, 8.0, size=int((base - top) / 2.0) + 2)
    bounds = top + np.concatenate([[0.0], np.cumsum(th)])
    bounds = np.concatenate([bounds[bounds < base], [base]])
    return bounds, np.zeros(bounds.size - 1, dtype=bool)


def _sand_package(rng, top, base, shale_prob):
    """Sand beds 0.5-5 m with thin shale breaks 0.5-2 m filling [top, base)."""
    nmax = int((base - top) / 0.5) + 2
    is_sand = rng.random(nmax) >= shale_prob
    th = np.where(is_sand, rng.uniform(0.5, 5.0, nmax), rng.uniform(0.5, 2.0, nmax))
    bounds = top + np.concatenate([[0.0], np.cumsum(th)])
    keep = bounds < base
    bounds = np.concatenate([bounds[keep], [base]])
    return bounds, is_sand[: bounds.size - 1]


def bed_model(rng):
    """Beds of one well: boundaries TVDSS [m] and per-bed properties.

    Returns
    -------
    dict with ``bounds`` (n+1,), and per bed: ``sand`` (bool), ``phi`` [fraction],
    ``gr`` [gAPI], ``rsh`` [ohm.m], ``kdev`` [log10 mD scatter].
    """
    edges = [(LOG_TOP, STRINGERS[0][0], "shale", None)]
    for i, (t, b, _) in enumerate(STRINGERS):
        edges.append((t, b, "stringer", i))
        nxt = STRINGERS[i + 1][0] if i + 1 < len(STRINGERS) else ZONES[0]["top"]
        edges.append((b, nxt, "shale", None))
    for iz, z in enumerate(ZONES):
        edges.append((z["top"], z["base"], "zone", iz))
        nxt = ZONES[iz + 1]["top"] if iz + 1 < len(ZONES) else LOG_BASE
        edges.append((z["base"], nxt, "shale", None))

    all_bounds, sand, phi = [LOG_TOP], [], []
    for top, base, kind, ref in edges:           # a dozen units, not samples
        if kind == "shale":
            bnd, s = _shale_beds(rng, top, base)
            p = np.full(s.size, np.nan)
        elif kind == "stringer":
            bnd, s = np.array([top, base]), np.array([True])
            p = np.array([STRINGERS[ref][2]])
        else:
            z = ZONES[ref]
            bnd, s = _sand_package(rng, top, base, z["shale_break_prob"])
            mean, sd, lo, hi = z["sand_phi"]
            p = np.clip(rng.normal(mean, sd, s.size), lo, hi)
        all_bounds.extend(bnd[1:].tolist())
        sand.append(s)
        phi.append(p)
    sand = np.concatenate(sand)
    phi = np.concatenate(phi)
    nb = sand.size
    shale_phi = rng.uniform(0.03, 0.08, nb)
    phi = np.where(sand, phi, shale_phi)
    gr_sand = 22.0 + 110.0 * (0.30 - phi) + rng.normal(0.0, 3.0, nb)
    gr_shale = rng.normal(108.0, 9.0, nb)
    rsh = np.exp(rng.uniform(math.log(RSH_RANGE[0]), math.log(RSH_RANGE[1]), nb))
    return {"bounds": np.asarray(all_bounds), "sand": sand, "phi": phi,
            "gr": np.where(sand, gr_sand, gr_shale), "rsh": rsh,
            "kdev": rng.normal(0.0, PORO_PERM["sd_bed"], nb)}


def tool_smooth(x, sigma_samples=1.5, half_width=6):
    """Gaussian vertical response of a logging tool, edges padded [same unit as x]."""
    i = np.arange(-half_width, half_width + 1)
    w = np.exp(-0.5 * (i / sigma_samples) ** 2)
    w /= w.sum()
    return np.convolve(np.pad(x, half_width, mode="edge"), w, mode="valid")


# --- one well ------------------------------------------------------------------------
def depth_axis(spec):
    """(DEPT in the file's unit rounded to 4 decimals, MD [m], TVDSS [m], step in file unit)."""
    step = STEP_M if spec["depth_unit"] == "m" else 0.5
    dept = np.round(spec["strt"] + step * np.arange(spec["n"]), 4)
    md = dept * (1.0 if spec["depth_unit"] == "m" else FOOT)
    elev = spec["ekb"] if spec["ekb"] is not None else spec["datum"]
    tvd = path_position(spec["path"], md)[0] if "path" in spec else md
    return dept, md, tvd - elev, step


def build_well(spec, rng):
    """All curves of one well plus the truth behind them.

    Returns
    -------
    dict of numpy arrays: ``DEPT`` (file unit), ``GR`` [gAPI], ``PHIE`` [fraction],
    ``PERM`` [mD], ``RT`` [ohm.m], ``SW`` [fraction] (all rounded as written, NaN
    for nulls), and ``tvdss`` [m], ``sw_true`` [fraction], ``j_true`` [-] (J does
    not depend on the J-Sw parameters, so it is also the project's J), ``zone``
    (index into ZONES, -1 outside), ``vsh`` (smoothed shale fraction [fraction]),
    ``sand`` (sample lies in a sand bed) and ``step`` (DEPT step in file unit).
    """
    beds = bed_model(rng)
    dept, md, tvdss, step = depth_axis(spec)
    ib = np.clip(np.searchsorted(beds["bounds"], tvdss, side="right") - 1, 0, beds["sand"].size - 1)
    n = tvdss.size

    vsh = tool_smooth(np.where(beds["sand"][ib], 0.0, 1.0))
    phi = tool_smooth(beds["phi"][ib]) + rng.normal(0.0, 0.004, n)
    phi = np.round(np.clip(phi, 0.01, 0.36), 4)
    gr = np.round(tool_smooth(beds["gr"][ib]) + rng.normal(0.0, 2.5, n), 2)

    logk = (PORO_PERM["c0"] + PORO_PERM["c1"] * phi + beds["kdev"][ib]
            + rng.normal(0.0, PORO_PERM["sd_sample"], n))
    perm = np.round(np.clip(10.0 ** logk, PORO_PERM["k_min"], PORO_PERM["k_max"]), 3)

    sw, j, zone = true_sw(tvdss, phi, perm, spec["truth"])
    rt_clean = archie_rt(phi, sw)
    rt = 1.0 / ((1.0 - vsh) / rt_clean + vsh / beds["rsh"][ib])
    rt = np.round(rt * np.exp(rng.normal(0.0, RT_NOISE, n)), 4)

    curves = {"DEPT": dept, "GR": gr, "PHIE": phi, "PERM": perm, "RT": rt}
    for names, top, base in spec["nulls"]:
        bad = (tvdss >= top) & (tvdss < base)
        for c in names:
            curves[c] = np.where(bad, np.nan, curves[c])
    if spec["sw_curve"]:
        curves["SW"] = np.round(archie_sw(curves["PHIE"], curves["RT"]), 4)
        curves["SW"] = np.where(np.isnan(curves["RT"]) | np.isnan(curves["PHIE"]), np.nan, curves["SW"])
    curves.update({"tvdss": tvdss, "sw_true": sw, "j_true": j, "zone": zone, "vsh": vsh,
                   "sand": beds["sand"][ib], "step": step})
    return curves


def build_field(seed=SEED):
    """Every well of the field: ``{name: build_well(...)}`` from one seed."""
    children = np.random.SeedSequence(seed).spawn(len(WELLS))
    return {spec["name"]: build_well(spec, np.random.default_rng(child))
            for spec, child in zip(WELLS, children)}


# --- writers -------------------------------------------------------------------------
CURVE_INFO = {  # mnemonic: (unit, decimals, description)
    "DEPT": (None, 4, "Measured depth"),
    "GR": ("gAPI", 2, "Gamma ray"),
    "PHIE": (None, 4, "Effective porosity"),
    "PERM": ("mD", 3, "Permeability from the porosity-permeability transform"),
    "RT": ("ohm.m", 4, "Deep resistivity, taken as true resistivity"),
    "SW": ("V/V", 4, "Water saturation, Archie from RT and PHIE"),
}


def _item(mnem, unit, value, desc):
    return f" {mnem:<5}.{unit:<6} {value:>36} : {desc}"


def las_text(spec, curves) -> str:
    """LAS 2.0 text of one well."""
    du = "M" if spec["depth_unit"] == "m" else "F"
    dept = curves["DEPT"]
    names = ["DEPT", "GR", "PHIE", "PERM", "RT"] + (["SW"] if spec["sw_curve"] else [])
    pct = spec["porosity_unit"] == "%"
    lines = [
        "~Version Information",
        _item("VERS", "", "2.0", "LAS version 2.0"),
        _item("WRAP", "", "NO", "One line per depth step"),
        "~Well Information",
        "#MNEM.UNIT                                  DATA : DESCRIPTION",
        _item("STRT", du, f"{dept[0]:.4f}", "Start depth"),
        _item("STOP", du, f"{dept[-1]:.4f}", "Stop depth"),
        _item("STEP", du, f"{curves['step']:.4f}", "Step"),
        _item("NULL", "", f"{NULL:.2f}", "Null value"),
        _item("COMP", "", COMPANY, "Company"),
        _item("WELL", "", spec["name"], "Well"),
        _item("FLD", "", f"{FIELD} (invented)", "Field"),
        _item("LOC", "", LOCATION, "Location"),
        _item("SRVC", "", SERVICE, "Service company"),
        _item("DATE", "", spec["date"], "Log date"),
    ]
    if spec["ekb"] is not None:
        lines.append(_item("EKB", "M", f"{spec['ekb']:.2f}",
                           "Elevation of kelly bushing above mean sea level"))
    lines += ["~Curve Information", "#MNEM.UNIT                                 API CODE : DESCRIPTION"]
    for c in names:
        unit, _, desc = CURVE_INFO[c]
        if c == "DEPT":
            unit = du
        elif c == "PHIE":
            unit = "%" if pct else "V/V"
        lines.append(_item(c, unit, "", desc))
    lines += [
        "~Parameter Information",
        _item("RW", "ohm.m", f"{ARCHIE['rw']:.3f}", "Formation water resistivity at formation temperature"),
        "~Other",
        f"INVENTED DEMO DATA. The {FIELD} field, this well, the company, the location",
        "and every number in this file are made up by demo_wells/make_demo.py",
        f"(numpy seed {SEED}); they describe no real field. {spec['note'].capitalize()}.",
    ]
    if "path" in spec:
        lines.append(f"DEPT is measured depth below the kelly bushing along a deviated hole; see "
                     f"{spec['name']}_survey.csv.")
    else:
        lines.append("Depths are below the kelly bushing; the wells are vertical (TVDSS = MD - KB elevation).")
    if spec["ekb"] is None:
        lines.append("The KB elevation is not recorded in this file: see the project file.")
    header = "~A  " + " ".join(f"{c:>12}" for c in names)
    cols, fmts = [], []
    for c in names:
        data = curves[c] * (100.0 if (c == "PHIE" and pct) else 1.0)
        dec = CURVE_INFO[c][1] - (2 if (c == "PHIE" and pct) else 0)
        cols.append(np.where(np.isnan(data), NULL, data))
        fmts.append(f"%{13 if c == 'DEPT' else 12}.{dec}f")
    table = np.column_stack(cols)
    buf = io.StringIO()
    np.savetxt(buf, table, fmt=fmts, delimiter=" ")
    return "\n".join(lines + [header]) + "\n" + buf.getvalue()


def _q(value, unit):
    """Quantity text with trailing zeros trimmed: ``_q(2105.0, "m") -> "2105 m"``."""
    return f"{value:g} {unit}"


def project_text() -> str:
    """The project file, commented."""
    out = [
        "# Project file of the Vantrel demo field.",
        "# THE FIELD IS INVENTED: the name, wells, company, location and every number are",
        "# made up (written by demo_wells/make_demo.py, which also made the LAS files).",
        "# Regenerate with:  python demo_wells/make_demo.py",
        "",
        "[project]",
        'name = "Vantrel demo field (invented)"',
        'units = "metric"                # bare numbers are metric',
        'tops_file = "demo_tops.csv"     # zone tops of the deviated well (MD or TVDSS per row)',
        '# core plugs and pressure points drawn on the track plots of their wells',
        'core_files = ["core_plugs.csv", "core_plug_V12.csv", "core_dean_stark.csv"]',
        'pressure_file = "demo_pressures.csv"',
        "",
        "[log_sw]",
        'method = "auto"                 # use a well\'s SW curve if present, otherwise Archie from RT',
        f"a = {ARCHIE['a']:.1f}",
        f"m = {ARCHIE['m']:.1f}",
        f"n = {ARCHIE['n']:.1f}",
        f'rw = "{ARCHIE["rw"]:g} ohm.m"              # at formation temperature (invented)',
        "",
        "[comparison]                    # net-reservoir cutoffs for the SHM vs log Sw statistics",
        "min_porosity = 0.10             # shale breaks (porosity 0.03-0.08) are left out",
        "",
        "[uncertainty]                   # Monte Carlo of the SHM (the spreads are invented too)",
        "realisations = 1000",
        "seed = 20241202",
        "",
    ]
    for spec in WELLS:
        out += ["[[wells]]", f'las = "{spec["name"]}.las"          # relative to this file; {spec["note"]}']
        if spec["ekb"] is None:
            out.append(f'datum_elevation = "{spec["datum"]:g} m"    # KB elevation above sea level: '
                       "this file has no EKB")
        if spec["porosity_unit"] == "%":
            out.append('curves = { porosity = "PHIE", permeability = "PERM" }   '
                       "# optional role -> mnemonic overrides")
        if "path" in spec:
            out.append(f'survey = "{spec["name"]}_survey.csv"   # deviation survey: TVDSS by minimum curvature')
        east, north = LOCATIONS[spec["name"]]
        out.append(f"location = {{ east = {east:g}, north = {north:g} }}   # well head, invented local grid [m]")
        out.append("")
    for z in ZONES:
        p = z["params"]
        out += [
            "[[zones]]",
            f'name = "{z["name"]}"',
            f'top = "{_q(z["top"], "m")}"                 # TVDSS, the same in every well (flat layer-cake)',
            f'base = "{_q(z["base"], "m")}"',
            f'fwl = "{_q(z["fwl"], "m")}"                 # free-water level, TVDSS',
            f'hydrocarbon = "{z["hydrocarbon"]}"',
            f'water_density = "{z["water_density"]}"'
            + ("      # a pressure gradient, turned into a density" if "/ft" in z["water_density"] else ""),
            f'hydrocarbon_density = "{z["hydrocarbon_density"]}"',
            f'sigma_cos_theta = "{z["sigma_cos_theta"]}"',
            "[zones.function]",
        ]
        if CORE_MODEL_FILE:  # the functions fitted to the invented core data (make_core_demo.py)
            out += [f'file = "{CORE_MODEL_FILE}"      # fitted by satheight fit to the invented core data',
                    f'rock_type = "{z["name"]}"',
                    f'family = "{z["family"]}"        # the J range comes from the core data']
            out += _uncertainty_lines(z) + [""]
            continue
        if z["family"] == "power_law":
            out.append('family = "power_law"            # Sw = swirr + (1 - swirr) * a * J^-b')
        else:
            out.append('family = "brooks_corey"         # Sw = swirr + (1 - swirr) * (J/jd)^-lam for J >= jd, else 1')
        out += [f"{k} = {v:g}" for k, v in p.items()]
        out += [f"j_min = {z['j_min']:g}                     # J range the (invented) calibration covered",
                f"j_max = {z['j_max']:g}", ""]
    return "\n".join(out).rstrip("\n") + "\n"


def _uncertainty_lines(z: dict) -> list[str]:
    """The zone's invented input spreads for the Monte Carlo (``[zones.uncertainty]``)."""
    return [
        "[zones.uncertainty]             # invented spreads of this zone's inputs",
        'fwl = { distribution = "normal", sd = "3 m" }                       # mean: the fwl above',
        'water_density = { distribution = "normal", sd = "0.01 g/cm3" }',
        'hydrocarbon_density = { distribution = "normal", sd = "0.02 g/cm3" }',
        'sigma_cos_theta = { distribution = "truncated_normal", sd = "3 mN/m", '
        'low = "15 mN/m", high = "60 mN/m" }',
        'porosity_error = { distribution = "normal", sd = 0.01, correlation_length = "2 m" }      '
        '# added [fraction]',
        'permeability_error = { distribution = "normal", sd = 0.15, correlation_length = "2 m" }  '
        '# decades: k x 10^e',
    ]


def write_atomic(path: Path, text: str) -> None:
    """Write text to ``path`` via a temporary file in the same folder and a rename."""
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "w", encoding="ascii", newline="\n") as fh:
            fh.write(text)
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def all_files(seed=SEED) -> dict[str, str]:
    """File name -> text of every generated file."""
    field = build_field(seed)
    files = {f"{s['name']}.las": las_text(s, field[s["name"]]) for s in WELLS}
    files["demo_project.toml"] = project_text()
    for spec in WELLS:
        if "path" in spec:
            files[f"{spec['name']}_survey.csv"] = survey_text(spec)
    files["demo_tops.csv"] = tops_text()
    return files


def survey_text(spec) -> str:
    """Survey CSV of a deviated well (satheight's layout: MD [m], INC [deg], AZI [deg])."""
    md, inc, azi = survey_stations(spec["path"])
    lines = [f"# Deviation survey of {spec['name']} (INVENTED demo data, made by make_demo.py).",
             "# MD below the kelly bushing, inclination from vertical, azimuth clockwise from grid north.",
             "MD [m],INC [deg],AZI [deg]"]
    lines += [f"{m:.2f},{i:.4f},{a:.4f}" for m, i, a in zip(md, inc, azi)]
    return "\n".join(lines) + "\n"


def tops_text() -> str:
    """Tops CSV: the zone windows of the deviated wells, MD or TVDSS per row."""
    lines = ["# Zone tops (INVENTED demo data, made by make_demo.py). depth: MD below KB, or TVDSS.",
             "well,zone,top [m],base [m],depth"]
    for spec in WELLS:
        if "path" not in spec:
            continue
        for z in ZONES:
            if TOPS_DEPTH_TYPE[z["name"]] == "MD":
                top = md_at_tvd(spec["path"], z["top"] + spec["ekb"])
                base = md_at_tvd(spec["path"], z["base"] + spec["ekb"])
                lines.append(f"{spec['name']},{z['name']},{top:.3f},{base:.3f},MD")
            else:
                lines.append(f"{spec['name']},{z['name']},{z['top']:.3f},{z['base']:.3f},TVDSS")
    return "\n".join(lines) + "\n"


def summary(field) -> str:
    """Plain-text table of J at zone tops and hydrocarbon sand per zone (for the console)."""
    rows = [f"{'well':<10} {'zone':<11} {'J range in sand above FWL':>26} {'J at top sand':>14} "
            f"{'Sw<0.5 sand [m]':>16}"]
    for spec in WELLS:
        w = field[spec["name"]]
        for iz, z in enumerate(ZONES):
            sel = (w["zone"] == iz) & w["sand"] & (w["j_true"] > 0)
            jz = w["j_true"][sel]
            top_sel = sel & (w["tvdss"] < z["top"] + 5.0)
            dz = np.abs(np.gradient(w["tvdss"]))     # vertical thickness per sample [m]
            hc = dz[(w["zone"] == iz) & w["sand"] & (w["sw_true"] < 0.5)].sum()
            rows.append(f"{spec['name']:<10} {z['name']:<11} {jz.min():>12.3f} - {jz.max():<11.3f} "
                        f"{np.median(w['j_true'][top_sel]):>14.2f} {hc:>16.1f}")
    return "\n".join(rows)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description="Generate the invented Vantrel demo field.")
    ap.add_argument("--out", type=Path, default=Path(__file__).resolve().parent,
                    help="folder to write into (default: this script's folder)")
    ap.add_argument("--check", action="store_true",
                    help="do not write; exit 1 if any file in --out differs from what would be written")
    ap.add_argument("--quiet", action="store_true", help="print nothing but errors")
    args = ap.parse_args(argv)
    files = all_files()
    if args.check:
        stale = [n for n, t in files.items()
                 if not (args.out / n).is_file() or (args.out / n).read_text(encoding="ascii") != t]
        if stale:
            print("stale or missing: " + ", ".join(stale), file=sys.stderr)
            return 1
        if not args.quiet:
            print(f"{len(files)} files up to date in {args.out}")
        return 0
    args.out.mkdir(parents=True, exist_ok=True)
    for name, text in files.items():
        write_atomic(args.out / name, text)
    if not args.quiet:
        print(f"wrote {len(files)} files to {args.out}")
        print(summary(build_field()))
    return 0


if __name__ == "__main__":
    sys.exit(main())
