"""``summary.xlsx``: the batch summary as a workbook a colleague can sort, filter and read (openpyxl, streamed).

Three sheets: ``products`` (the columns of :mod:`hazard.output.summary_table`, numbers as numbers rounded to 3
significant digits, the overall group cells filled with the project's group colour and the group written in them),
``claims`` (one row per vendor claim, :mod:`hazard.output.claim_rows`) and ``failures`` (the products that could
not be assessed, with the reason and the fix). Every sheet has a frozen header row and filters. Rows are streamed
(openpyxl's write-only mode), so a batch of any size holds only a row at a time; the file is written atomically.
"""

from __future__ import annotations

import contextlib
from collections.abc import Iterable, Sequence
from pathlib import Path

from openpyxl import Workbook
from openpyxl.cell import WriteOnlyCell
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter

from hazard.output.atomic import atomic_file
from hazard.output.summary_table import Cell, inert_text

__all__ = ["FAILURE_COLUMNS", "SummaryWorkbook"]

FAILURE_COLUMNS = ("id", "name", "vendor", "model", "error")
"""The columns of the failures sheet."""
_WIDEST = 60
"""Widest column, in characters (longer text wraps in the cell)."""


def _hex(color) -> str:
    """A reportlab colour as the RRGGBB text openpyxl takes."""
    return color.hexval()[2:].upper()


class SummaryWorkbook:
    """The batch workbook, filled row by row and saved atomically by :meth:`save`.

    Parameters
    ----------
    columns : sequence of str
        The products sheet's columns.
    claim_columns : sequence of str
        The claims sheet's columns.
    group_columns : iterable of str
        Columns holding a risk group: their cells are filled with the group's colour.
    """

    def __init__(self, columns: Sequence[str], claim_columns: Sequence[str], group_columns: Iterable[str]):
        from hazard.reports.style import GROUP_FILL, GROUP_INK

        self._book = Workbook(write_only=True)
        self._fills = {g: PatternFill("solid", fgColor=_hex(c)) for g, c in GROUP_FILL.items()}
        self._inks = {g: Font(color=_hex(c), bold=True) for g, c in GROUP_INK.items()}
        self._group_columns = {columns.index(c) for c in group_columns}
        self._sheets = {}
        self._counts = {}
        for name, header in (("products", columns), ("claims", claim_columns), ("failures", FAILURE_COLUMNS)):
            sheet = self._book.create_sheet(name)
            sheet.freeze_panes = "B2"
            for k, title in enumerate(header, start=1):
                sheet.column_dimensions[get_column_letter(k)].width = min(_WIDEST, max(10, len(title) + 2))
            bold = Font(bold=True)
            cells = []
            for title in header:
                cell = WriteOnlyCell(sheet, value=title)
                cell.font = bold
                cell.alignment = Alignment(wrap_text=True, vertical="top")
                cells.append(cell)
            sheet.append(cells)
            self._sheets[name], self._counts[name] = sheet, (len(header), 1)

    def _append(self, name: str, values: Sequence[Cell]) -> None:
        width, rows = self._counts[name]
        self._sheets[name].append(self._cells(name, values))
        self._counts[name] = (width, rows + 1)

    def _cells(self, name: str, values: Sequence[Cell]) -> list[object]:
        """The cells of one row: text made inert (never a formula), group cells filled with their colour.

        Plain values cost openpyxl far less than styled cells, so only the group cells carry a style.
        """
        cells: list[object] = [inert_text(v) for v in values]
        if name == "products":
            for k in self._group_columns:
                value = values[k]
                if isinstance(value, str) and value in self._fills:
                    cell = WriteOnlyCell(self._sheets[name], value=value)
                    cell.fill, cell.font = self._fills[value], self._inks[value]
                    cells[k] = cell
        return cells

    def add_product(self, values: Sequence[Cell]) -> None:
        """One product's row, in the order of the columns."""
        self._append("products", values)

    def add_claim(self, values: Sequence[Cell]) -> None:
        """One vendor claim's row."""
        self._append("claims", values)

    def add_failure(self, values: Sequence[Cell]) -> None:
        """One failed product's row (:data:`FAILURE_COLUMNS`)."""
        self._append("failures", values)

    def save(self, path: Path) -> None:
        """Write the workbook to ``path`` atomically, each sheet's filter over all its rows."""
        for name, sheet in self._sheets.items():
            width, rows = self._counts[name]
            sheet.auto_filter.ref = f"A1:{get_column_letter(width)}{rows}"
        with atomic_file(path) as handle:
            try:
                self._book.save(handle)
            except (OSError, ValueError) as exc:  # a failed write; openpyxl may then fail to close its XML
                self.discard()
                raise _os_error_behind(exc) from None

    def discard(self) -> None:
        """Close the row writers of a workbook that will not be saved (a failed run), now and quietly.

        openpyxl's write-only sheets otherwise report a closed file on stderr when they are collected at exit,
        which would add lines to the one-line error the user gets.
        """
        for sheet in self._book.worksheets:
            writer = getattr(sheet, "_writer", None)
            for generator in (getattr(sheet, "_rows", None), getattr(writer, "xf", None)):
                if generator is not None:
                    with contextlib.suppress(Exception):
                        generator.close()


def _os_error_behind(exc: BaseException) -> BaseException:
    """The OSError (a full disk, a lost device) that ``exc`` was raised while handling, else ``exc`` itself."""
    cause: BaseException | None = exc
    while cause is not None and not isinstance(cause, OSError):
        cause = cause.__context__
    return cause if cause is not None else exc
