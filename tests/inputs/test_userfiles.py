"""Hostile and unlucky input: every case below once crashed (exit 1), hung, lost or overwrote a file, or let
content from outside the manifest's folder into the outputs. Each now ends in one clear line (exit 2) or in a
result, with nothing the user gave changed.

Contract: DEVELOPERS.md and hazard/cli.py ("bad input: one line naming the file and the fix, exit 2; exit 1
only for defects; nothing the user gave is changed; outputs written atomically; one bad product never stops
the others"). Bounds: hazard/record.py MAGNITUDE_BOUNDS and hazard/spectrum.py (common practice, no published
source).
"""

import json
import os
import re

import pytest
from conftest import (
    LAMP_FIELDS,
    LAMP_NM,
    MANIFEST_HEAD,
    assert_exit_2,
    assert_one_line,
    bounded,
    run_cli,
    white_lamp,
    write_lamp,
    write_manifest,
    write_spectrum,
    write_xlsx,
)

import hazard
from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.manifest import read_manifest
from hazard.inputs.readers import read_spectrum
from hazard.inputs.readers.headers import header_statement, wavelength_scale


# --- readers: input that escaped as an exception ------------------------------------------------------------
@pytest.mark.parametrize(
    ("edit", "fragment"),
    [
        (lambda xml: xml.replace(b"<v>410</v>", b"<v>NaN</v>"), "cannot read the workbook"),
        (lambda xml: xml.replace(b"</row>", b"</rowx>", 2), "cannot read the workbook"),
        (lambda xml: xml[: len(xml) // 2], "cannot read the workbook"),
    ],
    ids=["NaN cell", "damaged XML", "truncated sheet"],
)
def test_damaged_workbook_is_one_input_error(tmp_path, edit, fragment):
    # the workbook is read lazily: damage shows while rows are read, and must still be an input error
    path = write_xlsx(tmp_path / "w.xlsx", [["wavelength_nm", "value"], [400, 0.1], [410, 0.2], [420, 0.1]], edit)
    with pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="w.xlsx")
    assert_one_line(caught.value, "w.xlsx", fragment)


def test_workbook_claiming_millions_of_rows_is_refused_while_streaming(tmp_path):
    # one cell in row 3 000 000: the reader would create every empty row before it; the row limit stops it
    path = write_xlsx(
        tmp_path / "w.xlsx",
        [["wavelength_nm", "value"], [400, 0.1], [410, 0.2]],
        lambda xml: xml.replace(b"</sheetData>", b'<row r="3000000"><c r="A3000000"><v>1</v></c></row></sheetData>'),
    )
    with bounded(30), pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="w.xlsx")
    assert_one_line(caught.value, "more than 100,000 rows")


def test_workbook_that_unpacks_huge_is_refused_before_parsing(tmp_path):
    # 60 MB of sheet XML compresses to a small file (a zip bomb); the unpacked size is checked first
    padding = b"<!--" + b" " * (60 * 2**20) + b"-->"
    path = write_xlsx(
        tmp_path / "w.xlsx",
        [["wavelength_nm", "value"], [400, 0.1], [410, 0.2]],
        lambda xml: xml.replace(b"<sheetData>", padding + b"<sheetData>"),
    )
    assert path.stat().st_size < 2**20
    with pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="w.xlsx")
    assert_one_line(caught.value, "unpacks to")


def test_workbook_date_and_bool_cells_are_named(tmp_path):
    import datetime

    path = write_xlsx(tmp_path / "w.xlsx", [["wavelength_nm", "value"], [400, 0.1], [410, datetime.date(2024, 1, 2)]])
    with pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="w.xlsx")
    assert_one_line(caught.value, "w.xlsx:3", "in a number column")


@pytest.mark.parametrize(
    ("content", "fragment"),
    [
        ("[" * 100_000 + "]" * 100_000, "nested too deep"),
        ('{"wavelength_nm": [400, 410], "value": [1, ' + "9" * 5000 + "]}", "not a finite number"),
        ("[[400, 1], [410, 2]]", None),
    ],
    ids=["deep nesting", "5000-digit integer", "plain pairs"],
)
def test_json_decoder_limits_are_input_errors(tmp_path, content, fragment):
    path = tmp_path / "s.json"
    path.write_text(content)
    if fragment is None:
        raw, _ = read_spectrum(str(path), display_path="s.json")
        assert raw.value.tolist() == [1.0, 2.0]
        return
    with pytest.raises(InputError) as caught:
        load_product(path, LAMP_FIELDS)
    assert_one_line(caught.value, fragment)


