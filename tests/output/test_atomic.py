"""Atomic output (hazard.output.atomic): a full disk or a read-only folder is one line, and no output is left half
written."""

import os

from conftest import (
    assert_exit_2,
    run_cli,
    write_lamp,
)


def test_full_disk_and_read_only_folder_are_one_line(tmp_path, monkeypatch):
    import errno

    import hazard.output.atomic as atomic

    write_lamp(tmp_path)
    for code in (errno.ENOSPC, errno.EROFS):

        def refuse(*args, code=code, **kwargs):
            raise OSError(code, os.strerror(code), str(tmp_path / "out.json"))

        monkeypatch.setattr(atomic.tempfile, "mkstemp", refuse)
        result = run_cli(
            ["assess", "lamp.csv", "--distance-mm", "500", "--source-diameter-mm", "30", "--output", "out.json"],
            tmp_path,
        )
        assert_exit_2(result, "cannot write", os.strerror(code))
        assert not (tmp_path / "out.json").exists()
