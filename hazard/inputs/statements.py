"""What a spectrum file says about itself, checked against the record.

The unit is never guessed, and a distance the file states that the record contradicts, or that cannot be read, is
named in a warning (:mod:`hazard.inputs.stated_distance` reads it).

A file states its unit in the value column's header cell (``Irradiance [mW/m²/nm]``), in a line before the
table or a comment whose key names a unit (``Unit: uW/cm2/nm``, ``# Y units = W/cm2/nm``), in a JSON key that
names a unit (``unit``, ``value_unit``), or in any line before the table that is a spectral unit and nothing
else (a unit row above the column names). A statement this tool reads is used (and all must agree with each
other and with the record's ``unit``); a statement it cannot trust as calibrated spectral values (``Counts``,
``%``, ``W/m2`` without /nm, a unit it does not read) is an error unless the record states ``unit`` itself.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterator
from itertools import pairwise

from hazard.errors import InputError, excerpt
from hazard.inputs.readers import RawSpectrum
from hazard.inputs.readers.headers import HeaderStatement, header_statement
from hazard.inputs.record import ProductRecord
from hazard.inputs.stated_distance import MAX_STATEMENT_CHARS, read_distance, split_item
from hazard.inputs.units import SpectralUnit, parse_spectral_unit

__all__ = [
    "MAX_DISTANCE_WARNINGS",
    "MAX_METADATA_ITEMS",
    "MAX_METADATA_TEXT",
    "file_metadata",
    "metadata_warnings",
    "resolve_unit",
]

MAX_METADATA_ITEMS = 40
"""Metadata lines of a file kept in the result (the first ones) [1]."""
MAX_METADATA_TEXT = 120
"""Characters kept of each metadata key and value [1]."""
DISTANCE_TOLERANCE = 0.01
"""A distance the file states differs from the record's beyond this relative amount: a warning [1]."""
MAX_DISTANCE_WARNINGS = 5
"""Distance statements of one file named in warnings; any more are counted in one more warning [1]."""

_UNIT_KEY = re.compile(r"(?<![a-z])units?(?![a-z])", re.IGNORECASE)
_COMMENT_ITEM = re.compile(r"^\s*([^:=]{1,80}?)\s*[:=]\s*(.+)$")


def _declared(text: str) -> HeaderStatement:
    """A text that is declared to be the values' unit (it follows a key naming a unit).

    Anything but a spectral unit this tool reads is a problem.
    """
    statement = header_statement(text)
    if statement.unit is not None or statement.problem is not None:
        return statement
    return HeaderStatement(text, problem=f"{text!r}, a unit this tool does not read")


def _items(metadata: dict) -> list[tuple[str, str, str]]:
    """(key, value, where) of the metadata lines and of the comments written as ``key: value``."""
    items = [
        (str(k), str(v).strip(), f"metadata line {str(k)[:40]!r}") for k, v in metadata.get("metadata", {}).items()
    ]
    for _, comment in metadata.get("comments", []):
        match = _COMMENT_ITEM.match(str(comment))
        if match:
            items.append((match.group(1), match.group(2).strip(), f"comment {str(comment)[:40]!r}"))
    return items


def _statements(raw: RawSpectrum, metadata: dict) -> list[tuple[HeaderStatement, int | None, str]]:
    """(statement, line, where) for every place the file speaks of its values' unit."""
    found = []
    if raw.header_cell:
        found.append((header_statement(raw.header_cell), raw.header_line, "header cell"))
    for key, value, where in _items(metadata):
        if not value:
            continue
        if _UNIT_KEY.search(key):
            found.append((_declared(value), None, where))
        elif (unit := header_statement(value)).unit == value:  # a line that is a spectral unit and nothing else
            found.append((unit, None, where))
    return found


def resolve_unit(
    record: ProductRecord, raw: RawSpectrum, metadata: dict, origin: str
) -> tuple[SpectralUnit, list[str]]:
    """The unit of the values, and warnings: the record's, checked against every statement of the file.

    A relative spectrum keeps its own scale (factor 1); its anchor sets the level.

    Raises
    ------
    InputError
        A statement that cannot be trusted while the record states no unit; statements that disagree with
        each other or with the record; a unit that does not fit the record's quantity.
    """
    if record.quantity == "relative":
        return SpectralUnit("relative", 1.0, record.effective_quantity == "radiance"), []
    warnings = []
    units = []
    for statement, line, where in _statements(raw, metadata):
        if statement.problem is not None:
            if record.unit is None:
                raise InputError(
                    f"the {where} says {statement.problem}; units are never guessed",
                    "if the values are calibrated, state the unit in the record (e.g. unit = "
                    '"W/m2/nm"); otherwise export calibrated spectral values',
                    raw.path,
                    line,
                )
            warnings.append(
                f"{raw.path}: the {where} says {statement.problem}; the values are taken in "
                f"{record.unit!r} as the record states"
            )
            continue
        if statement.unit is not None:
            units.append((parse_spectral_unit(statement.unit), statement.unit, line, where))
    for (first, text, _, where), (other, other_text, line, other_where) in pairwise(units):
        if not _same(first, other):
            raise InputError(
                f"the {where} says {text!r} but the {other_where} says {other_text!r}",
                "correct the file so it states one unit",
                raw.path,
                line,
            )
    if not units:
        return parse_spectral_unit(record.unit_text), warnings
    stated, text, line, where = units[0]
    if record.unit is None:
        exposure = record.quantity == "radiant_exposure"
        radiance_differs = not exposure and stated.per_steradian != (record.quantity == "radiance")
        if radiance_differs or stated.energy != exposure:
            raise InputError(
                f"the file's {where} gives {text!r}, which does not fit quantity {record.quantity!r}",
                "set quantity (and unit) to match the file",
                origin,
            )
        return stated, warnings
    given = parse_spectral_unit(record.unit)
    if not _same(given, stated):
        raise InputError(
            f"the record says unit {record.unit!r} but the file's {where} says {text!r}",
            "correct the record's unit, or remove it to use the file's",
            origin,
        )
    return given, warnings


