"""Figures: each function returns a matplotlib Figure (Agg canvas); callers write the files."""

from .contacts import misfit_plot, pressure_plot
from .core import j_sw_plot, pc_plot
from .crossplot import crossplot_data, zone_crossplot, zone_crossplots
from .section import section_plot, section_positions
from .style import DPI
from .text import safe_text
from .track import DepthPoints, track_plot

__all__ = ["DPI", "DepthPoints", "crossplot_data", "j_sw_plot", "misfit_plot", "pc_plot",
           "pressure_plot", "safe_text", "section_plot", "section_positions", "track_plot",
           "zone_crossplot", "zone_crossplots"]
