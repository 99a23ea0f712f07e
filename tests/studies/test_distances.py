"""Hazard distances (hazard.studies.distances), against analytic expectations."""

import math

import numpy as np
import pytest
from conftest import assess_spectrum, lineup_product, triangle_line

import hazard
from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded

GRID = np.concatenate([np.arange(200.0, 500.0, 0.01), np.arange(500.0, 3000.5, 0.5)])


def _boundary(a, family, group):
    return next(b for b in a.distances.boundaries if b.family == family and b.group == group)


def test_irradiance_boundary_distances_follow_the_inverse_square_law():
    # E_IR = 400 W/m2 at 200 mm (a 1500 nm line). Inverse-square law: E(d) = 400·(200/d)²; the Exempt limit
    # 100 W/m2 and the RG1 limit 570 W/m2 (IEC 62471:2006 Table 6.1) are met beyond d = 200·√(400/limit).
    a = assess_spectrum(GRID, triangle_line(GRID, 1500.0, 400.0), studies=True, no_emission_outside=True)
    assert _boundary(a, "E_IR", "Exempt").distance_mm == pytest.approx(200 * math.sqrt(400 / 100), rel=1e-6)
    assert _boundary(a, "E_IR", "RG1").distance_mm == pytest.approx(200 * math.sqrt(400 / 570), rel=1e-6)
    assert a.distances.minimum_distance_mm["Exempt"] == pytest.approx(400.0, rel=1e-6)


def test_small_source_blue_light_switches_criterion_at_the_right_distance():
    # A 2 mm source: α = 2/d falls below 0.011 rad beyond d = 181.8 mm, where E_B replaces L_B (IEC 62471:2006
    # Table 6.1). B = 1 on 435-440 nm (Table 4.2), so the line's irradiance is E_B.
    switch_mm = 2 / 0.011
    # E_B(200 mm) = 4 W/m2: the E_B Exempt limit 1 W/m2 is reached at 200·√4 = 400 mm, beyond the switch.
    far = assess_spectrum(
        GRID,
        triangle_line(GRID, 437.5, 4.0),
        studies=True,
        source_diameter_mm=2.0,
        no_emission_outside=True,
    )
    b = _boundary(far, "blue light", "Exempt")
    assert b.criterion == "E_B" and b.distance_mm == pytest.approx(400.0, rel=1e-6) and b.distance_mm > switch_mm
    # E_B(200 mm) = 0.3 W/m2: nearer than the switch L_B applies, averaged over the 0.1 rad Exempt field
    # (Ω = 2π(1 − cos 0.05) sr, method §4), limit 100 W/(m2 sr): E(d) = 100·Ω at d = 200·√(0.3/(100·Ω)).
    near = assess_spectrum(
        GRID,
        triangle_line(GRID, 437.5, 0.3),
        studies=True,
        source_diameter_mm=2.0,
        no_emission_outside=True,
    )
    omega = 2 * math.pi * (1 - math.cos(0.05))
    b = _boundary(near, "blue light", "Exempt")
    assert b.criterion == "L_B" and b.distance_mm < switch_mm
    assert b.distance_mm == pytest.approx(200 * math.sqrt(0.3 / (100 * omega)), rel=1e-6)


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-spot-65", "cl-grow-30", "cl-germ-254"])
def test_boundary_distances_reassess_to_the_boundary(lineup, stem):
    # project contract (issue: beyond the label): the distance found reassesses to the boundary within 0.5 %
    families = dict(hazard.IEC_62471_2006.families)
    boundaries = [b for b in lineup[stem].distances.boundaries if b.distance_mm is not None]
    products = [lineup_product(stem, at_distance_mm=b.distance_mm) for b in boundaries]
    batch = evaluate_loaded(products)  # each product's integrals and groups as when it is assessed alone
    for i, b in enumerate(boundaries):
        again = build_assessment(products[i], batch, i, studies=False)
        h = next(again.hazards[s] for s in families[b.family] if s in again.hazards)
        assert h.margins[b.group] == pytest.approx(1.0, abs=0.005), (b.family, b.group)
