"""Daily exposures against the exposure limit values, checked by hand.

The limits are those of Directive 2006/25/EC Annex I Table 1.1, which for these rows are the ICNIRP limits that
IEC 62471:2006 §4.3 also prints: E_S·t ≤ 30 J/m² (row a), E_UVA·t ≤ 10⁴ J/m² (row b), L_B·t ≤ 10⁶ J/(m²·sr) up to
10⁴ s (row d).
"""

import math

import numpy as np
import pytest
from conftest import assess_spectrum, triangle_line

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


# S_UV(270 nm) = 1.0 (IEC 62471:2006 Table 4.1): a 270 nm line of 0.001 W/m² gives E_S = 0.001 W/m².
UV_LINE = triangle_line(GRID, 270.0, 0.001 / 0.05, 0.05)


def _uv(exposures, **fields):
    """The 270 nm line measured at 1000 mm from a 5 mm source, with the given exposures."""
    return assess_spectrum(GRID, UV_LINE, distance_mm=1000.0, no_emission_outside=True, exposure=exposures, **fields)


def test_fraction_is_dose_over_limit(tmp_path):
    # 2 h at 1000 mm: E_S·t/30 J/m² = 0.001·7200/30 = 0.24 (2006/25/EC Annex I row a; IEC 62471:2006 §4.3.1).
    # At 500 mm the inverse-square law gives 4·0.001 W/m²: 10 min → 0.004·600/30 = 0.08.
    a = _uv([{"distance_mm": 1000, "duration_s": "2h"}, {"distance_mm": 500, "duration_s": "10min"}])
    first, second = a.exposure.exposures
    assert first.hazards["E_S"].fraction == pytest.approx(0.24, rel=1e-3)  # the line's weighting within 0.1 %
    assert second.hazards["E_S"].fraction == pytest.approx(0.08, rel=1e-3)
    assert first.duration_s == 7200 and second.duration_s == 600
    # exactly E·t/30 with the tool's own E_S, moved from the 200 mm assessment distance by the inverse square
    e_s_200 = a.hazards["E_S"].value
    assert first.hazards["E_S"].fraction == pytest.approx(e_s_200 * (200 / 1000) ** 2 * 7200 / 30, rel=1e-12)
    assert second.hazards["E_S"].fraction == pytest.approx(e_s_200 * (200 / 500) ** 2 * 600 / 30, rel=1e-12)


def test_two_exposures_of_a_dose_add_up(tmp_path):
    # A dose limit over the day: 0.24 + 0.08 = 0.32 of 30 J/m² (the doses add; 2006/25/EC Annex I row a is a
    # daily value).
    a = _uv([{"distance_mm": 1000, "duration_s": "2h"}, {"distance_mm": 500, "duration_s": "10min"}])
    assert a.exposure.day["E_S"].fraction == pytest.approx(0.32, rel=1e-3)
    assert a.exposure.within is True
    over = _uv([{"distance_mm": 1000, "duration_s": "6h"}, {"distance_mm": 500, "duration_s": "2h"}])
    # 0.001·21600/30 + 0.004·7200/30 = 0.72 + 0.96 = 1.68: each within on its own? no: the second is 0.96,
    # the first 0.72, both under 1, yet the day is over its limit.
    assert all(e.hazards["E_S"].fraction < 1 for e in over.exposure.exposures)
    assert over.exposure.day["E_S"].fraction == pytest.approx(1.68, rel=1e-3)
    assert over.exposure.within is False and over.exposure.most_family == "E_S"


def test_allowed_duration_reassesses_to_the_limit(tmp_path):
    # The allowed stay at a distance, stated back as the exposure's duration, is a fraction 1.000 of the limit.
    a = _uv([{"distance_mm": 700, "duration_s": "1h"}])
    allowed = a.exposure.exposures[0].hazards["E_S"].allowed_duration_s
    assert allowed == pytest.approx(30 / (0.001 * (1000 / 700) ** 2), rel=1e-3)  # 30 J/m² / E_S at 700 mm
    again = _uv([{"distance_mm": 700, "duration_s": allowed}])
    assert again.exposure.exposures[0].hazards["E_S"].fraction == pytest.approx(1.0, abs=1e-9)


