"""The first sheet of an .xlsx workbook, parsed as a stream with bounded work.

openpyxl's read-only reader parses the sheet lazily, so a damaged part of the file surfaces while rows are
read; every such failure becomes one :class:`~hazard.errors.InputError`. Before parsing, the zip directory is
checked: the parts may not unpack to more than a limit (a small file can hold a huge sheet). While streaming, rows
(including the empty rows a sparse sheet implies) and columns are counted against their limits, whatever
size the sheet claims for itself.
"""

from __future__ import annotations

import io
import warnings
import zipfile

from hazard.errors import InputError

__all__ = ["workbook_rows"]


def _check_parts(raw: bytes, display: str, max_unpacked_bytes: int) -> None:
    """Refuse a file that is not a zip, or whose parts unpack beyond the limit.

    Sizes come from its directory; Python's zip reader stops at the stated size, so a false statement cannot unpack
    more.
    """
    try:
        with zipfile.ZipFile(io.BytesIO(raw)) as archive:
            total = sum(part.file_size for part in archive.infolist())
    except (zipfile.BadZipFile, zipfile.LargeZipFile, OSError, ValueError, EOFError):
        raise InputError(
            "not an .xlsx workbook (the file is not a valid zip archive)",
            "save it again as .xlsx, or export CSV",
            display,
        ) from None
    if total > max_unpacked_bytes:
        raise InputError(
            f"the workbook unpacks to {total / 2**20:.1f} MB, above the "
            f"{max_unpacked_bytes / 2**20:.0f} MB limit of a workbook",
            "keep only the table on the first sheet, or export CSV",
            display,
        )


def workbook_rows(
    raw: bytes, display: str, *, max_rows: int, max_columns: int, max_unpacked_bytes: int, what: str = "workbook"
) -> list[tuple[int, list]]:
    """(row number, cell values) of the first sheet's non-empty rows, trailing empty cells dropped.

    openpyxl's warnings about the file (invalid parts it skips) are silenced: the rows say what matters.

    Parameters
    ----------
    raw : bytes
        The .xlsx file's bytes.
    display : str
        How to name the file in messages.
    max_rows, max_columns : int
        Rows (empty ones included) and columns read at most; beyond them the file is refused [1].
    max_unpacked_bytes : int
        Largest size of all parts uncompressed [bytes].
    what : str
        What the workbook holds, for messages (``"spectrum"``, ``"manifest"``).

    Raises
    ------
    InputError
        Not a workbook, damaged content, or beyond a limit.
    """
    _check_parts(raw, display, max_unpacked_bytes)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return _rows(raw, display, max_rows, max_columns, what)


def _rows(raw: bytes, display: str, max_rows: int, max_columns: int, what: str) -> list[tuple[int, list]]:
    import openpyxl

    try:
        book = openpyxl.load_workbook(io.BytesIO(raw), read_only=True, data_only=True)
    except Exception as exc:  # a damaged workbook raises many kinds of error
        raise InputError(
            f"cannot read the workbook ({type(exc).__name__})", "save it again as .xlsx, or export CSV", display
        ) from None
    number, rows = 0, []
    try:
        if not book.worksheets:
            raise InputError("the workbook has no sheet", f"put the {what} on the first sheet", display)
        sheet = book.worksheets[0]
        sheet.reset_dimensions()  # the size a sheet states may be false: read what is there
        for number, values in enumerate(sheet.iter_rows(values_only=True, max_col=max_columns + 1), start=1):
            if number > max_rows:
                raise InputError(
                    f"more than {max_rows:,} rows on the first sheet",
                    f"keep only the {what} on the sheet, or export CSV",
                    display,
                )
            cells = list(values)
            if len(cells) > max_columns and cells[max_columns] is not None:
                raise InputError(f"more than {max_columns} columns", f"keep only the {what}'s columns", display, number)
            while cells and cells[-1] is None:
                cells.pop()
            if cells:
                rows.append((number, cells))
    except InputError:
        raise
    except Exception as exc:  # damaged XML surfaces lazily, as any of many errors
        raise InputError(
            f"cannot read the workbook: damaged content after row {number} ({type(exc).__name__})",
            "save it again as .xlsx, or export CSV",
            display,
        ) from None
    finally:
        book.close()
    return rows
