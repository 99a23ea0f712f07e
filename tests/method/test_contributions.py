"""Where each hazard's value comes from (the result's ``contributions``), when the visible emission is negligible, and
the one notation every output uses."""

from itertools import pairwise

import numpy as np
import pytest
from conftest import LINEUP

import hazard
from hazard.inputs.loading import load_product
from hazard.method.contributions import band_step_nm, spectral_shares
from hazard.method.weighting import quadrature_weights
from hazard.output.formatting import format_value, unit_text
from hazard.standards import DEFAULT_LIMIT_SET
from hazard.weighting_tables import load_table


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-germ-254", "cl-spot-65"])
def test_shares_split_each_value_as_band_integrals_do(stem):
    # Each share, times the hazard's value, must equal the integral of the hazard over that band alone, computed
    # independently with the quadrature of hazard.method.weighting (design/method.md §5): the split is exact up to
    # how the band edges cut a sample's cell, under 2 % of the value on the line-up's 1 nm and 5 nm grids.
    a = hazard.assess(LINEUP / f"{stem}.toml")
    loaded = load_product(LINEUP / f"{stem}.toml")
    grid, values = loaded.spectrum.wavelength_nm, np.maximum(loaded.spectrum.value, 0.0)
    assert a.contributions  # every line-up product emits in some hazard band
    for symbol, shares in a.contributions.items():
        spec = DEFAULT_LIMIT_SET[symbol]
        weight = None if spec.table is None else load_table(spec.table)
        total = quadrature_weights(grid, spec.band_nm, weight) @ values
        assert shares.step_nm == band_step_nm(spec.band_nm)
        assert sum(shares.share) == pytest.approx(1.0, abs=2e-3)  # three significant digits each
        edges = shares.start_nm + shares.step_nm * np.arange(len(shares.share) + 1)
        direct = [quadrature_weights(grid, (lo, hi), weight) @ values / total for lo, hi in pairwise(edges)]
        assert np.abs(np.array(direct) - np.array(shares.share)).sum() < 0.02, symbol


def test_germicidal_uv_comes_from_the_mercury_line():
    # A low-pressure mercury lamp's actinic UV is its 253.7 nm line (CIE 155:2003, UV air disinfection); the
    # line-up's germicidal lamp models it (examples/lineup/cl-germ-254.csv)
    shares = hazard.assess(LINEUP / "cl-germ-254.toml").contributions["E_S"]
    k = int(np.argmax(shares.share))
    assert shares.start_nm + k * shares.step_nm <= 253.7 < shares.start_nm + (k + 1) * shares.step_nm
    assert shares.share[k] > 0.9


def test_shares_are_deterministic_and_leave_out_empty_hazards():
    # project contract (README "Results are deterministic"): the same input gives the same JSON
    a, b = (hazard.assess(LINEUP / "cl-far-222.toml") for _ in range(2))
    assert a.model_dump_json() == b.model_dump_json()
    # examples/lineup/cl-far-222.toml: a 222 nm lamp emits nothing in E_UVA's 315-400 nm band (value 0): no shares
    assert a.hazards["E_UVA"].value == 0 and "E_UVA" not in a.contributions


def test_flat_spectrum_splits_evenly():
    # arithmetic: a flat spectrum over E_UVA's unweighted 315-400 nm band (IEC 62471:2006 4.3.2) gives each of
    # its 17 bands of 5 nm 1/17 of the value
    grid = np.arange(300.0, 400.5, 0.5)
    start, step, share = spectral_shares(grid, np.ones(grid.size), DEFAULT_LIMIT_SET, ["E_UVA"])["E_UVA"]
    assert (start, step) == (315.0, 5.0)
    assert share == pytest.approx([1 / 17] * 17, rel=1e-2)


def test_infrared_led_has_no_colour_but_a_desk_lamp_does():
    # examples/lineup/cl-ir-940.csv: a 940 nm band whose tail under 780 nm is a few parts in 10^14 of its power,
    # under hazard.method.photometry.LUMINOUS_SHARE_FLOOR (common practice, no published source): no colour
    ir = hazard.assess(LINEUP / "cl-ir-940.toml")
    assert ir.photometry.visible_negligible
    assert ir.photometry.chromaticity_xy is None and ir.photometry.cct_k is None and ir.photometry.duv is None
    # examples/README.md: the desk lamp is a 3000 K warm-white LED; its colour is computed
    desk = hazard.assess(LINEUP / "cl-desk-30.toml")
    assert not desk.photometry.visible_negligible and desk.photometry.cct_k == pytest.approx(3000, abs=150)


@pytest.mark.parametrize(
    ("value", "text"),
    [
        # SI brochure (BIPM, 9th ed., 5.4.3): a power of ten written with a superscript exponent, × as the sign
        (0.000523991, "5.24×10⁻⁴"),
        (2336912.6, "2.34×10⁶"),
        (5.35e-12, "5.35×10⁻¹²"),
        (28000.0, "28000"),  # IEC 62471:2006 Table 6.1 prints the L_R limit as 28000
        (0.001, "0.001"),  # IEC 62471:2006 Table 6.1 prints the E_S Exempt limit as 0.001
        (12.3456, "12.3"),
        (None, "—"),
    ],
)
def test_numbers_have_one_notation(value, text):
    assert format_value(value) == text


@pytest.mark.parametrize(
    ("unit", "text"),
    [
        # SI brochure (BIPM, 9th ed., 5.4.6): a solidus once, the denominator in brackets, powers as superscripts
        ("W/m2", "W/m²"),
        ("W/m2/sr/nm", "W/(m²·sr·nm)"),
        ("uW/cm2/nm", "µW/(cm²·nm)"),
        ("W m-2 nm-1", "W/(m²·nm)"),
        ("cd/m2", "cd/m²"),
        ("counts", "counts"),
    ],
)
def test_units_have_one_notation(unit, text):
    assert unit_text(unit) == text
