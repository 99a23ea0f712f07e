"""The product report's section on distance, uncertainty and remedies.

Also the short texts page 1 and the batch summary print from the same studies.

Everything comes from the result's ``distances``, ``uncertainty`` and ``remedies``; this module only words and
formats them (and picks which family member's unit to print). Numbers follow the text output
(:mod:`hazard.output.text`): distances in whole millimetres, factors with three significant digits.
"""

from __future__ import annotations

from reportlab.platypus import Flowable, Spacer, Table

from hazard.output.formatting import (
    UNIT_DISPLAY,
    dimming_percent,
    distance_beyond_mm,
    format_distance_mm,
    format_percent,
    format_stated,
    format_times,
    format_value,
    round_up,
)
from hazard.reports.charts import distance_chart
from hazard.reports.exposure_section import exposure_blocks
from hazard.reports.layout import FRAME_WIDTH
from hazard.reports.style import INK, Styles, group_fill, group_ink, table_style
from hazard.result import Assessment, BoundaryDistance, DistanceStudy, Remedies, Remedy, UncertaintyStudy

__all__ = [
    "SECTION_TITLE",
    "area_text",
    "beyond",
    "dimming_text",
    "has_studies",
    "minimum_text",
    "remedy_lines",
    "studies_section",
    "study_summary",
    "uncertainty_summary",
]

SECTION_TITLE = "Distance, uncertainty and remedies"


def has_studies(a: Assessment) -> bool:
    """The result carries at least one of the distance, uncertainty, remedies and daily-exposure studies."""
    return any(study is not None for study in (a.distances, a.uncertainty, a.remedies, a.exposure))


def beyond(distance_mm: float | None, study: DistanceStudy, metres: bool = True) -> str:
    """A boundary or minimum distance as printed: ``'1590 mm (1.59 m)'``; 0 and None in words.

    Parameters
    ----------
    distance_mm : float or None
        The study's distance: 0 when the group holds from the nearest distance studied, None when it is
        not reached within the farthest.
    study : DistanceStudy
        For the range studied.
    metres : bool
        Add the distance in metres from 1 m on.

    Examples
    --------
    >>> s = DistanceStudy(distance_mm=[10.0, 1e5], group=["RG1", "Exempt"], family_group={}, t_max_s={},
    ...                   boundaries=[], minimum_distance_mm={}, near_field_below_mm=50.0)
    >>> beyond(1589.66, s), beyond(25.2, s, metres=False), beyond(0.0, s), beyond(None, s)
    ('1590 mm (1.59 m)', '26 mm', 'from 10 mm', 'not within 100 m')
    """
    if distance_mm is None:
        return f"not within {format_stated(study.distance_mm[-1] / 1000)} m"
    if distance_mm == 0:
        return f"from {format_distance_mm(study.distance_mm[0])}"
    text = distance_beyond_mm(distance_mm)
    return text + (f" ({round_up(distance_mm / 1000)} m)" if metres and distance_mm >= 1000 else "")


def minimum_text(study: DistanceStudy, group: str, metres: bool = True) -> str:
    """The product's minimum distance for ``group`` as printed (:func:`beyond`).

    "not assessed" when no hazard family could be assessed against that boundary (the study then gives 0).
    """
    if all(b.note == "not assessed" for b in study.boundaries if b.group == group):
        return "not assessed"
    return beyond(study.minimum_distance_mm.get(group), study, metres)


def dimming_text(factor: float | None) -> str:
    """A dimming factor as an instruction: ``'reduce to 1.58 % of today's output'``.

    Examples
    --------
    >>> dimming_text(0.015829), dimming_text(None)
    ("reduce to 1.58 % of today's output", 'not reachable by dimming')
    """
    if factor is None:
        return "not reachable by dimming"
    return f"reduce to {dimming_percent(factor)} of today's output"


def area_text(factor: float | None) -> str:
    """An area factor as an instruction: ``'enlarge emitting area ×836'``.

    Three significant digits rounded up (:func:`format_times`), so the printed enlargement always reaches the group;
    an em dash when there is none.

    Examples
    --------
    >>> area_text(835.56), area_text(8069.6), area_text(1.41421), area_text(None)
    ('enlarge emitting area ×836', 'enlarge emitting area ×8070', 'enlarge emitting area ×1.42', '—')
    """
    if factor is None:
        return "—"
    return f"enlarge emitting area ×{format_times(factor)}"


