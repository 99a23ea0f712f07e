"""assess_many (hazard.assessment.many): the method of assess on a matrix of spectra, bad products reported without
stopping the others."""

import numpy as np
import pytest
from conftest import assess_spectrum
from hypothesis import given, settings
from hypothesis import strategies as st

import hazard

# --- assess_many against assess -------------------------------------------------------------------------
GRID = np.arange(250.0, 1500.5, 2.5)


@st.composite
def products(draw):
    """A random smooth spectrum with lines, and random geometry."""
    bands = draw(
        st.lists(st.tuples(st.floats(260, 1450), st.floats(5, 200), st.floats(1e-4, 5)), min_size=1, max_size=4)
    )
    values = sum(a * np.exp(-0.5 * ((GRID - c) / w) ** 2) for c, w, a in bands)
    fields = {
        "distance_mm": draw(st.floats(100, 2000)),
        "source_diameter_mm": draw(st.floats(0.3, 80)),
        "lamp_type": draw(st.sampled_from(["gls", "other"])),
        "no_emission_outside": draw(st.booleans()),
    }
    return values, fields


# 15 examples of 5-15 products each compare 75-225 products (30 examples took over 5 s; the property is unchanged)
@settings(max_examples=15, deadline=None)
@given(st.lists(products(), min_size=5, max_size=15))
def test_assess_many_equals_assess(items):
    # project contract (issue: batch): assess_many and assess share one implementation of the method
    import pandas as pd

    records = pd.DataFrame([{"id": f"P{i}", **fields} for i, (_, fields) in enumerate(items)])
    spectra = np.vstack([values for values, _ in items])
    frame = hazard.assess_many(records, GRID, spectra)
    for i, (values, fields) in enumerate(items):
        single = assess_spectrum(GRID, values, product_id=f"P{i}", **fields)  # hazard.assess without the studies
        row = frame.iloc[i]
        assert row["risk_group"] == single.risk_group and row["complete"] == single.complete
        missing = pd.isna
        assert row["assessment_distance_mm"] == pytest.approx(single.assessment_distance_mm, rel=1e-9)
        assert row["illuminance_lx"] == pytest.approx(single.illuminance_lx, rel=1e-9, abs=1e-300)
        for symbol, h in single.hazards.items():
            group = row[f"{symbol}_group"]
            assert missing(group) if h.risk_group is None else group == h.risk_group
            assert row[f"{symbol}_assessed"] == h.assessed
            for got, want in ((row[f"{symbol}_value"], h.value), (row[f"{symbol}_t_max_s"], h.t_max_s)):
                if want is None:
                    assert missing(got)
                else:
                    assert got == pytest.approx(want, rel=1e-9, abs=1e-300)
        if single.photometry.cct_k is None:
            assert missing(row["cct_k"])
        else:
            assert row["cct_k"] == pytest.approx(single.photometry.cct_k, rel=1e-9)


def test_assess_many_reports_bad_products_without_stopping():
    import pandas as pd

    spectra = np.ones((3, GRID.size))
    spectra[1, 10] = np.nan
    records = pd.DataFrame(
        {"id": ["A", "B", "C"], "distance_mm": [200.0, 200.0, -1.0], "source_diameter_mm": [5.0, 5.0, 5.0]}
    )
    frame = hazard.assess_many(records, GRID, spectra)
    assert frame["status"].tolist() == ["ok", "error", "error"]
    assert "not finite" in frame.loc[1, "error"] and "distance_mm" in frame.loc[2, "error"]
