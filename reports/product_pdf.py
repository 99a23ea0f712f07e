"""The PDF report of one product.

Page 1 at a glance, page 2 input and method; then, when the result holds any of them, a page 3 on distance, uncertainty
and remedies (:mod:`hazard.reports.studies`); the cautions in full end the report.

Everything printed comes from the :class:`~hazard.result.Assessment`; numbers are formatted by
:mod:`hazard.output.formatting`, exactly as the text output prints them.
"""

from __future__ import annotations

import datetime
from collections.abc import Callable

from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import CondPageBreak, Flowable, KeepInFrame, KeepTogether, PageBreak, Spacer, Table

from hazard.output.formatting import (
    UNIT_DISPLAY,
    computed_text,
    format_duration_s,
    format_limit,
    format_value,
    group_words,
    hazard_margin_text,
)
from hazard.reports.charts import margin_chart, spectrum_chart
from hazard.reports.exposure_section import emission_block
from hazard.reports.layout import FRAME_HEIGHT, FRAME_WIDTH, build_pdf, start_report
from hazard.reports.ranking import tightest_margin
from hazard.reports.studies import has_studies, studies_section, study_summary, uncertainty_summary
from hazard.reports.style import HAIRLINE, INK, NEUTRAL, PANEL, Styles, fit_widths, group_fill, group_ink, table_style
from hazard.reports.timestamp import format_report_time
from hazard.reports.wording import (
    GROUP_MEANING,
    GROUP_NAME,
    LOWER_BOUND,
    LOWER_BOUND_MEANING,
    NOT_DETERMINED_MEANING,
    NOT_DETERMINED_NAME,
    PULSE_MEANING,
    WHAT_IF_MEANING,
)
from hazard.result import Assessment, BlueLightTransfer, HazardResult, ReportIdentity, Scaling

__all__ = ["render_assessment_pdf"]

_ANCHOR = {
    "illuminance_lx": ("illuminance", "lx"),
    "luminous_intensity_cd": ("luminous intensity", "cd"),
    "luminance_cd_m2": ("luminance", "cd/m²"),
}
_SPECTRAL_UNIT = {"irradiance": "W/(m²·nm)", "radiance": "W/(m²·sr·nm)"}


def _unit(unit: str) -> str:
    return UNIT_DISPLAY.get(unit, unit)


def _spectral_quantity(a: Assessment) -> str:
    """Irradiance or radiance: what the spectrum's SI values are.

    A relative spectrum once anchored, as the record's ``effective_quantity`` defines it: a luminance anchor makes it a
    radiance.
    """
    if a.spectrum.quantity != "relative":
        return a.spectrum.quantity
    return "radiance" if a.scaling is not None and a.scaling.anchor == "luminance_cd_m2" else "irradiance"


def _triple(values: dict[str, float], fmt: Callable[[float], str], scale: float = 1.0) -> str:
    """The Exempt / RG1 / RG2 entries of ``values`` as one string, or an em dash when there are none."""
    if not values:
        return "—"
    return " / ".join(fmt(value * scale) for value in values.values())


def _record_value(value: object) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return f"{value:g}"
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
    table = Table([[left, right]], colWidths=[FRAME_WIDTH - 150, 150])
    table.setStyle(
        [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LEFTPADDING", (0, 0), (-1, -1), 0),
            ("RIGHTPADDING", (0, 0), (-1, -1), 0),
            ("LINEBELOW", (0, 0), (-1, 0), 1.2, INK),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 5),
        ]
    )
    return table


def _deciding(a: Assessment) -> tuple[str, str]:
    """Lead-in and text naming what sets the overall group."""
    if not a.deciding_hazards:
        return "Not assessed:", ", ".join(a.not_assessed) or "—"
    if a.risk_group == "Exempt":
        closest = tightest_margin(a)
        if closest is None:  # a result with deciding hazards has a tightest one
            raise ValueError("an Exempt result with deciding hazards but no margin")
        h = a.hazards[closest.symbol]
        return (
            "Closest to a boundary:",
            f"{closest.symbol} ({h.title}, {hazard_margin_text(h)}); every assessed hazard is within its Exempt limit",
        )
    parts = []
    for symbol in a.deciding_hazards:
        h = a.hazards[symbol]
        parts.append(f"{symbol} ({h.title}, {hazard_margin_text(h)})")
    return "Decided by:", "; ".join(parts)


def _meaning(a: Assessment, group: str) -> str:
    """What the group means; for a pulsed lamp, what the pulse rules made of it."""
    if a.emission is None:
        return GROUP_MEANING[group]
    if a.pulse_exceeds:
        return PULSE_MEANING["over"]
    if a.emission.mode == "single_pulse":
        return PULSE_MEANING["single_within"]
    return f"{GROUP_MEANING[group]} {PULSE_MEANING['train_within']}"


