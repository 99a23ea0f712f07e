"""The report charts, drawn as vector graphics with ``reportlab.graphics``.

- :func:`spectrum_chart`: the spectrum preview relative to its peak, with the action spectra S_UV(λ), B(λ)
  and R(λ) on the same logarithmic axis.
- :func:`margin_chart`: one row per assessed hazard with risk groups; a marker at the value relative to its Exempt
  limit and the group zones up to the RG1 and RG2 limits, so the nearest boundary shows at a glance.
- :func:`distance_chart`: the distance study: t_max of each hazard family against distance (both axes
  logarithmic) under a labelled strip of the overall group, with the assessment distance and the near field
  marked.

They only scale what the result holds for drawing; none computes a hazard quantity. Line styles (solid,
dashed, dotted) and text labels carry the meaning, so the charts read in greyscale.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from itertools import pairwise

import numpy as np
from reportlab.graphics.shapes import Drawing, Group, Line, Polygon, PolyLine, Rect
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from hazard.output.formatting import hazard_margin_text
from hazard.reports.chart_parts import (
    TICK,
    chart_text,
    curve_lines,
    dash_style,
    family_line,
    power_of_ten,
    segments,
)
from hazard.reports.fonts import FontSet
from hazard.reports.style import INK, MUTED, PANEL, RULE, SPECTRUM_EDGE, SPECTRUM_FILL, group_fill, group_ink
from hazard.result import Assessment, HazardResult
from hazard.weighting_tables import load_table

__all__ = ["ACTION_SPECTRA", "distance_chart", "margin_chart", "spectrum_chart"]

ACTION_SPECTRA = (
    ("s_uv", "S_UV(λ) actinic UV", None, 1.1),
    ("blue_light", "B(λ) blue light", (4, 2.2), 1.1),
    ("retinal_thermal", "R(λ) retinal thermal", (0.9, 1.8), 1.4),
)
"""Weighting table, legend text, dash pattern (None: solid) and line width of each overlaid action spectrum."""

_Y_DECADES = (-4, 1)  # spectrum chart: 1e-4 … 10 (R peaks at 10)
_ZONE_LABEL = 5.8  # group name inside a zone of the margin chart [pt]
_X_DECADES = (-4, 6)  # margin chart: value ÷ Exempt limit from 1e-4 to 1e6


def _wavelength_range(assessment: Assessment) -> tuple[float, float, float]:
    """The x range of the spectrum chart and its grid step: the measured range and the action spectra's bands."""
    s = assessment.spectrum
    lo = min(200.0, math.floor(s.min_nm / 100) * 100)
    hi = max(1400.0, math.ceil(s.max_nm / 100) * 100)
    step = 100.0 if hi - lo <= 1400 else 200.0
    return lo, hi, step