@pytest.mark.parametrize(("column", "fragment"), [(0, "count from 1"), (-1, "count from 1"), (3, "does not exist")])
def test_json_pairs_column_never_picks_the_wavelength(tmp_path, column, fragment):
    # column = 0 once silently used the wavelength as the value
    path = tmp_path / "s.json"
    path.write_text(json.dumps([[400 + 10 * i, 0.01] for i in range(20)]))
    with pytest.raises(InputError) as caught:
        load_product(path, {**LAMP_FIELDS, "column": column})
    assert_one_line(caught.value, fragment)


def test_json_with_an_unknown_unit_is_named(tmp_path):
    path = tmp_path / "s.json"
    path.write_text(
        json.dumps({"wavelength_nm": LAMP_NM.tolist(), "value": white_lamp(LAMP_NM).tolist(), "unit": "furlongs"})
    )
    with pytest.raises(InputError) as caught:
        load_product(path, LAMP_FIELDS)
    assert_one_line(caught.value, "'furlongs'", "a unit this tool does not read")


@pytest.mark.parametrize("column", ["²", "١", "9" * 5000])
def test_column_that_looks_like_a_number_but_is_not(tmp_path, column):
    # "²".isdigit() is True but int("²") fails; a 5000-digit number exceeds int()'s limit
    path = write_lamp(tmp_path)
    with pytest.raises(InputError) as caught:
        load_product(path, {**LAMP_FIELDS, "column": column})
    assert_one_line(caught.value, "column")


def test_linear_time_header_and_number_patterns(tmp_path):
    # a 7 KB header cell once took 68 s (the bracketed-unit pattern) and a 21 KB cell 9.5 s (the number
    # pattern); both are now linear, and over-long cells are refused
    with bounded(10):
        assert header_statement("(" + " " * 7000 + "x(").unit is None
        with pytest.raises(InputError):  # not a unit this tool reads: refused, in bounded time
            wavelength_scale("(" + " " * 7000 + "µm(")
    path = tmp_path / "long.csv"
    path.write_text("wavelength_nm,value\n400,0.1\n410," + "1" * 21_000 + "x\n420,0.1\n")
    with bounded(10), pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="long.csv")
    assert_one_line(caught.value, "long.csv:3", "cell of 21,001 characters")


@pytest.mark.parametrize(
    ("cell", "unit"),
    [
        ("Irradiance [mW/m²/nm]", "mW/m²/nm"),
        ("E (µW/(cm²·nm))", "µW/(cm²·nm)"),
        ("E (a) (W/m2/nm)", "W/m2/nm"),
        ("E [W/m2/nm] ", "W/m2/nm"),
        ("counts", None),
        ("Wavelength [µm]", None),
    ],
)
def test_header_units_read_as_before(cell, unit):
    # the linear-time reading keeps the behaviour on ordinary header cells (hazard/readers/headers.py)
    assert header_statement(cell).unit == unit


def test_long_message_excerpts_are_short_and_printable(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text("wavelength_nm,value\n400,0.1\n410,abc\x1b[2J" + "z" * 900 + "\n")
    with pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="t.csv")
    text = assert_one_line(caught.value, "t.csv:3")
    assert "\x1b" not in text and "zzzz" in text and "z" * 100 not in text


# --- files that are not regular files, or paths that cannot be opened ------------------------------------------
def test_fifo_record_manifest_and_check_input_are_refused_without_blocking(tmp_path):
    for name in ("r.toml", "m.csv"):
        os.mkfifo(tmp_path / name)
    with bounded(20):
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "r.toml")
        assert_one_line(caught.value, "named pipe (FIFO)")
        with pytest.raises(InputError) as caught:
            read_manifest(tmp_path / "m.csv")
        assert_one_line(caught.value, "named pipe (FIFO)")
        assert_exit_2(run_cli(["check", "m.csv"], tmp_path), "named pipe")


