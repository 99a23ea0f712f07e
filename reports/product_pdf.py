"""The PDF report of one product.

Page 1 answers the reader's questions (:mod:`hazard.reports.page_one`); page 2 holds the hazards in detail (values,
limits as applied, exposure-limit formulas, geometry, claims, pulses, warnings); then, when the result holds any of
them, the section on distance, uncertainty and remedies (:mod:`hazard.reports.studies`); the input and its provenance
and the cautions in full end the report.

Everything printed comes from the :class:`~hazard.result.Assessment`; numbers are formatted by
:mod:`hazard.output.formatting`, exactly as the text output prints them.
"""

from __future__ import annotations

import datetime
from collections.abc import Callable

from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import CondPageBreak, Flowable, KeepTogether, PageBreak, Spacer, Table

from hazard.output.formatting import (
    UNIT_DISPLAY,
    computed_text,
    format_distance_mm,
    format_duration_s,
    format_limit,
    format_stated,
    format_value,
    group_words,
    hazard_margin_text,
    photometry_text,
    source_size_text,
    unit_text,
)
from hazard.reports.exposure_section import emission_block
from hazard.reports.layout import FRAME_WIDTH, LEAST_SCALE, build_pdf, fit_page, heading_table, start_report
from hazard.reports.page_one import Pages, first_page
from hazard.reports.studies import has_studies, studies_section
from hazard.reports.style import HAIRLINE, Styles, fit_widths, group_fill, group_ink, table_style
from hazard.reports.timestamp import format_report_time
from hazard.result import Assessment, BlueLightTransfer, HazardResult, ReportIdentity, Scaling

__all__ = ["render_assessment_pdf"]

_ANCHOR = {
    "illuminance_lx": ("illuminance", "lx"),
    "luminous_intensity_cd": ("luminous intensity", "cd"),
    "luminance_cd_m2": ("luminance", "cd/m²"),
}


def _unit(unit: str) -> str:
    return UNIT_DISPLAY.get(unit, unit)


def _triple(values: dict[str, float], fmt: Callable[[float], str], scale: float = 1.0) -> str:
    """The Exempt / RG1 / RG2 entries of ``values`` as one string, or an em dash when there are none."""
    if not values:
        return "—"
    return " / ".join(fmt(value * scale) for value in values.values())