def spectrum_chart(assessment: Assessment, width: float, height: float, fonts: FontSet) -> Drawing:
    """The spectrum preview (relative to its peak) and the action spectra on one log axis.

    Parameters
    ----------
    assessment : Assessment
        Its ``spectrum.preview_nm`` / ``preview_value_si`` are drawn.
    width, height : float
        Size of the drawing [pt].
    fonts : FontSet
        Report fonts.

    Returns
    -------
    Drawing
    """
    d = Drawing(width, height)
    left, right, bottom, top = 34.0, 8.0, 24.0, 20.0
    pw, ph = width - left - right, height - bottom - top
    lo, hi, step = _wavelength_range(assessment)
    y0, y1 = _Y_DECADES

    def px(nm: float) -> float:
        return left + (nm - lo) / (hi - lo) * pw

    def py(value: float) -> float:
        return bottom + (math.log10(value) - y0) / (y1 - y0) * ph

    s = assessment.spectrum
    for start, end in ((lo, s.min_nm), (s.max_nm, hi)):
        if end > start:
            d.add(Rect(px(start), bottom, px(end) - px(start), ph, fillColor=PANEL, strokeColor=None))
            if px(end) - px(start) > 40:
                d.add(chart_text(px(start) + 4, bottom + 3, "not measured", fonts, 6, color=MUTED))
    for decade in range(y0, y1 + 1):
        d.add(
            Line(
                left,
                py(10.0**decade),
                left + pw,
                py(10.0**decade),
                strokeColor=RULE,
                strokeWidth=0.3 if decade else 0.7,
            )
        )
        d.add(power_of_ten(left - 3, py(10.0**decade) - 2.2, decade, fonts, anchor="end"))
    for nm in np.arange(lo, hi + 0.5, step):
        d.add(Line(px(nm), bottom, px(nm), bottom - 2.5, strokeColor=INK, strokeWidth=0.5))
        d.add(chart_text(px(nm), bottom - 10, f"{nm:.0f}", fonts, TICK, color=MUTED, anchor="middle"))
    floor = 10.0**y0
    peak = max(s.preview_value_si, default=0.0)
    if peak > 0:
        outline = [(px(nm), py(max(v / peak, floor))) for nm, v in zip(s.preview_nm, s.preview_value_si, strict=True)]
        area = [(outline[0][0], bottom), *outline, (outline[-1][0], bottom)]
        d.add(Polygon([c for point in area for c in point], fillColor=SPECTRUM_FILL, strokeColor=None))
        d.add(PolyLine([c for point in outline for c in point], strokeColor=SPECTRUM_EDGE, strokeWidth=0.6))
    for name, _, dash, line_width in ACTION_SPECTRA:
        table = load_table(name)
        grid = np.arange(table.range_nm[0], table.range_nm[1] + 0.5, 1.0)
        weights = table.at(grid)
        points = [(px(nm), py(max(w, floor))) for nm, w in zip(grid, weights, strict=True)]
        for run in segments(points, list(weights >= floor)):
            d.add(
                PolyLine(
                    [c for point in run for c in point],
                    strokeColor=INK,
                    strokeWidth=line_width,
                    strokeDashArray=dash,
                    strokeLineCap=1 if dash and dash[0] < 1 else 0,
                )
            )
    d.add(Rect(left, bottom, pw, ph, fillColor=None, strokeColor=INK, strokeWidth=0.6))
    d.add(chart_text(left + pw / 2, 2, "wavelength λ [nm]", fonts, 7, color=MUTED, anchor="middle"))
    d.add(
        Group(
            chart_text(0, 0, "relative (log)", fonts, 6.5, color=MUTED, anchor="middle"),
            transform=(0, 1, -1, 0, 6, bottom + ph / 2),
        )
    )
    d.add(_legend(left, height - 9, pw, fonts))
    return d


def _legend(x: float, y: float, width: float, fonts: FontSet) -> Group:
    """Legend row within ``width``: the spectrum's swatch, then one sample line per action spectrum."""
    label = "spectrum ÷ its peak (highest sample per bin)"
    texts = [label] + [text for _, text, _, _ in ACTION_SPECTRA]
    natural = sum(stringWidth(fonts.clean(t), fonts.regular, 7) for t in texts) + len(texts) * 38
    size = 7 * min(1.0, width / natural)
    g = Group(
        Rect(x, y - 1, 14, 6, fillColor=SPECTRUM_FILL, strokeColor=SPECTRUM_EDGE, strokeWidth=0.6),
        chart_text(x + 18, y, label, fonts, size),
    )
    cursor = x + 18 + stringWidth(fonts.clean(label), fonts.regular, size) + 14
    for _, text, dash, line_width in ACTION_SPECTRA:
        g.add(
            Line(
                cursor,
                y + 2.5,
                cursor + 20,
                y + 2.5,
                strokeColor=INK,
                strokeWidth=line_width,
                strokeDashArray=dash,
                strokeLineCap=1 if dash and dash[0] < 1 else 0,
            )
        )
        g.add(chart_text(cursor + 24, y, text, fonts, size))
        cursor += 24 + stringWidth(fonts.clean(text), fonts.regular, size) + 14
    return g


def _chart_rows(assessment: Assessment) -> list[HazardResult]:
    """Assessed hazards that have risk groups, in report order."""
    return [h for h in assessment.hazards.values() if h.assessed and h.limits]


