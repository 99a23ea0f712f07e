"""Delimited text spectra as instruments export them.

Comma, semicolon, tab or whitespace separated; decimal comma; UTF-8 with or without BOM, or Latin-1; CRLF;
``#`` comment lines; metadata lines before the table (``key: value``, ``key = value`` or ``key;value``,
kept as metadata); an optional header row (its cells may state units); several value columns.

The numeric body is parsed by numpy's C reader a chunk of rows at a time; where it fails, a careful pass over
that chunk finds the first bad line so the message can name it. Work is linear in the file's size.
"""

from __future__ import annotations

import io
import re

import numpy as np

from hazard.errors import InputError, excerpt
from hazard.inputs.readers.common import Limits, RawSpectrum, current_limits, decode_text, read_bytes, to_nm
from hazard.inputs.readers.headers import choose_value_column, wavelength_scale

__all__ = ["read_delimited"]

_NUMBER = re.compile(r"^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$")  # unambiguous: linear time on any cell
_DECIMAL_COMMA = re.compile(r"^[+-]?\d+,\d+([eE][+-]?\d+)?$")
_SPECIALS = ("nan", "inf", "-inf", "+inf")
PARSE_CHUNK_ROWS = 20_000
"""Rows given to numpy's parser at a time [1]."""


def _is_number(cell: str) -> bool:
    return bool(_NUMBER.match(cell)) or cell.lower() in _SPECIALS


def _layout(line: str) -> tuple[str | None, bool]:
    """(delimiter, decimal comma) of a data row: tab, semicolon, comma or whitespace (None)."""
    for delimiter in ("\t", ";"):
        if delimiter in line:
            cells = [c.strip() for c in line.split(delimiter)]
            return delimiter, any(_DECIMAL_COMMA.match(c) for c in cells)
    if "," in line:
        tokens = line.split()
        if len(tokens) >= 2 and any(_DECIMAL_COMMA.match(t) for t in tokens):
            return None, True
        return ",", False
    return None, False


def _cells(line: str, delimiter: str | None, decimal_comma: bool) -> list[str]:
    cells = [c.strip().strip('"') for c in (line.split(delimiter) if delimiter else line.split())]
    return [c.replace(",", ".") for c in cells] if decimal_comma else cells


def _metadata_item(line: str) -> tuple[str, str] | None:
    for separator in (":", "=", ";", "\t", ","):
        if separator in line:
            key, value = line.split(separator, 1)
            if key.strip():
                return key.strip(), value.strip().strip(";,\t").strip()
    return None


def _careful(
    rows: list[str],
    numbers: np.ndarray,
    delimiter: str | None,
    decimal_comma: bool,
    width: int,
    path: str,
    limits: Limits,
) -> np.ndarray:
    """Parse row by row, raising for the first bad line; the table (n, width)."""
    table = []
    for number, line in zip(numbers.tolist(), rows, strict=True):
        cells = _cells(line.strip(), delimiter, decimal_comma)
        if len(cells) != width:
            raise InputError(
                f"{len(cells)} cells where the table has {width}", "give every row the same columns", path, number
            )
        for cell in cells:
            _check_cell_length(cell, limits, path, number)
            if not cell:
                raise InputError(
                    "empty cell in a number column (the file may be truncated)",
                    "export the spectrum again, or remove the incomplete row",
                    path,
                    number,
                )
            if not _is_number(cell):
                raise InputError(
                    f"text {excerpt(cell)} in a number column",
                    "use plain numbers (decimal point or decimal comma, consistently)",
                    path,
                    number,
                )
        table.append([float(c) for c in cells])
    return np.array(table, dtype=float).reshape(-1, width)


def _check_cell_length(cell: str, limits: Limits, path: str, line: int) -> None:
    if len(cell) > limits.max_cell_chars:
        raise InputError(
            f"a cell of {len(cell):,} characters",
            f"keep cells under {limits.max_cell_chars:,} characters: a number, a column name or a unit",
            path,
            line,
        )


def _lines_from(text: str):
    """Lines of ``text`` one at a time, without splitting the whole (possibly large) file."""
    position = 0
    while position <= len(text):
        end = text.find("\n", position)
        if end < 0:
            yield text[position:]
            return
        yield text[position:end]
        position = end + 1


def _data_rows(body: str, first_line: int) -> tuple[list[str], np.ndarray]:
    """The body's rows without blank and comment lines, and their 1-based line numbers."""
    lines = body.split("\n")
    keep = [i for i, line in enumerate(lines) if (text := line.strip()) and not text.startswith("#")]
    if len(keep) == len(lines):
        return lines, np.arange(first_line, first_line + len(lines))
    return [lines[i] for i in keep], np.array(keep, dtype=int) + first_line


def _fast(rows: list[str], delimiter: str | None, decimal_comma: bool, width: int) -> np.ndarray | None:
    """The rows through numpy's C parser; None when it fails (the careful pass then names the bad line)."""
    body = "\n".join(rows)
    if decimal_comma:
        body = body.replace(",", ".")
    try:
        table = np.loadtxt(io.StringIO(body), delimiter=delimiter, ndmin=2, dtype=float, quotechar='"', comments=None)
    except ValueError:
        return None
    return table if table.shape == (len(rows), width) else None