class _PageMark(Flowable):
    """An invisible flowable that notes the page it lands on in ``marks[key]``."""

    def __init__(self, marks: dict[str, int], key: str) -> None:
        super().__init__()
        self.marks, self.key = marks, key

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        return 0, 0

    def draw(self) -> None:
        self.marks[self.key] = self.canv.getPageNumber()


def _verdict(a: Assessment, st: Styles, studies_page: int) -> Flowable:
    group = a.risk_group
    shown = group or NOT_DETERMINED_NAME
    fill = group_fill(group) if group else NEUTRAL
    size = min(st.verdict.fontSize, 80 / stringWidth(group or "n/d", st.fonts.bold, 1))
    label_style = st.verdict.clone("verdict_group", textColor=group_ink(group), fontSize=size, leading=size * 1.15)
    small_label = st.head.clone("tile_note", alignment=1, textColor=group_ink(group))
    label = (
        [st.p(group or "n/d", label_style)]
        if group
        else [st.p("not determined", small_label.clone("nd", fontSize=11, leading=13))]
    )
    if group is None:
        text = [st.p(f"Overall risk group: {shown}", st.verdict_head), st.p(NOT_DETERMINED_MEANING)]
    else:
        lead = f"What-if group at {a.assessment_distance_mm:.0f} mm" if a.basis == "what-if" else "Overall risk group"
        text = [
            st.p(f"{lead}: {group} — {GROUP_NAME[group]}", st.verdict_head),
            st.p(_meaning(a, group) + ("" if a.complete else " " + LOWER_BOUND_MEANING)),
        ]
    text.append(st.bold_lead(*_deciding(a), st.small))
    if group is not None and not a.complete:
        label.append(st.p("lower bound", small_label))
        text.insert(0, st.p(f"{LOWER_BOUND}: {', '.join(a.not_assessed)} not assessed", st.banner))
    if a.basis == "what-if":
        label.insert(0, st.p(f"what-if at {a.assessment_distance_mm:.0f} mm", small_label))
        standard = a.standard_risk_group or "not determined"
        text.insert(
            0,
            st.p(
                f"WHAT-IF at {a.assessment_distance_mm:.0f} mm — the standard's distance "
                f"({a.standard_assessment_distance_mm:.0f} mm) gives {standard}"
                f"{'' if a.complete or a.standard_risk_group is None else ' (lower bound)'}",
                st.banner,
            ),
        )
        text.insert(1, st.p(WHAT_IF_MEANING, st.small))
    if a.uncertainty is not None:
        if a.uncertainty.verdict == "borderline":
            label.append(st.p("BORDERLINE", small_label))
        text.append(st.bold_lead(*uncertainty_summary(a, studies_page), st.small))
    table = Table([[label, text]], colWidths=[96, FRAME_WIDTH - 96])
    table.setStyle(
        [
            ("BACKGROUND", (0, 0), (0, 0), fill),
            ("BOX", (0, 0), (0, 0), 1.2, INK),
            ("VALIGN", (0, 0), (0, 0), "MIDDLE"),
            ("VALIGN", (1, 0), (1, 0), "TOP"),
            ("LEFTPADDING", (1, 0), (1, 0), 10),
            ("TOPPADDING", (0, 0), (-1, -1), 4),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 4),
        ]
    )
    return table


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