def margin_chart(assessment: Assessment, width: float, fonts: FontSet) -> Drawing:
    """Each hazard's value relative to its Exempt limit, with its group zones, on one log axis.

    A row's zones run Exempt up to the Exempt limit (1 on the axis), RG1 up to where the value would meet
    the RG1 limit (``margins["Exempt"] / margins["RG1"]``), RG2 up to the RG2 limit, RG3 beyond. The
    boundaries are where the same spectrum, scaled, would reach each limit, so field-of-view averaging at
    each boundary is respected.

    Parameters
    ----------
    assessment : Assessment
    width : float
        Width of the drawing [pt]; the height follows from the number of rows.
    fonts : FontSet

    Returns
    -------
    Drawing
    """
    rows = _chart_rows(assessment)
    if not rows:
        single = assessment.emission is not None and assessment.emission.mode == "single_pulse"
        text = (
            "A single pulse has no continuous-wave group limits: its group comes from each pulse against its "
            "exposure limit (Pulsed emission, page 2)."
            if single
            else "No hazard with risk groups could be assessed, so there is nothing to draw."
        )
        d = Drawing(width, 14)
        d.add(chart_text(0, 3, text, fonts, 7.5))
        return d
    row_h, gap, label_w, result_w, bottom, top = 13.5, 1.5, 112.0, 126.0, 22.0, 10.0
    height = bottom + top + len(rows) * (row_h + gap)
    d = Drawing(width, height)
    left, pw = label_w, width - label_w - result_w
    x0, x1 = _X_DECADES

    def px(ratio: float) -> float:
        return left + (min(max(math.log10(ratio), x0), x1) - x0) / (x1 - x0) * pw

    for decade in range(x0, x1 + 1):
        x = px(10.0**decade)
        d.add(Line(x, bottom, x, height - top, strokeColor=RULE, strokeWidth=0.3))
        d.add(power_of_ten(x, bottom - 10, decade, fonts))
    one = px(1.0)
    d.add(Line(one, bottom - 2, one, height - top + 2, strokeColor=INK, strokeWidth=0.9))
    for i, hazard in enumerate(rows):
        y = height - top - (i + 1) * (row_h + gap) + gap
        title = fonts.clean(hazard.title)
        title_size = min(6.3, (label_w - 4) / stringWidth(title, fonts.regular, 1))
        d.add(chart_text(0, y + row_h / 2 + 1.5, hazard.symbol, fonts, 7.5, bold=True))
        d.add(chart_text(0, y + row_h / 2 - 6, title, fonts, title_size, color=MUTED))
        d.add(_row(hazard, assessment.limit_set.groups, left, y, pw, row_h, px, fonts))
        d.add(_result(hazard, left + pw + 8, y, row_h, fonts))
    lowest = assessment.limit_set.boundaries[0]
    d.add(chart_text(one, height - top + 4, f"{lowest} limit", fonts, 6.5, bold=True, anchor="middle"))
    d.add(
        chart_text(
            left + pw / 2,
            2,
            f"value ÷ {lowest} limit (log scale); zones end where the value reaches each group's limit",
            fonts,
            7,
            color=MUTED,
            anchor="middle",
        )
    )
    return d


def _row(
    hazard: HazardResult,
    groups: list[str],
    left: float,
    y: float,
    pw: float,
    row_h: float,
    px: Callable[[float], float],
    fonts: FontSet,
) -> Group:
    """One hazard's band: group zones, boundary lines and the value marker (or why there is none)."""
    g = Group()
    margins = hazard.margins
    boundaries = list(margins)  # rising; the zone beyond the last is the next group
    if margins[boundaries[0]] <= 0:
        g.add(Rect(left, y, pw, row_h, fillColor=colors.white, strokeColor=RULE, strokeWidth=0.5))
        g.add(chart_text(left + 6, y + row_h / 2 - 2.5, "value 0: nothing emitted in this band", fonts, 7, color=MUTED))
        return g
    value = margins[boundaries[0]]
    edges = [px(10.0 ** _X_DECADES[0]), *(px(value / margins[b]) for b in boundaries), px(10.0 ** _X_DECADES[1])]
    for group, (start, end) in zip(groups, pairwise(edges), strict=True):
        if end - start <= 0:
            continue
        g.add(Rect(start, y, end - start, row_h, fillColor=group_fill(group), strokeColor=None))
        if end - start >= stringWidth(group, fonts.bold, _ZONE_LABEL) + 5:
            g.add(
                chart_text(start + 2.5, y + row_h - 5.6, group, fonts, _ZONE_LABEL, bold=True, color=group_ink(group))
            )
    for edge in edges[1:-1]:
        g.add(Line(edge, y, edge, y + row_h, strokeColor=INK, strokeWidth=0.7))
    g.add(Rect(left, y, pw, row_h, fillColor=None, strokeColor=INK, strokeWidth=0.5))
    g.add(_marker(px(value), y + 4.6, value))
    return g


