"""The one integration routine (hazard.method.weighting): on arrays, and through the whole assessment.

On arrays, the quadrature is held to integrals known in closed form and to a dense trapezoid sum. Through the
assessment, every quantity is a weighted integral, linear in the spectrum (method §1, §5 "Sampling"): a narrow line
gives weight × irradiance (style.md, habit 9), and resampling a smooth spectrum changes little (hypothesis). Those
spectra are assessed in memory (conftest.assess_spectrum).
"""

import math

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians, log_uniform, triangle_line
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from numpy import polynomial as P

from hazard.method.weighting import quadrature_matrix, quadrature_weights
from hazard.weighting_tables import WeightingTable, load_table

FAST = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])


# --- the quadrature on arrays --------------------------------------------------------------------------------
def _table(points_nm, values, interpolation):
    """A weighting function of our own points (invented for the check), read by the library's table rules."""
    return WeightingTable(
        name="test",
        symbol="W",
        wavelength_nm=np.asarray(points_nm, dtype=float),
        value=np.asarray(values, dtype=float),
        interpolation=interpolation,
        metadata={},
        sha256="",
    )


def _linear_times_linear(x, w, u, v):
    """∫_u^v x(λ)·w(λ) dλ for polynomials x and w (coefficients in λ, lowest first), exactly."""
    product = P.Polynomial(x) * P.Polynomial(w)
    antiderivative = product.integ()
    return float(antiderivative(v) - antiderivative(u))


def test_an_unweighted_band_integrates_a_linear_spectrum_exactly():
    # The trapezoid rule is exact for a function linear between its samples; the band ends (off the grid) are
    # interpolated. X = 2 + 0.5·(λ − 300) over 301–315 nm: ∫ = 2·14 + 0.25·(15² − 1²) = 84 W/m²  # analytic
    grid = np.array([300.0, 301.3, 302.0, 305.5, 310.0, 320.25])
    x = 2 + 0.5 * (grid - 300)
    assert float(quadrature_weights(grid, (301.0, 315.0)) @ x) == pytest.approx(84.0, rel=1e-13)


def test_a_linear_weight_times_a_linear_spectrum_is_exact():
    # A weight linear between its points (0.2 at 300 nm, 1.0 at 310, 0.4 at 325; invented) times a spectrum linear in
    # λ: on each piece the product is a quadratic, integrated here in closed form  # analytic
    weight = _table([300.0, 310.0, 325.0], [0.2, 1.0, 0.4], "linear")
    grid = np.arange(296.0, 330.0, 0.7)  # table points and band ends fall between the samples
    x = 3 - 0.04 * (grid - 300)
    x_poly = [3 + 0.04 * 300, -0.04]
    pieces = [
        (302.5, 310.0, [0.2 - 0.08 * 300, 0.08]),  # w = 0.2 + 0.08·(λ − 300)
        (310.0, 322.0, [1.0 + 0.04 * 310, -0.04]),  # w = 1.0 − 0.04·(λ − 310)
    ]
    exact = sum(_linear_times_linear(x_poly, w, u, v) for u, v, w in pieces)
    assert float(quadrature_weights(grid, (302.5, 322.0), weight) @ x) == pytest.approx(exact, rel=1e-12)


def test_a_log_linear_weight_times_a_linear_spectrum_is_exact():
    # A weight log-linear between its points (1 at 250 nm, 0.5 at 260, 0.02 at 280; invented), so w = w_a·e^{s(λ − λ_a)}
    # on each piece, times X = 1.5 + 0.1·(λ − 250): ∫ (α + βλ)·e^{sλ} dλ = e^{sλ}·((α + βλ)/s − β/s²)  # analytic
    weight = _table([250.0, 260.0, 280.0], [1.0, 0.5, 0.02], "log-linear")
    grid = np.arange(240.0, 291.0, 1.0)
    x = 1.5 + 0.1 * (grid - 250)
    alpha, beta = 1.5 - 0.1 * 250, 0.1

    def piece(u, v, lam_a, w_a, lam_b, w_b):
        s = math.log(w_b / w_a) / (lam_b - lam_a)

        def primitive(lam):
            return w_a * math.exp(s * (lam - lam_a)) * ((alpha + beta * lam) / s - beta / s**2)

        return primitive(v) - primitive(u)

    exact = piece(252.3, 260.0, 250.0, 1.0, 260.0, 0.5) + piece(260.0, 277.7, 260.0, 0.5, 280.0, 0.02)
    assert float(quadrature_weights(grid, (252.3, 277.7), weight) @ x) == pytest.approx(exact, rel=1e-12)


