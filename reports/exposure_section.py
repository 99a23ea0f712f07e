"""The product report's blocks on pulsed emission and on the day's exposures.

Everything comes from the result's ``emission``, each hazard's ``pulse`` and ``exposure``; this module words,
formats and draws them. Numbers follow the text output (:mod:`hazard.output.text`): shares of a limit rounded up,
allowed stays rounded down, distances to keep rounded up.
"""

from __future__ import annotations

import math

from reportlab.graphics.shapes import Circle, Drawing, Group, Line, Rect
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import Flowable, Spacer, Table

from hazard.output.formatting import (
    UNIT_DISPLAY,
    distance_beyond_mm,
    emission_text,
    format_duration_s,
    format_fraction,
    format_pulse_count,
    format_value,
)
from hazard.reports.chart_parts import chart_text, curve_lines, dash_style, family_line, power_of_ten
from hazard.reports.fonts import FontSet
from hazard.reports.layout import FRAME_WIDTH
from hazard.reports.style import INK, MUTED, RULE, Styles, fit_widths, table_style
from hazard.result import Assessment, ExposureStudy

__all__ = ["emission_block", "exposure_blocks", "exposure_chart"]

_DAY_S = 86400.0  # the chart's time axis reaches a day at least [s]


def emission_block(a: Assessment, st: Styles) -> list[Flowable]:
    """A pulsed source: how it emits, the rule that set its group, and each hazard's pulse against its limit.

    Empty for a continuous source.
    """
    e = a.emission
    if e is None:
        return []
    held = "its peak values" if e.pulse_rate_hz is None else "its time-averaged values"
    how = f"{emission_text(e)}; the hazard table holds {held}"
    head = ["Hazard", "Dose per pulse", "Unit", "Pulse vs its limit", "In the train (N^−0.25)", "Pulses to limit"]
    body = []
    for symbol, h in a.hazards.items():
        p = h.pulse
        if p is None:
            continue
        unit = UNIT_DISPLAY.get(h.unit, h.unit).replace("W", "J", 1)
        in_train = "—"
        if p.fraction_in_train is not None:
            in_train = f"{format_fraction(p.fraction_in_train)}, N = {format_value(p.pulses_in_window)}"
        to_limit = "—" if p.pulses_to_limit is None else format_pulse_count(p.pulses_to_limit)
        body.append([symbol, format_value(p.dose_per_pulse), unit, format_fraction(p.fraction), in_train, to_limit])
    widths = fit_widths(head, body, st.fonts, FRAME_WIDTH, flexible=4, size=st.cell.fontSize, bold={0})
    rows = [[st.formula(x, st.head) for x in head]]
    rows += [[st.p(x, st.cell_bold if c == 0 else st.cell) for c, x in enumerate(row)] for row in body]
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style())
    return [
        st.p("Pulsed emission", st.h2),
        st.bold_lead("Emission:", how + ".", st.body),
        st.formula(e.rule + ".", st.small, lead="Rule:"),
        Spacer(1, 3),
        table,
        Spacer(1, 2),
        st.p(
            "Pulse vs its limit: one pulse's dose against the exposure limit at the pulse duration. In the train: "
            "thermal limits with the N pulses that fall within the limit's window. Pulses to limit: how many such "
            "pulses together reach the limit (within its dose period or window); —: a pulse alone exceeds it.",
            st.caption,
        ),
    ]


def _axis_decades(values: list[float]) -> tuple[int, int]:
    """Whole decades spanning ``values`` (at least three)."""
    lo = math.floor(math.log10(min(values)))
    hi = math.ceil(math.log10(max(values)))
    if hi - lo < 3:
        lo -= 3 - (hi - lo)
    return lo, hi