def _marker(x: float, y: float, value: float) -> Polygon:
    """A diamond at the value, or an arrow at the axis end when the value lies beyond it."""
    r = 3.6
    low, high = 10.0 ** _X_DECADES[0], 10.0 ** _X_DECADES[1]
    if value < low:
        points = [x + 1, y, x + 2 * r + 1, y + r, x + 2 * r + 1, y - r]
    elif value > high:
        points = [x - 1, y, x - 2 * r - 1, y + r, x - 2 * r - 1, y - r]
    else:
        points = [x, y + r, x + r, y, x, y - r, x - r, y]
    return Polygon(points, fillColor=INK, strokeColor=colors.white, strokeWidth=0.8)


def _result(hazard: HazardResult, x: float, y: float, row_h: float, fonts: FontSet) -> Group:
    """Right-hand column: the hazard's group as a labelled box, and its margin in words."""
    g = Group()
    group = hazard.risk_group
    if group is None:  # excluded by _chart_rows: assessed hazards with risk groups
        raise ValueError(f"{hazard.symbol} has no risk group to draw")
    g.add(Rect(x, y + 2, 38, row_h - 4, fillColor=group_fill(group), strokeColor=INK, strokeWidth=0.5))
    g.add(chart_text(x + 19, y + row_h / 2 - 2.5, group, fonts, 7, bold=True, color=group_ink(group), anchor="middle"))
    margin = hazard_margin_text(hazard)
    g.add(chart_text(x + 42, y + row_h / 2 - 2.5, margin, fonts, 6.8))
    return g


_MAX_T_DECADES = 12  # distance chart: at most this many decades of t_max


def _group_runs(
    distance_mm: list[float], group: list[str | None], exact: dict[str, float | None]
) -> list[tuple[str | None, float, float]]:
    """Runs of equal overall group along the grid as (group, start, end) [mm].

    A run ends halfway (on the log axis) between the last grid point of one group and the first of the next,
    or at the study's minimum distance for the next group when that lies between the two points (exact where
    the group falls with distance, as it normally does).
    """
    runs, start = [], distance_mm[0]
    for i in range(1, len(distance_mm)):
        if group[i] == group[i - 1]:
            continue
        edge = math.sqrt(distance_mm[i - 1] * distance_mm[i])
        boundary = exact.get(group[i] or "")
        if boundary and distance_mm[i - 1] <= boundary <= distance_mm[i]:
            edge = boundary
        runs.append((group[i - 1], start, edge))
        start = edge
    runs.append((group[-1], start, distance_mm[-1]))
    return runs


def _t_range(curves: dict[str, list[float | None]]) -> tuple[int, int]:
    """Decades of the t_max axis: the finite values' span, at least 3 and at most 12 decades."""
    values = [t for ts in curves.values() for t in ts if t is not None and t > 0]
    if not values:
        return -3, 5
    lo, hi = math.floor(math.log10(min(values))), math.ceil(math.log10(max(values)))
    if hi - lo < 3:
        lo, hi = lo - 1, hi + (3 - (hi - lo) - 1)
    return max(lo, hi - _MAX_T_DECADES), hi


