"""A test plan for the laboratory: what to measure for each product, ranked by how much it could change the decision.

Pure functions of results (:class:`~hazard.result.Assessment`): no input, no output.

What the plan asks for (the item's ``kind``)
--------------------------------------------
- ``not assessed``: an applicable hazard whose band the spectrum does not cover, with the wavelength range to
  extend the measurement to.
- ``borderline``: a hazard so near a group boundary that the measurement uncertainty decides its side: within the
  uncertainty the record states (the uncertainty study's groups, or the ratio r = value/limit), or within
  ±20 % (:data:`DEFAULT_UNCERTAINTY_PCT`) when the record states none, which is the summary's window of 0.8 to
  1.25 × the limit. The figure that settles it is the expanded uncertainty below which a result at the same
  value stays on its side of the limit: the smaller of |1 − r| and |1 − 1/r| (so it holds whether the
  uncertainty is read relative to the value or to the limit).
- ``radiance imaging``: a radiance hazard (blue light, retinal thermal) where an imaging radiance measurement
  through the standard's fields (100, 11 and 1.7 mrad) could show more than the data: radiance derived from
  irradiance as if the source were uniform, or measured through a field wider than the boundary's, while that
  field is narrower than the source (a hot spot counts there); a peak-to-mean radiance stated as an estimate; a
  source subtending less than twice the small-source bound (11 mrad), whose apparent size selects the
  blue-light criterion (E_B or L_B) and the α of the thermal limits. The figure is the peak-to-mean radiance at
  which the group changes, or for the size alone the value's distance from its next limit.
- ``assessment distance``: irradiance scaled by the inverse-square law from the measurement distance d_m to the
  assessment distance d_a. Scaled outwards (d_m < d_a) it understates a beam that spreads less than from a
  point, by up to (d_a/d_m)² for a collimated one; scaled inwards it overstates an extended source.
- ``claim``: a vendor claim contradicted, inconclusive or not checkable, and a claimed group higher than the
  computed one (the vendor may know of a hazard the data miss).
- ``fix input``: a product that could not be assessed. ``confirm``: a product none of the above applies to.

How the plan is ranked (safety first)
-------------------------------------
Each item gets a priority from 0 to 100; the plan lists items by priority, then product id, then kind.

1. *fix the input*: 100; nothing is known of the product.
2. *could raise the group*: 67 to 97. A measurement could put the product in a higher group than reported: a
   wrong lower group (worst of all a wrong Exempt) is the error that matters, so these come before anything
   that could only lower a group. By evidence first: the value is unknown (0: hazard not assessed), within the
   measurement uncertainty (1: borderline, inconclusive claim), or it would take an effect the data cannot show
   (2: a hot spot, a beam, the vendor's own higher group); then the lower the current group the higher; then
   closeness. Priority = 95 − 10·evidence − 2·(group index + 1) + 1.9·closeness (group index 0 for Exempt,
   −1 when no group is determined).
3. *could lower the group*: 35 to 57; 55 − 10·evidence + 1.9·closeness.
4. *changes no group*: 0 to 10; 10·closeness. Figures for the record: CCT, illuminance and t_max claims, a
   hazard without risk groups, a factor beyond the plausible range, a product already in the highest group.

Closeness runs from 0 to 1: 1 for a value not measured at all; 1 − (settling uncertainty ÷ window) for a
borderline; 1 − log f / log F for a factor f the data would have to be off by, against the largest plausible
factor F: :data:`HOT_SPOT_FACTOR` for a hot spot, :data:`CRITERION_SWITCH_FACTOR` for the source size alone,
(d_a/d_m)² for the inverse-square scaling.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass, replace
from typing import Literal

from hazard.output.formatting import format_distance_mm as _mm
from hazard.output.formatting import (
    format_percent,
    format_stated,
    format_value,
    group_words,
    round_down,
    round_up,
)
from hazard.result import Assessment, ClaimCheck, HazardResult
from hazard.standards import limit_set_named

__all__ = [
    "CRITERION_SWITCH_FACTOR",
    "DEFAULT_UNCERTAINTY_PCT",
    "HOT_SPOT_FACTOR",
    "KINDS",
    "NEAR_SMALL_FACTOR",
    "PlanItem",
    "failure_item",
    "plan_items",
    "rank_plan",
    "settling_uncertainty_pct",
]

Kind = Literal["fix input", "not assessed", "borderline", "claim", "radiance imaging", "assessment distance", "confirm"]
KINDS: tuple[Kind, ...] = (
    "fix input",
    "not assessed",
    "borderline",
    "claim",
    "radiance imaging",
    "assessment distance",
    "confirm",
)
"""The kinds of plan item, in the order they are listed for one product at equal priority."""
Change = Literal["fix the input", "could raise", "could lower", "no group change"]

DEFAULT_UNCERTAINTY_PCT = 20.0
"""Window for a borderline when the record states no uncertainty [%]: 0.8 to 1.25 × the limit, the summary's."""
HOT_SPOT_FACTOR = 10.0
"""Largest peak-to-mean radiance an imaging measurement is taken to reveal [1] (common practice, no published
source): beyond it an item changes no group."""
NEAR_SMALL_FACTOR = 2.0
"""A source subtending less than this many times the small-source bound gets an imaging item [1]."""
CRITERION_SWITCH_FACTOR = 1.3
"""How much the blue-light value against its limit can change when a source found below 11 mrad is at or above it
[1]: the E_B limit 1 W/m² against L_B 100 W/(m²·sr) averaged over the 100 mrad field (7.85·10⁻³ sr), 1/0.785 = 1.27
at the Exempt boundary, about 1.05 at the others (IEC 62471:2006 Table 6.1 limits and fields)."""
_OPEN_VERDICTS = frozenset({"contradicted", "not checkable", "inconclusive"})
_EVIDENCE = {
    0: "the value is not known until it is measured",
    1: "within the measurement uncertainty",
}


