"""What a spectrum file says of its units (value and wavelength), and what it says beside the numbers: never
guessed, never ignored (method §5: units are converted, never guessed). Invented test spectra."""

import json

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    normalise,
    pdf_pages,
    white_lamp,
    write_spectrum,
    write_xlsx,
)

import hazard
from hazard.cli import main
from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.statements import MAX_DISTANCE_WARNINGS

WL = np.arange(380.0, 781.0, 1.0)
VALUES = 1e-3 * np.exp(-0.5 * ((WL - 450.0) / 10.0) ** 2)
BODY = "".join(f"{w},{v}\n" for w, v in zip(WL, VALUES, strict=True))
FIELDS = {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True}


@pytest.mark.parametrize(
    "preamble",
    [
        "# Unit: W/cm2/nm\n",
        "Y Unit: W/cm2/nm\n",
        "Irradiance unit: W/cm2/nm\n",
        "Data units = W/cm2/nm\n",
        "nm,W/cm2/nm\n",  # a unit row above the column names
    ],
)
def test_a_unit_stated_before_the_table_is_used(tmp_path, preamble):
    # W/cm²/nm is 10⁴ W/m²/nm (SI prefixes); read as W/m²/nm the lamp would come out 10⁴ too low
    path = tmp_path / "lamp.csv"
    path.write_text(preamble + "wavelength_nm,value\n" + BODY)
    a = hazard.assess(path, FIELDS)
    assert a.spectrum.unit_given == "W/cm2/nm"
    assert a.spectrum.peak_value_si == pytest.approx(VALUES.max() * 1e4)


def test_statements_that_disagree_are_refused(tmp_path):
    path = tmp_path / "lamp.csv"
    path.write_text("Unit: W/cm2/nm\nwavelength_nm,value [W/m2/nm]\n" + BODY)
    with pytest.raises(
        InputError,
        match="the header cell says 'W/m2/nm' but the metadata line 'Unit' says "
        "'W/cm2/nm'; fix: correct the file so it states one unit",
    ):
        hazard.assess(path, FIELDS)


@pytest.mark.parametrize(
    "document",
    [
        [
            {"wavelength_nm": w, "value": v, "unit": "W/cm2/nm"}
            for w, v in zip(WL.tolist(), VALUES.tolist(), strict=True)
        ],
        {"wavelength_nm": WL.tolist(), "value": VALUES.tolist(), "value_unit": "W/cm2/nm"},
    ],
)
def test_a_unit_stated_in_json_is_used(tmp_path, document):
    path = tmp_path / "lamp.json"
    path.write_text(json.dumps(document))
    assert hazard.assess(path, FIELDS).spectrum.peak_value_si == pytest.approx(VALUES.max() * 1e4)


@pytest.mark.parametrize(
    ("header", "scale"),
    [("Wavelength [nm]", 1.0), ("Wavelength (Å)", 0.1), ("Wavelength [A]", 0.1), ("Wavelength [µm]", 1000.0)],
)
def test_wavelength_units_in_the_header(tmp_path, header, scale):
    # 1 Å = 0.1 nm, 1 µm = 1000 nm (SI)
    path = tmp_path / "lamp.csv"
    path.write_text(
        f"{header},value\n"
        + "".join(f"{w / scale!r},{v!r}\n" for w, v in zip(WL.tolist(), VALUES.tolist(), strict=True))
    )
    np.testing.assert_allclose(hazard.assess(path, FIELDS).spectrum.min_nm, 380.0, rtol=1e-12)


@pytest.mark.parametrize("header", ["Wavenumber [cm-1]", "Frequency [THz]", "Wavelength [furlong]"])
def test_a_wavelength_column_on_another_scale_is_refused(tmp_path, header):
    path = tmp_path / "lamp.csv"
    path.write_text(f"{header},value\n" + BODY)
    with pytest.raises(InputError) as caught:
        hazard.assess(path, FIELDS)
    assert "lamp.csv:1:" in str(caught.value) and "\n" not in str(caught.value)


