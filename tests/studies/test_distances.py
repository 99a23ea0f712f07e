"""Hazard distances, uncertainty, remedies and source uniformity, against analytic expectations."""

import math

import numpy as np
import pytest
from conftest import LINEUP, assess_arrays, triangle_line, write_spectrum

import hazard

GRID = np.concatenate([np.arange(200.0, 500.0, 0.01), np.arange(500.0, 3000.5, 0.5)])


def _boundary(a, family, group):
    return next(b for b in a.distances.boundaries if b.family == family and b.group == group)


def test_irradiance_boundary_distances_follow_the_inverse_square_law(tmp_path):
    # E_IR = 400 W/m2 at 200 mm (a 1500 nm line). Inverse-square law: E(d) = 400·(200/d)²; the Exempt limit
    # 100 W/m2 and the RG1 limit 570 W/m2 (IEC 62471:2006 Table 6.1) are met beyond d = 200·√(400/limit).
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 1500.0, 400.0), no_emission_outside=True)
    assert _boundary(a, "E_IR", "Exempt").distance_mm == pytest.approx(200 * math.sqrt(400 / 100), rel=1e-6)
    assert _boundary(a, "E_IR", "RG1").distance_mm == pytest.approx(200 * math.sqrt(400 / 570), rel=1e-6)
    assert a.distances.minimum_distance_mm["Exempt"] == pytest.approx(400.0, rel=1e-6)


def test_small_source_blue_light_switches_criterion_at_the_right_distance(tmp_path):
    # A 2 mm source: α = 2/d falls below 0.011 rad beyond d = 181.8 mm, where E_B replaces L_B (IEC 62471:2006
    # Table 6.1). B = 1 on 435-440 nm (Table 4.2), so the line's irradiance is E_B.
    switch_mm = 2 / 0.011
    # E_B(200 mm) = 4 W/m2: the E_B Exempt limit 1 W/m2 is reached at 200·√4 = 400 mm, beyond the switch.
    far = assess_arrays(
        tmp_path, GRID, triangle_line(GRID, 437.5, 4.0), name="far", source_diameter_mm=2.0, no_emission_outside=True
    )
    b = _boundary(far, "blue light", "Exempt")
    assert b.criterion == "E_B" and b.distance_mm == pytest.approx(400.0, rel=1e-6) and b.distance_mm > switch_mm
    # E_B(200 mm) = 0.3 W/m2: nearer than the switch L_B applies, averaged over the 0.1 rad Exempt field
    # (Ω = 2π(1 − cos 0.05) sr, method §4), limit 100 W/(m2 sr): E(d) = 100·Ω at d = 200·√(0.3/(100·Ω)).
    near = assess_arrays(
        tmp_path, GRID, triangle_line(GRID, 437.5, 0.3), name="near", source_diameter_mm=2.0, no_emission_outside=True
    )
    omega = 2 * math.pi * (1 - math.cos(0.05))
    b = _boundary(near, "blue light", "Exempt")
    assert b.criterion == "L_B" and b.distance_mm < switch_mm
    assert b.distance_mm == pytest.approx(200 * math.sqrt(0.3 / (100 * omega)), rel=1e-6)


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-spot-65", "cl-grow-30", "cl-germ-254"])
def test_boundary_distances_reassess_to_the_boundary(tmp_path, stem):
    # project contract (issue: beyond the label): the distance found reassesses to the boundary within 0.5 %
    a = hazard.assess(LINEUP / f"{stem}.toml")
    families = dict(hazard.IEC_62471_2006.families)
    for b in a.distances.boundaries:
        if b.distance_mm is None:
            continue
        again = hazard.assess(LINEUP / f"{stem}.toml", {"at_distance_mm": b.distance_mm})
        h = next(again.hazards[s] for s in families[b.family] if s in again.hazards)
        assert h.margins[b.group] == pytest.approx(1.0, abs=0.005), (b.family, b.group)


def test_uncertainty_makes_a_near_boundary_product_borderline(tmp_path):
    # E_S = 0.98 × the Exempt limit 0.001 W/m2 (IEC 62471:2006 Table 6.1): +10 % crosses it, +1 % does not.
    values = triangle_line(GRID, 270.0, 0.98e-3 / 0.05, 0.05)  # S_UV(270) = 1.0, Table 4.1
    wide = assess_arrays(tmp_path, GRID, values, name="wide", no_emission_outside=True, uncertainty_pct=10.0)
    narrow = assess_arrays(tmp_path, GRID, values, name="narrow", no_emission_outside=True, uncertainty_pct=1.0)
    assert wide.risk_group == "Exempt" and wide.uncertainty.verdict == "borderline"
    assert (wide.uncertainty.risk_group_low, wide.uncertainty.risk_group_high) == ("Exempt", "RG1")
    assert narrow.uncertainty.verdict == "robust"