@dataclass(frozen=True)
class PlanItem:
    """One thing to ask the laboratory about one product.

    Attributes
    ----------
    product_id, name, vendor, model : str
        The product (empty strings where the record gives none).
    group : str
        The group now, in words (``'RG1'``, ``'Exempt (lower bound)'``, ``'not determined'``).
    kind : str
        One of :data:`KINDS`.
    hazard : str
        Hazard symbol or family the item is about; empty when it is about the whole product.
    change : str
        What the measurement could do: ``'could raise'``, ``'could lower'``, ``'no group change'`` or
        ``'fix the input'``.
    measure : str
        What to ask the laboratory for, in one sentence.
    why : str
        Why, in one sentence.
    settles : str
        The figure that settles it.
    extend_to_nm : str
        Wavelength range the spectrum lacks (``'200–300 nm'``); empty otherwise.
    assessment_distance_mm : float or None
        Where the product is assessed [mm]; None for a product that could not be assessed.
    priority : float
        0–100, one decimal (see the module's ranking rule).
    rank_reason : str
        Why it ranks where it does.
    rank : int
        Position in the ranked plan (from 1); 0 before :func:`rank_plan`.
    """

    product_id: str
    name: str
    vendor: str
    model: str
    group: str
    kind: Kind
    hazard: str
    change: Change
    measure: str
    why: str
    settles: str
    extend_to_nm: str
    assessment_distance_mm: float | None
    priority: float
    rank_reason: str
    rank: int = 0


def settling_uncertainty_pct(ratio: float) -> float:
    """The expanded uncertainty below which a result at ``ratio`` = value/limit stays on its side of the limit [%].

    The smaller of |1 − r| and |1 − 1/r|: it holds whether the uncertainty is read relative to the value or to the
    limit.

    Examples
    --------
    >>> round(settling_uncertainty_pct(0.8), 6), round(settling_uncertainty_pct(1.25), 6)
    (20.0, 20.0)
    """
    if ratio <= 0:
        return 100.0
    return 100.0 * min(abs(1 - ratio), abs(1 - 1 / ratio))


def _closeness(factor: float, plausible: float) -> float:
    """1 − log f / log F, within 0..1: how little the data would have to be off by [1]."""
    if factor <= 1 or plausible <= 1:
        return 1.0
    return min(1.0, max(0.0, 1 - math.log(factor) / math.log(plausible)))


