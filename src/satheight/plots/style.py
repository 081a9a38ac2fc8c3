"""Colours, resolution and page sizes shared by every figure.

Colours are the eight-colour set of Okabe & Ito (2008), "Color Universal Design",
chosen so that readers with the common forms of colour-vision deficiency can tell
them apart, plus greys. Which curve gets which colour is our own choice.
"""

from __future__ import annotations

#: Resolution of written PNG files [dots per inch].
DPI = 110

BLACK = "#000000"
ORANGE = "#E69F00"
SKY = "#56B4E9"
GREEN = "#009E73"
YELLOW = "#F0E442"
BLUE = "#0072B2"
VERMILLION = "#D55E00"
PURPLE = "#CC79A7"
GREY = "#555555"
LIGHT_GREY = "#BDBDBD"
GRID = "#D9D9D9"

#: Colours for a set of wells or classes, in order (Okabe & Ito without the pale yellow,
#: which is hard to see on white, then black).
SERIES = (BLUE, ORANGE, GREEN, VERMILLION, SKY, PURPLE, BLACK, YELLOW)
#: Marker shapes that cycle with :data:`SERIES` so more than eight series stay apart.
MARKERS = ("o", "s", "^", "D", "v", "P", "X", "<", ">", "h")

#: Page sizes [inch]: A4 portrait (ISO 216: 210 x 297 mm) and a screen page.
PAGES = {"a4": (210.0 / 25.4, 297.0 / 25.4), "screen": (13.3, 7.5)}


def series_style(i: int) -> tuple[str, str]:
    """Colour and marker of the ``i``-th series: colours cycle first, markers every cycle."""
    return SERIES[i % len(SERIES)], MARKERS[(i // len(SERIES)) % len(MARKERS)]