def test_device_behind_a_symlink_is_refused(tmp_path):
    (tmp_path / "zero.csv").symlink_to("/dev/zero")
    (tmp_path / "r.toml").symlink_to("/dev/zero")
    with bounded(20):
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "zero.csv", LAMP_FIELDS)
        assert_one_line(caught.value, "a device")
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "r.toml")
        assert_one_line(caught.value, "a device")


def test_symlink_loop_nul_byte_long_name_and_folder(tmp_path):
    (tmp_path / "a.csv").symlink_to("b.csv")
    (tmp_path / "b.csv").symlink_to("a.csv")
    (tmp_path / "x.toml").mkdir()
    cases = [
        (tmp_path / "a.csv", "loop of symbolic links"),
        (tmp_path / ("n" * 300 + ".csv"), "too long"),
        (tmp_path / "x.toml", "a folder, not a record"),
    ]
    for path, fragment in cases:
        with pytest.raises(InputError) as caught:
            load_product(path, LAMP_FIELDS)
        assert_one_line(caught.value, fragment)
    record = tmp_path / "r.toml"
    record.write_text('id = "x"\nspectrum = "a\\u0000b.csv"\ndistance_mm = 500\nsource_diameter_mm = 5\n')
    with pytest.raises(InputError) as caught:
        load_product(record)
    assert_one_line(caught.value, "NUL byte")
    assert_exit_2(run_cli(["assess", "x.toml"], tmp_path), "x.toml")


def test_folder_of_records_with_a_folder_named_like_a_record(tmp_path):
    from hazard.assessment.batch import run_batch

    records = tmp_path / "records"
    records.mkdir()
    write_lamp(records)
    (records / "good.toml").write_text('id = "G"\nspectrum = "lamp.csv"\ndistance_mm = 500\nsource_diameter_mm = 30\n')
    (records / "x.toml").mkdir()
    outcome = run_batch(records, tmp_path / "out")
    assert outcome.exit_code == 3 and list(outcome.assessments) == ["G"]
    assert "a folder, not a record" in next(iter(outcome.errors.values()))


def test_invalid_size_limit_variable(tmp_path, monkeypatch):
    path = write_lamp(tmp_path)
    for value in ("abc", "-1", "nan", "inf", "0"):
        monkeypatch.setenv("HAZARD_MAX_FILE_MB", value)
        with pytest.raises(InputError) as caught:
            load_product(path, LAMP_FIELDS)
        assert_one_line(caught.value, "HAZARD_MAX_FILE_MB")


# --- records: numbers that overflowed the geometry or the parser --------------------------------------------
@pytest.mark.parametrize(
    ("field", "value"),
    [
        ("distance_mm", 1e-300),
        ("distance_mm", 5e-324),
        ("distance_mm", 1e300),
        ("at_distance_mm", 1e-300),
        ("source_diameter_mm", 1e300),
        ("source_diameter_mm", 1e-300),
        ("peak_to_mean_radiance", 1e300),
        ("claimed_t_max_s_L_B", 5e-324),
        ("claimed_cct_k", 1e300),
    ],
)
def test_absurd_record_magnitudes_are_refused_with_the_bound(tmp_path, field, value):
    path = write_lamp(tmp_path)
    with pytest.raises(InputError) as caught:
        load_product(path, {**LAMP_FIELDS, field: value})
    assert_one_line(caught.value, f"{value:g}", "is not a usable", "give ")


@pytest.mark.parametrize(
    ("text", "fragment"),
    [
        ("a = " + "[" * 5000 + "]" * 5000 + "\n", "nested too deep"),
        ("distance_mm = " + "9" * 5000 + "\n", "not a usable TOML value"),
    ],
)
def test_toml_parser_limits_are_input_errors(tmp_path, text, fragment):
    record = tmp_path / "r.toml"
    record.write_text('id = "x"\n' + text)
    with pytest.raises(InputError) as caught:
        load_product(record)
    assert_one_line(caught.value, "r.toml", fragment)


def test_spectral_values_near_the_float_limit_are_refused(tmp_path):
    # values near 1e305 once overflowed to infinity, were written as null and did not read back
    path = write_spectrum(tmp_path / "big.csv", LAMP_NM, white_lamp(LAMP_NM) * 1e307)
    with pytest.raises(InputError) as caught:
        load_product(path, LAMP_FIELDS)
    assert_one_line(caught.value, "big.csv", "not a plausible measurement")


