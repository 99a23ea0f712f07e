"""Manifests (hazard.inputs.manifest): CSV and .xlsx dialects, unknown columns, duplicate ids, folders of records."""

import pytest
from conftest import (
    MANIFEST_HEAD,
    assert_one_line,
    copy_lineup,
    run_process,
    write_lamp,
    write_xlsx,
)

from hazard.assessment.batch import run_batch
from hazard.errors import InputError
from hazard.inputs.manifest import read_manifest


def test_duplicate_ids_make_the_manifest_unusable(tmp_path):
    folder = copy_lineup(tmp_path)
    manifest = folder / "m.csv"
    manifest.write_text(
        "id,spectrum,distance_mm,source_diameter_mm\nA,cl-desk-30.csv,500,30\n"
        "B,cl-desk-30.csv,500,30\nA,cl-spot-65.csv,1000,60\n"
    )
    with pytest.raises(InputError, match=r"m.csv:4: duplicate id 'A' \(also at .*m.csv:2\)"):
        run_batch(manifest, tmp_path / "out")
    result = run_process("batch", str(manifest), "--output", str(tmp_path / "out"))
    assert result.returncode == 2 and result.stderr.count("\n") == 1 and "duplicate id" in result.stderr


def test_unknown_column_is_named_with_a_suggestion(tmp_path):
    manifest = tmp_path / "m.csv"
    manifest.write_text("id,spectrum,distance,source_diameter_mm\nA,a.csv,500,30\n")
    result = run_process("batch", str(manifest), "--output", str(tmp_path / "out"))
    assert result.returncode == 2 and "unknown column 'distance'" in result.stderr
    assert "distance_mm" in result.stderr


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


def test_a_row_longer_than_the_header_fails_alone_and_an_empty_manifest_is_refused(tmp_path):
    # An unquoted comma in a name shifts every later cell of its row (the distance would be read from the spectrum
    # column): that row fails with its line and the fix, the others are assessed (one bad product never stops a
    # batch). A manifest without any product row is refused: an empty summary would read as "nothing found".
    copy_lineup(tmp_path)
    manifest = tmp_path / "m.csv"
    manifest.write_text(
        "id,name,spectrum,distance_mm,source_diameter_mm\n"
        "A,Desk lamp 5W,cl-desk-30.csv,500,30\nB,Desk lamp, 5W,cl-desk-30.csv,500,30\n"
    )
    rows = read_manifest(manifest)
    assert rows[0].problem is None
    assert_one_line(rows[1].problem, "m.csv:3", "1 more cell(s) than the header", "quote a cell")
    ran = run_process("batch", str(manifest), "--output", str(tmp_path / "out"))
    assert ran.returncode == 3 and (tmp_path / "out" / "summary.csv").read_text().count("\n") == 3
    (tmp_path / "empty.csv").write_text("id,spectrum\n\n")
    refused = run_process("batch", str(tmp_path / "empty.csv"), "--output", str(tmp_path / "out2"))
    assert refused.returncode == 2 and "the manifest lists no products" in refused.stderr
