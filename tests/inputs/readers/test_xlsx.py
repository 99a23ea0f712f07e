"""Spectra in .xlsx workbooks (hazard.inputs.readers.xlsx and .workbook): damaged, huge or odd workbooks are one input
error, found in bounded time."""

import pytest
from conftest import (
    assert_one_line,
    bounded,
    write_xlsx,
)

from hazard.errors import InputError
from hazard.inputs.readers import read_spectrum


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
