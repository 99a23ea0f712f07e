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
_BISECTIONS = 48


def _crossing(arrays: ProductArrays, limit_set: LimitSet, members: tuple[str, ...], boundary: int,
              grid: np.ndarray, margins: np.ndarray) -> tuple[float | None, str]:
    """Distance beyond which the family stays within ``boundary`` [m], by bracketing on the grid and bisection."""
    above = np.flatnonzero(margins[:, boundary] > 1)
    if np.all(np.isnan(margins[:, boundary])):
        return None, "not assessed"
    if above.size == 0:
        return None, f"within at every distance from {grid[0] * 1e3:.0f} mm"
    last = above[-1]
    if last == grid.size - 1:
        return None, f"not within up to {grid[-1]:.0f} m"
    lo, hi = np.log(grid[last]), np.log(grid[last + 1])
    for _ in range(_BISECTIONS):
        mid = (lo + hi) / 2
        ev = evaluate_rows(arrays, 1, limit_set, forced_distance_m=np.array([np.exp(mid)]))
        if family_margins(ev, members)[0, boundary] > 1:
            lo = mid
        else:
            hi = mid
    return float(np.exp(hi)), "reassessed to the boundary by bisection"


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
    boundaries: list[BoundaryDistance] = []
    minimum: dict[str, float | None] = {}
    for name, members in limit_set.families:
        margins = family_margins(ev, members)
        for k, group in enumerate(GROUPS[:3]):
            distance_m, how = _crossing(arrays, limit_set, members, k, grid, margins)
            criterion = None
            if distance_m is not None:
                at = evaluate_rows(arrays, 1, limit_set, forced_distance_m=np.array([distance_m]))
                criterion = next((s for s in members if at.hazards[s].applicable[0]), None)
            boundaries.append(BoundaryDistance(family=name, group=group, distance_mm=None if distance_m is None
                                               else distance_m * 1e3, criterion=criterion, note=how))
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