def _same(a: SpectralUnit, b: SpectralUnit) -> bool:
    return math.isclose(a.factor_to_si, b.factor_to_si) and (a.per_steradian, a.energy) == (b.per_steradian, b.energy)


def file_metadata(metadata: dict) -> dict[str, str]:
    """The file's metadata lines as text, bounded.

    The first :data:`MAX_METADATA_ITEMS`, each key and value cut to :data:`MAX_METADATA_TEXT` characters of printable
    text.
    """

    def clean(text: object) -> str:
        printable = "".join(c if c.isprintable() else " " for c in str(text))
        return printable[:MAX_METADATA_TEXT].strip()

    items = list(metadata.get("metadata", {}).items())[:MAX_METADATA_ITEMS]
    return {clean(key): clean(value) for key, value in items}


def _distance_lines(metadata: dict) -> Iterator[tuple[str, object, int | None, str, str]]:
    """(name, value, line, kind, text) of every metadata line and comment written as an item (``name: value``).

    ``kind`` (``metadata`` or ``comment``) and ``text`` name it in a message. A line kept whole (a one-cell workbook
    row, ``Distance: 500 mm``) is split at its separator.
    """
    items = metadata.get("metadata_items")
    if items is None:  # a format without lines (JSON keys)
        items = [(None, key, value) for key, value in metadata.get("metadata", {}).items()]
    for line, key, value in items:
        whole = value is None or value == ""
        item = split_item(str(key)) if whole else (str(key), value)
        if item is not None:
            text = str(key) if whole else f"{str(key)[:MAX_STATEMENT_CHARS]}: {str(value)[:MAX_STATEMENT_CHARS]}"
            yield item[0], item[1], line, "metadata", text
    for line, comment in metadata.get("comments", []):
        if (item := split_item(comment)) is not None:
            yield item[0], item[1], line, "comment", comment


def metadata_warnings(record: ProductRecord, metadata: dict, path: str) -> list[str]:
    """Warnings for each distance the file states that differs from the record's ``distance_mm`` or cannot be read.

    Every metadata line and comment before the table is examined (:func:`hazard.inputs.stated_distance.read_distance`);
    the first :data:`MAX_DISTANCE_WARNINGS` are named, with the file and line, and any more counted. The record's
    distance is the one used: a statement of the file never changes the result.

    Parameters
    ----------
    record : ProductRecord
    metadata : dict
        What the reader found beside the numbers: ``metadata_items`` ((line, name, value) of each metadata line;
        else ``metadata``, name → value, without lines) and ``comments`` ((line, text) pairs).
    path : str
        The spectrum file as the user named it.
    """
    if record.distance_mm is None:
        return []
    warnings: list[str] = []
    more = 0
    for name, value, line, kind, text in _distance_lines(metadata):
        stated = read_distance(name, value)
        if stated is None or (
            stated.distance_mm is not None
            and math.isclose(stated.distance_mm, record.distance_mm, rel_tol=DISTANCE_TOLERANCE)
        ):
            continue
        if len(warnings) == MAX_DISTANCE_WARNINGS:
            more += 1
            continue
        where = f"{path}:{line}: the file's {kind}" if line is not None else f"{path}: the file's {kind}"
        quoted = excerpt(text[:MAX_STATEMENT_CHARS], 60)
        if stated.distance_mm is None:
            warnings.append(
                f"{where} {quoted} states a distance this tool cannot read ({stated.problem}); the record's "
                f"distance_mm of {record.distance_mm:g} mm is used, check that it is the measurement's"
            )
        else:
            warnings.append(
                f"{where} {quoted} states {stated.distance_mm:g} mm but the record's distance_mm is "
                f"{record.distance_mm:g} mm; the record's value is used, check which is right"
            )
    if more:
        warnings.append(
            f"{path}: {more} more distance statement(s) of the file differ from the record's distance_mm or cannot "
            f"be read; check the file's metadata"
        )
    return warnings
