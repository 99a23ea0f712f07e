"""Product reports (hazard.reports.product_pdf): every line-up product renders to pages that carry its facts (page 1
the answers, page 2 the hazards in detail, page 3 its distance, uncertainty and remedies studies, then the input),
identically each time; one notation on every page."""

import datetime
import doctest
import io
import math
import re

import pytest
from conftest import EXPECTED_GROUP, FOOTER, LINEUP, RENDERED_AT, normalise, pdf_pages
from pypdf import PdfReader

import hazard
import hazard.reports.fonts
import hazard.reports.headroom
import hazard.reports.layout
import hazard.reports.product_pdf
import hazard.reports.studies
import hazard.reports.timestamp
from hazard.output.formatting import UNIT_DISPLAY, format_value, hazard_margin_text
from hazard.reports import render_assessment_pdf, render_summary_pdf
from hazard.reports.studies import remedy_lines, study_summary
from hazard.reports.wording import GROUP_NAME
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
    # (reports/__init__.py): page 1 the answers, page 2 the hazards in detail, the studies from page 3, the input
    # and its provenance last (a pulsed emission table or a daily exposure section may add pages)
    assert a.distances is not None and a.remedies is not None
    assert len(pages) == 4 if a.exposure is None and a.emission is None else len(pages) >= 4
    assert SECTION in pages[2] and SECTION not in pages[0] + pages[1]
    first, text = pages[0], " ".join(pages)
    assert a.id in first and a.id == stem.upper()  # examples/lineup/<stem>.toml: id is the stem in capitals
    assert GROUP_NAME[EXPECTED_GROUP[stem]] in first  # examples/README.md, as above; the group in words on page 1
    for h in a.hazards.values():
        assert h.assessed  # examples/lineup: every record states no emission outside its measured range
        # project contract: hazard.output.formatting.format_value prints every value, in the row of its hazard on
        # the detail page
        assert re.search(
            _row_pattern(h.symbol, h.title, format_value(h.value), UNIT_DISPLAY.get(h.unit, h.unit)), pages[1]
        ), h.symbol
        # project contract (issue "page 1 built from the tool's answers"): every assessed hazard's headroom on page 1
        headroom = hazard_margin_text(h) if h.risk_group is not None else "no risk groups"
        assert normalise(f"{h.symbol} {h.title}") in first and normalise(headroom) in first, h.symbol
    # the distance answer and the remedies on page 1, as the studies module words them
    assert normalise(study_summary(a, 3)) in first
    for line in remedy_lines(a):
        assert normalise(line) in first
    for caution in a.cautions:
        # project contract: hazard/cautions.py, every chosen caution on page 1 and in full at the end
        assert normalise(caution) in first and normalise(caution) in pages[-1]
    for digest in (*a.provenance.inputs.values(), *(t["sha256"] for t in a.provenance.tables.values())):
        assert digest in text  # project contract: README "full provenance" (input and table SHA-256)
    assert "2024-06-01 12:00 UTC" in first  # the date shown is rendered_at, in UTC
    for number, page in enumerate(pages, start=1):
        assert FOOTER in page and f"page {number} of {len(pages)}" in page  # footer on every page


@pytest.mark.parametrize("stem", sorted(p.stem for p in LINEUP.glob("*.toml")))
def test_one_notation_on_every_page(stem, lineup_all, lineup_pdfs):
    # project contract (issue "one notation in every output"): SI units with superscripts, powers of ten with a
    # superscript exponent; never a computer exponent (3e+04), a caret (10^4) or a unit code (W/m2); every product
    # of the demo line-up, the pulsed ones included
    pdf = lineup_pdfs.get(stem) or render_assessment_pdf(lineup_all[stem], RENDERED_AT)  # hazard.assess, once
    for number, text in enumerate(pdf_pages(pdf), start=1):
        page = re.sub(r"\b[0-9a-f]{64}\b", "", text)  # SHA-256 digests are hex, not numbers
        assert not re.search(r"\d[eE][+-]\d", page), (number, re.search(r".{30}\d[eE][+-]\d.{10}", page))
        assert "^" not in page, number
        assert not re.search(r"(?<![A-Za-z0-9_])c?m2\b", page), number  # W/m2, cd/m2, µW/cm2


