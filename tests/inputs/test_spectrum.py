"""Bad input: each case raises :class:`hazard.InputError` whose message names the file, the line where there is
one, and the fix; the CLI prints it as one line and exits 2. Tolerated input (small negatives, descending
wavelengths, a partial spectrum) is accepted and what was done is recorded in the result.

Rules checked: method §5 (project design) and the CLI contract in
``hazard/cli.py`` and DEVELOPERS.md ("exit 2, one line on stderr").
"""

import os
import re
import subprocess
import sys
import warnings

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    REPO,
    assert_error_line,
    file_hashes,
    same_result,
    white_lamp,
    write_file,
    write_spectrum,
    write_toml,
)

import hazard
from hazard import InputError
from hazard.cli import main

SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}
SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]
HEADER = "wavelength_nm,value\n"
VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


def _assess_in_a_process(args, cwd):
    """The real command in a fresh interpreter, as a user runs it."""
    env = {**os.environ, "PYTHONPATH": os.pathsep.join(filter(None, [str(REPO), os.environ.get("PYTHONPATH")]))}
    return subprocess.run(
        [sys.executable, "-m", "hazard.cli", "assess", *args],
        capture_output=True,
        text=True,
        cwd=cwd,
        env=env,
        timeout=120,
    )


# --- bad spectrum files ------------------------------------------------------------------------------------
# (file name, content, message pattern, line named in the message or None). Each rule: method §5 (project
# design) unless noted; the line numbers count the header as line 1.
_MICROMETRE = HEADER + "".join(f"{w / 1000:.3f},0.01\n" for w in range(300, 801, 10))
SPECTRUM_CASES = [
    pytest.param("empty.csv", "", r"no data rows", None, id="empty file"),
    pytest.param("header_only.csv", HEADER, r"no data rows", None, id="only a header"),
    pytest.param("one_row.csv", HEADER + "500,0.1\n", r"only one data row", 2, id="one data row"),
    pytest.param(
        "text.csv",
        HEADER + "500,0.1\n501,0.2\n502,abc\n503,0.1\n",
        r"text 'abc' in a number column",
        4,
        id="text in a number column",
    ),
    pytest.param("nan.csv", HEADER + "500,0.1\n501,NaN\n502,0.1\n", r"value is not a finite number", 3, id="NaN"),
    pytest.param(
        "inf.csv",
        HEADER + "500,0.1\n501,0.1\n502,1e400\n",
        r"value is not a finite number",
        4,
        id="overflow to infinity",
    ),
    # the message names both rows: the second in the FILE:LINE prefix, the first in the text
    pytest.param(
        "duplicate.csv",
        HEADER + "500,0.1\n501,0.2\n501,0.3\n502,0.1\n",
        r"duplicate wavelength 501 nm \(also on line 3\)",
        4,
        id="duplicate wavelengths",
    ),
    pytest.param(
        "unsorted.csv", HEADER + "500,0.1\n502,0.2\n501,0.3\n", r"501 nm breaks the order", 4, id="unsorted wavelengths"
    ),
    pytest.param(
        "micrometre.csv",
        _MICROMETRE,
        r"0\.3 to 0\.8: this looks like µm, not nm.*multiply the "
        r"wavelength column by 1000",
        2,
        id="wavelengths in um",
    ),
    pytest.param(
        "negative.csv",
        HEADER + "500,1.0\n501,0.5\n502,-0.05\n503,0.2\n",
        r"value -0\.05 at 502 nm is negative beyond dark noise \(more than 1% of the peak 1\)",
        4,
        id="negative beyond 1 % of the peak",
    ),
    pytest.param(
        "just_beyond.csv",
        HEADER + "500,1.0\n501,-0.0101\n502,0.2\n",
        r"negative beyond dark noise",
        3,
        id="negative just beyond 1 %",
    ),
    pytest.param(
        "binary.csv", b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR\x00\x00\x01\x00", r"binary file", None, id="binary file"
    ),
    pytest.param(
        "ragged.csv", HEADER + "500,0.1\n501,0.2,0.3\n502,0.1\n", r"3 cells where the table has 2", 3, id="ragged rows"
    ),
    pytest.param("one_column.csv", "wavelength_nm\n500\n501\n", r"only one column", 2, id="one column"),
    pytest.param("zero.csv", HEADER + "500,0\n501,0\n", r"no positive value", None, id="all zero"),
    pytest.param(
        "columns.csv",
        "wavelength_nm,a,b\n500,0.1,0.2\n501,0.1,0.2\n",
        r"2 value columns; fix: name the one to use with 'column'",
        None,
        id="several value columns without column",
    ),
]


