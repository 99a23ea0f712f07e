"""The laboratory test plan: `hazard plan` on records written here, its CSV and workbook read back, and the PDF section.

The sources are blackbodies (Planck's law) seen through filters, scaled so that one hazard sits at a chosen fraction
of a limit of IEC 62471:2006 Table 6.1. Scaling uses the tool's own margin of an unscaled copy: a weighted integral
is linear in the spectrum, so scaling the spectrum by k scales the margin by k.
"""

import csv
import datetime
import io
import json
import re

import numpy as np
import openpyxl
import pytest
from click.testing import CliRunner
from pypdf import PdfReader

import hazard
from hazard.assessment.lab_plan import KINDS, plan_items, rank_plan, settling_uncertainty_pct
from hazard.cli import main
from hazard.output.formatting import round_down
from hazard.output.plan_files import COLUMNS
from hazard.reports import render_summary_pdf
from hazard.result import ClaimCheck

H, C, K_B = 6.62607015e-34, 299792458.0, 1.380649e-23  # SI 2019: exact values of h, c and k_B
RG1_LIMIT_L_B = 1e4  # IEC 62471:2006 Table 6.1: L_B RG1 limit 10⁴ W/(m²·sr)


def planck(wavelength_nm, temperature_k):
    """Planck's law: the shape of a blackbody's spectral radiance, 1 at its highest sample [1]."""
    lam = np.asarray(wavelength_nm) * 1e-9
    radiance = 2 * H * C**2 / lam**5 / np.expm1(H * C / (lam * K_B * temperature_k))
    return radiance / radiance.max()


def _write(folder, stem, wavelength_nm, values, **fields):
    """A spectrum CSV and its TOML record in ``folder``; returns the record's path."""
    folder.mkdir(parents=True, exist_ok=True)
    lines = ["wavelength_nm,value"] + [
        f"{w!r},{v!r}" for w, v in zip(map(float, wavelength_nm), map(float, values), strict=True)
    ]
    (folder / f"{stem}.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    record = {
        "id": stem.upper(),
        "spectrum": f"{stem}.csv",
        "quantity": "irradiance",
        "unit": "W/m2/nm",
        "distance_mm": 200.0,
        "lamp_type": "other",
        **fields,
    }
    path = folder / f"{stem}.toml"
    path.write_text("".join(f"{k} = {_toml(v)}\n" for k, v in record.items()), encoding="utf-8")
    return path


def _toml(value):
    """A TOML value: booleans in lower case, strings as JSON strings (valid TOML basic strings), numbers as is."""
    if isinstance(value, bool):
        return str(value).lower()
    return json.dumps(value) if isinstance(value, str) else repr(value)


def _scaled(folder, stem, wavelength_nm, shape, hazard_symbol, boundary, ratio, **fields):
    """A record whose ``hazard_symbol`` is at ``ratio`` × its ``boundary`` limit (margin value/limit)."""
    probe = hazard.assess(_write(folder / "probe", stem, wavelength_nm, shape, **fields))
    k = ratio / probe.hazards[hazard_symbol].margins[boundary]
    return _write(folder, stem, wavelength_nm, shape * k, **fields)


VISIBLE = np.arange(380.0, 781.0, 1.0)


