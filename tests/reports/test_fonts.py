"""Report fonts (hazard.reports.fonts): without DejaVu Sans, Greek letters are spelled out."""

from conftest import RENDERED_AT, pdf_pages

import hazard
import hazard.reports.fonts
import hazard.reports.headroom
import hazard.reports.layout
import hazard.reports.product_pdf
import hazard.reports.studies
import hazard.reports.timestamp
from hazard.reports import render_assessment_pdf
from hazard.reports.fonts import register_fonts


def test_without_dejavu_greek_is_spelled_out(tmp_path, monkeypatch, lineup):
    # reportlab's bundled Vera.ttf has no U+03B1 α, U+03BB λ, U+03B3 γ (its character map)
    fallback = register_fonts(tmp_path)  # an empty folder: DejaVu Sans is not there
    assert (fallback.regular, fallback.greek) == ("Vera", False)
    monkeypatch.setattr(hazard.reports.layout, "report_fonts", lambda: fallback)
    text = " ".join(pdf_pages(render_assessment_pdf(lineup["cl-pip-470"], RENDERED_AT)))
    assert "alpha" in text and "lambda" in text and "gamma" in text
    assert not {"α", "λ", "γ", "⁴", "⁻"} & set(text)  # Vera has neither these letters nor these superscripts
    assert "Ω_s" in text and "µs" in text  # Vera has Ω and µ, so they stay
