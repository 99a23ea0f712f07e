"""What a spectrum file says of its units (value and wavelength), and what it says beside the numbers: never
guessed, never ignored (method §5: units are converted, never guessed). Invented test spectra."""

import json

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    white_lamp,
    write_spectrum,
)

import hazard
from hazard.cli import main
from hazard.errors import InputError

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
