"""Weighted integrals of many spectra (hazard.method.integrals): on arrays against closed forms and each other, and
through the assessment on an irregular grid."""

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians

from hazard.method.evaluate import integral_index
from hazard.method.integrals import coverage, integrate_matrix, integrate_spectra
from hazard.standards import IEC_62471_2006

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


# --- the integrals on arrays ---------------------------------------------------------------------------------
GRID = np.arange(200.0, 3000.5, 1.0)
"""200–3000 nm at 1 nm: every band of IEC 62471:2006 (method §1)."""
KEYS = integral_index(IEC_62471_2006)


def _spectra(n):
    """``n`` spectra of a UV line, a visible line and a broad infrared band, each a little apart [W m⁻² nm⁻¹]."""
    return np.vstack(
        [gaussians(GRID, [(270 + 40 * i, 20, 0.01), (450 + 100 * i, 30, 1.0), (1200, 300, 0.2)]) for i in range(n)]
    )


def test_unweighted_bands_of_a_linear_spectrum_are_exact():
    # X = 1 + 0.01·(λ − 200) W m⁻² nm⁻¹. E_UVA = ∫_315^400 X dλ (IEC 62471:2006 §4.3.2, unweighted)
    # = 85 + 0.005·(200² − 115²) = 218.875 W/m²; E_IR = ∫_780^3000 X dλ (§4.3.7) = 2220 + 0.005·(2800² − 580²)
    # = 39738 W/m²  # analytic
    x = 1 + 0.01 * (GRID - 200)
    integrated, _, _ = integrate_matrix(GRID, x[None, :], np.array([False]), IEC_62471_2006)
    assert integrated.raw[0, KEYS["E_UVA"]] == pytest.approx(218.875, rel=1e-13)
    assert integrated.raw[0, KEYS["E_IR"]] == pytest.approx(39738.0, rel=1e-13)


def test_the_matrix_product_and_the_per_product_sum_agree():
    # two ways to the same integrals (hazard.method.integrals): one BLAS product for the batch, one fixed-order sum
    # per product; only their last bits may differ
    values = _spectra(7)
    batch, _, _ = integrate_matrix(GRID, values, np.zeros(7, dtype=bool), IEC_62471_2006)
    alone = integrate_spectra([GRID] * 7, list(values), [False] * 7, IEC_62471_2006)
    np.testing.assert_allclose(batch.raw, alone.raw, rtol=1e-12, atol=0)
    np.testing.assert_allclose(batch.xyz, alone.xyz, rtol=1e-12, atol=0)
    np.testing.assert_array_equal(batch.covered, alone.covered)
    chunked, _, _ = integrate_matrix(GRID, values, np.zeros(7, dtype=bool), IEC_62471_2006, chunk_rows=3)
    np.testing.assert_allclose(chunked.raw, batch.raw, rtol=1e-12, atol=0)


def test_a_product_s_integrals_do_not_depend_on_the_others():
    # a product's integrals are the same bits alone or in a batch, on its own grid among others (integrate_spectra)
    values = _spectra(3)
    coarse = GRID[::5]
    together = integrate_spectra(
        [GRID, coarse, GRID], [values[0], values[1][::5], values[2]], [False] * 3, IEC_62471_2006
    )
    for i, (grid, x) in enumerate([(GRID, values[0]), (coarse, values[1][::5]), (GRID, values[2])]):
        alone = integrate_spectra([grid], [x], [False], IEC_62471_2006)
        np.testing.assert_array_equal(together.raw[i], alone.raw[0])


def test_float32_spectra_stay_within_the_rounding_bound():
    # a sum of m non-negative float32 terms is within (m − 1)·2⁻²⁴ of the exact sum, relatively (Higham, Accuracy
    # and Stability of Numerical Algorithms, 2002, §4.2; from memory)
    values = _spectra(5)
    single, _, _ = integrate_matrix(GRID, values.astype(np.float32), np.zeros(5, dtype=bool), IEC_62471_2006)
    double, _, _ = integrate_matrix(GRID, values, np.zeros(5, dtype=bool), IEC_62471_2006)
    np.testing.assert_allclose(single.raw, double.raw, rtol=GRID.size * 2.0**-24, atol=0)