def test_wavelength_shift_of_a_300_nm_line_follows_s_uv(tmp_path):
    # A line at 300 nm read 1 nm long or short: E_S scales by S_UV(301)/S_UV(300) and S_UV(299)/S_UV(300),
    # with S_UV log-linear between the IEC 62471:2006 Table 4.1 points 297 nm (0.46), 300 nm (0.30) and
    # 303 nm (0.12).
    values = triangle_line(GRID, 300.0, 1e-3 / 0.05, 0.05)
    a = assess_arrays(tmp_path, GRID, values, no_emission_outside=True, wavelength_uncertainty_nm=1.0)
    e_s = next(h for h in a.uncertainty.hazards if h.family == "E_S")
    s_299, s_301 = 0.30 * (0.46 / 0.30) ** (1 / 3), 0.30 * (0.12 / 0.30) ** (1 / 3)
    nominal = a.hazards["E_S"].value
    assert e_s.value_shift_plus / nominal == pytest.approx(s_301 / 0.30, rel=2e-3)
    assert e_s.value_shift_minus / nominal == pytest.approx(s_299 / 0.30, rel=2e-3)


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-spot-65", "cl-germ-254", "cl-grow-30"])
def test_dimming_factor_reassesses_to_the_target_boundary(tmp_path, stem):
    # project contract (issue: beyond the label): applying the reported dimming factor and reassessing
    # gives the target group, at its boundary
    a = hazard.assess(LINEUP / f"{stem}.toml")
    product = [r for r in a.remedies.remedies if r.target == "product"]
    assert product, "every line-up product above Exempt has product remedies"
    raw = hazard.load_product(LINEUP / f"{stem}.toml")
    for remedy in product:
        path = write_spectrum(
            tmp_path / f"{stem}-{remedy.group}.csv",
            raw.spectrum.wavelength_nm,
            raw.spectrum.value * remedy.dimming_factor,
        )
        fields = raw.record.model_dump(exclude_none=True, exclude={"id", "spectrum", "unit"})
        again = hazard.assess(path, {**fields, "unit": "W/m2/nm"})
        assert again.risk_group == remedy.group
        deciding = [again.hazards[s] for s in again.deciding_hazards]
        ratio = max(h.margins[remedy.group] for h in deciding if h.margins)
        assert ratio == pytest.approx(1.0, rel=1e-6)


def test_uv_band_contributions_name_the_mercury_line(tmp_path):
    # The germicidal lamp's E_S is dominated by the 253.7 nm mercury line (common practice / NIST ASD line
    # position), i.e. the 250-255 nm band
    a = hazard.assess(LINEUP / "cl-germ-254.toml")
    top = a.remedies.uv_bands["E_S"][0]
    assert top.band_nm == (250.0, 255.0) and top.share > 0.5
    assert sum(b.share for b in a.remedies.uv_bands["E_S"]) == pytest.approx(1.0, abs=0.01)


def test_peak_to_mean_multiplies_radiance_in_small_fields(tmp_path):
    # method §4: a non-uniform source exceeds the average radiance E/Ω_s; the record's peak-to-mean ratio
    # multiplies the radiance seen by fields of view smaller than the source (project design, issue 6).
    values = triangle_line(GRID, 437.5, 5.0)
    uniform = assess_arrays(tmp_path, GRID, values, name="u", source_diameter_mm=15.0, no_emission_outside=True)
    hot = assess_arrays(
        tmp_path, GRID, values, name="h", source_diameter_mm=15.0, no_emission_outside=True, peak_to_mean_radiance=3.0
    )
    u, h = uniform.hazards["L_B"], hot.hazards["L_B"]
    assert h.value == pytest.approx(3 * u.value)
    for group in ("RG1", "RG2"):  # 0.011 and 0.0017 rad fields are inside a 15 mm source at 200 mm (α = 0.075)
        assert h.compared[group] == pytest.approx(3 * u.compared[group])
    assert h.compared["Exempt"] == pytest.approx(u.compared["Exempt"])  # the 0.1 rad field is wider than it
    assert h.t_max_s == pytest.approx(u.t_max_s / 3)  # §4.3.3: t = 10^6 / L_B