@pytest.mark.parametrize(("name", "content", "pattern", "line"), SPECTRUM_CASES)
def test_bad_spectrum_file_raises_input_error(tmp_path, name, content, pattern, line):
    path = write_file(tmp_path / name, content)
    with pytest.raises(InputError, match=pattern) as caught:
        hazard.assess(path, SIZE)
    # errors.py: the message starts 'FILE:LINE: ' (or 'FILE: ' where no line applies) and ends with the fix
    prefix = f"{name}:{line}: " if line is not None else f"{name}: "
    assert str(caught.value).startswith(prefix)
    assert caught.value.line == line
    assert "; fix: " in str(caught.value)


@pytest.mark.parametrize(("name", "content", "pattern", "line"), SPECTRUM_CASES)
def test_bad_spectrum_file_on_the_command_line(tmp_path, monkeypatch, name, content, pattern, line):
    write_file(tmp_path / name, content)
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(main, ["assess", name, *SIZE_OPTIONS])
    where = f"{name}:{line}: " if line is not None else f"{name}: "
    message = assert_error_line(result.exit_code, result.stdout, result.stderr, where)
    assert re.search(pattern, message)


@pytest.mark.parametrize(("name", "content", "pattern", "line"), SPECTRUM_CASES)
def test_bad_input_never_modifies_the_input_file(tmp_path, monkeypatch, name, content, pattern, line):
    # The tool reads its inputs and writes nothing beside them (common practice, no published source)
    write_file(tmp_path / name, content)
    write_toml(tmp_path / "record.toml", id="x", spectrum=name, distance_mm=200.0, source_diameter_mm=5.0)
    before = file_hashes(tmp_path)
    with pytest.raises(InputError):
        hazard.assess(tmp_path / name, SIZE)
    with pytest.raises(InputError):
        hazard.load_product(tmp_path / "record.toml")
    monkeypatch.chdir(tmp_path)
    assert CliRunner().invoke(main, ["assess", "record.toml"]).exit_code == 2
    assert file_hashes(tmp_path) == before


def test_real_process_exit_code_and_one_line(tmp_path):
    # A fresh interpreter: the exit status and stderr a shell script sees (hazard/cli.py: exit 2, one line)
    write_file(tmp_path / "text.csv", HEADER + "500,0.1\n501,0.2\n502,abc\n503,0.1\n")
    before = file_hashes(tmp_path)
    result = _assess_in_a_process(["text.csv", *SIZE_OPTIONS], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "text.csv:4: text 'abc' in a number column")
    assert file_hashes(tmp_path) == before


def test_real_process_missing_file(tmp_path):
    result = _assess_in_a_process(["missing.csv", *SIZE_OPTIONS], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "missing.csv", "file not found")


def test_real_process_invalid_toml_names_the_line(tmp_path):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    write_file(tmp_path / "record.toml", 'id = "x"\nspectrum = "lamp.csv"\ndistance_mm = 200\nsource_diameter_mm 5\n')
    result = _assess_in_a_process(["record.toml"], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "record.toml:4: not valid TOML")


def test_spectrum_file_not_found(tmp_path):
    with pytest.raises(InputError, match=r"missing\.csv: file not found"):
        hazard.assess(tmp_path / "missing.csv", SIZE)
    write_toml(tmp_path / "record.toml", id="x", spectrum="nope.csv", distance_mm=200.0, source_diameter_mm=5.0)
    # the record's spectrum path is named as the record gives it (relative to the record's folder)
    with pytest.raises(InputError, match=r"^nope\.csv: spectrum file not found; fix: check the 'spectrum' path"):
        hazard.load_product(tmp_path / "record.toml")


