"""The batch summary PDF (hazard.reports.summary_pdf): rank, flags, failures and the minimum distance to Exempt."""

import re

import pytest
from conftest import FOOTER, LINEUP, RENDERED_AT, normalise, pdf_pages, with_tightest

import hazard
import hazard.reports.fonts
import hazard.reports.headroom
import hazard.reports.layout
import hazard.reports.product_pdf
import hazard.reports.studies
import hazard.reports.timestamp
from hazard.errors import InputError
from hazard.reports import rank_assessments, render_summary_pdf
from hazard.reports.ranking import is_borderline
from hazard.result import UncertaintyStudy


def test_summary_ranks_flags_and_lists_failures(tmp_path, lineup):
    bad = tmp_path / "cl-bad-1.toml"
    (tmp_path / "cl-bad-1.csv").write_text("wavelength_nm,value\n0.38,1\n0.39,2\n0.40,1\n", encoding="utf-8")
    bad.write_text(
        'id = "CL-BAD-1"\nspectrum = "cl-bad-1.csv"\ndistance_mm = 200.0\nsource_diameter_mm = 5.0\n', encoding="utf-8"
    )
    with pytest.raises(InputError) as failure:  # design/method.md §5: a wavelength column in µm is an error
        hazard.assess(bad)
    reason = f"{failure.value}\nsecond line, not shown"
    incomplete = hazard.assess(LINEUP / "cl-heat-2k.toml", {"no_emission_outside": False, "id": "CL-HEAT-RAW"})
    borderline = with_tightest(lineup["cl-cure-365"], "CL-EDGE", "RG2", {"Exempt": 9.0, "RG1": 2.7, "RG2": 0.9})
    products = [*lineup.values(), incomplete, borderline]
    pages = pdf_pages(render_summary_pdf(products, [("CL-BAD-1", reason)], RENDERED_AT))
    text = " ".join(pages)
    positions = [text.index(a.id + " ") for a in rank_assessments(products)]
    assert positions == sorted(positions)  # rows in rank order (project contract: reports/ranking.py)
    assert re.search(r"CL-HEAT-RAW .* INCOMPLETE", text)  # the incomplete product flagged in text
    # one incomplete product (CL-HEAT-RAW), one borderline (CL-EDGE at 0.9 of its RG2 limit; no line-up
    # product lies within 1.25x of a boundary by the values in its result)
    assert "incomplete: 1" in text and "borderline: 1" in text
    # CL-EDGE keeps the curing lamp's distance study: its minimum distance to Exempt sits between margin and flag
    assert re.search(r"CL-EDGE .* E_UVA: 2.7× RG1 limit; 90 % of RG2 limit \d+ mm BORDERLINE", text)
    assert normalise(str(failure.value)) in text and "second line, not shown" not in text
    for caution in {c for a in products for c in a.cautions}:
        assert normalise(caution) in text  # project contract: hazard/cautions.py, every caution shown
    for number, page in enumerate(pages, start=1):
        assert FOOTER in page and f"page {number} of {len(pages)}" in page


def _study(verdict: str) -> UncertaintyStudy:
    """An uncertainty study of ±10 % (k = 2) and ±1 nm with the given verdict."""
    low, high = ("RG1", "RG1") if verdict == "robust" else ("Exempt", "RG1")
    return UncertaintyStudy(
        uncertainty_pct=10.0,
        wavelength_uncertainty_nm=1.0,
        hazards=[],
        risk_group_low=low,
        risk_group_high=high,
        verdict=verdict,
        note=f"{verdict} by construction",
    )