def exposure_chart(x: ExposureStudy, width: float, height: float, fonts: FontSet) -> Drawing:
    """The longest allowed stay of each hazard family against distance, with the day's exposures as numbered dots.

    Both axes are logarithmic. A dot below every curve is an exposure that alone stays within each limit; whether
    the day as a whole does is in the table beside it (photochemical doses add up over the day).

    Parameters
    ----------
    x : ExposureStudy
    width, height : float
        Size of the drawing [pt].
    fonts : FontSet

    Returns
    -------
    Drawing
    """
    d = Drawing(width, height)
    left, right, bottom, top = 40.0, 10.0, 36.0, 6.0
    pw, ph = width - left - right, height - bottom - top - 12
    distances = x.curve_distance_mm
    d0, d1 = math.log10(distances[0]), math.log10(distances[-1])
    times = [t for ts in x.allowed_duration_s.values() for t in ts if t is not None and t > 0]
    times += [e.duration_s for e in x.exposures] + [_DAY_S]
    t0, t1 = _axis_decades(times)

    def px(mm: float) -> float:
        return left + (math.log10(min(max(mm, distances[0]), distances[-1])) - d0) / (d1 - d0) * pw

    def py(seconds: float) -> float:
        return bottom + (math.log10(seconds) - t0) / (t1 - t0) * ph

    step = 1 if t1 - t0 <= 8 else 2
    for decade in range(t0, t1 + 1):
        y = py(10.0**decade)
        d.add(Line(left, y, left + pw, y, strokeColor=RULE, strokeWidth=0.3))
        if (decade - t0) % step == 0:
            d.add(power_of_ten(left - 3, y - 2.2, decade, fonts, anchor="end"))
    for decade in range(math.ceil(d0), math.floor(d1) + 1):
        xx = px(10.0**decade)
        d.add(Line(xx, bottom, xx, bottom + ph, strokeColor=RULE, strokeWidth=0.3))
        d.add(power_of_ten(xx, bottom - 10, decade, fonts))
    day = py(_DAY_S)
    d.add(Line(left, day, left + pw, day, strokeColor=MUTED, strokeWidth=0.6, strokeDashArray=[2, 1.5]))
    d.add(chart_text(left + pw - 3, day - 7.5, "one day", fonts, 6, color=MUTED, anchor="end"))
    curves, labels = curve_lines(distances, x.allowed_duration_s, px, py, (left, bottom, pw, ph), fonts)
    d.add(curves)
    for k, e in enumerate(x.exposures, start=1):
        cx, cy = px(e.distance_mm), py(e.duration_s)
        d.add(Circle(cx, cy, 4.2, fillColor=INK, strokeColor=None))
        d.add(chart_text(cx, cy - 2.2, str(k), fonts, 5.8, bold=True, color=colors.white, anchor="middle"))
    d.add(Rect(left, bottom, pw, ph, fillColor=None, strokeColor=INK, strokeWidth=0.6))
    d.add(labels)
    d.add(
        chart_text(
            left + pw / 2,
            bottom - 20,
            "distance from the source [mm] (log scale)",
            fonts,
            7,
            color=MUTED,
            anchor="middle",
        )
    )
    d.add(
        Group(
            chart_text(0, 0, "longest stay [s] (log)", fonts, 6.5, color=MUTED, anchor="middle"),
            transform=(0, 1, -1, 0, 7, bottom + ph / 2),
        )
    )
    cursor = left
    for family, ts in x.allowed_duration_s.items():
        if all(t is None for t in ts):
            continue
        dash, line_width, colour = family_line(x.allowed_duration_s, family)
        y = height - 8
        d.add(
            Line(cursor, y + 2.5, cursor + 18, y + 2.5, strokeColor=colour, strokeWidth=line_width, **dash_style(dash))
        )
        d.add(chart_text(cursor + 21, y, family, fonts, 6.5))
        cursor += 21 + stringWidth(fonts.clean(family), fonts.regular, 6.5) + 10
    return d


