"""What a buyer and a test planner run: record options, claims within the uncertainty, the workbook, the output
folder and the report identity, each from the CLI on files made here, with the outputs read back."""

import csv
import json
import re
from pathlib import Path

import click
import numpy as np
import openpyxl
import pytest
from click.testing import CliRunner
from conftest import REPO, write_spectrum
from pypdf import PdfReader

import hazard
from hazard.cli import main
from hazard.cli_options import POSITIONAL, field_table
from hazard.inputs.record import ProductRecord
from hazard.result import ReportIdentity

README = REPO / "README.md"
GRID_NM = np.arange(380.0, 781.0)
BLUE_NM = 450.0
"""A blue LED line: B(450 nm) = 0.9 (IEC 62471:2006 Table 4.2), so the blue-light hazard decides."""


def _blue(folder: Path, scale: float, name: str = "blue") -> Path:
    """A Gaussian blue line (FWHM 20 nm) of peak ``scale`` W/m2/nm, as an exported spectrum file."""
    values = scale * np.exp(-0.5 * ((GRID_NM - BLUE_NM) / (20 / 2.3548)) ** 2)
    return write_spectrum(folder / f"{name}.csv", GRID_NM, values)


LARGE = {"distance_mm": 200.0, "source_diameter_mm": 150.0, "no_emission_outside": True}
"""A source of 0.72 rad at 200 mm: it fills every blue-light field of view (0.1, 0.011, 0.0017 rad; IEC 62471:2006
Table 6.1), so L_B is the source's own radiance at every boundary."""


def _args(fields: dict) -> list[str]:
    out = []
    for key, value in fields.items():
        option = "--" + key.replace("_", "-")
        out += [option] if value is True else [option, str(value)]
    return out


@pytest.fixture(scope="module")
def unit_scale(tmp_path_factory) -> float:
    """L_B [W m-2 sr-1] per unit peak of the blue line, and a check of the Exempt limit the tests rely on."""
    folder = tmp_path_factory.mktemp("unit")
    a = hazard.assess(_blue(folder, 1.0), LARGE)
    assert a.hazards["L_B"].limits["Exempt"] == pytest.approx(100.0)  # IEC 62471:2006 Table 6.1, L_B Exempt
    return a.hazards["L_B"].value


def _at_exempt_ratio(folder: Path, unit_scale: float, ratio: float, name: str = "blue") -> Path:
    """A blue source whose L_B is ``ratio`` × the Exempt limit of 100 W m-2 sr-1 (IEC 62471:2006 Table 6.1)."""
    return _blue(folder, ratio * 100.0 / unit_scale, name)


def test_every_record_field_is_an_option_of_assess_and_check():
    fields = set(ProductRecord.model_fields) - POSITIONAL  # project contract: README "every record field"
    for command in ("assess", "check"):
        cli_command = main.commands[command]
        options = {p.name for p in cli_command.get_params(click.Context(cli_command))}
        assert fields <= options, fields - options


def test_readme_field_table_is_the_generated_one():
    # project contract: README's record-field table is `hazard schema record --format markdown`
    text = README.read_text(encoding="utf-8")
    block = re.search(r"<!-- record-fields:[^\n]*-->\n(.*?)<!-- record-fields: end -->", text, re.S)
    assert block is not None and block.group(1) == field_table()
    result = CliRunner().invoke(main, ["schema", "record", "--format", "markdown"])
    assert result.exit_code == 0 and result.output == field_table()


def test_relative_spectrum_with_a_lux_value_from_the_command_line(tmp_path):
    # a datasheet spectrum in relative units with its illuminance, assessed with options only
    path = _blue(tmp_path, 1.0, "relative")
    args = ["assess", str(path), "--quantity", "relative", "--illuminance-lx", "500", "--distance-mm", "1000"]
    args += ["--source-diameter-mm", "50", "--no-emission-outside", "--format", "json"]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    found = json.loads(result.stdout)
    # the scaled spectrum reproduces the stated 500 lx at 1000 mm (the anchor's definition, README), hence
    # 500 × (1000/200)² lx at the 200 mm assessment distance (inverse-square law; IEC 62471:2006 5.1.2)
    assert found["scaling"]["anchor"] == "illuminance_lx"
    assert found["photometry"]["illuminance_lx"] == pytest.approx(500 * 25, rel=1e-9)


