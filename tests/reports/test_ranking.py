"""The order of the batch summary (hazard.reports.ranking): groups, then headroom; borderline products first."""

from itertools import pairwise

import pytest
from conftest import with_tightest

from hazard.reports import rank_assessments
from hazard.reports.ranking import is_borderline, tightest_margin


def test_rank_orders_groups_then_headroom(lineup):
    # IEC 62471:2006 6.1: Exempt < RG1 < RG2 < RG3; project contract (issue "Beyond the label"): within a group
    # borderline products first (RG3-NEAR at 1.2x its RG2 limit, RG2-TIGHT at 0.9: within the 1.25 factor of
    # reports/ranking.py); then (reports/ranking.py) the deciding hazard with the largest value/limit at its
    # group's upper boundary first
    base = lineup["cl-cure-365"]
    products = [
        with_tightest(base, "E-LOW", "Exempt", {"Exempt": 0.1, "RG1": 0.03, "RG2": 0.01}),
        with_tightest(base, "RG2-TIGHT", "RG2", {"Exempt": 90.0, "RG1": 27.0, "RG2": 0.9}),
        with_tightest(base, "RG3-FAR", "RG3", {"Exempt": 500.0, "RG1": 150.0, "RG2": 50.0}),
        with_tightest(base, "RG1-LOOSE", "RG1", {"Exempt": 2.0, "RG1": 0.6, "RG2": 0.2}),
        with_tightest(base, "RG2-LOOSE", "RG2", {"Exempt": 10.0, "RG1": 3.0, "RG2": 0.1}),
        with_tightest(base, "RG3-NEAR", "RG3", {"Exempt": 12.0, "RG1": 4.0, "RG2": 1.2}),
        with_tightest(base, "E-HIGH", "Exempt", {"Exempt": 0.7, "RG1": 0.2, "RG2": 0.07}),
    ]
    assert [a.id for a in rank_assessments(products)] == [
        "RG3-NEAR",
        "RG3-FAR",
        "RG2-TIGHT",
        "RG2-LOOSE",
        "RG1-LOOSE",
        "E-HIGH",
        "E-LOW",
    ]


def test_rank_of_the_lineup(lineup):
    # examples/README.md groups; within a group by the deciding hazard's value/limit as each result reports
    # it (germicidal E_S far over RG2 before the curing lamp's E_UVA and the heater's E_IR, both about 2x)
    ranked = rank_assessments(list(lineup.values()))
    assert [a.risk_group for a in ranked] == sorted(
        (a.risk_group for a in ranked), key=["RG3", "RG2", "RG1", "Exempt"].index
    )
    assert not any(is_borderline(a) for a in ranked)  # by the values in each result (see the summary test)
    ratios = [(a.risk_group, tightest_margin(a).ratio) for a in ranked]
    assert all(r1 >= r2 for (g1, r1), (g2, r2) in pairwise(ratios) if g1 == g2)
    assert ranked[0].id == "CL-GERM-254"


@pytest.mark.parametrize(
    ("group", "margins", "expected"),
    [
        ("RG1", {"Exempt": 3.0, "RG1": 0.8, "RG2": 0.1}, True),  # 0.8 of the RG1 limit: at the edge
        ("RG1", {"Exempt": 2.9, "RG1": 0.79, "RG2": 0.1}, False),  # just beyond the factor
        ("RG1", {"Exempt": 1.25, "RG1": 0.3, "RG2": 0.01}, True),  # just over the Exempt limit, the other side
        ("RG1", {"Exempt": 1.26, "RG1": 0.3, "RG2": 0.01}, False),
        ("RG3", {"Exempt": 40.0, "RG1": 12.0, "RG2": 1.2}, True),  # RG3 within 1.25x of the RG2 limit
        ("RG3", {"Exempt": 50.0, "RG1": 15.0, "RG2": 1.3}, False),
        ("Exempt", {"Exempt": 0.95, "RG1": 0.3, "RG2": 0.1}, True),
        ("Exempt", {"Exempt": 0.5, "RG1": 0.15, "RG2": 0.05}, False),
    ],
)
def test_borderline_within_a_factor_of_a_boundary(lineup, group, margins, expected):
    # project contract (summary brief): borderline when the tightest hazard's value/limit lies in 0.8-1.25
    # for the limit above or below it
    assert is_borderline(with_tightest(lineup["cl-cure-365"], "X", group, margins)) is expected
