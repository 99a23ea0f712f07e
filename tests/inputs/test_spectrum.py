"""Spectrum validation (hazard.inputs.spectrum, method §5).

Bad spectra: each case raises :class:`hazard.InputError` whose message names the file, the line where there is one,
and the fix; the CLI prints it as one line and exits 2 (``hazard/cli.py`` and DEVELOPERS.md: "exit 2, one line on
stderr"). Tolerated input (small negatives, descending wavelengths) is accepted and what was done is recorded in the
result.
"""

import re

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    LAMP_FIELDS,
    LAMP_NM,
    assert_error_line,
    assert_one_line,
    file_hashes,
    load_spectrum,
    same_result,
    white_lamp,
    write_file,
    write_spectrum,
    write_toml,
)
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

import hazard
from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded
from hazard.cli import main
from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.spectrum import validate_spectrum

SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}


SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]


HEADER = "wavelength_nm,value\n"


VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


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


FAST = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])


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


# --- descending input equals ascending input ---------------------------------------------------------------
@FAST
# start ≥ 200 nm: the spectrum overlaps 200-3000 nm (hazard/inputs.py refuses one wholly outside the bands)
@given(
    steps=st.lists(st.floats(0.05, 10.0), min_size=1, max_size=150),
    start=st.floats(200.0, 2500.0),
    data=st.data(),
    diameter_mm=st.floats(0.5, 30.0),
    no_emission_outside=st.booleans(),
    lamp_type=st.sampled_from(["gls", "other"]),
)
def test_descending_input_equals_ascending(steps, start, data, diameter_mm, no_emission_outside, lamp_type):
    wl = start + np.concatenate([[0.0], np.cumsum(steps)])
    values = np.array(data.draw(st.lists(st.floats(0.0, 100.0), min_size=wl.size, max_size=wl.size)))
    assume(values.max() > 0)  # a spectrum needs a positive value (method §5)
    fields = {"source_diameter_mm": diameter_mm, "no_emission_outside": no_emission_outside, "lamp_type": lamp_type}
    up, down = load_spectrum(wl, values, **fields), load_spectrum(wl[::-1], values[::-1], **fields)
    # method §5: descending input is reversed into the very same validated spectrum, so everything computed from it
    # (the studies too) is the same; in the results only the note of the reversal and the input's hash differ
    assert np.array_equal(down.spectrum.wavelength_nm, up.spectrum.wavelength_nm)
    assert np.array_equal(down.spectrum.value, up.spectrum.value)
    a_up, a_down = (build_assessment(p, evaluate_loaded([p]), 0, studies=False) for p in (up, down))
    strip = {"warnings": True, "provenance": {"inputs", "result_sha256"}}
    assert a_down.model_dump(exclude=strip) == a_up.model_dump(exclude=strip)
    assert len(a_down.warnings) == len(a_up.warnings) + 1
    assert [w for w in a_down.warnings if "descending" not in w] == a_up.warnings


def test_spectral_values_near_the_float_limit_are_refused(tmp_path):
    # values near 1e305 once overflowed to infinity, were written as null and did not read back
    path = write_spectrum(tmp_path / "big.csv", LAMP_NM, white_lamp(LAMP_NM) * 1e307)
    with pytest.raises(InputError) as caught:
        load_product(path, LAMP_FIELDS)
    assert_one_line(caught.value, "big.csv", "not a plausible measurement")


@pytest.mark.parametrize("bad", [np.nan, np.inf, -np.inf], ids=["NaN", "inf", "-inf"])
@pytest.mark.parametrize("column", ["wavelength", "value"])
def test_arrays_with_a_value_that_is_not_finite_are_refused(bad, column):
    # method §5: every number finite; the message names the row's line and the fix (hazard.errors: file, line, fix)
    wl, value = np.arange(400.0, 411.0), np.ones(11)
    (wl if column == "wavelength" else value)[4] = bad
    lines = np.arange(11) + 2  # a header on line 1
    with pytest.raises(InputError, match=f"{column} is not a finite number") as caught:
        validate_spectrum(wl, value, lines, "lamp.csv", 1.0, "irradiance")
    assert caught.value.line == 6 and str(caught.value).startswith("lamp.csv:6: ")