def test_a_result_that_overflowed_never_leaves_the_engine(tmp_path):
    from hazard.assessment.guard import require_finite

    good = hazard.assess(write_lamp(tmp_path), {**LAMP_FIELDS, "id": "P"})
    assert require_finite(good) is good
    hazards = dict(good.hazards)
    hazards["E_B" if "E_B" in hazards else "L_B"] = next(iter(hazards.values())).model_copy(
        update={"value": float("inf")}
    )
    with pytest.raises(InputError) as caught:
        require_finite(good.model_copy(update={"hazards": hazards}))
    assert_one_line(caught.value, "product 'P'", "came out as inf")


# --- manifests ------------------------------------------------------------------------------------------------
def test_manifest_dialects_that_crashed(tmp_path):
    write_lamp(tmp_path)
    cases = {
        "cr.csv": MANIFEST_HEAD.replace("\n", "\r") + "A,lamp.csv,500,30,true\r",  # old spreadsheet exports
        "one.csv": "id\nA\n",  # a one-column header (the delimiter sniffer failed on it)
        "semi.csv": MANIFEST_HEAD.replace(",", ";") + "A;lamp.csv;500;30;true\n",
    }
    for name, text in cases.items():
        (tmp_path / name).write_text(text)
        rows = read_manifest(tmp_path / name)
        assert [row.product_id for row in rows] == ["A"], name
    assert read_manifest(tmp_path / "cr.csv")[0].fields["spectrum"] == "lamp.csv"
    big = tmp_path / "big.csv"
    big.write_text(MANIFEST_HEAD + "A,lamp.csv,500,30,true\n" + "B," + "x" * 140_000 + ",500,30,true\n")
    with pytest.raises(InputError) as caught:
        read_manifest(big)
    assert_one_line(caught.value, "big.csv:3", "not a readable CSV row")


def test_xlsx_manifest_with_a_date_cell(tmp_path):
    import datetime

    from hazard.assessment.batch import run_batch

    write_lamp(tmp_path)
    path = write_xlsx(
        tmp_path / "m.xlsx",
        [
            ["id", "spectrum", "distance_mm", "source_diameter_mm", "name"],
            ["A", "lamp.csv", 500, 30, datetime.datetime(2024, 5, 1, 12, 0)],
            [datetime.date(2024, 5, 2), "lamp.csv", 500, 30, "dated"],
        ],
    )
    outcome = run_batch(path, tmp_path / "out")
    assert outcome.exit_code == 0 and list(outcome.assessments) == ["A", "2024-05-02"]
    assert outcome.assessments["A"].name == "2024-05-01 12:00:00"


# --- one bad product never loses the batch --------------------------------------------------------------------
@pytest.mark.parametrize(("raised", "status"), [(OverflowError("math range error"), 3), (RuntimeError("a defect"), 1)])
def test_a_failure_after_loading_is_that_products_error(tmp_path, monkeypatch, raised, status):
    import hazard.assessment.batch as batch

    real = batch.build_assessment

    def failing(loaded, *args, **kwargs):
        if loaded.record.id == "BAD":
            raise raised
        return real(loaded, *args, **kwargs)

    monkeypatch.setattr(batch, "build_assessment", failing)
    manifest = write_manifest(tmp_path, ["A", "BAD", "C"])
    outcome = batch.run_batch(manifest, tmp_path / "out")
    assert outcome.exit_code == status and list(outcome.assessments) == ["A", "C"]
    summary = (tmp_path / "out" / "summary.csv").read_text().splitlines()
    assert [line.split(",")[:2] for line in summary[1:]] == [["A", "ok"], ["BAD", "error"], ["C", "ok"]]
    assert ("internal error" in outcome.errors["BAD"]) == (status == 1)
    for line in (tmp_path / "out" / "results.jsonl").read_text().splitlines():
        hazard.Assessment.model_validate_json(line)  # every written result reads back


