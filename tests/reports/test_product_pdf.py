"""Product reports (hazard.reports.product_pdf): every line-up product renders to three pages that carry its facts
(the third its distance, uncertainty and remedies studies), identically each time."""

import datetime
import doctest
import math
import re

import pytest
from conftest import EXPECTED_GROUP, FOOTER, LINEUP, RENDERED_AT, normalise, pdf_pages

import hazard
import hazard.reports.fonts
import hazard.reports.layout
import hazard.reports.product_pdf
import hazard.reports.studies
import hazard.reports.timestamp
from hazard.output.formatting import UNIT_DISPLAY, format_value
from hazard.reports import render_assessment_pdf, render_summary_pdf
from hazard.result import Assessment

SECTION = "Distance, uncertainty and remedies"  # project contract: issue "Beyond the label", the section's title


def _row_pattern(symbol: str, title: str, value: str, unit: str) -> str:
    """A hazard-table row as extracted: symbol, title (possibly wrapped), value, unit, in that order."""
    return r"\s".join(re.escape(part) for part in (symbol, *title.split(), value, unit))


@pytest.fixture(scope="module")
def lineup_pdfs(lineup) -> dict[str, bytes]:
    return {stem: render_assessment_pdf(a, RENDERED_AT) for stem, a in lineup.items()}


@pytest.mark.parametrize("stem", sorted(EXPECTED_GROUP))
def test_product_report_pages_hold_their_facts(stem, lineup, lineup_pdfs):
    a, pages = lineup[stem], pdf_pages(lineup_pdfs[stem])
    # hazard/assessment: hazard.assess computes distances and remedies by default; project contract
    # (reports/__init__.py): page 1 at a glance, page 2 input and method, then the studies from page 3 (a
    # pulsed emission table or a daily exposure section may carry them onto further pages)
    assert a.distances is not None and a.remedies is not None
    assert len(pages) == 3 if a.exposure is None and a.emission is None else len(pages) >= 3
    assert SECTION in pages[2] and SECTION not in pages[0] + pages[1]
    first, text = pages[0], " ".join(pages)
    assert a.id in first and a.id == stem.upper()  # examples/lineup/<stem>.toml: id is the stem in capitals
    assert f"Overall risk group: {EXPECTED_GROUP[stem]}" in first  # examples/README.md, as above
    for h in a.hazards.values():
        assert h.assessed  # examples/lineup: every record states no emission outside its measured range
        # project contract: hazard.output.formatting.format_value prints every value, in the row of its hazard
        assert re.search(
            _row_pattern(h.symbol, h.title, format_value(h.value), UNIT_DISPLAY.get(h.unit, h.unit)), first
        ), h.symbol
    for caution in a.cautions:
        # project contract: hazard/cautions.py, every chosen caution on page 1 and in full at the end
        assert normalise(caution) in first and normalise(caution) in pages[-1]
    for digest in (*a.provenance.inputs.values(), *(t["sha256"] for t in a.provenance.tables.values())):
        assert digest in text  # project contract: README "full provenance" (input and table SHA-256)
    assert "2024-06-01 12:00 UTC" in first  # the date shown is rendered_at, in UTC
    for number, page in enumerate(pages, start=1):
        assert FOOTER in page and f"page {number} of {len(pages)}" in page  # footer on every page


def test_incomplete_report_says_lower_bound_and_why(tmp_path):
    # examples/lineup/cl-heat-2k.csv spans 300-3000 nm and E_S needs 200-400 nm (design/method.md §1), so
    # without the record's no-emission statement E_S is not assessed (design/method.md §5, coverage)
    a = hazard.assess(LINEUP / "cl-heat-2k.toml", {"no_emission_outside": False})
    assert a.not_assessed == ["E_S"] and not a.complete
    pages = pdf_pages(render_assessment_pdf(a, RENDERED_AT))
    # project contract: reports/__init__.py, three pages with the studies, and one more for the record's
    # daily exposures (examples/lineup/cl-heat-2k.toml states some)
    assert a.exposure is not None and len(pages) == 4
    assert "LOWER BOUND — not all hazards assessed" in pages[0]  # project brief: shown prominently
    assert normalise(a.hazards["E_S"].note) in pages[0]  # the reason, from the result's own note
    assert "INCOMPLETE" in pages[0]