def test_pdf_creation_date_is_the_report_date(lineup_pdfs):
    # ISO 32000-1 14.3.3: the document information's CreationDate; the report's own date, not a fixed one
    info = PdfReader(io.BytesIO(lineup_pdfs["cl-desk-30"])).metadata
    assert info.creation_date == RENDERED_AT.replace(tzinfo=None) or info.creation_date == RENDERED_AT


def test_a_measured_part_over_a_limit_gives_a_lower_bound_on_page_one(lineup):
    # examples/lineup/cl-ir-940.csv spans 700-1200 nm, E_IR's band is 780-3000 nm: not assessed. Yet 780-1200 nm
    # alone is over the E_IR Exempt limit (100 W/m², IEC 62471:2006 Table 6.1), and spectra and weights are
    # non-negative, so the whole band is too: the lamp is at least RG1, never "not determined"
    a = hazard.assess(LINEUP / "cl-ir-940.toml", {"no_emission_outside": False})
    e_ir = a.hazards["E_IR"]
    assert not e_ir.assessed and e_ir.lower_bound_group == "RG1" and a.risk_group == "RG1" and not a.complete
    assert "E_IR" in a.deciding_hazards and "at least RG1" in e_ir.note
    full = hazard.assess(LINEUP / "cl-ir-940.toml")  # the record's own statement: nothing outside 700-1200 nm
    assert full.hazards["E_IR"].value >= 100 and full.hazards["E_IR"].risk_group == "RG1"
    first = pdf_pages(render_assessment_pdf(a, RENDERED_AT))[0]
    assert "LOWER BOUND" in first and "Risk Group 1 (low risk) or higher" in first


def test_not_determined_and_what_if_say_so_on_page_one(lineup):
    # examples/lineup/cl-pip-470.csv spans 380-600 nm; without the record's no-emission statement none of the
    # hazards with groups has its band covered (design/method.md §5, coverage), and the measured parts alone stay
    # within every Exempt limit, so no group can be determined
    nd = hazard.assess(LINEUP / "cl-pip-470.toml", {"no_emission_outside": False})
    assert nd.risk_group is None and not any(h.lower_bound_group for h in nd.hazards.values())
    first = pdf_pages(render_assessment_pdf(nd, RENDERED_AT))[0]
    assert "Risk group not determined" in first and "Do not read this as safe" in first
    for symbol in nd.not_assessed:
        assert normalise(nd.hazards[symbol].note) in first  # why each hazard was not assessed
    # hazard/record.py: at_distance_mm asks for a what-if, which is not a classification
    what_if = hazard.assess(LINEUP / "cl-desk-30.toml", {"at_distance_mm": 50.0})
    first = pdf_pages(render_assessment_pdf(what_if, RENDERED_AT))[0]
    assert "WHAT-IF at 50 mm — not a classification" in first
    assert f"What-if at 50 mm: {GROUP_NAME[what_if.risk_group]}" in first
    assert f"gives {GROUP_NAME[what_if.standard_risk_group]}" in first


def test_infrared_led_has_no_light_figures(lineup, lineup_pdfs):
    # examples/lineup/cl-ir-940.csv: a 940 nm band; its tail under 780 nm is no light worth a figure (hazard/method/
    # photometry.py LUMINOUS_SHARE_FLOOR), so neither an illuminance nor a colour is printed
    a = lineup["cl-ir-940"]
    assert a.photometry.visible_negligible and a.photometry.chromaticity_xy is None
    text = " ".join(pdf_pages(lineup_pdfs["cl-ir-940"]))
    assert " lx" not in text and "CIE 1931 x, y" not in text and "visible emission is negligible" in text


def test_window_size_is_printed_as_given(lineup_pdfs):
    # examples/lineup/cl-far-222.toml: emitting window 60 mm x 40 mm
    assert "60 × 40 mm" in pdf_pages(lineup_pdfs["cl-far-222"])[1]


