"""Pulsed sources checked by hand: each pulse against the exposure limit at its duration, trains, bad input.

Exposure limits: IEC 62471:2006 §4.3 (the same ICNIRP values as 2006/25/EC Annex I). The group rules for pulsed
lamps (a pulse over a limit is RG3, a single pulse within every limit Exempt, a train within them grouped by its
time average) are IEC 62471:2006 6.2 # from memory.
"""

import math

import numpy as np
import pytest
from conftest import assess_pulsed, triangle_line

from hazard.standards import GROUPS

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


MS = 1e-3


def _pulse(line, **fields):
    """A pulsed source of ``line`` on GRID (see :func:`conftest.assess_pulsed`)."""
    return assess_pulsed(GRID, line, **fields)


# (hazard, line centre [nm], dose limit at 1 ms [J/m² or J/(m²·sr)], source diameter [mm] at 200 mm, line
# half-width [nm]: narrow on the 0.01 nm UV grid, 1 nm on the 0.5 nm grid)
DOSE_LIMITS = [
    pytest.param("E_S", 270.0, 30.0, 5.0, 0.05, id="E_S 30 J/m2 (4.3.1; S_UV(270) = 1, Table 4.1)"),
    pytest.param("E_UVA", 365.0, 1e4, 5.0, 0.05, id="E_UVA 1e4 J/m2 (4.3.2, unweighted)"),
    pytest.param("E_B", 437.5, 100.0, 2.0, 1.0, id="E_B 100 J/m2, small source (4.3.4; B = 1 at 435-440 nm)"),
    pytest.param("E_IR", 1500.0, 18000 * MS**0.25, 5.0, 1.0, id="E_IR 18000 t^0.25 J/m2 (4.3.7, unweighted)"),
]


@pytest.mark.parametrize(("symbol", "centre", "limit", "diameter", "width"), DOSE_LIMITS)
@pytest.mark.parametrize(("share", "group"), [(0.99, "Exempt"), (1.01, "RG3")])
def test_single_pulse_just_under_and_over_a_dose_limit(tmp_path, symbol, centre, limit, diameter, width, share, group):
    line = triangle_line(GRID, centre, share * limit / width, width)
    a = _pulse(line, source_diameter_mm=diameter)
    h = a.hazards[symbol]
    assert h.pulse.fraction == pytest.approx(share, rel=1e-3)  # the line's weighting within 0.1 %
    assert h.pulse.dose_per_pulse == pytest.approx(share * limit, rel=1e-3)
    assert h.risk_group == group
    # the overall group is never lower (the 100 J/m² blue pulse in 1 ms is also far over the retinal thermal limit)
    assert GROUPS.index(a.risk_group) >= GROUPS.index(group)
    assert h.limits == {} and h.t_max_s is None  # one pulse has no continuous-wave comparison


@pytest.mark.parametrize(("share", "group"), [(0.99, "Exempt"), (1.01, "RG3")])
def test_single_pulse_against_the_blue_light_radiance_dose(tmp_path, share, group):
    # L_B·t ≤ 10⁶ J/(m²·sr) (4.3.3), a 10 mm disc at 200 mm: the 1.7 mrad field of a pulse (Table 6.1, t ≤ 0.25 s)
    # lies inside the source, so the compared radiance dose is the source's own, H/Ω_s (method §4:
    # Ω_s = 2π(1 − cos(atan(D/2d)))).
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(5 / 200)))
    dose = share * 1e6 * omega_s  # J/m² at the eye
    a = _pulse(triangle_line(GRID, 437.5, dose), source_diameter_mm=10.0)
    assert a.hazards["L_B"].pulse.fraction == pytest.approx(share, rel=1e-9)
    assert a.hazards["L_B"].risk_group == group


def _retinal_pulse(share_of_limit, duration_s, held_at_s=None):
    """A 600 nm pulse (R = 1 over 500-700 nm, IEC 62471:2006 Table 4.2) from a 10 mm disc at 200 mm, its peak
    radiance ``share_of_limit`` × 50000/(α·t^0.25) at t = ``held_at_s`` (default: the pulse duration)."""
    alpha = 10 / 200  # α = D/d (method §4), within the 1.7-100 mrad bounds of a pulse's limit (Table 6.1)
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(5 / 200)))
    limit = 50000 / (alpha * (held_at_s or duration_s) ** 0.25)  # 4.3.5 [W/(m²·sr)]
    peak_irradiance = share_of_limit * limit * omega_s
    a = _pulse(triangle_line(GRID, 600.0, peak_irradiance), dose=False, duration_s=duration_s, source_diameter_mm=10)
    assert a.alpha_rad == pytest.approx(alpha, rel=1e-9)
    return a


