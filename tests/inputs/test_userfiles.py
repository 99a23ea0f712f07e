"""Files a user names that are not regular files, or paths that cannot be opened (hazard.inputs.userfiles): every
case below once crashed (exit 1) or hung. Each now ends in one clear line (exit 2).

Contract: DEVELOPERS.md and hazard/cli.py ("bad input: one line naming the file and the fix, exit 2; exit 1 only
for defects").
"""

import os

import pytest
from conftest import (
    LAMP_FIELDS,
    assert_exit_2,
    assert_one_line,
    bounded,
    run_cli,
)

from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.manifest import read_manifest


# --- files that are not regular files, or paths that cannot be opened ------------------------------------------
def test_fifo_record_manifest_and_check_input_are_refused_without_blocking(tmp_path):
    for name in ("r.toml", "m.csv"):
        os.mkfifo(tmp_path / name)
    with bounded(20):
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "r.toml")
        assert_one_line(caught.value, "named pipe (FIFO)")
        with pytest.raises(InputError) as caught:
            read_manifest(tmp_path / "m.csv")
        assert_one_line(caught.value, "named pipe (FIFO)")
        assert_exit_2(run_cli(["check", "m.csv"], tmp_path), "named pipe")


def test_device_behind_a_symlink_is_refused(tmp_path):
    (tmp_path / "zero.csv").symlink_to("/dev/zero")
    (tmp_path / "r.toml").symlink_to("/dev/zero")
    with bounded(20):
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "zero.csv", LAMP_FIELDS)
        assert_one_line(caught.value, "a device")
        with pytest.raises(InputError) as caught:
            load_product(tmp_path / "r.toml")
        assert_one_line(caught.value, "a device")


def test_symlink_loop_nul_byte_long_name_and_folder(tmp_path):
    (tmp_path / "a.csv").symlink_to("b.csv")
    (tmp_path / "b.csv").symlink_to("a.csv")
    (tmp_path / "x.toml").mkdir()
    cases = [
        (tmp_path / "a.csv", "loop of symbolic links"),
        (tmp_path / ("n" * 300 + ".csv"), "too long"),
        (tmp_path / "x.toml", "a folder, not a record"),
    ]
    for path, fragment in cases:
        with pytest.raises(InputError) as caught:
            load_product(path, LAMP_FIELDS)
        assert_one_line(caught.value, fragment)
    record = tmp_path / "r.toml"
    record.write_text('id = "x"\nspectrum = "a\\u0000b.csv"\ndistance_mm = 500\nsource_diameter_mm = 5\n')
    with pytest.raises(InputError) as caught:
        load_product(record)
    assert_one_line(caught.value, "NUL byte")
    assert_exit_2(run_cli(["assess", "x.toml"], tmp_path), "x.toml")