def distance_chart(assessment: Assessment, width: float, height: float, fonts: FontSet) -> Drawing:
    """t_max of each hazard family against distance, under a strip of the overall group at each distance.

    Both axes are logarithmic. A family's curve has a gap where its limit is not reached within the limit's
    time range (``None`` in the study). The strip's runs are labelled with the group's name; a vertical line
    marks the assessment distance and a shaded band the near field, where inverse-square values are
    approximate.

    Parameters
    ----------
    assessment : Assessment
        Its ``distances`` (a :class:`~hazard.result.DistanceStudy`) is drawn; must not be None.
    width, height : float
        Size of the drawing [pt].
    fonts : FontSet

    Returns
    -------
    Drawing
    """
    study = assessment.distances
    if study is None:
        raise ValueError("the result holds no distance study to draw")
    d = Drawing(width, height)
    left, right, bottom = 40.0, 10.0, 38.0
    strip_h, label_row, near_row = 13.0, 10.0, 11.0
    strip_top = height - label_row
    strip_bottom = strip_top - strip_h
    plot_top = strip_bottom - near_row
    pw, ph = width - left - right, plot_top - bottom
    dmin, dmax = study.distance_mm[0], study.distance_mm[-1]
    x0, x1 = math.log10(dmin), math.log10(dmax)
    t0, t1 = _t_range(study.t_max_s)

    def px(mm: float) -> float:
        return left + (math.log10(min(max(mm, dmin), dmax)) - x0) / (x1 - x0) * pw

    def py(seconds: float) -> float:
        return bottom + (math.log10(seconds) - t0) / (t1 - t0) * ph

    near = study.near_field_below_mm
    if near > dmin:
        d.add(Rect(px(dmin), bottom, px(near) - px(dmin), ph, fillColor=PANEL, strokeColor=None))
    step = 1 if t1 - t0 <= 8 else 2
    for decade in range(t0, t1 + 1):
        y = py(10.0**decade)
        d.add(Line(left, y, left + pw, y, strokeColor=RULE, strokeWidth=0.3))
        if (decade - t0) % step == 0:
            d.add(power_of_ten(left - 3, y - 2.2, decade, fonts, anchor="end"))
    for decade in range(math.ceil(x0), math.floor(x1) + 1):
        x = px(10.0**decade)
        d.add(Line(x, bottom, x, plot_top, strokeColor=RULE, strokeWidth=0.3))
        d.add(Line(x, bottom, x, bottom - 2.5, strokeColor=INK, strokeWidth=0.5))
        d.add(power_of_ten(x, bottom - 10, decade, fonts))
    if near > dmin:
        d.add(
            Line(
                px(near),
                bottom,
                px(near),
                plot_top + near_row - 2,
                strokeColor=MUTED,
                strokeWidth=0.6,
                strokeDashArray=[2, 1.5],
            )
        )
    curves, labels = curve_lines(study.distance_mm, study.t_max_s, px, py, (left, bottom, pw, ph), fonts)
    d.add(curves)
    if not labels.contents:
        empty = (
            "No hazard could be assessed at any distance."
            if all(g is None for g in study.group)
            else "No exposure limit is reached at any distance studied (within each limit's time range)."
        )
        d.add(chart_text(left + pw / 2, bottom + ph / 2 - 3, empty, fonts, 7.5, color=MUTED, anchor="middle"))
    d.add(Rect(left, bottom, pw, ph, fillColor=None, strokeColor=INK, strokeWidth=0.6))
    at = assessment.assessment_distance_mm
    shown = dmin <= at <= dmax
    text = fonts.clean(f"assessed at {at:.0f} mm")
    w = stringWidth(text, fonts.bold, 6.5)
    tx = min(max(px(at) - w / 2, left), left + pw - w)
    d.add(_strip(study, px, strip_bottom, strip_h, fonts, [(tx, tx + w)] if shown else []))
    if shown:
        x = px(at)
        d.add(Line(x, bottom, x, strip_top + 1, strokeColor=INK, strokeWidth=1.0))
        d.add(Polygon([x - 3.2, bottom - 0.5, x + 3.2, bottom - 0.5, x, bottom + 4.5], fillColor=INK, strokeColor=None))
        d.add(chart_text(tx, strip_top + 2.5, text, fonts, 6.5, bold=True))
    d.add(chart_text(left - 3, strip_bottom + strip_h / 2 - 2.2, "group", fonts, 6.5, bold=True, anchor="end"))
    if near > dmin:  # over the assessment line, which passes behind it
        d.add(
            Rect(
                px(dmin),
                plot_top + 1.5,
                px(near) - px(dmin),
                near_row - 3.5,
                fillColor=PANEL,
                strokeColor=MUTED,
                strokeWidth=0.4,
            )
        )
        text = fonts.clean(f"near field, under {near:.0f} mm: approximate")
        size = 6.2
        y = plot_top + 2.8
        if px(near) - px(dmin) >= stringWidth(text, fonts.regular, size) + 8:
            d.add(chart_text((px(dmin) + px(near)) / 2, y, text, fonts, size, color=INK, anchor="middle"))
        else:
            tip = px(near) + 2.5  # a small triangle pointing at the band (a glyph the fonts lack)
            d.add(
                Rect(
                    tip,
                    y - 1.8,
                    stringWidth(text, fonts.regular, size) + 8,
                    size + 2,
                    fillColor=colors.white,
                    strokeColor=None,
                )
            )  # over the assessment line where it crosses
            d.add(Polygon([tip, y + 2.2, tip + 4, y + 4.4, tip + 4, y], fillColor=INK, strokeColor=None))
            d.add(chart_text(tip + 6.5, y, text, fonts, size, color=INK))
    d.add(labels)
    d.add(
        chart_text(
            left + pw / 2,
            bottom - 19,
            "distance from the source [mm] (log scale; 10³ mm = 1 m)",
            fonts,
            7,
            color=MUTED,
            anchor="middle",
        )
    )
    d.add(
        Group(
            chart_text(0, 0, "t_max [s] (log)", fonts, 6.5, color=MUTED, anchor="middle"),
            transform=(0, 1, -1, 0, 7, bottom + ph / 2),
        )
    )
    d.add(_family_legend(study, left, 2, pw, fonts))
    return d