_TYPICAL_ROW = [
    "X_XXX",
    "xxxxxxx, xxx (xxxx)",
    "7.50e-04",
    "W/(m²·sr)",
    "5.05e+05",
    "5.05e+05",
    "1.31e+06",
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
        "limit (—: not within its range). Margin: value ÷ limit at the boundary below the hazard's group and "
        "the one above it. EL only: no groups.",
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


def _geometry(a: Assessment, st: Styles, studies_page: int) -> Flowable:
    g, ph = a.geometry, a.photometry
    source = (
        f"largest dimension {g.largest_dimension_mm:g} mm; α = {format_value(g.alpha_rad)} rad at the "
        f"assessment distance; Ω_s = {format_value(g.source_solid_angle_sr)} sr"
    )
    if g.small_source:
        source += (
            f"; small source (α < {a.limit_set.small_source_alpha_rad:g} rad): the small-source forms of "
            f"the hazards apply"
        )
    if g.weak_visual_stimulus:
        source += (
            f"; weak visual stimulus (below {a.limit_set.weak_stimulus_luminance_cd_m2:g} cd/m²): the "
            f"weak-stimulus forms of the hazards apply"
        )
    peak_to_mean = a.record.get("peak_to_mean_radiance", 1.0)
    if peak_to_mean > 1:
        source += f"; radiance values × {peak_to_mean:g}, the record's peak-to-mean radiance (hot spots)"
    measured = "" if g.measurement_distance_mm is None else f" (spectrum measured at {g.measurement_distance_mm:g} mm)"
    if a.complete:
        completeness = "complete: every applicable hazard was assessed"
    else:
        completeness = f"INCOMPLETE — not assessed: {', '.join(a.not_assessed)} (why: see the table); " + (
            "no risk group could be determined" if a.risk_group is None else "the overall group is a lower bound"
        )
    cells = [
        ("Distance", f"{g.assessment_distance_mm:.0f} mm{measured} — {g.distance_rule}"),
        ("Source", source),
        (
            "Photometry",
            f"{format_value(ph.illuminance_lx)} lx at the assessment distance; luminance "
            f"{format_value(ph.luminance_cd_m2)} cd/m²",
        ),
        ("Completeness", completeness),
    ]
    if a.scaling is not None:
        cells.append(("Scaling", _scaling(a.scaling)))
    if a.claims:
        cells.append(("Vendor claims", _claims_summary(a)))
    if (studies := study_summary(a, studies_page)) is not None:
        cells.append(("Studies", studies))
    cells += [("Warning", warning) for warning in a.warnings]
    return _key_values(cells, st, key_width=64)


def _scaling(sc: Scaling) -> str:
    """How a relative spectrum was made absolute, in one line."""
    name, unit = _ANCHOR[sc.anchor]
    at = "" if sc.reference_distance_mm is None else f" at {sc.reference_distance_mm:g} mm"
    return (
        f"relative spectrum made absolute by the stated {name}, {format_value(sc.anchor_value)} {unit}{at} "
        f"(× {format_value(sc.scale_factor)} SI per unit); every value rests on that figure"
    )


def _claims_summary(a: Assessment) -> str:
    """The vendor claims' verdicts in one line, naming the contradicted ones."""
    parts = []
    for verdict in ("contradicted", "inconclusive", "not checkable", "consistent"):
        found = [c for c in a.claims if c.verdict == verdict]
        if not found:
            continue
        text = f"{len(found)} {verdict.upper() if verdict != 'consistent' else verdict}"
        if verdict == "contradicted":
            text += " (" + "; ".join(f"{c.claim}: claimed {c.claimed}, computed {c.computed}" for c in found) + ")"
        parts.append(text)
    return ", ".join(parts) + " — details on page 2"


def _charts(a: Assessment, st: Styles) -> list[Flowable]:
    fonts = st.fonts
    s = a.spectrum
    quantity = _spectral_quantity(a)
    kind = f"spectral {quantity}" + (", scaled from a relative spectrum" if s.quantity == "relative" else "")
    peak = (
        f"{kind[0].upper()}{kind[1:]}, {s.points} samples, {s.min_nm:g}–{s.max_nm:g} nm; its peak, "
        f"{format_value(s.peak_value_si)} {_SPECTRAL_UNIT[quantity]} at {s.peak_nm:g} nm, is 1 on this axis. "
        f"Weights as tabulated."
    )
    missing = [symbol for symbol in a.not_assessed if a.hazards[symbol].limits]
    drawn = len(missing) < sum(1 for h in a.hazards.values() if h.limits)
    chart_note = " ".join(
        (
            [
                "Diamond: the value (arrow: beyond the axis). Coinciding limits (e.g. Exempt and RG1 "
                "of L_R) leave no zone between them. E_H has no risk groups."
            ]
            if drawn
            else []
        )
        + ([f"Not assessed, so not drawn: {', '.join(missing)}."] if missing else [])
    )
    return [
        st.p("Spectrum and action spectra", st.h2),
        spectrum_chart(a, FRAME_WIDTH, 106, fonts),
        st.p(peak, st.caption),
        st.p("Distance to the group boundaries", st.h2),
        margin_chart(a, FRAME_WIDTH, fonts),
        st.p(chart_note, st.caption),
    ]


def _record_table(a: Assessment, st: Styles) -> Flowable:
    items = [(k, _record_value(v)) for k, v in a.record.items()]
    if len(items) % 2:
        items.append(("", ""))
    half = len(items) // 2
    rows = [
        [st.p(k1, st.cell_bold), st.p(v1, st.cell), st.p(k2, st.cell_bold), st.p(v2, st.cell)]
        for (k1, v1), (k2, v2) in zip(items[:half], items[half:], strict=True)
    ]
    table = Table(rows, colWidths=[w * FRAME_WIDTH for w in (0.2, 0.3, 0.2, 0.3)])
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
        "Time bases [s]",
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
                f"{lo:g}–{hi:g} nm, {h.weighting or 'unweighted'}",
                h.exposure_limit or "—",
                _triple(h.time_bases_s, format_limit),
                _triple(h.fov_rad, format_limit, 1e3),
                _triple(h.alpha_rad, format_limit, 1e3),
                compared,
            ]
        )
    rows = [[st.p(x, st.head) for x in head]]
    rows += [[st.p(x, st.cell_bold if c == 0 else st.cell) for c, x in enumerate(row)] for row in cells]
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
    spectrum = f"{s.quantity} in {s.unit_given}, {s.points} samples, {s.min_nm:g}–{s.max_nm:g} nm"
    colour = [] if ph.cct_k is None else [f"CCT {format_value(ph.cct_k)} K, Duv {format_value(ph.duv)}"]
    if ph.chromaticity_xy is not None:
        colour.append(f"CIE 1931 x, y = {ph.chromaticity_xy[0]:.4f}, {ph.chromaticity_xy[1]:.4f}")
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

    A4: two pages, three when the result holds a distance, uncertainty or remedies study.

    Parameters
    ----------
    assessment : Assessment
        The result to render, e.g. from :func:`hazard.assess` or loaded from its JSON.
    rendered_at : datetime.datetime, optional
        Timezone-aware time printed as the report date; defaults to :func:`reports.report_time`
        (``SOURCE_DATE_EPOCH`` when set, else now).

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
    studies_page = 3  # page 1 names the page the studies start on: a second pass when page 2 ran over
    for _ in range(2):
        marks: dict[str, int] = {}
        pdf = build_pdf(
            _story(a, st, moment, studies_page, marks),
            fonts,
            title=title,
            header=header,
            author=f"hazard {a.provenance.tool_version}",
            identity="" if a.provenance.identity is None else a.provenance.identity.header_text(),
        )
        if marks.get("studies", studies_page) == studies_page:
            break
        studies_page = marks["studies"]
    return pdf


