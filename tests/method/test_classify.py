"""Risk groups (hazard.method.classify): the top-down reading of compared values and limits, its agreement with
t_max, and groups that never improve as the spectrum grows (hypothesis), with the documented exceptions.

Spectra are assessed in memory (conftest.assess_spectrum: everything but the reading of a file) so that hypothesis
can try many sources.
"""

import math

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians, log_uniform, rank, triangle_line
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from hazard.standards import GROUPS

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""


SETTINGS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


ROUNDING = 0.03
"""IEC 62471:2006 Table 6.1 prints its limits to two digits (method §1, §3): a group and t_max agree within it."""


LINES = st.lists(
    st.tuples(st.floats(250.0, 2500.0), st.floats(2.0, 200.0), st.floats(-6.0, 2.0).map(lambda x: 10.0**x)),
    min_size=1,
    max_size=4,
)
"""Gaussian lines (centre nm, width nm, peak W/(m²·nm)) over eight decades."""

SHAPES = st.one_of(
    st.builds(lambda d: {"source_diameter_mm": d}, st.floats(-1.3, 2.0).map(lambda x: 10.0**x)),
    st.builds(
        lambda w, h: {"source_width_mm": w, "source_height_mm": h},
        st.floats(-1.3, 2.0).map(lambda x: 10.0**x),
        st.floats(-1.3, 2.0).map(lambda x: 10.0**x),
    ),
)
"""Discs and rectangles of 0.05-100 mm (the issue's range)."""

GRID_FINE_UV = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])

FAST = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])

GRID_1_NM = np.arange(200.0, 3000.5, 1.0)
"""200–3000 nm at 1 nm: spans every hazard band (method §1), so coverage never decides."""

WIDE_LINES = st.lists(
    st.tuples(st.floats(200.0, 3000.0), st.floats(1.0, 300.0), log_uniform(1e-6, 10.0)), min_size=1, max_size=4
)
"""Gaussian lines anywhere in 200–3000 nm, narrow (1 nm) to broad, over seven decades [nm, nm, W m⁻² nm⁻¹]."""


def _assess(values, **fields):
    """An irradiance on GRID assessed in memory at 200 mm, nothing emitted outside it (no studies)."""
    return assess_spectrum(GRID, values, **{"no_emission_outside": True, "source_diameter_mm": None, **fields})


def _top_down(compared, limits):
    """method §3, written out here: RG3 when the RG2 comparison fails, else RG2 when the RG1 one fails, else RG1
    when the Exempt one fails, else Exempt."""
    for boundary, above in (("RG2", "RG3"), ("RG1", "RG2"), ("Exempt", "RG1")):
        if compared[boundary] > limits[boundary]:
            return above
    return "Exempt"


def _group_from_t_max(t_max_s, bases, tolerance):
    """The group a t_max implies by the time bases of Table 6.1 (method §1: "a hazard is Exempt exactly when its
    t_max is null or at least the Exempt time base, RG1 when at least the RG1 base…")."""
    t = math.inf if t_max_s is None else t_max_s
    for boundary, above in (("RG2", "RG3"), ("RG1", "RG2"), ("Exempt", "RG1")):
        if t < bases[boundary] * (1 - tolerance):
            return above
    return "Exempt"


@SETTINGS
@given(
    lines=LINES,
    shape=SHAPES,
    distance_mm=st.sampled_from([50.0, 200.0, 700.0, 2000.0]),
    peak_to_mean=st.sampled_from([1.0, 1.0, 3.0]),
)
def test_groups_agree_with_their_values_limits_and_t_max(lines, shape, distance_mm, peak_to_mean):
    a = _assess(gaussians(GRID, lines), distance_mm=distance_mm, peak_to_mean_radiance=peak_to_mean, **shape)
    grouped = []
    for symbol, h in a.hazards.items():
        if h.risk_group is None:
            continue
        grouped.append(h.risk_group)
        # (a) the group is the top-down reading of its own compared values and limits (method §3); only a t_max
        # that reaches the limit before the group's time base may raise it, and the note then says so
        reading = _top_down(h.compared, h.limits)
        assert rank(h.risk_group) >= rank(reading), symbol
        if h.risk_group != reading:
            assert "raised" in h.note, (symbol, h.note)
        # (b) group and t_max agree with the time bases (IEC 62471:2006 Table 6.1; 3 % for its rounding): t_max
        # never implies a worse group; a worse group than t_max implies comes only from the table's rounding
        # (the value is within 3 % of the boundary below) or from L_IR, whose limit holds beyond 10 s, the time
        # base of its RG2 boundary (IEC 62471:2006 4.3.6)
        implied = _group_from_t_max(h.t_max_s, h.time_bases_s, ROUNDING)
        assert rank(implied) <= rank(h.risk_group), (symbol, h.t_max_s, h.risk_group)
        if rank(h.risk_group) > rank(_group_from_t_max(h.t_max_s, h.time_bases_s, -ROUNDING)):
            below = GROUPS[rank(h.risk_group) - 1]
            within_rounding = h.margins[below] <= 1 + ROUNDING
            weak_stimulus_step = symbol == "L_IR" and h.t_max_s is not None and h.t_max_s <= 10.0
            assert within_rounding or weak_stimulus_step, (symbol, h.t_max_s, h.risk_group, h.margins)
    # (c) the overall group is the highest (method §3), null when none was determined
    assert a.risk_group == (GROUPS[max(map(rank, grouped))] if grouped else None)