def test_a_gaussian_line_against_its_closed_form():
    # ∫_a^b A·exp(−(λ − μ)²/2σ²) dλ = A·σ·√(2π)·(Φ((b − μ)/σ) − Φ((a − μ)/σ)), Φ(z) = (1 + erf(z/√2))/2  # analytic
    # Sampled at 0.01 nm, the linear interpolant's error is about h²/12·∫|X''| ≈ 1e-7 of the integral.
    amplitude, mu, sigma = 2.0, 450.0, 7.0
    grid = np.arange(400.0, 500.005, 0.01)
    x = amplitude * np.exp(-0.5 * ((grid - mu) / sigma) ** 2)

    def phi(z):
        return 0.5 * (1 + math.erf(z / math.sqrt(2)))

    exact = amplitude * sigma * math.sqrt(2 * math.pi) * (phi((470 - mu) / sigma) - phi((430 - mu) / sigma))
    assert float(quadrature_weights(grid, (430.0, 470.0)) @ x) == pytest.approx(exact, rel=1e-6)


def test_s_uv_weighted_line_on_a_1_nm_grid_against_a_dense_trapezoid():
    # A 300 nm line (σ = 2 nm) sampled at 1 nm, weighted by S_UV (IEC 62471:2006 Table 4.1, log-linear between its
    # points, method §2). The method integrates the spectrum's linear interpolant times the weight exactly; the
    # reference is a trapezoid sum of the same product at 0.0005 nm, with the weight interpolated here in log
    # space from the table's points. The trapezoid sum on the 1 nm weighted samples, which the method replaces,
    # is off by more (S_UV falls by half within 2 nm near 300 nm).
    table = load_table("s_uv")
    grid = np.arange(280.0, 321.0, 1.0)
    x = np.exp(-0.5 * ((grid - 300.0) / 2.0) ** 2)
    dense = np.arange(280.0, 320.0 + 1e-9, 0.0005)
    weight = np.exp(np.interp(dense, table.wavelength_nm, np.log(table.value)))
    reference = np.trapezoid(np.interp(dense, grid, x) * weight, dense)
    method = float(quadrature_weights(grid, (200.0, 400.0), table) @ x)
    assert method == pytest.approx(reference, rel=1e-6)
    naive = np.trapezoid(x * table.at(grid), grid)
    assert abs(naive - reference) > 100 * abs(method - reference)


def test_the_band_outside_the_grid_counts_nothing_and_the_matrix_stacks_the_vectors():
    # method §5: the part of a band beyond the measured range contributes nothing (coverage is judged apart)
    grid = np.arange(300.0, 400.5, 0.5)
    ones = np.ones(grid.size)
    assert float(quadrature_weights(grid, (250.0, 350.0)) @ ones) == pytest.approx(50.0, rel=1e-13)  # analytic
    assert not quadrature_weights(grid, (450.0, 500.0)).any()
    bands = [((250.0, 350.0), None), ((320.0, 380.0), load_table("s_uv")), ((450.0, 500.0), None)]
    matrix = quadrature_matrix(grid, bands)
    assert matrix.shape == (grid.size, 3)
    for k, (band, weight) in enumerate(bands):
        np.testing.assert_array_equal(matrix[:, k], quadrature_weights(grid, band, weight))


# --- resampling a smooth spectrum ----------------------------------------------------------------------------
SMOOTH = st.lists(
    st.tuples(st.floats(300.0, 1100.0), st.floats(15.0, 150.0), st.floats(0.05, 1.0)), min_size=1, max_size=3
)
"""1–3 broad Gaussians (σ ≥ 15 nm) in 300–1100 nm [nm, nm, W m⁻² nm⁻¹]."""


MAX_WEIGHT = {"E_S": 1.0, "E_UVA": 1.0, "L_B": 1.0, "E_B": 1.0, "L_R": 10.0, "L_IR": 10.0, "E_IR": 1.0, "E_H": 1.0}
"""Largest weight in each band (Tables 4.1, 4.2: S_UV ≤ 1, B ≤ 1, R ≤ 10; unweighted bands 1)."""


