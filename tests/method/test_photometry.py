"""Spectra from outside the project: CIE illuminants and LED series as distributed by colour-science."""

import numpy as np
import pytest
from conftest import assess_spectrum


def _illuminant(colour, name):
    sd = colour.SDS_ILLUMINANTS[name]
    return np.asarray(sd.wavelengths, dtype=float), np.asarray(sd.values, dtype=float)


def test_illuminance_of_scaled_illuminant_a_matches_colour_science(colour):
    # colour-science's photometry: luminous_flux = 683 lm/W · ∫ S(λ) V(λ) dλ (CIE 1924 V, K_m = 683, CIE S 010).
    # Illuminant A (CIE 15) read as spectral irradiance in W/m2/nm at 200 mm, scaled by 1e-3.
    wl, values = _illuminant(colour, "A")
    scaled = values * 1e-3
    reference = colour.luminous_flux(colour.SpectralDistribution(dict(zip(wl, scaled, strict=True))))
    a = assess_spectrum(wl, scaled, no_emission_outside=True)
    assert a.illuminance_lx == pytest.approx(reference, rel=1e-3)  # integration rules differ slightly


def test_k_m_is_683():
    # CIE S 010: K_m = 683 lm/W at 555 nm where V = 1. A narrow line of 1 W/m2 at 555 nm gives ≈ 683 lx.
    wl = np.arange(300.0, 800.0, 0.01)
    line = np.clip(1 - np.abs(wl - 555.0) / 0.05, 0, None) / 0.05
    a = assess_spectrum(wl, line, no_emission_outside=True)
    assert a.illuminance_lx == pytest.approx(683.0, rel=1e-4)


@pytest.mark.parametrize(
    ("name", "cct_k", "tolerance_k"),
    [
        ("A", 2856, 2),  # CIE 15:2004 §3.1: illuminant A, CCT 2856 K
        ("D65", 6504, 5),  # CIE 15:2004 §3.1: D65, CCT ≈ 6504 K
        ("FL2", 4230, 15),  # CIE 15:2004 Table T.8: FL2 (cool white fluorescent), CCT 4230 K (from memory)
        ("LED-B3", 4103, 15),  # CIE 15:2018 Table 11: LED-B3, CCT 4103 K (from memory)
    ],
)
def test_cct_of_cie_illuminants(colour, name, cct_k, tolerance_k):
    wl, values = _illuminant(colour, name)
    a = assess_spectrum(wl, values * 1e-3, no_emission_outside=True)
    assert a.photometry.cct_k == pytest.approx(cct_k, abs=tolerance_k)


def test_chromaticity_of_illuminant_a_matches_colour_science(colour):
    # colour-science's sd_to_XYZ (CIE 1931 2°) for illuminant A; CIE 15:2004 Table T.3 gives x = 0.44757,
    # y = 0.40745.
    wl, values = _illuminant(colour, "A")
    a = assess_spectrum(wl, values * 1e-3, no_emission_outside=True)
    x, y = a.photometry.chromaticity_xy
    assert (x, y) == (pytest.approx(0.44757, abs=2e-5), pytest.approx(0.40745, abs=2e-5))
