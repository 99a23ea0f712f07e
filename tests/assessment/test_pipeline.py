"""Relative spectra scaled by a photometric anchor (hazard.assessment.pipeline), against colour-science's photometry."""

import numpy as np
import pytest
from conftest import assess_spectrum


def test_illuminant_a_scaled_to_1000_lx(colour):
    # colour-science's CIE illuminant A (relative) anchored to 1000 lx at 500 mm: the scale factor is
    # 1000 / (683 ∫S V dλ), with colour-science's own photometry giving 683 ∫S V dλ (CIE S 010, K_m = 683).
    sd = colour.SDS_ILLUMINANTS["A"]
    a = assess_spectrum(
        sd.wavelengths,
        sd.values,
        quantity="relative",
        illuminance_lx=1000.0,
        distance_mm=500.0,
        source_diameter_mm=10.0,
        no_emission_outside=True,
    )
    expected_scale = 1000.0 / colour.luminous_flux(sd)
    assert a.scaling.scale_factor == pytest.approx(expected_scale, rel=1e-3)
    assert a.illuminance_lx == pytest.approx(1000.0 * (500 / 200) ** 2, rel=1e-9)  # inverse-square to 200 mm
    # the absolute spectrum: E_λ(560 nm) at 500 mm = scale · S(560); the preview holds it at 200 mm scaling
    # to the measurement distance is the record's job, so compare E_UVA (unweighted 315-400 nm) instead
    uva_relative = float(
        np.trapezoid(
            sd.values[(sd.wavelengths >= 315) & (sd.wavelengths <= 400)],
            sd.wavelengths[(sd.wavelengths >= 315) & (sd.wavelengths <= 400)],
        )
    )
    assert a.hazards["E_UVA"].value == pytest.approx(expected_scale * uva_relative * (500 / 200) ** 2, rel=2e-3)
    assert any("scaled by" in text for text in a.assumptions)


def test_led_b3_with_luminous_intensity(colour):
    # CIE LED-B3 (CIE 15:2018, via colour-science) with I_v = 250 cd: E_v at 200 mm = I/d² = 6250 lx
    # (inverse-square law)
    sd = colour.SDS_ILLUMINANTS["LED-B3"]
    a = assess_spectrum(
        sd.wavelengths,
        sd.values,
        quantity="relative",
        luminous_intensity_cd=250.0,
        distance_mm=None,  # an intensity needs no measurement distance
        source_diameter_mm=5.0,
        no_emission_outside=True,
    )
    assert a.illuminance_lx == pytest.approx(250.0 / 0.2**2, rel=1e-9)
    assert a.blue_light_transfer.luminous_intensity_cd == 250.0
    # TR 62778: d_thr = √(I/E_thr), E_thr = 1/K_B,v
    t = a.blue_light_transfer
    assert t.threshold_distance_mm == pytest.approx(1e3 * np.sqrt(250.0 * t.k_bv_w_per_lm), rel=1e-9)


def test_relative_spectrum_short_of_a_band_follows_the_coverage_rule():
    wl = np.arange(400.0, 701.0, 1.0)
    relative = np.exp(-0.5 * ((wl - 550) / 60) ** 2)
    a = assess_spectrum(
        wl, relative, quantity="relative", illuminance_lx=500.0, distance_mm=500.0, source_diameter_mm=20.0
    )
    assert not a.complete and "E_S" in a.not_assessed  # method §5 coverage
