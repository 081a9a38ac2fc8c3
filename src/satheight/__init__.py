"""satheight: saturation-height modelling with the Leverett J-function.

Public entry points:

* :func:`satheight.workflows.run.run_project` runs a project file end to end.
* :mod:`satheight.engine` holds the pure per-depth computation.
* :mod:`satheight.models` holds the J-Sw function families (fit/predict).
"""

__version__ = "0.1.0"
