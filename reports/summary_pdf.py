"""The PDF summary of a batch.

Products ranked by group and headroom (flagging incomplete and borderline results and contradicted vendor claims), then
the products that failed, then the cautions chosen.

The order comes from :func:`hazard.reports.ranking.rank_assessments`; every number is formatted by
:mod:`hazard.output.formatting`.
"""

from __future__ import annotations

import datetime

from reportlab.platypus import Flowable, KeepTogether, Spacer, Table

from hazard.assessment.lab_plan import PlanItem
from hazard.output.formatting import format_distance_mm, format_stated, group_words, hazard_margin_text, what_if_prefix
from hazard.reports.layout import FRAME_WIDTH, LEAST_SCALE, build_pdf, fit_page, heading_table, start_report
from hazard.reports.plan_section import plan_section
from hazard.reports.ranking import BORDERLINE_FACTOR, is_borderline, rank_assessments, ranks_by_margin, tightest_margin
from hazard.reports.studies import minimum_text
from hazard.reports.style import INK, NEUTRAL, Styles, group_fill, group_ink, table_style
from hazard.reports.timestamp import format_report_time
from hazard.result import Assessment
from hazard.standards import GROUPS

__all__ = ["render_summary_pdf"]


def _heading(
    assessments: list[Assessment], errors: list[tuple[str, str]], st: Styles, moment: datetime.datetime
) -> Flowable:
    tools = ", ".join(f"hazard {v}" for v in sorted({a.provenance.tool_version for a in assessments})) or "—"
    limit_sets = ", ".join(sorted({a.provenance.limit_set for a in assessments})) or "—"
    left = [
        st.p("PHOTOBIOLOGICAL SAFETY PRE-SCREEN · BATCH SUMMARY", st.kicker),
        st.p(f"{len(assessments)} products assessed, {len(errors)} failed", st.title),
    ]
    right = [
        st.bold_lead("Report date", format_report_time(moment), st.small),
        st.bold_lead("Tool", tools, st.small),
        st.bold_lead("Limit set", limit_sets, st.small),
    ]
    return heading_table(left, right)


def _counts(assessments: list[Assessment], st: Styles) -> Flowable:
    """One labelled cell per group with its count, then the incomplete and borderline counts."""
    cells, style = [], []
    for i, group in enumerate(reversed(GROUPS)):
        count = sum(a.classification_group == group for a in assessments)
        cells.append(
            st.p(f"{group}: {count}", st.cell_bold.clone(f"n{group}", textColor=group_ink(group), alignment=1))
        )
        style.append(("BACKGROUND", (i, 0), (i, 0), group_fill(group)))
    undetermined = sum(a.classification_group is None for a in assessments)
    if undetermined:
        cells.append(st.p(f"not determined: {undetermined}", st.cell_bold))
        style.append(("BACKGROUND", (len(cells) - 1, 0), (len(cells) - 1, 0), NEUTRAL))
    cells.append(st.p(f"incomplete: {sum(not a.complete for a in assessments)}", st.cell_bold))
    what_if = sum(a.basis == "what-if" for a in assessments)
    if what_if:
        cells.append(st.p(f"what-if: {what_if}", st.cell_bold))
    borderline = sum(ranks_by_margin(a) and is_borderline(a) for a in assessments)  # of the classifications
    cells.append(st.p(f"borderline: {borderline}", st.cell_bold))
    table = Table([cells], colWidths=[FRAME_WIDTH / len(cells)] * len(cells))
    table.setStyle(
        [
            *style,
            ("BOX", (0, 0), (-1, -1), 0.8, INK),
            ("INNERGRID", (0, 0), (-1, -1), 0.8, INK),
            ("TOPPADDING", (0, 0), (-1, -1), 3),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 4),
        ]
    )
    return table