@pytest.mark.parametrize(
    ("ratio", "verdict", "exit_code"),
    [
        (0.90, "consistent", 0),  # 0.90 × 1.10 = 0.99: Exempt at every variant
        (0.95, "inconclusive", 0),  # 0.95 × 0.90 = 0.855 Exempt, 0.95 × 1.10 = 1.045 RG1
        (1.20, "contradicted", 4),  # 1.20 × 0.90 = 1.08: RG1 at every variant
    ],
)
def test_claimed_exempt_respects_the_uncertainty(tmp_path, unit_scale, ratio, verdict, exit_code):
    # L_B at `ratio` × the Exempt limit (IEC 62471:2006 Table 6.1), ±10 % (k = 2) stated, no wavelength shift
    path = _at_exempt_ratio(tmp_path, unit_scale, ratio)
    fields = {**LARGE, "uncertainty_pct": 10, "claimed_risk_group": "Exempt", "id": "BLUE-1"}
    result = CliRunner().invoke(main, ["check", str(path), *_args(fields), "--format", "csv"])
    assert result.exit_code == exit_code, result.output
    rows = list(csv.DictReader(result.stdout.splitlines()))
    assert len(rows) == 1 and rows[0]["verdict"] == verdict and rows[0]["id"] == "BLUE-1"
    if verdict == "inconclusive":
        assert "Exempt" in rows[0]["reason"] and "RG1" in rows[0]["reason"]  # both groups named
    # the final count line (stderr for csv)
    assert f"1 {verdict}" in result.stderr and "1 claim(s) of 1 product(s)" in result.stderr


def test_claim_at_its_own_distance(tmp_path, unit_scale):
    # RG1 at 200 mm; a small source's L_B falls as the field of view is no longer filled, but this one is large:
    # radiance does not change with distance (IEC 62471:2006 4.3.3 uses radiance), so the claim fails at 2 m too;
    # E_S etc. are absent (visible only). A claimed RG1 at 2 m holds.
    path = _at_exempt_ratio(tmp_path, unit_scale, 2.0)
    fields = {**LARGE, "claimed_risk_group": "Exempt", "claimed_distance_mm": 2000}
    result = CliRunner().invoke(main, ["check", str(path), *_args(fields), "--format", "json"])
    assert result.exit_code == 4
    (claim,) = [json.loads(line) for line in result.stdout.splitlines()]
    assert claim["distance_mm"] == 2000 and claim["verdict"] == "contradicted"
    fields["claimed_risk_group"] = "RG1"
    result = CliRunner().invoke(main, ["check", str(path), *_args(fields), "--format", "json"])
    assert result.exit_code == 0 and json.loads(result.stdout)["verdict"] == "consistent"


def _manifest(folder: Path, rows: list[dict]) -> Path:
    columns = sorted({k for r in rows for k in r}, key=lambda c: (c != "id", c))
    with open(folder / "manifest.csv", "w", newline="", encoding="utf-8") as handle:
        writer = csv.DictWriter(handle, columns)
        writer.writeheader()
        writer.writerows(rows)
    return folder / "manifest.csv"


@pytest.fixture
def batch_inputs(tmp_path, unit_scale):
    inputs = tmp_path / "in"
    inputs.mkdir()
    _at_exempt_ratio(inputs, unit_scale, 0.5, "low")
    _at_exempt_ratio(inputs, unit_scale, 3.0, "high")
    common = {k: ("true" if v is True else v) for k, v in LARGE.items()}
    rows = [
        {"id": "ABC/123", "spectrum": "low.csv", "vendor": "Corvel Lightworks", "model": "L-1", **common},
        {
            "id": "ABC_123",
            "spectrum": "high.csv",
            "vendor": "Corvel Lightworks",
            "claimed_risk_group": "Exempt",
            **common,
        },
        {"id": "BROKEN", "spectrum": "missing.csv", "vendor": "Corvel Lightworks", **common},
    ]
    return _manifest(inputs, rows)


