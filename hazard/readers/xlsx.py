"""Spectra in an .xlsx workbook: the first sheet (or the sheet named in metadata), same layout rules as text:
metadata rows, an optional header row, then numeric rows."""

from __future__ import annotations

import numpy as np

from hazard.errors import InputError
from hazard.readers.common import Limits, RawSpectrum, current_limits, read_bytes
from hazard.readers.headers import choose_value_column, wavelength_scale

__all__ = ["read_xlsx"]


def _number(cell) -> bool:
    return isinstance(cell, (int, float)) and not isinstance(cell, bool)


def read_xlsx(path: str, *, display_path: str, column: str | int | None = None,
              limits: Limits | None = None) -> tuple[RawSpectrum, dict]:
    """Read the first sheet of a workbook; see :func:`hazard.readers.delimited.read_delimited`."""
    import openpyxl

    limits = limits or current_limits()
    _, digest = read_bytes(path, display_path, limits)
    try:
        book = openpyxl.load_workbook(path, read_only=True, data_only=True)
    except Exception as exc:  # noqa: BLE001 - a damaged workbook raises many kinds of error
        raise InputError(f"cannot read the workbook ({type(exc).__name__})", "save it again as .xlsx, or export "
                         "CSV", display_path) from None
    sheet = book.worksheets[0]
    if (sheet.max_row or 0) > limits.max_rows + 1000:
        raise InputError(f"more than {limits.max_rows:,} rows", "resample the spectrum", display_path)
    rows = [list(r) for r in sheet.iter_rows(values_only=True)]
    book.close()
    preamble, preamble_rows, data, numbers = [], [], [], []
    for number, cells in enumerate(rows, start=1):
        cells = [c for c in cells]
        while cells and cells[-1] is None:
            cells.pop()
        if not cells:
            continue
        if not data and not (len(cells) >= 2 and _number(cells[0])):
            preamble.append(cells)
            preamble_rows.append(number)
            continue
        data.append(cells)
        numbers.append(number)
    if not data:
        raise InputError("no data rows on the first sheet", "put wavelength in nm and the value in the first two "
                         "columns", display_path)
    width = len(data[0])
    header = [str(c) if c is not None else "" for c in preamble[-1]] if preamble and len(preamble[-1]) == width \
        else None
    metadata = {str(p[0]): " ".join(str(c) for c in p[1:] if c is not None) for p in
                (preamble[:-1] if header else preamble) if p and p[0] is not None}
    value_index = choose_value_column(header, width, column, display_path)
    table = np.empty((len(data), width))
    for i, (cells, number) in enumerate(zip(data, numbers)):
        if len(cells) != width:
            raise InputError(f"{len(cells)} cells where the table has {width}", "give every row the same columns",
                             display_path, number)
        for j, cell in enumerate(cells):
            if not _number(cell):
                raise InputError(f"text {cell!r} in a number column", "use numbers in every data cell",
                                 display_path, number)
            table[i, j] = float(cell)
    scale = wavelength_scale(header[0] if header else None)
    spectrum = RawSpectrum(wavelength_nm=table[:, 0] * scale, value=table[:, value_index],
                           lines=np.array(numbers), path=display_path,
                           header_cell=header[value_index] if header else None,
                           header_line=preamble_rows[-1] if header else None)
    return spectrum, {"header": header, "value_column": header[value_index] if header else value_index,
                      "comments": [], "metadata": metadata, "sheet": sheet.title, "sha256": digest}
