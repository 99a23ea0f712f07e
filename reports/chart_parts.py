"""Drawing parts shared by the report charts: tick labels, text, curve runs, family line styles and curve labels.

They only place what a result holds; none computes a hazard quantity.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable

from reportlab.graphics.shapes import Group, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from hazard.reports.fonts import FontSet
from hazard.reports.style import FAMILY_STYLE, INK, MUTED

__all__ = [
    "TICK",
    "chart_text",
    "curve_lines",
    "dash_style",
    "end_label",
    "family_line",
    "power_of_ten",
    "segments",
]

TICK = 6.5  # tick label size [pt]


def power_of_ten(x: float, y: float, exponent: int, fonts: FontSet, anchor: str = "middle") -> Group:
    """'10' with a raised exponent, as a tick label; ``anchor`` is middle or end at ``x``."""
    base, sup = "10", str(exponent)
    w_base = stringWidth(base, fonts.regular, TICK)
    w_sup = stringWidth(sup, fonts.regular, TICK - 1.5)
    left = x - (w_base + w_sup) / 2 if anchor == "middle" else x - w_base - w_sup
    return Group(
        String(left, y, base, fontName=fonts.regular, fontSize=TICK, fillColor=MUTED),
        String(left + w_base + 0.3, y + 2.6, sup, fontName=fonts.regular, fontSize=TICK - 1.5, fillColor=MUTED),
    )


def chart_text(
    x: float,
    y: float,
    text: str,
    fonts: FontSet,
    size: float = 7,
    bold: bool = False,
    color: colors.Color = INK,
    anchor: str = "start",
) -> String:
    """A label in the report's fonts (characters they lack replaced), ``anchor`` start, middle or end at ``x``."""
    return String(
        x,
        y,
        fonts.clean(text),
        fontName=fonts.bold if bold else fonts.regular,
        fontSize=size,
        fillColor=color,
        textAnchor=anchor,
    )


def segments(points: list[tuple[float, float]], keep: list[bool]) -> list[list[tuple[float, float]]]:
    """Runs of consecutive points whose ``keep`` flag is set."""
    runs: list[list[tuple[float, float]]] = []
    current: list[tuple[float, float]] = []
    for point, flag in zip(points, keep, strict=True):
        if flag:
            current.append(point)
        elif current:
            runs.append(current)
            current = []
    if current:
        runs.append(current)
    return [run for run in runs if len(run) > 1]


def family_line(families: Iterable[str], family: str) -> tuple[tuple[float, ...], float, colors.Color]:
    """Dash pattern, line width and colour of ``family``'s curve, by its place among ``families``.

    ``families`` is in the limit set's order; the styles are :data:`~hazard.reports.style.FAMILY_STYLE`'s.
    """
    index = list(families).index(family)
    return FAMILY_STYLE[index % len(FAMILY_STYLE)]


def dash_style(pattern: tuple[float, ...]) -> dict:
    """Line keywords for a dash pattern: solid when empty, round caps for dotted lines."""
    if not pattern:
        return {"strokeDashArray": None}
    return {"strokeDashArray": list(pattern), "strokeLineCap": 1 if pattern[0] < 1 else 0}


def curve_lines(
    distance_mm: list[float],
    series: dict[str, list[float | None]],
    px: Callable[[float], float],
    py: Callable[[float], float],
    box: tuple[float, float, float, float],
    fonts: FontSet,
) -> tuple[Group, Group]:
    """Each family's time curve against distance (gaps where it is None or off the axis), named at its end.

    ``series`` maps family → times [s] at ``distance_mm``; ``box`` is (left, bottom, width, height) [pt].
    """
    _, bottom, _, ph = box
    g, labels = Group(), Group()
    placed: list[tuple[float, float, float, float]] = []
    for family, ts in series.items():
        dash, line_width, colour = family_line(series, family)
        points, keep = [], []
        for mm, t in zip(distance_mm, ts, strict=True):
            y = py(t) if t is not None and t > 0 else math.nan
            ok = bottom - 0.01 <= y <= bottom + ph + 0.01
            points.append((px(mm), y if ok else 0.0))
            keep.append(ok)
        runs = segments(points, keep)
        for run in runs:
            g.add(
                PolyLine(
                    [c for point in run for c in point], strokeColor=colour, strokeWidth=line_width, **dash_style(dash)
                )
            )
        if runs:
            labels.add(end_label(family, runs[-1][-1], box, placed, fonts))
    return g, labels


def end_label(
    family: str,
    end: tuple[float, float],
    box: tuple[float, float, float, float],
    placed: list[tuple[float, float, float, float]],
    fonts: FontSet,
) -> Group:
    """The family's name beside its curve's last point, moved down past labels already placed."""
    left, bottom, pw, ph = box
    size = 6.3
    text = fonts.clean(family)
    w = stringWidth(text, fonts.bold, size)
    x = end[0] + 3 if end[0] + 3 + w <= left + pw - 2 else end[0] - 3 - w
    y = min(max(end[1] - 2.2, bottom + 2), bottom + ph - 8)
    for _ in range(12):
        if not any(x < px2 and px1 < x + w and y < py2 and py1 < y + size for px1, py1, px2, py2 in placed):
            break
        y = y - size - 1 if y - size - 1 >= bottom + 2 else y + 2 * (size + 1)
    placed.append((x, y, x + w, y + size))
    return Group(
        Rect(x - 1, y - 1.6, w + 2, size + 1.6, fillColor=colors.white, strokeColor=None),
        String(x, y, text, fontName=fonts.bold, fontSize=size, fillColor=INK),
    )
