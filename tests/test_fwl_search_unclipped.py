"""The FWL search sees the unclipped Archie Sw: clipping at Sw = 1 biases the misfit in and
near the water leg (noise above 1 is cut, noise below 1 is kept)."""

from __future__ import annotations

import numpy as np

from satheight.project import load_project
from satheight.workflows.contacts import _well_zone_samples
from satheight.workflows.well import compute_well
from tiny_field import make_field


def test_fwl_search_samples_hold_unclipped_archie_sw(tmp_path):
    project = load_project(make_field(tmp_path, wells=(("w0.las", "W0"),)))
    res, _ = compute_well(project, project.wells[0])
    samples = _well_zone_samples(project, res, "S", [], None, None)
    c = project.log_sw
    # Archie (archie1942): Sw = (a Rw / (phi^m Rt))^(1/n), worked here with numpy
    by_depth = dict(zip(res.tvdss, (c.a * c.rw / (res.phi ** c.m * res.rt)) ** (1.0 / c.n)))
    expected = np.array([by_depth[z] for z in samples.tvdss])
    assert (samples.sw_log > 1.0).any()                       # values above 1 reach the search
    assert np.allclose(samples.sw_log, expected, rtol=1e-12)