@SETTINGS
@given(lines=LINES, shape=SHAPES, scale=st.floats(1.0, 1e3))
def test_scaling_a_spectrum_up_never_lowers_a_group(lines, shape, scale):
    # (d) every compared value grows with the spectrum (non-negative weights, method §2); the limits depend on
    # the geometry only. The weak-visual-stimulus switch (10 cd/m2, IEC 62471:2006 4.3.6) is a documented exception
    # (test_group_can_improve_when_the_source_stops_being_a_weak_visual_stimulus), so the luminance class is held
    # fixed.
    values = gaussians(GRID, lines)
    base, grown = _assess(values, **shape), _assess(values * scale, **shape)
    assume(base.geometry.weak_visual_stimulus == grown.geometry.weak_visual_stimulus)
    for symbol, h in base.hazards.items():
        assert rank(grown.hazards[symbol].risk_group) >= rank(h.risk_group), symbol
    assert rank(grown.risk_group) >= rank(base.risk_group)


@pytest.mark.parametrize(
    ("irradiance", "group"), [(0.999e-3, "Exempt"), (1.001e-3, "RG1"), (0.0299, "RG2"), (0.0301, "RG3")]
)
def test_group_boundaries_at_or_below(irradiance, group):
    # IEC 62471:2006 §6.1: a value at or below a group's limit is in that group; above RG2 is RG3
    a = assess_spectrum(
        GRID_FINE_UV, triangle_line(GRID_FINE_UV, 270.0, irradiance / 0.05, 0.05), no_emission_outside=True
    )
    assert a.hazards["E_S"].risk_group == group and a.risk_group == group


# --- the group never improves when the spectrum grows --------------------------------------------------------
def _assert_never_improves(base, grown):
    """Each hazard's group and t_max, and the overall group, are no better for the grown spectrum."""
    assert base.hazards.keys() == grown.hazards.keys()
    for symbol, b in base.hazards.items():
        g = grown.hazards[symbol]
        assert g.value >= b.value * (1 - 1e-12), symbol  # non-negative weights (method §2)
        if b.risk_group is not None:
            assert rank(g.risk_group) >= rank(b.risk_group), symbol
        # t_max falls as the value rises; None means the limit is never reached (method §1)
        if b.t_max_s is not None:
            assert g.t_max_s is not None and g.t_max_s <= b.t_max_s * (1 + 1e-12), symbol
    assert base.risk_group is not None and rank(grown.risk_group) >= rank(base.risk_group)


@FAST
@given(
    first=WIDE_LINES,
    added=WIDE_LINES,
    diameter_mm=st.floats(0.5, 30.0),
    distance_mm=st.sampled_from([100.0, 200.0, 500.0]),
)
def test_group_never_improves_when_the_spectrum_grows(first, added, diameter_mm, distance_mm):
    """Non-GLS lamps only: a GLS lamp is assessed where it gives 500 lx, so more light moves it further away
    and can lower its group (method §4; see the GLS tests in tests/method/test_evaluate.py)."""
    a = gaussians(GRID_1_NM, first)
    b = gaussians(GRID_1_NM, added)
    fields = {"source_diameter_mm": diameter_mm, "distance_mm": distance_mm, "lamp_type": "other"}
    base = assess_spectrum(GRID_1_NM, a, **fields)
    grown = assess_spectrum(GRID_1_NM, a + b, **fields)
    # Crossing 10 cd/m2 swaps L_IR for L_R (IEC 62471:2006 §4.3.6): a documented exception, tested below.
    assume(base.geometry.weak_visual_stimulus == grown.geometry.weak_visual_stimulus)
    assert grown.assessment_distance_mm == base.assessment_distance_mm == 200.0  # method §4: 200 mm
    _assert_never_improves(base, grown)


def test_group_can_improve_when_the_source_stops_being_a_weak_visual_stimulus():
    """The one exception for non-GLS lamps, and why the property above holds the luminance class fixed.

    An IR source below 10 cd/m2 is judged by L_IR against 6000/α for every group, so exceeding it is RG3; a
    trace of visible light lifts the luminance over 10 cd/m2 and L_R is judged instead, against 28000/α and
    71000/α (IEC 62471:2006 Table 6.1; method §1, §3). The group then falls although the spectrum only grew.
    """
    ir = gaussians(GRID_1_NM, [(1000.0, 50.0, 20.0)])
    trace = gaussians(GRID_1_NM, [(555.0, 20.0, 1e-4)])
    fields = {"source_diameter_mm": 10.0}  # α = 10/200 = 0.05 rad
    base = assess_spectrum(GRID_1_NM, ir, **fields)
    grown = assess_spectrum(GRID_1_NM, ir + trace, **fields)
    assert base.geometry.weak_visual_stimulus and not grown.geometry.weak_visual_stimulus
    l_ir, l_r = base.hazards["L_IR"], grown.hazards["L_R"]
    assert l_ir.limits["RG2"] == pytest.approx(6000 / 0.05)  # Table 6.1: 6000/α
    assert l_r.limits["Exempt"] == pytest.approx(28000 / 0.05)  # Table 6.1: 28000/α
    assert 6000 / 0.05 < l_ir.value < 28000 / 0.05  # chosen so: above the L_IR limit, below L_R's Exempt
    assert l_r.value == pytest.approx(l_ir.value, rel=1e-3)  # the visible trace adds almost nothing
    assert l_ir.risk_group == "RG3" and l_r.risk_group == "Exempt"
    assert base.risk_group == "RG3" and grown.risk_group is not None and rank(grown.risk_group) < rank(base.risk_group)
