"""The commands' steps: each public function here does the whole job of one command.

- :mod:`satheight.workflows.run`: ``run`` and ``demo`` (a project, well by well);
- :mod:`satheight.workflows.well`: one well's computation (no files);
- :mod:`satheight.workflows.outputs`: a well's output files, the input record;
- :mod:`satheight.workflows.fit`: ``fit`` (core data to fitted J-Sw functions);
- :mod:`satheight.workflows.contacts`: ``fwl`` and ``pressures``;
- :mod:`satheight.workflows.inspect`: ``inspect`` (what a LAS file holds);
- :mod:`satheight.workflows.report`: the HTML report of a run.
"""