def test_a_report_that_fails_to_render_does_not_stop_the_others(tmp_path, monkeypatch):
    import hazard.reports
    from hazard.assessment.batch import run_batch

    real = hazard.reports.render_assessment_pdf

    def failing(assessment, *args, **kwargs):
        if assessment.id == "BAD":
            raise ValueError("a defect")
        return real(assessment, *args, **kwargs)

    monkeypatch.setattr(hazard.reports, "render_assessment_pdf", failing)
    outcome = run_batch(write_manifest(tmp_path, ["A", "BAD"]), tmp_path / "out", pdf=True)
    assert outcome.exit_code == 1 and "a defect" in outcome.report_failures["BAD"]
    assert (tmp_path / "out" / "A.pdf").exists() and (tmp_path / "out" / "summary.pdf").exists()
    assert not (tmp_path / "out" / "BAD.pdf").exists()


def test_check_goes_on_after_a_failing_product(tmp_path, monkeypatch):
    import hazard.assessment.build as engine

    real = engine.build_assessment

    def failing(loaded, *args, **kwargs):
        if loaded.record.id == "BAD":
            raise OverflowError("math range error")
        return real(loaded, *args, **kwargs)

    monkeypatch.setattr(engine, "build_assessment", failing)
    write_manifest(tmp_path, ["A", "BAD", "C"])
    result = run_cli(["check", "m.csv"], tmp_path)
    assert result.exit_code == 3
    assert result.stdout.count(": computed ") == 2 and "BAD: error:" in result.stderr


# --- outputs never touch inputs -------------------------------------------------------------------------------
def test_assess_refuses_to_write_over_its_input(tmp_path):
    path = write_lamp(tmp_path)
    before = path.read_bytes()
    for option in ("--output", "--pdf"):
        result = run_cli(
            ["assess", "lamp.csv", "--distance-mm", "500", "--source-diameter-mm", "30", option, "lamp.csv"], tmp_path
        )
        assert_exit_2(result, "would replace an input file")
    assert path.read_bytes() == before


def test_batch_refuses_the_input_folder_and_foreign_folders(tmp_path):
    from hazard.assessment.batch import run_batch

    manifest = write_manifest(tmp_path, ["A"])
    (tmp_path / "summary.csv").write_text("the user's own file\n")
    with pytest.raises(InputError) as caught:
        run_batch(manifest, tmp_path)
    assert_one_line(caught.value, "holds this run's input", "new sub-folder")
    assert (tmp_path / "summary.csv").read_text() == "the user's own file\n"
    elsewhere = tmp_path / "mine"
    elsewhere.mkdir()
    (elsewhere / "notes.txt").write_text("keep me\n")
    with pytest.raises(InputError) as caught:
        run_batch(manifest, elsewhere)
    assert_one_line(caught.value, "files that hazard did not write")
    assert run_batch(manifest, tmp_path / "new" / "out").exit_code == 0  # a new sub-folder is fine


def test_colliding_ids_get_files_of_their_own(tmp_path):
    from hazard.assessment.batch import run_batch

    ids = ["lamp 1", "lamp_1", "a/b", "a_b", "summary", "...", "product", "Desk", "desk"]
    manifest = write_manifest(tmp_path, [f'"{i}"' for i in ids])
    outcome = run_batch(manifest, tmp_path / "out", per_product_json=True)
    assert outcome.exit_code == 0
    files = sorted(p.name for p in (tmp_path / "out").glob("*.json"))
    assert len(files) == len(ids) and "summary.json" not in files
    stems = {
        line.split(",")[0].strip('"'): line.rsplit(",", 1)[1]
        for line in (tmp_path / "out" / "summary.csv").read_text().splitlines()[1:]
    }
    assert sorted(f"{stems[i]}.json" for i in ids) == files
    for i in ids:
        assert json.loads((tmp_path / "out" / f"{stems[i]}.json").read_text())["id"] == i


def test_one_run_at_a_time_and_one_batch_per_folder(tmp_path):
    from hazard.assessment.batch import run_batch
    from hazard.assessment.outfolder import OutputFolder

    manifest = write_manifest(tmp_path, ["A"])
    out = tmp_path / "out"
    with OutputFolder(out, manifest, []):
        with pytest.raises(InputError) as caught:
            run_batch(manifest, out)
        assert_one_line(caught.value, "another hazard run is writing into this folder", f"process {os.getpid()}")
    assert run_batch(manifest, out).exit_code == 0
    other = tmp_path / "other.csv"
    other.write_text(manifest.read_text())
    with pytest.raises(InputError) as caught:
        run_batch(other, out)
    assert_one_line(caught.value, "outputs of another batch")