def test_batch_workbook_and_summary_for_a_spreadsheet(tmp_path, batch_inputs):
    out = tmp_path / "out"
    result = CliRunner().invoke(main, ["batch", str(batch_inputs), "--output", str(out), "--pdf"])
    assert result.exit_code == 3, result.output  # one product failed (README exit codes)
    rows = list(csv.DictReader(open(out / "summary.csv", encoding="utf-8")))
    assert [r["id"] for r in rows] == ["ABC/123", "ABC_123", "BROKEN"]
    ok = rows[1]
    assert ok["vendor"] == "Corvel Lightworks" and ok["risk_group"] == "RG1" and ok["basis"] == "standard"
    assert ok["assessment_distance [mm]"] == "200"  # IEC 62471:2006 5.1.2: 200 mm for lamps other than GLS
    value = ok["L_B value [W m-2 sr-1]"]
    assert float(value) == pytest.approx(300, rel=5e-3) and len(value.replace(".", "")) <= 3  # 3 significant digits
    assert ok["claims_contradicted"] == "1"
    # two colliding ids, two files, each named in the summary
    stems = [r["file_stem"] for r in rows[:2]]
    assert len(set(stems)) == 2 and all((out / f"{s}.pdf").is_file() for s in stems)
    # failed rows in results.jsonl with their reason
    lines = [json.loads(line) for line in (out / "results.jsonl").read_text(encoding="utf-8").splitlines()]
    assert [line["id"] for line in lines] == ["ABC/123", "ABC_123", "BROKEN"]
    assert lines[2]["status"] == "error" and "missing.csv" in lines[2]["error"]
    # the workbook: frozen header, filters, group cells coloured and written, claims and failures sheets
    book = openpyxl.load_workbook(out / "summary.xlsx")
    products = book["products"]
    header = [c.value for c in products[1]]
    assert header == list(rows[0].keys())
    assert (
        products.freeze_panes == "B2"
        and products.auto_filter.ref == f"A1:{products.cell(1, len(header)).column_letter}4"
    )
    group = products.cell(3, header.index("risk_group") + 1)
    assert group.value == "RG1" and group.fill.fgColor.rgb.endswith("E9C46A")  # reports/style.py GROUP_FILL
    assert products.cell(3, header.index("L_B value [W m-2 sr-1]") + 1).value == pytest.approx(300, rel=5e-3)
    claims = list(book["claims"].values)
    assert claims[1][0] == "ABC_123" and claims[1][claims[0].index("verdict")] == "contradicted"
    failures = list(book["failures"].values)
    assert len(failures) == 2 and failures[1][0] == "BROKEN" and "missing.csv" in failures[1][-1]
    # a failed product's report is refused with its reason
    report = CliRunner().invoke(
        main, ["report", str(out / "results.jsonl"), "--id", "BROKEN", "--output", str(tmp_path / "b.pdf")]
    )
    assert report.exit_code == 2 and "could not be assessed" in report.output


def test_stale_files_are_listed_and_kept_unless_clean(tmp_path, batch_inputs):
    out = tmp_path / "out"
    runner = CliRunner()
    assert runner.invoke(main, ["batch", str(batch_inputs), "--output", str(out), "--pdf"]).exit_code == 3
    written = json.loads((out / "outputs.json").read_text(encoding="utf-8"))
    names = {f["name"] for f in written["files"]}
    assert {"results.jsonl", "summary.csv", "summary.xlsx", "summary.pdf"} <= names
    # the second run asks for no PDFs: the first run's PDFs are stale
    second = runner.invoke(main, ["batch", str(batch_inputs), "--output", str(out)])
    stale = sorted(n for n in names if n.endswith(".pdf"))
    assert second.exit_code == 3 and f"{len(stale)} file(s) of an earlier run" in second.output
    assert "kept" in second.output and all((out / n).is_file() for n in stale)
    third = runner.invoke(main, ["batch", str(batch_inputs), "--output", str(out), "--clean"])
    assert "removed (--clean)" in third.output and not any((out / n).exists() for n in stale)
    assert not any(f["name"].endswith(".pdf") for f in json.loads((out / "outputs.json").read_text())["files"])