def _priority(change: Change, evidence: int, group_index: int, closeness: float) -> float:
    c = min(1.0, max(0.0, closeness))
    if change == "fix the input":
        return 100.0
    if change == "could raise":
        return round(95 - 10 * evidence - 2 * (group_index + 1) + 1.9 * c, 1)
    if change == "could lower":
        return round(55 - 10 * evidence + 1.9 * c, 1)
    return round(10 * c, 1)


def _mrad(angle_rad: float) -> str:
    return f"{format_value(angle_rad * 1e3)} mrad"


def _words(items: list[str]) -> str:
    """'a', 'a and b', 'a, b and c'."""
    return items[0] if len(items) == 1 else f"{', '.join(items[:-1])} and {items[-1]}"


def _sentence(text: str) -> str:
    """``text`` with a capital first letter and a full stop."""
    return text[:1].upper() + text[1:] + "."


def _is_radiance(h: HazardResult) -> bool:
    return h.unit.endswith("/sr")


def _crossed_up(h: HazardResult, boundary: str) -> int:
    """Group index of the hazard once its value passes the limit at ``boundary`` (equal limits pass together)."""
    ratio = h.margins[boundary]
    return sum(1 for v in h.margins.values() if v >= ratio * (1 - 1e-9))


def _crossed_down(h: HazardResult, boundary: str) -> int:
    """Group index of the hazard once its value falls just below the limit at ``boundary``."""
    ratio = h.margins[boundary]
    return sum(1 for v in h.margins.values() if v > ratio * (1 + 1e-9))


class _Product:
    """One result and what every item of it needs: groups, the current group, the uncertainty window."""

    def __init__(self, a: Assessment) -> None:
        self.a = a
        self.groups = a.limit_set.groups
        self.top = len(self.groups) - 1
        self.g = -1 if a.risk_group is None else self.groups.index(a.risk_group)
        self.now = group_words(a.risk_group, a.complete, a.basis, a.assessment_distance_mm)
        standard = a.classification_group
        self.standard_g = -1 if standard is None else self.groups.index(standard)  # what claims are checked against
        self.family = {s: name for name, members in a.limit_set.families.items() for s in members}
        self.bounds = {b.family: b for b in a.uncertainty.hazards} if a.uncertainty is not None else {}
        stated = float(a.record.get("uncertainty_pct") or 0.0)
        self.stated = stated > 0  # a stated 0 is no uncertainty statement: the default window applies
        self.window = stated if self.stated else DEFAULT_UNCERTAINTY_PCT
        self.d_a = a.geometry.assessment_distance_mm

    def window_text(self) -> str:
        if self.stated:
            return f"the stated ±{format_stated(self.window)} % uncertainty"
        return f"±{format_stated(self.window)} %, the default window (the record states no uncertainty)"

    def up(self, h: HazardResult) -> tuple[float, str, int] | None:
        """(ratio, limit, group index after) at the nearest limit above the current group this hazard could pass."""
        if not 0 <= self.g < self.top:
            return None
        found = []
        boundary = self.groups[self.g]
        if boundary in h.margins and 0 < h.margins[boundary] <= 1:
            found.append((h.margins[boundary], f"{boundary} limit", _crossed_up(h, boundary)))
        if h.pulse is not None and 0 < h.pulse.worst <= 1:
            found.append((h.pulse.worst, "pulse limit", self.top))
        return max(found, default=None)

    def down(self, h: HazardResult) -> tuple[float, str, int] | None:
        """(ratio, limit, group index after) at the limit below the current group this hazard could fall under."""
        if self.g < 1:
            return None
        if h.pulse is not None and h.pulse.worst > 1:
            return h.pulse.worst, "pulse limit", sum(1 for v in h.margins.values() if v > 1)
        boundary = self.groups[self.g - 1]
        if boundary in h.margins and h.margins[boundary] > 1:
            return h.margins[boundary], f"{boundary} limit", _crossed_down(h, boundary)
        return None

    def item(
        self,
        kind: Kind,
        hazard: str,
        change: Change,
        evidence: int,
        closeness: float,
        because: str,
        measure: str,
        why: str,
        settles: str,
        to_group: str | None = None,
        extend_to_nm: str = "",
    ) -> PlanItem:
        a = self.a
        if change == "could raise":
            reason = f"could raise the group ({self.now} → {to_group}): {because}"
        elif change == "could lower":
            reason = f"could lower the group ({self.now} → {to_group}): {because}"
        else:
            reason = f"changes no group: {because}"
        return PlanItem(
            product_id=a.id,
            name=a.name or "",
            vendor=str(a.record.get("vendor", "")),
            model=str(a.record.get("model", "")),
            group=self.now,
            kind=kind,
            hazard=hazard,
            change=change,
            measure=measure,
            why=why,
            settles=settles,
            extend_to_nm=extend_to_nm,
            assessment_distance_mm=self.d_a,
            priority=_priority(change, evidence, self.g, closeness),
            rank_reason=reason,
        )

    def unknown(
        self, kind: Kind, hazard: str, measure: str, why: str, settles: str, extend_to_nm: str = ""
    ) -> PlanItem:
        """An item whose value is not known at all: it could raise the group as far as the highest."""
        return self.item(
            kind,
            hazard,
            "could raise",
            0,
            1.0,
            _EVIDENCE[0],
            measure,
            why,
            settles,
            to_group=f"up to {self.groups[self.top]}",
            extend_to_nm=extend_to_nm,
        )


