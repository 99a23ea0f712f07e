"""The batch summary's rows (hazard.output.summary_table): every row reads at one distance per figure, so a what-if can
never pass for a classification."""

import numpy as np
import pytest
from conftest import assess_spectrum, rank, triangle_line

from hazard.output.summary_table import HAZARD_COLUMNS_AT, hazard_headers, summary_columns, summary_row
from hazard.standards import DEFAULT_LIMIT_SET

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band at 0.5 nm."""
UV_LINE = triangle_line(GRID, 365.0, 2.0)
"""A 365 nm line of 2 W/m² (peak 2 W m⁻² nm⁻¹ × half-width 1 nm) measured at 200 mm (invented test data)."""
FIELDS = {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True, "uncertainty_pct": 20.0}


@pytest.fixture(scope="module")
def rows():
    """The same lamp twice: at the standard's 200 mm, and as a what-if at 30 mm."""
    standard = assess_spectrum(GRID, UV_LINE, product_id="S", **FIELDS)
    what_if = assess_spectrum(GRID, UV_LINE, product_id="W", at_distance_mm=30.0, **FIELDS)
    return {a.id: summary_row(a.id, a.id, a, None) for a in (standard, what_if)}


def test_the_distance_of_the_hazard_columns_comes_right_before_them():
    columns = summary_columns()
    first_hazard = hazard_headers(DEFAULT_LIMIT_SET.hazards[0].symbol, DEFAULT_LIMIT_SET.hazards[0].unit)[0]
    assert columns.index(HAZARD_COLUMNS_AT) == columns.index(first_hazard) - 1
    # the pulse fraction and the uncertainty are per-hazard figures too: they follow the hazard columns
    last_hazard = hazard_headers(DEFAULT_LIMIT_SET.hazards[-1].symbol, DEFAULT_LIMIT_SET.hazards[-1].unit)[-1]
    tail = columns[columns.index(last_hazard) + 1 :]
    assert tail[:4] == ["emission", "pulse_max_fraction [1]", "uncertainty", "group_range"]


def test_a_what_if_row_keeps_the_classification_and_labels_its_own_figures(rows):
    standard, what_if = rows["S"], rows["W"]
    # IEC 62471:2006 Table 6.1: E_UVA Exempt below 10 W/m², RG1 below 33, RG2 below 100. At 200 mm E_UVA = 2 W/m²
    # (Exempt); at 30 mm the inverse-square law gives 2 × (200/30)² = 88.9 W/m² (RG2).
    assert standard["E_UVA value [W m-2]"] == pytest.approx(2.0) and standard["E_UVA group"] == "Exempt"
    assert what_if["E_UVA value [W m-2]"] == pytest.approx(88.9) and what_if["E_UVA group"] == "RG2"
    # the classification columns hold the standard's group at the standard's distance, in both rows
    assert standard["risk_group"] == what_if["risk_group"] == "Exempt"
    assert standard["assessment_distance [mm]"] == what_if["assessment_distance [mm]"] == 200.0
    # the hazard columns say at which distance they were computed
    assert standard[HAZARD_COLUMNS_AT] == 200.0
    assert what_if[HAZARD_COLUMNS_AT] == what_if["what_if_distance [mm]"] == 30.0
    assert what_if["what_if_risk_group"] == "RG2" and what_if["basis"] == "what-if"
    # each text figure of the what-if names it; the standard row's do not
    for column in ("deciding_hazards", "margin", "uncertainty", "group_range"):
        assert str(what_if[column]).startswith("what-if at 30 mm: "), column
        assert "what-if" not in str(standard[column]), column
    assert what_if["margin"] == "what-if at 30 mm: E_UVA: 2.7× RG1 limit; 88.9 % of RG2 limit"  # 88.9/33, 88.9/100
    assert "RG2" in what_if["group_range"]  # the what-if's own group lies within its uncertainty range


def test_the_hazard_groups_of_every_row_agree_with_the_group_at_their_distance(rows):
    # IEC 62471:2006 §6.1: the overall group is the highest hazard group; a row's hazard groups belong to the group at
    # hazard_columns_at: the classification when that is the standard's distance, else the what-if's
    for row in rows.values():
        at_standard = row[HAZARD_COLUMNS_AT] == row["assessment_distance [mm]"]
        group = row["risk_group"] if at_standard else row["what_if_risk_group"]
        hazard_groups = [row[hazard_headers(h.symbol, h.unit)[1]] for h in DEFAULT_LIMIT_SET.hazards]
        assert max(rank(g) for g in hazard_groups if g in DEFAULT_LIMIT_SET.groups) == rank(group), row["id"]


def test_a_lower_bound_reads_as_one_in_its_row():
    # The 365 nm line of 2 W/m² measured only from 300 nm: E_S (200-400 nm) is not assessed, yet its measured part,
    # S_UV(365) = 1.1e-4 (IEC 62471:2006 Table 4.1) × 2 W/m² ≈ 2.4e-4 W/m², is under the Exempt limit (0.001): no
    # bound. At 20 W/m² it is 2.4e-3, over it: E_S is at least RG1, and so is the lamp (a lower bound).
    measured = GRID >= 300.0
    for peak, bound in ((2.0, None), (20.0, "RG1")):
        a = assess_spectrum(
            GRID[measured],
            triangle_line(GRID, 365.0, peak)[measured],
            product_id="P",
            distance_mm=200.0,
            source_diameter_mm=5.0,
        )
        row = summary_row(a.id, a.id, a, None)
        assert a.hazards["E_S"].lower_bound_group == bound
        assert row["E_S group"] == ("not assessed" if bound is None else f"not assessed, at least {bound}")
        assert row["group_note"] == "lower bound" and row["complete"] is False
        assert rank(row["risk_group"]) >= rank(bound or "Exempt")
