"""Number, duration and margin formatting shared by the text output and the PDF report."""

from __future__ import annotations

import math

__all__ = ["format_limit", "format_value", "format_duration_s", "margin_to_next", "format_margin", "UNIT_DISPLAY"]

UNIT_DISPLAY = {"W/m2": "W/m²", "W/m2/sr": "W/(m²·sr)"}
_DURATION_UNITS = ((3600.0, 3600.0, "h"), (60.0, 60.0, "min"), (1.0, 0.1, "s"), (1e-3, 1e-4, "ms"),
                   (1e-6, -math.inf, "µs"))  # (seconds per unit, shown from, unit)


def format_value(value: float | None, digits: int = 3) -> str:
    """A value with ``digits`` significant digits, or an em dash for None.

    Examples
    --------
    >>> format_value(0.000523991), format_value(46154.5596), format_value(None)
    ('5.24e-04', '4.62e+04', '—')
    >>> format_value(12.3456)
    '12.3'
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    if value == 0:
        return "0"
    if 0.01 <= abs(value) < 1e4:
        return f"{value:.{digits}g}"
    return f"{value:.{digits - 1}e}"


def format_limit(value: float | None) -> str:
    """A limit as the standard prints it: three significant digits, no trailing zeros.

    Examples
    --------
    >>> format_limit(0.001), format_limit(4e6), format_limit(2336912.6), format_limit(None)
    ('0.001', '4e+06', '2.34e+06', '—')
    """
    return "—" if value is None else f"{value:.3g}"


def format_duration_s(seconds: float | None) -> str:
    """A duration in the largest sensible unit: µs, ms, s, min, h.

    Examples
    --------
    >>> format_duration_s(263.49), format_duration_s(0.25), format_duration_s(9000), format_duration_s(None)
    ('4.4 min', '0.25 s', '2.5 h', '—')
    """
    if seconds is None:
        return "—"
    scale, unit = next((scale, unit) for scale, threshold, unit in _DURATION_UNITS if seconds >= threshold)
    amount = seconds / scale
    return f"{amount:.2g} {unit}" if amount < 10 else f"{amount:.0f} {unit}"


def margin_to_next(risk_group: str | None, margins: dict[str, float]) -> tuple[str, float] | None:
    """The boundary that matters for a hazard in ``risk_group`` and the ratio value/limit there.

    For Exempt, RG1 and RG2 it is the group's own upper limit (ratio ≤ 1: how much headroom is left); for
    RG3 it is the RG2 limit (ratio > 1: how far over). None when the hazard has no groups.
    """
    if risk_group is None or not margins:
        return None
    boundary = "RG2" if risk_group == "RG3" else risk_group
    return boundary, margins[boundary]


def format_margin(risk_group: str | None, margins: dict[str, float]) -> str:
    """Margin as text, e.g. ``'38% of RG1 limit'`` or ``'3.2× RG2 limit'``.

    Examples
    --------
    >>> format_margin("RG1", {"Exempt": 2.0, "RG1": 0.38, "RG2": 0.001})
    '38% of RG1 limit'
    >>> format_margin("RG3", {"Exempt": 300.0, "RG1": 100.0, "RG2": 3.2})
    '3.2× RG2 limit'
    """
    found = margin_to_next(risk_group, margins)
    if found is None:
        return "—"
    boundary, ratio = found
    if ratio > 1:
        return f"{format_value(ratio, 2)}× {boundary} limit"
    percent = ratio * 100
    shown = f"{percent:.2g}" if percent >= 0.01 else "<0.01"
    return f"{shown}% of {boundary} limit"
