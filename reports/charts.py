"""The report charts, drawn as vector graphics with ``reportlab.graphics``.

- :func:`distance_chart`: the distance study: t_max of each hazard family against distance (both axes
  logarithmic) under a labelled strip of the overall group, with the assessment distance and the near field
  marked.

They only scale what the result holds for drawing; none computes a hazard quantity. Line styles (solid,
dashed, dotted) and text labels carry the meaning, so the charts read in greyscale.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from reportlab.graphics.shapes import Drawing, Group, Line, Polygon, Rect
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from hazard.output.formatting import format_distance_mm
from hazard.reports.chart_parts import (
    chart_text,
    curve_lines,
    dash_style,
    family_line,
    power_of_ten,
)
from hazard.reports.fonts import FontSet
from hazard.reports.style import INK, MUTED, PANEL, RULE, group_fill, group_ink
from hazard.result import Assessment

__all__ = ["distance_chart"]

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


def distance_chart(assessment: Assessment, width: float, height: float, fonts: FontSet, legend: bool = True) -> Drawing:
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
    legend : bool
        A row naming each family's line style under the chart (the curves are named at their ends either way).

    Returns
    -------
    Drawing
    """
    study = assessment.distances
    if study is None:
        raise ValueError("the result holds no distance study to draw")
    d = Drawing(width, height)
    left, right, bottom = 40.0, 10.0, 38.0 if legend else 26.0
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
            else "No exposure limit is reached at any distance studied."
        )
        d.add(chart_text(left + pw / 2, bottom + ph / 2 - 3, empty, fonts, 7, color=INK, anchor="middle"))
    d.add(Rect(left, bottom, pw, ph, fillColor=None, strokeColor=INK, strokeWidth=0.6))
    at = assessment.assessment_distance_mm
    shown = dmin <= at <= dmax
    text = fonts.clean(f"assessed at {format_distance_mm(at)}")
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
        text = fonts.clean(f"near field, under {format_distance_mm(near)}: approximate")
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
    if legend:
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
        dash, line_width, colour = family_line(study.t_max_s, family)
        g.add(
            Line(cursor, y + 2.5, cursor + 20, y + 2.5, strokeColor=colour, strokeWidth=line_width, **dash_style(dash))
        )
        g.add(chart_text(cursor + 24, y, text, fonts, size))
        cursor += 24 + stringWidth(text, fonts.regular, size) + 12
    return g
