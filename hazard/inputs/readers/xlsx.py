"""Spectra in an .xlsx workbook.

The first sheet, same layout rules as text: metadata rows, an optional header row, then numeric rows. The sheet is
streamed (:mod:`hazard.inputs.readers.workbook`) with the limits applied as it is read.
"""

from __future__ import annotations

import math

import numpy as np

from hazard.errors import InputError, excerpt
from hazard.inputs.readers.common import Limits, RawSpectrum, current_limits, read_bytes, to_nm
from hazard.inputs.readers.headers import choose_value_column, wavelength_scale
from hazard.inputs.readers.workbook import workbook_rows

__all__ = ["read_xlsx"]


def _number(cell) -> bool:
    return isinstance(cell, (int, float)) and not isinstance(cell, bool)


def _text(cell, limits: Limits, path: str, line: int) -> str:
    text = "" if cell is None else str(cell)
    if len(text) > limits.max_cell_chars:
        raise InputError(
            f"a cell of {len(text):,} characters", f"keep cells under {limits.max_cell_chars:,} characters", path, line
        )
    return text


def _as_float(cell: int | float) -> float:
    """The cell as a float; an integer beyond the float range becomes infinity, which validation refuses."""
    try:
        return float(cell)
    except OverflowError:
        return math.inf if cell > 0 else -math.inf


def _not_a_number(cell) -> str:
    if cell is None:
        return "an empty cell"
    if isinstance(cell, str):
        return f"text {excerpt(cell)}"
    return f"{type(cell).__name__} {excerpt(cell)}"


def read_xlsx(
    path: str, *, display_path: str, column: str | int | None = None, limits: Limits | None = None
) -> tuple[RawSpectrum, dict]:
    """Read the first sheet of a workbook; see :func:`hazard.inputs.readers.delimited.read_delimited`."""
    limits = limits or current_limits()
    raw, digest = read_bytes(path, display_path, limits)
    preamble: list[tuple[int, list]] = []
    data: list[list[float]] = []
    numbers: list[int] = []
    width = 0
    for number, cells in workbook_rows(
        raw,
        display_path,
        max_rows=limits.max_workbook_rows,
        max_columns=limits.max_workbook_columns,
        max_unpacked_bytes=limits.max_workbook_unpacked_bytes,
        what="spectrum",
    ):
        if not cells:
            continue
        if not data and not (len(cells) >= 2 and _number(cells[0])):
            preamble.append((number, cells))
            continue
        if not data:
            width = len(cells)
        if len(cells) != width:
            raise InputError(
                f"{len(cells)} cells where the table has {width}",
                "give every row the same columns",
                display_path,
                number,
            )
        for cell in cells:
            if not _number(cell):
                raise InputError(
                    f"{_not_a_number(cell)} in a number column", "use numbers in every data cell", display_path, number
                )
        data.append([_as_float(cell) for cell in cells])
        numbers.append(number)
    if not data:
        raise InputError(
            "no data rows on the first sheet",
            "put wavelength in nm and the value in the first two columns",
            display_path,
        )
    header = None
    if preamble and len(preamble[-1][1]) == width:
        line, cells = preamble[-1]
        header = [_text(c, limits, display_path, line) for c in cells]
    items = [
        (
            line,
            _text(p[0], limits, display_path, line),
            " ".join(_text(c, limits, display_path, line) for c in p[1:] if c is not None),
        )
        for line, p in (preamble[:-1] if header else preamble)
        if p and p[0] is not None
    ]
    metadata = {key: value for _, key, value in items}
    value_index = choose_value_column(header, width, column, display_path)
    table = np.array(data, dtype=float).reshape(-1, width)
    scale = wavelength_scale(header[0] if header else None, display_path, preamble[-1][0] if header else None)
    spectrum = RawSpectrum(
        wavelength_nm=to_nm(table[:, 0], scale),
        value=table[:, value_index],
        lines=np.array(numbers),
        path=display_path,
        header_cell=header[value_index] if header else None,
        header_line=preamble[-1][0] if header else None,
    )
    return spectrum, {
        "header": header,
        "value_column": header[value_index] if header else value_index,
        "comments": [],
        "metadata": metadata,
        "metadata_items": items,
        "sha256": digest,
    }
