"""The product record (hazard.inputs.record): bad fields from options, TOML files and manifest rows are one input error
naming the field, the line and the fix; flat fields and tables of fields agree."""

import json
import re

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    LAMP_FIELDS,
    assert_error_line,
    assert_one_line,
    file_hashes,
    triangle_line,
    white_lamp,
    write_file,
    write_lamp,
    write_spectrum,
    write_toml,
)

import hazard
from hazard.cli import main
from hazard.errors import InputError
from hazard.inputs.loading import load_product

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


# S_UV(270 nm) = 1.0 (IEC 62471:2006 Table 4.1): a 270 nm line of 0.001 W/m² gives E_S = 0.001 W/m².
UV_LINE = triangle_line(GRID, 270.0, 0.001 / 0.05, 0.05)


SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}

SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]

VISIBLE_NM = np.arange(380.0, 781.0, 1.0)

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

BAD = [
    pytest.param(["--emission", "single_pulse", "--pulse-duration-s", "0.3"], "0.3 s is not a pulse", id="long pulse"),
    pytest.param(["--emission", "pulse_train", "--pulse-duration-s", "1ms"], "needs --pulse-rate-hz", id="no rate"),
    pytest.param(
        ["--quantity", "radiant_exposure", "--unit", "J/m2/nm"], "exposure of one pulse", id="dose, continuous"
    ),
    pytest.param(
        ["--exposure-distance-mm", "500", "--exposure-duration-s", "0"], "not a usable duration", id="zero duration"
    ),
    pytest.param(["--exposure-distance-mm", "500", "--exposure-duration-s", "-5min"], "not a duration", id="negative"),
    pytest.param(
        ["--exposure-distance-mm", "500", "--exposure-duration-s", "25h"], "at most 86400 s (a day)", id="over a day"
    ),
    pytest.param(
        # shorter than the limits reach (IEC 62471:2006 4.3: the shortest is 10 µs); 1e-320 s overflowed t^-1 terms
        ["--emission", "single_pulse", "--pulse-duration-s", "1e-320"],
        "at least 1e-09 s (1 ns)",
        id="under a nanosecond",
    ),
    pytest.param(["--exposure", "distance_mm=500,duration_s=2d"], "at most 86400 s (a day)", id="table over a day"),
    pytest.param(["--exposure-duration-s", "2h"], "go together", id="duration without distance"),
    pytest.param(
        ["--emission", "single_pulse", "--pulse-duration-s", "1ms", "--exposure", "distance_mm=500,duration_s=1h"],
        "single pulse has no daily duration",
        id="a day of one pulse",
    ),
]


def test_the_flat_fields_and_a_manifest_row_give_the_same_exposure(tmp_path):
    spectrum = write_spectrum(tmp_path / "uv.csv", GRID, UV_LINE)
    fields = {"distance_mm": 1000.0, "source_diameter_mm": 5.0, "no_emission_outside": True}
    flat = hazard.assess(spectrum, {**fields, "exposure_distance_mm": 700.0, "exposure_duration_s": "90min"})
    table = hazard.assess(spectrum, {**fields, "exposure": [{"distance_mm": 700.0, "duration_s": 5400}]})
    assert flat.exposure.exposures[0].hazards == table.exposure.exposures[0].hazards
    manifest = tmp_path / "products.csv"
    manifest.write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside,exposure_distance_mm,exposure_duration_s\n"
        "UV-1,uv.csv,1000,5,true,700,90min\n",
        encoding="utf-8",
    )
    result = CliRunner().invoke(main, ["batch", str(manifest), "--output", str(tmp_path / "out")])
    assert result.exit_code == 0, result.output
    line = json.loads((tmp_path / "out" / "results.jsonl").read_text(encoding="utf-8").splitlines()[0])
    assert line["exposure"]["exposures"][0]["hazards"]["E_S"]["fraction"] == pytest.approx(
        flat.exposure.exposures[0].hazards["E_S"].fraction
    )
    summary = (tmp_path / "out" / "summary.csv").read_text(encoding="utf-8")
    assert "day_max_fraction" in summary.splitlines()[0] and ",E_S," in summary.splitlines()[1]


# --- bad record fields -------------------------------------------------------------------------------------


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


# --- bad input: one clear line each --------------------------------------------------------------------------


@pytest.mark.parametrize(("options", "message"), BAD)
def test_bad_pulse_and_exposure_input_is_one_line(tmp_path, options, message):
    spectrum = tmp_path / "lamp.csv"
    spectrum.write_text("wavelength_nm,value\n400,0.1\n500,0.2\n600,0.1\n", encoding="utf-8")
    base = ["assess", str(spectrum), "--distance-mm", "200", "--source-diameter-mm", "5"]
    result = CliRunner().invoke(main, [*base, *options])
    assert result.exit_code == 2, result.output
    lines = result.stderr.splitlines()
    assert len(lines) == 1 and lines[0].startswith("hazard: error: ") and message in lines[0], result.stderr
    assert "Traceback" not in result.stderr and result.stdout == ""


def test_a_radiance_field_of_view_needs_the_measurement_distance(tmp_path):
    # method §4: whether the source filled the meter's field depends on where it was measured from
    spectrum = tmp_path / "lamp.csv"
    spectrum.write_text("wavelength_nm,value\n400,0.1\n500,0.2\n600,0.1\n", encoding="utf-8")
    options = ["--quantity", "radiance", "--source-diameter-mm", "5", "--measurement-fov-mrad", "100"]
    result = CliRunner().invoke(main, ["assess", str(spectrum), *options])
    assert result.exit_code == 2 and "--measurement-fov-mrad needs --distance-mm" in result.stderr


def test_relative_spectrum_needs_one_anchor(tmp_path):
    path = write_spectrum(tmp_path / "rel.csv", [500.0, 600.0], [1.0, 1.0])
    with pytest.raises(InputError, match="exactly one anchor"):
        hazard.assess(path, {"quantity": "relative", "source_diameter_mm": 5.0})
    with pytest.raises(InputError, match="scales a relative spectrum"):
        hazard.assess(path, {"illuminance_lx": 5.0, "distance_mm": 200.0, "source_diameter_mm": 5.0})


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


def test_a_bad_option_over_a_record_names_the_option(tmp_path):
    # project brief: bad input gets one line naming where it is and the fix; a value given as an option over a
    # TOML record is the command line's, not the file's
    from hazard.inputs.record import load_record

    path = tmp_path / "lamp.toml"
    path.write_text('id = "L1"\nspectrum = "lamp.csv"\ndistance_mm = 200.0\nsource_diameter_mm = 5.0\n')
    with pytest.raises(InputError) as found:
        load_record(path, {"claimed_t_max_s_L_B": 0})
    assert str(found.value).startswith("command line: --claimed-t-max-s-L-B:")
    with pytest.raises(InputError) as found:  # an option replacing a good value of the file
        load_record(path, {"distance_mm": -1.0, "claimed_cct_k": 3000.0})
    assert str(found.value).startswith("command line: --distance-mm:")
    # the file's own bad value still names the file and its line
    path.write_text('id = "L1"\nspectrum = "lamp.csv"\ndistance_mm = -200.0\nsource_diameter_mm = 5.0\n')
    with pytest.raises(InputError) as found:
        load_record(path, {"claimed_cct_k": 3000.0})
    assert str(found.value).startswith(f"{path}:3: distance_mm:")
