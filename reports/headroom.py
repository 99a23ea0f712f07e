"""Each hazard's place between its group boundaries, on one scale shared by every hazard.

The scale has four zones of equal width, one per group (Exempt, RG1, RG2, RG3), with the group limits at the same
places for every hazard, so the rows line up and a glance down the page shows which hazard sits nearest its next
boundary. Within a zone the place is proportional on a logarithmic scale between the two limits that bound it (the
limits as each result applied them, field-of-view averages included: the ratios value ÷ limit of the result's
``margins``). Left of the first limit the zone spans :data:`DECADES_BELOW` decades, right of the last
:data:`DECADES_ABOVE`; a value beyond either end is drawn as an arrow at the end. A zone that a hazard cannot be in,
because two of its limits coincide (L_R's Exempt and RG1 limits), is hatched in that row.

Only the placing is done here; the ratios, groups and limits come from the result.
"""

from __future__ import annotations

import math
from itertools import pairwise

from reportlab.graphics.shapes import Circle, Drawing, Line, Polygon, Rect
from reportlab.lib import colors

from hazard.reports.chart_parts import chart_text
from hazard.reports.fonts import FontSet
from hazard.reports.style import INK, MUTED, RULE, ZONE_TINT
from hazard.result import HazardResult

__all__ = ["DECADES_ABOVE", "DECADES_BELOW", "scale_header", "scale_position", "track"]

DECADES_BELOW = 3
"""Decades of value ÷ limit shown below the first boundary (the Exempt limit) [1]."""
DECADES_ABOVE = 2
"""Decades of value ÷ limit shown beyond the last boundary (the RG2 limit) [1]."""
TRACK_HEIGHT = 11.0
"""Height of one hazard's track [pt]."""


def scale_position(margins: dict[str, float]) -> float:
    """Where a hazard sits on the shared scale, in zone widths: 0 at the left end, 1 at the first limit, … [1].

    Parameters
    ----------
    margins : dict
        Boundary → value ÷ that boundary's limit, in rising order (:attr:`HazardResult.margins`).

    Returns
    -------
    float
        From 0 to the number of boundaries + 1; outside that range when the value lies beyond an end.

    Examples
    --------
    >>> round(scale_position({"Exempt": 0.01, "RG1": 0.001, "RG2": 1e-4}), 6)  # two decades into a three-decade zone
    0.333333
    >>> scale_position({"Exempt": 10.0, "RG1": 0.1, "RG2": 0.01})  # halfway (log) between Exempt and RG1 limits
    1.5
    >>> scale_position({"Exempt": 1000.0, "RG1": 100.0, "RG2": 10.0})  # one decade over the RG2 limit
    3.5
    """
    ratios = list(margins.values())
    first, last = ratios[0], ratios[-1]
    if first <= 1:
        return 1 + math.log10(first) / DECADES_BELOW
    for k, (below, above) in enumerate(pairwise(ratios), start=1):
        if above <= 1:  # between this boundary's limit and the next: value/limit falls from below to above
            return k + math.log10(below) / math.log10(below / above)
    return len(ratios) + math.log10(last) / DECADES_ABOVE


def _empty_zones(limits: dict[str, float]) -> set[int]:
    """Zones (1 … boundaries − 1) that no value can fall in: the two limits around them coincide."""
    values = list(limits.values())
    return {k for k, (below, above) in enumerate(pairwise(values), start=1) if math.isclose(below, above, rel_tol=1e-9)}


def _zones(d: Drawing, groups: list[str], width: float, y: float, height: float, empty: set[int]) -> None:
    zone = width / len(groups)
    for k, group in enumerate(groups):
        x = k * zone
        if k in empty:
            d.add(Rect(x, y, zone, height, fillColor=colors.white, strokeColor=None))
            step = 4.0
            for start in range(int(-height // step), int(zone // step) + 1):
                x0 = x + start * step
                a, b = max(x0, x), min(x0 + height, x + zone)
                if b > a:
                    d.add(Line(a, y + (a - x0), b, y + (b - x0), strokeColor=RULE, strokeWidth=0.5))
        else:
            d.add(Rect(x, y, zone, height, fillColor=ZONE_TINT.get(group, colors.white), strokeColor=None))
    for k in range(1, len(groups)):
        d.add(Line(k * zone, y - 1.5, k * zone, y + height + 1.5, strokeColor=INK, strokeWidth=0.8))
    d.add(Rect(0, y, width, height, fillColor=None, strokeColor=MUTED, strokeWidth=0.4))


def track(hazard: HazardResult, groups: list[str], width: float) -> Drawing:
    """One hazard's row of the scale: the zones, and a bar from the left end to the hazard's place.

    Parameters
    ----------
    hazard : HazardResult
        An assessed hazard with group limits (non-empty ``margins``).
    groups : list of str
        The limit set's groups in rising order.
    width : float
        Width of the drawing [pt].

    Returns
    -------
    Drawing
    """
    d = Drawing(width, TRACK_HEIGHT)
    _zones(d, groups, width, 0, TRACK_HEIGHT, _empty_zones(hazard.limits))
    ratios = list(hazard.margins.values())
    middle = TRACK_HEIGHT / 2
    if ratios[0] <= 0:  # nothing emitted in the band: no place to mark
        return d
    zone = width / len(groups)
    place = scale_position(hazard.margins) * zone
    end = min(max(place, 0.0), width)
    d.add(Rect(0, middle - 1.6, end, 3.2, fillColor=INK, strokeColor=None))
    if place < 0:
        d.add(Polygon([0, middle, 6, middle + 4, 6, middle - 4], fillColor=INK, strokeColor=colors.white))
    elif place > width:
        d.add(Polygon([width, middle, width - 6, middle + 4, width - 6, middle - 4], fillColor=INK, strokeColor=None))
    else:
        d.add(Circle(end, middle, 3.4, fillColor=INK, strokeColor=colors.white, strokeWidth=0.9))
    return d


def scale_header(groups: list[str], boundaries: list[str], width: float, fonts: FontSet) -> Drawing:
    """The zone names over the scale and, under them, which limit each dividing line is."""
    d = Drawing(width, 20)
    zone = width / len(groups)
    for k, group in enumerate(groups):
        d.add(chart_text(k * zone + zone / 2, 10, group, fonts, 7.5, bold=True, anchor="middle"))
    for k, boundary in enumerate(boundaries, start=1):
        d.add(chart_text(k * zone, 1, f"{boundary} limit", fonts, 6.5, color=MUTED, anchor="middle"))
    d.add(chart_text(0, 1, f"10⁻{DECADES_BELOW}×", fonts, 6.5, color=MUTED))
    d.add(chart_text(width, 1, f"{10**DECADES_ABOVE}×", fonts, 6.5, color=MUTED, anchor="end"))
    return d
