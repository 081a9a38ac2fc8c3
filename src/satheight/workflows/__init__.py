"""The commands' steps: each public function here does the whole job of one command.

- :mod:`satheight.workflows.run`: ``run`` and ``demo`` (a project, well by well);
- :mod:`satheight.workflows.well`: one well's computation (no files);
- :mod:`satheight.workflows.outputs`: a well's output files, the input record;
- :mod:`satheight.workflows.fit`: ``fit`` (core data to fitted J-Sw functions);
- :mod:`satheight.workflows.contacts`: ``fwl`` and ``pressures``;
- :mod:`satheight.workflows.inspect`: ``inspect`` (what a LAS file holds);
- :mod:`satheight.workflows.report`: the HTML report of a run;
- :mod:`satheight.workflows.setup`: ``start`` (a commented project file from a folder of LAS files);
- :mod:`satheight.workflows.output_folder`: the output folder's lock, work folder and manifest;
- :mod:`satheight.workflows.figures`: every figure written through :mod:`satheight.io.atomic`;
- :mod:`satheight.workflows.field_tables`: the field summary and all-wells tables;
- :mod:`satheight.workflows.uncertainty`: the Monte Carlo inside a run;
- :mod:`satheight.workflows.console`: progress on stderr and JSON on stdout.
"""