def test_report_identity_from_settings_and_options(tmp_path, unit_scale, monkeypatch):
    path = _at_exempt_ratio(tmp_path, unit_scale, 0.5)
    (tmp_path / "hazard.toml").write_text(
        '[report]\norganisation = "Corvel Lightworks QA (invented)"\ndocument_number = "PS-7"\n', encoding="utf-8"
    )
    monkeypatch.chdir(tmp_path)
    args = ["assess", str(path), *_args(LARGE), "--prepared-by", "A. Engineer", "--format", "json"]
    args += ["--output", "r.json", "--pdf", "r.pdf"]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    identity = json.loads((tmp_path / "r.json").read_text())["provenance"]["identity"]
    assert (
        identity
        == ReportIdentity(
            organisation="Corvel Lightworks QA (invented)", document_number="PS-7", prepared_by="A. Engineer"
        ).model_dump()
    )
    pages = [p.extract_text() for p in PdfReader(tmp_path / "r.pdf").pages]
    for page in pages:  # on every page's header
        assert "Corvel Lightworks QA (invented)" in page and "Doc. PS-7" in page and "Prepared by A. Engineer" in page
    (tmp_path / "hazard.toml").write_text("[report]\ncolour = 'teal'\n", encoding="utf-8")
    bad = CliRunner().invoke(main, args)
    assert bad.exit_code == 2 and "hazard.toml:2" in bad.output and "Traceback" not in bad.output


def test_a_formula_in_a_manifest_never_reaches_the_spreadsheet_as_a_formula(tmp_path, unit_scale):
    # OWASP "CSV injection": text starting with = + - @ is read as a formula by spreadsheet programs
    inputs = tmp_path / "in"
    inputs.mkdir()
    _at_exempt_ratio(inputs, unit_scale, 0.5, "low")
    common = {k: ("true" if v is True else v) for k, v in LARGE.items()}
    manifest = _manifest(inputs, [{"id": "X1", "spectrum": "low.csv", "name": '=HYPERLINK("http://x","y")', **common}])
    out = tmp_path / "out"
    assert CliRunner().invoke(main, ["batch", str(manifest), "--output", str(out)]).exit_code == 0
    row = next(csv.DictReader(open(out / "summary.csv", encoding="utf-8")))
    assert row["name"].startswith("'=")
    cell = openpyxl.load_workbook(out / "summary.xlsx")["products"]["C2"]
    assert cell.data_type == "s" and cell.value.startswith("'=")
    # the result keeps the name as given
    assert json.loads((out / "results.jsonl").read_text(encoding="utf-8"))["name"].startswith("=HYPERLINK")


def test_batch_plan_for_the_laboratory(tmp_path, batch_inputs):
    # the test plan from a batch: failed products first (fix the input), every product has a row
    out = tmp_path / "out"
    result = CliRunner().invoke(main, ["batch", str(batch_inputs), "--output", str(out), "--plan"])
    assert result.exit_code == 3 and "plan.csv, plan.xlsx" in result.output
    rows = list(csv.DictReader(open(out / "plan.csv", encoding="utf-8")))
    assert rows[0]["id"] == "BROKEN" and rows[0]["kind"] == "fix input"
    assert {r["id"] for r in rows} == {"ABC/123", "ABC_123", "BROKEN"}
    listed = {f["name"] for f in json.loads((out / "outputs.json").read_text(encoding="utf-8"))["files"]}
    assert {"plan.csv", "plan.xlsx"} <= listed
