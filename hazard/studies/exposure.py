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

from hazard.method.evaluate import ProductArrays
from hazard.method.exposure_time import limit_fraction, limit_value
from hazard.method.families import evaluate_rows, family_member
from hazard.method.search import log_search
from hazard.result import DayExposure, ExposureFraction, ExposureResult, ExposureStudy
from hazard.standards import LimitSet
from hazard.studies.distances import CURVE_POINTS, SEARCH_RANGE_M

__all__ = ["Exposure", "exposure_study"]


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


def _fractions(
    arrays: ProductArrays, limit_set: LimitSet, distance_m: np.ndarray, duration_s: float, members: tuple[str, ...]
) -> tuple[np.ndarray, list[str | None]]:
    """(n,) fraction of the limit for ``duration_s`` at each distance, and the member that applies there.

    NaN and None where none applies or it was not assessed.
    """
    ev = evaluate_rows(arrays, distance_m.size, limit_set, forced_distance_m=distance_m)
    out = np.full(distance_m.size, np.nan)
    used: list[str | None] = []
    for row in range(distance_m.size):
        symbol = family_member(ev, members, row)
        used.append(symbol)
        if symbol is None or not ev.hazards[symbol].assessed[row]:
            continue
        out[row] = limit_fraction(limit_set[symbol], ev.viewed, duration_s, row)
    return out, used


def _shortest_distance_m(
    arrays: ProductArrays, limit_set: LimitSet, duration_s: float, members: tuple[str, ...]
) -> tuple[float | None, str]:
    """Least distance beyond which ``duration_s`` stays within the limit, and how it was found [m]."""
    grid = np.geomspace(*SEARCH_RANGE_M, CURVE_POINTS)
    fractions, _ = _fractions(arrays, limit_set, grid, duration_s, members)
    if np.all(np.isnan(fractions)):
        return None, "not assessed"
    over = np.flatnonzero(~(fractions <= 1))
    if over.size == 0:
        return 0.0, f"within the limit at every distance from {grid[0] * 1e3:.0f} mm"
    if over[-1] == grid.size - 1:
        return None, f"not within the limit up to {grid[-1]:.0f} m"

    def within(distance: np.ndarray, jobs: np.ndarray) -> np.ndarray:
        found, _ = _fractions(arrays, limit_set, distance.ravel(), duration_s, members)
        return (found <= 1).reshape(distance.shape)

    _, above = log_search(within, np.array([grid[over[-1]]]), np.array([grid[over[-1] + 1]]))
    return float(above[0]), "re-assessed to the limit"


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
    results = []
    per_family: dict[str, list[tuple[float, float, str]]] = {}
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
            shortest, how = _shortest_distance_m(arrays, limit_set, exposure.duration_s, members)
            fractions[family] = ExposureFraction(
                criterion=symbol,
                fraction=fraction,
                allowed_duration_s=None if np.isnan(t_max) else t_max,
                shortest_distance_mm=None if shortest is None else shortest * 1e3,
                note=how,
            )
            per_family.setdefault(family, []).append((fraction, exposure.duration_s, symbol))
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
        dose = all(limit_set[s].effect == "photochemical" for s in symbols) and len(symbols) == 1
        if dose:
            symbol = next(iter(symbols))
            values = [f * limit_value(limit_set[symbol], t) for f, t, _ in found]  # the value each exposure holds
            fraction = _day_fraction(values, [t for _, t, _ in found], limit_set, symbol)
            how = "summed over the day (a dose): exposures back to back, the most intense first"
        else:
            fraction = max(f for f, _, _ in found)
            how = "the highest single exposure (thermal limits do not add up between separate exposures)"
        day[family] = DayExposure(fraction=fraction, rule=how)
    most = max(((family, d.fraction) for family, d in day.items()), key=lambda x: x[1], default=None)
    worst_exposure = None
    if most is not None:
        worst_exposure = max(
            range(len(results)),
            key=lambda i: results[i].hazards.get(most[0]).fraction if most[0] in results[i].hazards else -1.0,
        )
    return ExposureStudy(
        limit_set=limit_set.name,
        exposures=results,
        day=day,
        most_family=None if most is None else most[0],
        most_exposure=None if worst_exposure is None else results[worst_exposure].label,
        within=all(d.fraction <= 1 for d in day.values()),
        note="A pre-screen of the exposure: whether a workplace meets the exposure limit values is the employer's "
        "assessment, confirmed by a laboratory or a competent person.",
    )