def _flags(a: Assessment, st: Styles) -> Flowable:
    """WHAT-IF, BORDERLINE, contradicted and inconclusive vendor claims, in words; an em dash when there is none.

    A what-if's BORDERLINE is at its own distance, and says so.
    """
    contradicted = sum(c.verdict == "contradicted" for c in a.claims)
    inconclusive = sum(c.verdict == "inconclusive" for c in a.claims)
    by_study = (
        ""
        if a.uncertainty is None
        else (
            f" (within ±{format_stated(a.uncertainty.uncertainty_pct)} %, "
            f"±{format_stated(a.uncertainty.wavelength_uncertainty_nm)} nm)"
        )
    )
    at = format_distance_mm(a.assessment_distance_mm)
    what_if = (
        [f"<b>WHAT-IF</b> at {at} gives {st.text(group_words(a.risk_group, a.complete))}"]
        if a.basis == "what-if"
        else []
    )
    where = "" if ranks_by_margin(a) else f" at the what-if distance ({at})"
    flags = (
        what_if
        + ([f"<b>BORDERLINE</b>{where}{by_study}"] if is_borderline(a) else [])
        + (
            [f"<b>{contradicted}</b> vendor claim{'s' if contradicted > 1 else ''} <b>CONTRADICTED</b>"]
            if contradicted
            else []
        )
        + (
            [f"<b>{inconclusive}</b> vendor claim{'s' if inconclusive > 1 else ''} <b>INCONCLUSIVE</b>"]
            if inconclusive
            else []
        )
    )
    return st.p("", st.cell, markup="<br/>".join(flags) or "—")


def _min_distance(a: Assessment) -> str:
    """The product's minimum distance to Exempt as its report prints it; an em dash without a distance study."""
    if a.distances is None:
        return "—"
    return minimum_text(a.distances, "Exempt", metres=False)


def _ranked_table(assessments: list[Assessment], st: Styles) -> Flowable:
    distances = any(a.distances is not None for a in assessments)
    head = ["#", "ID", "Name", "Group", "Complete", "Deciding hazards", "Tightest margin", "Flags"]
    if distances:
        head.insert(7, "Min. distance to Exempt")
    rows = [[st.p(h, st.head) for h in head]]
    extra: list[tuple] = []
    for rank, a in enumerate(rank_assessments(assessments), start=1):
        tightest = tightest_margin(a)
        at = what_if_prefix(a)  # a what-if's deciding hazards and margin are at its own distance
        if tightest is None:
            margin = "—"
        else:
            h = a.hazards[tightest.symbol]
            margin = f"{at}{tightest.symbol}: {hazard_margin_text(h)}"
        rows.append(
            [
                st.p(str(rank), st.cell),
                st.p(a.id, st.cell_bold),
                st.p(a.name or "—", st.cell),
                st.p(
                    group_words(a.classification_group, a.complete),
                    st.cell_bold.clone("g", textColor=group_ink(a.classification_group)),
                ),
                st.p("yes", st.cell)
                if a.complete
                else st.bold_lead("INCOMPLETE", f"lower bound; not assessed: {', '.join(a.not_assessed)}", st.cell),
                st.p(at + ", ".join(a.deciding_hazards) if a.deciding_hazards else "—", st.cell),
                st.p(margin, st.cell),
                *([st.p(_min_distance(a), st.cell)] if distances else []),
                _flags(a, st),
            ]
        )
        group = a.classification_group
        extra.append(("BACKGROUND", (3, rank), (3, rank), group_fill(group) if group else NEUTRAL))
    if len(rows) == 1:
        rows.append([st.p("no products assessed", st.cell)] + [""] * (len(head) - 1))
        extra.append(("SPAN", (0, 1), (-1, 1)))
    widths = [
        18,
        max(st.bold_width(text) for text in ["ID", *(a.id for a in assessments)]),
        0,
        st.bold_width("Exempt"),
        66,
        60,
        84,
        st.bold_width("CONTRADICTED"),
    ]
    if distances:  # room for the column: narrower completeness and margin columns, which may wrap
        widths[4], widths[6] = 50, 76
        widths.insert(7, 46)
    widths[2] = FRAME_WIDTH - sum(widths)
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style(extra=extra))
    return table


def _failed_table(errors: list[tuple[str, str]], st: Styles) -> Flowable:
    """The failed products with the first line of each reason; a sentence when there are none."""
    if not errors:
        return st.p("None: every product was assessed.", st.small)
    rows = [[st.p("ID", st.head), st.p("Why it could not be assessed", st.head)]]
    rows += [
        [st.p(product, st.cell_bold), st.p((reason.strip().splitlines() or ["—"])[0], st.cell)]
        for product, reason in errors
    ]
    id_width = min(FRAME_WIDTH / 3, max(st.bold_width(product) for product, _ in [("ID", ""), *errors]))
    table = Table(rows, colWidths=[id_width, FRAME_WIDTH - id_width], repeatRows=1)
    table.setStyle(table_style())
    return table


