"""Remedies (hazard.studies.remedies): dimming factors that reassess to their boundary, and the UV bands that carry a
hazard."""

import pytest
from conftest import LINEUP, write_spectrum

import hazard


@pytest.mark.parametrize("stem", ["cl-heat-2k", "cl-spot-65", "cl-germ-254", "cl-grow-30"])
def test_dimming_factor_reassesses_to_the_target_boundary(tmp_path, stem):
    # project contract (issue: beyond the label): applying the reported dimming factor and reassessing
    # gives the target group, at its boundary
    a = hazard.assess(LINEUP / f"{stem}.toml")
    product = [r for r in a.remedies.remedies if r.target == "product"]
    assert product, "every line-up product above Exempt has product remedies"
    raw = hazard.load_product(LINEUP / f"{stem}.toml")
    for remedy in product:
        path = write_spectrum(
            tmp_path / f"{stem}-{remedy.group}.csv",
            raw.spectrum.wavelength_nm,
            raw.spectrum.value * remedy.dimming_factor,
        )
        fields = raw.record.model_dump(exclude_none=True, exclude={"id", "spectrum", "unit"})
        again = hazard.assess(path, {**fields, "unit": "W/m2/nm"})
        assert again.risk_group == remedy.group
        deciding = [again.hazards[s] for s in again.deciding_hazards]
        ratio = max(h.margins[remedy.group] for h in deciding if h.margins)
        assert ratio == pytest.approx(1.0, rel=1e-6)


def test_uv_band_contributions_name_the_mercury_line(tmp_path):
    # The germicidal lamp's E_S is dominated by the 253.7 nm mercury line (common practice / NIST ASD line
    # position), i.e. the 250-255 nm band
    a = hazard.assess(LINEUP / "cl-germ-254.toml")
    top = a.remedies.uv_bands["E_S"][0]
    assert top.band_nm == (250.0, 255.0) and top.share > 0.5
    assert sum(b.share for b in a.remedies.uv_bands["E_S"]) == pytest.approx(1.0, abs=0.01)