def _member(a: Assessment, family: str) -> str | None:
    """The family member assessed at the assessment distance (blue light: L_B or E_B), if any."""
    for symbol in a.limit_set.families.get(family, [family]):
        if symbol in a.hazards and a.hazards[symbol].assessed:
            return symbol
    return None


def _family_label(a: Assessment, family: str) -> str:
    member = _member(a, family)
    return family if member is None or member == family else f"{family} ({member})"


def _group_range(low: str | None, high: str | None) -> str:
    if low == high:
        return low or "—"
    return f"{low} to {high}"


def study_summary(a: Assessment, page: int) -> str | None:
    """One line for page 1: the product's minimum distance per group.

    ``page`` is where the section starts. None when the result has no distance study.
    """
    s = a.distances
    if s is None:
        return None
    distances = []
    for group in a.limit_set.boundaries:  # up to the first group that holds at every distance studied
        distance = s.minimum_distance_mm.get(group)
        name = group if group == "Exempt" else f"{group} or lower"
        if minimum_text(s, group) == "not assessed":
            distances.append("no hazard family assessed at any distance")
            break
        if distance == 0:
            if not distances:
                distances.append(f"{name} at every distance {beyond(distance, s)}")
            break
        distances.append(f"{name} {'beyond ' if distance else ''}{beyond(distance, s, metres=False)}")
    return ", ".join(distances) + ("" if a.complete else " (assessed hazards only)") + f" — page {page}"


def remedy_lines(a: Assessment) -> list[str]:
    """For page 1: per lower group, the dimming (and a diffuser's enlargement) that brings the whole product there.

    Empty without a remedies study.
    """
    if a.remedies is None:
        return []
    lines = []
    for r in _product_remedies(a.remedies):
        how = (
            f"{r.group} at {dimming_percent(r.dimming_factor)} of today's output"
            if r.dimming_factor is not None
            else f"{r.group}: not reachable by dimming"
        )
        if r.area_factor is not None:
            how += f", or with a diffuser: {area_text(r.area_factor)}"
        lines.append(how)
    if lines and not a.complete:
        lines.append("from the measured data only: hazards not assessed may need more")
    if not lines:
        lines.append(
            "already in the lowest group"
            + ("" if a.complete else " for the assessed hazards")
            + (f" at {format_distance_mm(a.assessment_distance_mm)} (what-if)" if a.basis == "what-if" else "")
            if a.risk_group == a.limit_set.groups[0]
            else "no remedy in this result"
        )
    return lines


def uncertainty_summary(a: Assessment, page: int) -> tuple[str, str]:
    """Lead-in and text for page 1: the verdict in capitals and the study's note.

    ``page`` is where the section starts.
    """
    u = a.uncertainty
    if u is None:
        raise ValueError("the result holds no uncertainty study")
    return "Uncertainty:", f"{u.verdict.upper()} — {u.note} (page {page})"


def _product_remedies(remedies: Remedies) -> list[Remedy]:
    return [r for r in remedies.remedies if r.target == "product"]


def _distance_table(a: Assessment, s: DistanceStudy, st: Styles) -> Flowable:
    near = s.near_field_below_mm
    head = ["Beyond: in the group or lower", *a.limit_set.boundaries]
    rows = [[st.p(h, st.head) for h in head]]

    def cell(
        distance: float | None, criterion: str | None, note: str | None, style, group: str | None = None
    ) -> Flowable:
        if distance is None and note is not None:
            return st.p(note, st.cell)
        text = beyond(distance, s) if group is None else minimum_text(s, group)
        if criterion:
            text += f", by {criterion}"
        if distance and distance < near:
            text += " *"
        return st.p(text, style)

    rows.append(
        [st.p("Whole product", st.cell_bold)]
        + [cell(s.minimum_distance_mm.get(g), None, None, st.cell_bold, g) for g in a.limit_set.boundaries]
    )
    by_family: dict[str, dict[str, BoundaryDistance]] = {}
    for b in s.boundaries:
        if b.note != "not assessed":  # a family that was not assessed has nothing true to say about distance
            by_family.setdefault(b.family, {})[b.group] = b
    for family, found in by_family.items():
        cells = []
        for group in a.limit_set.boundaries:
            at = found.get(group)
            if at is None:
                cells.append(st.p("—", st.cell))
                continue
            criterion = at.criterion if at.criterion and at.criterion != family else None
            cells.append(cell(at.distance_mm, criterion, None if at.distance_mm is not None else at.note, st.cell))
        rows.append([st.p(family, st.cell_bold), *cells])
    first = max(st.bold_width(label) for label in ["Whole product", *by_family])
    table = Table(rows, colWidths=[first] + [(FRAME_WIDTH - first) / 3] * 3, repeatRows=1)
    table.setStyle(table_style(extra=[("LINEBELOW", (0, 1), (-1, 1), 0.6, INK)]))
    return table