@pytest.mark.parametrize(("share", "group"), [(0.99, "Exempt"), (1.01, "RG3")])
def test_retinal_thermal_pulse_at_1_ms(tmp_path, share, group):
    a = _retinal_pulse(share, 1e-3)
    assert a.hazards["L_R"].pulse.fraction == pytest.approx(share, rel=1e-3)
    assert a.hazards["L_R"].risk_group == group


@pytest.mark.parametrize(("share", "group"), [(0.99, "Exempt"), (1.01, "RG3"), (1.5, "RG3")])
def test_retinal_thermal_pulse_at_1_us_uses_the_limit_held_at_10_us(tmp_path, share, group):
    # Below 10 µs the limit is held at its 10 µs value (2006/25/EC Annex I row i: 8.89·10⁸/C_α); the formula
    # extrapolated to 1 µs would allow (10/1)^0.25 = 1.78× more, so 1.5× the held limit must still be RG3.
    a = _retinal_pulse(share, 1e-6, held_at_s=1e-5)
    assert a.hazards["L_R"].pulse.fraction == pytest.approx(share, rel=1e-3)
    assert a.hazards["L_R"].risk_group == group


def test_train_of_safe_pulses_over_a_day_is_not_safe(tmp_path):
    # 0.01 J/m² of E_S per pulse, 1 ms at 1 Hz: each pulse is 1/3000 of 30 J/m², its time average 0.01 W/m²
    # (RG2, IEC 62471:2006 Table 6.1: 0.003 < 0.01 ≤ 0.03; t_max 3000 s). 8 h gather 288 J/m², 9.6× the limit.
    line = triangle_line(GRID, 270.0, 0.01 / 0.05, 0.05)
    a = _pulse(line, rate_hz=1.0, exposure=[{"distance_mm": 200, "duration_s": "8h"}])
    e_s = a.hazards["E_S"]
    assert e_s.pulse.fraction == pytest.approx(0.01 / 30, rel=1e-3)
    assert e_s.pulse.pulses_to_limit == pytest.approx(3000, rel=1e-3)
    assert e_s.value == pytest.approx(0.01, rel=1e-3) and e_s.risk_group == "RG2"
    assert e_s.t_max_s == pytest.approx(3000, rel=1e-3)
    assert a.exposure.exposures[0].hazards["E_S"].fraction == pytest.approx(9.6, rel=1e-3)
    assert a.exposure.within is False


def test_train_grouped_by_its_time_average(tmp_path):
    # 0.002 J/m² per pulse at 1 Hz: the time average 0.002 W/m² is RG1 by the continuous-wave table
    # (0.001 < 0.002 ≤ 0.003, IEC 62471:2006 Table 6.1); every pulse is far within its limit.
    a = _pulse(triangle_line(GRID, 270.0, 0.002 / 0.05, 0.05), rate_hz=1.0)
    assert a.risk_group == "RG1" and a.hazards["E_S"].risk_group == "RG1"
    assert a.hazards["E_S"].value == pytest.approx(0.002, rel=1e-3)
    assert a.emission.mode == "pulse_train" and "time-averaged" in a.emission.rule
    assert a.emission.duty_cycle == pytest.approx(1e-3)


def test_thermal_pulses_add_up_in_a_train(tmp_path):
    # Each 600 nm pulse at half its L_R limit, 1000 per second: N = 10⁴ pulses within the 10 s window, and
    # 0.5·N^0.25 = 5 > 1 (the N^−0.25 rule of 2006/25/EC Annex II Table 2.6, written for lasers and applied here by
    # analogy: the reading that cannot call such a train safe). t_max: 0.5^−4 = 16 pulses, 16 ms.
    alpha = 10 / 200  # α = D/d (method §4)
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(5 / 200)))
    peak = 0.5 * 50000 / (alpha * 1e-5**0.25) * omega_s
    a = _pulse(triangle_line(GRID, 600.0, peak), dose=False, duration_s=1e-5, rate_hz=1000.0, source_diameter_mm=10)
    l_r = a.hazards["L_R"]
    assert l_r.pulse.fraction == pytest.approx(0.5, rel=1e-3)
    assert l_r.pulse.pulses_in_window == pytest.approx(1e4)
    assert l_r.pulse.fraction_in_train == pytest.approx(5.0, rel=1e-3)
    assert l_r.risk_group == "RG3" and a.pulse_exceeds
    assert l_r.t_max_s == pytest.approx(16 / 1000, rel=1e-2)
