"""Remedies (hazard.studies.remedies): dimming factors that reassess to their boundary, and the UV bands that carry a
hazard."""

import pytest
from conftest import lineup_product

from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-spot-65", "cl-germ-254", "cl-grow-30"])
def test_dimming_factor_reassesses_to_the_target_boundary(lineup, stem):
    # project contract (issue: beyond the label): applying the reported dimming factor and reassessing
    # gives the target group, at its boundary
    product = [r for r in lineup[stem].remedies.remedies if r.target == "product"]
    assert product, "every line-up product above Exempt has product remedies"
    for remedy in product:
        dimmed = lineup_product(stem, remedy.dimming_factor)
        again = build_assessment(dimmed, evaluate_loaded([dimmed]), 0, studies=False)
        assert again.risk_group == remedy.group
        deciding = [again.hazards[s] for s in again.deciding_hazards]
        ratio = max(h.margins[remedy.group] for h in deciding if h.margins)
        assert ratio == pytest.approx(1.0, rel=1e-6)


def test_uv_band_contributions_name_the_mercury_line(lineup):
    # The germicidal lamp's E_S is dominated by the 253.7 nm mercury line (common practice / NIST ASD line
    # position), i.e. the 250-255 nm band
    a = lineup["cl-germ-254"]
    top = a.remedies.uv_bands["E_S"][0]
    assert top.band_nm == (250.0, 255.0) and top.share > 0.5
    assert sum(b.share for b in a.remedies.uv_bands["E_S"]) == pytest.approx(1.0, abs=0.01)
