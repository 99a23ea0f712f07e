"""t_max (hazard.method.exposure_time): it scales with the spectrum as the power laws of the exposure limits say
(IEC 62471:2006 §4.3), checked on generated spectra (hypothesis)."""

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians, log_uniform
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

FAST = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])


GRID = np.arange(200.0, 3000.5, 1.0)
"""200–3000 nm at 1 nm: spans every hazard band (method §1), so coverage never decides."""


# --- scaling by k ------------------------------------------------------------------------------------------
# t_max exponents from the exposure limits (IEC 62471:2006 §4.3; method §1): dose limits value·t ≤ D give
# t = D/value ∝ k^-1; E_IR ≤ 18000·t^-0.75 and E_H·t ≤ 20000·t^0.25 give t ∝ k^(-4/3); L_R ≤ 50000/(α·t^0.25)
# gives t ∝ k^-4.
T_MAX_EXPONENT = {"E_S": -1.0, "E_UVA": -1.0, "L_B": -1.0, "E_B": -1.0, "E_IR": -4 / 3, "E_H": -4 / 3, "L_R": -4.0}


# A floor under every generated spectrum that reaches every exposure limit for k ≥ 0.5 with a margin of two
# (thresholds from method §1: E_S > 0.001 W/m2 within 30000 s, E_UVA > 10 W/m2, L_B > 100 W/(m2 sr),
# E_B > 1 W/m2, L_R above 50000/(α·10^0.25), E_IR above 18000·1000^-0.75 ≈ 101 W/m2, E_H above
# 20000·10^-0.75 ≈ 3560 W/m2), so that every t_max is finite and the scaling of t_max is always checked.
FLOOR_LINES = [
    (270.0, 3.0, 2e-3),  # E_S ≈ 0.015 W/m2 (S_UV ≈ 1 near 270 nm, Table 4.1)
    (365.0, 10.0, 2.0),  # E_UVA ≈ 50 W/m2
    (450.0, 10.0, 0.5),
]  # E_B ≈ 12 W/m2, luminance far above 10 cd/m2 (L_R, not L_IR)


IR_FLOOR = 20.0
"""Flat 780–3000 nm [W m⁻² nm⁻¹]: E_IR ≈ E_H ≈ 44 kW/m2, R-weighted ≈ 2.7 kW/m2."""


def _floor(wavelength_nm):
    wl = np.asarray(wavelength_nm, dtype=float)
    return gaussians(wl, FLOOR_LINES) + np.where(wl >= 780.0, IR_FLOOR, 0.0)


@FAST
@given(
    extra=st.lists(st.tuples(st.floats(200.0, 3000.0), st.floats(1.0, 300.0), log_uniform(1e-4, 10.0)), max_size=3),
    k=st.floats(0.5, 4.0),
    diameter_mm=st.floats(0.5, 8.0),
)
def test_scaling_scales_values_by_k_and_t_max_by_a_power_of_k(extra, k, diameter_mm):
    values = _floor(GRID) + gaussians(GRID, extra)
    base = assess_spectrum(GRID, values, source_diameter_mm=diameter_mm)
    scaled = assess_spectrum(GRID, k * values, source_diameter_mm=diameter_mm)
    # Which hazards apply depends on α (geometry only) and on luminance ≥ 10 cd/m2, which the floor keeps
    # (IEC 62471:2006 Table 6.1, §4.3.6); so the same hazards are reported.
    assert base.hazards.keys() == scaled.hazards.keys()
    assert "L_R" in base.hazards and ("L_B" in base.hazards) != ("E_B" in base.hazards)
    # every quantity is linear in the spectrum (method §1); so are illuminance (method §6) and the FOV averages
    assert scaled.illuminance_lx == pytest.approx(k * base.illuminance_lx, rel=1e-9)
    for symbol, b in base.hazards.items():
        s = scaled.hazards[symbol]
        assert s.value == pytest.approx(k * b.value, rel=1e-9), symbol
        assert s.compared == pytest.approx({g: k * v for g, v in b.compared.items()}, rel=1e-9), symbol
        assert s.limits == b.limits  # limits depend on α only (Table 6.1)
    for symbol, exponent in T_MAX_EXPONENT.items():
        if symbol not in base.hazards:
            continue  # E_B or L_B, by α (IEC 62471:2006 Table 6.1, α < 0.011 rad)
        b, s = base.hazards[symbol], scaled.hazards[symbol]
        assert b.t_max_s is not None and s.t_max_s is not None, symbol  # the floor reaches every limit
        if min(b.t_max_s, s.t_max_s) < 1e-5:
            # below 10 µs the retinal thermal limit is held at its 10 µs value (ICNIRP; 2006/25/EC Annex I row
            # i), so a limit exceeded there is exceeded from the first instant: t_max 0, no power law
            assert min(b.t_max_s, s.t_max_s) == 0 and symbol == "L_R", symbol
            continue
        assert s.t_max_s == pytest.approx(b.t_max_s * k**exponent, rel=1e-9), symbol