# --- bad record fields -------------------------------------------------------------------------------------
# Each rule: method §4/§5 (project design) and hazard/record.py's field contract.
RECORD_CASES = [
    pytest.param(
        {"distance_mm": 200.0},
        r"missing source size: give source_diameter_mm, or source_width_mm and "
        r"source_height_mm, or source_alpha_mrad",
        id="missing source size",
    ),
    pytest.param({**SIZE, "source_alpha_mrad": 25.0}, r"give exactly one source size", id="two source sizes"),
    pytest.param(
        {"distance_mm": 200.0, "source_width_mm": 5.0},
        r"source_width_mm and source_height_mm go "
        r"together: give both",
        id="width without height",
    ),
    pytest.param(
        {"source_diameter_mm": 5.0},
        r"distance_mm is required for an irradiance spectrum",
        id="missing distance_mm for irradiance",
    ),
    pytest.param(
        {**SIZE, "unit": "W/m2"},
        r"unknown unit 'W/m2': expected power per area per wavelength",
        id="unit without per nm",
    ),
    pytest.param({**SIZE, "unit": "lux"}, r"unknown unit 'lux'", id="photometric unit"),
    pytest.param(
        {**SIZE, "unit": "W/m2/sr/nm"},
        r"unit 'W/m2/sr/nm' does not fit quantity 'irradiance'",
        id="radiance unit with quantity irradiance",
    ),
    pytest.param(
        {"source_diameter_mm": 5.0, "quantity": "radiance", "unit": "W/m2/nm"},
        r"unit 'W/m2/nm' does not fit quantity 'radiance'",
        id="irradiance unit with quantity radiance",
    ),
    pytest.param(
        {**SIZE, "distance_mm": -200.0}, r"distance[_-]mm: Input should be greater than 0", id="negative distance"
    ),
    pytest.param({**SIZE, "quantity": "exitance"}, r"quantity: Input should be 'irradiance'", id="unknown quantity"),
]


@pytest.mark.parametrize(("fields", "pattern"), RECORD_CASES)
def test_bad_record_fields_from_options(tmp_path, fields, pattern):
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    # on the command line, multi-word fields are named as their options (distance_mm → --distance-mm)
    pattern = re.sub(r"\b([a-z]+(?:_[a-z]+)+)\b", lambda m: "--" + m.group(1).replace("_", "-"), pattern)
    with pytest.raises(InputError, match=pattern) as caught:
        hazard.assess(path, fields)
    assert str(caught.value).startswith("command line: ")  # options are named as the command line
    assert "; fix: " in str(caught.value)


@pytest.mark.parametrize(("fields", "pattern"), RECORD_CASES)
def test_bad_record_fields_in_a_toml_record(tmp_path, monkeypatch, fields, pattern):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    record = write_toml(tmp_path / "record.toml", id="x", spectrum="lamp.csv", **fields)
    before = file_hashes(tmp_path)
    with pytest.raises(InputError, match=pattern) as caught:
        hazard.load_product(record)
    assert str(caught.value).startswith(str(record))
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(main, ["assess", "record.toml"])
    message = assert_error_line(result.exit_code, result.stdout, result.stderr, "record.toml")
    assert re.search(pattern, message)
    assert file_hashes(tmp_path) == before


def test_unknown_unit_on_the_command_line_names_the_option_value(tmp_path, monkeypatch):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(main, ["assess", "lamp.csv", *SIZE_OPTIONS, "--unit", "lux"])
    assert_error_line(result.exit_code, result.stdout, result.stderr, "command line", "unknown unit 'lux'")


def test_unknown_toml_field_suggests_the_close_name(tmp_path, monkeypatch):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    record = write_file(
        tmp_path / "record.toml", 'id = "x"\nspectrum = "lamp.csv"\ndistance = 200\nsource_diameter_mm = 5\n'
    )
    # record.py: extra fields are refused, with the closest field name (difflib) and the line of the key
    with pytest.raises(
        InputError,
        match=r"record\.toml:3: unknown field 'distance'; fix: did you mean "
        r"'distance_mm'\?",
    ):
        hazard.load_product(record)
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(main, ["assess", "record.toml"])
    assert_error_line(result.exit_code, result.stdout, result.stderr, "record.toml:3:", "'distance_mm'")


def test_invalid_toml_names_the_line(tmp_path):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    record = write_file(
        tmp_path / "record.toml", 'id = "x"\nspectrum = "lamp.csv"\n\ndistance_mm = 200 mm\nsource_diameter_mm = 5\n'
    )
    with pytest.raises(InputError, match=r"record\.toml:4: not valid TOML") as caught:
        hazard.load_product(record)
    assert caught.value.line == 4


