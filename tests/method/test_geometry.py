"""Source geometry (hazard.method.geometry): solid angles of cones, discs and rectangles, and the share of a field of
view that a source fills, against closed forms and dense numeric sums."""

import math

import numpy as np
import pytest

from hazard.method.geometry import SourceShape, cone_rectangle_solid_angle, cone_solid_angle_sr


# --- solid angles and fields of view --------------------------------------------------------------------------
def test_solid_angles():
    # Geometry (method §4): a 0.011 rad cone is 9.503e-5 sr ≈ πγ²/4; a small disc is ≈ π(D/2)²/d²;
    # a small rectangle ≈ w·h/d².
    assert cone_solid_angle_sr(0.011) == pytest.approx(math.pi * 0.011**2 / 4, rel=1e-5)
    disc = SourceShape(np.array([0.001]), np.array([np.nan]))
    assert disc.solid_angle_sr(1.0)[0] == pytest.approx(math.pi * 0.0005**2, rel=1e-6)
    rect = SourceShape(np.array([0.002]), np.array([0.001]))
    assert rect.solid_angle_sr(1.0)[0] == pytest.approx(2e-6, rel=1e-6)
    assert rect.alpha_rad(1.0)[0] == pytest.approx(0.0015)  # mean of the two angular dimensions


def test_cone_rectangle_solid_angle_against_a_dense_sum():
    # An independent numeric integral, in Cartesian coordinates where the method works in polar ones: the solid
    # angle of {x² + y² ≤ tan²θ} ∩ {|x| ≤ p, |y| ≤ q} in the plane at unit distance is the integral of the kernel
    # 1/(1 + x² + y²)^{3/2} over it (definition of the solid angle of a flat region seen from a point). Along y it
    # is in closed form, ∫ dy/(1 + x² + y²)^{3/2} = y/((1 + x²)·√(1 + x² + y²))  # analytic
    # up to y = min(q, √(tan²θ − x²)); along x a dense trapezoid sum (2·10⁵ steps; its error, largest where the
    # circle's edge is steep, stays below 1e-7 here).
    for theta, p, q in ((0.0055, 0.0025, 3.0), (0.0055, 0.002, 0.004), (0.05, 0.03, 0.02), (0.05, 0.06, 0.01)):
        reach = math.tan(theta)
        x = np.linspace(-min(p, reach), min(p, reach), 200_001)
        y = np.minimum(q, np.sqrt(np.maximum(reach**2 - x**2, 0.0)))
        dense = np.trapezoid(2 * y / ((1 + x**2) * np.sqrt(1 + x**2 + y**2)), x)
        assert float(cone_rectangle_solid_angle(np.array(theta), np.array(p), np.array(q))) == pytest.approx(
            dense, rel=1e-6
        )


def test_long_strip_field_fraction_on_the_sphere():
    # A 1 × 1200 mm strip at 200 mm, 11 mrad field: a flat drawing of the strip with its area Ω_s narrows its
    # central width; on the sphere the cone holds 0.5581 of its area (independent review: exact integration and
    # Monte Carlo gave 0.5581)
    strip = SourceShape(np.array([0.001]), np.array([1.2]))
    assert float(strip.field_fraction(0.2, 0.011)[0]) == pytest.approx(0.5581, abs=1e-4)


def test_disc_sources_keep_e_over_the_larger_solid_angle():
    # method §4: for a uniform disc, the field average is E/max(Ω_s, Ω_γ), i.e. L·min(Ω_s, Ω_γ)/Ω_γ
    shape = SourceShape(np.array([0.001, 0.01]), np.array([np.nan, np.nan]))
    for fov in (0.0017, 0.011, 0.1):
        omega_s, omega_g = shape.solid_angle_sr(0.2), cone_solid_angle_sr(fov)
        np.testing.assert_allclose(shape.field_fraction(0.2, fov), np.minimum(omega_s, omega_g) / omega_g, rtol=1e-12)


@pytest.mark.parametrize(("width_m", "height_m"), [(0.05, math.nan), (0.06, 0.02)])
def test_projected_solid_angle_against_a_dense_sum_of_cosine_weighted_elements(width_m, height_m):
    # The on-axis irradiance of a uniform Lambertian source of radiance L is ∫ L·cos θ·cos θ' dA/r² = ∫ L·d²/r⁴ dA
    # over its surface (r: distance to the element, both cosines d/r); summed here on a fine grid of surface
    # elements, independently of the closed forms (disc: π r²/(r² + d²), the textbook result; rectangle: the
    # corner configuration factor).
    shape = SourceShape(np.array([width_m]), np.array([height_m]))
    n = 1500
    half_w, half_h = width_m / 2, (width_m if math.isnan(height_m) else height_m) / 2
    x = (np.arange(n) + 0.5) / n * 2 * half_w - half_w
    y = (np.arange(n) + 0.5) / n * 2 * half_h - half_h
    xx, yy = np.meshgrid(x, y)
    inside = xx**2 + yy**2 <= half_w**2 if math.isnan(height_m) else np.ones_like(xx, dtype=bool)
    cell = (2 * half_w / n) * (2 * half_h / n)
    for d in (0.02, 0.2):
        dense = float(np.sum(np.where(inside, d**2 / (xx**2 + yy**2 + d**2) ** 2, 0.0)) * cell)
        assert shape.projected_solid_angle_sr(d)[0] == pytest.approx(dense, rel=2e-3)


def test_irradiance_scaling_never_below_either_law():
    # A 50 mm disc measured at 20 mm and assessed at 200 mm: the point-source law gives (20/200)² = 0.01; a uniform
    # Lambertian disc gives sin²θ(200)/sin²θ(20) = (25² + 20²)/(25² + 200²) = 0.02523, 2.52× more, and that is taken.
    # Carried inward (measured at 1 m, assessed at 200 mm) the point-source law gives more and is kept.
    disc = SourceShape(np.array([0.05]), np.array([np.nan]))
    assert disc.irradiance_scaling(0.02, 0.2)[0] == pytest.approx((25**2 + 20**2) / (25**2 + 200**2), rel=1e-12)
    assert disc.irradiance_scaling(1.0, 0.2)[0] == pytest.approx(25.0, rel=1e-12)
    small = SourceShape(np.array([0.001]), np.array([0.001]))  # far from a small source the two laws agree
    assert small.irradiance_scaling(0.5, 0.2)[0] == pytest.approx(6.25, rel=1e-5)