def test_incomplete_report_says_lower_bound_and_why(tmp_path):
    # examples/lineup/cl-heat-2k.csv spans 300-3000 nm and E_S needs 200-400 nm (design/method.md §1), so
    # without the record's no-emission statement E_S is not assessed (design/method.md §5, coverage)
    a = hazard.assess(LINEUP / "cl-heat-2k.toml", {"no_emission_outside": False})
    assert a.not_assessed == ["E_S"] and not a.complete
    pages = pdf_pages(render_assessment_pdf(a, RENDERED_AT))
    # project contract: reports/__init__.py, four pages with the studies, and one more for the record's
    # daily exposures (examples/lineup/cl-heat-2k.toml states some)
    assert a.exposure is not None and len(pages) == 5
    assert "LOWER BOUND — not all hazards assessed" in pages[0]  # project brief: shown prominently
    assert normalise(a.hazards["E_S"].note) in pages[0]  # the reason, from the result's own note
    assert "INCOMPLETE" in pages[1]  # the completeness line of the detail page


def test_contradicted_vendor_claim_is_named_on_page_one(lineup, lineup_pdfs):
    # examples/README.md: the spotlight is RG1 (blue light); examples/lineup/cl-spot-65.toml: its datasheet
    # claims Exempt and 6500 K; hazard/claims.py: a computed group higher than the claimed one contradicts the
    # claim (the CCT claim is checked with its own tolerance, consistent here)
    a = lineup["cl-spot-65"]
    assert [(c.claim, c.verdict) for c in a.claims] == [("risk group", "contradicted"), ("CCT", "consistent")]
    pages = pdf_pages(lineup_pdfs["cl-spot-65"])
    assert "1 CONTRADICTED (risk group: claimed Exempt, computed RG1), 1 consistent — page 2" in pages[0]
    assert normalise(a.claims[0].reason) in pages[1]
    summary = " ".join(pdf_pages(render_summary_pdf([a], [], RENDERED_AT)))
    assert "1 vendor claim CONTRADICTED" in summary


def test_without_studies_the_report_has_three_pages(lineup):
    # project contract: reports/__init__.py, the studies' pages only "when the result holds those studies" (a batch
    # run without --studies gives none: hazard/batch.py)
    bare = lineup["cl-heat-2k"].model_copy(
        update={"distances": None, "uncertainty": None, "remedies": None, "exposure": None}
    )
    pages = pdf_pages(render_assessment_pdf(bare, RENDERED_AT))
    assert len(pages) == 3 and SECTION not in " ".join(pages)
    assert "No distance study in this result" in pages[0]
    for caution in bare.cautions:
        assert normalise(caution) in pages[-1]  # hazard/cautions.py: every caution in full at the end


def test_page_one_names_the_page_the_studies_start_on(lineup):
    # project contract: reports/product_pdf.py, page 1 points to the studies' page; 25 extra assumption lines
    # make the detail page run over (beyond the slight shrink it allows), so the section starts on page 4
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
    assert "Exempt at 1.58 % of today's output" in first  # what would change it, on page 1
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
    assert len(pages) == 4
    # project contract: issue "Beyond the label", "borderline" next to the overall group on page 1
    assert "WHAT-IF at 2700 mm — not a classification" in pages[0]  # issue: what-if
    assert re.search(r"What-if at 2700 mm: Risk Group 1 \(low risk\) .* BORDERLINE: within the stated", pages[0])
    assert "within the stated measurement uncertainty the group ranges from Exempt to RG1" in pages[0]
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
    assert "(borderline)" in pdf_pages(render_assessment_pdf(edge, RENDERED_AT))[1]


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


@pytest.mark.parametrize(
    "module", [hazard.reports.fonts, hazard.reports.timestamp, hazard.reports.studies, hazard.reports.headroom]
)
def test_docstring_examples(module):
    # project habit (style.md): docstring examples run in the suite
    assert doctest.testmod(module).failed == 0


def test_a_stated_day_over_the_limit_values_is_on_page_one(lineup_all):
    # examples/README.md: the heater's stated day exceeds the exposure limit values (E_IR, Directive 2006/25/EC
    # Annex I); a day within them says so too (the xenon unit's 5 min walk past the open door)
    heater, xenon = lineup_all["cl-heat-2k"], lineup_all["cl-xen-uv"]
    assert heater.exposure is not None and not heater.exposure.within
    assert xenon.exposure is not None and xenon.exposure.within
    for a, verdict in ((heater, "EXCEEDS the limit values"), (xenon, "WITHIN the limit values")):
        first = normalise(pdf_pages(render_assessment_pdf(a, RENDERED_AT))[0])
        assert "Stated day:" in first and verdict in first
