"""Hazard distances: where each hazard crosses each group boundary, and t_max against distance.

Every distance is found by re-assessing the product at that distance with the same geometry as the
assessment (inverse-square irradiance, α, Ω_s and field-of-view averaging all follow the distance), so a
boundary distance reassesses to its boundary. Search range: :data:`SEARCH_RANGE_M`.
"""

from __future__ import annotations

import numpy as np

from hazard.evaluate import ProductArrays
from hazard.families import evaluate_rows, family_groups, family_margins, family_t_max, overall_groups
from hazard.hazards import GROUPS, LimitSet
from hazard.result import BoundaryDistance, DistanceStudy

__all__ = ["distance_study", "SEARCH_RANGE_M", "CURVE_POINTS"]

SEARCH_RANGE_M = (0.01, 100.0)
"""Distances searched, 10 mm to 100 m [m]."""
CURVE_POINTS = 121
_BISECTIONS = 32  # the bracket spans one grid step (8 %): 32 halvings leave < 1e-10


def _crossings(arrays: ProductArrays, limit_set: LimitSet, grid: np.ndarray, margins: dict[str, np.ndarray]
               ) -> dict[tuple[str, int], tuple[float | None, str]]:
    """Distance beyond which each family stays within each boundary [m]: bracketed on the grid, then all
    brackets bisected together (one evaluation of every open bracket per step)."""
    families = dict(limit_set.families)
    result, open_jobs = {}, []
    for name, m in margins.items():
        for k in range(3):
            above = np.flatnonzero(m[:, k] > 1)
            if np.all(np.isnan(m[:, k])):
                result[(name, k)] = (None, "not assessed")
            elif above.size == 0:
                result[(name, k)] = (None, f"within at every distance from {grid[0] * 1e3:.0f} mm")
            elif above[-1] == grid.size - 1:
                result[(name, k)] = (None, f"not within up to {grid[-1]:.0f} m")
            else:
                open_jobs.append((name, k, np.log(grid[above[-1]]), np.log(grid[above[-1] + 1])))
    if not open_jobs:
        return result
    lo = np.array([j[2] for j in open_jobs])
    hi = np.array([j[3] for j in open_jobs])
    for _ in range(_BISECTIONS):
        mid = (lo + hi) / 2
        ev = evaluate_rows(arrays, mid.size, limit_set, forced_distance_m=np.exp(mid))
        beyond = np.array([family_margins(ev, families[name])[i, k] > 1 for i, (name, k, _, _) in enumerate(open_jobs)])
        lo, hi = np.where(beyond, mid, lo), np.where(beyond, hi, mid)
    for i, (name, k, _, _) in enumerate(open_jobs):
        result[(name, k)] = (float(np.exp(hi[i])), "reassessed to the boundary by bisection")
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
    crossings = _crossings(arrays, limit_set, grid, {name: family_margins(ev, members)
                                                     for name, members in limit_set.families})
    found_at = [(key, d) for key, (d, _) in crossings.items() if d is not None]
    criteria = {}
    if found_at:
        at = evaluate_rows(arrays, len(found_at), limit_set, forced_distance_m=np.array([d for _, d in found_at]))
        families = dict(limit_set.families)
        criteria = {key: next((s for s in families[key[0]] if at.hazards[s].applicable[i]), None)
                    for i, (key, _) in enumerate(found_at)}
    boundaries: list[BoundaryDistance] = []
    minimum: dict[str, float | None] = {}
    for name, _ in limit_set.families:
        for k, group in enumerate(GROUPS[:3]):
            distance_m, how = crossings[(name, k)]
            boundaries.append(BoundaryDistance(family=name, group=group, distance_mm=None if distance_m is None
                                               else distance_m * 1e3, criterion=criteria.get((name, k)), note=how))
    for k, group in enumerate(GROUPS[:3]):
        found = [b for b in boundaries if b.group == group and b.note != "not assessed"]
        if any(b.note.startswith("not within") for b in found):
            minimum[group] = None
        else:
            minimum[group] = max((b.distance_mm for b in found if b.distance_mm is not None), default=0.0)
    t_max = {name: [None if np.isnan(t) else float(t) for t in family_t_max(ev, members)]
             for name, members in limit_set.families}
    t_max["E_H"] = [None if np.isnan(t) else float(t) for t in ev.hazards["E_H"].t_max_s]
    groups = {name: [GROUPS[g] if g >= 0 else None for g in family_groups(ev, members)]
              for name, members in limit_set.families}
    return DistanceStudy(distance_mm=[float(d * 1e3) for d in grid], group=[GROUPS[g] if g >= 0 else None for g in
                                                                           overall_groups(ev, limit_set)],
                         family_group=groups, t_max_s=t_max, boundaries=boundaries, minimum_distance_mm=minimum,
                         near_field_below_mm=5 * largest_dimension_mm)