_LEAST_SCALE = 0.88
"""Pages 2 and 3 are shrunk to fit their page down to this scale; longer, they run onto the next page."""


def _fit_page(content: list[Flowable], least_scale: float = 0.0) -> list[Flowable]:
    """``content`` on one page, shrunk when it runs long.

    Unless that needs a scale below ``least_scale``: then as it is, to flow on.
    """
    if least_scale:  # measuring lays the content out once more: only when it may run on
        height = sum(f.wrap(FRAME_WIDTH, FRAME_HEIGHT)[1] + f.getSpaceBefore() + f.getSpaceAfter() for f in content)
        if height * least_scale > FRAME_HEIGHT:
            return content
    return [KeepInFrame(FRAME_WIDTH, FRAME_HEIGHT, content, mode="shrink")]


def _story(
    a: Assessment, st: Styles, moment: datetime.datetime, studies_page: int, marks: dict[str, int]
) -> list[Flowable]:
    """The report's flowables.

    Page 1 is shrunk to fit its page when its content runs long; pages 2 and 3 (the studies, then the cautions) only
    slightly, beyond that they run on.
    """
    first_page = [
        _heading(a, st, moment),
        Spacer(1, 5),
        _verdict(a, st, studies_page),
        Spacer(1, 4),
        _cautions(a, st),
        st.p("Hazards at the assessment distance", st.h2),
        _hazard_table(a, st),
        Spacer(1, 2),
        _hazard_caption(st),
        Spacer(1, 4),
        _geometry(a, st, studies_page),
        *_charts(a, st),
    ]
    blocks = studies_section(a, st) if has_studies(a) else []
    second_page = [
        *_inputs(a, st),
        *_claims_table(a, st),
        st.p("Hazard details (each triple: Exempt / RG1 / RG2)", st.h2),
        _detail_table(a, st),
        *emission_block(a, st),
        st.p("Warnings and assumptions", st.h2),
        *_notes(a, st),
        *_method(a, st),
    ]
    cautions = [st.p("Cautions", st.h2), *_bullets(a.cautions, st)]
    if not blocks:
        return [
            *_fit_page(first_page),
            PageBreak(),
            *_fit_page([*second_page, CondPageBreak(60), *cautions], _LEAST_SCALE),
        ]
    third_page = [f for block in blocks for f in block] + cautions
    fitted = _fit_page(third_page, _LEAST_SCALE)
    if len(fitted) != 1:  # too long for one page: let it run on, each block kept together
        fitted = [KeepTogether(block) if len(block) > 1 else block[0] for block in blocks]
        fitted += [CondPageBreak(60), *cautions]
    return [
        *_fit_page(first_page),
        PageBreak(),
        *_fit_page(second_page, _LEAST_SCALE),
        PageBreak(),
        _PageMark(marks, "studies"),
        *fitted,
    ]
