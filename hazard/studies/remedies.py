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
from hazard.method.evaluate import ProductArrays
from hazard.method.families import evaluate_rows, family_groups
from hazard.method.search import log_search
from hazard.method.weighting import quadrature_matrix
from hazard.result import BandContribution, Remedies, Remedy
from hazard.standards import LimitSet
from hazard.weighting_tables import load_table

__all__ = ["remedies_study"]

_LEAST_DIMMING = 1e-30  # dimming searched down to this factor [1]
_MAX_AREA_FACTOR = 1e4


def _groups_of(ev, target: str, limit_set: LimitSet) -> np.ndarray:
    if target == "product":
        return ev.group_index
    return family_groups(ev, dict(limit_set.families)[target])


def _radiance_families(limit_set: LimitSet) -> set[str]:
    """Families with a radiance member: the ones a diffuser (a larger emitting area) can lower."""
    return {h.family for h in limit_set.hazards if h.kind == "radiance"}


def _reaches(arrays, limit_set, jobs: list[tuple[str, int]], variant: str):
    """A :func:`hazard.method.search.log_search` test: whether each job's target is in its group or lower at factor x.

    ``variant`` is ``raw_scale`` (dimming) or ``size_scale`` (a diffuser).
    """

    def test(x: np.ndarray, index: np.ndarray) -> np.ndarray:
        ev = evaluate_rows(arrays, x.size, limit_set, **{variant: x.ravel()})
        targets = np.repeat(np.asarray(index), x.shape[1])
        ok = np.empty(x.size, dtype=bool)
        for target in {jobs[j][0] for j in index}:
            rows = np.flatnonzero([jobs[j][0] == target for j in targets])
            groups = _groups_of(ev, target, limit_set)[rows]
            ok[rows] = groups <= np.array([jobs[j][1] for j in targets[rows]])
        return ok.reshape(x.shape)

    return test


def _largest_dimming(arrays, limit_set, jobs: list[tuple[str, int]]) -> list[float | None]:
    """For each (target, group index): the largest factor f ≤ 1 with the target's group ≤ that index.

    To a relative 1e-12; None where even f = 1e-30 does not reach it. Dimming never raises a group, so the test is
    monotonic (searched in 1/f, which grows towards the answer).
    """
    reaches = _reaches(arrays, limit_set, jobs, "raw_scale")
    ok_at_least = reaches(np.full((len(jobs), 1), _LEAST_DIMMING), np.arange(len(jobs)))[:, 0]
    _, inverse = log_search(
        lambda y, index: reaches(1 / y, index), np.ones(len(jobs)), np.full(len(jobs), 1 / _LEAST_DIMMING)
    )
    return [float(1 / inverse[i]) if ok_at_least[i] else None for i in range(len(jobs))]


def _smallest_area(arrays, limit_set, jobs: list[tuple[str, int]]) -> list[float | None]:
    """For each (radiance family, group index): the least area factor s² ≥ 1 reaching that group.

    None beyond :data:`_MAX_AREA_FACTOR`.
    """
    reaches = _reaches(arrays, limit_set, jobs, "size_scale")
    largest = np.sqrt(_MAX_AREA_FACTOR)
    ok_at_largest = reaches(np.full((len(jobs), 1), largest), np.arange(len(jobs)))[:, 0]
    _, scale = log_search(reaches, np.ones(len(jobs)), np.full(len(jobs), largest))
    return [float(scale[i] ** 2) if ok_at_largest[i] else None for i in range(len(jobs))]


def _band_shares(
    spectrum: Spectrum, to_assessment: float, limit_set: LimitSet, assessed: set[str]
) -> dict[str, list[BandContribution]]:
    """Each assessed hazard's value by bands of a fixed width (its stepped :class:`~hazard.standards.BandShare`).

    Largest first, bands of at least 0.1 % of the total.
    """
    out = {}
    for hazard in limit_set.hazards:
        for share in hazard.shares:
            if share.step_nm is None or hazard.symbol not in assessed:
                continue
            edges = np.arange(share.band_nm[0], share.band_nm[1] + share.step_nm / 2, share.step_nm)
            bands = [(float(a), float(b)) for a, b in pairwise(edges)]
            weight = None if hazard.table is None else load_table(hazard.table)
            values = spectrum.value @ quadrature_matrix(spectrum.wavelength_nm, [(band, weight) for band in bands])
            values = values * to_assessment
            total = values.sum()
            if not total > 0:
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
            notes.append(f"enlarging the area up to ×{_MAX_AREA_FACTOR:g} does not reach this group")
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
    """Remedies for one product (one row of ``arrays``).

    Parameters
    ----------
    spectrum : Spectrum
        The product's spectrum, for the UV bands.
    to_assessment : float
        Multiplier from the spectrum's integrals to irradiance at the assessment distance [1].
    assessed : set of str
        Hazards assessed; band contributions are given only for those.
    """
    ev = evaluate_rows(arrays, 1, limit_set)
    jobs = []
    for name, members in limit_set.grouped_families:
        current = family_groups(ev, members)[0]
        jobs += [(name, g) for g in range(max(current, 0))]
    overall = ev.group_index[0]
    jobs += [("product", g) for g in range(max(overall, 0))]
    dimming = _largest_dimming(arrays, limit_set, jobs) if jobs else []
    radiance = _radiance_families(limit_set)
    area_jobs = [(t, g) for t, g in jobs if t in radiance]
    areas = dict(zip(area_jobs, _smallest_area(arrays, limit_set, area_jobs), strict=True)) if area_jobs else {}
    remedies = [
        Remedy(
            target=t,
            group=limit_set.groups[g],
            dimming_factor=f,
            area_factor=areas.get((t, g)),
            note=_why_none(t, f, areas.get((t, g)), radiance),
        )
        for (t, g), f in zip(jobs, dimming, strict=True)
    ]
    return Remedies(
        remedies=remedies,
        uv_bands=_band_shares(spectrum, to_assessment, limit_set, assessed),
        note="Dimming factors are the largest emission multipliers (or neutral filter transmissions) "
        "that reach the group; area factors enlarge the emitting area at the same power (a "
        "diffuser). Each was found by re-assessing the product, as the standard's distances "
        "apply.",
    )
