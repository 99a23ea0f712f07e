"""What it would take: the dimming factor (or neutral filter transmission) and, for radiance hazards, the
larger emitting area that bring each hazard family and the product into each lower group; and which 5 nm
bands dominate the UV quantities, so the engineer knows what to filter.

Dimming and enlarging are found by bisection on full re-assessments (a GLS lamp's 500 lx distance moves
with its output, so dimming is not simply 1/margin), to a relative precision far below 0.1 %.
"""

from __future__ import annotations

import numpy as np

from hazard.evaluate import ProductArrays
from hazard.families import evaluate_rows, family_groups, overall_groups
from hazard.hazards import GROUPS, LimitSet
from hazard.result import BandContribution, Remedies, Remedy
from hazard.spectrum import Spectrum
from hazard.weighting import quadrature_matrix
from weighting_tables import load_table

__all__ = ["remedies_study", "UV_BAND_STEP_NM"]

UV_BAND_STEP_NM = 5.0
_BISECTIONS = 44  # over 30 decades of dimming or 2 of size: better than 1e-12 relative
_RADIANCE_FAMILIES = ("blue light", "retinal thermal")
_MAX_AREA_FACTOR = 1e4


def _groups_of(ev, target: str, limit_set: LimitSet) -> np.ndarray:
    if target == "product":
        return overall_groups(ev, limit_set)
    return family_groups(ev, dict(limit_set.families)[target])


def _largest_dimming(arrays, limit_set, jobs: list[tuple[str, int]]) -> list[float | None]:
    """For each (target, group index): the largest factor f ≤ 1 with the target's group ≤ that index."""
    lo = np.full(len(jobs), -30.0)  # log10 f
    hi = np.zeros(len(jobs))
    for _ in range(_BISECTIONS):
        mid = (lo + hi) / 2
        ev = evaluate_rows(arrays, len(jobs), limit_set, raw_scale=10 ** mid)
        ok = np.array([_groups_of(ev, t, limit_set)[i] <= g for i, (t, g) in enumerate(jobs)])
        lo, hi = np.where(ok, mid, lo), np.where(ok, hi, mid)
    ev = evaluate_rows(arrays, len(jobs), limit_set, raw_scale=10 ** lo)
    return [float(10 ** lo[i]) if _groups_of(ev, t, limit_set)[i] <= g else None for i, (t, g) in enumerate(jobs)]


def _smallest_area(arrays, limit_set, jobs: list[tuple[str, int]]) -> list[float | None]:
    """For each (radiance family, group index): the least area factor s² ≥ 1 reaching that group."""
    lo = np.zeros(len(jobs))  # log10 s
    hi = np.full(len(jobs), np.log10(np.sqrt(_MAX_AREA_FACTOR)))
    ev = evaluate_rows(arrays, len(jobs), limit_set, size_scale=10 ** hi)
    reachable = np.array([_groups_of(ev, t, limit_set)[i] <= g for i, (t, g) in enumerate(jobs)])
    for _ in range(_BISECTIONS):
        mid = (lo + hi) / 2
        ev = evaluate_rows(arrays, len(jobs), limit_set, size_scale=10 ** mid)
        ok = np.array([_groups_of(ev, t, limit_set)[i] <= g for i, (t, g) in enumerate(jobs)])
        lo, hi = np.where(ok, lo, mid), np.where(ok, mid, hi)
    return [float(10 ** (2 * hi[i])) if reachable[i] else None for i in range(len(jobs))]


def _uv_bands(spectrum: Spectrum, to_assessment: float) -> dict[str, list[BandContribution]]:
    edges = np.arange(200.0, 400.0 + UV_BAND_STEP_NM, UV_BAND_STEP_NM)
    out = {}
    for symbol, table, lo in (("E_S", "s_uv", 200.0), ("E_UVA", None, 315.0)):
        weight = None if table is None else load_table(table)
        bands = [(a, b) for a, b in zip(edges[:-1], edges[1:]) if a >= lo]
        values = spectrum.value @ quadrature_matrix(spectrum.wavelength_nm, [(band, weight) for band in bands])
        values = values * to_assessment
        total = values.sum()
        if not total > 0:
            continue
        order = np.argsort(-values)
        out[symbol] = [BandContribution(band_nm=bands[k], value=float(values[k]), share=float(values[k] / total))
                       for k in order if values[k] / total >= 1e-3]
    return out


def _why_none(target: str, dimming: float | None, area: float | None) -> str:
    notes = []
    if dimming is None:
        notes.append("dimming alone does not reach this group")
    if area is None:
        if target in _RADIANCE_FAMILIES:
            notes.append(f"enlarging the area up to ×{_MAX_AREA_FACTOR:g} does not reach this group")
        else:
            notes.append("a diffuser changes radiance only; see the blue-light and retinal-thermal rows"
                         if target == "product" else "no diffuser factor: not a radiance hazard")
    return "; ".join(notes)


def remedies_study(arrays: ProductArrays, spectrum: Spectrum, to_assessment: float, limit_set: LimitSet) -> Remedies:
    """Remedies for one product (one row of ``arrays``).

    Parameters
    ----------
    spectrum : Spectrum
        The product's spectrum, for the UV bands.
    to_assessment : float
        Multiplier from the spectrum's integrals to irradiance at the assessment distance [1].
    """
    ev = evaluate_rows(arrays, 1, limit_set)
    jobs = []
    for name, members in limit_set.families:
        current = family_groups(ev, members)[0]
        jobs += [(name, g) for g in range(max(current, 0))]
    overall = overall_groups(ev, limit_set)[0]
    jobs += [("product", g) for g in range(max(overall, 0))]
    dimming = _largest_dimming(arrays, limit_set, jobs) if jobs else []
    area_jobs = [(t, g) for t, g in jobs if t in _RADIANCE_FAMILIES]
    areas = dict(zip(area_jobs, _smallest_area(arrays, limit_set, area_jobs))) if area_jobs else {}
    remedies = [Remedy(target=t, group=GROUPS[g], dimming_factor=f, area_factor=areas.get((t, g)),
                       note=_why_none(t, f, areas.get((t, g))))
                for (t, g), f in zip(jobs, dimming)]
    return Remedies(remedies=remedies, uv_bands=_uv_bands(spectrum, to_assessment),
                    note="Dimming factors are the largest emission multipliers (or neutral filter transmissions) "
                         "that reach the group; area factors enlarge the emitting area at the same power (a "
                         "diffuser). Each was found by re-assessing the product, as the standard's distances "
                         "apply.")