def test_uncertainty_study_sets_borderline_and_ranks_it_first(lineup):
    base = lineup["cl-cure-365"]
    # project contract: issue "Beyond the label": with an uncertainty study its verdict is the BORDERLINE flag
    # (else the margin rule of reports/ranking.py), and borderline products rank first within their group
    study_edge = with_tightest(base, "RG1-STUDY-EDGE", "RG1", {"Exempt": 2.0, "RG1": 0.3, "RG2": 0.01}).model_copy(
        update={"uncertainty": _study("borderline")}
    )
    study_safe = with_tightest(base, "RG1-STUDY-SAFE", "RG1", {"Exempt": 3.0, "RG1": 0.95, "RG2": 0.1}).model_copy(
        update={"uncertainty": _study("robust")}
    )
    margin_edge = with_tightest(base, "RG1-MARGIN-EDGE", "RG1", {"Exempt": 2.8, "RG1": 0.85, "RG2": 0.1})
    loose = with_tightest(base, "RG1-LOOSE", "RG1", {"Exempt": 1.6, "RG1": 0.5, "RG2": 0.05})
    rg2 = with_tightest(base, "RG2-LOOSE", "RG2", {"Exempt": 10.0, "RG1": 3.0, "RG2": 0.1})
    # 0.3 and 2.0 of the RG1 and Exempt limits lie outside 0.8-1.25, 0.95 inside: the studies decide here
    assert [is_borderline(a) for a in (study_edge, study_safe, margin_edge, loose)] == [True, False, True, False]
    products = [loose, study_safe, rg2, study_edge, margin_edge]
    assert [a.id for a in rank_assessments(products)] == [
        "RG2-LOOSE",
        "RG1-MARGIN-EDGE",
        "RG1-STUDY-EDGE",
        "RG1-STUDY-SAFE",
        "RG1-LOOSE",
    ]
    text = " ".join(pdf_pages(render_summary_pdf(products, [], RENDERED_AT)))
    assert "borderline: 2" in text
    assert re.search(r"RG1-STUDY-EDGE .* BORDERLINE \(within ±10 %, ±1 nm\)", text)  # the study's flag, in words
    safe_row = text.split("RG1-STUDY-SAFE ")[1].split("RG1-LOOSE ")[0]  # ranked just before RG1-LOOSE
    assert "BORDERLINE" not in safe_row  # 0.95 of its RG1 limit, but the study says robust


def test_summary_cautions_are_never_split_from_their_heading(lineup):
    # project contract (issue: "one orphan bullet alone on page 2 of a batch summary"): the cautions stay together
    # with their heading, on one page, however long the ranked table runs (two copies of the line-up here)
    products = [*lineup.values(), *(a.model_copy(update={"id": a.id + "-B"}) for a in lineup.values())]
    pages = pdf_pages(render_summary_pdf(products, [], RENDERED_AT))
    holding = [page for page in pages if "Cautions" in page]
    assert len(pages) >= 2 and len(holding) == 1
    for caution in {c for a in products for c in a.cautions}:
        assert normalise(caution) in holding[0]


def test_summary_without_failures_says_so_in_a_sentence(lineup):
    # project contract: issue "Beyond the label", with no failed product one sentence instead of an empty table
    text = " ".join(pdf_pages(render_summary_pdf(list(lineup.values()), [], RENDERED_AT)))
    assert "Products that could not be assessed None: every product was assessed." in text
    assert "Why it could not be assessed" not in text


def test_summary_shows_the_minimum_distance_to_exempt(lineup):
    # project contract: issue "Beyond the label", a "min. distance to Exempt" column when distances are present;
    # the heater is Exempt beyond 1590 mm (test_heater_distances_and_remedies_are_printed); its E_IR is 1.974× the
    # RG2 limit, printed rounded up (hazard.output.formatting: a multiple over a limit is never printed smaller)
    heater = lineup["cl-heat-2k"]
    text = " ".join(pdf_pages(render_summary_pdf([heater, lineup["cl-desk-30"]], [], RENDERED_AT)))
    assert "Min. distance to Exempt" in text and re.search(r"CL-HEAT-2K .* 1.98× RG2 limit 1590 mm", text)
    bare = heater.model_copy(update={"distances": None})
    assert "Min. distance to Exempt" not in " ".join(pdf_pages(render_summary_pdf([bare], [], RENDERED_AT)))