def _cautions(assessments: list[Assessment], st: Styles) -> list[Flowable]:
    """Each distinct caution once, in order of first appearance, with the products it was chosen for."""
    products: dict[str, list[str]] = {}
    for a in rank_assessments(assessments):
        for caution in a.cautions:
            products.setdefault(caution, []).append(a.id)
    return [
        st.bold_lead(f"• {'All products' if len(ids) == len(assessments) else ', '.join(ids)}:", caution, st.small)
        for caution, ids in products.items()
    ] or [st.p("none: no product assessed", st.small)]


def render_summary_pdf(
    assessments: list[Assessment],
    errors: list[tuple[str, str]],
    rendered_at: datetime.datetime | None = None,
    plan: list[PlanItem] | None = None,
) -> bytes:
    """A batch overview as a PDF: ranked products, failed products, and the cautions chosen for them.

    Parameters
    ----------
    assessments : list of Assessment
        The products assessed.
    errors : list of (str, str)
        Products that could not be assessed: id (or file) and the reason; the reason's first line is shown.
    rendered_at : datetime.datetime, optional
        Timezone-aware time printed as the report date; defaults to :func:`reports.report_time`.
    plan : list of PlanItem, optional
        The ranked laboratory test plan (:func:`hazard.assessment.lab_plan.rank_plan`): a section before the
        cautions when given.

    Returns
    -------
    bytes
        The PDF; the same input and ``rendered_at`` give identical bytes.

    Raises
    ------
    ValueError
        When ``rendered_at`` has no timezone.
    """
    moment, fonts, st = start_report(rendered_at)
    versions = sorted({a.provenance.tool_version for a in assessments})
    low, high = 1 / BORDERLINE_FACTOR, BORDERLINE_FACTOR
    story = [
        _heading(assessments, errors, st, moment),
        Spacer(1, 6),
        _counts(assessments, st),
        st.p("Products, highest risk first", st.h2),
        _ranked_table(assessments, st),
        Spacer(1, 2),
        st.p(
            f"Ranked by the group at the standard's distance (RG3 first); within a group BORDERLINE products first "
            f"(the ones to send to the laboratory), then by the deciding hazard closest to its next boundary (largest "
            f"value ÷ limit first), then by id. Tightest margin: that hazard's value ÷ limit at its group's upper "
            f"boundary (RG3: multiple of the RG2 limit). BORDERLINE: with an uncertainty study (the record states its "
            f"measurement uncertainty), the overall group changes within it; without one, the tightest hazard "
            f"lies within a factor {format_stated(high)} of a group boundary on either side ({format_stated(low)}–"
            f"{format_stated(high)} × the limit), so "
            f"a modest measurement error could change its group. An INCOMPLETE product's group is a lower bound; "
            f"'not determined': no hazard with risk groups could be assessed, nothing is known. WHAT-IF: assessed "
            f"at a distance the record asks for, not a classification: the Group column holds the standard's group, "
            f"and the what-if's own figures (deciding hazards, margin, BORDERLINE) are marked as the what-if's; it "
            f"ranks after the products of its group assessed at the standard's distance. "
            f"CONTRADICTED: a vendor claim in the record that the result does not bear out at any variant of its "
            f"stated uncertainty; INCONCLUSIVE: it holds at some variants and fails at others (see its report)."
            + (
                " Min. distance to Exempt: beyond it the product is Exempt (its report's distance study; —: none "
                "in the result)."
                if any(a.distances is not None for a in assessments)
                else ""
            ),
            st.caption,
        ),
        st.p("Products that could not be assessed", st.h2),
        _failed_table(errors, st),
        *(plan_section(plan, st) if plan is not None else []),
    ]
    cautions = [st.p("Cautions", st.h2), *_cautions(assessments, st)]
    fitted = fit_page([*story, *cautions], LEAST_SCALE)  # slightly long: shrunk onto one page
    return build_pdf(
        fitted if len(fitted) == 1 else [*story, KeepTogether(cautions)],  # else never a lone bullet on a page
        fonts,
        title="Photobiological safety pre-screen — batch summary",
        header="Photobiological safety pre-screen — batch summary",
        author=f"hazard {', '.join(versions) or '—'}",
        identity=next((a.provenance.identity.header_text() for a in assessments if a.provenance.identity), ""),
        moment=moment,
    )
