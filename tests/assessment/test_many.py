"""assess_many (hazard.assessment.many): the method of assess on a matrix of spectra, bad products reported without
stopping the others."""

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import hazard
from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded

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


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(products(), min_size=5, max_size=15))
def test_assess_many_equals_assess(tmp_path, items):
    # project contract (issue: batch): assess_many and assess share one implementation of the method
    import pandas as pd

    records = pd.DataFrame([{"id": f"P{i}", **fields} for i, (_, fields) in enumerate(items)])
    spectra = np.vstack([values for values, _ in items])
    frame = hazard.assess_many(records, GRID, spectra)
    for i, (values, fields) in enumerate(items):
        path = tmp_path / f"p{i}.csv"
        path.write_text("wavelength_nm,value\n" + "".join(f"{w!r},{v!r}\n" for w, v in zip(GRID, values, strict=True)))
        loaded = hazard.load_product(path, {"id": f"P{i}", **fields})  # hazard.assess without the studies
        single = build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=False)
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


def test_assess_many_reports_bad_products_without_stopping(tmp_path):
    import pandas as pd

    spectra = np.ones((3, GRID.size))
    spectra[1, 10] = np.nan
    records = pd.DataFrame(
        {"id": ["A", "B", "C"], "distance_mm": [200.0, 200.0, -1.0], "source_diameter_mm": [5.0, 5.0, 5.0]}
    )
    frame = hazard.assess_many(records, GRID, spectra)
    assert frame["status"].tolist() == ["ok", "error", "error"]
    assert "not finite" in frame.loc[1, "error"] and "distance_mm" in frame.loc[2, "error"]
