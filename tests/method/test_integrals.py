"""Weighted integrals of many spectra (hazard.method.integrals)."""

import numpy as np
import pytest
from conftest import assess_spectrum

SIZE = {"distance_mm": 500.0, "source_diameter_mm": 20.0}


def test_irregular_grid_integrates_on_its_own_grid():
    # An array spectrometer's ~0.3 nm irregular grid gives the same quantities as a regular 0.1 nm grid of
    # the same smooth spectrum, within the trapezoid rule's error (method §5: own grid, no resampling).
    rng = np.random.default_rng(3)
    irregular = np.cumsum(rng.uniform(0.2, 0.4, 8000)) + 300.0
    irregular = irregular[irregular <= 1100]
    regular = np.arange(300.0, 1100.0, 0.1)

    def shape(w):
        return 0.05 * np.exp(-0.5 * ((w - 460) / 20) ** 2) + 0.1 * np.exp(-0.5 * ((w - 800) / 90) ** 2)

    a = assess_spectrum(irregular, shape(irregular), **SIZE, no_emission_outside=True)
    b = assess_spectrum(regular, shape(regular), **SIZE, no_emission_outside=True)
    for symbol in ("E_UVA", "L_B", "L_R", "E_IR", "E_H"):
        assert a.hazards[symbol].value == pytest.approx(b.hazards[symbol].value, rel=2e-3)