def test_a_spectrum_wholly_outside_the_hazard_bands_is_refused(tmp_path):
    # every band of IEC 62471:2006 lies within 200-3000 nm (Table 4.1, 4.2, 4.3): a spectrum wholly beyond it
    # is on another scale, not a source that is safe everywhere
    path = tmp_path / "lamp.csv"
    path.write_text("wavelength,value\n" + "".join(f"{w * 10},{v}\n" for w, v in zip(WL, VALUES, strict=True)))
    with pytest.raises(InputError, match="wholly outside 200–3000 nm"):
        hazard.assess(path, FIELDS)


# --- units are never guessed --------------------------------------------------------------------------------
VISIBLE = np.arange(380.0, 781.0, 1.0)


def _lamp(wl):
    return 1e-3 * np.exp(-0.5 * ((wl - 560.0) / 80.0) ** 2)


@pytest.mark.parametrize(
    ("header", "problem"),
    [
        ("E (furlongs/fortnight)", "whose unit 'furlongs/fortnight' this tool does not read"),
        ("Counts", "not a calibrated spectral irradiance or radiance"),
        ("Irradiance (W/m2)", "a power per area without /nm"),
        ("Signal [%]", "not a calibrated spectral irradiance or radiance"),
    ],
)
def test_units_are_never_guessed(tmp_path, monkeypatch, header, problem):
    # method §5: units are converted, never guessed; a header that says something else is refused (exit 2) with
    # the file, the line and the fix, unless the record states the unit itself
    write_spectrum(tmp_path / "lamp.csv", VISIBLE, _lamp(VISIBLE), header=f"wavelength_nm,{header}")
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside"]
    refused = CliRunner().invoke(main, ["assess", "lamp.csv", *options])
    assert refused.exit_code == 2
    message = refused.stderr.strip()
    assert message.count("\n") == 0 and message.startswith("hazard: error: lamp.csv:1: the header cell says")
    assert problem in message and "state the unit in the record" in message
    stated = CliRunner().invoke(main, ["assess", "lamp.csv", *options, "--unit", "uW/cm2/nm", "--format", "json"])
    assert stated.exit_code == 0
    assert any(header in w for w in json.loads(stated.stdout)["warnings"])


def test_file_metadata_is_kept_and_a_contradicting_distance_is_named(tmp_path):
    import hazard

    path = tmp_path / "lamp.csv"
    path.write_text(
        "Instrument: a spectroradiometer\nDistance: 500 mm\nwavelength_nm,value\n"
        + "".join(f"{w},{v}\n" for w, v in zip(VISIBLE, _lamp(VISIBLE), strict=True))
    )
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True})
    assert a.spectrum.file_metadata == {"Instrument": "a spectroradiometer", "Distance": "500 mm"}
    assert any("states 500 mm" in w and "distance_mm is 200 mm" in w for w in a.warnings)


SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}


VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


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


# --- the measurement distance a file states ------------------------------------------------------------------
# Each spelling, as instruments and spreadsheets write it, and the distance it states [mm]. The conversions are
# exact: 1 cm = 10 mm and 1 m = 1000 mm (SI prefixes), 1 in = 25.4 mm (the international inch, 1959; NIST SP 811
# Appendix B).
DISTANCE_LINES = [
    ("distance_mm: 500", 500.0),  # the unit closes the name
    ("Distance [mm]: 500", 500.0),  # the unit in the name's brackets
    ("distance: 500 mm", 500.0),
    ("Distance: 500 MM", 500.0),  # a unit is read whatever its case
    ("distance: 20 in", 508.0),  # 20 × 25.4 mm
    ("Distance (cm): 50", 500.0),  # 50 × 10 mm
    ("Measurement distance = 0.5 m", 500.0),  # 0.5 × 1000 mm
    ("distance;500;mm", 500.0),  # a semicolon-separated export: name, number and unit in cells of their own
]
AS_WRITTEN = pytest.mark.parametrize("comment", ["", "# "], ids=["metadata line", "comment line"])


