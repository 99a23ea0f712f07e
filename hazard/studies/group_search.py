"""Every group boundary of a product's studies narrowed in one search: distances, dimming and enlarging together.

The distance study asks where each hazard family crosses each group boundary, the remedies where dimming or a larger
emitting area bring a family (or the product) into a lower group. Each is a bracket narrowed by
:func:`hazard.method.search.log_search`; here all of a product's brackets share its rounds, so each round is one
evaluation of the product's variants (a distance, a dimming factor or an area factor per row) instead of one per study.
Each bracket is narrowed exactly as it would be alone (the method is applied row by row), so the answers do not depend
on which other brackets share the rounds.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np

from hazard.method.evaluate import Evaluation, ProductArrays
from hazard.method.families import evaluate_rows, family_groups
from hazard.method.search import log_search
from hazard.standards import Hazard, LimitSet

__all__ = ["PRODUCT", "GroupJob", "evaluate_variants", "groups_of", "search_groups", "take_rows"]

PRODUCT = "product"
"""The target that stands for the product's overall group (not a family)."""


@dataclass(frozen=True)
class GroupJob:
    """One bracket: where ``target`` comes within group index ``group`` as one variant parameter changes.

    Attributes
    ----------
    target : str
        A hazard family's name, or :data:`PRODUCT`.
    group : int
        The group index to reach or go below (0 Exempt, 1 RG1, 2 RG2).
    variant : str
        ``"distance"`` (x is the distance [m]), ``"dimming"`` (x is 1/f for an emission multiplier f [1]) or ``"area"``
        (x is the linear size factor at the same power [1]).
    low, high : float
        The bracket: the test is taken as false at ``low`` and true at ``high`` [unit of x].
    """

    target: str
    group: int
    variant: Literal["distance", "dimming", "area"]
    low: float
    high: float


def groups_of(ev: Evaluation, target: str, limit_set: LimitSet) -> np.ndarray:
    """(n,) group index of ``target`` (a family, or :data:`PRODUCT`) at each row; −1 where none."""
    if target == PRODUCT:
        return ev.group_index
    return family_groups(ev, dict(limit_set.families)[target])


def evaluate_variants(
    arrays: ProductArrays,
    limit_set: LimitSet,
    forced_distance_m: np.ndarray,
    raw_scale: np.ndarray,
    size_scale: np.ndarray,
) -> Evaluation:
    """Rows of variants of the one product in ``arrays``: each row with its distance, emission and size factors.

    A NaN distance keeps the product's own (its what-if distance, or the standard's rule). A factor of 1 changes
    nothing, to the last bit, so a row is evaluated exactly as :func:`hazard.method.families.evaluate_rows` would
    evaluate it with only its own variant given.
    """
    own = np.nan if arrays.forced_distance_m is None else float(arrays.forced_distance_m[0])
    forced = np.where(np.isnan(forced_distance_m), own, forced_distance_m)
    return evaluate_rows(
        arrays, forced.size, limit_set, forced_distance_m=forced, raw_scale=raw_scale, size_scale=size_scale
    )


def search_groups(arrays: ProductArrays, limit_set: LimitSet, jobs: list[GroupJob]) -> np.ndarray:
    """For each job, the end of its final bracket where the target is within its group [unit of x].

    Narrowed to a relative 1e-12 by :func:`hazard.method.search.log_search`, one evaluation per round for all jobs.
    """
    if not jobs:
        return np.empty(0)
    variant = np.array([job.variant for job in jobs])
    group = np.array([job.group for job in jobs])
    targets = np.array([job.target for job in jobs])

    def within(x: np.ndarray, index: np.ndarray) -> np.ndarray:
        job = np.repeat(index, x.shape[1])
        flat = x.ravel()
        kind = variant[job]
        ev = evaluate_variants(
            arrays,
            limit_set,
            forced_distance_m=np.where(kind == "distance", flat, np.nan),
            raw_scale=np.where(kind == "dimming", 1 / flat, 1.0),
            size_scale=np.where(kind == "area", flat, 1.0),
        )
        reached = np.empty(flat.size, dtype=bool)
        for target in np.unique(targets[index]):
            rows = np.flatnonzero(targets[job] == target)
            reached[rows] = groups_of(ev, str(target), limit_set)[rows] <= group[job[rows]]
        return reached.reshape(x.shape)

    _, above = log_search(within, np.array([job.low for job in jobs]), np.array([job.high for job in jobs]))
    return above


def take_rows(ev: Evaluation, rows: slice) -> Evaluation:
    """The rows ``rows`` of an evaluation, as if only they had been evaluated (the method works row by row)."""

    def take(value: Any) -> Any:
        if isinstance(value, np.ndarray):
            return value[rows]
        if isinstance(value, dict):
            return {key: take(item) for key, item in value.items()}
        if dataclasses.is_dataclass(value) and not isinstance(value, (type, Hazard)):
            changes = {f.name: take(getattr(value, f.name)) for f in dataclasses.fields(value) if f.init}
            return dataclasses.replace(value, **changes)
        return value

    return take(ev)
