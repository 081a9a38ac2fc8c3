"""Figures: each function returns a matplotlib Figure (Agg canvas); callers write the files."""

from .contacts import misfit_plot, pressure_plot
from .core import j_sw_plot, pc_plot
from .section import section_plot, section_positions
from .style import DPI
from .text import safe_text
from .track import track_plot

__all__ = ["DPI", "j_sw_plot", "misfit_plot", "pc_plot", "pressure_plot", "safe_text",
           "section_plot", "section_positions", "track_plot"]