def _gaps_nm(covered: tuple[float, float], band: tuple[float, float]) -> list[tuple[float, float]]:
    """Parts of ``band`` outside ``covered`` [nm]."""
    gaps = []
    if covered[0] > band[0]:
        gaps.append((band[0], min(covered[0], band[1])))
    if covered[1] < band[1]:
        gaps.append((max(covered[1], band[0]), band[1]))
    return gaps


def _not_assessed(p: _Product) -> list[PlanItem]:
    a, items = p.a, []
    covered = (a.spectrum.min_nm, a.spectrum.max_nm)
    for symbol in a.not_assessed:
        h = a.hazards[symbol]
        gaps = " and ".join(f"{format_stated(lo)}–{format_stated(hi)} nm" for lo, hi in _gaps_nm(covered, h.band_nm))
        grouped = p.family.get(symbol) in a.limit_set.grouped_families
        measure = (
            f"Extend the spectrum to {gaps} so that {symbol} ({h.title}) can be assessed, or have the laboratory "
            f"confirm the source emits nothing there (then set no_emission_outside)."
        )
        why = (
            f"{symbol} needs {format_stated(h.band_nm[0])}–{format_stated(h.band_nm[1])} nm and the spectrum covers "
            f"{format_stated(covered[0])}–{format_stated(covered[1])} nm"
        )
        settles = f"a spectrum over {gaps} (or a statement that nothing is emitted there)"
        if grouped and p.g < p.top:
            why += (
                ": no group is determined until it is measured."
                if p.g < 0
                else f": {a.risk_group} is only a lower bound until it is measured."
            )
            items.append(p.unknown("not assessed", symbol, measure, why, settles, extend_to_nm=gaps))
        else:
            because = (
                "an exposure limit without risk groups" if not grouped else f"already {p.groups[p.top]}, the highest"
            )
            why += f"; {because}, so it completes the result (t_max) without changing the group."
            items.append(
                p.item(
                    "not assessed", symbol, "no group change", 0, 1.0, because, measure, why, settles, extend_to_nm=gaps
                )
            )
    return items


def _settle_text(settle_pct: float, low: str, high: str) -> str:
    if settle_pct <= 0:
        return f"none: the value lies on the limit between {low} and {high}; take {high} unless a result moves"
    return f"an expanded uncertainty (k = 2) below {round_down(settle_pct, 2)} % decides between {low} and {high}"


