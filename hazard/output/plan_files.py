"""The laboratory test plan as files: ``plan.csv`` and ``plan.xlsx``, each written atomically.

One row per :class:`~hazard.assessment.lab_plan.PlanItem`, in the plan's rank order, with the same columns in both.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Iterable
from pathlib import Path

from hazard.assessment.lab_plan import PlanItem
from hazard.output.atomic import atomic_file, remove_stale_temporaries, write_atomic

__all__ = ["COLUMNS", "PLAN_CSV", "PLAN_XLSX", "write_plan_csv", "write_plan_items", "write_plan_xlsx"]

PLAN_CSV = "plan.csv"
PLAN_XLSX = "plan.xlsx"
COLUMNS: tuple[tuple[str, str, float], ...] = (
    ("rank", "rank", 6),
    ("priority", "priority", 8),
    ("id", "product_id", 16),
    ("name", "name", 30),
    ("vendor", "vendor", 18),
    ("model", "model", 14),
    ("group_now", "group", 16),
    ("change", "change", 14),
    ("kind", "kind", 18),
    ("hazard", "hazard", 14),
    ("what_to_measure", "measure", 60),
    ("why", "why", 60),
    ("settled_by", "settles", 48),
    ("extend_to_nm", "extend_to_nm", 14),
    ("assessment_distance_mm", "assessment_distance_mm", 12),
    ("rank_reason", "rank_reason", 44),
)
"""(column heading, PlanItem attribute, width in the workbook [characters])."""
_WRAPPED = {"name", "what_to_measure", "why", "settled_by", "rank_reason"}
_MAX_CELL = 32000
"""A workbook cell holds at most 32767 characters [1]."""


def _cells(item: PlanItem) -> list[str | int | float | None]:
    """The row's values: numbers as numbers (the distance to 0.1 mm), text as text."""
    values: list[str | int | float | None] = []
    for _, attribute, _ in COLUMNS:
        value = getattr(item, attribute)
        values.append(round(value, 1) if attribute == "assessment_distance_mm" and value is not None else value)
    return values


def write_plan_csv(path: str | Path, items: Iterable[PlanItem]) -> None:
    """Write the plan as UTF-8 CSV (a header row, then one row per item), atomically.

    Parameters
    ----------
    path : str or Path
        The file to write.
    items : iterable of PlanItem
        The ranked plan (:func:`~hazard.assessment.lab_plan.rank_plan`).
    """
    text = io.StringIO()
    table = csv.writer(text, lineterminator="\n")
    table.writerow([heading for heading, _, _ in COLUMNS])
    for item in items:
        table.writerow(["" if v is None else v for v in _cells(item)])
    write_atomic(path, text.getvalue().encode("utf-8"))


def _text_cell(value: str) -> str:
    """A string as a workbook can hold it: characters it forbids replaced by U+FFFD, cut to its cell size."""
    from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE

    return ILLEGAL_CHARACTERS_RE.sub("\ufffd", value)[:_MAX_CELL]


def write_plan_xlsx(path: str | Path, items: Iterable[PlanItem]) -> None:
    """Write the plan as an .xlsx workbook, atomically.

    One sheet: the header row in bold and frozen, a filter on every column, set widths, long texts wrapped. Every
    text is stored as text (a name starting with "=" never becomes a formula).

    Parameters
    ----------
    path : str or Path
        The file to write.
    items : iterable of PlanItem
        The ranked plan.
    """
    from openpyxl import Workbook
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter

    book = Workbook()
    sheet = book.active
    sheet.title = "plan"
    top = Alignment(vertical="top")
    wrapped = Alignment(vertical="top", wrap_text=True)
    for column, (heading, _, width) in enumerate(COLUMNS, start=1):
        cell = sheet.cell(row=1, column=column, value=heading)
        cell.font = Font(bold=True)
        cell.alignment = wrapped
        sheet.column_dimensions[get_column_letter(column)].width = width
    row = 1
    for row, item in enumerate(items, start=2):
        for column, value in enumerate(_cells(item), start=1):
            cell = sheet.cell(row=row, column=column)
            if isinstance(value, str):
                cell.value = _text_cell(value)
                cell.data_type = "s"  # text, even when it starts with "="
            else:
                cell.value = value
            cell.alignment = wrapped if COLUMNS[column - 1][0] in _WRAPPED else top
    sheet.freeze_panes = "A2"
    sheet.auto_filter.ref = f"A1:{get_column_letter(len(COLUMNS))}{row}"
    with atomic_file(path) as out:
        book.save(out)


def write_plan_items(folder: str | Path, items: list[PlanItem]) -> list[Path]:
    """Write ``plan.csv`` and ``plan.xlsx`` of a ranked plan into ``folder`` (made if missing).

    What a killed earlier run left while writing them is removed first.

    Returns
    -------
    list of Path
        The files written.
    """
    folder = Path(folder)
    paths = [folder / PLAN_CSV, folder / PLAN_XLSX]
    for path, write in zip(paths, (write_plan_csv, write_plan_xlsx), strict=True):
        remove_stale_temporaries(folder, path.name)
        write(path, items)
    return paths
