"""What it would take: dimming, a larger emitting area, and what to filter.

The dimming factor (or neutral filter transmission) and, for radiance hazards, the larger emitting area that bring each
hazard family and the product into each lower group; and which 5 nm bands dominate the UV quantities, so the engineer
knows what to filter.

Dimming and enlarging are found by :func:`hazard.method.search.log_search` on full re-assessments (a GLS lamp's 500 lx
distance moves with its output, so dimming is not simply 1/margin), to a relative precision of 1e-12.
"""

from __future__ import annotations

from itertools import pairwise

import numpy as np

from hazard.inputs.spectrum import Spectrum
from hazard.method.contributions import NEGLIGIBLE_SHARE_OF_EXEMPT
from hazard.method.evaluate import Evaluation, ProductArrays
from hazard.method.families import evaluate_rows, family_groups
from hazard.method.weighting import GridCache, quadrature_matrix
from hazard.output.formatting import format_stated
from hazard.result import BandContribution, Remedies, Remedy
from hazard.standards import LimitSet
from hazard.studies.group_search import PRODUCT, GroupJob, evaluate_variants, groups_of, search_groups
from hazard.weighting_tables import load_table

__all__ = ["assemble_remedies", "check_rows", "remedies_study", "remedy_factors", "remedy_jobs", "remedy_targets"]

_BAND_MATRICES = GridCache(32)
_LEAST_DIMMING = 1e-30  # dimming searched down to this factor [1]
_MAX_AREA_FACTOR = 1e4


def _radiance_families(limit_set: LimitSet) -> set[str]:
    """Families with a radiance member: the ones a diffuser (a larger emitting area) can lower."""
    return {h.family for h in limit_set.hazards if h.kind == "radiance"}


def remedy_targets(ev: Evaluation, limit_set: LimitSet) -> list[tuple[str, int]]:
    """(target, group index) for every lower group of every family and of the product; ``ev`` is the product (1 row)."""
    jobs = []
    for name, members in limit_set.grouped_families:
        current = family_groups(ev, members)[0]
        jobs += [(name, g) for g in range(max(current, 0))]
    return jobs + [(PRODUCT, g) for g in range(max(ev.group_index[0], 0))]


def remedy_jobs(targets: list[tuple[str, int]], limit_set: LimitSet) -> tuple[list[GroupJob], list[GroupJob]]:
    """The dimming brackets (in 1/f, which grows towards the answer) and the diffuser brackets of ``targets``.

    Dimming never raises a group, nor does a larger area at the same power, so both tests are monotonic.
    """
    radiance = _radiance_families(limit_set)
    dimming = [GroupJob(t, g, "dimming", 1.0, 1 / _LEAST_DIMMING) for t, g in targets]
    area = [GroupJob(t, g, "area", 1.0, float(np.sqrt(_MAX_AREA_FACTOR))) for t, g in targets if t in radiance]
    return dimming, area


def check_rows(dimming: list[GroupJob], area: list[GroupJob]) -> tuple[np.ndarray, np.ndarray]:
    """(emission factor, size factor) of the rows that tell whether each job can be reached at all.

    The least dimming :data:`_LEAST_DIMMING` for each dimming job, then the largest area for each area job [1].
    """
    raw_scale = np.concatenate([np.full(len(dimming), _LEAST_DIMMING), np.ones(len(area))])
    size_scale = np.concatenate([np.ones(len(dimming)), np.full(len(area), np.sqrt(_MAX_AREA_FACTOR))])
    return raw_scale, size_scale


def remedy_factors(
    jobs: list[GroupJob], found: np.ndarray, checks: Evaluation, first_row: int, limit_set: LimitSet
) -> list[float | None]:
    """Each job's factor: the largest dimming f = 1/x, or the least area factor x² [1].

    None where the check row (``checks`` from ``first_row`` on, in the jobs' order) shows that the target is not
    reached even at the extreme.
    """
    out: list[float | None] = []
    for i, (job, x) in enumerate(zip(jobs, found, strict=True)):
        reachable = groups_of(checks, job.target, limit_set)[first_row + i] <= job.group
        out.append((float(1 / x) if job.variant == "dimming" else float(x**2)) if reachable else None)
    return out