def test_contradicted_vendor_claim_is_named_on_page_one(lineup, lineup_pdfs):
    # examples/README.md: the spotlight is RG1 (blue light); examples/lineup/cl-spot-65.toml: its datasheet
    # claims Exempt and 6500 K; hazard/claims.py: a computed group higher than the claimed one contradicts the
    # claim (the CCT claim is checked with its own tolerance, consistent here)
    a = lineup["cl-spot-65"]
    assert [(c.claim, c.verdict) for c in a.claims] == [("risk group", "contradicted"), ("CCT", "consistent")]
    pages = pdf_pages(lineup_pdfs["cl-spot-65"])
    assert "1 CONTRADICTED (risk group: claimed Exempt, computed RG1), 1 consistent" in pages[0]
    assert normalise(a.claims[0].reason) in pages[1]
    summary = " ".join(pdf_pages(render_summary_pdf([a], [], RENDERED_AT)))
    assert "1 vendor claim CONTRADICTED" in summary


def test_without_studies_the_report_has_two_pages(lineup):
    # project contract: reports/__init__.py, page 3 only "when the result holds those studies" (a batch run
    # without --studies gives none: hazard/batch.py)
    bare = lineup["cl-heat-2k"].model_copy(
        update={"distances": None, "uncertainty": None, "remedies": None, "exposure": None}
    )
    pages = pdf_pages(render_assessment_pdf(bare, RENDERED_AT))
    assert len(pages) == 2 and SECTION not in " ".join(pages)
    for caution in bare.cautions:
        assert normalise(caution) in pages[-1]  # hazard/cautions.py: every caution in full at the end


def test_page_one_names_the_page_the_studies_start_on(lineup):
    # project contract: reports/product_pdf.py, page 1 points to the studies' page; 25 extra assumption lines
    # make page 2 run over (beyond the slight shrink it allows), so the section starts on page 4
    a = lineup["cl-heat-2k"]
    long = a.model_copy(
        update={"assumptions": a.assumptions + [f"Assumption {i}: " + "an invented line. " * 12 for i in range(25)]}
    )
    pages = pdf_pages(render_assessment_pdf(long, RENDERED_AT))
    assert [number for number, page in enumerate(pages, start=1) if page.startswith(SECTION)] == [4]
    assert "— page 4" in pages[0] and "(page 4)" in pages[0] and "page 3" not in pages[0]


def test_heater_distances_and_remedies_are_printed(lineup, lineup_pdfs):
    a = lineup["cl-heat-2k"]
    first, third = pdf_pages(lineup_pdfs["cl-heat-2k"])[0], pdf_pages(lineup_pdfs["cl-heat-2k"])[2]
    e_ir = a.hazards["E_IR"]
    # IEC 62471:2006 Table 6.1: the E_IR Exempt limit is 100 W/m2; examples/README.md: the heater is RG3 by E_IR,
    # the last family to reach Exempt (its blue light is only RG1)
    assert e_ir.limits["Exempt"] == 100.0 and a.deciding_hazards == ["E_IR"]
    # the record's spectrum is an irradiance scaled by the inverse-square law (the result's assumption), so
    # E_IR falls to its Exempt limit at 200 mm x sqrt(E_IR / 100 W/m2) = 200 x sqrt(6.32e3 / 100) = 1590 mm
    exempt_mm = a.assessment_distance_mm * math.sqrt(e_ir.value / 100.0)
    assert f"{exempt_mm:.0f}" == "1590"
    assert "Whole product 1590 mm (1.59 m)" in third  # project contract: mm as hazard/textout.py prints them
    assert "Exempt beyond 1590 mm" in first  # project contract: issue "Beyond the label", a line on page 1
    # E_IR is proportional to the emission: dimming to 100 / 6.32e3 = 1.58 % of today's output brings it to
    # its Exempt limit, and the other families are Exempt by then (blue light needs 1.84 %, the result says)
    assert f"{100.0 / e_ir.value * 100:.3g}" == "1.58"
    assert "Whole product (as E_IR) RG3 Exempt reduce to 1.58 % of today's output" in third
    assert "Exempt at 1.58 % of today's output" in first
    # the heater's emitting coil is 1.6 mm x 250 mm; near field: five source sizes (hazard/result.py
    # DistanceStudy.near_field_below_mm) = 1250 mm
    assert "near field, under 1250 mm: approximate" in third
    # the overall group falls RG3 -> RG2 -> RG1 -> Exempt with distance, labelled in text along the axis
    # (project contract: issue "Beyond the label", readable in greyscale); assessed at the standard's 200 mm
    # for a non-GLS lamp (design/method.md, assessment distance)
    assert "RG3 RG2 RG1 Exempt assessed at 200 mm" in third
    # the blue-light family never crosses RG2 (examples/README.md: heater blue light is RG1): the note is shown
    assert "within at every distance from 10 mm" in third
    assert "enlarge emitting area ×836" in third  # blue light L_B is a radiance: a diffuser lowers it


