"""What every reader shares (hazard.inputs.readers.common): the size limit set by HAZARD_MAX_FILE_MB."""

import pytest
from conftest import (
    LAMP_FIELDS,
    assert_one_line,
    write_lamp,
)

from hazard.errors import InputError
from hazard.inputs.loading import load_product


def test_invalid_size_limit_variable(tmp_path, monkeypatch):
    path = write_lamp(tmp_path)
    for value in ("abc", "-1", "nan", "inf", "0"):
        monkeypatch.setenv("HAZARD_MAX_FILE_MB", value)
        with pytest.raises(InputError) as caught:
            load_product(path, LAMP_FIELDS)
        assert_one_line(caught.value, "HAZARD_MAX_FILE_MB")