def test_record_without_spectrum(tmp_path):
    record = write_toml(tmp_path / "record.toml", id="x", distance_mm=200.0, source_diameter_mm=5.0)
    with pytest.raises(InputError, match=r"record\.toml: the record names no spectrum file"):
        hazard.load_product(record)


def test_unknown_unit_in_a_toml_record_names_its_line(tmp_path):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    record = write_file(
        tmp_path / "record.toml",
        'id = "x"\nspectrum = "lamp.csv"\ndistance_mm = 200\nsource_diameter_mm = 5\nunit = "lux"\n',
    )
    # errors.py: 'it names the file, the line and the fix'; the unit is on line 5
    with pytest.raises(InputError, match=r"record\.toml:5: .*unknown unit 'lux'"):
        hazard.load_product(record)


@pytest.mark.parametrize("field", ["distance_mm", "source_diameter_mm"])
def test_infinite_record_numbers_are_refused(tmp_path, field):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    record = write_file(
        tmp_path / "record.toml",
        f'id = "x"\nspectrum = "lamp.csv"\nno_emission_outside = true\n'
        f"{'distance_mm = 200' if field != 'distance_mm' else ''}\n"
        f"{'source_diameter_mm = 5' if field != 'source_diameter_mm' else ''}"
        f"\n{field} = inf\n",
    )
    # method §5: values finite; a distance or size must be a finite positive length (common practice)
    with pytest.raises(InputError, match=field):
        hazard.load_product(record)


@pytest.mark.parametrize(
    ("header", "fields", "pattern"),
    [
        (
            "E [mW/m2/nm]",
            {**SIZE, "unit": "W/m2/nm"},
            r"the record says unit 'W/m2/nm' but the file's header cell says 'mW/m2/nm'",
        ),
        (
            "L [W/m2/sr/nm]",
            SIZE,
            r"the file's header cell gives 'W/m2/sr/nm', which does not fit quantity "
            r"'irradiance'",
        ),
    ],
)
def test_unit_in_the_header_that_contradicts_the_record(tmp_path, header, fields, pattern):
    # method §5: units are converted, never guessed; a header and a record that disagree are refused
    path = write_spectrum(
        tmp_path / "lamp.csv", VISIBLE_NM, 1000 * white_lamp(VISIBLE_NM), header=f"wavelength_nm,{header}"
    )
    with pytest.raises(InputError, match=pattern) as caught:
        hazard.assess(path, fields)
    assert "lamp.csv" in str(caught.value)


@pytest.mark.parametrize("with_header", [True, False])
def test_mistyped_first_data_row_is_not_taken_for_a_header(tmp_path, with_header):
    rows = "5OO,0.1\n501,0.2\n502,0.3\n"
    path = write_file(tmp_path / "typo.csv", (HEADER if with_header else "") + rows)
    # style.md habit 8: no silent fallbacks; the row is data (its value cell is a number), so it is bad data
    with pytest.raises(InputError, match=r"5OO"):
        hazard.assess(path, SIZE)


# --- tolerated input ---------------------------------------------------------------------------------------
def test_small_negatives_are_set_to_zero_with_a_warning(tmp_path):
    wl = VISIBLE_NM
    clean = white_lamp(wl)
    clean[[10, 300]] = 0.0
    noisy = clean.copy()
    peak = clean.max()
    noisy[10], noisy[300] = -0.004 * peak, -0.01 * peak  # method §5: dark noise down to −1 % of the peak
    (tmp_path / "noisy").mkdir(), (tmp_path / "clean").mkdir()
    a_noisy = hazard.assess(write_spectrum(tmp_path / "noisy" / "lamp.csv", wl, noisy), SIZE)
    a_clean = hazard.assess(write_spectrum(tmp_path / "clean" / "lamp.csv", wl, clean), SIZE)
    notes = [w for w in a_noisy.warnings if "negative" in w]
    assert len(notes) == 1 and "2 small negative value(s)" in notes[0] and "set to zero" in notes[0]
    assert "lamp.csv" in notes[0]
    assert not any("negative" in w for w in a_clean.warnings)
    assert same_result(a_noisy, a_clean)  # the negatives became exactly zero