def _loaded(tmp_path, line, distance_mm):
    """The spectrum of a file whose second line is ``line``, loaded for a record at ``distance_mm``."""
    path = tmp_path / "lamp.csv"
    path.write_text(f"Instrument: a spectroradiometer\n{line}\nwavelength_nm,value\n" + BODY)
    return load_product(path, {**FIELDS, "distance_mm": distance_mm}).spectrum


@AS_WRITTEN
@pytest.mark.parametrize(("line", "stated_mm"), DISTANCE_LINES)
def test_a_stated_distance_that_contradicts_the_record_is_named(tmp_path, line, stated_mm, comment):
    # the record says 200 mm; the file 500 mm or 508 mm, far beyond rounding (the tool's 1 %): one warning that names
    # the file, the line and both distances
    (warning,) = _loaded(tmp_path, comment + line, 200.0).warnings
    assert warning.startswith("lamp.csv:2: the file's ")
    assert f"states {stated_mm:g} mm but the record's distance_mm is 200 mm" in warning
    assert "\n" not in warning


@AS_WRITTEN
@pytest.mark.parametrize(("line", "stated_mm"), DISTANCE_LINES)
def test_a_stated_distance_that_matches_the_record_gives_no_warning(tmp_path, line, stated_mm, comment):
    # 500 mm against 500 mm, 50 cm against 500 mm, 0.5 m against 500 mm, 20 in against 508 mm: the same distance
    assert _loaded(tmp_path, comment + line, stated_mm).warnings == ()


@AS_WRITTEN
@pytest.mark.parametrize(
    ("line", "problem"),
    [
        ("distance: 3 furlongs", "its unit 'furlongs' is not mm, cm, m or in"),
        ("Distance (furlongs): 3", "its unit 'furlongs' is not mm, cm, m or in"),
        ("Distance: 500", "it gives no unit"),  # method §5: units are never guessed
        ("Distance: 1,500 mm", "the comma may mark thousands or decimals"),  # 1.5 mm or 1500 mm
        ("Distance (cm): 500 mm", "its name gives the unit 'cm' but its value 'mm'"),
        ("Distance: -500 mm", "is not a positive, finite length"),
    ],
)
def test_a_distance_line_that_cannot_be_read_is_named_never_refused(tmp_path, line, problem, comment):
    # the record's distance is the one used, so an unreadable statement is a warning, not an input error; but it is
    # never passed over in silence
    (warning,) = _loaded(tmp_path, comment + line, 200.0).warnings
    assert warning.startswith("lamp.csv:2: the file's ") and "states a distance this tool cannot read" in warning
    assert problem in warning and "the record's distance_mm of 200 mm is used" in warning


@pytest.mark.parametrize(
    "line",
    [
        "Distance: n/a",  # no number: states no distance
        "# Level: irradiance [W/m2] at distance_mm [mm] from the tube",  # prose of the demo line-up's files
        "# reflector_gain [1]. Irradiance at distance_mm [mm] = radiance x area / distance^2.",
        "Integration time: 120 ms",
    ],
)
def test_lines_that_state_no_distance_are_left_alone(tmp_path, line):
    assert _loaded(tmp_path, line, 200.0).warnings == ()