def _parse(
    rows: list[str],
    numbers: np.ndarray,
    delimiter: str | None,
    decimal_comma: bool,
    width: int,
    path: str,
    limits: Limits,
) -> np.ndarray:
    """The table of ``rows``, a chunk at a time.

    numpy's C parser reads each chunk, the careful pass only a chunk it refuses, so that naming a bad last line costs no
    more than reading the file.
    """
    tables = [np.empty((0, width))]
    for k in range(0, len(rows), PARSE_CHUNK_ROWS):
        chunk = rows[k : k + PARSE_CHUNK_ROWS]
        table = _fast(chunk, delimiter, decimal_comma, width)
        tables.append(
            table
            if table is not None
            else _careful(chunk, numbers[k : k + PARSE_CHUNK_ROWS], delimiter, decimal_comma, width, path, limits)
        )
    return np.concatenate(tables)


def read_delimited(
    path: str, *, display_path: str, column: str | int | None = None, limits: Limits | None = None
) -> tuple[RawSpectrum, dict]:
    """Read a delimited text spectrum.

    Parameters
    ----------
    path : str
        File to open.
    display_path : str
        Name used in messages.
    column : str or int, optional
        Value column when there are several (header name or 1-based number).
    limits : Limits
        Size and row limits.

    Returns
    -------
    tuple of (RawSpectrum, dict)
        The numbers, and metadata: ``header``, ``value_column``, ``comments`` ((line, text) of the comment lines
        before the table), ``metadata`` (key → value from lines before the table; the last of a repeated key),
        ``metadata_items`` ((line, key, value) of every such line), ``delimiter``, ``decimal_comma``, ``sha256``.

    Raises
    ------
    InputError
    """
    limits = limits or current_limits()
    raw, digest = read_bytes(path, display_path, limits)
    if max(raw.count(b"\n"), raw.count(b"\r")) > 2 * limits.max_rows + 1000:  # room for blank lines
        raise InputError(f"more than {limits.max_rows:,} rows", "resample the spectrum to a coarser grid", display_path)
    text = decode_text(raw, display_path)
    if "\r" in text:
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    comments: list[tuple[int, str]] = []
    preamble: list[tuple[int, str]] = []
    start = None
    offset = 0
    for index, line in enumerate(_lines_from(text)):
        line_start, offset = offset, offset + len(line) + 1
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            comments.append((index + 1, stripped.lstrip("#").strip()))
            continue
        delimiter, decimal_comma = _layout(stripped)
        cells = _cells(stripped, delimiter, decimal_comma)
        if _is_number(cells[0]):
            if len(cells) < 2:
                raise InputError(
                    "only one column found",
                    "give two columns: wavelength in nm, then the spectral "
                    "value, separated by a comma, tab or semicolon",
                    display_path,
                    index + 1,
                )
            start = index
            break
        preamble.append((index + 1, stripped))
    body_offset = line_start
    if start is None:
        raise InputError("no data rows", "give two columns: wavelength in nm, then the spectral value", display_path)
    width = len(cells)
    if width > limits.max_columns:
        raise InputError(
            f"{width:,} columns, above the {limits.max_columns:,} limit",
            "keep the wavelength and the value columns you need",
            display_path,
            index + 1,
        )
    for cell in cells:
        _check_cell_length(cell, limits, display_path, index + 1)
    header, header_number = None, None
    if preamble:
        last_number, last_line = preamble[-1]
        header_cells = _cells(last_line, delimiter, False)
        if len(header_cells) == width:
            if any(_is_number(c) for c in _cells(last_line, delimiter, decimal_comma)[1:]):
                bad = header_cells[0]  # numbers beside it: a data row whose first cell is mistyped
                raise InputError(
                    f"text {excerpt(bad)} in a number column",
                    "use plain numbers (a letter O or l for a digit is a common slip)",
                    display_path,
                    last_number,
                )
            for cell in header_cells:
                _check_cell_length(cell, limits, display_path, last_number)
            header, header_number = header_cells, last_number
            preamble = preamble[:-1]
    items = [(number, *item) for number, line in preamble if (item := _metadata_item(line)) is not None]
    metadata = {key: value for _, key, value in items}
    value_index = choose_value_column(header, width, column, display_path)
    rows, numbers = _data_rows(text[body_offset:], start + 1)
    if len(rows) > limits.max_rows:
        raise InputError(
            f"{len(rows):,} rows, above the {limits.max_rows:,} limit",
            "resample the spectrum to a coarser grid",
            display_path,
        )
    table = _parse(rows, numbers, delimiter, decimal_comma, width, display_path, limits)
    scale = wavelength_scale(header[0] if header else None, display_path, header_number)
    warnings = []
    if scale != 1.0:
        warnings.append(
            f"{display_path}: the wavelength column's header gives {1 / scale if scale < 1 else scale:g}"
            f"{' nm per unit' if scale >= 1 else ' units per nm'}; converted to nm"
        )
    if not raw.endswith(b"\n"):
        warnings.append(
            f"{display_path}: the file does not end with a line break, so it may be truncated; check its last row"
        )
    spectrum = RawSpectrum(
        wavelength_nm=to_nm(table[:, 0], scale),
        value=table[:, value_index],
        lines=numbers,
        path=display_path,
        header_cell=header[value_index] if header else None,
        header_line=header_number,
        warnings=tuple(warnings),
    )
    info = {
        "header": header,
        "value_column": header[value_index] if header else value_index,
        "comments": comments,
        "metadata": metadata,
        "metadata_items": items,
        "delimiter": delimiter or "whitespace",
        "decimal_comma": decimal_comma,
        "sha256": digest,
    }
    return spectrum, info
