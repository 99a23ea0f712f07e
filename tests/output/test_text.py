"""The terminal view (hazard.output.text): a what-if reads as a what-if on every line that carries its figures, and
numbers are written in the project's notation."""

import re

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians, triangle_line

from hazard.output.text import render_batch_table, render_text

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band at 0.5 nm."""
VISIBLE_NM = np.arange(380.0, 781.0, 1.0)
UV_LINE = triangle_line(GRID, 365.0, 2.0)
"""A 365 nm line of 2 W/m² measured at 200 mm (invented test data)."""
FIELDS = {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True}


@pytest.fixture(scope="module")
def pair():
    """The UV lamp at the standard's 200 mm and as a what-if at 30 mm, both with a ±20 % uncertainty study."""
    standard = assess_spectrum(GRID, UV_LINE, product_id="S", uncertainty_pct=20.0, studies=True, **FIELDS)
    what_if = assess_spectrum(
        GRID, UV_LINE, product_id="W", at_distance_mm=30.0, uncertainty_pct=20.0, studies=True, **FIELDS
    )
    return standard, what_if


def test_a_what_if_never_says_overall_risk_group(pair):
    standard, what_if = pair
    # IEC 62471:2006 Table 6.1: E_UVA = 2 W/m² at 200 mm is Exempt (below 10 W/m²); at 30 mm the inverse-square law
    # gives 2 × (200/30)² = 88.9 W/m², RG2 (33 to 100 W/m²): the what-if's group, which is no classification
    lines = render_text(what_if).splitlines()
    assert lines[1].startswith("WHAT-IF at 30 mm, not a classification: the standard's distance (200 mm) gives Exempt")
    assert lines[2].startswith("What-if group at 30 mm: RG2 (not a classification)")
    assert not any(line.startswith("Overall risk group") for line in lines)
    # its studies are at its own distance and say so
    assert any(line.startswith("Uncertainty (what-if at 30 mm): ") for line in lines)
    assert any(line.startswith("What it would take (what-if at 30 mm): ") for line in lines)
    plain = render_text(standard).splitlines()
    assert plain[1].startswith("Overall risk group: Exempt") and not any("what-if" in line for line in plain)


def test_the_batch_screen_shows_the_classification_and_flags_the_what_if(pair):
    standard, what_if = pair
    table = render_batch_table(["S", "W"], {"S": standard, "W": what_if}, {})
    row = next(line for line in table.splitlines() if line.startswith("W "))
    assert row.split()[1] == "Exempt"  # the classification, as in the row of S
    assert "WHAT-IF at 30 mm gives RG2 (not a classification)" in row
    # ±20 % around 88.9 W/m² reaches 100 W/m² (RG3 from there): borderline, but at the what-if distance only
    assert "BORDERLINE RG2-RG3 at the what-if distance" in row
    # no margin or deciding hazard of the what-if stands unlabelled beside the standard's group
    assert "E_UVA" not in row


@pytest.mark.parametrize(
    ("spectrum", "fields", "expected"),
    [
        # A deep-red indicator (720 nm): B(λ) is 10⁻³ up to 700 nm and not defined beyond (IEC 62471:2006 Table 4.2),
        # so only the line's short-wave tail is weighted: K_B,v is a few 10⁻⁵ mW/lm (computed 4.4×10⁻⁵)
        (
            (VISIBLE_NM, gaussians(VISIBLE_NM, [(720.0, 5.0, 1.0)])),
            {"source_diameter_mm": 0.1},
            r"K_B,v = [\d.]+×10⁻⁵ mW/lm",
        ),
        # a what-if far beyond any lamp's reach (10⁸ mm): its distance written with a power of ten
        ((GRID, UV_LINE), {"at_distance_mm": 1e8}, r"WHAT-IF at 1×10⁸ mm"),
    ],
)
def test_text_output_has_no_exponent_form(spectrum, fields, expected):
    # project notation (README "Every output writes numbers one way"): powers of ten with a superscript exponent
    a = assess_spectrum(*spectrum, studies=True, **{**FIELDS, **fields})
    text = render_text(a)
    assert re.search(expected, text)
    assert re.search(r"\d[eE][+-]?\d", text) is None, re.search(r".{40}\d[eE][+-]?\d.{20}", text)