def test_resume_survives_a_torn_utf8_tail_and_removes_stale_temporaries(tmp_path):
    from hazard.assessment.batch import run_batch

    manifest = write_manifest(tmp_path, ["A", "B", "C"])
    out = tmp_path / "out"
    run_batch(manifest, out)
    clean = (out / "results.jsonl").read_bytes()
    first = clean.split(b"\n")[0]
    (out / "results.jsonl").unlink()
    (out / "summary.csv").unlink()
    (out / "results.jsonl.partial").write_bytes(first + b"\n" + "é".encode()[:1] + first[:50])  # a full disk
    stale = out / ".summary.csv.4194304-abcdefgh.hazard.tmp"  # a killed run's (no such process id)
    stale.write_text("half")
    outcome = run_batch(manifest, out, resume=True)
    assert outcome.reused == 1 and (out / "results.jsonl").read_bytes() == clean
    assert not stale.exists() and not (out / "results.jsonl.partial").exists()


def test_full_disk_and_read_only_folder_are_one_line(tmp_path, monkeypatch):
    import errno

    import hazard.output.atomic as atomic

    write_lamp(tmp_path)
    for code in (errno.ENOSPC, errno.EROFS):

        def refuse(*args, code=code, **kwargs):
            raise OSError(code, os.strerror(code), str(tmp_path / "out.json"))

        monkeypatch.setattr(atomic.tempfile, "mkstemp", refuse)
        result = run_cli(
            ["assess", "lamp.csv", "--distance-mm", "500", "--source-diameter-mm", "30", "--output", "out.json"],
            tmp_path,
        )
        assert_exit_2(result, "cannot write", os.strerror(code))
        assert not (tmp_path / "out.json").exists()


# --- confinement: a manifest cannot reach outside its folder ---------------------------------------------------
def test_spectrum_paths_outside_the_manifest_folder_are_refused(tmp_path):
    from hazard.assessment.batch import run_batch

    secret = tmp_path / "secret"
    secret.mkdir()
    (secret / "s.csv").write_text("wavelength_nm,value\n400,SECRET-CONTENT\n")
    vendor = tmp_path / "vendor"
    vendor.mkdir()
    write_lamp(vendor)
    (vendor / "link.csv").symlink_to(secret / "s.csv")
    manifest = vendor / "m.csv"
    manifest.write_text(
        MANIFEST_HEAD + "A,lamp.csv,500,30,true\nB,../secret/s.csv,500,30,true\n"
        f"C,{secret / 's.csv'},500,30,true\nD,link.csv,500,30,true\nE,../secret/none.csv,500,30,true\n"
    )
    outcome = run_batch(manifest, tmp_path / "out")
    assert list(outcome.assessments) == ["A"]
    for product in "BCDE":
        assert "--allow-outside" in outcome.errors[product]
        assert "SECRET" not in outcome.errors[product] and "not found" not in outcome.errors[product]
    assert "SECRET" not in (tmp_path / "out" / "summary.csv").read_text()
    allowed = run_batch(manifest, tmp_path / "out2", allow_outside=True)
    assert "text 'SECRET-CONTENT'" in allowed.errors["B"]  # read only when the user allows it


def test_report_refuses_a_result_that_does_not_read_back(tmp_path):
    good = hazard.assess(write_lamp(tmp_path), {**LAMP_FIELDS, "id": "P"}).model_dump_json()
    cases = {
        "deep.json": "[" * 100_000,
        "torn.json": good[:300],
        "nan.json": re.sub(r'"value":[0-9.e+-]+', '"value":NaN', good, count=1),
    }
    for name, text in cases.items():
        (tmp_path / name).write_text(text)
        assert_exit_2(run_cli(["report", name, "--output", "r.pdf"], tmp_path), name)
    (tmp_path / "good.json").write_text(good)
    assert_exit_2(run_cli(["report", "good.json", "--output", "good.json"], tmp_path), "would replace an input")
    assert not (tmp_path / "r.pdf").exists()