def _exposure_table(x: ExposureStudy, st: Styles) -> Table:
    head = ["#", "Exposure", "Distance", "Duration", "Hazard", "Share of limit", "Allowed there", "Within beyond"]
    body = []
    for k, e in enumerate(x.exposures, start=1):
        for f in e.hazards.values():
            farther = f.shortest_distance_mm is not None and f.shortest_distance_mm > e.distance_mm
            shortest = (
                "—"
                if f.shortest_distance_mm is None
                else "any"
                if f.shortest_distance_mm == 0
                else distance_beyond_mm(f.shortest_distance_mm) + ("*" if farther and f.worst <= 1 else "")
            )
            body.append(
                [
                    str(k),
                    e.label,
                    distance_beyond_mm(e.distance_mm),
                    format_duration_s(e.duration_s),
                    f.criterion,
                    format_fraction(f.worst),
                    format_duration_s(f.allowed_duration_s),
                    shortest,
                ]
            )
    widths = fit_widths(head, body, st.fonts, FRAME_WIDTH, flexible=1, size=st.cell.fontSize, bold={0, 5})
    rows = [[st.p(h, st.head) for h in head]]
    rows += [[st.p(v, st.cell_bold if c in (0, 5) else st.cell) for c, v in enumerate(row)] for row in body]
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style())
    return table


def exposure_verdict(x: ExposureStudy) -> tuple[str, str]:
    """The day's verdict in words and, when some limit is used, which family uses most of it and from where."""
    verdict = "WITHIN the limit values" if x.within else "EXCEEDS the limit values"
    if x.most_family is None:
        return verdict, ""
    return verdict, (
        f"Most of the allowance: {x.most_family}, {format_fraction(x.day[x.most_family].worst)} over the day, "
        f"mostly from {x.most_exposure!r}."
    )


def exposure_blocks(a: Assessment, st: Styles) -> list[list[Flowable]]:
    """The section on the day's exposures: verdict, chart, table, the day's totals and notes; empty without one."""
    x = a.exposure
    if x is None:
        return []
    verdict, most = exposure_verdict(x)
    lead = f"The stated day against {x.limit_set}:"
    most = f" {most}" if most else ""
    day_rows = [["Hazard family", "Over the day", "How the exposures combine"]]
    day_rows += [[family, format_fraction(d.worst), d.rule] for family, d in x.day.items()]
    widths = fit_widths(day_rows[0], day_rows[1:], st.fonts, FRAME_WIDTH, flexible=2, size=st.cell.fontSize, bold={1})
    day_table = Table(
        [[st.p(v, st.head) for v in day_rows[0]]]
        + [[st.p(v, st.cell_bold if c == 1 else st.cell) for c, v in enumerate(row)] for row in day_rows[1:]],
        colWidths=widths,
    )
    day_table.setStyle(table_style())
    notes = [
        f"* {f.criterion} at {e.label!r}: {f.note}."
        for e in x.exposures
        for f in e.hazards.values()
        if f.shortest_distance_mm is not None and f.shortest_distance_mm > e.distance_mm and f.worst <= 1
    ]
    return [
        [
            st.p("Daily exposure", st.h2),
            st.p(f"{lead} {verdict}.{most}", st.body),
            exposure_chart(x, FRAME_WIDTH, 170, st.fonts),
            st.p(
                "Curves: the longest stay within each family's exposure limit at each distance (a gap: not reached "
                "within a day). Numbered dots: the stated exposures, numbered as in the table; a dot above a curve "
                "exceeds that limit on its own.",
                st.caption,
            ),
        ],
        [Spacer(1, 3), _exposure_table(x, st)],
        [Spacer(1, 3), day_table],
        [
            Spacer(1, 2),
            *[st.p(n, st.caption) for n in notes],
            st.p(
                "Share of limit: the exposure as a fraction of the limit for its duration (a pulse train: the larger "
                "of its dose and a single pulse). Allowed there: the longest stay at that distance. Within beyond: "
                "the least distance from which that duration stays within the limit (any: from 10 mm; —: not within "
                f"100 m). {x.note}",
                st.caption,
            ),
        ],
    ]