def _borderline(p: _Product) -> list[PlanItem]:
    a, items = p.a, []
    study = a.uncertainty
    study_text = (
        ""
        if study is None
        else (
            f"; the uncertainty study (±{format_stated(study.uncertainty_pct)} %, "
            f"±{format_stated(study.wavelength_uncertainty_nm)} nm)"
        )
    )
    for symbol, h in a.hazards.items():
        up = p.up(h) if h.assessed else None
        if up is None:
            continue
        ratio, limit, after = up
        settle = settling_uncertainty_pct(ratio)
        bound = p.bounds.get(p.family.get(symbol, ""))
        by_study = (
            bound is not None
            and bound.criterion == symbol
            and bound.group_high is not None
            and p.groups.index(bound.group_high) > p.g
        )
        if settle > p.window and not by_study:
            continue
        high = p.groups[after]
        why = f"{symbol} is at {format_percent(ratio)} of the {limit}"
        why += f", within {p.window_text()}" if settle <= p.window else ""
        why += f"{study_text} reaches {bound.group_high}." if by_study and bound is not None else "."
        items.append(
            p.item(
                "borderline",
                symbol,
                "could raise",
                1,
                1 - settle / p.window,
                _EVIDENCE[1],
                f"Measure {symbol} ({h.title}) at {_mm(p.d_a)} with an expanded uncertainty (k = 2) below "
                f"{round_down(settle, 2) if settle > 0 else 0} %.",
                why,
                _settle_text(settle, p.groups[p.g], high),
                to_group=high,
            )
        )
    items += _borderline_down(p)
    return items


def _borderline_down(p: _Product) -> list[PlanItem]:
    """Deciding hazards that could each fall a group within the uncertainty: only then can the product's group."""
    a = p.a
    found = []
    for symbol in a.deciding_hazards:
        h = a.hazards[symbol]
        down = p.down(h)
        if down is None:
            return []
        settle = settling_uncertainty_pct(down[0])
        bound = p.bounds.get(p.family.get(symbol, ""))
        by_study = bound is not None and bound.group_low is not None and p.groups.index(bound.group_low) < p.g
        if settle > p.window and not by_study:
            return []
        found.append((symbol, h, *down, settle))
    items = []
    for symbol, h, ratio, limit, after, settle in found:
        low = p.groups[after]
        items.append(
            p.item(
                "borderline",
                symbol,
                "could lower",
                1,
                1 - settle / p.window,
                _EVIDENCE[1],
                f"Measure {symbol} ({h.title}) at {_mm(p.d_a)} with an expanded uncertainty (k = 2) below "
                f"{round_down(settle, 2) if settle > 0 else 0} %.",
                f"{symbol} is {round_up(ratio)}× the {limit}, within {p.window_text()}.",
                _settle_text(settle, low, p.groups[p.g]),
                to_group=low,
            )
        )
    return items


def _fields_text(p: _Product, members: list[HazardResult]) -> str:
    """The standard's fields narrower than the source (all at or below the small-source bound for a small one)."""
    alpha, small = p.a.geometry.alpha_rad, p.a.limit_set.small_source_alpha_rad
    fields = {v for h in members for v in h.fov_rad.values() if v < alpha}
    if not fields:
        fields = {v for h in p.a.hazards.values() for v in h.fov_rad.values() if v <= small} or {small}
    return _words([_mrad(v) for v in sorted(fields, reverse=True)])


def _imaging_reasons(p: _Product, h: HazardResult) -> tuple[list[str], bool, bool]:
    """Why an imaging measurement of ``h`` matters: (reasons, a hot spot could show more, the size decides)."""
    a = p.a
    alpha, small = a.geometry.alpha_rad, a.limit_set.small_source_alpha_rad
    peak_to_mean = float(a.record.get("peak_to_mean_radiance", 1.0))
    measured_fov = a.record.get("measurement_fov_mrad")
    boundary = p.groups[p.g] if 0 <= p.g < p.top else None
    field = h.fov_rad.get(boundary) if boundary is not None else None
    reasons = []
    if field is not None and alpha > field:
        if a.spectrum.quantity != "radiance":
            reasons.append(
                f"{h.symbol} was derived from irradiance as if the source were uniform, and the {_mrad(field)} "
                f"field of the {boundary} limit sees only part of the {_mrad(alpha)} source"
            )
        elif measured_fov is None or measured_fov * 1e-3 > field:
            through = "an unstated field" if measured_fov is None else f"a {format_stated(measured_fov)} mrad field"
            reasons.append(f"the radiance was measured through {through}, wider than the {_mrad(field)} one")
    if peak_to_mean > 1 and _is_radiance(h):
        reasons.append(f"the peak-to-mean radiance of {format_stated(peak_to_mean)} is an estimate")
    hot_spot = bool(reasons)
    size = alpha < NEAR_SMALL_FACTOR * small
    if size:
        reasons.append(
            f"the source subtends {_mrad(alpha)}, {'below' if a.geometry.small_source else 'near'} the "
            f"{_mrad(small)} small-source bound, so its apparent size decides which criterion applies"
        )
    return reasons, hot_spot, size