def test_negatives_count_as_zero_and_extreme_samples_are_reported():
    # method §5: dark-noise negatives count as zero (the caller judges them against the peak); NaN and ±inf show in
    # each row's highest and lowest sample, which is where a batch refuses them
    values = _spectra(4)
    noisy = values.copy()
    noisy[0, 100:110] = -1e-4
    noisy[1, 7], noisy[2, 9] = np.inf, -np.inf
    with np.errstate(invalid="ignore"):  # ±inf × a zero weight is NaN in the refused rows' integrals
        integrated, peak, lowest = integrate_matrix(GRID, noisy, np.zeros(4, dtype=bool), IEC_62471_2006)
    clipped, _, _ = integrate_matrix(GRID, np.maximum(noisy[:1], 0), np.array([False]), IEC_62471_2006)
    np.testing.assert_allclose(integrated.raw[0], clipped.raw[0], rtol=1e-12, atol=0)  # BLAS blocking: last bits
    assert lowest[0] == -1e-4 and peak[0] == values[0].max()
    assert peak[1] == np.inf and lowest[2] == -np.inf
    with np.errstate(invalid="ignore"):
        _, peak, _ = integrate_matrix(
            GRID, np.where(np.arange(GRID.size) == 7, np.nan, values[:1]), np.array([False]), IEC_62471_2006
        )
    assert np.isnan(peak[0])


def test_a_nan_row_does_not_change_its_neighbours():
    # method §5 and the batch contract: one bad product never changes another's result; the NaN row is refused, its
    # neighbour with dark-noise negatives must integrate as it does alone
    noisy = _spectra(2)
    noisy[0, 100:110] = -1e-4
    noisy[1, 7] = np.nan
    with np.errstate(invalid="ignore"):
        together, _, _ = integrate_matrix(GRID, noisy, np.zeros(2, dtype=bool), IEC_62471_2006)
    alone, _, _ = integrate_matrix(GRID, noisy[:1], np.array([False]), IEC_62471_2006)
    np.testing.assert_allclose(together.raw[0], alone.raw[0], rtol=1e-12, atol=0)  # BLAS blocking: last bits


def test_the_unit_factor_scales_every_integral():
    values = _spectra(3)
    factor = np.array([1e-3, 1.0, 1e4])  # mW, W and W/cm² per nm to W/m²/nm (SI prefixes)
    scaled, _, _ = integrate_matrix(GRID, values, np.zeros(3, dtype=bool), IEC_62471_2006, factor)
    plain, _, _ = integrate_matrix(GRID, values, np.zeros(3, dtype=bool), IEC_62471_2006)
    np.testing.assert_array_equal(scaled.raw, plain.raw * factor[:, None])
    np.testing.assert_array_equal(scaled.xyz, plain.xyz * factor[:, None])


def test_an_integral_is_trusted_where_its_band_is_measured_or_nothing_is_emitted_outside():
    # method §5: a spectrum of 380–780 nm spans the visible band, not E_S's 200–400 nm, unless the record states that
    # nothing is emitted outside it
    visible = np.arange(380.0, 781.0, 5.0)
    covered, gap_free = coverage(visible, False, IEC_62471_2006)
    assert covered[KEYS["VIS"]] and not covered[KEYS["E_S"]] and not covered[KEYS["E_IR"]] and gap_free.all()
    assert coverage(visible, True, IEC_62471_2006)[0].all()


def test_a_hole_in_the_spectrum_is_not_covered_even_when_nothing_is_emitted_outside():
    # method §5 read on the safe side: across a 500 nm hole (400–900 nm) the spectrum is unknown, so no band that
    # holds the hole is trusted, and what the record says of the range outside the measurement does not fill it;
    # bands clear of the hole (E_S, 200–400 nm) stay covered. Steps of 10 nm (UV) or 50 nm (IR) are no hole.
    holed = np.concatenate([np.arange(200.0, 401.0, 1.0), np.arange(900.0, 3001.0, 1.0)])
    for no_emission_outside in (False, True):
        covered, gap_free = coverage(holed, no_emission_outside, IEC_62471_2006)
        assert covered[KEYS["E_S"]] and not covered[KEYS["VIS"]] and not covered[KEYS["L_R"]]
        # E_IR (780-3000 nm) holds only 780-900 nm of the hole, under its allowance of a tenth of the band
        assert covered[KEYS["E_IR"]] == no_emission_outside or covered[KEYS["E_IR"]]
        assert not gap_free[KEYS["V"]] and gap_free[KEYS["E_UVA"]]
    coarse = np.concatenate([np.arange(200.0, 800.0, 10.0), np.arange(800.0, 3001.0, 50.0)])
    assert coverage(coarse, False, IEC_62471_2006)[0].all()