RESAMPLING_REL = {"E_S": 0.010}
"""E_S may move by up to 1 %: on a 1 nm grid the trapezoid overestimates ∫exp(sλ)dλ by about (s·1 nm)²/12,
and S_UV halves in 2 nm in places (Table 4.1: 0.12 → 0.06 over 303–305 nm, 0.006 → 0.003 over 313–315 nm),
s = ln 2 / 2 nm⁻¹, giving 1.0 %. All other quantities: 0.5 % (project requirement)."""


TAIL = 1e-5
"""Part of the spectrum's whole (max-weighted) content below which a change is a far Gaussian tail, whose
log-slope the 1 nm grid cannot follow; not a property of a smooth spectrum (common practice, no published
source)."""


def _resampling_tolerances(lines, diameter_mm):
    total = sum(a * s * math.sqrt(2 * math.pi) for _, s, a in lines)  # ∫ of the Gaussians [W m⁻²]
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(diameter_mm / 400.0)))  # at 200 mm (method §4)
    floor = {k: TAIL * w * total / (omega_s if k.startswith("L") else 1.0) for k, w in MAX_WEIGHT.items()}
    floor["E_v"] = TAIL * 683.0 * total  # V ≤ 1, K_m = 683 lm/W (CIE S 010)
    return floor


def _resampled_pair(lines, fine_step_nm, diameter_mm):
    coarse_nm = np.arange(300.0, 1100.5, 1.0)
    fine_nm = 300.0 + fine_step_nm * np.arange(round(800 / fine_step_nm) + 1)
    fields = {"source_diameter_mm": diameter_mm, "no_emission_outside": True}
    coarse = assess_spectrum(coarse_nm, gaussians(coarse_nm, lines), **fields)
    fine = assess_spectrum(fine_nm, gaussians(fine_nm, lines), **fields)
    return coarse, fine


@FAST
@given(lines=SMOOTH, fine_step_nm=st.sampled_from([0.5, 0.25]), diameter_mm=st.sampled_from([1.0, 5.0]))
def test_resampling_a_smooth_spectrum_changes_little(lines, fine_step_nm, diameter_mm):
    coarse, fine = _resampled_pair(lines, fine_step_nm, diameter_mm)
    floor = _resampling_tolerances(lines, diameter_mm)
    assert coarse.hazards.keys() == fine.hazards.keys()
    for symbol, c in coarse.hazards.items():
        f = fine.hazards[symbol].value
        rel = RESAMPLING_REL.get(symbol, 0.005)
        assert abs(c.value - f) <= rel * abs(f) + floor[symbol], (symbol, c.value, f)
    assert abs(coarse.illuminance_lx - fine.illuminance_lx) <= 0.005 * fine.illuminance_lx + floor["E_v"]


def test_resampling_changes_e_s_by_at_most_half_a_percent():
    coarse, fine = _resampled_pair([(310.0, 30.0, 1.0)], 0.25, 5.0)
    # project requirement: resampling a smooth spectrum changes no quantity by more than 0.5 %
    assert coarse.hazards["E_S"].value == pytest.approx(fine.hazards["E_S"].value, rel=0.005)


# --- a narrow line gives weight × irradiance ----------------------------------------------------------------
# Stretches where the weight is constant (IEC 62471:2006 Table 4.2: B = 0.01 over 300–380 nm, B(435) =
# B(440) = 1.0, B = 0.001 over 600–700 nm; R = 1.0 over 500–700 nm, 0.2 over 1050–1150 nm, 0.02 over
# 1200–1400 nm; E_UVA, E_IR and E_H are unweighted, §4.3). (symbol, quantity, source diameter [mm], stretch
# [nm], weight). The source sizes choose E_B (α = 1/200 < 0.011 rad) or L_B (α = 10/200); L_R needs a
# luminance ≥ 10 cd/m2, so R's infrared stretches are read as L_IR (IEC 62471:2006 §4.3.6).
CONSTANT_WEIGHT = [
    ("E_B", "irradiance", 1.0, (300.0, 380.0), 0.01),
    ("E_B", "irradiance", 1.0, (435.0, 440.0), 1.0),
    ("E_B", "irradiance", 1.0, (600.0, 700.0), 0.001),
    ("L_B", "radiance", 10.0, (435.0, 440.0), 1.0),
    ("L_R", "radiance", 10.0, (500.0, 700.0), 1.0),
    ("L_IR", "radiance", 10.0, (1050.0, 1150.0), 0.2),
    ("L_IR", "radiance", 10.0, (1200.0, 1400.0), 0.02),
    ("E_UVA", "irradiance", 5.0, (315.0, 400.0), 1.0),
    ("E_IR", "irradiance", 5.0, (780.0, 3000.0), 1.0),
    ("E_H", "irradiance", 5.0, (380.0, 3000.0), 1.0),
]


