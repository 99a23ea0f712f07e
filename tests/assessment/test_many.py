"""assess_many (hazard.assessment.many): the method of assess on a matrix of spectra, bad products reported without
stopping the others."""

import numpy as np
import pandas.testing as pd_testing
import pytest
from conftest import assess_spectrum
from hypothesis import given, settings
from hypothesis import strategies as st

import hazard
from hazard.inputs.spectrum import VALUE_RULES

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


# --- arrays that cannot be assessed ------------------------------------------------------------------------------
def _records(n):
    import pandas as pd

    return pd.DataFrame({"id": list("ABCD")[:n], "distance_mm": [200.0] * n, "source_diameter_mm": [5.0] * n})


@pytest.mark.parametrize(
    ("n_records", "grid", "spectra", "message"),
    [
        pytest.param(
            1, GRID, np.ones(GRID.size), r"spectra must be \(n, 501\) .*got \(501,\)", id="one spectrum as a 1-D array"
        ),
        pytest.param(2, GRID, np.ones((3, GRID.size)), r"2 records but 3 spectra", id="more spectra than records"),
        pytest.param(
            3, GRID[None, :], np.ones((3, GRID.size)), r"spectra must be \(n, 501\) for a grid of 501", id="2-D grid"
        ),
        pytest.param(
            3, GRID[:-1], np.ones((3, GRID.size)), r"spectra must be \(n, 500\) .*got \(3, 501\)", id="grid too short"
        ),
        pytest.param(3, GRID[::-1], np.ones((3, GRID.size)), r"strictly increasing", id="descending grid"),
        pytest.param(3, np.where(GRID == 500, np.nan, GRID), np.ones((3, GRID.size)), r"strictly", id="NaN in grid"),
    ],
)
def test_arrays_of_the_wrong_shape_are_refused(n_records, grid, spectra, message):
    # hazard/assessment/many.py: the common grid is 1-D, strictly increasing, one column per wavelength, one row per
    # record; anything else is the caller's mistake (ValueError), not a product's
    with pytest.raises(ValueError, match=message):
        hazard.assess_many(_records(n_records), grid, spectra)


def test_nan_and_infinite_samples_make_their_product_an_error_and_no_other():
    # method §5: values must be finite; in a batch one bad product never stops the others, whose results are those
    # they have alone
    spectra = np.vstack([np.exp(-0.5 * ((GRID - 300 - 100 * i) / 40) ** 2) for i in range(4)])
    spectra[1, 10], spectra[2, 20], spectra[3, 30] = np.nan, np.inf, -np.inf
    with np.errstate(invalid="ignore"):  # ±inf × a zero weight is NaN in the refused rows' integrals
        frame = hazard.assess_many(_records(4), GRID, spectra)
    assert frame["status"].tolist() == ["ok", "error", "error", "error"]
    for i in (1, 2, 3):
        assert frame.loc[i, "error"] == f"{'ABCD'[i]}: {VALUE_RULES[0]}; fix: correct or remove this spectrum"
    alone = hazard.assess_many(_records(1), GRID, spectra[:1])
    assert frame["error"].isna()[0] and alone["error"].isna()[0]  # no error (NaN or None, by pandas' choice)
    # with failed rows beside it, a column may hold objects where alone it holds bools: the values are compared
    pd_testing.assert_frame_equal(frame.iloc[:1].drop(columns="error"), alone.drop(columns="error"), check_dtype=False)