def test_allowed_duration_of_blue_light_with_its_growing_field_reassesses_to_the_limit():
    # L_B's field of view grows with the duration (IEC 62471:2006 Table 6.1 note; 1.1·√t mrad): the allowed
    # stay must be found with the field that belongs to it, and stated back it gives 1.000.
    blue = triangle_line(GRID, 437.5, 40.0)  # B = 1 over 435-440 nm (IEC 62471:2006 Table 4.2)
    fields = {"distance_mm": 200.0, "source_diameter_mm": 10.0, "no_emission_outside": True}
    a = assess_spectrum(GRID, blue, exposure=[{"distance_mm": 300, "duration_s": "1min"}], **fields)
    found = a.exposure.exposures[0].hazards["blue light"]
    assert found.criterion == "L_B" and found.allowed_duration_s is not None
    again = assess_spectrum(
        GRID, blue, exposure=[{"distance_mm": 300, "duration_s": found.allowed_duration_s}], **fields
    )
    assert again.exposure.exposures[0].hazards["blue light"].fraction == pytest.approx(1.0, abs=1e-6)


def test_shortest_distance_follows_the_inverse_square_law(tmp_path):
    # E_S(d) = 0.001·(1000/d)² W/m²; 8 h within 30 J/m² needs d ≥ 1000·√(0.001·28800/30) mm.
    a = _uv([{"distance_mm": 300, "duration_s": "8h"}])
    shortest = a.exposure.exposures[0].hazards["E_S"].shortest_distance_mm
    assert shortest == pytest.approx(1000 * math.sqrt(0.001 * 28800 / 30), rel=1e-3)
    e_s_200 = a.hazards["E_S"].value  # with the tool's own E_S the law holds to the search's precision
    assert shortest == pytest.approx(200 * math.sqrt(e_s_200 * 28800 / 30), rel=1e-9)


def test_a_short_intense_spell_is_not_averaged_away():
    # UV-A to the eye: the Directive keeps 10⁴ J/m² as a daily dose (row b), so 10 min at 40 W/m² (2.4·10⁴ J/m²,
    # 2.4× the limit) stays over the limit however long the rest of the day is spent far away.
    uva = triangle_line(GRID, 365.0, 40.0)  # E_UVA is unweighted over 315-400 nm: 40 W/m² at 200 mm
    a = assess_spectrum(
        GRID,
        uva,
        no_emission_outside=True,
        exposure=[{"distance_mm": 200, "duration_s": "10min"}, {"distance_mm": 20000, "duration_s": "7h"}],
    )
    assert a.exposure.exposures[0].hazards["E_UVA"].fraction == pytest.approx(2.4, rel=1e-6)
    assert a.exposure.day["E_UVA"].fraction >= 2.4
    assert a.exposure.within is False


def test_thermal_exposures_do_not_add_up():
    # Thermal limits are not doses over the day: the day's fraction is the highest single exposure
    # (# common practice, no published source: the limits' own time ranges end at 10 s / 1000 s).
    ir = triangle_line(GRID, 1500.0, 50.0)  # E_IR = 50 W/m² at 200 mm, unweighted 780-3000 nm
    a = assess_spectrum(
        GRID,
        ir,
        no_emission_outside=True,
        exposure=[{"distance_mm": 200, "duration_s": "1h"}, {"distance_mm": 200, "duration_s": "1h"}],
    )
    one = a.exposure.exposures[0].hazards["E_IR"].fraction
    assert one == pytest.approx(50 / 100, rel=1e-6)  # beyond 1000 s E_IR ≤ 100 W/m² (row n, IEC §4.3.7)
    assert a.exposure.day["E_IR"].fraction == pytest.approx(one)