LINE_STEP_NM = 0.25


def _line(centre_nm, peak):
    """A triangle of 1 nm half-width on a grid through its vertices: its area is peak × 1 nm exactly."""
    grid = centre_nm + LINE_STEP_NM * np.arange(-8, 9)
    return grid, triangle_line(grid, centre_nm, peak, 1.0)


def _record(quantity, diameter_mm):
    if quantity == "radiance":
        return {
            "quantity": "radiance",
            "unit": "W/m2/sr/nm",
            "source_diameter_mm": diameter_mm,
            "no_emission_outside": True,
            "distance_mm": None,
        }
    return {"source_diameter_mm": diameter_mm, "no_emission_outside": True}


@FAST
@given(case=st.sampled_from(CONSTANT_WEIGHT), data=st.data(), peak=log_uniform(10.0, 1e4))
def test_narrow_line_where_the_weight_is_constant(case, data, peak):
    symbol, quantity, diameter_mm, (lo, hi), weight = case
    centre = data.draw(st.floats(lo + 1.0, hi - 1.0))  # the line's base stays inside the stretch
    grid, values = _line(centre, peak)
    a = assess_spectrum(grid, values, **_record(quantity, diameter_mm))
    assert symbol in a.hazards, sorted(a.hazards)
    # a narrow line gives weight × (peak × 1 nm) (style.md habit 9; weights as above)
    assert a.hazards[symbol].value == pytest.approx(weight * peak * 1.0, rel=1e-9)


def _triangle_times_exponential(s):
    """∫₀¹ (1 − x)·e^(−s·x) dx: one side of a unit triangle under a weight falling by e^(−s) per nm."""
    return 0.5 if abs(s) < 1e-12 else (s - 1 + math.exp(-s)) / s**2


@pytest.mark.parametrize(
    ("symbol", "centre", "weight", "left", "right", "source"),
    [
        ("E_S", 270.0, 1.0, (265.0, 0.81), (275.0, 0.96), "IEC 62471:2006 Table 4.1"),
        ("E_S", 254.0, 0.5, (250.0, 0.43), (255.0, 0.52), "IEC 62471:2006 Table 4.1"),
        ("E_B", 440.0, 1.0, (435.0, 1.0), (445.0, 0.97), "IEC 62471:2006 Table 4.2"),
    ],
)
def test_narrow_line_at_a_tabulated_point(symbol, centre, weight, left, right, source):
    """At a tabulated point the weight bends; between table points it is log-linear (method §2), so the
    line integral is weight × peak × 1 nm × (g(s_left) + g(s_right)), with g from
    :func:`_triangle_times_exponential` and s the log-slope on each side from the published neighbours."""
    peak = 2.0
    grid = centre + 0.01 * np.arange(-100, 101)  # trapezoid error ≈ (h²/12)·2·(s_left + s_right)·P < 1e-6·P
    values = triangle_line(grid, centre, peak, 1.0)
    a = assess_spectrum(grid, values, source_diameter_mm=1.0, no_emission_outside=True)
    s_left = math.log(weight / left[1]) / (centre - left[0])
    s_right = math.log(weight / right[1]) / (right[0] - centre)
    shape = _triangle_times_exponential(s_left) + _triangle_times_exponential(s_right)
    expected = weight * peak * 1.0 * shape  # source: see the parameter 'source'
    assert a.hazards[symbol].value == pytest.approx(expected, rel=1e-5), source
    assert a.hazards[symbol].value == pytest.approx(weight * peak * 1.0, rel=0.01)  # ≈ weight × P × 1 nm
