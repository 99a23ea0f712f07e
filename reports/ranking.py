"""Ranking a batch for the summary: pure functions of the results, no drawing.

A product's *tightest margin* is the ratio value/limit at the boundary that matters (as
:func:`hazard.output.formatting.margin_to_next` defines it) for the deciding hazard closest to the next group up:
the largest such ratio among ``Assessment.deciding_hazards``. Products rank by overall group, highest first;
within a group the borderline ones first (they are what to send to the laboratory); then by that ratio, largest
first (least headroom, or furthest over the RG2 limit); then by id.

A product is *borderline* by its uncertainty study when the result holds one (``Assessment.uncertainty``: the
overall group changes within the stated measurement uncertainty), else by the margin rule of
:func:`is_borderline`.
"""

from __future__ import annotations

from typing import NamedTuple

from hazard.output.formatting import PULSE_LIMIT, hazard_margin
from hazard.result import Assessment

__all__ = ["BORDERLINE_FACTOR", "Tightest", "is_borderline", "rank_assessments", "tightest_margin"]

BORDERLINE_FACTOR = 1.25
"""A value within this factor of a group boundary, on either side, is flagged borderline."""


class Tightest(NamedTuple):
    """The deciding hazard closest to the next boundary."""

    symbol: str
    boundary: str
    ratio: float


def tightest_margin(assessment: Assessment) -> Tightest | None:
    """The deciding hazard with the largest value/limit ratio at its group's upper boundary.

    Parameters
    ----------
    assessment : Assessment

    Returns
    -------
    Tightest or None
        None when no deciding hazard has groups (e.g. nothing could be assessed).
    """
    found = []
    for symbol in assessment.deciding_hazards:
        hazard = assessment.hazards[symbol]
        margin = hazard_margin(hazard)
        if margin is not None:
            found.append(Tightest(symbol, *margin))
    return max(found, key=lambda t: (t.ratio, t.symbol), default=None)


def is_borderline(assessment: Assessment) -> bool:
    """The overall group could change within the measurement uncertainty.

    With an uncertainty study in the result, its verdict decides (``"borderline"``). Without one, the margin
    rule: the tightest hazard lies within :data:`BORDERLINE_FACTOR` of a group boundary, either side. The
    boundaries that can move the hazard's group are its group's upper limit and the limit of the group
    below (for RG3 both are the RG2 limit); the hazard is borderline when its ratio value/limit at either
    lies between 1/1.25 = 0.8 and 1.25.

    Parameters
    ----------
    assessment : Assessment

    Returns
    -------
    bool
    """
    if assessment.uncertainty is not None:
        return assessment.uncertainty.verdict == "borderline"
    tightest = tightest_margin(assessment)
    if tightest is None:
        return False
    if tightest.boundary == PULSE_LIMIT:  # one boundary: the pulse's own exposure limit
        return 1 / BORDERLINE_FACTOR <= tightest.ratio <= BORDERLINE_FACTOR
    hazard = assessment.hazards[tightest.symbol]
    if hazard.risk_group is None:  # excluded by tightest_margin: only hazards with a group have a margin
        raise ValueError(f"{tightest.symbol} has a margin but no risk group")
    limits = list(hazard.margins)  # the boundaries, rising
    rank = assessment.limit_set.groups.index(hazard.risk_group)
    boundaries = {limits[min(rank, len(limits) - 1)], limits[max(rank - 1, 0)]}
    return any(1 / BORDERLINE_FACTOR <= hazard.margins[b] <= BORDERLINE_FACTOR for b in boundaries)


def rank_assessments(assessments: list[Assessment]) -> list[Assessment]:
    """The batch in summary order.

    Highest group first, borderline products first within a group, then least headroom to the next boundary.

    Parameters
    ----------
    assessments : list of Assessment

    Returns
    -------
    list of Assessment
        A new list; products whose group could not be determined first (nothing is known of them), products
        without a tightest margin last within their group, ties by id.
    """

    def key(assessment: Assessment) -> tuple[int, bool, float, str]:
        tightest = tightest_margin(assessment)
        groups, group = assessment.limit_set.groups, assessment.classification_group
        rank = len(groups) if group is None else groups.index(group)
        return (-rank, not is_borderline(assessment), -(tightest.ratio if tightest else -1.0), assessment.id)

    return sorted(assessments, key=key)
