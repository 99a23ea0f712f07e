"""Delimited text spectra: CSV, TSV, semicolon or whitespace separated, ``#`` comments, optional header."""

from __future__ import annotations

import hashlib
import re

import numpy as np

from hazard.errors import InputError
from hazard.spectrum import Spectrum, validate_spectrum

__all__ = ["read_delimited"]

_NUMBER = re.compile(r"^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$")


def _split(line: str, delimiter: str | None) -> list[str]:
    cells = line.split(delimiter) if delimiter else line.split()
    return [cell.strip().strip('"') for cell in cells]


def _detect_delimiter(line: str) -> str | None:
    for delimiter in ("\t", ";", ","):
        if delimiter in line:
            return delimiter
    return None


def _is_number(cell: str) -> bool:
    return bool(_NUMBER.match(cell)) or cell.lower() in ("nan", "inf", "-inf", "+inf")


def _decode(raw: bytes, path: str) -> str:
    if b"\x00" in raw[:4096]:
        raise InputError("this is a binary file, not a text spectrum",
                         "export the spectrum as CSV or TSV text", path)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        return raw.decode("latin-1")


def read_delimited(path: str, *, display_path: str, quantity: str, factor_to_si: float,
                   column: str | int | None = None) -> tuple[Spectrum, dict]:
    """Read a two-column (or multi-column) text spectrum.

    Parameters
    ----------
    path : str
        File to open.
    display_path : str
        Name used in messages.
    quantity : str
        ``"irradiance"``, ``"radiance"`` or ``"relative"``.
    factor_to_si : float
        Multiplier from the file's unit to SI [1].
    column : str or int, optional
        Value column to use when there are several: a header name or a 1-based index counted over the
        value columns (the wavelength column is not counted).

    Returns
    -------
    tuple of (Spectrum, dict)
        The validated spectrum and metadata: ``header`` (list of column names or None),
        ``value_column`` (name or index used), ``comments`` (comment lines), ``sha256`` (of the file's
        bytes).

    Raises
    ------
    InputError
        Missing file, binary content, text in a number column, ragged rows, ambiguous columns.
    """
    try:
        with open(path, "rb") as handle:
            raw = handle.read()
    except FileNotFoundError:
        raise InputError("spectrum file not found", "check the 'spectrum' path (relative to the record's "
                         "folder)", display_path) from None
    except IsADirectoryError:
        raise InputError("spectrum path is a folder", "name a spectrum file", display_path) from None
    text = _decode(raw, display_path)
    header: list[str] | None = None
    comments: list[str] = []
    delimiter: str | None = None
    rows: list[list[str]] = []
    line_numbers: list[int] = []
    for number, line in enumerate(text.splitlines(), start=1):
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            comments.append(stripped.lstrip("#").strip())
            continue
        if delimiter is None and not rows and header is None:
            delimiter = _detect_delimiter(stripped)
        cells = _split(stripped, delimiter)
        if not rows and header is None and not _is_number(cells[0]):
            header = cells
            continue
        rows.append(cells)
        line_numbers.append(number)
    width = len(header) if header else (len(rows[0]) if rows else 2)
    if width < 2:
        raise InputError("only one column found", "give two columns: wavelength in nm, then the spectral "
                         "value, separated by a comma, tab or semicolon", display_path)
    value_index = _choose_column(header, width, column, display_path)
    wavelength = np.empty(len(rows))
    value = np.empty(len(rows))
    for i, (cells, number) in enumerate(zip(rows, line_numbers)):
        if len(cells) != width:
            raise InputError(f"{len(cells)} cells where the table has {width}",
                             "give every row the same columns", display_path, number)
        for target, cell in ((wavelength, cells[0]), (value, cells[value_index])):
            if not _is_number(cell):
                raise InputError(f"text {cell!r} in a number column",
                                 "use plain numbers with '.' as decimal point", display_path, number)
            target[i] = float(cell)
    spectrum = validate_spectrum(wavelength, value, np.array(line_numbers, dtype=int), display_path,
                                 factor_to_si, quantity)
    metadata = {"header": header, "value_column": value_index if header is None else header[value_index],
                "comments": comments, "sha256": hashlib.sha256(raw).hexdigest()}
    return spectrum, metadata


def _choose_column(header: list[str] | None, width: int, column: str | int | None, path: str) -> int:
    """Index of the value column among ``width`` cells (0 is the wavelength)."""
    if column is None:
        if width > 2:
            raise InputError(f"{width - 1} value columns",
                             "name the one to use with 'column' in the record (header name or number)", path)
        return 1
    if isinstance(column, int):
        if not 1 <= column <= width - 1:
            raise InputError(f"column {column} does not exist ({width - 1} value columns)",
                             "give a number from 1 to the count of value columns", path)
        return column
    if header is None or column not in header[1:]:
        known = ", ".join(header[1:]) if header else "none (the file has no header)"
        raise InputError(f"no value column named {column!r}", f"use one of: {known}", path)
    return header.index(column, 1)
