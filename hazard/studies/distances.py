"""Hazard distances: where each hazard crosses each group boundary, and t_max against distance.

Every distance is found by re-assessing the product at that distance with the same geometry as the
assessment (inverse-square irradiance, α, Ω_s and field-of-view averaging all follow the distance), so a
boundary distance reassesses to its boundary. Search range: :data:`SEARCH_RANGE_M`.
"""

from __future__ import annotations

import numpy as np

from hazard.method.evaluate import ProductArrays
from hazard.method.families import evaluate_rows, family_groups, family_member, family_t_max
from hazard.method.search import log_search
from hazard.result import BoundaryDistance, DistanceStudy
from hazard.standards import LimitSet

__all__ = ["CURVE_POINTS", "SEARCH_RANGE_M", "distance_study"]

SEARCH_RANGE_M = (0.01, 100.0)
"""Distances searched, 10 mm to 100 m [m]."""
CURVE_POINTS = 121


def _crossings(
    arrays: ProductArrays, limit_set: LimitSet, grid: np.ndarray, groups: dict[str, np.ndarray]
) -> dict[tuple[str, int], tuple[float | None, str]]:
    """Distance beyond which each family stays in group ``k`` or lower, for k = Exempt, RG1, RG2 [m].

    Bracketed on the grid, then all brackets narrowed together by :func:`hazard.method.search.log_search`. The group is
    the top-down one (:mod:`hazard.method.classify`), so a boundary distance is where the product's group really
    changes, whichever boundary's field of view decides it.
    """
    families = dict(limit_set.families)
    result: dict[tuple[str, int], tuple[float | None, str]] = {}
    open_jobs: list[tuple[str, int, float, float]] = []
    for name, g in groups.items():
        for k in range(3):
            above = np.flatnonzero(g > k)
            if np.all(g < 0):
                result[(name, k)] = (None, "not assessed")
            elif above.size == 0:
                result[(name, k)] = (None, f"within at every distance from {grid[0] * 1e3:.0f} mm")
            elif above[-1] == grid.size - 1:
                result[(name, k)] = (None, f"not within up to {grid[-1]:.0f} m")
            else:
                open_jobs.append((name, k, np.log(grid[above[-1]]), np.log(grid[above[-1] + 1])))
    if not open_jobs:
        return result

    def within(distance_m: np.ndarray, index: np.ndarray) -> np.ndarray:
        ev = evaluate_rows(arrays, distance_m.size, limit_set, forced_distance_m=distance_m.ravel())
        job = np.repeat(index, distance_m.shape[1])
        ok = np.empty(distance_m.size, dtype=bool)
        for name in {open_jobs[j][0] for j in index}:
            rows = np.flatnonzero([open_jobs[j][0] == name for j in job])
            ok[rows] = family_groups(ev, families[name])[rows] <= np.array([open_jobs[j][1] for j in job[rows]])
        return ok.reshape(distance_m.shape)

    _, found = log_search(within, np.exp([j[2] for j in open_jobs]), np.exp([j[3] for j in open_jobs]))
    for i, (name, k, _, _) in enumerate(open_jobs):
        result[(name, k)] = (float(found[i]), "reassessed to the boundary")
    return result


def distance_study(arrays: ProductArrays, limit_set: LimitSet, largest_dimension_mm: float) -> DistanceStudy:
    """Boundary distances per hazard family and group, the minimum distance per group, and curves.

    Parameters
    ----------
    arrays : ProductArrays
        One product.
    largest_dimension_mm : float
        For the near-field note (five source sizes) [mm].
    """
    grid = np.geomspace(*SEARCH_RANGE_M, CURVE_POINTS)
    ev = evaluate_rows(arrays, grid.size, limit_set, forced_distance_m=grid)
    grouped = limit_set.grouped_families
    crossings = _crossings(arrays, limit_set, grid, {name: family_groups(ev, members) for name, members in grouped})
    found_at = [(key, d) for key, (d, _) in crossings.items() if d is not None]
    criteria = {}
    if found_at:
        at = evaluate_rows(arrays, len(found_at), limit_set, forced_distance_m=np.array([d for _, d in found_at]))
        families = dict(grouped)
        criteria = {key: family_member(at, families[key[0]], i) for i, (key, _) in enumerate(found_at)}
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
