"""Colours, paragraph styles and table styles of the reports.

The palette is our own: a pale-sage → saffron → burnt-orange → maroon ramp for the risk groups whose
lightness falls steadily (grey levels about 94 %, 77 %, 55 % and 24 %), so the order survives greyscale
printing. Colour never carries meaning alone: every group cell also says "Exempt", "RG1", "RG2" or "RG3".
Text and lines are slate ink on white.
"""

from __future__ import annotations

import re
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.enums import TA_LEFT
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import Paragraph, TableStyle

from hazard.reports.fonts import FontSet

__all__ = [
    "FAMILY_STYLE",
    "GROUP_FILL",
    "GROUP_INK",
    "HAIRLINE",
    "INK",
    "MUTED",
    "NEUTRAL",
    "PANEL",
    "RULE",
    "SPECTRUM_EDGE",
    "SPECTRUM_FILL",
    "ZONE_TINT",
    "Styles",
    "fit_widths",
    "group_fill",
    "group_ink",
    "table_style",
]

_EXPONENT = re.compile(r"\^([−-]?[0-9.]+)")

INK = colors.HexColor("#1F2A36")
"""Text, axes and the action-spectrum lines."""
MUTED = colors.HexColor("#4A5561")
"""Secondary text: captions, units, labels (dark enough to read in print)."""
RULE = colors.HexColor("#A7B1BA")
"""Table rules and chart grid."""
HAIRLINE = colors.HexColor("#D5DBE0")
"""Light rules between key-value rows."""
PANEL = colors.HexColor("#EEF1F4")
"""Background of table headers and boxed notes."""
NEUTRAL = colors.HexColor("#D9DCDF")
"""Fill of a tile that holds no group (not determined): grey, no group colour."""
SPECTRUM_FILL = colors.HexColor("#C5D3E0")
"""Area under the relative spectrum in the spectrum chart."""
SPECTRUM_EDGE = colors.HexColor("#3D5A78")
"""Outline of the relative spectrum."""

GROUP_FILL = {
    "Exempt": colors.HexColor("#EEF3EA"),
    "RG1": colors.HexColor("#E9C46A"),
    "RG2": colors.HexColor("#D1793F"),
    "RG3": colors.HexColor("#6B2737"),
}
"""Fill of a risk-group label, lightest for Exempt, darkest for RG3."""
GROUP_INK = {"Exempt": INK, "RG1": INK, "RG2": INK, "RG3": colors.white}
"""Text colour on each group fill (white only on the dark RG3 fill)."""
ZONE_TINT = {
    "Exempt": colors.HexColor("#EEF3EA"),
    "RG1": colors.HexColor("#F6E8C0"),
    "RG2": colors.HexColor("#F0CDB3"),
    "RG3": colors.HexColor("#E2C3CA"),
}
"""Pale fills of the group zones in the headroom scale and the distance strip's background: the same order of
lightness as :data:`GROUP_FILL`, pale enough that ink marks read on every one."""
FAMILY_STYLE = (
    ((), 1.3, colors.HexColor("#4B3F72")),
    ((4.5, 2.0), 1.2, colors.HexColor("#2B6A8C")),
    ((), 3.4, colors.HexColor("#A9C3DD")),
    ((6.0, 1.8, 1.2, 1.8), 1.1, colors.HexColor("#7A3B2E")),
    ((), 3.6, colors.HexColor("#EBBF95")),
    ((0.9, 1.9), 1.5, INK),
    ((10.0, 2.5), 1.6, colors.HexColor("#3F6B3A")),
    ((2.0, 1.2, 2.0, 1.2, 0.6, 3.0), 0.8, MUTED),
)
"""Dash pattern (empty: solid), width and colour of each hazard family's curve, in the limit set's order. Wide pale
bands alternate with thin dark lines, so a curve drawn over another (E_H along E_IR) still shows both."""


def group_fill(group: str | None) -> colors.Color:
    """Fill for a group label; white for a hazard without a group."""
    return GROUP_FILL.get(group or "", colors.white)


def group_ink(group: str | None) -> colors.Color:
    """Text colour that reads on :func:`group_fill`."""
    return GROUP_INK.get(group or "", INK)


