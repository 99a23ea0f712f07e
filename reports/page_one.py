"""Page 1 of the product report: the answers, in the order a reader asks for them.

1. What is it: the group in words (or "not determined", or a what-if that is no classification), what it means and
   what sets it, beside a staircase of the groups with this product's step marked.
2. How close is it: every hazard on one scale of group zones (:mod:`hazard.reports.headroom`), with its margin to the
   boundaries in words.
3. From where on is it safe: the group and t_max against distance, and the distances beyond which the product is in
   each group or lower.
4. What would change it: dimming or a diffuser to reach a lower group, the uncertainty verdict, the vendor claims.
5. Where each hazard's weighted sum comes from, by wavelength (:mod:`hazard.reports.contribution_chart`).

The cautions sit under the first answer. Limits and exposure-limit formulas are on the detail pages. Everything comes
from the result; numbers are formatted by :mod:`hazard.output.formatting`.
"""

from __future__ import annotations

from dataclasses import dataclass

from reportlab.graphics.shapes import Drawing, Rect
from reportlab.lib import colors
from reportlab.platypus import Flowable, Spacer, Table

from hazard.output.formatting import (
    format_distance_mm,
    format_duration_s,
    format_fraction,
    hazard_margin_text,
    pulse_decides,
)
from hazard.reports.chart_parts import chart_text
from hazard.reports.charts import distance_chart
from hazard.reports.contribution_chart import contribution_chart
from hazard.reports.exposure_section import exposure_verdict
from hazard.reports.fonts import FontSet
from hazard.reports.headroom import DECADES_ABOVE, DECADES_BELOW, scale_header, track
from hazard.reports.layout import FRAME_WIDTH
from hazard.reports.ranking import tightest_margin
from hazard.reports.studies import remedy_lines, study_summary, uncertainty_summary
from hazard.reports.style import HAIRLINE, INK, MUTED, PANEL, RULE, Styles, group_fill
from hazard.reports.wording import (
    GROUP_MEANING,
    GROUP_NAME,
    LOWER_BOUND,
    LOWER_BOUND_MEANING,
    NOT_DETERMINED_MEANING,
    PULSE_MEANING,
    WHAT_IF_MEANING,
)
from hazard.result import Assessment, HazardResult

__all__ = ["Pages", "first_page"]


@dataclass(frozen=True)
class Pages:
    """Where the report's later sections start, for page 1's pointers."""

    details: int = 2
    studies: int = 3


def _meaning(a: Assessment, group: str) -> str:
    """What the group means; for a pulsed lamp, what the pulse rules made of it."""
    if a.emission is None:
        return GROUP_MEANING[group]
    if a.pulse_exceeds:
        return PULSE_MEANING["over"]
    if a.emission.mode == "single_pulse":
        return PULSE_MEANING["single_within"]
    return f"{GROUP_MEANING[group]} {PULSE_MEANING['train_within']}"


def _set_by(a: Assessment) -> tuple[str, str]:
    """Lead-in and text naming what sets the group, or what is missing."""
    if not a.deciding_hazards:
        return "Not assessed:", ", ".join(a.not_assessed) or "—"
    if a.risk_group == "Exempt":
        closest = tightest_margin(a)
        if closest is None:  # a result with deciding hazards has a tightest one
            raise ValueError("an Exempt result with deciding hazards but no margin")
        h = a.hazards[closest.symbol]
        return "Closest to a boundary:", f"{closest.symbol} ({h.title}), {hazard_margin_text(h)}"
    parts = [f"{s} ({a.hazards[s].title})" for s in a.deciding_hazards]
    return "Set by:", "; ".join(parts)