def _uncertainty_block(a: Assessment, u: UncertaintyStudy, st: Styles) -> list[Flowable]:
    shift = f"{format_stated(u.wavelength_uncertainty_nm)} nm"
    head = ["Hazard family", "Lowest – highest value", f"λ −{shift} / +{shift}", "Unit", "Group within it"]
    rows = [[st.p(h, st.head) for h in head]]
    for h in u.hazards:
        member = _member(a, h.family)
        unit = a.hazards[member].unit if member else ""
        changes = h.group_low != h.group_high
        group_text = _group_range(h.group_low, h.group_high) + (" (changes)" if changes else "")
        rows.append(
            [
                st.p(_family_label(a, h.family), st.cell_bold),
                st.p(f"{format_value(h.value_low)} – {format_value(h.value_high)}", st.cell),
                st.p(f"{format_value(h.value_shift_minus)} / {format_value(h.value_shift_plus)}", st.cell),
                st.p(UNIT_DISPLAY.get(unit, unit) or "—", st.cell),
                st.p(group_text, st.cell_bold if changes else st.cell),
            ]
        )
    widths = [100, 100, 100, 56, 0]
    widths[-1] = FRAME_WIDTH - sum(widths)
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style())
    overall = _group_range(u.risk_group_low, u.risk_group_high)
    verdict = st.p(f" — overall group {overall}: {u.note}.", st.body, markup=f"<b>{u.verdict.upper()}</b>")
    return [
        st.p(
            f"Within the measurement uncertainty (±{format_stated(u.uncertainty_pct)} % scale, k = 2; ±{shift} "
            f"wavelength)",
            st.h3,
        ),
        verdict,
        Spacer(1, 2),
        table,
        Spacer(1, 2),
        st.p(
            "Nine variants: the spectrum scaled by 1 ± the uncertainty, its wavelength scale shifted by ± the "
            "stated amount; λ columns: the shifts alone. Radiance: the source's own, as in the hazard table. "
            "BORDERLINE: the overall group differs between variants; ROBUST: it does not.",
            st.caption,
        ),
    ]


def _remedies_block(a: Assessment, r: Remedies, st: Styles) -> list[Flowable]:
    head = ["Target", "Now", "To reach", "Dimming (or a neutral filter)", "Diffuser (same power)"]
    rows = [[st.p(h, st.head) for h in head]]
    extra, targets = [], ["Target"]

    def same(x: Remedy) -> tuple:
        return x.group, x.dimming_factor, x.area_factor

    product = _product_remedies(r)
    first_family: dict[tuple, str] = {}  # a family row that says what a product row says is folded into it
    for x in r.remedies:
        if x.target != "product":
            first_family.setdefault(same(x), x.target)
    families = [x for x in r.remedies if x.target != "product" and same(x) not in {same(p) for p in product}]
    for i, x in enumerate(product + families, start=1):
        if x.target == "product":
            target, now = "Whole product", a.risk_group
            if same(x) in first_family:
                target += f" (as {first_family[same(x)]})"
        else:
            member = _member(a, x.target)
            target = _family_label(a, x.target)
            now = a.hazards[member].risk_group if member else None
        style = st.cell_bold if x.target == "product" else st.cell
        targets.append(target)
        rows.append(
            [
                st.p(target, style),
                st.p(now or "—", st.cell_bold.clone("now", textColor=group_ink(now))),
                st.p(x.group, st.cell_bold.clone("to", textColor=group_ink(x.group))),
                st.p(dimming_text(x.dimming_factor), style),
                st.p(area_text(x.area_factor), style),
            ]
        )
        extra += [("BACKGROUND", (1, i), (1, i), group_fill(now)), ("BACKGROUND", (2, i), (2, i), group_fill(x.group))]
    if len(rows) == 1:
        nothing = (
            "nothing to remedy: the product is already Exempt" + ("." if a.complete else " (for the assessed hazards).")
            if a.risk_group == "Exempt"
            else "no remedy in this result."
        )
        return [st.p("What it would take", st.h3), st.p(nothing[0].upper() + nothing[1:], st.small)]
    group_w = st.bold_width("Exempt")
    target_w = max(st.bold_width(target) for target in targets)
    widths = [target_w, group_w, group_w, 0, 140]
    widths[3] = FRAME_WIDTH - sum(widths)
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style(extra=extra))
    out = [st.p("What it would take", st.h3), table, Spacer(1, 2)]
    bands = []
    for symbol, found in r.uv_bands.items():
        if found:
            top = ", ".join(
                f"{format_stated(b.band_nm[0])}–{format_stated(b.band_nm[1])} nm ({format_percent(b.share)})"
                for b in found[:3]
            )
            bands.append(
                st.bold_lead(f"{symbol} comes mostly from", top + " (5 nm bands, share of the total)", st.small)
            )
    out += [*bands, Spacer(1, 2)] if bands else []
    out.append(
        st.p(
            f"{r.note} A diffuser lowers the radiance hazards only (—: not applicable to this target, or "
            f"not reachable).",
            st.caption,
        )
    )
    return out


