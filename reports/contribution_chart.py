"""Where each hazard's weighted sum comes from: one strip per hazard over a shared wavelength axis.

The top strip is the measured spectrum relative to its peak (linear), the strips under it each hazard's share per
wavelength band (the result's ``contributions``), each scaled to its own largest band, so the strips show the shape
and the text beside each names the band that gives most. The bars sit on a pale band marking the hazard's
integration range. Everything drawn comes from the result.
"""

from __future__ import annotations

import math

from reportlab.graphics.shapes import Drawing, Line, Polygon, PolyLine, Rect

from hazard.output.formatting import format_percent, format_stated
from hazard.reports.chart_parts import TICK, chart_text
from hazard.reports.fonts import FontSet
from hazard.reports.style import INK, MUTED, PANEL, RULE, SPECTRUM_EDGE, SPECTRUM_FILL
from hazard.result import Assessment, SpectralShares

__all__ = ["contribution_chart", "largest_band", "wavelength_axis"]

_STRIP = 14.0  # height of one hazard's strip [pt]
_GAP = 2.0
_LABEL = 44.0  # room for the symbol at the left [pt]
_NOTE = 132.0  # room for the largest band at the right [pt]


def largest_band(shares: SpectralShares) -> tuple[float, float, float]:
    """The band that gives most of a hazard's value: (from [nm], to [nm], its share [1])."""
    k = max(range(len(shares.share)), key=lambda i: (shares.share[i], -i))
    start = shares.start_nm + k * shares.step_nm
    return start, start + shares.step_nm, shares.share[k]


def wavelength_axis(a: Assessment) -> tuple[float, float, float]:
    """The chart's wavelength range and grid step [nm]: the measured range and every contribution, in whole 100 nm."""
    lows = [a.spectrum.min_nm] + [c.start_nm for c in a.contributions.values()]
    highs = [a.spectrum.max_nm] + [c.start_nm + c.step_nm * len(c.share) for c in a.contributions.values()]
    lo, hi = math.floor(min(lows) / 100) * 100, math.ceil(max(highs) / 100) * 100
    span = hi - lo
    step = 50.0 if span <= 500 else 100.0 if span <= 1400 else 200.0 if span <= 2800 else 500.0
    return float(lo), float(hi), step


def contribution_chart(a: Assessment, width: float, fonts: FontSet) -> Drawing:
    """The spectrum and, under it, each hazard's contribution by wavelength.

    Parameters
    ----------
    a : Assessment
        Its ``spectrum`` preview and ``contributions`` are drawn (hazards in the result's order).
    width : float
        Width of the drawing [pt]; the height follows from the number of hazards.
    fonts : FontSet

    Returns
    -------
    Drawing
    """
    rows = [(symbol, a.contributions[symbol]) for symbol in a.hazards if symbol in a.contributions]
    bottom, top = 20.0, 2.0
    spectrum_h = 22.0
    height = bottom + top + spectrum_h + _GAP + len(rows) * (_STRIP + _GAP)
    d = Drawing(width, height)
    lo, hi, step = wavelength_axis(a)
    pw = width - _LABEL - _NOTE

    def px(nm: float) -> float:
        return _LABEL + (min(max(nm, lo), hi) - lo) / (hi - lo) * pw

    y = height - top - spectrum_h
    s = a.spectrum
    d.add(Rect(_LABEL, y, pw, spectrum_h, fillColor=PANEL, strokeColor=None))
    for nm in _ticks(lo, hi, step):
        d.add(Line(px(nm), bottom - 2.5, px(nm), height - top, strokeColor=RULE, strokeWidth=0.3))
        d.add(chart_text(px(nm), bottom - 10, format_stated(nm), fonts, TICK, color=MUTED, anchor="middle"))

    peak = max(s.preview_value_si, default=0.0)
    if peak > 0:
        outline = [
            (px(nm), y + v / peak * (spectrum_h - 1)) for nm, v in zip(s.preview_nm, s.preview_value_si, strict=True)
        ]
        area = [(outline[0][0], y), *outline, (outline[-1][0], y)]
        d.add(Polygon([c for point in area for c in point], fillColor=SPECTRUM_FILL, strokeColor=None))
        d.add(PolyLine([c for point in outline for c in point], strokeColor=SPECTRUM_EDGE, strokeWidth=0.6))
    d.add(chart_text(0, y + spectrum_h / 2 - 2.5, "spectrum", fonts, 7, bold=True))
    d.add(
        chart_text(
            _LABEL + pw + 6, y + spectrum_h / 2 - 2.5, f"peak at {format_stated(s.peak_nm)} nm", fonts, 7, color=MUTED
        )
    )
    for symbol, shares in rows:
        y -= _GAP + _STRIP
        band = a.hazards[symbol].band_nm
        d.add(Rect(px(band[0]), y, px(band[1]) - px(band[0]), _STRIP, fillColor=PANEL, strokeColor=None))
        biggest = max(shares.share) or 1.0
        for k, share in enumerate(shares.share):
            if share <= 0:
                continue
            x0 = px(shares.start_nm + k * shares.step_nm)
            x1 = px(shares.start_nm + (k + 1) * shares.step_nm)
            h = max(share / biggest * (_STRIP - 1), 0.6)
            d.add(Rect(x0, y, max(x1 - x0, 0.5), h, fillColor=INK, strokeColor=None))
        d.add(chart_text(0, y + _STRIP / 2 - 2.7, symbol, fonts, 7.5, bold=True))
        start, end, share = largest_band(shares)
        note = f"most from {format_stated(start)}–{format_stated(end)} nm ({format_percent(share)})"
        d.add(chart_text(_LABEL + pw + 6, y + _STRIP / 2 - 2.7, note, fonts, 7))
    d.add(Line(_LABEL, bottom, _LABEL + pw, bottom, strokeColor=INK, strokeWidth=0.6))
    d.add(chart_text(_LABEL + pw / 2, 0, "wavelength [nm]", fonts, 7, color=MUTED, anchor="middle"))
    return d


def _ticks(lo: float, hi: float, step: float) -> list[float]:
    """Multiples of ``step`` from ``lo`` to ``hi`` [nm]."""
    first = math.ceil(lo / step) * step
    return [first + k * step for k in range(int((hi - first) // step) + 1)]