def _staircase(a: Assessment, fonts: FontSet, width: float) -> Drawing:
    """The groups as rising steps, this product's step filled and outlined, each step named in text."""
    groups = a.limit_set.groups
    d = Drawing(width, 74)
    step_w = (width - 6) / len(groups)
    ours = a.risk_group
    standard = a.standard_risk_group if a.basis == "what-if" else None
    labels = []
    for k, group in enumerate(groups):
        x, h = 3 + k * step_w, 12 + k * 10
        mine = group == ours
        d.add(
            Rect(
                x + 1,
                14,
                step_w - 2,
                h,
                fillColor=group_fill(group) if mine else colors.white,
                strokeColor=INK if mine else RULE,
                strokeWidth=1.6 if mine else 0.6,
                strokeDashArray=[2, 1.5] if ours is None else None,
            )
        )
        if group == standard and not mine:
            d.add(
                Rect(
                    x + 2.5,
                    15.5,
                    step_w - 5,
                    h - 3,
                    fillColor=None,
                    strokeColor=INK,
                    strokeWidth=1.0,
                    strokeDashArray=[2.5, 1.5],
                )
            )
        d.add(
            chart_text(x + step_w / 2, 4, group, fonts, 7.5, bold=mine, color=INK if mine else MUTED, anchor="middle")
        )
        if mine or group == standard:
            words = "this product" if mine else "standard's"
            labels.append(
                chart_text(min(x + step_w / 2, width - 28), 14 + h + 3, words, fonts, 6.5, bold=mine, anchor="middle")
            )
    for label in labels:  # over every step
        d.add(label)
    if ours is None:
        d.add(chart_text(width / 2, 62, "not determined", fonts, 7.5, bold=True, anchor="middle"))
    return d


def _answer(a: Assessment, st: Styles, pages: Pages) -> list[Flowable]:
    """What it is: the group in words, its meaning, what sets it; banners for what-if and lower bounds."""
    group = a.risk_group
    at = format_distance_mm(a.assessment_distance_mm)
    big = st.title.clone("answer", fontSize=16, leading=19)
    text: list[Flowable] = []
    if a.basis == "what-if":
        standard = a.standard_risk_group
        standard_words = GROUP_NAME[standard] if standard else "no group (not determined)"
        standard_mm = a.standard_assessment_distance_mm
        text.append(
            st.p(
                f"WHAT-IF at {at} — not a classification. The standard's distance"
                f"{'' if standard_mm is None else f' ({format_distance_mm(standard_mm)})'} gives {standard_words}"
                f"{'' if a.complete or standard is None else ' (lower bound)'}.",
                st.banner,
            )
        )
    if group is None:
        text += [st.p("Risk group not determined", big), st.p(NOT_DETERMINED_MEANING, st.small)]
    else:
        lead = f"What-if at {at}: " if a.basis == "what-if" else ""
        text += [
            st.p(
                f"{lead}{GROUP_NAME[group]}" + ("" if a.complete or group == a.limit_set.groups[-1] else " or higher"),
                big,
            ),
            st.p(_meaning(a, group) + ("" if a.complete else " " + LOWER_BOUND_MEANING), st.small),
        ]
    if a.basis == "what-if":
        text.append(st.p(WHAT_IF_MEANING, st.small))
    if group is not None and not a.complete:
        text.insert(0, st.p(f"{LOWER_BOUND}: {', '.join(a.not_assessed)} not assessed", st.banner))
    rule = a.geometry.distance_rule
    u = a.uncertainty
    if u is not None and u.verdict == "borderline":
        text.append(
            st.bold_lead(
                "BORDERLINE:",
                f"within the stated measurement uncertainty the group ranges from {u.risk_group_low} to "
                f"{u.risk_group_high} (page {pages.studies}).",
                st.small,
            )
        )
    text.append(st.bold_lead(*_set_by(a), st.small))
    where = rule if rule.startswith(at) else f"{at} — {rule}"
    text.append(st.bold_lead("Assessed at:", f"{where}. Values, limits and formulas: page {pages.details}.", st.small))
    side = 160
    table = Table([[text, _staircase(a, st.fonts, side)]], colWidths=[FRAME_WIDTH - side, side])
    table.setStyle(
        [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LEFTPADDING", (0, 0), (-1, -1), 0),
            ("RIGHTPADDING", (0, 0), (0, 0), 10),
            ("TOPPADDING", (0, 0), (-1, -1), 0),
        ]
    )
    return [table]


def _cautions(a: Assessment, st: Styles) -> Flowable:
    rows = [[st.p("Cautions", st.cell_bold)]] + [[st.p(f"• {c}", st.small)] for c in a.cautions]
    table = Table(rows, colWidths=[FRAME_WIDTH])
    table.setStyle(
        [
            ("BACKGROUND", (0, 0), (-1, -1), PANEL),
            ("LINEBEFORE", (0, 0), (0, -1), 2.5, INK),
            ("LEFTPADDING", (0, 0), (-1, -1), 8),
            ("TOPPADDING", (0, 0), (-1, -1), 1.5),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 1.5),
            ("TOPPADDING", (0, 0), (-1, 0), 4),
            ("BOTTOMPADDING", (0, -1), (-1, -1), 5),
        ]
    )
    return table


