"""Ranking a batch for the summary: pure functions of the results, no drawing.

A product's *tightest margin* is the ratio value/limit at the boundary that matters (as
:func:`hazard.output.formatting.margin_to_next` defines it) for the deciding hazard closest to the next group up:
the largest such ratio among ``Assessment.deciding_hazards``. Products rank by overall group, highest first;
within a group the borderline ones first (they are what to send to the laboratory); then by that ratio, largest
first (least headroom, or furthest over the RG2 limit); then by id.

A product is *borderline* by its uncertainty study when the result holds one (``Assessment.uncertainty``: the
overall group changes within the stated measurement uncertainty), else by the margin rule of
:func:`is_borderline`.

Both are figures of the result's own distance. A what-if result ranks by its classification (the group at the
standard's distance, :attr:`Assessment.classification_group`), whose margins it does not hold: its own margin and
borderline verdict belong to the what-if distance and do not move it within its group (:func:`ranks_by_margin`).
"""

from __future__ import annotations

from typing import NamedTuple

from hazard.output.formatting import PULSE_LIMIT, tightest_deciding
from hazard.result import Assessment

__all__ = ["BORDERLINE_FACTOR", "Tightest", "is_borderline", "rank_assessments", "ranks_by_margin", "tightest_margin"]

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
    found = tightest_deciding(assessment)
    return None if found is None else Tightest(*found)


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


def ranks_by_margin(assessment: Assessment) -> bool:
    """The result's margins are those of its classification (a result at the standard's distance).

    A what-if's margins and borderline verdict are at the what-if distance: a summary shows them as the what-if's
    and neither ranks nor counts the product by them.
    """
    return assessment.basis == "standard"


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
        without a tightest margin at their classification's distance (what-if results among them) last within their
        group, ties by id.
    """

    def key(assessment: Assessment) -> tuple[int, bool, float, str]:
        own = ranks_by_margin(assessment)
        tightest = tightest_margin(assessment) if own else None
        groups, group = assessment.limit_set.groups, assessment.classification_group
        rank = len(groups) if group is None else groups.index(group)
        borderline = own and is_borderline(assessment)
        return (-rank, not borderline, -(tightest.ratio if tightest else -1.0), assessment.id)

    return sorted(assessments, key=key)