@pytest.fixture(scope="module")
def plan_run(tmp_path_factory):
    """A folder of five records planned by the CLI: (result, folder, plan.csv rows, workbook sheet)."""
    base = tmp_path_factory.mktemp("plan")
    records = base / "records"
    daylight = planck(VISIBLE, 5000.0)  # a 5000 K blackbody behind a filter passing 380-780 nm only
    filtered = {"no_emission_outside": True, "source_diameter_mm": 20.0, "uncertainty_pct": 10.0}
    # α = 20 mm / 200 mm = 100 mrad, wider than the 11 mrad field of the RG1 limit: L_B is compared as it is
    _scaled(records, "border", VISIBLE, daylight, "L_B", "RG1", 0.97, **filtered)  # 3 % under the RG1 limit
    _scaled(records, "robust", VISIBLE, daylight, "L_B", "RG1", 0.2, **filtered)  # RG1 with room on both sides
    # a 3000 K blackbody (tungsten halogen) measured from 300 nm only: E_S (200-400 nm) cannot be assessed
    wide = np.arange(300.0, 3001.0, 1.0)
    _scaled(records, "nouv", wide, planck(wide, 3000.0), "L_B", "Exempt", 0.3, source_diameter_mm=20.0)
    # a 1 mm die at 200 mm: α = 5 mrad, below the 11 mrad small-source bound (IEC 62471:2006 Table 6.1, E_B)
    _scaled(
        records, "small", VISIBLE, daylight, "E_B", "Exempt", 0.2, no_emission_outside=True,
        source_diameter_mm=1.0, name="=SUM(1,2) indicator",
    )  # fmt: skip
    (records / "broken.toml").write_text(
        'id = "BROKEN"\nspectrum = "robust.csv"\ndistance_mm = -5.0\nsource_diameter_mm = 20.0\n', encoding="utf-8"
    )
    out = base / "out"
    result = CliRunner().invoke(main, ["plan", str(records), "--output", str(out)])
    with open(out / "plan.csv", newline="", encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    sheet = openpyxl.load_workbook(out / "plan.xlsx").active
    return result, base, rows, sheet


def _first_rank(rows, product_id):
    return min(int(r["rank"]) for r in rows if r["id"] == product_id)


def test_borderline_product_ranks_above_robust_one(plan_run):
    result, _, rows, _ = plan_run
    assert result.exit_code == 3, result.output  # project contract: 3 when some product could not be assessed
    assert _first_rank(rows, "BORDER") < _first_rank(rows, "ROBUST")
    [border] = [r for r in rows if r["id"] == "BORDER" and r["kind"] == "borderline"]
    assert border["hazard"] == "L_B" and border["change"] == "could raise" and border["group_now"] == "RG1"
    # |1 − value/limit| × 100 % = 3 % at 0.97 × the limit (and 1/0.97 − 1 = 3.09 % read against the limit)
    settle = float(re.search(r"below ([\d.]+) %", border["settled_by"]).group(1))
    assert settle == pytest.approx(3.0, abs=0.11)
    assert "RG1 and RG2" in border["settled_by"]
    assert not [r for r in rows if r["id"] == "ROBUST" and r["kind"] == "borderline"]


def test_missing_uv_band_is_asked_for_and_ranks_first(plan_run):
    _, _, rows, _ = plan_run
    [missing] = [r for r in rows if r["id"] == "NOUV" and r["kind"] == "not assessed"]
    assert missing["hazard"] == "E_S"  # IEC 62471:2006 4.3.1: E_S is weighted over 200-400 nm
    assert missing["extend_to_nm"] == "200–300 nm" and "200–300 nm" in missing["what_to_measure"]
    assert missing["change"] == "could raise" and missing["group_now"] == "Exempt (lower bound)"
    # safety first: an unknown hazard of an Exempt product before a borderline RG1 (issue: rank by decision change)
    assert int(missing["rank"]) < _first_rank(rows, "BORDER")


def test_small_source_gets_a_radiance_imaging_item(plan_run):
    _, _, rows, _ = plan_run
    imaging = [r for r in rows if r["id"] == "SMALL" and r["kind"] == "radiance imaging"]
    blue = [r for r in imaging if r["hazard"] == "blue light"]
    assert blue, imaging
    assert "11 mrad" in blue[0]["what_to_measure"] and "1.7 mrad" in blue[0]["what_to_measure"]
    assert "small-source bound" in blue[0]["why"]  # α = 5 mrad < 11 mrad
    # E_B at 20 % of its Exempt limit: the criteria either side of 11 mrad differ by far less than the 5× needed
    # (IEC 62471:2006 Table 6.1: E_B 1 W/m² against L_B 100 W/(m²·sr) over 100 mrad, 1.27×)
    assert blue[0]["change"] == "no group change"


def test_failed_row_tells_to_fix_the_input(plan_run):
    result, _, rows, _ = plan_run
    [broken] = [r for r in rows if r["id"] == "BROKEN"]
    assert broken["kind"] == "fix input" and broken["rank"] == "1" and broken["priority"] == "100.0"
    assert broken["what_to_measure"].startswith("Fix the input: ") and "distance_mm" in broken["what_to_measure"]
    assert "BROKEN: error:" in result.stderr


def test_screen_shows_the_ranked_table_and_the_caution(plan_run):
    result, _, rows, _ = plan_run
    lines = result.stdout.splitlines()
    assert lines[0].split()[:3] == ["#", "Priority", "Product"]
    assert lines[2].split()[:3] == ["1", "100.0", "BROKEN"]
    assert f"{len(rows)} items for 4 products assessed, 1 failed" in result.stdout
    assert "Caution: Pre-screen only" in result.stdout


def test_workbook_matches_csv_with_frozen_header_and_filter(plan_run):
    _, _, rows, sheet = plan_run
    header = [c.value for c in sheet[1]]
    assert header == [name for name, _, _ in COLUMNS] == list(rows[0])
    assert sheet.freeze_panes == "A2"
    assert sheet.auto_filter.ref == f"A1:{openpyxl.utils.get_column_letter(len(COLUMNS))}{len(rows) + 1}"
    assert sheet.column_dimensions["K"].width == 60 and sheet["K2"].alignment.wrap_text
    body = [[c.value for c in row] for row in sheet.iter_rows(min_row=2)]
    assert [str(r[0]) for r in body] == [r["rank"] for r in rows]
    assert [r[2] for r in body] == [r["id"] for r in rows]
    [name_cell] = [row[3] for row in sheet.iter_rows(min_row=2) if row[2].value == "SMALL"][:1]
    assert name_cell.value == "=SUM(1,2) indicator" and name_cell.data_type == "s"  # text, never a formula


def test_plan_of_one_record(plan_run, tmp_path):
    _, base, _, _ = plan_run
    result = CliRunner().invoke(main, ["plan", str(base / "records" / "border.toml"), "--output", str(tmp_path)])
    assert result.exit_code == 0, result.output
    rows = list(csv.DictReader(io.StringIO((tmp_path / "plan.csv").read_text(encoding="utf-8"))))
    assert {r["id"] for r in rows} == {"BORDER"} and rows[0]["kind"] == "borderline"


def test_plan_refuses_to_overwrite_an_input(plan_run, tmp_path):
    _, base, _, _ = plan_run
    folder = tmp_path / "in"
    folder.mkdir()
    record = (base / "records" / "robust.toml").read_text(encoding="utf-8").replace("robust.csv", "plan.csv")
    (folder / "robust.toml").write_text(record, encoding="utf-8")
    spectrum = (base / "records" / "robust.csv").read_bytes()
    (folder / "plan.csv").write_bytes(spectrum)
    result = CliRunner().invoke(main, ["plan", str(folder / "robust.toml"), "--output", str(folder)])
    assert result.exit_code == 2 and "would replace an input" in result.stderr
    assert (folder / "plan.csv").read_bytes() == spectrum  # project rule: nothing the user gave is changed


def test_settling_uncertainty_is_symmetric_in_ratio():
    # |1 − r| below the limit, |1 − 1/r| above it: the smaller of the two readings, the stricter demand
    assert settling_uncertainty_pct(0.9) == pytest.approx(10.0)  # |1 − 0.9| < 1/0.9 − 1
    assert settling_uncertainty_pct(1.1) == pytest.approx(100 / 11)  # 1 − 1/1.1 < 1.1 − 1
    assert settling_uncertainty_pct(0.0) == 100.0


def test_inconclusive_claim_is_treated_like_a_borderline(plan_run):
    _, base, _, _ = plan_run
    a = hazard.assess(base / "records" / "robust.toml")
    claim = ClaimCheck.model_construct(
        claim="risk group",
        field="claimed_risk_group",
        claimed="RG1",
        computed="RG1",
        tolerance="none",
        verdict="inconclusive",
        reason="the group lies within the uncertainty",
    )
    [item] = [i for i in plan_items(a.model_copy(update={"claims": [claim]})) if i.kind == "claim"]
    assert item.change == "could raise" and "uncertainty" in item.rank_reason
    borderline = [i for i in plan_items(hazard.assess(base / "records" / "border.toml")) if i.kind == "borderline"]
    assert abs(borderline[0].priority - item.priority) < 2  # the same tier (evidence tiers lie 10 apart)


def test_ranking_is_deterministic_and_kinds_known(plan_run):
    _, base, _, _ = plan_run
    products = [hazard.assess(base / "records" / f"{stem}.toml") for stem in ("border", "robust", "nouv", "small")]
    first, again = rank_plan(products), rank_plan(list(reversed(products)))
    assert first == again
    assert [i.rank for i in first] == list(range(1, len(first) + 1))
    assert all(i.kind in KINDS for i in first)


def test_summary_pdf_has_the_plan_section(plan_run):
    _, base, _, _ = plan_run
    products = [hazard.assess(base / "records" / f"{stem}.toml") for stem in ("border", "robust")]
    moment = datetime.datetime(2024, 1, 1, tzinfo=datetime.UTC)
    pdf = render_summary_pdf(products, [], moment, plan=rank_plan(products))
    text = " ".join(page.extract_text() for page in PdfReader(io.BytesIO(pdf)).pages)
    assert "What to ask the laboratory" in text and "COULD RAISE" in text
    assert re.search(r"BORDER\s+RG1", text)  # the group named in text, not by colour alone
    assert "What to ask the laboratory" not in " ".join(
        page.extract_text() for page in PdfReader(io.BytesIO(render_summary_pdf(products, [], moment))).pages
    )


def test_default_window_of_20_percent_when_no_uncertainty_is_stated(tmp_path):
    daylight = planck(VISIBLE, 5000.0)
    fields = {"no_emission_outside": True, "source_diameter_mm": 20.0}
    # 0.85 × the L_B RG1 limit: 15 % under it, inside the default ±20 % but outside a stated ±10 %
    unstated = hazard.assess(_scaled(tmp_path / "a", "near", VISIBLE, daylight, "L_B", "RG1", 0.85, **fields))
    [item] = [i for i in plan_items(unstated) if i.kind == "borderline"]
    assert item.change == "could raise" and "default window" in item.why and "no uncertainty" in item.why
    stated = hazard.assess(
        _scaled(tmp_path / "b", "near", VISIBLE, daylight, "L_B", "RG1", 0.85, uncertainty_pct=10.0, **fields)
    )
    assert not [i for i in plan_items(stated) if i.kind == "borderline"]


def test_a_group_that_could_only_fall_ranks_below_one_that_could_rise(tmp_path):
    daylight = planck(VISIBLE, 5000.0)
    fields = {"no_emission_outside": True, "source_diameter_mm": 20.0, "uncertainty_pct": 10.0}
    # 1.05 × the L_B RG1 limit: RG2 (IEC 62471:2006 Table 6.1), within 10 % of falling back to RG1
    above = hazard.assess(_scaled(tmp_path, "above", VISIBLE, daylight, "L_B", "RG1", 1.05, **fields))
    robust = hazard.assess(_scaled(tmp_path, "robust", VISIBLE, daylight, "L_B", "RG1", 0.2, **fields))
    plan = rank_plan([above, robust])
    [fall] = [i for i in plan if i.product_id == "ABOVE" and i.kind == "borderline"]
    assert fall.change == "could lower" and "RG1 and RG2" in fall.settles
    rise = [i for i in plan if i.product_id == "ROBUST" and i.change == "could raise"]
    assert rise and all(i.rank < fall.rank for i in rise)  # safety first (issue: rank by decision change)


def test_irradiance_scaled_outwards_may_understate_a_beam(tmp_path):
    # a 365 nm UV-A line measured at 100 mm and assessed at 200 mm, the distance for lamps other than general
    # lighting service (IEC 62471:2006, from memory): the inverse-square law divides the irradiance by 4, a
    # collimated beam would keep it whole
    wl = np.arange(300.0, 450.0, 0.5)
    line = np.clip(1 - np.abs(wl - 365.0) / 5.0, 0, None)
    fields = {"no_emission_outside": True, "source_diameter_mm": 5.0, "distance_mm": 100.0}
    a = hazard.assess(_scaled(tmp_path, "uva", wl, line, "E_UVA", "Exempt", 0.5, **fields))
    assert a.assessment_distance_mm == pytest.approx(200.0) and a.risk_group == "Exempt"
    [item] = [i for i in plan_items(a) if i.kind == "assessment distance"]
    # the UV hazard nearest its Exempt limit: E_UVA at 0.5, or E_S where S_UV(365 nm) makes it nearer
    nearest = max(("E_S", "E_UVA"), key=lambda s: a.hazards[s].margins["Exempt"])
    factor = 1 / a.hazards[nearest].margins["Exempt"]
    assert item.change == "could raise" and item.hazard == nearest and factor <= 2  # within (200/100)² = 4
    assert f"{round_down(factor)}× the scaled value" in item.settles


def test_vendor_groups_lower_and_higher_than_computed(tmp_path):
    daylight = planck(VISIBLE, 5000.0)
    fields = {"no_emission_outside": True, "source_diameter_mm": 20.0, "uncertainty_pct": 10.0}
    # L_B at 0.2 × the RG1 limit: RG1, 20× the Exempt limit of 100 W/(m²·sr) (IEC 62471:2006 Table 6.1)
    lower = hazard.assess(
        _scaled(tmp_path / "a", "spot", VISIBLE, daylight, "L_B", "RG1", 0.2, claimed_risk_group="Exempt", **fields)
    )
    [claim] = [i for i in plan_items(lower) if i.kind == "claim"]
    assert claim.change == "could lower" and "contradicted" in claim.why
    assert "L_B measures below 1/20" in claim.settles  # 20× the Exempt limit, printed rounded up
    higher = hazard.assess(
        _scaled(tmp_path / "b", "spot", VISIBLE, daylight, "L_B", "RG1", 0.2, claimed_risk_group="RG2", **fields)
    )
    [claim] = [i for i in plan_items(higher) if i.kind == "claim"]
    assert claim.change == "could raise" and "RG1 → RG2" in claim.rank_reason  # the vendor may know of more


def test_unusable_source_is_one_line_and_exit_2(tmp_path):
    result = CliRunner().invoke(main, ["plan", str(tmp_path / "missing.csv"), "--output", str(tmp_path / "out")])
    assert result.exit_code == 2 and result.stderr.count("\n") == 1 and "hazard: error:" in result.stderr
    assert not (tmp_path / "out").exists()