def test_uncertainty_verdict_is_printed_on_page_one_and_three(lineup, lineup_pdfs):
    # examples/lineup/cl-spot-65.toml states ±10 % (k = 2) and ±0.5 nm. Assessed at 2700 mm, just nearer than
    # where its blue light reaches the Exempt limit, L_B lies between 1 and 1/0.9 of that limit, so the -10 %
    # variant is Exempt and the nominal one RG1; hazard/uncertainty.py: a product whose overall group differs
    # between the variants is borderline
    edge = hazard.assess(LINEUP / "cl-spot-65.toml", {"at_distance_mm": 2700.0})
    assert edge.risk_group == "RG1" and 1.0 < edge.hazards["L_B"].margins["Exempt"] < 1 / 0.9
    assert edge.uncertainty.verdict == "borderline"
    pages = pdf_pages(render_assessment_pdf(edge, RENDERED_AT))
    assert len(pages) == 3
    # project contract: issue "Beyond the label", "borderline" next to the overall group on page 1
    assert re.search(r"what-if at 2700 mm RG1 BORDERLINE WHAT-IF at 2700 mm", pages[0])  # issue: what-if
    assert "What-if group at 2700 mm: RG1" in pages[0] and "Overall risk group" not in pages[0]
    assert f"Uncertainty: BORDERLINE — {normalise(edge.uncertainty.note)}" in pages[0]
    assert f"BORDERLINE — overall group Exempt to RG1: {normalise(edge.uncertainty.note)}" in pages[2]
    assert "blue light (L_B)" in pages[2] and "Exempt to RG1 (changes)" in pages[2]
    # the heater's deciding E_IR is 2x its RG2 limit (examples/README.md, the result's margin): ±10 % cannot
    # move it out of RG3
    robust = lineup["cl-heat-2k"]
    assert robust.uncertainty.verdict == "robust"
    pages = pdf_pages(lineup_pdfs["cl-heat-2k"])
    assert "Uncertainty: ROBUST" in pages[0] and "ROBUST — overall group RG3" in pages[2]
    assert "BORDERLINE" not in pages[0] and "(borderline)" not in pages[1]  # page 1; the running header


def test_report_renders_from_saved_json(tmp_path, lineup, lineup_pdfs):
    # project contract: README "reports/ only renders them, and can render from saved JSON"
    saved = tmp_path / "cl-germ-254.json"
    saved.write_text(lineup["cl-germ-254"].model_dump_json(), encoding="utf-8")
    loaded = Assessment.model_validate_json(saved.read_text(encoding="utf-8"))
    assert render_assessment_pdf(loaded, RENDERED_AT) == lineup_pdfs["cl-germ-254"]


def test_same_input_and_time_give_identical_bytes(lineup, lineup_pdfs):
    # project contract: README "Results are deterministic"; reproducible-builds.org SOURCE_DATE_EPOCH
    a = lineup["cl-heat-2k"]
    assert render_assessment_pdf(a, RENDERED_AT) == lineup_pdfs["cl-heat-2k"]
    later = RENDERED_AT + datetime.timedelta(days=1)
    assert render_assessment_pdf(a, later) != lineup_pdfs["cl-heat-2k"]
    summary = render_summary_pdf(list(lineup.values()), [], RENDERED_AT)
    assert render_summary_pdf(list(lineup.values()), [], RENDERED_AT) == summary


def test_naive_rendered_at_is_refused(lineup):
    # project habit (style.md): a time without a zone would print a guessed UTC time, so it is an error
    with pytest.raises(ValueError, match="timezone-aware"):
        render_assessment_pdf(lineup["cl-desk-30"], datetime.datetime(2024, 6, 1, 12, 0))


@pytest.mark.parametrize("module", [hazard.reports.fonts, hazard.reports.timestamp, hazard.reports.studies])
def test_docstring_examples(module):
    # project habit (style.md): docstring examples run in the suite
    assert doctest.testmod(module).failed == 0