def studies_section(a: Assessment, st: Styles) -> list[list[Flowable]]:
    """The section "Distance, uncertainty and remedies": whichever of the three studies the result holds.

    Parameters
    ----------
    a : Assessment
        A result with at least one study (:func:`has_studies`).
    st : Styles

    Returns
    -------
    list of list of Flowable
        Blocks to keep together when the section runs over a page (the distance table may split).
    """
    missing = [
        name
        for name, study in (
            ("hazard distances", a.distances),
            ("measurement uncertainty", a.uncertainty),
            ("remedies", a.remedies),
        )
        if study is None
    ]
    intro = (
        "The product re-assessed by the tool (same spectrum and geometry) across distance, within the stated "
        "uncertainty, and dimmed or diffused; this report only prints the results."
    )
    if missing:
        intro += f" Not in this result: {', '.join(missing)}."
    blocks: list[list[Flowable]] = [
        [st.p(SECTION_TITLE, st.h2.clone("h2_top", spaceBefore=0)), st.p(intro, st.caption)]
    ]
    if a.distances is not None:
        s = a.distances
        chart = distance_chart(a, FRAME_WIDTH, 190, st.fonts)
        never = [family for family, ts in s.t_max_s.items() if all(t is None for t in ts)]
        near = s.near_field_below_mm > s.distance_mm[0]
        caption = (
            "Top strip: the overall group at each distance (text labels). Curves: t_max, the time to each "
            "exposure limit, per hazard family; a gap where the limit is not reached within its time "
            "range."
            + (f" No curve ({', '.join(never)}): not reached at any distance studied." if never else "")
            + " Vertical line and triangle: the assessment distance."
            + (
                f" Shaded: the near field, under {distance_beyond_mm(s.near_field_below_mm)} (five source "
                f"sizes), where inverse-square values are approximate."
                if near
                else ""
            )
        )
        blocks += [
            [st.p("Group and t_max against distance", st.h3), chart, st.p(caption, st.caption)],
            [Spacer(1, 4)],
            [_distance_table(a, s, st)],
            [
                Spacer(1, 2),
                st.p(
                    (
                        f"* nearer than {distance_beyond_mm(s.near_field_below_mm)}: approximate (near field). "
                        if near
                        else ""
                    )
                    + (
                        ""
                        if a.complete
                        else "Incomplete result: the whole-product distances cover the assessed hazards only. "
                    )
                    + f'"by L_B": the family member that applies there. Studied from '
                    f"{format_distance_mm(s.distance_mm[0])} to {format_stated(s.distance_mm[-1] / 1000)} m.",
                    st.caption,
                ),
            ],
        ]
    if a.uncertainty is not None:
        blocks.append(_uncertainty_block(a, a.uncertainty, st))
    if a.remedies is not None:
        blocks.append(_remedies_block(a, a.remedies, st))
    return blocks + exposure_blocks(a, st)
