"""Groups within the measurement uncertainty (hazard.studies.uncertainty), against analytic expectations."""

import numpy as np
import pytest
from conftest import assess_spectrum, triangle_line

GRID = np.concatenate([np.arange(200.0, 500.0, 0.01), np.arange(500.0, 3000.5, 0.5)])


def test_uncertainty_makes_a_near_boundary_product_borderline():
    # E_S = 0.98 × the Exempt limit 0.001 W/m2 (IEC 62471:2006 Table 6.1): +10 % crosses it, +1 % does not.
    values = triangle_line(GRID, 270.0, 0.98e-3 / 0.05, 0.05)  # S_UV(270) = 1.0, Table 4.1
    wide = assess_spectrum(GRID, values, no_emission_outside=True, uncertainty_pct=10.0)
    narrow = assess_spectrum(GRID, values, no_emission_outside=True, uncertainty_pct=1.0)
    assert wide.risk_group == "Exempt" and wide.uncertainty.verdict == "borderline"
    assert (wide.uncertainty.risk_group_low, wide.uncertainty.risk_group_high) == ("Exempt", "RG1")
    assert narrow.uncertainty.verdict == "robust"


def test_wavelength_shift_of_a_300_nm_line_follows_s_uv():
    # A line at 300 nm read 1 nm long or short: E_S scales by S_UV(301)/S_UV(300) and S_UV(299)/S_UV(300),
    # with S_UV log-linear between the IEC 62471:2006 Table 4.1 points 297 nm (0.46), 300 nm (0.30) and
    # 303 nm (0.12).
    values = triangle_line(GRID, 300.0, 1e-3 / 0.05, 0.05)
    a = assess_spectrum(GRID, values, no_emission_outside=True, wavelength_uncertainty_nm=1.0)
    e_s = next(h for h in a.uncertainty.hazards if h.family == "E_S")
    s_299, s_301 = 0.30 * (0.46 / 0.30) ** (1 / 3), 0.30 * (0.12 / 0.30) ** (1 / 3)
    nominal = a.hazards["E_S"].value
    assert e_s.value_shift_plus / nominal == pytest.approx(s_301 / 0.30, rel=2e-3)
    assert e_s.value_shift_minus / nominal == pytest.approx(s_299 / 0.30, rel=2e-3)
