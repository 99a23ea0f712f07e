"""Spectrometer export dialects (hazard.inputs.readers.read_spectrum): one spectrum in ten dialects reads the same."""

import numpy as np
import pytest
from conftest import DATA

from hazard.errors import InputError
from hazard.inputs.loading import product_from_record
from hazard.inputs.record import ProductRecord

REFERENCE = np.loadtxt(DATA / "reference.txt")  # invented test spectrum, W/m2/nm (tests/data, our own)


SIZE = {"distance_mm": 500.0, "source_diameter_mm": 20.0}


def _load(name, **fields):
    record = ProductRecord(id="x", spectrum=name, **{**SIZE, **fields})
    return product_from_record(record, DATA, name)


@pytest.mark.parametrize(
    ("name", "fields"),
    [
        ("comma.csv", {}),
        ("semicolon_decimal_comma.csv", {}),  # mW/m²/nm from the header, UTF-8 BOM, CRLF
        ("tab_latin1.tsv", {}),  # µW/(cm²·nm) from a Latin-1 header
        ("whitespace.txt", {}),
        ("several_columns.csv", {"column": "irradiance"}),  # chosen by name without its unit
        ("several_columns.csv", {"column": 3}),  # chosen by number among the value columns
        ("workbook.xlsx", {}),
        ("arrays.json", {}),
        ("pairs.json", {}),
        ("micrometre_header_descending.csv", {}),  # µm by header, descending rows
    ],
)
def test_every_dialect_reads_to_the_same_spectrum(name, fields):
    # project corpus (tests/data): each file holds the spectrum of reference.txt in another dialect
    product = _load(name, **fields)
    np.testing.assert_allclose(product.spectrum.wavelength_nm, REFERENCE[:, 0], rtol=1e-9)
    np.testing.assert_allclose(product.spectrum.value, REFERENCE[:, 1], rtol=2e-6)  # printed to 6 digits


def test_metadata_lines_are_kept():
    product = _load("semicolon_decimal_comma.csv")
    assert product.metadata["metadata"]["Integration time"] == "120 ms"
    assert product.metadata["decimal_comma"] is True and product.metadata["unit_used"] == "mW/m²/nm"


def test_header_unit_contradicting_the_record_is_refused():
    # the header states mW/m²/nm; a record claiming W/m2/nm would be off by 10^3 (method §5 unit slips)
    with pytest.raises(InputError, match=r"the record says unit 'W/m2/nm' but the file's header cell says"):
        _load("semicolon_decimal_comma.csv", unit="W/m2/nm")
    assert _load("semicolon_decimal_comma.csv", unit="mW/m2/nm").spectrum.value[0] == pytest.approx(
        REFERENCE[0, 1], rel=2e-6
    )


@pytest.mark.parametrize(
    ("name", "where"),
    [("semicolon_decimal_comma.csv", "semicolon_decimal_comma.csv:4: "), ("arrays.json", "arrays.json: ")],
)
def test_the_measurement_distance_the_corpus_states_is_checked(name, where):
    # both files state 500 mm (one in cells of a semicolon export, one as a JSON key), the distance of SIZE
    assert _load(name).spectrum.warnings == ()
    (warning,) = _load(name, distance_mm=200.0).spectrum.warnings
    assert warning.startswith(where) and "states 500 mm but the record's distance_mm is 200 mm" in warning
