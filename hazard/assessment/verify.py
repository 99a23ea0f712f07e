"""Check a saved result before it is rendered.

It must be unchanged since it was made, and its groups must follow from its own numbers and its limit set.

A result file can be edited by hand or damaged; rendering it as it stands could print "Exempt" beside values
far above a limit. :func:`check_result` first compares the result with the SHA-256 it was sealed with, then
re-derives each hazard's group from the values compared and the limits applied (top-down, and never safer
than its t_max: :mod:`hazard.method.classify`), checks those limits, time bases and fields of view against the
limit set, that every family of the set is present, that what the spectrum covers was assessed, that a
standard result sits at the standard's distance, and that the cautions its groups call for are there. A result
that fails is refused, naming what it says and what its numbers give.
"""

from __future__ import annotations

import math

import numpy as np

from hazard.assessment.cautions import PRE_SCREEN, select_cautions
from hazard.errors import InputError
from hazard.method.classify import hazard_groups
from hazard.method.geometry import MIN_ASSESSMENT_DISTANCE_M
from hazard.result import Assessment, Emission
from hazard.standards import LIMIT_SETS, LimitSet

__all__ = ["check_result"]

_FIX = "re-run 'hazard assess' on the product instead of editing its result"


def _refuse(problem: str, path: str) -> InputError:
    return InputError(problem, _FIX, path)


def _hazard_group(symbol: str, h, limit_set: LimitSet, emission: Emission | None, path: str) -> str | None:
    """The group the hazard's own numbers give, with the pulse rules of :mod:`hazard.method.pulses`.

    A single pulse: RG3 over its limit, else Exempt. A train: RG3 when a pulse exceeds its limit, else the group
    of its time-averaged values.
    """
    if not (h.assessed and limit_set[symbol].grouped):
        return None
    if emission is not None:
        if h.pulse is None:
            raise _refuse(f"hazard {symbol} of a pulsed source lacks its pulse check", path)
        if max(h.pulse.fraction, h.pulse.fraction_in_train or 0.0) > 1:
            return limit_set.groups[-1]
        if emission.mode == "single_pulse":
            return limit_set.groups[0]
    return _continuous_group(symbol, h, limit_set, path)


def _continuous_group(symbol: str, h, limit_set: LimitSet, path: str) -> str:
    """The group of a hazard's compared values and limits (top-down, never safer than its t_max)."""
    try:
        compared = np.array([[h.compared[b] for b in limit_set.boundaries]], dtype=float)
        limits = np.array([[h.limits[b] for b in limit_set.boundaries]], dtype=float)
        exempt_s, rg1_s, rg2_s = (float(h.time_bases_s[b]) for b in limit_set.boundaries)
    except KeyError as missing:
        raise _refuse(f"hazard {symbol} lacks its {missing} boundary", path) from None
    if not (np.all(np.isfinite(compared)) and np.all(np.isfinite(limits))):
        raise _refuse(f"hazard {symbol} holds a value that is not a finite number", path)
    value = math.nan if h.value is None else h.value
    if limit_set[symbol].kind == "irradiance":  # an irradiance is compared as it is
        if not np.allclose(compared, value, rtol=1e-9, atol=0.0):
            raise _refuse(f"hazard {symbol}: its value {value:.6g} is not the value it was compared with", path)
    elif not np.all(compared <= value * (1 + 1e-9)):  # a field's average never exceeds the source's own radiance
        raise _refuse(f"hazard {symbol}: a field-of-view average exceeds its value {value:.6g}", path)
    for b, c, lim in zip(limit_set.boundaries, compared[0], limits[0], strict=True):
        margin = h.margins.get(b)
        if margin is None or not math.isclose(margin, c / lim, rel_tol=1e-9):
            raise _refuse(f"hazard {symbol}: margin at {b} is {margin!r} but compared/limit is {c / lim:.6g}", path)
    t_max = np.array([np.nan if h.t_max_s is None else h.t_max_s])
    group, _ = hazard_groups(compared, limits, t_max, (exempt_s, rg1_s, rg2_s), limit_set.table_rounding)
    return limit_set.groups[int(group[0])]