def _imaging(p: _Product) -> list[PlanItem]:
    a, items = p.a, []
    limit_set = limit_set_named(a.limit_set.name)
    peak_to_mean = float(a.record.get("peak_to_mean_radiance", 1.0))
    for family in a.limit_set.grouped_families:
        symbols = a.limit_set.families[family]
        if not any(limit_set[s].kind == "radiance" for s in symbols):
            continue  # a family judged on irradiance only has no radiance to image
        members = [a.hazards[s] for s in symbols if s in a.hazards and a.hazards[s].assessed]
        if not members or p.g < 0:
            continue
        h = members[0]
        reasons, hot_spot, size = _imaging_reasons(p, h)
        if not reasons:
            continue
        measure = (
            f"Imaging radiance measurement of the {family} hazard at {_mm(p.d_a)}: the radiance through "
            f"{_fields_text(p, members)} fields at the brightest part of the source, the peak-to-mean radiance and "
            f"the apparent size α."
        )
        why = _sentence("; ".join(reasons))
        plausible = HOT_SPOT_FACTOR if hot_spot else CRITERION_SWITCH_FACTOR
        up = p.up(h)
        if up is not None and 1 / up[0] <= plausible:
            factor, high = 1 / up[0], p.groups[up[2]]
            if hot_spot:
                because = f"if the brightest part is {round_down(factor)}× the radiance assumed"
                settles = (
                    f"{h.symbol} reaches the {up[1]} ({high}) at {round_down(factor)}× the radiance assumed: a "
                    f"peak-to-mean radiance below that keeps {p.groups[p.g]}"
                )
            else:
                because = f"if the criterion for the measured size gives {round_down(factor)}× the value"
                settles = (
                    f"{h.symbol} is {format_percent(up[0])} of the {up[1]} ({high}); the criteria either side of "
                    f"{_mrad(a.limit_set.small_source_alpha_rad)} differ by up to "
                    f"{format_stated(CRITERION_SWITCH_FACTOR)}×"
                )
            items.append(
                p.item(
                    "radiance imaging",
                    family,
                    "could raise",
                    2,
                    _closeness(factor, plausible),
                    because,
                    measure,
                    why,
                    settles,
                    to_group=high,
                )
            )
            continue
        down = p.down(h) if peak_to_mean > 1 and hot_spot and a.deciding_hazards == [h.symbol] else None
        if down is not None and down[0] <= peak_to_mean:
            low = p.groups[down[2]]
            settles = f"a peak-to-mean radiance below {round_down(peak_to_mean / down[0])} puts {h.symbol} in {low}"
            items.append(
                p.item(
                    "radiance imaging",
                    family,
                    "could lower",
                    2,
                    _closeness(down[0], peak_to_mean),
                    f"if the source is more uniform than the stated {format_stated(peak_to_mean)}",
                    measure,
                    why,
                    settles,
                    to_group=low,
                )
            )
            continue
        if not (size or peak_to_mean > 1):
            continue  # only the uniformity assumption, and no plausible hot spot would change the group
        if p.g == p.top:
            settles = f"already {p.groups[p.top]}: the radiance completes the record"
        elif hot_spot:
            settles = (
                f"no plausible hot spot (up to {format_stated(HOT_SPOT_FACTOR)}× the radiance assumed) changes the "
                f"group"
            )
        else:
            settles = f"{h.symbol} is too far from its next limit for the criterion at the measured size to matter"
        items.append(
            p.item("radiance imaging", family, "no group change", 2, 0.0, "for the record", measure, why, settles)
        )
    return items


