"""A day of real exposures: each task's distance and duration against the exposure limit values.

For each exposure (distance, duration) and each hazard family the study gives the exposure as a fraction of
its limit for that duration (radiance hazards with the field of view that belongs to the duration), the longest
allowed duration at that distance (t_max there), and the shortest distance at which that duration stays within
the limit (the product re-assessed across distance, as in :mod:`hazard.studies.distances`).

Over the day, photochemical hazards add up (the limits are doses; ICNIRP 2013 errata, Eq. 11; 2006/25/EC Annex
I rows a, b): the exposures are laid back to back, the most intense first, and the cumulative dose is compared
with the limit at every duration it reaches, so a short intense spell is never averaged away over a long day.
Thermal hazards do not add up between separate exposures (tissue cools); each exposure is judged on its own.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hazard.inputs.record import DAY_S
from hazard.method.evaluate import Evaluation, ProductArrays
from hazard.method.exposure_time import limit_fraction, limit_fractions, limit_value
from hazard.method.families import evaluate_rows, family_member, family_t_max
from hazard.method.search import log_search
from hazard.result import DayExposure, ExposureFraction, ExposureResult, ExposureStudy
from hazard.standards import LimitSet
from hazard.studies.distances import CURVE_POINTS, SEARCH_RANGE_M

__all__ = ["Exposure", "exposure_study"]
CHART_POINTS = 61
"""Distances per allowed-stay curve [1]."""


@dataclass(frozen=True)
class Exposure:
    """One task of the day.

    Attributes
    ----------
    label : str
        What the person does, for the reader.
    distance_m : float
        Distance from the source [m].
    duration_s : float
        Time spent there in a day [s].
    """

    label: str
    distance_m: float
    duration_s: float


def _fractions(ev: Evaluation, limit_set: LimitSet, duration_s: float, members: tuple[str, ...]) -> np.ndarray:
    """Each row's exposure of ``duration_s`` as a fraction of its limit, shape (n,) [1].

    The family member that applies at the row is used (for a pulse train, the larger of the dose and a single
    pulse's fraction); NaN where none applies or it was not assessed.
    """
    out = np.full(ev.assessment_distance_m.size, np.nan)
    claimed = np.zeros(out.size, dtype=bool)
    for symbol in members:  # the first applicable member of each row (family_member), where it was assessed
        h = ev.hazards[symbol]
        rows = np.flatnonzero(h.applicable & ~claimed & h.assessed)
        claimed |= h.applicable
        if rows.size:
            pulse = np.nan if h.pulse is None else h.pulse.fraction[rows]
            out[rows] = np.fmax(limit_fractions(limit_set[symbol], ev.viewed, duration_s, rows), pulse)
    return out


def _pulse_fraction(ev: Evaluation, symbol: str, row: int) -> float:
    """A pulse train's single pulse against its own limit at ``row`` [1]; NaN for continuous light.

    The dose of the day is the time average's; a pulse may still exceed its own, shorter-duration limit
    (:mod:`hazard.method.pulses`), so the larger of the two decides.
    """
    check = ev.hazards[symbol].pulse
    return np.nan if check is None else float(check.fraction[row])


def _shortest_distances_m(
    arrays: ProductArrays, limit_set: LimitSet, durations_s: list[float]
) -> dict[float, dict[str, tuple[float | None, str]]]:
    """For each duration, each family's least distance beyond which it stays within the limit, and how found [m].

    Bracketed on the distance grid of :mod:`hazard.studies.distances` (one evaluation for every duration), then
    every bracket of every duration narrowed together (one evaluation of the product per round).
    """
    grid = np.geomspace(*SEARCH_RANGE_M, CURVE_POINTS)
    ev = evaluate_rows(arrays, grid.size, limit_set, forced_distance_m=grid)
    found: dict[float, dict[str, tuple[float | None, str]]] = {d: {} for d in durations_s}
    jobs: list[tuple[float, str, tuple[str, ...], float, float]] = []
    for duration_s in durations_s:
        for family, members in limit_set.families:
            fractions = _fractions(ev, limit_set, duration_s, members)
            over = np.flatnonzero(~(fractions <= 1))
            if np.all(np.isnan(fractions)):
                found[duration_s][family] = (None, "not assessed")
            elif over.size == 0:
                found[duration_s][family] = (0.0, f"within the limit at every distance from {grid[0] * 1e3:.0f} mm")
            elif over[-1] == grid.size - 1:
                found[duration_s][family] = (None, f"not within the limit up to {grid[-1]:.0f} m")
            else:
                jobs.append((duration_s, family, members, grid[over[-1]], grid[over[-1] + 1]))
    if jobs:

        def within(distance: np.ndarray, index: np.ndarray) -> np.ndarray:
            flat = evaluate_rows(arrays, distance.size, limit_set, forced_distance_m=distance.ravel())
            ok = np.zeros(distance.shape, dtype=bool)
            for duration_s, members in {(jobs[j][0], jobs[j][2]) for j in index}:
                mine = [k for k, j in enumerate(index) if jobs[j][0] == duration_s and jobs[j][2] == members]
                ok[mine] = (_fractions(flat, limit_set, duration_s, members).reshape(distance.shape) <= 1)[mine]
            return ok

        _, above = log_search(within, np.array([j[3] for j in jobs]), np.array([j[4] for j in jobs]))
        for (duration_s, family, _, _, _), distance in zip(jobs, above, strict=True):
            found[duration_s][family] = (float(distance), "re-assessed to the limit")
    return found


def _within_day(t_s: float) -> float | None:
    """An allowed stay, or None when it is not reached within a day (or at all) [s]."""
    return t_s if np.isfinite(t_s) and t_s <= DAY_S else None


def _curves(
    arrays: ProductArrays, limit_set: LimitSet, exposures: list[Exposure]
) -> tuple[list[float], dict[str, list[float | None]]]:
    """Each family's allowed stay against distance [mm, s].

    From a fifth of the nearest exposure to five times the farthest, clipped to the distance study's search range.
    """
    nearest = min(e.distance_m for e in exposures) / 5
    farthest = max(e.distance_m for e in exposures) * 5
    low, high = max(nearest, SEARCH_RANGE_M[0]), min(farthest, SEARCH_RANGE_M[1])
    grid = np.geomspace(low, max(high, low * 10), CHART_POINTS)
    ev = evaluate_rows(arrays, grid.size, limit_set, forced_distance_m=grid)
    allowed = {
        family: [_within_day(float(t)) for t in family_t_max(ev, members)] for family, members in limit_set.families
    }
    return [float(d) * 1e3 for d in grid], allowed


def _day_fraction(values: list[float], durations: list[float], limit_set: LimitSet, symbol: str) -> float:
    """Worst fraction of a dose limit over a day [1].

    The exposures are laid back to back, the most intense first, and the cumulative dose H(t) is compared with the
    allowed dose limit(t)·t at every breakpoint (both are linear or constant between breakpoints, so their ratio is
    largest at one).
    """
    hazard = limit_set[symbol]
    order = np.argsort(values)[::-1]
    breakpoints = {p.up_to_s for p in hazard.exposure_limit.pieces if np.isfinite(p.up_to_s)}
    cumulative_t, dose, worst = 0.0, 0.0, 0.0
    steps = []
    for k in order:
        steps.append((cumulative_t, cumulative_t + durations[k], values[k]))
        cumulative_t += durations[k]
    times = sorted({t for _, t, _ in steps} | {t for t in breakpoints if t < cumulative_t})
    for t in times:
        dose = sum(value * (min(t, end) - start) for start, end, value in steps if t > start)
        allowed = limit_value(hazard, t) * t
        worst = max(worst, dose / allowed)
    return worst


def exposure_study(arrays: ProductArrays, limit_set: LimitSet, exposures: list[Exposure]) -> ExposureStudy:
    """Each exposure against the limits, the day's totals, and the hazard and exposure that use most of it.

    Parameters
    ----------
    arrays : ProductArrays
        One product, its integrals made for ``limit_set``.
    limit_set : LimitSet
        The exposure limits to judge by (the workplace limit values of Directive 2006/25/EC by default).
    exposures : list of Exposure

    Returns
    -------
    ExposureStudy
    """
    distances = np.array([e.distance_m for e in exposures])
    ev = evaluate_rows(arrays, len(exposures), limit_set, forced_distance_m=distances)
    shortest_by_duration = _shortest_distances_m(arrays, limit_set, sorted({e.duration_s for e in exposures}))
    results = []
    per_family: dict[str, list[tuple[float, float, str]]] = {}
    pulses: dict[str, float] = {}
    for row, exposure in enumerate(exposures):
        fractions = {}
        for family, members in limit_set.families:
            symbol = family_member(ev, members, row)
            if symbol is None or not ev.hazards[symbol].assessed[row]:
                continue
            fraction = float(limit_fraction(limit_set[symbol], ev.viewed, exposure.duration_s, row))
            if not np.isfinite(fraction):
                continue  # no limit for this duration (e.g. skin thermal beyond 10 s)
            t_max = float(ev.hazards[symbol].t_max_s[row])
            shortest, how = shortest_by_duration[exposure.duration_s][family]
            pulse = _pulse_fraction(ev, symbol, row)
            if shortest is not None and shortest > exposure.distance_m and np.fmax(fraction, pulse) <= 1:
                how = (
                    f"within the limit at this distance but exceeded farther out, up to {shortest * 1e3:.0f} mm: "
                    f"there the source looks smaller and another member of the family applies (e.g. the "
                    f"small-source limit of blue light)"
                )
            fractions[family] = ExposureFraction(
                criterion=symbol,
                fraction=fraction,
                pulse_fraction=None if np.isnan(pulse) else pulse,
                allowed_duration_s=_within_day(t_max),
                shortest_distance_mm=None if shortest is None else shortest * 1e3,
                note=how,
            )
            per_family.setdefault(family, []).append((fraction, exposure.duration_s, symbol))
            if not np.isnan(pulse):
                pulses[family] = max(pulses.get(family, 0.0), pulse)
        results.append(
            ExposureResult(
                label=exposure.label,
                distance_mm=exposure.distance_m * 1e3,
                duration_s=exposure.duration_s,
                hazards=fractions,
            )
        )
    day = {}
    for family, found in per_family.items():
        symbols = {s for _, _, s in found}
        if any(limit_set[s].effect != "photochemical" for s in symbols):
            fraction = max(f for f, _, _ in found)
            how = "the highest single exposure (thermal limits do not add up between separate exposures)"
        elif len(symbols) == 1:
            symbol = next(iter(symbols))
            rates = [f * limit_value(limit_set[symbol], t) for f, t, _ in found]  # each exposure's value
            fraction = _day_fraction(rates, [t for _, t, _ in found], limit_set, symbol)
            how = "summed over the day (a dose): exposures back to back, the most intense first"
        else:
            fraction = sum(f for f, _, _ in found)
            how = (
                "the exposures' fractions added (the family member differs between exposures, so their doses are "
                "in different units; the sum cannot be lower than the day's true fraction)"
            )
        day[family] = DayExposure(fraction=fraction, pulse_fraction=pulses.get(family), rule=how)
    most = max(day, key=lambda family: day[family].worst, default=None)

    def share(result: ExposureResult) -> float:
        found = result.hazards.get(most) if most is not None else None
        return -1.0 if found is None else found.worst

    worst_exposure = max(results, key=share) if most is not None else None
    curve_distance_mm, allowed = _curves(arrays, limit_set, exposures)
    return ExposureStudy(
        limit_set=limit_set.name,
        exposures=results,
        day=day,
        curve_distance_mm=curve_distance_mm,
        allowed_duration_s=allowed,
        most_family=most,
        most_exposure=None if worst_exposure is None else worst_exposure.label,
        within=all(d.worst <= 1 for d in day.values()),
        note="A pre-screen of the exposure: whether a workplace meets the exposure limit values is the employer's "
        "assessment, confirmed by a laboratory or a competent person.",
    )
