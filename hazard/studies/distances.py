"""Hazard distances: where each hazard crosses each group boundary, and t_max against distance.

Every distance is found by re-assessing the product at that distance with the same geometry as the
assessment (inverse-square irradiance, α, Ω_s and field-of-view averaging all follow the distance), so a
boundary distance reassesses to its boundary. Search range: :data:`SEARCH_RANGE_M`.
"""

from __future__ import annotations

import numpy as np

from hazard.method.evaluate import Evaluation, ProductArrays
from hazard.method.families import evaluate_rows, family_groups, family_member, family_t_max
from hazard.result import BoundaryDistance, DistanceStudy
from hazard.standards import LimitSet
from hazard.studies.group_search import GroupJob, search_groups

__all__ = [
    "CURVE_POINTS",
    "SEARCH_RANGE_M",
    "assemble_distance_study",
    "crossing_jobs",
    "distance_grid",
    "distance_study",
]

SEARCH_RANGE_M = (0.01, 100.0)
"""Distances searched, 10 mm to 100 m [m]."""
CURVE_POINTS = 121


def distance_grid() -> np.ndarray:
    """The distances of the curves, and of the first bracket of every boundary [m]."""
    return np.geomspace(*SEARCH_RANGE_M, CURVE_POINTS)


def crossing_jobs(
    ev: Evaluation, grid: np.ndarray, limit_set: LimitSet
) -> tuple[dict[tuple[str, int], tuple[float | None, str]], list[GroupJob]]:
    """What the grid already answers, and the brackets still to narrow, for each family and k = Exempt, RG1, RG2.

    The answer is the distance beyond which the family stays in group ``k`` or lower [m]; the group is the top-down
    one (:mod:`hazard.method.classify`), so a boundary distance is where the product's group really changes,
    whichever boundary's field of view decides it. ``ev`` is the product evaluated at ``grid``.
    """
    result: dict[tuple[str, int], tuple[float | None, str]] = {}
    jobs: list[GroupJob] = []
    for name, members in limit_set.grouped_families:
        g = family_groups(ev, members)
        for k in range(3):
            above = np.flatnonzero(g > k)
            if np.all(g < 0):
                result[(name, k)] = (None, "not assessed")
            elif above.size == 0:
                result[(name, k)] = (None, f"within at every distance from {grid[0] * 1e3:.0f} mm")
            elif above[-1] == grid.size - 1:
                result[(name, k)] = (None, f"not within up to {grid[-1]:.0f} m")
            else:
                low, high = np.exp(np.log(grid[above[-1] : above[-1] + 2]))  # the search's own log scale
                jobs.append(GroupJob(name, k, "distance", float(low), float(high)))
    return result, jobs


def distance_study(arrays: ProductArrays, limit_set: LimitSet, largest_dimension_mm: float) -> DistanceStudy:
    """Boundary distances per hazard family and group, the minimum distance per group, and curves.

    The product alone; :func:`hazard.studies.joint.distances_and_remedies` shares the search with the remedies.

    Parameters
    ----------
    arrays : ProductArrays
        One product.
    largest_dimension_mm : float
        For the near-field note (five source sizes) [mm].
    """
    grid = distance_grid()
    ev = evaluate_rows(arrays, grid.size, limit_set, forced_distance_m=grid)
    crossings, jobs = crossing_jobs(ev, grid, limit_set)
    found = search_groups(arrays, limit_set, jobs)
    crossings.update(
        {(job.target, job.group): (float(d), "reassessed to the boundary") for job, d in zip(jobs, found, strict=True)}
    )
    at = evaluate_rows(arrays, found.size, limit_set, forced_distance_m=found) if found.size else None
    return assemble_distance_study(limit_set, largest_dimension_mm, grid, ev, crossings, jobs, at)


def assemble_distance_study(
    limit_set: LimitSet,
    largest_dimension_mm: float,
    grid: np.ndarray,
    ev: Evaluation,
    crossings: dict[tuple[str, int], tuple[float | None, str]],
    jobs: list[GroupJob],
    at: Evaluation | None,
    first_row: int = 0,
) -> DistanceStudy:
    """The study from the grid's evaluation ``ev``, every crossing, and the criterion at each one found by search.

    ``at`` holds the product evaluated at the crossings of ``jobs`` (in their order, from row ``first_row`` on).
    """
    grouped = limit_set.grouped_families
    families = dict(grouped)
    criteria = {}
    if at is not None:
        criteria = {
            (job.target, job.group): family_member(at, families[job.target], first_row + i)
            for i, job in enumerate(jobs)
        }
    boundaries: list[BoundaryDistance] = []
    minimum: dict[str, float | None] = {}
    for name, _ in grouped:
        for k, group in enumerate(limit_set.boundaries):
            distance_m, how = crossings[(name, k)]
            boundaries.append(
                BoundaryDistance(
                    family=name,
                    group=group,
                    distance_mm=None if distance_m is None else distance_m * 1e3,
                    criterion=criteria.get((name, k)),
                    note=how,
                )
            )
    for group in limit_set.boundaries:
        found = [b for b in boundaries if b.group == group and b.note != "not assessed"]
        if not found:
            continue  # no family assessed: nothing to say about this group (never "at any distance")
        if any(b.note.startswith("not within") for b in found):
            minimum[group] = None
        else:
            minimum[group] = max((b.distance_mm for b in found if b.distance_mm is not None), default=0.0)
    t_max = {
        name: [None if np.isnan(t) else float(t) for t in family_t_max(ev, members)]
        for name, members in limit_set.families
    }
    names = limit_set.groups
    groups = {name: [names[g] if g >= 0 else None for g in family_groups(ev, members)] for name, members in grouped}
    return DistanceStudy(
        distance_mm=[float(d * 1e3) for d in grid],
        group=[names[g] if g >= 0 else None for g in ev.group_index],
        family_group=groups,
        t_max_s=t_max,
        boundaries=boundaries,
        minimum_distance_mm=minimum,
        near_field_below_mm=5 * largest_dimension_mm,
    )
