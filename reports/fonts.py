"""The report fonts: DejaVu Sans when installed, else reportlab's bundled Vera.

Report text uses α, λ, Ω, γ, µ, ≤, ·, –, × and superscript digits and minus (powers of ten, units). DejaVu Sans
(Debian's ``fonts-dejavu-core``) has all of them. Vera, which ships with reportlab, lacks α, λ, γ and most superscripts;
with Vera the three letters are spelled out and a superscript run is written after a caret before drawing
(:meth:`FontSet.clean`), so a report never shows a missing-glyph box.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import cache
from pathlib import Path

from reportlab.lib.fonts import addMapping
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont

__all__ = ["DEJAVU_DIR", "FontSet", "register_fonts", "report_fonts"]

DEJAVU_DIR = Path("/usr/share/fonts/truetype/dejavu")
_SPELLED_OUT = str.maketrans({"α": "alpha", "λ": "lambda", "γ": "gamma"})
_SUPERSCRIPTS = re.compile("[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+")
_PLAIN = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")


@dataclass(frozen=True)
class FontSet:
    """Registered font names and whether they draw Greek letters.

    Attributes
    ----------
    regular : str
        Registered name of the regular face.
    bold : str
        Registered name of the bold face.
    greek : bool
        The faces have α, λ, γ and the superscript digits.
    """

    regular: str
    bold: str
    greek: bool

    def clean(self, text: str) -> str:
        """``text`` as these fonts can draw it: α, λ, γ spelled out and superscripts after a caret when they lack them.

        Examples
        --------
        >>> FontSet("Vera", "VeraBd", greek=False).clean("α = 0.1 rad at λ > 380 nm, 5×10⁻⁴ W/m²")
        'alpha = 0.1 rad at lambda > 380 nm, 5×10^-4 W/m^2'
        """
        if self.greek:
            return text
        return _SUPERSCRIPTS.sub(lambda m: "^" + m.group().translate(_PLAIN), text.translate(_SPELLED_OUT))


def _register(regular: tuple[str, str], bold: tuple[str, str], greek: bool) -> FontSet:
    for name, path in (regular, bold):
        if name not in pdfmetrics.getRegisteredFontNames():
            pdfmetrics.registerFont(TTFont(name, path))
    family = regular[0]
    for is_bold, is_italic, face in ((0, 0, regular[0]), (1, 0, bold[0]), (0, 1, regular[0]), (1, 1, bold[0])):
        addMapping(family, is_bold, is_italic, face)
    return FontSet(regular=regular[0], bold=bold[0], greek=greek)


def register_fonts(dejavu_dir: Path = DEJAVU_DIR) -> FontSet:
    """Register DejaVu Sans from ``dejavu_dir`` if both faces are there, else the bundled Vera.

    Parameters
    ----------
    dejavu_dir : Path
        Folder holding ``DejaVuSans.ttf`` and ``DejaVuSans-Bold.ttf``.

    Returns
    -------
    FontSet
    """
    regular, bold = dejavu_dir / "DejaVuSans.ttf", dejavu_dir / "DejaVuSans-Bold.ttf"
    if regular.is_file() and bold.is_file():
        return _register(("DejaVuSans", str(regular)), ("DejaVuSans-Bold", str(bold)), greek=True)
    return _register(("Vera", "Vera.ttf"), ("VeraBd", "VeraBd.ttf"), greek=False)


@cache
def report_fonts() -> FontSet:
    """The fonts every report uses, registered once per process."""
    return register_fonts()