def _strip(
    study, px: Callable[[float], float], y: float, h: float, fonts: FontSet, taken: list[tuple[float, float]]
) -> Group:
    """The overall group at each distance as filled runs, each labelled in text.

    A label goes inside where it has room, else just above the strip, clear of the spans in ``taken`` (x from, x to)
    already labelled there.
    """
    g = Group()
    runs = _group_runs(study.distance_mm, study.group, study.minimum_distance_mm)
    for group, start, end in runs:
        x, w = px(start), px(end) - px(start)
        g.add(Rect(x, y, w, h, fillColor=group_fill(group), strokeColor=None))
        label = group or "not assessed"
        size = 7 if group else 6
        if w >= stringWidth(label, fonts.bold, size) + 4:
            g.add(
                chart_text(
                    x + w / 2, y + h / 2 - 2.5, label, fonts, size, bold=True, color=group_ink(group), anchor="middle"
                )
            )
            continue
        width = stringWidth(label, fonts.bold, 6)
        lx = x + w / 2 - width / 2
        for a, b in sorted(taken):
            if lx < b + 3 and a - 3 < lx + width:
                lx = a - 3 - width if x + w / 2 < (a + b) / 2 else b + 3
        taken.append((lx, lx + width))
        g.add(chart_text(lx, y + h + 2.5, label, fonts, 6, bold=True))
        g.add(Line(x + w / 2, y + h, x + w / 2, y + h + 2, strokeColor=INK, strokeWidth=0.5))
    for _, start, _ in runs[1:]:
        g.add(Line(px(start), y, px(start), y + h, strokeColor=INK, strokeWidth=0.7))
    g.add(
        Rect(
            px(study.distance_mm[0]),
            y,
            px(study.distance_mm[-1]) - px(study.distance_mm[0]),
            h,
            fillColor=None,
            strokeColor=INK,
            strokeWidth=0.6,
        )
    )
    return g


def _family_legend(study, x: float, y: float, width: float, fonts: FontSet) -> Group:
    """One sample line and name per family drawn (those whose limit is reached somewhere)."""
    entries = [
        (family, fonts.clean(family + ("" if family in study.family_group else " (no groups)")))
        for family, ts in study.t_max_s.items()
        if any(t is not None for t in ts)
    ]
    natural = sum(stringWidth(t, fonts.regular, 7) for _, t in entries) + len(entries) * 36
    size = 7 * min(1.0, width / max(natural, 1.0))
    g = Group()
    cursor = x
    for family, text in entries:
        dash, line_width = family_line(study.t_max_s, family)
        g.add(Line(cursor, y + 2.5, cursor + 20, y + 2.5, strokeColor=INK, strokeWidth=line_width, **dash_style(dash)))
        g.add(chart_text(cursor + 24, y, text, fonts, size))
        cursor += 24 + stringWidth(text, fonts.regular, size) + 12
    return g
