"""The laboratory test plan as a section of the batch summary PDF: the first items of the ranked plan.

Rendering only: the items come ranked from :func:`hazard.assessment.lab_plan.rank_plan`. Every group is named in
text; its colour only repeats it.
"""

from __future__ import annotations

from reportlab.platypus import Flowable, Table

from hazard.assessment.lab_plan import PlanItem
from hazard.reports.layout import FRAME_WIDTH
from hazard.reports.style import Styles, group_fill, group_ink, table_style

__all__ = ["PDF_PLAN_ITEMS", "plan_section"]

PDF_PLAN_ITEMS = 40
"""The PDF lists at most this many items; plan.csv and plan.xlsx have them all [1]."""
_CHANGE = {
    "fix the input": "FIX THE INPUT",
    "could raise": "COULD RAISE",
    "could lower": "could lower",
    "no group change": "no group change",
}


def _group_code(item: PlanItem) -> str | None:
    """The group named first in the item's group words ('RG1 (lower bound)' → 'RG1'), for its fill."""
    first = item.group.split(" ", 1)[0]
    return first if first in ("Exempt", "RG1", "RG2", "RG3") else None


def plan_section(items: list[PlanItem], styles: Styles) -> list[Flowable]:
    """A heading, the first :data:`PDF_PLAN_ITEMS` items of the ranked plan as a table, and how it is ranked.

    Parameters
    ----------
    items : list of PlanItem
        The ranked plan.
    styles : Styles
        The report's paragraph styles.

    Returns
    -------
    list of Flowable
    """
    st = styles
    head = ["#", "Product", "Group now", "Change", "Kind", "What to ask the laboratory", "Settled by"]
    rows: list[list] = [[st.p(h, st.head) for h in head]]
    extra: list[tuple] = []
    shown = items[:PDF_PLAN_ITEMS]
    for row, item in enumerate(shown, start=1):
        code = _group_code(item)
        kind = item.kind + (f": {item.hazard}" if item.hazard else "")
        rows.append(
            [
                st.p(str(item.rank), st.cell),
                st.p(item.product_id, st.cell_bold),
                st.p(item.group, st.cell_bold.clone("plan_group", textColor=group_ink(code))),
                st.p(
                    _CHANGE[item.change], st.cell_bold if item.change in ("could raise", "fix the input") else st.cell
                ),
                st.p(kind, st.cell),
                st.p(item.measure + (f" ({item.why})" if item.kind != "fix input" else ""), st.cell),
                st.p(item.settles, st.cell),
            ]
        )
        extra.append(("BACKGROUND", (2, row), (2, row), group_fill(code)))
    if len(rows) == 1:
        rows.append([st.p("no items: no product in the plan", st.cell)] + [""] * (len(head) - 1))
        extra.append(("SPAN", (0, 1), (-1, 1)))
    id_width = min(FRAME_WIDTH / 6, max(st.bold_width(text) for text in ["Product", *(i.product_id for i in shown)]))
    widths = [18, id_width, 44, 46, 54, 0, 100]
    widths[5] = FRAME_WIDTH - sum(widths)
    table = Table(rows, colWidths=widths, repeatRows=1)
    table.setStyle(table_style(extra=extra))
    more = len(items) - PDF_PLAN_ITEMS
    return [
        st.p("What to ask the laboratory", st.h2),
        table,
        st.p(
            (f"… and {more} more items in plan.csv and plan.xlsx. " if more > 0 else "")
            + "Ranked safety first: FIX THE INPUT (nothing is known of the product), then items that COULD RAISE a "
            "group (a hazard not assessed, a value within the measurement uncertainty of the next limit, then an "
            "effect the data cannot show such as a hot spot in a small field), lower groups first; then items that "
            "could only lower a group; then figures that change no group. Settled by: the figure a laboratory "
            "result must reach to decide the item, such as the expanded uncertainty (k = 2) below which a value "
            "stays on its side of the limit. The group now is the pre-screen's; a lower bound where hazards were not "
            "assessed.",
            st.caption,
        ),
    ]