def _headroom_text(h: HazardResult) -> str:
    """A hazard's group and margin in words, with its t_max when the exposure limit is reached."""
    t_max = f"; t_max {format_duration_s(h.t_max_s)}" if h.t_max_s is not None else ""
    if h.risk_group is None:
        if h.pulse is not None:
            return f"no risk groups; a pulse at {format_fraction(h.pulse.worst)}"
        reached = f"exposure limit reached in {format_duration_s(h.t_max_s)}" if h.t_max_s else "limit not reached"
        return f"no risk groups; {reached}"
    nothing = " (value 0: nothing emitted in its band)" if h.value == 0 else ""
    return f"{h.risk_group} · {hazard_margin_text(h)}{t_max}{nothing}"


def _headroom(a: Assessment, st: Styles) -> list[Flowable]:
    """How close each hazard is to its boundaries: one row per hazard on the shared scale."""
    groups, boundaries = a.limit_set.groups, a.limit_set.boundaries
    label_w, note_w = 118.0, 168.0
    track_w = FRAME_WIDTH - label_w - note_w
    rows: list[list] = [["", scale_header(groups, boundaries, track_w - 6, st.fonts), ""]]
    spans: list[tuple] = []
    for i, h in enumerate(a.hazards.values(), start=1):
        label = st.p("", st.cell, markup=f"<b>{st.text(h.symbol)}</b> {st.text(h.title)}")
        if not h.assessed:
            rows.append([label, st.p(h.note, st.cell), ""])
            spans.append(("SPAN", (1, i), (2, i)))
        elif h.limits and h.margins and not pulse_decides(h):
            rows.append([label, track(h, groups, track_w - 6), st.p(_headroom_text(h), st.cell)])
        else:
            rows.append([label, st.p(_headroom_text(h), st.cell), ""])
            spans.append(("SPAN", (1, i), (2, i)))
    table = Table(rows, colWidths=[label_w, track_w, note_w], rowHeights=[22] + [None] * (len(rows) - 1))
    table.setStyle(
        [
            ("VALIGN", (0, 0), (-1, -1), "MIDDLE"),
            ("LEFTPADDING", (0, 0), (-1, -1), 3),
            ("RIGHTPADDING", (0, 0), (-1, -1), 3),
            ("TOPPADDING", (0, 0), (-1, -1), 1.2),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 1.2),
            ("LINEBELOW", (0, 1), (-1, -1), 0.3, HAIRLINE),
            *spans,
        ]
    )
    caption = (
        f"Each row: the hazard's value placed between its group limits as applied. The limits sit at the same "
        f"places in every row; within a zone the place is proportional (log scale) between the limits bounding it; "
        f"left of the Exempt limit the zone spans {DECADES_BELOW} decades, right of the RG2 limit {DECADES_ABOVE}. "
        f"Hatched: a zone the hazard cannot be in (two of its limits coincide). t_max: time to its exposure limit."
    )
    return [st.p("How close each hazard is to the next group", st.h2), table, Spacer(1, 2), st.p(caption, st.caption)]


def _distance(a: Assessment, st: Styles, pages: Pages) -> list[Flowable]:
    """From where on it is safe: the distance chart and the distances in words, or why there are none."""
    heading = st.p("From where on it is safe", st.h2)
    summary = study_summary(a, pages.studies)
    if a.distances is None:
        return [heading, st.p(f"No distance study in this result: {_no_study(a)}.", st.small)]
    chart = distance_chart(a, FRAME_WIDTH * 0.6 - 6, 132, st.fonts, legend=False)
    words = st.bold_lead("Distances:", summary or "—", st.small)
    return [heading, chart, Spacer(1, 1), words]


