#!/usr/bin/env python3
"""Generate the invented formation-pressure points of the Vantrel demo field.

EVERYTHING HERE IS INVENTED. The points are made from the demo field's own FWLs
and densities (see README.md in this folder): per zone a water line and a
hydrocarbon line that meet at the zone's FWL, plus small gauge noise, one
supercharged point (quality fair, which the outlier rejection should drop), one
point of quality poor, one of unknown fluid and two points given by MD only.

    python demo_wells/make_pressures.py            # rewrite demo_pressures.csv here
    python demo_wells/make_pressures.py --check    # exit 1 if the file here is stale
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import numpy as np

SEED = 20240612
G = 9.80665                      #: standard gravity [m/s^2]
P_ATM = 101325.0                 #: [Pa]
PSI = 0.45359237 * G / 0.0254 ** 2
NOISE_KPA = 3.0                  #: gauge noise sd [kPa] (invented)

#: zone -> FWL [m], water and hydrocarbon density [kg/m^3], overpressure of the
#: compartment at the FWL [Pa], hydrocarbon name. Matches demo_project.toml.
ZONES = {
    "Upper Sand": {"fwl": 2105.0, "rho_w": 1080.0, "rho_h": 780.0, "over": 0.0, "hc": "oil"},
    "Lower Sand": {"fwl": 2290.0, "rho_w": 0.468 * PSI / 0.3048 / G, "rho_h": 220.0,
                   "over": 1.5e6, "hc": "gas"},
}

#: (well, zone, TVDSS [m], fluid) of each point; the fluid as tested.
POINTS = [
    ("VANTREL-1", "Upper Sand", 2041.3, "oil"), ("VANTREL-1", "Upper Sand", 2063.8, "oil"),
    ("VANTREL-1", "Upper Sand", 2088.2, "oil"), ("VANTREL-1", "Upper Sand", 2108.6, "water"),
    ("VANTREL-2", "Upper Sand", 2050.4, "oil"), ("VANTREL-2", "Upper Sand", 2097.1, "oil"),
    ("VANTREL-2", "Upper Sand", 2111.9, "water"), ("VANTREL-2", "Upper Sand", 2117.2, "water"),
    ("VANTREL-3", "Upper Sand", 2072.5, "oil"), ("VANTREL-3", "Upper Sand", 2114.3, "water"),
    ("VANTREL-4", "Upper Sand", 2080.0, "oil"), ("VANTREL-4", "Upper Sand", 2106.8, "water"),
    ("VANTREL-4", "Upper Sand", 2119.0, "water"),
    ("VANTREL-1", "Lower Sand", 2214.7, "gas"), ("VANTREL-1", "Lower Sand", 2262.0, "gas"),
    ("VANTREL-1", "Lower Sand", 2296.4, "water"), ("VANTREL-2", "Lower Sand", 2236.1, "gas"),
    ("VANTREL-2", "Lower Sand", 2281.5, "gas"), ("VANTREL-2", "Lower Sand", 2303.3, "water"),
    ("VANTREL-3", "Lower Sand", 2249.8, "gas"), ("VANTREL-3", "Lower Sand", 2299.0, "water"),
    ("VANTREL-4", "Lower Sand", 2225.3, "gas"), ("VANTREL-4", "Lower Sand", 2293.1, "water"),
    ("VANTREL-4", "Lower Sand", 2307.6, "water"),
]
#: index -> (quality, pressure offset [Pa]); other points are good with no offset
SPECIAL = {5: ("fair", 180e3), 17: ("poor", -60e3)}
UNKNOWN = {19}                   #: reported as fluid "unknown"
MD_ONLY = {"VANTREL-1": 28.5}    #: well -> EKB [m]: its first point of each zone is given by MD


def pressure(zone: dict, z: float, fluid: str) -> float:
    """Pressure [Pa] at TVDSS z [m] on the fluid's line; lines meet at the FWL."""
    p_fwl = P_ATM + zone["rho_w"] * G * zone["fwl"] + zone["over"]
    rho = zone["rho_w"] if fluid == "water" else zone["rho_h"]
    return p_fwl + rho * G * (z - zone["fwl"])


def build() -> str:
    rng = np.random.default_rng(SEED)
    noise = rng.normal(0.0, NOISE_KPA * 1e3, len(POINTS))
    lines = ["# Formation-pressure points of the Vantrel demo field. INVENTED: made by",
             "# demo_wells/make_pressures.py from the field's FWLs and densities; no real data.",
             "well,tvdss [m],md [m],pressure [kPa],fluid,quality,zone"]
    seen_md = set()
    for i, (well, zname, z, fluid) in enumerate(POINTS):
        zone = ZONES[zname]
        quality, offset = SPECIAL.get(i, ("good", 0.0))
        p = pressure(zone, z, fluid) + noise[i] + offset
        label = "unknown" if i in UNKNOWN else fluid
        tvd, md = f"{z:.2f}", ""
        if well in MD_ONLY and (well, zname) not in seen_md:
            seen_md.add((well, zname))
            tvd, md = "", f"{z + MD_ONLY[well]:.2f}"
        lines.append(f"{well},{tvd},{md},{p / 1e3:.2f},{label},{quality},{zname}")
    return "\n".join(lines) + "\n"


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", action="store_true")
    args = ap.parse_args(argv)
    target = Path(__file__).resolve().parent / "demo_pressures.csv"
    text = build()
    if args.check:
        same = target.is_file() and target.read_text(encoding="utf-8") == text
        print("up to date" if same else f"{target} differs from what the generator writes")
        return 0 if same else 1
    tmp = target.with_name("." + target.name + ".tmp")
    tmp.write_text(text, encoding="utf-8")
    tmp.replace(target)
    print(f"wrote {target}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