def _record_value(key: str, value: object) -> str:
    """A record field as printed: units with superscripts, numbers to six significant digits."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return format_value(value, 6)
    if key == "unit" and isinstance(value, str):
        return unit_text(value)
    return str(value)


def _heading(a: Assessment, st: Styles, moment: datetime.datetime) -> Flowable:
    p = a.provenance
    left = [st.p(f"PHOTOBIOLOGICAL SAFETY PRE-SCREEN · {p.limit_set} method", st.kicker), st.p(a.id, st.title)]
    if a.name:
        left.append(st.p(a.name, st.subtitle))
    maker = [
        f"{label} {a.record[key]}" for key, label in (("vendor", "Vendor:"), ("model", "Model:")) if a.record.get(key)
    ]
    if maker:
        left.append(st.p(" · ".join(maker), st.small))
    right = [
        st.bold_lead("Report date", format_report_time(moment), st.small),
        st.bold_lead("Tool", f"hazard {p.tool_version}", st.small),
        st.bold_lead("Limit set", p.limit_set, st.small),
    ]
    return heading_table(left, right)


class _PageMark(Flowable):
    """An invisible flowable that notes the page it lands on in ``marks[key]``."""

    def __init__(self, marks: dict[str, int], key: str) -> None:
        super().__init__()
        self.marks, self.key = marks, key

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        return 0, 0

    def draw(self) -> None:
        self.marks[self.key] = self.canv.getPageNumber()


_TYPICAL_ROW = [
    "X_XXX",
    "xxxxxxx, xxx (xxxx)",
    "7.5×10⁻⁴",
    "W/(m²·sr)",
    "5.05×10⁵",
    "5.05×10⁵",
    "1.31×10⁶",
    "4.4 min",
    "Exempt",
    "58.4 % of Exempt limit",
]
"""Wide entries of each hazard-table column, so the columns stay the same from report to report."""


def _hazard_row(h: HazardResult, boundaries: list[str]) -> list[str]:
    """The hazard-table cells of an assessed hazard, formatted as the text output formats them."""
    return [
        h.symbol,
        h.title,
        format_value(h.value),
        _unit(h.unit),
        *(format_limit(h.limits.get(b)) for b in boundaries),
        format_duration_s(h.t_max_s),
        h.risk_group or "EL only",
        hazard_margin_text(h),
    ]


def _hazard_table(a: Assessment, st: Styles) -> Flowable:
    head = ["Symbol", "Hazard", "Value", "Unit", "Limits as applied", "", "", "t_max", "Group", "Margin"]
    sub = ["", "", "", "", *a.limit_set.boundaries, "", "", ""]
    rows = [[st.p(h, st.head) for h in head], [st.p(h, st.head) for h in sub]]
    extra: list[tuple] = [("SPAN", (4, 0), (6, 0))] + [("SPAN", (c, 0), (c, 1)) for c in (0, 1, 2, 3, 7, 8, 9)]
    fitted = [_TYPICAL_ROW]
    for i, h in enumerate(a.hazards.values(), start=2):
        if not h.assessed:
            rows.append([st.p(h.symbol, st.cell_bold), st.p(h.title, st.cell), st.p(h.note, st.cell)] + [""] * 7)
            extra.append(("SPAN", (2, i), (9, i)))
            continue
        cells = _hazard_row(h, a.limit_set.boundaries)
        fitted.append([*cells[:9], max(cells[9].split("; "), key=len)])
        styles = [st.cell_bold if c in (0, 2) else st.cell for c in range(len(cells))]
        styles[8] = st.cell_bold.clone("group", textColor=group_ink(h.risk_group))
        row = [st.p(text, style) for text, style in zip(cells[:9], styles, strict=False)]
        if h.compared and any(v != h.value for v in h.compared.values()):  # field averages: show what was compared
            for k, b in enumerate(a.limit_set.boundaries):
                row[4 + k] = st.p(
                    "",
                    st.cell,
                    markup=f"{st.text(cells[4 + k])}<br/><font size=6>"
                    f"{st.text('(' + format_value(h.compared[b]) + ')')}</font>",
                )
        rows.append([*row, st.p("", st.cell, markup="<br/>".join(st.text(part) for part in cells[9].split("; ")))])
        extra.append(("BACKGROUND", (8, i), (8, i), group_fill(h.risk_group)))
    header = [top if top != "Limits as applied" and top else below for top, below in zip(head, sub, strict=True)]
    widths = fit_widths(header, fitted, st.fonts, FRAME_WIDTH, flexible=1, size=st.cell.fontSize, bold={0, 2, 8})
    table = Table(rows, colWidths=widths, repeatRows=2)
    table.setStyle(table_style(header_rows=2, extra=extra))
    return table


def _hazard_caption(st: Styles) -> Flowable:
    return st.p(
        "Radiance hazards: the value is the source's own radiance; the field-of-view average compared with "
        "each limit is in brackets under it. Limits over α after the α bounds. t_max: time to the exposure "
        "limit. Margin: value ÷ limit at the boundary below the hazard's group and the one above it. "
        "EL only: an exposure limit without groups. — in the t_max column: the exposure limit is not reached "
        "within its time range; elsewhere: no such value.",
        st.caption,
    )


_KEY_VALUE_STYLE = [
    ("VALIGN", (0, 0), (-1, -1), "TOP"),
    ("LEFTPADDING", (0, 0), (-1, -1), 0),
    ("RIGHTPADDING", (0, 0), (-1, -1), 6),
    ("TOPPADDING", (0, 0), (-1, -1), 1),
    ("BOTTOMPADDING", (0, 0), (-1, -1), 1.5),
    ("LINEBELOW", (0, 0), (-1, -1), 0.3, HAIRLINE),
]


def _key_values(rows: list[tuple[str, str]], st: Styles, key_width: float = 104) -> Table:
    table = Table(
        [[st.p(k, st.cell_bold), st.p(v, st.cell)] for k, v in rows], colWidths=[key_width, FRAME_WIDTH - key_width]
    )
    table.setStyle(_KEY_VALUE_STYLE)
    return table


def _geometry(a: Assessment, st: Styles) -> Flowable:
    g = a.geometry
    size = source_size_text(a.record) or f"largest dimension {format_value(g.largest_dimension_mm)} mm"
    source = (
        f"{size}; α = {format_value(g.alpha_rad)} rad at the assessment distance; "
        f"Ω_s = {format_value(g.source_solid_angle_sr)} sr"
    )
    if g.small_source:
        source += (
            f"; small source (α < {format_value(a.limit_set.small_source_alpha_rad)} rad): the small-source forms of "
            f"the hazards apply"
        )
    if g.weak_visual_stimulus:
        source += (
            f"; weak visual stimulus (below {format_value(a.limit_set.weak_stimulus_luminance_cd_m2)} cd/m²): the "
            f"weak-stimulus forms of the hazards apply"
        )
    peak_to_mean = a.record.get("peak_to_mean_radiance", 1.0)
    if peak_to_mean > 1:
        source += f"; radiance values × {format_value(peak_to_mean)}, the record's peak-to-mean radiance (hot spots)"
    measured = (
        ""
        if g.measurement_distance_mm is None
        else f" (spectrum measured at {format_value(g.measurement_distance_mm, 6)} mm)"
    )
    if a.complete:
        completeness = "complete: every applicable hazard was assessed"
    else:
        completeness = f"INCOMPLETE — not assessed: {', '.join(a.not_assessed)} (why: see the table); " + (
            "no risk group could be determined" if a.risk_group is None else "the overall group is a lower bound"
        )
    cells = [
        ("Distance", f"{format_distance_mm(g.assessment_distance_mm)}{measured} — {g.distance_rule}"),
        ("Source", source),
        ("Photometry", photometry_text(a.photometry)),
        ("Completeness", completeness),
    ]
    if a.scaling is not None:
        cells.append(("Scaling", _scaling(a.scaling)))
    cells += [("Warning", warning) for warning in a.warnings]
    return _key_values(cells, st, key_width=64)


def _scaling(sc: Scaling) -> str:
    """How a relative spectrum was made absolute, in one line."""
    name, unit = _ANCHOR[sc.anchor]
    at = "" if sc.reference_distance_mm is None else f" at {format_value(sc.reference_distance_mm, 6)} mm"
    return (
        f"relative spectrum made absolute by the stated {name}, {format_value(sc.anchor_value)} {unit}{at} "
        f"(× {format_value(sc.scale_factor)} SI per unit); every value rests on that figure"
    )


def _record_table(a: Assessment, st: Styles) -> Flowable:
    items = [(k, _record_value(k, v)) for k, v in a.record.items()]
    if len(items) % 2:
        items.append(("", ""))
    half = len(items) // 2
    rows = [
        [st.p(k1, st.cell_bold), st.p(v1, st.cell), st.p(k2, st.cell_bold), st.p(v2, st.cell)]
        for (k1, v1), (k2, v2) in zip(items[:half], items[half:], strict=True)
    ]
    key_width = max([st.bold_width(k) for k, _ in items] + [60.0])  # field names are never split
    value_width = FRAME_WIDTH / 2 - key_width
    table = Table(rows, colWidths=[key_width, value_width, key_width, value_width])
    table.setStyle(table_style(header_rows=0))
    return table


def _compared(h: HazardResult) -> str:
    """The values compared with the three limits; one value when they are the same (no FOV averaging)."""
    if not h.assessed:
        return "not assessed"
    if not h.compared:
        return "—"
    if len(set(h.compared.values())) == 1:
        return f"{format_value(h.value)} {_unit(h.unit)} at each"
    return f"{_triple(h.compared, format_value)} {_unit(h.unit)}"


def _detail_table(a: Assessment, st: Styles) -> Flowable:
    head = [
        "Symbol",
        "Band, weight",
        "Exposure limit",
        "Time bases",
        "FOV γ [mrad]",
        "α in limit [mrad]",
        "Compared with limit",
    ]
    cells = []
    for h in a.hazards.values():
        lo, hi = h.band_nm
        compared = _compared(h)
        cells.append(
            [
                h.symbol,
                f"{format_stated(lo)}–{format_stated(hi)} nm, {h.weighting or 'unweighted'}",
                h.exposure_limit or "—",
                _triple(h.time_bases_s, format_duration_s),
                _triple(h.fov_rad, format_limit, 1e3),
                _triple(h.alpha_rad, format_limit, 1e3),
                compared,
            ]
        )
    rows = [[st.p(x, st.head) for x in head]]
    rows += [
        [st.formula(x, st.cell) if c == 2 else st.p(x, st.cell_bold if c == 0 else st.cell) for c, x in enumerate(row)]
        for row in cells
    ]
    one_line = [[*row[:1], "", "", *row[3:6], ""] for row in cells]  # band, limit and compared values wrap
    widths = fit_widths(head, one_line, st.fonts, FRAME_WIDTH, flexible=2, size=st.cell.fontSize, bold={0})
    widths[1], widths[6] = 62, 80
    widths[2] = FRAME_WIDTH - sum(widths) + widths[2]
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style())
    return table


def _bullets(items: list[str], st: Styles) -> list[Flowable]:
    return [st.p(f"• {item}", st.small) for item in items]


def _notes(a: Assessment, st: Styles) -> list[Flowable]:
    """Warnings (what the method tolerates but doubts) first, then the assumptions made."""
    notes = [st.bold_lead("• Warning:", w, st.small) for w in a.warnings] + [
        st.bold_lead("• Assumption:", x, st.small) for x in a.assumptions
    ]
    return notes or [st.p("none", st.small)]


def _hashes(rows: list[tuple[str, str, str]], head: tuple[str, str, str], st: Styles) -> Flowable:
    """A table of (name, description, SHA-256) rows, the digest kept on one line."""
    digest_width = max(stringWidth(digest, st.fonts.regular, st.digest.fontSize) for _, _, digest in rows) + 7
    name_width = (
        max(
            stringWidth(st.fonts.clean(name), st.fonts.regular, st.cell.fontSize)
            for name, _, _ in [(head[0], "", ""), *rows]
        )
        + 7
    )
    body = [[st.p(x, st.head) for x in head]]
    body += [[st.p(name, st.cell), st.p(text, st.cell), st.p(digest, st.digest)] for name, text, digest in rows]
    table = Table(body, colWidths=[name_width, FRAME_WIDTH - name_width - digest_width, digest_width])
    table.setStyle(table_style())
    return table


def _identity_rows(identity: ReportIdentity | None) -> list[tuple[str, str]]:
    """Who issues the report, as key-value rows (those given)."""
    if identity is None:
        return []
    names = {
        "organisation": "Organisation",
        "document_number": "Document number",
        "prepared_by": "Prepared by",
        "checked_by": "Checked by",
        "note": "Note",
    }
    return [(label, value) for key, label in names.items() if (value := getattr(identity, key))]


def _claims_table(a: Assessment, st: Styles) -> list[Flowable]:
    if not a.claims:
        return []
    head = ["Claim", "Claimed", "Computed", "Tolerance", "Verdict", "Why"]
    rows = [[st.p(x, st.head) for x in head]]
    rows += [
        [
            st.p(c.claim, st.cell_bold),
            st.p(c.claimed, st.cell),
            st.p(computed_text(c), st.cell),
            st.p(c.tolerance or "—", st.cell),
            st.p(
                c.verdict.upper() if c.verdict == "contradicted" else c.verdict,
                st.cell_bold if c.verdict == "contradicted" else st.cell,
            ),
            st.p(c.reason, st.cell),
        ]
        for c in a.claims
    ]
    verdict_width = stringWidth("CONTRADICTED", st.fonts.bold, st.cell.fontSize) + 7
    widths = [62, 46, 52, 104, verdict_width, 0]
    widths[-1] = FRAME_WIDTH - sum(widths)
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style())
    return [st.p("Vendor claims checked", st.h2), table]


def _transfer(t: BlueLightTransfer) -> str:
    """The IEC TR 62778 blue-light transfer values in one line."""
    return (
        f"IEC TR 62778:2014: K_B,v = {format_value(t.k_bv_w_per_lm)} W/lm; "
        f"E_thr = {format_value(t.threshold_illuminance_lx)} lx; "
        f"I_v = {format_value(t.luminous_intensity_cd)} cd ({t.intensity_source}); "
        f"d_thr = {format_value(t.threshold_distance_mm)} mm"
    )


def _inputs(a: Assessment, st: Styles) -> list[Flowable]:
    s, ph = a.spectrum, a.photometry
    spectrum = (
        f"{s.quantity} in {unit_text(s.unit_given)}, {s.points} samples, "
        f"{format_stated(s.min_nm)}–{format_stated(s.max_nm)} nm"
    )
    colour = [] if ph.cct_k is None else [f"CCT {format_value(ph.cct_k)} K, Duv {format_value(ph.duv)}"]
    if ph.chromaticity_xy is not None:
        colour.append(f"CIE 1931 x, y = {ph.chromaticity_xy[0]:.4f}, {ph.chromaticity_xy[1]:.4f}")
    if ph.visible_negligible:
        colour.append("none: the visible emission is negligible")
    files = [
        (path, spectrum if path == s.path else "product record" if path.endswith(".toml") else "input", digest)
        for path, digest in a.provenance.inputs.items()
    ]
    return [
        st.p("Input: the product record as used", st.h2.clone("h2_first", spaceBefore=0)),
        _record_table(a, st),
        Spacer(1, 4),
        _hashes(files, ("Input file", "Content", "SHA-256"), st),
        Spacer(1, 3),
        _key_values(
            [("Colour", "; ".join(colour) or "—")]
            + ([("Blue-light transfer", _transfer(a.blue_light_transfer))] if a.blue_light_transfer is not None else [])
            + ([("Scaling", _scaling(a.scaling))] if a.scaling is not None else [])
            + (
                [("File metadata", "; ".join(f"{k}: {v}" for k, v in s.file_metadata.items()))]
                if s.file_metadata
                else []
            ),
            st,
        ),
    ]


def _method(a: Assessment, st: Styles) -> list[Flowable]:
    p = a.provenance
    tables = []
    for name, t in p.tables.items():
        source = t.get("source", "—")
        edition = t.get("edition", "")
        tables.append(
            (
                f"{t.get('symbol', name)} ({name})",
                source if edition in source else f"{source}; edition {edition}",
                t.get("sha256", "—"),
            )
        )
    return [
        st.p("Method and provenance", st.h2),
        _key_values([("Limit set", p.limit_set), ("Integration", p.method), *_identity_rows(p.identity)], st),
        Spacer(1, 4),
        _hashes(tables, ("Weighting table", "Source", "SHA-256"), st),
    ]


def render_assessment_pdf(assessment: Assessment, rendered_at: datetime.datetime | None = None) -> bytes:
    """One product's pre-screen report as a PDF.

    A4: page 1 the answers, page 2 the hazards in detail, then the studies when the result holds any, and the input
    with its provenance and the cautions last.

    Parameters
    ----------
    assessment : Assessment
        The result to render, e.g. from :func:`hazard.assess` or loaded from its JSON.
    rendered_at : datetime.datetime, optional
        Timezone-aware time printed as the report date and recorded as the PDF's creation date; defaults to
        :func:`reports.report_time` (``SOURCE_DATE_EPOCH`` when set, else now).

    Returns
    -------
    bytes
        The PDF. The same assessment and ``rendered_at`` give identical bytes.

    Raises
    ------
    ValueError
        When ``rendered_at`` has no timezone.
    """
    moment, fonts, st = start_report(rendered_at)
    a = assessment
    words = group_words(a.risk_group, a.complete, a.basis, a.assessment_distance_mm)
    title = f"{a.id} — photobiological safety pre-screen ({words})"
    borderline = a.uncertainty is not None and a.uncertainty.verdict == "borderline"
    header = f"{a.id}{' — ' + a.name if a.name else ''} · overall {words}" + (" (borderline)" if borderline else "")
    pages = Pages()  # page 1 names the page the studies start on: a second pass when page 2 ran over
    for _ in range(2):
        marks: dict[str, int] = {}
        pdf = build_pdf(
            _story(a, st, moment, pages, marks),
            fonts,
            title=title,
            header=header,
            author=f"hazard {a.provenance.tool_version}",
            identity="" if a.provenance.identity is None else a.provenance.identity.header_text(),
            moment=moment,
        )
        if marks.get("studies", pages.studies) == pages.studies:
            break
        pages = Pages(studies=marks["studies"])
    return pdf


def _story(a: Assessment, st: Styles, moment: datetime.datetime, pages: Pages, marks: dict[str, int]) -> list[Flowable]:
    """The report's flowables.

    Page 1 is shrunk to fit its page when its content runs long; the later pages (details, studies, input) only
    slightly, beyond that they run on.
    """
    details = [
        st.p("Hazards at the assessment distance", st.h2.clone("h2_first", spaceBefore=0)),
        _hazard_table(a, st),
        Spacer(1, 2),
        _hazard_caption(st),
        Spacer(1, 4),
        _geometry(a, st),
        *_claims_table(a, st),
        st.p("Exposure limits and how each hazard was compared (each triple: Exempt / RG1 / RG2)", st.h2),
        _detail_table(a, st),
        *emission_block(a, st),
        st.p("Warnings and assumptions", st.h2),
        *_notes(a, st),
    ]
    closing = [*_inputs(a, st), *_method(a, st), st.p("Cautions", st.h2), *_bullets(a.cautions, st)]
    story = [
        *fit_page(first_page(a, st, _heading(a, st, moment), pages)),
        PageBreak(),
        *fit_page(details, LEAST_SCALE),
        PageBreak(),
    ]
    if has_studies(a):
        blocks = studies_section(a, st)
        fitted = fit_page([f for block in blocks for f in block], LEAST_SCALE)
        if len(fitted) != 1:  # too long for one page: let it run on, each block kept together
            fitted = [KeepTogether(block) if len(block) > 1 else block[0] for block in blocks]
        story += [_PageMark(marks, "studies"), *fitted, PageBreak()]
    closing_fitted = fit_page(closing, LEAST_SCALE)
    if len(closing_fitted) != 1:
        closing_fitted = [*closing[: -1 - len(a.cautions)], CondPageBreak(60), *closing[-1 - len(a.cautions) :]]
    return story + closing_fitted
