"""The measurement distance one metadata line of a spectrum file states, read without guessing.

Instruments write it in many ways: the unit after the number (``Distance: 500 mm``, ``distance: 20 in``), in the
name (``distance_mm: 500``, ``Distance [mm]: 500``, ``Distance (cm): 50``) or in a cell of its own
(``distance;500;mm``). A line states a distance when its name holds the word ``distance`` and its value begins
with a number; it is read when the number has exactly one unit this module knows, and is otherwise a problem to
report (an unknown or missing unit, two units, a comma that may be a thousands separator): never a guess.

Only the first :data:`MAX_STATEMENT_CHARS` characters of a line are examined, in one forward pass without regular
expressions, so any line costs bounded work.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from hazard.errors import excerpt

__all__ = ["LENGTH_UNITS_MM", "MAX_STATEMENT_CHARS", "DistanceStatement", "read_distance", "split_item"]

MAX_STATEMENT_CHARS = 200
"""Characters of a metadata name or value examined [characters]."""
LENGTH_UNITS_MM = {
    "mm": 1.0,
    "millimetre": 1.0,
    "millimetres": 1.0,
    "millimeter": 1.0,
    "millimeters": 1.0,
    "cm": 10.0,
    "centimetre": 10.0,
    "centimetres": 10.0,
    "centimeter": 10.0,
    "centimeters": 10.0,
    "m": 1000.0,
    "metre": 1000.0,
    "metres": 1000.0,
    "meter": 1000.0,
    "meters": 1000.0,
    "in": 25.4,  # 1 in = 25.4 mm exactly (international inch, 1959)
    "inch": 25.4,
    "inches": 25.4,
}
"""Length units a file may state a distance in (lower case), and their size [mm]."""
_SEPARATORS = (":", "=", ";", "\t")
_DIGITS = "0123456789"
_BEFORE_UNIT = " \t;,:([\"'"
"""What may stand between a number and its unit (``500 mm``, ``500;mm``, ``500 (mm)``)."""
_BEFORE_NUMBER = " \t\"'~≈"
"""What may stand before the number (quotes of an export, an approximation sign)."""


@dataclass(frozen=True)
class DistanceStatement:
    """A distance a metadata line states.

    Attributes
    ----------
    distance_mm : float or None
        The distance [mm]; None when it could not be read.
    problem : str or None
        Why it could not be read (one clause, quoting the line's text short and printable).
    """

    distance_mm: float | None = None
    problem: str | None = None


def split_item(text: str) -> tuple[str, str] | None:
    """A comment or one-cell line as (name, value), split at its first ``:``, ``=``, ``;`` or tab.

    None when there is no such separator or no name before it.

    Examples
    --------
    >>> split_item("Measurement distance = 0.5 m"), split_item("distance;500;mm"), split_item("no item")
    (('Measurement distance', '0.5 m'), ('distance', '500;mm'), None)
    """
    text = text[:MAX_STATEMENT_CHARS]
    found = [i for i in (text.find(s) for s in _SEPARATORS) if i >= 0]
    if not found:
        return None
    at = min(found)
    name = text[:at].strip()
    return (name, text[at + 1 :].strip()) if name else None


def _name_unit(name: str) -> tuple[str | None, str | None]:
    """(known unit, unknown bracketed text) a metadata name states: ``Distance [mm]``, ``distance_mm``."""
    name = name.strip().lower()
    if name.endswith((")", "]")):
        inner = name[max(name.rfind("("), name.rfind("[")) + 1 : -1].strip()
        return (inner, None) if inner in LENGTH_UNITS_MM else (None, inner or None)
    words = name.replace("_", " ").replace("-", " ").split()
    return (words[-1], None) if len(words) > 1 and words[-1] in LENGTH_UNITS_MM else (None, None)


def _number(text: str) -> tuple[str, int] | None:
    """The number ``text`` begins with (sign, digits, one decimal point or comma) and where it ends."""
    i = 0
    n = len(text)
    if i < n and text[i] in "+-":
        i += 1
    while i < n and text[i] in _DIGITS:
        i += 1
    if i + 1 < n and text[i] in ".," and text[i + 1] in _DIGITS:
        i += 1
        while i < n and text[i] in _DIGITS:
            i += 1
    return (text[:i], i) if text[:i].lstrip("+-") else None


def _thousands_or_decimal(number: str) -> bool:
    """``1,500`` may be 1.5 or 1500: a comma before exactly three digits, after a whole part that is not 0."""
    whole, comma, fraction = number.lstrip("+-").partition(",")
    return bool(comma) and len(fraction) == 3 and whole.strip("0") != ""


def read_distance(name: str, value: object) -> DistanceStatement | None:
    """The distance a metadata line (``name``, ``value``) states; None when it states none.

    A line states a distance when ``name`` holds the word ``distance`` and ``value`` is a number or begins with
    one. Its unit follows the number or closes the name; a unit this module does not know, none, or two that
    differ make it a statement that cannot be read (a ``problem``).

    Parameters
    ----------
    name : str
        The line's name (the text before its separator).
    value : object
        Its value: text, or a number (a JSON value).

    Examples
    --------
    >>> read_distance("Distance [mm]", "500"), read_distance("distance", "20 in")
    (DistanceStatement(distance_mm=500.0, problem=None), DistanceStatement(distance_mm=508.0, problem=None))
    >>> read_distance("distance", "3 furlongs").problem
    "its unit 'furlongs' is not mm, cm, m or in"
    >>> read_distance("Instrument", "SR-9") is None, read_distance("Distance", "n/a") is None
    (True, True)
    """
    name = str(name)[:MAX_STATEMENT_CHARS]
    if "distance" not in name.lower():
        return None
    name_unit, name_other = _name_unit(name)
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        number_text, magnitude, value_unit = repr(value), float(value), None
    else:
        text = str(value)[:MAX_STATEMENT_CHARS].lstrip(_BEFORE_NUMBER)
        found = _number(text)
        if found is None:
            return None
        number_text, end = found
        if _thousands_or_decimal(number_text):
            return DistanceStatement(problem=f"in {excerpt(number_text)} the comma may mark thousands or decimals")
        magnitude = float(number_text.replace(",", "."))
        rest = text[end:].lstrip(_BEFORE_UNIT)
        stop = 0
        while stop < len(rest) and rest[stop].isalnum():
            stop += 1
        value_unit = rest[:stop].lower() or None
    if value_unit is not None and value_unit not in LENGTH_UNITS_MM:
        return DistanceStatement(problem=f"its unit {excerpt(value_unit)} is not mm, cm, m or in")
    if value_unit is not None and name_unit is not None and LENGTH_UNITS_MM[value_unit] != LENGTH_UNITS_MM[name_unit]:
        return DistanceStatement(problem=f"its name gives the unit {name_unit!r} but its value {value_unit!r}")
    unit = value_unit or name_unit
    if unit is None:
        if name_other is not None:
            return DistanceStatement(problem=f"its unit {excerpt(name_other)} is not mm, cm, m or in")
        return DistanceStatement(problem="it gives no unit")
    distance_mm = magnitude * LENGTH_UNITS_MM[unit]
    if not (math.isfinite(distance_mm) and distance_mm > 0):
        return DistanceStatement(problem=f"{excerpt(number_text)} is not a positive, finite length")
    return DistanceStatement(distance_mm=distance_mm)