def check_result(assessment: Assessment, path: str) -> None:
    """Refuse a result whose groups do not follow from its numbers.

    Parameters
    ----------
    assessment : Assessment
        A result loaded from JSON.
    path : str
        Its file, for messages.

    Raises
    ------
    InputError
        Naming the hazard, what the result says and what its numbers give.
    """
    if not assessment.provenance.result_sha256:
        raise _refuse("the result carries no SHA-256 of its own, so it cannot be trusted as made", path)
    if assessment.content_sha256() != assessment.provenance.result_sha256:
        raise _refuse("the result was changed after it was made: its content no longer matches its SHA-256", path)
    limit_set = LIMIT_SETS.get(assessment.provenance.limit_set)
    if limit_set is None:
        raise InputError(
            f"limit set {assessment.provenance.limit_set!r} is not one this tool knows",
            f"use a result made with one of: {', '.join(LIMIT_SETS)}",
            path,
        )
    pulsed_record = assessment.record.get("emission", "continuous") != "continuous"
    if pulsed_record != (assessment.emission is not None):
        raise _refuse("its emission block does not match the record's emission", path)
    _check_against_set(assessment, limit_set, path)
    derived = {}
    for symbol, h in assessment.hazards.items():
        derived[symbol] = _hazard_group(symbol, h, limit_set, assessment.emission, path)
        if derived[symbol] != h.risk_group:
            shown = "the compared values and limits" if h.assessed else "its assessed flag"
            raise _refuse(
                f"hazard {symbol} says {h.risk_group or 'no group'} but {shown} give {derived[symbol] or 'no group'}",
                path,
            )
    lower = {s: h.lower_bound_group for s, h in assessment.hazards.items() if h.lower_bound_group is not None}
    if any(assessment.hazards[s].assessed for s in lower) or limit_set.groups[0] in lower.values():
        raise _refuse("it gives a lower bound for an assessed hazard, or an Exempt one", path)
    grouped = [limit_set.groups.index(g) for g in [*derived.values(), *lower.values()] if g is not None]
    overall = limit_set.groups[max(grouped)] if grouped else None
    if overall != assessment.risk_group:
        raise _refuse(
            f"the overall group says {assessment.risk_group or 'not determined'} but its hazards give "
            f"{overall or 'not determined'}",
            path,
        )
    not_assessed = sorted(s for s, h in assessment.hazards.items() if not h.assessed)
    if sorted(assessment.not_assessed) != not_assessed or assessment.complete != (not not_assessed):
        raise _refuse("its completeness does not match the hazards it lists as assessed", path)
    what_if = assessment.record.get("at_distance_mm") is not None
    if (assessment.basis == "what-if") != what_if:
        raise _refuse(
            f"its basis says {assessment.basis} but the record "
            f"{'asks' if what_if else 'does not ask'} for a what-if distance",
            path,
        )
    _check_distance_and_cautions(assessment, limit_set, derived, path)


def _check_against_set(a: Assessment, limit_set: LimitSet, path: str) -> None:
    """Check hazards, units, limits, time bases and fields of view against the limit set.

    Every family must be present, and what the spectrum covers must have been assessed.
    """
    lo, hi = a.spectrum.min_nm, a.spectrum.max_nm
    no_emission_outside = bool(a.record.get("no_emission_outside", False))
    for name, members in limit_set.families:
        present = [m for m in members if m in a.hazards]
        if len(present) != 1:
            raise _refuse(f"hazard family {name!r} should appear once among {', '.join(members)}", path)
    for symbol, h in a.hazards.items():
        try:
            spec = limit_set[symbol]
        except KeyError:
            raise _refuse(f"hazard {symbol} is not in {limit_set.name}", path) from None
        covered = no_emission_outside or (lo <= spec.band_nm[0] and hi >= spec.band_nm[1])
        holed = h.hole_nm is not None and spec.band_nm[0] < h.hole_nm[1] and h.hole_nm[0] < spec.band_nm[1]
        if h.assessed != (covered and not holed) or h.unit != spec.unit or tuple(h.band_nm) != tuple(spec.band_nm):
            raise _refuse(
                f"hazard {symbol}: band, unit or assessed flag differ from the spectrum and {limit_set.name}", path
            )
        if spec.limits is None or spec.time_bases_s is None:  # no risk groups (both or neither: Hazard)
            continue
        if a.emission is not None and a.emission.mode == "single_pulse":
            if h.limits or h.compared:  # a single pulse is grouped by its pulse check alone
                raise _refuse(f"hazard {symbol}: a single pulse has no continuous-wave limits to compare", path)
            continue
        alpha_bounds = spec.alpha_bounds_rad or ()
        expected = {}
        for k, b in enumerate(limit_set.boundaries):
            coefficient = spec.limits[k]
            if spec.limits_over_alpha:
                alpha = h.alpha_rad.get(b, math.nan)
                low, high = alpha_bounds[k]
                if not low * (1 - 1e-12) <= alpha <= high * (1 + 1e-12):
                    raise _refuse(f"hazard {symbol}: α at {b} is outside {low:g}–{high:g} rad", path)
                coefficient = coefficient / alpha
            expected[b] = coefficient
        bases = dict(zip(limit_set.boundaries, spec.time_bases_s, strict=True))
        fovs = dict(zip(limit_set.boundaries, spec.fov_rad, strict=True)) if spec.fov_rad else {}
        if (
            any(not math.isclose(h.limits.get(b, math.nan), v, rel_tol=1e-9) for b, v in expected.items())
            or h.time_bases_s != bases
            or h.fov_rad != fovs
        ):
            raise _refuse(f"hazard {symbol}: limits, time bases or fields of view differ from {limit_set.name}", path)


def _check_distance_and_cautions(a: Assessment, limit_set: LimitSet, groups: dict[str, str | None], path: str) -> None:
    """A standard result at the standard's distance; the cautions its groups call for present."""
    if a.basis == "standard":
        other = a.record.get("lamp_type", "other") != "gls"
        at_minimum = math.isclose(a.assessment_distance_mm, MIN_ASSESSMENT_DISTANCE_M * 1e3, rel_tol=1e-9)
        if (other and not at_minimum) or a.assessment_distance_mm < MIN_ASSESSMENT_DISTANCE_M * 1e3 * (1 - 1e-9):
            raise _refuse(
                f"a standard result at {a.assessment_distance_mm:g} mm is not at the standard's assessment distance",
                path,
            )
    needed = select_cautions(limit_set, groups, {}, a.complete, determined=a.risk_group is not None)
    if not a.cautions or a.cautions[0] != PRE_SCREEN or not set(needed) <= set(a.cautions):
        raise _refuse("its cautions are not the ones its groups call for", path)
