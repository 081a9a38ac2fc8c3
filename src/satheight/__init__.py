"""satheight: saturation-height modelling with the Leverett J-function.

The public Python surface is the names in ``__all__`` (see :mod:`satheight.api` and the
README section "Python use"): open or build a project, run one well or all, results as
pandas DataFrames, figures as matplotlib Figures, core fits and the J-Sw function
families (scikit-learn estimators). Every other module of the package is private and
may change without notice.
"""

# defined before anything below imports the submodules, which read it
__version__ = "0.1.0"

from .api import (BrooksCorey, CoreFit, JSwFunction, PowerLaw, RunReport,  # noqa: E402
                  SatHeightError, SkeltHarrison, Thomeer, VanGenuchten, WellRun, crossplots,
                  demo_project, fit_core, open_project, project_from_dict, quantity,
                  result_frame, run, run_well, section_plot, track_plot)

__all__ = ["__version__", "open_project", "project_from_dict", "demo_project", "run",
           "run_well", "WellRun", "result_frame", "track_plot", "crossplots", "section_plot",
           "fit_core", "CoreFit", "quantity", "JSwFunction", "PowerLaw", "BrooksCorey",
           "Thomeer", "VanGenuchten", "SkeltHarrison", "SatHeightError", "RunReport"]
