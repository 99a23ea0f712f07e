"""Header cells (hazard.inputs.readers.headers): units read in linear time, as before."""

import pytest
from conftest import (
    assert_one_line,
    bounded,
)

from hazard.errors import InputError
from hazard.inputs.readers import read_spectrum
from hazard.inputs.readers.headers import header_statement, wavelength_scale


def test_linear_time_header_and_number_patterns(tmp_path):
    # a 7 KB header cell once took 68 s (the bracketed-unit pattern) and a 21 KB cell 9.5 s (the number
    # pattern); both are now linear, and over-long cells are refused
    with bounded(10):
        assert header_statement("(" + " " * 7000 + "x(").unit is None
        with pytest.raises(InputError):  # not a unit this tool reads: refused, in bounded time
            wavelength_scale("(" + " " * 7000 + "µm(")
    path = tmp_path / "long.csv"
    path.write_text("wavelength_nm,value\n400,0.1\n410," + "1" * 21_000 + "x\n420,0.1\n")
    with bounded(10), pytest.raises(InputError) as caught:
        read_spectrum(str(path), display_path="long.csv")
    assert_one_line(caught.value, "long.csv:3", "cell of 21,001 characters")


@pytest.mark.parametrize(
    ("cell", "unit"),
    [
        ("Irradiance [mW/m²/nm]", "mW/m²/nm"),
        ("E (µW/(cm²·nm))", "µW/(cm²·nm)"),
        ("E (a) (W/m2/nm)", "W/m2/nm"),
        ("E [W/m2/nm] ", "W/m2/nm"),
        ("counts", None),
        ("Wavelength [µm]", None),
    ],
)
def test_header_units_read_as_before(cell, unit):
    # the linear-time reading keeps the behaviour on ordinary header cells (hazard/readers/headers.py)
    assert header_statement(cell).unit == unit