def _distance(p: _Product) -> list[PlanItem]:
    a = p.a
    d_m, d_a = a.geometry.measurement_distance_mm, p.d_a
    if d_m is None or a.spectrum.quantity == "radiance" or math.isclose(d_m, d_a, rel_tol=0.01):
        return []
    irradiance = {s: h for s, h in a.hazards.items() if h.assessed and not _is_radiance(h) and h.margins}
    measure = f"Measure the spectrum at the assessment distance, {_mm(d_a)}, not only at {_mm(d_m)}."
    standard = f" Assessment distance — {a.geometry.distance_rule}." + (
        f" The standard's own distance is {_mm(a.standard_assessment_distance_mm)}."
        if a.basis == "what-if" and a.standard_assessment_distance_mm is not None
        else ""
    )
    if d_m < d_a:
        plausible = (d_a / d_m) ** 2
        why = (
            f"The irradiance at {_mm(d_a)} was scaled down from {_mm(d_m)} by the inverse-square law, which "
            f"understates a beam that spreads less than from a point (up to {round_down(plausible)}× for a "
            f"collimated one).{standard}"
        )
        ups = [(up, s) for s, h in irradiance.items() if (up := p.up(h)) is not None]
        if ups:
            (ratio, limit, after), symbol = max(ups)
            if 1 / ratio <= plausible:
                high = p.groups[after]
                settles = (
                    f"an irradiance at {_mm(d_a)} of {round_down(1 / ratio)}× the scaled value or more puts {symbol} "
                    f"over the {limit} ({high})"
                )
                return [
                    p.item(
                        "assessment distance",
                        symbol,
                        "could raise",
                        2,
                        _closeness(1 / ratio, plausible),
                        f"if the beam spreads less than from a point ({round_down(1 / ratio)}× the scaled value)",
                        measure,
                        why,
                        settles,
                        to_group=high,
                    )
                ]
    else:
        plausible = (d_m / d_a) ** 2
        why = (
            f"The irradiance at {_mm(d_a)} was scaled up from {_mm(d_m)} by the inverse-square law, which "
            f"overstates an extended source or a spreading beam close to it (a focusing optic is the "
            f"exception).{standard}"
        )
        downs = [p.down(a.hazards[s]) for s in a.deciding_hazards]
        if a.deciding_hazards and all(s in irradiance for s in a.deciding_hazards) and all(downs):
            ratio, limit, after = max(d for d in downs if d is not None)
            if ratio <= plausible:
                low = p.groups[after]
                settles = f"an irradiance at {_mm(d_a)} below 1/{round_up(ratio)} of the scaled value puts it in {low}"
                return [
                    p.item(
                        "assessment distance",
                        _words(a.deciding_hazards),
                        "could lower",
                        2,
                        _closeness(ratio, plausible),
                        "if the source is larger than a point at that distance",
                        measure,
                        why,
                        settles,
                        to_group=low,
                    )
                ]
    return []  # no plausible error of the scaling changes the group; every row names the assessment distance


def _claim_measure(p: _Product, c: ClaimCheck) -> str:
    distance = p.a.record.get("distance_mm")
    if c.field == "claimed_risk_group":
        return f"Ask for the risk group under IEC 62471 to settle the vendor's {c.claimed}."
    if c.field == "claimed_cct_k":
        return f"Measure the CCT (spectrum over 360–830 nm) to check the vendor's {c.claimed}."
    if c.field == "claimed_illuminance_lx":
        where = f" at {_mm(distance)}" if isinstance(distance, int | float) else ""
        return f"Measure the illuminance{where} to check the vendor's {c.claimed}."
    return f"Measure what the vendor's {c.claim} ({c.claimed}) rests on, at {_mm(p.d_a)}."