class Styles:
    """Paragraph styles in the report fonts, and a helper that escapes and cleans text for them.

    Parameters
    ----------
    fonts : FontSet
        The registered report fonts.
    """

    def __init__(self, fonts: FontSet) -> None:
        self.fonts = fonts
        base = ParagraphStyle(
            "body", fontName=fonts.regular, fontSize=8.5, leading=11, textColor=INK, alignment=TA_LEFT
        )
        self.body = base
        self.small = ParagraphStyle("small", base, fontSize=7.5, leading=9.4)
        self.cell = ParagraphStyle("cell", base, fontSize=7.2, leading=8.8)
        self.cell_bold = ParagraphStyle("cell_bold", self.cell, fontName=fonts.bold)
        self.head = ParagraphStyle("head", self.cell, fontName=fonts.bold, fontSize=7, textColor=INK)
        self.digest = ParagraphStyle("digest", base, fontSize=6.4, leading=8.8)
        self.caption = ParagraphStyle("caption", base, fontSize=8, leading=10, textColor=MUTED)
        self.kicker = ParagraphStyle("kicker", base, fontName=fonts.bold, fontSize=7.5, leading=9.5, textColor=MUTED)
        self.title = ParagraphStyle("title", base, fontName=fonts.bold, fontSize=19, leading=22)
        self.subtitle = ParagraphStyle("subtitle", base, fontSize=11, leading=14)
        self.h2 = ParagraphStyle(
            "h2", base, fontName=fonts.bold, fontSize=10.5, leading=13, spaceBefore=6, spaceAfter=2
        )
        self.h3 = ParagraphStyle(
            "h3", base, fontName=fonts.bold, fontSize=9, leading=11.5, spaceBefore=5, spaceAfter=1.5
        )
        self.verdict = ParagraphStyle("verdict", base, fontName=fonts.bold, fontSize=30, leading=34, alignment=1)
        self.verdict_head = ParagraphStyle("verdict_head", base, fontName=fonts.bold, fontSize=11, leading=14)
        self.banner = ParagraphStyle(
            "banner",
            base,
            fontName=fonts.bold,
            fontSize=9.5,
            leading=12,
            borderWidth=1.5,
            borderColor=INK,
            borderPadding=(2, 4, 3, 4),
            spaceAfter=7,
            leftIndent=4,
            rightIndent=4,
            spaceBefore=2,
        )

    def text(self, text: str) -> str:
        """``text`` escaped for a Paragraph and cleaned for the fonts."""
        return escape(self.fonts.clean(text))

    def p(self, text: str, style: ParagraphStyle | None = None, markup: str = "") -> Paragraph:
        """A Paragraph of plain ``text`` (escaped), optionally preceded by trusted ``markup``.

        Parameters
        ----------
        text : str
            Plain text; escaped and cleaned for the fonts.
        style : ParagraphStyle, optional
            Defaults to :attr:`body`.
        markup : str
            Already-formed Paragraph markup put before ``text`` (e.g. a bold lead-in).
        """
        return Paragraph(markup + self.text(text), style or self.body)

    def formula(self, text: str, style: ParagraphStyle | None = None, lead: str = "") -> Paragraph:
        """A Paragraph of a formula or rule whose ``^`` marks an exponent (``t^0.25``): the exponent raised.

        ``lead``, when given, goes first in bold.
        """
        markup = f"<b>{self.text(lead)}</b> " if lead else ""
        return Paragraph(markup + _EXPONENT.sub(r"<super>\1</super>", self.text(text)), style or self.body)

    def bold_width(self, text: str) -> float:
        """Width of a table cell holding ``text`` in bold cell type on one line, padding included [pt]."""
        return stringWidth(self.fonts.clean(text), self.fonts.bold, self.cell.fontSize) + 7

    def bold_lead(self, lead: str, text: str, style: ParagraphStyle | None = None) -> Paragraph:
        """A Paragraph starting with ``lead`` in bold, then ``text``."""
        return self.p(text, style, markup=f"<b>{self.text(lead)}</b> ")


def table_style(header_rows: int = 1, extra: list[tuple] | None = None) -> TableStyle:
    """The grid every report table uses: panel-coloured header, hairline rules, top-aligned cells.

    Parameters
    ----------
    header_rows : int
        Rows drawn as header.
    extra : list of tuple, optional
        Further TableStyle commands (e.g. group fills).
    """
    commands = [
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ("TOPPADDING", (0, 0), (-1, -1), 2),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
        ("LINEBELOW", (0, 0), (-1, -1), 0.35, RULE),
        ("LINEABOVE", (0, 0), (-1, 0), 0.8, INK),
        ("LINEBELOW", (0, -1), (-1, -1), 0.8, INK),
    ]
    if header_rows:
        commands += [
            ("BACKGROUND", (0, 0), (-1, header_rows - 1), PANEL),
            ("LINEBELOW", (0, header_rows - 1), (-1, header_rows - 1), 0.6, INK),
        ]
    return TableStyle(commands + (extra or []))


def fit_widths(
    header: list[str],
    body: list[list[str]],
    fonts: FontSet,
    total: float,
    flexible: int,
    size: float,
    bold: set[int],
    min_flexible: float = 90,
    padding: float = 7,
) -> list[float]:
    """Table column widths that keep each body cell on one line where the page allows.

    Parameters
    ----------
    header : list of str
        Column headings, set in bold; they may wrap between words.
    body : list of list of str
        The cells' texts, row by row.
    fonts : FontSet
        Report fonts.
    total : float
        Width of the table [pt].
    flexible : int
        Column that takes what is left (at least ``min_flexible``) and wraps.
    size : float
        Font size of the cells [pt].
    bold : set of int
        Body columns set in bold.
    min_flexible, padding : float
        Least width of the flexible column; left plus right cell padding [pt].

    Returns
    -------
    list of float
        Widths adding up to ``total``. When the other columns need more than ``total - min_flexible`` they
        shrink in proportion (and wrap), never below their longest heading word.
    """

    def width(text: str, face: str) -> float:
        return stringWidth(fonts.clean(text), face, size)

    floor = [max((width(word, fonts.bold) for word in head.split()), default=0.0) + padding for head in header]
    natural = [
        max([floor[c]] + [width(row[c], fonts.bold if c in bold else fonts.regular) + padding for row in body])
        for c in range(len(header))
    ]
    others = [c for c in range(len(header)) if c != flexible]
    room = total - max(min_flexible, total - sum(natural[c] for c in others))
    stretch = sum(natural[c] - floor[c] for c in others)
    share = 1.0 if stretch <= 0 else min(1.0, (room - sum(floor[c] for c in others)) / stretch)
    widths = [floor[c] + (natural[c] - floor[c]) * share for c in range(len(header))]
    widths[flexible] = total - sum(widths[c] for c in others)
    return widths
