"""Tornado chart: which uncertain input moves the hydrocarbon pore thickness most.

One horizontal bar per input, from the thickness with the input at its 10th
percentile to the thickness at its 90th, every other input at its median; bars sorted
with the largest swing on top, a vertical line at the all-median thickness. Returns a
:class:`matplotlib.figure.Figure` (Agg canvas, no pyplot state); writing it is the
caller's job.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Sequence

if TYPE_CHECKING:  # matplotlib is imported where a figure is drawn (~0.3 s at start)
    from matplotlib.figure import Figure

from ..uncertainty import TornadoBar
from .text import safe_text

__all__ = ["tornado_figure"]

# Okabe & Ito (2008) colour-blind-safe pair; which input end takes which colour is our choice.
_LOW, _HIGH = "#0072B2", "#E69F00"


def tornado_figure(base: float, bars: Sequence[TornadoBar], title: str = "",
                   length_unit: str = "m", length_factor: float = 1.0,
                   max_bars: int = 15) -> Figure:
    """Tornado chart of HCPT [``length_unit``] for the bars of :func:`satheight.uncertainty.tornado`.

    Parameters
    ----------
    base : float
        HCPT with every input at its median [m].
    bars : sequence of TornadoBar
        Largest swing first (as returned); at most ``max_bars`` are drawn.
    title : str
        Figure title (made safe for drawing).
    length_unit, length_factor : str, float
        Unit of the axis and metres per unit.
    """
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure
    from matplotlib.patches import Patch

    shown = list(bars)[:max_bars]
    fig = Figure(figsize=(7.5, 1.2 + 0.38 * max(len(shown), 1)))
    FigureCanvasAgg(fig)
    ax = fig.add_subplot(1, 1, 1)
    b0 = base / length_factor
    for row, bar in enumerate(reversed(shown)):
        lo, hi = bar.hcpt_low / length_factor, bar.hcpt_high / length_factor
        ax.barh(row, lo - b0, left=b0, color=_LOW, height=0.6)
        ax.barh(row, hi - b0, left=b0, color=_HIGH, height=0.6)
    ax.set_yticks(range(len(shown)))
    ax.set_yticklabels([safe_text(f"{b.zone}: {b.input}") for b in reversed(shown)])
    ax.axvline(b0, color="black", linewidth=1.0)
    ax.set_xlabel(f"Hydrocarbon pore thickness [{safe_text(length_unit)}]")
    if shown:
        ax.legend(handles=[Patch(color=_LOW, label="input at its 10th percentile"),
                           Patch(color=_HIGH, label="input at its 90th percentile")],
                  loc="upper center", bbox_to_anchor=(0.5, -0.18 - 1.0 / (len(shown) + 3)),
                  ncol=2, fontsize="small", frameon=False)
    else:
        ax.text(0.5, 0.5, "no uncertain input", transform=ax.transAxes, ha="center")
    ax.set_title(safe_text(title or "Tornado: one input at a time, others at their medians"),
                 fontsize="medium", y=1.0)     # on the top edge: no tick labels there
    fig.tight_layout()
    return fig
