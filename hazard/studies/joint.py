"""The distance study and the remedies of one product together: one grid, one search, one last evaluation.

Alone, each study evaluates the product once per round of its own search; together, every bracket of both (each
family's boundary distances, dimming and area factors for each lower group) is narrowed in the same rounds
(:func:`hazard.studies.group_search.search_groups`), and the rows they need besides (the distance grid and the
product as assessed; then the criterion at each boundary distance and the extreme dimming and area) are evaluated
in one call each. Every row is evaluated as it would be alone, so the studies' numbers are the same either way.
"""

from __future__ import annotations

import numpy as np

from hazard.inputs.spectrum import Spectrum
from hazard.method.evaluate import ProductArrays
from hazard.result import DistanceStudy, Remedies
from hazard.standards import LimitSet
from hazard.studies.distances import assemble_distance_study, crossing_jobs, distance_grid
from hazard.studies.group_search import evaluate_variants, search_groups, take_rows
from hazard.studies.remedies import assemble_remedies, check_rows, remedy_factors, remedy_jobs, remedy_targets

__all__ = ["distances_and_remedies"]


def distances_and_remedies(
    arrays: ProductArrays,
    spectrum: Spectrum,
    to_assessment: float,
    limit_set: LimitSet,
    assessed: set[str],
    largest_dimension_mm: float,
) -> tuple[DistanceStudy, Remedies]:
    """:func:`~hazard.studies.distances.distance_study` and :func:`~hazard.studies.remedies.remedies_study` at once.

    Parameters
    ----------
    arrays : ProductArrays
        One product.
    spectrum : Spectrum
        Its spectrum, for the UV bands of the remedies.
    to_assessment : float
        Multiplier from the spectrum's integrals to irradiance at the assessment distance [1].
    assessed : set of str
        Hazards assessed; band contributions are given only for those.
    largest_dimension_mm : float
        For the near-field note (five source sizes) [mm].
    """
    grid = distance_grid()
    ones = np.ones(grid.size + 1)
    first = evaluate_variants(arrays, limit_set, np.append(grid, np.nan), ones, ones)  # the grid, then the product
    on_grid, product = take_rows(first, slice(0, grid.size)), take_rows(first, slice(grid.size, grid.size + 1))
    crossings, crossing = crossing_jobs(on_grid, grid, limit_set)
    targets = remedy_targets(product, limit_set)
    dimming, area = remedy_jobs(targets, limit_set)
    found = search_groups(arrays, limit_set, crossing + dimming + area)
    at_crossings = found[: len(crossing)]
    crossings.update(
        {
            (job.target, job.group): (float(d), "reassessed to the boundary")
            for job, d in zip(crossing, at_crossings, strict=True)
        }
    )
    raw_scale, size_scale = check_rows(dimming, area)
    last = None  # the criterion at each boundary distance found, then the extreme dimming and area of each remedy
    if found.size:
        last = evaluate_variants(
            arrays,
            limit_set,
            np.concatenate([at_crossings, np.full(raw_scale.size, np.nan)]),
            np.concatenate([np.ones(len(crossing)), raw_scale]),
            np.concatenate([np.ones(len(crossing)), size_scale]),
        )
    distances = assemble_distance_study(
        limit_set, largest_dimension_mm, grid, on_grid, crossings, crossing, last if crossing else None
    )
    factors = (
        [] if last is None else remedy_factors(dimming + area, found[len(crossing) :], last, len(crossing), limit_set)
    )
    return distances, assemble_remedies(spectrum, to_assessment, limit_set, assessed, targets, factors)