def _changes(a: Assessment, st: Styles, pages: Pages) -> list[Flowable]:
    """What would change it: remedies, the uncertainty verdict, the claims, pulses and the stated day."""
    out: list[Flowable] = [st.p("What would change it", st.h2)]
    if a.remedies is not None:
        out.append(st.bold_lead("To reach a lower group:", "; ".join(remedy_lines(a)), st.small))
    else:
        out.append(
            st.bold_lead("To reach a lower group:", f"no remedies study in this result: {_no_study(a)}", st.small)
        )
    if a.uncertainty is not None:
        out.append(st.bold_lead(*uncertainty_summary(a, pages.studies), st.small))
    else:
        stated = a.record.get("uncertainty_pct") or a.record.get("wavelength_uncertainty_nm")
        why = _no_study(a) if stated else "the record states no measurement uncertainty"
        out.append(st.bold_lead("Uncertainty:", f"not studied: {why}", st.small))
    if a.claims:
        out.append(st.bold_lead("Vendor claims:", _claims_summary(a, pages.details), st.small))
    pulse = [h for h in a.hazards.values() if h.pulse is not None]
    if pulse:
        worst = max(pulse, key=lambda h: h.pulse.worst if h.pulse else 0.0)
        if worst.pulse is not None:
            out.append(
                st.bold_lead(
                    "Pulses:", f"the largest, {worst.symbol}, at {format_fraction(worst.pulse.worst)}", st.small
                )
            )
    if a.exposure is not None:  # a stated working day over the limit values is news for page 1
        verdict, most = exposure_verdict(a.exposure)
        text = "; ".join(
            filter(None, (f"{verdict} of {a.exposure.limit_set}", most.rstrip(".").replace("Most", "most")))
        )
        text += f" (page {pages.studies} on)"
        out.append(st.bold_lead("Stated day:", text, st.small))
    if a.photometry.visible_negligible:
        out.append(st.bold_lead("Light:", "the visible emission is negligible; no colour is given", st.small))
    return out


def _no_study(a: Assessment) -> str:
    """Why the result holds no study."""
    if a.risk_group is None:
        return "no risk group could be determined, so there is nothing to study"
    return "the studies were not asked for ('hazard batch --studies' computes them)"


def _claims_summary(a: Assessment, page: int) -> str:
    """The vendor claims' verdicts in one line, naming the contradicted ones."""
    parts = []
    for verdict in ("contradicted", "inconclusive", "not checkable", "consistent"):
        found = [c for c in a.claims if c.verdict == verdict]
        if not found:
            continue
        text = f"{len(found)} {verdict.upper() if verdict in ('contradicted', 'inconclusive') else verdict}"
        if verdict == "contradicted":
            text += " (" + "; ".join(f"{c.claim}: claimed {c.claimed}, computed {c.computed}" for c in found) + ")"
        parts.append(text)
    return ", ".join(parts) + f" — page {page}"


def _contributions(a: Assessment, st: Styles) -> list[Flowable]:
    if not a.contributions:
        return []
    return [
        st.p("Where each hazard's weighted sum comes from", st.h2),
        contribution_chart(a, FRAME_WIDTH, st.fonts),
        st.p(
            "Top: the measured spectrum relative to its peak. Under it, each hazard's value split by wavelength "
            "band (5 nm for the UV and blue-light hazards, 10 nm for retinal thermal, 20 nm for the infrared and skin "
            "hazards), each strip scaled to its largest band; pale: the hazard's wavelength range. A hazard "
            "under a thousandth of every limit is not split (its value is noise or a far tail).",
            st.caption,
        ),
    ]


def first_page(a: Assessment, st: Styles, heading: Flowable, pages: Pages) -> list[Flowable]:
    """Page 1's flowables, under ``heading``."""
    left = _distance(a, st, pages)
    right = _changes(a, st, pages)
    middle = Table([[left, right]], colWidths=[FRAME_WIDTH * 0.6, FRAME_WIDTH * 0.4])
    middle.setStyle(
        [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LEFTPADDING", (0, 0), (-1, -1), 0),
            ("RIGHTPADDING", (0, 0), (0, 0), 8),
            ("RIGHTPADDING", (1, 0), (1, 0), 0),
            ("TOPPADDING", (0, 0), (-1, -1), 0),
        ]
    )
    return [
        heading,
        Spacer(1, 6),
        *_answer(a, st, pages),
        Spacer(1, 5),
        _cautions(a, st),
        *_headroom(a, st),
        middle,
        *_contributions(a, st),
    ]