def test_descending_wavelengths_equal_ascending(tmp_path):
    wl = np.arange(300.0, 1101.0, 1.0)
    (tmp_path / "up").mkdir(), (tmp_path / "down").mkdir()
    up = write_spectrum(tmp_path / "up" / "lamp.csv", wl, white_lamp(wl))
    down = write_spectrum(tmp_path / "down" / "lamp.csv", wl[::-1], white_lamp(wl)[::-1])
    fields = {**SIZE, "no_emission_outside": True}
    a_up, a_down = hazard.assess(up, fields), hazard.assess(down, fields)
    # method §5: descending input is reversed (and the reversal noted); the result is otherwise the same
    assert same_result(a_up, a_down)
    added = [w for w in a_down.warnings if w not in a_up.warnings]
    assert len(added) == 1 and "descending" in added[0] and "reversed" in added[0]


# Bands of method §1 (IEC 62471:2006 §4.3) and what a 380–780 nm spectrum misses of each
_MISSING_FROM_380_780 = {
    "E_S": "200–380 nm",
    "E_UVA": "315–380 nm",
    "L_B": "300–380 nm",
    "E_B": "300–380 nm",
    "L_R": "780–1400 nm",
    "E_IR": "780–3000 nm",
    "E_H": "780–3000 nm",
}


@pytest.mark.parametrize(("diameter_mm", "blue"), [(5.0, "L_B"), (1.0, "E_B")])
def test_band_not_covered_is_not_assessed(tmp_path, monkeypatch, diameter_mm, blue):
    # α = D/200 mm: 0.025 rad → L_B, 0.005 rad → E_B (IEC 62471:2006 Table 6.1, α < 0.011 rad)
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": diameter_mm})
    expected = {"E_S", "E_UVA", blue, "L_R", "E_IR", "E_H"}
    # method §5: a hazard is assessed only when the spectrum spans its band; method §3: with no hazard that has
    # risk groups assessed there is no group at all (never "Exempt")
    assert a.complete is False and a.risk_group is None and a.deciding_hazards == []
    assert set(a.not_assessed) == expected
    assert not a.geometry.weak_visual_stimulus  # bright lamp: L_R, not L_IR (method §1)
    for symbol in expected:
        h = a.hazards[symbol]
        assert h.assessed is False and h.value is None and h.risk_group is None and h.t_max_s is None
        missing = _MISSING_FROM_380_780[symbol]
        assert f"missing {missing}" in h.note, h.note
        assert "no_emission_outside" in h.note  # the fix is named
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(
        main, ["assess", "lamp.csv", "--distance-mm", "200", "--source-diameter-mm", str(diameter_mm)]
    )
    assert result.exit_code == 0
    overall = next(line for line in result.stdout.splitlines() if line.startswith("Overall risk group"))
    assert overall.startswith("Overall risk group: NOT DETERMINED") and "Exempt" not in overall
    assert "measure the missing wavelength range" in result.stdout  # the fix is named


def test_band_gap_assumed_empty_with_no_emission_outside(tmp_path, monkeypatch):
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    a = hazard.assess(path, {**SIZE, "no_emission_outside": True})
    # method §5: the gap counts as zero and the assumption is printed in every output
    assert a.complete is True and a.not_assessed == []
    assert all(h.assessed and h.value is not None for h in a.hazards.values())
    assert a.hazards["E_IR"].value == 0.0  # nothing beyond 780 nm by the record's statement
    assumption = "emits nothing outside 380–780 nm"
    assert any(assumption in text for text in a.assumptions)
    monkeypatch.chdir(tmp_path)
    text = CliRunner().invoke(main, ["assess", "lamp.csv", *SIZE_OPTIONS, "--no-emission-outside"])
    as_json = CliRunner().invoke(
        main, ["assess", "lamp.csv", *SIZE_OPTIONS, "--no-emission-outside", "--format", "json"]
    )
    assert text.exit_code == 0 and as_json.exit_code == 0
    assert assumption in text.stdout and assumption in as_json.stdout


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


# --- quiet output ------------------------------------------------------------------------------------------
def test_valid_input_raises_no_python_warnings(tmp_path):
    wl = np.arange(300.0, 1101.0, 1.0)
    values = np.exp(-0.5 * ((wl - 960) / 15) ** 2)  # an IR LED: its UV tail leaves E_S ≈ 4e-308 W/m2
    path = write_spectrum(tmp_path / "ir.csv", wl, values)
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # a valid input must not make numpy or Python warn (style.md, habit 8)
        a = hazard.assess(path, {**SIZE, "no_emission_outside": True})
    assert a.hazards["E_S"].t_max_s is None  # method §1: 30/E_S is far beyond 30000 s
