"""Check a saved result before it is rendered: its groups must follow from its own numbers.

A result file can be edited by hand or damaged; rendering it as it stands could print "Exempt" beside values
far above a limit. :func:`check_result` re-derives each hazard's group from the values compared and the limits
applied (top-down, and never safer than its t_max: :mod:`hazard.method.classify`), and the overall group from the
hazards, and refuses a result that disagrees, naming the hazard, what the file says and what its numbers give.
"""

from __future__ import annotations

import math

import numpy as np

from hazard.errors import InputError
from hazard.method.classify import hazard_groups
from hazard.result import Assessment
from hazard.standards import LIMIT_SETS, LimitSet

__all__ = ["check_result"]

_FIX = "re-run 'hazard assess' on the product instead of editing its result"


def _refuse(problem: str, path: str) -> InputError:
    return InputError(problem, _FIX, path)


def _hazard_group(symbol: str, h, limit_set: LimitSet, path: str) -> str | None:
    """The group the hazard's own numbers give."""
    if not (h.assessed and h.limits):
        return None
    try:
        compared = np.array([[h.compared[b] for b in limit_set.boundaries]], dtype=float)
        limits = np.array([[h.limits[b] for b in limit_set.boundaries]], dtype=float)
        bases = tuple(float(h.time_bases_s[b]) for b in limit_set.boundaries)
    except KeyError as missing:
        raise _refuse(f"hazard {symbol} lacks its {missing} boundary", path) from None
    if not (np.all(np.isfinite(compared)) and np.all(np.isfinite(limits))):
        raise _refuse(f"hazard {symbol} holds a value that is not a finite number", path)
    for b, c, lim in zip(limit_set.boundaries, compared[0], limits[0]):
        margin = h.margins.get(b)
        if margin is None or not math.isclose(margin, c / lim, rel_tol=1e-9):
            raise _refuse(f"hazard {symbol}: margin at {b} is {margin!r} but compared/limit is {c / lim:.6g}", path)
    t_max = np.array([np.nan if h.t_max_s is None else h.t_max_s])
    group, _ = hazard_groups(compared, limits, t_max, bases, limit_set.table_rounding)
    return limit_set.groups[int(group[0])]


def check_result(assessment: Assessment, path: str) -> None:
    """Refuse a result whose groups do not follow from its numbers.

    Parameters
    ----------
    assessment : Assessment
        A result loaded from JSON.
    path : str
        Its file, for messages.

    Raises
    ------
    InputError
        Naming the hazard, what the result says and what its numbers give.
    """
    limit_set = LIMIT_SETS.get(assessment.provenance.limit_set)
    if limit_set is None:
        raise InputError(f"limit set {assessment.provenance.limit_set!r} is not one this tool knows",
                         f"use a result made with one of: {', '.join(LIMIT_SETS)}", path)
    derived = {}
    for symbol, h in assessment.hazards.items():
        derived[symbol] = _hazard_group(symbol, h, limit_set, path)
        if derived[symbol] != h.risk_group:
            shown = "the compared values and limits" if h.assessed else "its assessed flag"
            raise _refuse(f"hazard {symbol} says {h.risk_group or 'no group'} but {shown} give "
                          f"{derived[symbol] or 'no group'}", path)
    grouped = [limit_set.groups.index(g) for g in derived.values() if g is not None]
    overall = limit_set.groups[max(grouped)] if grouped else None
    if overall != assessment.risk_group:
        raise _refuse(f"the overall group says {assessment.risk_group or 'not determined'} but its hazards give "
                      f"{overall or 'not determined'}", path)
    not_assessed = sorted(s for s, h in assessment.hazards.items() if not h.assessed)
    if sorted(assessment.not_assessed) != not_assessed or assessment.complete != (not not_assessed):
        raise _refuse("its completeness does not match the hazards it lists as assessed", path)
    what_if = assessment.record.get("at_distance_mm") is not None
    if (assessment.basis == "what-if") != what_if:
        raise _refuse(f"its basis says {assessment.basis} but the record "
                      f"{'asks' if what_if else 'does not ask'} for a what-if distance", path)
