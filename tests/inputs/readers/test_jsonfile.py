"""Spectra in JSON (hazard.inputs.readers.jsonfile): decoder limits, the value column and stated units."""

import json

import pytest
from conftest import (
    LAMP_FIELDS,
    LAMP_NM,
    assert_one_line,
    white_lamp,
)

from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.readers import read_spectrum


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
