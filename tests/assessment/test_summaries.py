"""The summaries of a result (hazard.assessment.summaries): blue-light transfer values only for mainly visible
sources."""

import numpy as np
from conftest import assess_spectrum, gaussians, triangle_line

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""


def _assess(values, **fields):
    """An irradiance on GRID assessed in memory at 200 mm, nothing emitted outside it (no studies)."""
    return assess_spectrum(GRID, values, **{"no_emission_outside": True, "source_diameter_mm": None, **fields})


def test_blue_light_transfer_only_for_mainly_visible_sources():
    # IEC TR 62778 transfer values are made for white-light sources: an IR emitter with a trace of visible light
    # gets none
    visible_trace = triangle_line(GRID, 555.0, 1e-4, 5.0)
    ir = _assess(triangle_line(GRID, 940.0, 5.0, 20.0) + visible_trace, source_diameter_mm=5.0)
    white = _assess(gaussians(GRID, [(450.0, 10.0, 0.5), (580.0, 60.0, 0.4)]), source_diameter_mm=5.0)
    assert ir.blue_light_transfer is None and white.blue_light_transfer is not None