def test_distance_lines_of_a_workbook(tmp_path):
    # metadata rows above the table: name and value in cells of their own, the unit in a third cell, or the whole
    # line in one cell; 20 in = 508 mm (international inch), 20 cm = 200 mm (SI prefix) matches the record
    rows = [
        ["Distance [mm]", 500],
        ["distance", 20, "in"],
        ["Measurement distance = 0.5 m"],
        ["distance: 3 furlongs"],
        ["Distance (cm)", 20],
        ["wavelength_nm", "value"],
        *([w, v] for w, v in zip(WL.tolist(), VALUES.tolist(), strict=True)),
    ]
    path = write_xlsx(tmp_path / "lamp.xlsx", rows)
    warnings = load_product(path, FIELDS).spectrum.warnings
    assert len(warnings) == 4
    assert (
        warnings[0].startswith("lamp.xlsx:1: ")
        and "states 500 mm but the record's distance_mm is 200 mm" in warnings[0]
    )
    assert warnings[1].startswith("lamp.xlsx:2: ") and "states 508 mm" in warnings[1]
    assert warnings[2].startswith("lamp.xlsx:3: ") and "states 500 mm" in warnings[2]
    assert warnings[3].startswith("lamp.xlsx:4: ") and "its unit 'furlongs' is not mm, cm, m or in" in warnings[3]


@pytest.mark.parametrize(
    ("statement", "stated_mm"),
    [
        ({"distance_mm": 500}, 500.0),
        ({"Distance": "20 in"}, 508.0),  # 20 × 25.4 mm (international inch)
        ({"measurement_distance_m": 0.5}, 500.0),  # 0.5 × 1000 mm
    ],
)
def test_distance_keys_of_a_json_spectrum(tmp_path, statement, stated_mm):
    path = tmp_path / "lamp.json"
    path.write_text(json.dumps({**statement, "wavelength_nm": WL.tolist(), "value": VALUES.tolist()}))
    (warning,) = load_product(path, FIELDS).spectrum.warnings
    assert warning.startswith("lamp.json: the file's metadata ")  # JSON keys have no line of their own
    assert f"states {stated_mm:g} mm but the record's distance_mm is 200 mm" in warning
    assert load_product(path, {**FIELDS, "distance_mm": stated_mm}).spectrum.warnings == ()


def test_many_distance_lines_give_a_bounded_number_of_warnings(tmp_path):
    # a file may hold any number of lines, under the same name too: each is read, the first few are named, the others
    # counted in one warning
    lines = "".join(f"distance: {k} m\n" for k in range(1, 10))  # 1000 mm to 9000 mm, none the record's 200 mm
    path = tmp_path / "lamp.csv"
    path.write_text(lines + "wavelength_nm,value\n" + BODY)
    warnings = load_product(path, FIELDS).spectrum.warnings
    assert len(warnings) == MAX_DISTANCE_WARNINGS + 1
    assert warnings[0].startswith("lamp.csv:1: ") and "states 1000 mm" in warnings[0]
    assert warnings[-1] == (
        f"lamp.csv: {9 - MAX_DISTANCE_WARNINGS} more distance statement(s) of the file differ from the record's "
        "distance_mm or cannot be read; check the file's metadata"
    )


def test_a_contradicting_distance_shows_in_every_output(tmp_path, monkeypatch):
    # the warning travels with the result: the text on screen, the JSON's warnings and the PDF report
    (tmp_path / "lamp.csv").write_text("# Distance: 20 in\nwavelength_nm,value\n" + BODY)
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside"]
    text = CliRunner().invoke(main, ["assess", "lamp.csv", *options])
    assert text.exit_code == 0, text.output
    expected = (
        "lamp.csv:1: the file's comment 'Distance: 20 in' states 508 mm but the record's distance_mm is 200 mm; "
        "the record's value is used, check which is right"
    )  # 20 in = 508 mm (international inch)
    assert f"Warnings:\n  - {expected}\n" in text.stdout
    saved = CliRunner().invoke(main, ["assess", "lamp.csv", *options, "--format", "json", "--pdf", "lamp.pdf"])
    assert saved.exit_code == 0, saved.output
    assert expected in json.loads(saved.stdout)["warnings"]
    assert any(normalise(expected) in page for page in pdf_pages((tmp_path / "lamp.pdf").read_bytes()))
