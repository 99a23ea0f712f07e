"""The laboratory test plan on a terminal: a short ranked table."""

from __future__ import annotations

from hazard.assessment.lab_plan import PlanItem
from hazard.errors import one_line
from hazard.output.text import _table

__all__ = ["render_plan_table"]

_ID_CHARS = 24
"""Longest product id shown in the table [characters]; the files hold it whole."""


def render_plan_table(items: list[PlanItem], limit: int) -> str:
    """The first ``limit`` items of a ranked plan, one line each, what to ask the laboratory last.

    Parameters
    ----------
    items : list of PlanItem
        The ranked plan.
    limit : int
        Most items shown; a last line counts the rest.

    Returns
    -------
    str
        The table, ending with a newline.
    """
    columns = ("#", "Priority", "Product", "Group now", "Change", "Kind", "Hazard", "Ask the laboratory")
    rows: list[tuple[str, ...]] = [
        (
            str(item.rank),
            f"{item.priority:.1f}",
            one_line(item.product_id, _ID_CHARS),
            item.group,
            item.change,
            item.kind,
            item.hazard or "—",
            one_line(item.measure, 400),
        )
        for item in items[:limit]
    ]
    lines = _table(columns, rows)
    if len(items) > limit:
        lines.append(f"… and {len(items) - limit} more items: every one is in plan.csv and plan.xlsx")
    return "\n".join(lines) + "\n"
