"""The one place that maps header names.

Which column is the wavelength, which unit a header cell states, and which value column a record's ``column`` names.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from hazard.errors import InputError
from hazard.inputs.units import parse_spectral_unit

__all__ = ["WAVELENGTH_NAMES", "HeaderStatement", "choose_value_column", "header_statement", "wavelength_scale"]

WAVELENGTH_NAMES = ("wavelength", "wavelength_nm", "wl", "lambda", "λ", "nm", "wave")
_OPEN, _CLOSE = "[(", "])"


def _bracketed(cell: str) -> tuple[int, str] | None:
    """Where a cell's final bracketed part starts, and its text.

    ``[unit]`` or ``(unit)`` at the end of the cell, which may hold parenthesised groups one level deep
    (``(µW/(cm²·nm))``). One backward pass, so any cell costs linear time.

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
            return i, cell[i + 1 : end].strip()
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


_UNCALIBRATED = re.compile(
    r"(?<![a-z])(counts?|cnts?|digits|adc|dn|raw|signal|intensity|relative|rel|a\.?u\.?|arb"
    r"|arbitrary|normali[sz]ed|norm|percent|transmittance|reflectance|absorbance|scope"
    r"|sample)(?![a-z])|%",
    re.IGNORECASE,
)
"""Words in a header cell that name values which are not a calibrated spectral irradiance or radiance."""


@dataclass(frozen=True)
class HeaderStatement:
    """What a value column's header cell (or a file's stated unit) says about the values.

    Attributes
    ----------
    cell : str
        The cell as written.
    unit : str or None
        The spectral unit it states, when it states one this tool reads.
    problem : str or None
        Why the values cannot be taken as calibrated spectral values without the record's ``unit``: the cell
        names counts, a percentage, a relative scale, or a unit this tool does not read.
    """

    cell: str
    unit: str | None = None
    problem: str | None = None


def header_statement(cell: str) -> HeaderStatement:
    """Read what a header cell states.

    A spectral unit, nothing (a plain name), or something the values cannot be trusted as (units are never guessed).

    Examples
    --------
    >>> header_statement("Irradiance [mW/m²/nm]").unit, header_statement("irradiance").problem
    ('mW/m²/nm', None)
    >>> header_statement("Counts").problem
    "'Counts', which names values that are not a calibrated spectral irradiance or radiance"
    >>> header_statement("Irradiance (W/m2)").problem
    "'Irradiance (W/m2)', whose unit 'W/m2' is a power per area without /nm: not a spectral quantity"
    >>> header_statement("E (furlongs/fortnight)").problem
    "'E (furlongs/fortnight)', whose unit 'furlongs/fortnight' this tool does not read"
    """
    stated = _unit_text(cell)
    for candidate in (stated, cell):
        if candidate:
            try:
                parse_spectral_unit(candidate)
            except ValueError:
                continue
            return HeaderStatement(cell, unit=candidate)
    if _UNCALIBRATED.search(cell):
        return HeaderStatement(
            cell, problem=f"{cell!r}, which names values that are not a calibrated spectral irradiance or radiance"
        )
    if stated:
        if _per_area(stated):
            return HeaderStatement(
                cell,
                problem=f"{cell!r}, whose unit {stated!r} is a power per area without /nm: not a spectral quantity",
            )
        return HeaderStatement(cell, problem=f"{cell!r}, whose unit {stated!r} this tool does not read")
    return HeaderStatement(cell)


def _per_area(text: str) -> bool:
    """``text`` reads as a spectral unit once '/nm' is added: a power per area (or per area and sr)."""
    try:
        parse_spectral_unit(f"{text}/nm")
    except ValueError:
        return False
    return True


_WAVELENGTH_UNITS = {
    "nm": 1.0,
    "nanometre": 1.0,
    "nanometer": 1.0,
    "nanometres": 1.0,
    "nanometers": 1.0,
    "um": 1000.0,
    "micron": 1000.0,
    "microns": 1000.0,
    "micrometre": 1000.0,
    "micrometer": 1000.0,
    "micrometres": 1000.0,
    "micrometers": 1000.0,
    "å": 0.1,
    "a": 0.1,
    "angstrom": 0.1,
    "angstroms": 0.1,
    "ångström": 0.1,
}
"""Wavelength units a header may state, and their factor to nm."""
_NOT_WAVELENGTH = re.compile(
    r"wave\s*number|cm\s*\^?\s*-\s*1|cm⁻¹|1\s*/\s*cm|\bev\b|\bthz\b|\bhz\b|frequency", re.IGNORECASE
)


def wavelength_scale(cell: str | None, path: str = "", line: int | None = None) -> float:
    """Multiplier to nm stated by the wavelength column's header (1 when it states nm or nothing).

    Raises
    ------
    InputError
        When the header states something that is not a wavelength unit this tool reads (wavenumbers,
        frequencies, energies, an unknown unit): units are never guessed.

    Examples
    --------
    >>> wavelength_scale("Wavelength [µm]"), wavelength_scale("lambda (nm)"), wavelength_scale(None)
    (1000.0, 1.0, 1.0)
    >>> wavelength_scale("Wavelength (Å)")
    0.1
    """
    if not cell:
        return 1.0
    if _NOT_WAVELENGTH.search(cell):
        raise InputError(
            f"the wavelength column's header {cell[:40]!r} states wavenumbers, frequencies or "
            f"energies, not wavelengths",
            "convert the column to wavelength in nm",
            path,
            line,
        )
    unit = _unit_text(cell)
    if unit is None:
        return 1.0
    key = unit.replace("µ", "u").replace("μ", "u").strip().lower()
    if key not in _WAVELENGTH_UNITS:
        raise InputError(
            f"the wavelength column's header states {unit[:40]!r}, a unit this tool does not read",
            "give the wavelength in nm (or µm or Å, named so in the header)",
            path,
            line,
        )
    return _WAVELENGTH_UNITS[key]


def _bare(cell: str) -> str:
    found = _bracketed(cell)
    return (cell if found is None else cell[: found[0]]).strip().lower()


def choose_value_column(header: list[str] | None, width: int, column: str | int | None, path: str) -> int:
    """Index (0 = wavelength) of the value column among ``width`` columns.

    ``column`` is a header name (exact, then case-insensitive, then without its unit) or a 1-based number
    counted over the value columns. With one value column it may be omitted.
    """
    if column is None:
        if width > 2:
            names = ", ".join(header[1:]) + " or a number" if header else f"a number from 1 to {width - 1}"
            raise InputError(
                f"{width - 1} value columns", f"name the one to use with 'column' in the record: {names}", path
            )
        return 1
    if isinstance(column, int) or (isinstance(column, str) and column.isdigit()):
        number = int(column)
        if not 1 <= number <= width - 1:
            raise InputError(
                f"column {number} does not exist ({width - 1} value columns)",
                "give a number from 1 to the count of value columns",
                path,
            )
        return number
    if header:
        for match in (
            lambda h: h == column,
            lambda h: h.lower() == column.lower(),
            lambda h: _bare(h) == _bare(column),
        ):
            found = [i for i, h in enumerate(header) if i > 0 and match(h)]
            if found:
                return found[0]
    known = ", ".join(header[1:]) if header else "none (the file has no header)"
    raise InputError(f"no value column named {column!r}", f"use one of: {known}", path)