def _band_shares(
    spectrum: Spectrum, to_assessment: float, limit_set: LimitSet, assessed: set[str]
) -> dict[str, list[BandContribution]]:
    """Each assessed hazard's value by bands of a fixed width (its stepped :class:`~hazard.standards.BandShare`).

    Largest first, bands of at least 0.1 % of the total. A hazard whose value is under
    :data:`~hazard.method.contributions.NEGLIGIBLE_SHARE_OF_EXEMPT` of its Exempt limit (a spectrum's noise
    floor, a line's far tail) gets none: where such a value comes from says nothing about the product.
    """
    out = {}
    for hazard in limit_set.hazards:
        for share in hazard.shares:
            if share.step_nm is None or hazard.symbol not in assessed:
                continue
            edges = np.arange(share.band_nm[0], share.band_nm[1] + share.step_nm / 2, share.step_nm)
            bands = [(float(a), float(b)) for a, b in pairwise(edges)]
            weight = None if hazard.table is None else load_table(hazard.table)

            def build(grid: np.ndarray, bands=bands, weight=weight) -> np.ndarray:
                return quadrature_matrix(grid, [(band, weight) for band in bands])

            matrix = _BAND_MATRICES.get(spectrum.wavelength_nm, (hazard.table, tuple(bands)), build)
            values = spectrum.value @ matrix
            values = values * to_assessment
            total = values.sum()
            floor = 0.0 if hazard.limits is None or hazard.limits_over_alpha else hazard.limits[0]
            if not total > floor * NEGLIGIBLE_SHARE_OF_EXEMPT:
                continue
            order = np.argsort(-values)
            out[hazard.symbol] = [
                BandContribution(band_nm=bands[k], value=float(values[k]), share=float(values[k] / total))
                for k in order
                if values[k] / total >= 1e-3
            ]
    return out


def _why_none(target: str, dimming: float | None, area: float | None, radiance: set[str]) -> str:
    notes = []
    if dimming is None:
        notes.append("dimming alone does not reach this group")
    if area is None:
        if target in radiance:
            notes.append(f"enlarging the area up to ×{format_stated(_MAX_AREA_FACTOR)} does not reach this group")
        else:
            notes.append(
                f"a diffuser changes radiance only; see the "
                f"{' and '.join(name.replace(' ', '-') for name in sorted(radiance))} rows"
                if target == "product"
                else "no diffuser factor: not a radiance hazard"
            )
    return "; ".join(notes)


def remedies_study(
    arrays: ProductArrays, spectrum: Spectrum, to_assessment: float, limit_set: LimitSet, assessed: set[str]
) -> Remedies:
    """Remedies for one product (one row of ``arrays``), searched on their own.

    :func:`hazard.studies.joint.distances_and_remedies` shares the search with the distance study.

    Parameters
    ----------
    spectrum : Spectrum
        The product's spectrum, for the UV bands.
    to_assessment : float
        Multiplier from the spectrum's integrals to irradiance at the assessment distance [1].
    assessed : set of str
        Hazards assessed; band contributions are given only for those.
    """
    targets = remedy_targets(evaluate_rows(arrays, 1, limit_set), limit_set)
    dimming, area = remedy_jobs(targets, limit_set)
    found = search_groups(arrays, limit_set, dimming + area)
    raw_scale, size_scale = check_rows(dimming, area)
    factors: list[float | None] = []
    if found.size:
        checks = evaluate_variants(arrays, limit_set, np.full(raw_scale.size, np.nan), raw_scale, size_scale)
        factors = remedy_factors(dimming + area, found, checks, 0, limit_set)
    return assemble_remedies(spectrum, to_assessment, limit_set, assessed, targets, factors)


def assemble_remedies(
    spectrum: Spectrum,
    to_assessment: float,
    limit_set: LimitSet,
    assessed: set[str],
    targets: list[tuple[str, int]],
    factors: list[float | None],
) -> Remedies:
    """The remedies from each target's dimming factor and then each radiance target's area factor (``factors``)."""
    radiance = _radiance_families(limit_set)
    dimming = factors[: len(targets)]
    areas = dict(zip([(t, g) for t, g in targets if t in radiance], factors[len(targets) :], strict=True))
    remedies = [
        Remedy(
            target=t,
            group=limit_set.groups[g],
            dimming_factor=f,
            area_factor=areas.get((t, g)),
            note=_why_none(t, f, areas.get((t, g)), radiance),
        )
        for (t, g), f in zip(targets, dimming, strict=True)
    ]
    return Remedies(
        remedies=remedies,
        uv_bands=_band_shares(spectrum, to_assessment, limit_set, assessed),
        note="Dimming factors are the largest emission multipliers (or neutral filter transmissions) "
        "that reach the group; area factors enlarge the emitting area at the same power (a "
        "diffuser). Each was found by re-assessing the product, as the standard's distances "
        "apply.",
    )
