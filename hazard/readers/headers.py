"""The one place that maps header names: which column is the wavelength, which unit a header cell states,
and which value column a record's ``column`` names."""

from __future__ import annotations

from hazard.errors import InputError
from hazard.units import parse_spectral_unit

__all__ = ["header_unit", "wavelength_scale", "choose_value_column", "WAVELENGTH_NAMES"]

WAVELENGTH_NAMES = ("wavelength", "wavelength_nm", "wl", "lambda", "λ", "nm", "wave")
_OPEN, _CLOSE = "[(", "])"


def _bracketed(cell: str) -> tuple[int, str] | None:
    """Where a cell's final bracketed part starts, and its text: ``[unit]`` or ``(unit)`` at the end of the
    cell, which may hold parenthesised groups one level deep (``(µW/(cm²·nm))``). One backward pass, so any
    cell costs linear time.

    Examples
    --------
    >>> _bracketed("E (µW/(cm²·nm)) "), _bracketed("a (b) (c)"), _bracketed("x]"), _bracketed("a ) b")
    ((2, 'µW/(cm²·nm)'), (6, 'c'), None, None)
    """
    end = len(cell.rstrip()) - 1
    if end < 0 or cell[end] not in _CLOSE:
        return None
    nested = False
    for i in range(end - 1, -1, -1):
        char = cell[i]
        if nested:  # inside a nested (...) group, read backwards: anything but parentheses until its '('
            if char == "(":
                nested = False
            elif char == ")":
                return None
        elif char == ")":
            nested = True
        elif char in _OPEN:
            return i, cell[i + 1:end].strip()
        elif char == "]":
            return None
    return None


def _unit_text(cell: str) -> str | None:
    """The unit a header cell states: the text in its last brackets, or the cell after a name."""
    found = _bracketed(cell)
    if found:
        return found[1]
    parts = cell.split(None, 1)
    return parts[1].strip() if len(parts) == 2 else None


def header_unit(cell: str) -> str | None:
    """The spectral unit a value-column header states, or None when it states none we can read.

    Examples
    --------
    >>> header_unit("Irradiance [mW/m²/nm]"), header_unit("E (µW/(cm²·nm))"), header_unit("counts")
    ('mW/m²/nm', 'µW/(cm²·nm)', None)
    """
    for candidate in (_unit_text(cell), cell):
        if not candidate:
            continue
        try:
            parse_spectral_unit(candidate)
        except ValueError:
            continue
        return candidate
    return None


def wavelength_scale(cell: str | None) -> float:
    """Multiplier to nm stated by the wavelength column's header (1 when it states nm or nothing).

    Examples
    --------
    >>> wavelength_scale("Wavelength [µm]"), wavelength_scale("lambda (nm)"), wavelength_scale(None)
    (1000.0, 1.0, 1.0)
    """
    unit = (_unit_text(cell) or "") if cell else ""
    return 1000.0 if unit.replace("µ", "u").replace("μ", "u").strip().lower() == "um" else 1.0


def _bare(cell: str) -> str:
    found = _bracketed(cell)
    return (cell if found is None else cell[:found[0]]).strip().lower()


def choose_value_column(header: list[str] | None, width: int, column: str | int | None, path: str) -> int:
    """Index (0 = wavelength) of the value column among ``width`` columns.

    ``column`` is a header name (exact, then case-insensitive, then without its unit) or a 1-based number
    counted over the value columns. With one value column it may be omitted.
    """
    if column is None:
        if width > 2:
            names = ", ".join(header[1:]) + " or a number" if header else f"a number from 1 to {width - 1}"
            raise InputError(f"{width - 1} value columns",
                             f"name the one to use with 'column' in the record: {names}", path)
        return 1
    if isinstance(column, int) or (isinstance(column, str) and column.isdigit()):
        number = int(column)
        if not 1 <= number <= width - 1:
            raise InputError(f"column {number} does not exist ({width - 1} value columns)",
                             "give a number from 1 to the count of value columns", path)
        return number
    if header:
        for match in (lambda h: h == column, lambda h: h.lower() == column.lower(),
                      lambda h: _bare(h) == _bare(column)):
            found = [i for i, h in enumerate(header) if i > 0 and match(h)]
            if found:
                return found[0]
    known = ", ".join(header[1:]) if header else "none (the file has no header)"
    raise InputError(f"no value column named {column!r}", f"use one of: {known}", path)
