"""The distance one metadata line states (hazard.inputs.stated_distance): read exactly, bounded on any text."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hazard.inputs.stated_distance import MAX_STATEMENT_CHARS, read_distance, split_item


@pytest.mark.parametrize(
    ("name", "value", "stated_mm"),
    [
        ("distance", "0,5 m", 500.0),  # a decimal comma; 1 m = 1000 mm (SI prefix)
        ("Distance", "500mm", 500.0),  # no space before the unit
        ("distance", "20 inches", 508.0),  # 1 in = 25.4 mm exactly (international inch, 1959; NIST SP 811 App. B)
        ("Distance", "~ 50 cm (to the front glass)", 500.0),  # 1 cm = 10 mm (SI prefix); words after the unit
        ("distance_m", 0.5, 500.0),  # a JSON number, the unit closing the name
        ("Distance (cm)", "50 cm", 500.0),  # the same unit twice
        ("Distance (to lamp)", "500 mm", 500.0),  # brackets in the name that are no unit
    ],
)
def test_distances_are_read_exactly(name, value, stated_mm):
    assert read_distance(name, value).distance_mm == pytest.approx(stated_mm, rel=1e-15)


def test_a_length_beyond_the_float_range_is_a_problem():
    # 1e308 m is 1e311 mm, beyond the largest double (IEEE 754 binary64, about 1.8e308)
    assert read_distance("distance_m", 1e308).problem == "'1e+308' is not a positive, finite length"


def test_only_the_first_characters_are_examined():
    # a unit beyond the examined characters is not found: the line is reported, not searched to its end
    assert read_distance("distance", "5" + " " * MAX_STATEMENT_CHARS + "mm").problem == "it gives no unit"
    assert read_distance("distance", "9" * 10**6 + " mm").problem == "it gives no unit"


NUMBERISH = st.from_regex(r"[~ ]?[+-]?[0-9]{0,4}[.,]?[0-9]{0,4}", fullmatch=True)
UNITISH = st.one_of(
    st.sampled_from(["mm", "MM", "cm", "m", "in", "inch", "furlongs", "", ")", "m2"]), st.text(max_size=9)
)


@settings(max_examples=300, derandomize=True, database=None, deadline=None)
@given(
    name=st.builds(lambda a, b: f"distance{a} {b}", st.text(max_size=200), UNITISH),
    value=st.one_of(
        st.text(max_size=300),
        st.builds(
            lambda n, s, u, t: n + s + u + t, NUMBERISH, st.sampled_from(["", " ", ";", "\t"]), UNITISH, st.text()
        ),
        st.floats(),
    ),
)
def test_any_text_gives_a_distance_a_problem_or_nothing(name, value):
    # whatever a file holds: a positive finite distance, or one printable line saying why it cannot be read
    stated = read_distance(name, value)
    if stated is None:
        return
    assert (stated.distance_mm is None) != (stated.problem is None)
    if stated.distance_mm is not None:
        assert math.isfinite(stated.distance_mm) and stated.distance_mm > 0
    else:
        assert stated.problem.isprintable() and len(stated.problem) < 120


def test_an_item_is_split_at_its_first_separator():
    assert split_item("Measured at 12:00; distance = 500 mm") == ("Measured at 12", "00; distance = 500 mm")
    assert split_item("Distance = 500 mm (12:00)") == ("Distance", "500 mm (12:00)")
    assert split_item(": 500 mm") is None
