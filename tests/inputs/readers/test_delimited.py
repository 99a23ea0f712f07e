"""Delimited text spectra (hazard.inputs.readers.delimited): decimal commas, several value columns, mistyped rows and
over-long cells."""

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    LAMP_FIELDS,
    assert_one_line,
    same_result,
    white_lamp,
    write_file,
    write_lamp,
    write_spectrum,
)

import hazard
from hazard.cli import main
from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.readers import read_spectrum

SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}


SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]


HEADER = "wavelength_nm,value\n"


VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


@pytest.mark.parametrize("with_header", [True, False])
def test_mistyped_first_data_row_is_not_taken_for_a_header(tmp_path, with_header):
    rows = "5OO,0.1\n501,0.2\n502,0.3\n"
    path = write_file(tmp_path / "typo.csv", (HEADER if with_header else "") + rows)
    # style.md habit 8: no silent fallbacks; the row is data (its value cell is a number), so it is bad data
    with pytest.raises(InputError, match=r"5OO"):
        hazard.assess(path, SIZE)


def test_decimal_comma_with_semicolons_equals_decimal_point(tmp_path):
    # readers/delimited.py: decimal comma is read (European instrument exports); the numbers are the same
    wl, values = VISIBLE_NM, white_lamp(VISIBLE_NM)
    (tmp_path / "comma").mkdir(), (tmp_path / "point").mkdir()
    comma = tmp_path / "comma" / "lamp.csv"
    comma.write_text(
        "wavelength_nm;value\n"
        + "".join(f"{w!r};{v!r}\n".replace(".", ",") for w, v in zip(map(float, wl), map(float, values), strict=True))
    )
    point = write_spectrum(tmp_path / "point" / "lamp.csv", wl, values)
    assert same_result(hazard.assess(comma, SIZE), hazard.assess(point, SIZE))


# --- several value columns ---------------------------------------------------------------------------------
def _columns_file(tmp_path):
    wl = VISIBLE_NM
    a, b = white_lamp(wl), 3.0 * white_lamp(wl)[::-1]
    path = tmp_path / "columns.csv"
    path.write_text(
        "wavelength_nm,a,b\n"
        + "".join(f"{w!r},{x!r},{y!r}\n" for w, x, y in zip(*(map(float, c) for c in (wl, a, b)), strict=True))
    )
    (tmp_path / "single").mkdir()
    single = write_spectrum(tmp_path / "single" / "columns.csv", wl, b)
    return path, single


@pytest.mark.parametrize("column", ["b", 2])
def test_value_column_by_name_or_number(tmp_path, column):
    path, single = _columns_file(tmp_path)
    chosen = hazard.assess(path, {**SIZE, "column": column})
    alone = hazard.assess(single, SIZE)
    # readers/delimited.py: a header name, or a 1-based number counted over the value columns
    assert chosen.model_dump()["hazards"] == alone.model_dump()["hazards"]
    assert chosen.photometry == alone.photometry


@pytest.mark.parametrize("column", ["b", "2"])
def test_value_column_on_the_command_line(tmp_path, monkeypatch, column):
    _, single = _columns_file(tmp_path)
    monkeypatch.chdir(tmp_path)
    chosen = CliRunner().invoke(main, ["assess", "columns.csv", *SIZE_OPTIONS, "--column", column, "--format", "json"])
    assert chosen.exit_code == 0, chosen.stderr
    alone = hazard.assess(single, SIZE)
    assert hazard.Assessment.model_validate_json(chosen.stdout).hazards == alone.hazards


@pytest.mark.parametrize(
    ("column", "pattern"),
    [
        ("c", r"no value column named 'c'; fix: use one of: a, b"),
        (3, r"column 3 does not exist \(2 value columns\)"),
        (0, r"column 0 does not exist"),
    ],
)
def test_value_column_that_does_not_exist(tmp_path, column, pattern):
    path, _ = _columns_file(tmp_path)
    with pytest.raises(InputError, match=pattern):
        hazard.assess(path, {**SIZE, "column": column})


@pytest.mark.parametrize("column", ["²", "١", "9" * 5000])
def test_column_that_looks_like_a_number_but_is_not(tmp_path, column):
    # "²".isdigit() is True but int("²") fails; a 5000-digit number exceeds int()'s limit
    path = write_lamp(tmp_path)
    with pytest.raises(InputError) as caught:
        load_product(path, {**LAMP_FIELDS, "column": column})
    assert_one_line(caught.value, "column")


def test_long_message_excerpts_are_short_and_printable(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text("wavelength_nm,value\n400,0.1\n410,abc\x1b[2J" + "z" * 900 + "\n")
    with pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="t.csv")
    text = assert_one_line(caught.value, "t.csv:3")
    assert "\x1b" not in text and "zzzz" in text and "z" * 100 not in text