def _claims(p: _Product) -> list[PlanItem]:
    a, items = p.a, []
    for c in a.claims:
        group_claim = c.field == "claimed_risk_group" and c.claimed in p.groups
        claimed = p.groups.index(c.claimed) if group_claim else -1
        if c.verdict not in _OPEN_VERDICTS and not (group_claim and claimed > p.standard_g):
            continue
        measure = _claim_measure(p, c)
        why = f"The claim is {c.verdict}: {c.reason}."
        settles = f"computed {c.computed or '—'} against claimed {c.claimed}" + (
            f" (tolerance {c.tolerance})" if c.tolerance else ""
        )
        if not group_claim:
            items.append(
                p.item("claim", c.claim, "no group change", 2, 0.5, "a figure for the record", measure, why, settles)
            )
        elif c.verdict == "consistent":  # the vendor's group is higher than the computed one
            why = f"The vendor states {c.claimed}, higher than the computed {c.computed}: ask what it rests on."
            items.append(
                p.item(
                    "claim",
                    c.claim,
                    "could raise",
                    2,
                    0.0,
                    "the vendor's own group is higher",
                    measure,
                    why,
                    settles,
                    to_group=c.claimed,
                )
            )
        elif c.verdict == "not checkable":
            if p.g < p.top:
                items.append(p.unknown("claim", c.claim, measure, why, settles))
        elif c.verdict == "inconclusive":
            to = p.groups[min(p.top, max(claimed, p.standard_g) + 1)]
            items.append(
                p.item("claim", c.claim, "could raise", 1, 0.5, _EVIDENCE[1], measure, why, settles, to_group=to)
            )
        else:  # contradicted: computed above the claim; a measurement could only bring it down to it
            ratios = [
                (a.hazards[s].margins[c.claimed], s)
                for s in a.deciding_hazards
                if a.basis == "standard" and c.claimed in a.hazards[s].margins
            ]
            ratio, symbol = max(ratios, default=(math.inf, ""))
            settle = settling_uncertainty_pct(ratio) if math.isfinite(ratio) else 100.0
            within = settle <= p.window
            if math.isfinite(ratio):
                settles += f"; the claim holds only if {symbol} measures below 1/{round_up(ratio)} of the value found"
            closeness = 1 - settle / p.window if within else _closeness(ratio, HOT_SPOT_FACTOR)
            because = _EVIDENCE[1] if within else "if the spectrum overstates the product"
            items.append(
                p.item(
                    "claim",
                    c.claim,
                    "could lower",
                    1 if within else 2,
                    closeness,
                    because,
                    measure,
                    why,
                    settles,
                    to_group=c.claimed,
                )
            )
    return items


def plan_items(assessment: Assessment) -> list[PlanItem]:
    """What to ask the laboratory about one product, unranked (``rank`` 0).

    Parameters
    ----------
    assessment : Assessment

    Returns
    -------
    list of PlanItem
        Not assessed, borderline, claim, radiance-imaging and assessment-distance items; a single ``confirm``
        item when none applies.
    """
    p = _Product(assessment)
    items = _not_assessed(p) + _borderline(p) + _claims(p) + _imaging(p) + _distance(p)
    if items:
        return items
    return [
        p.item(
            "confirm",
            "",
            "no group change",
            0,
            0.0,
            "nothing found that a measurement would change",
            f"Routine confirmation of {p.now} at {_mm(p.d_a)}.",
            "Every applicable hazard was assessed and none lies near a boundary this plan looks at.",
            "the laboratory's classification",
        )
    ]


def failure_item(product_id: str, reason: str) -> PlanItem:
    """The plan's row for a product that could not be assessed.

    Parameters
    ----------
    product_id : str
        Id of the product (or the file it came from).
    reason : str
        Why it failed; the first line is used.
    """
    first = (reason.strip().splitlines() or ["no reason given"])[0]
    return PlanItem(
        product_id=product_id,
        name="",
        vendor="",
        model="",
        group="not assessed",
        kind="fix input",
        hazard="",
        change="fix the input",
        measure=f"Fix the input: {first}",
        why="The product could not be assessed, so nothing is known of its risk group.",
        settles="an input the tool accepts",
        extend_to_nm="",
        assessment_distance_mm=None,
        priority=_priority("fix the input", 0, -1, 0.0),
        rank_reason="fix the input: nothing is known until the product can be assessed",
    )


def rank_plan(assessments: Iterable[Assessment], errors: Iterable[tuple[str, str]] = ()) -> list[PlanItem]:
    """The plan of many products, ranked across them by how much a measurement could change the decision.

    Parameters
    ----------
    assessments : iterable of Assessment
    errors : iterable of (str, str)
        Products that could not be assessed: id (or file) and reason.

    Returns
    -------
    list of PlanItem
        Highest priority first (ties by product id, then kind as in :data:`KINDS`, then hazard), ``rank`` from 1.
    """
    items = [item for a in assessments for item in plan_items(a)]
    items += [failure_item(product_id, reason) for product_id, reason in errors]
    items.sort(key=lambda i: (-i.priority, i.product_id, KINDS.index(i.kind), i.hazard))
    return [replace(item, rank=k) for k, item in enumerate(items, start=1)]
