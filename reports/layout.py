"""The A4 page every report shares: margins, a running header, the issuer's line and the footer with "page N of M".

The total page count is known only after the last page, so the canvas keeps each page's state and draws
the header and footer when the document is saved.
"""

from __future__ import annotations

import datetime
import io
from functools import partial

from reportlab.lib.pagesizes import A4
from reportlab.lib.units import mm
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import Flowable, KeepInFrame, SimpleDocTemplate, Table

from hazard.reports.fonts import FontSet, report_fonts
from hazard.reports.style import INK, MUTED, RULE, Styles
from hazard.reports.timestamp import report_time
from hazard.reports.wording import FOOTER

__all__ = [
    "FRAME_HEIGHT",
    "FRAME_WIDTH",
    "LEAST_SCALE",
    "MARGIN",
    "PAGE_HEIGHT",
    "PAGE_WIDTH",
    "build_pdf",
    "fit_page",
    "heading_table",
    "start_report",
]

PAGE_WIDTH, PAGE_HEIGHT = A4
MARGIN = 14 * mm
FRAME_WIDTH = PAGE_WIDTH - 2 * MARGIN
_TOP_MARGIN, _BOTTOM_MARGIN = 12 * mm, 16 * mm
FRAME_HEIGHT = PAGE_HEIGHT - _TOP_MARGIN - _BOTTOM_MARGIN - 12
"""Height a page's flowables can fill: the frame less its 6 pt padding at top and bottom [pt]."""
_FOOTER_Y = 8 * mm
_HEADER_Y = PAGE_HEIGHT - 8 * mm


class _FramedCanvas(Canvas):
    """A canvas that adds the running header (from page 2), the issuer's line and the footer to every page on save."""

    def __init__(
        self,
        *args,
        fonts: FontSet,
        header: str,
        identity: str = "",
        moment: datetime.datetime | None = None,
        **kwargs,
    ) -> None:
        super().__init__(*args, **kwargs)
        if moment is not None:  # the metadata's date is the report's, not reportlab's fixed one
            stamp = moment.astimezone(datetime.UTC).strftime("D:%Y%m%d%H%M%S+00'00'")
            self.setDateFormatter(lambda *_: stamp)
        self._fonts = fonts
        self._header = fonts.clean(header)
        self._identity = fonts.clean(identity)
        self._pages: list[dict] = []

    def showPage(self) -> None:  # reportlab's name, overridden
        self._pages.append(dict(self.__dict__))
        self._startPage()

    def save(self) -> None:
        total = len(self._pages)
        for state in self._pages:
            self.__dict__.update(state)
            self._decorate(total)
            super().showPage()
        super().save()

    def _draw_identity(self, y: float) -> None:
        """The issuer's line, right-aligned; smaller type (down to 5.5 pt), then cut with "…", so it fits the width."""
        text, size = self._identity, 7.5
        while size > 5.5 and stringWidth(text, self._fonts.regular, size) > FRAME_WIDTH:
            size -= 0.5
        while stringWidth(text, self._fonts.regular, size) > FRAME_WIDTH:
            text = text[: len(text) - 2] + "…"
        self.setFont(self._fonts.regular, size)
        self.drawRightString(PAGE_WIDTH - MARGIN, y, text)

    def _decorate(self, total: int) -> None:
        number = self.getPageNumber()
        self.saveState()
        self.setStrokeColor(RULE)
        self.setLineWidth(0.5)
        self.line(MARGIN, _FOOTER_Y + 9, PAGE_WIDTH - MARGIN, _FOOTER_Y + 9)
        self.setFillColor(INK)
        self.setFont(self._fonts.bold, 7.5)
        self.drawString(MARGIN, _FOOTER_Y, FOOTER)
        self.setFont(self._fonts.regular, 7.5)
        self.drawRightString(PAGE_WIDTH - MARGIN, _FOOTER_Y, f"page {number} of {total}")
        self.setFillColor(MUTED)
        if number > 1:
            self.drawString(MARGIN, _HEADER_Y, self._header)
            self.line(MARGIN, _HEADER_Y - 4, PAGE_WIDTH - MARGIN, _HEADER_Y - 4)
        if self._identity:
            self._draw_identity(_HEADER_Y + (9 if number > 1 else 0))
        self.restoreState()


def build_pdf(
    flowables: list[Flowable],
    fonts: FontSet,
    title: str,
    header: str,
    author: str,
    moment: datetime.datetime | None = None,
    identity: str = "",
) -> bytes:
    """Lay ``flowables`` out on A4 pages and return the PDF.

    Parameters
    ----------
    flowables : list of Flowable
        The story, in order.
    fonts : FontSet
        The registered report fonts (for header and footer).
    title : str
        Document title (PDF metadata).
    header : str
        Running header printed from page 2 on.
    author : str
        Producer named in the metadata, e.g. ``"hazard 0.1.0"``.
    moment : datetime.datetime, optional
        Timezone-aware time recorded as the PDF's creation and modification date (the report's date); without it
        reportlab's fixed date of its invariant mode.
    identity : str
        Who issues the report (organisation, document number, prepared and checked by), at the top of every page.

    Returns
    -------
    bytes
        The PDF; identical for identical input (reportlab's invariant mode fixes the document id).
    """
    buffer = io.BytesIO()
    doc = SimpleDocTemplate(
        buffer,
        pagesize=A4,
        leftMargin=MARGIN,
        rightMargin=MARGIN,
        topMargin=_TOP_MARGIN,
        bottomMargin=_BOTTOM_MARGIN,
        title=title,
        author=author,
        creator=author,
        subject="Photobiological safety pre-screen",
        invariant=1,
    )
    doc.build(
        flowables, canvasmaker=partial(_FramedCanvas, fonts=fonts, header=header, identity=identity, moment=moment)
    )
    return buffer.getvalue()


def start_report(rendered_at: datetime.datetime | None) -> tuple[datetime.datetime, FontSet, Styles]:
    """What every report begins with.

    The time to print (``rendered_at``, else :func:`report_time`), the fonts and the paragraph styles in them.
    """
    fonts = report_fonts()
    return rendered_at or report_time(), fonts, Styles(fonts)


LEAST_SCALE = 0.88
"""Pages after the first are shrunk to fit their page down to this scale; longer, they run onto the next page."""


def fit_page(content: list[Flowable], least_scale: float = 0.0) -> list[Flowable]:
    """``content`` on one page, shrunk when it runs long.

    Unless that needs a scale below ``least_scale``: then as it is, to flow on.
    """
    if least_scale:  # measuring lays the content out once more: only when it may run on
        height = sum(f.wrap(FRAME_WIDTH, FRAME_HEIGHT)[1] + f.getSpaceBefore() + f.getSpaceAfter() for f in content)
        if height * least_scale > FRAME_HEIGHT:
            return content
    return [KeepInFrame(FRAME_WIDTH, FRAME_HEIGHT, content, mode="shrink")]


HEADING_RIGHT_WIDTH = 150
"""Width of a report heading's right column (date, tool, limit set) [pt]."""


def heading_table(left: list[Flowable], right: list[Flowable]) -> Table:
    """A report's heading: what it is about on the left, date, tool and limit set on the right, a rule below."""
    table = Table([[left, right]], colWidths=[FRAME_WIDTH - HEADING_RIGHT_WIDTH, HEADING_RIGHT_WIDTH])
    table.setStyle(
        [
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LEFTPADDING", (0, 0), (-1, -1), 0),
            ("RIGHTPADDING", (0, 0), (-1, -1), 0),
            ("LINEBELOW", (0, 0), (-1, 0), 1.2, INK),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 5),
        ]
    )
    return table
