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


def test_a_disk_that_fills_while_the_workbook_is_written_is_one_line(tmp_path, monkeypatch):
    # A full disk found half-way through summary.xlsx: openpyxl then fails to close its XML (a ValueError on the
    # closed file) and that hid the disk's own error behind an internal error (exit 1). The user sees the disk's
    # error on one line (exit 2), and no workbook, whole or half, is left.
    import contextlib
    import errno
    import io

    import hazard.output.workbook as workbook

    class FillingFile(io.BytesIO):
        def write(self, data):
            if self.tell() + len(data) > 2000:
                raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))
            return super().write(data)

    @contextlib.contextmanager
    def filling(path):
        yield FillingFile()

    monkeypatch.setattr(workbook, "atomic_file", filling)
    write_lamp(tmp_path)
    (tmp_path / "m.csv").write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside\nA,lamp.csv,500,30,true\n"
    )
    result = run_cli(["batch", "m.csv", "--output", "out"], tmp_path)
    assert_exit_2(result, os.strerror(errno.ENOSPC))
    assert not (tmp_path / "out" / "summary.xlsx").exists()


def test_a_disk_that_fills_while_results_are_written_leaves_nothing_on_stderr_at_exit(tmp_path, monkeypatch):
    # The disk fills while results.jsonl is written: the user gets the disk's error on one line, and the summary
    # workbook that will now never be saved is closed at once: collected later, openpyxl's unsaved sheets wrote
    # "Exception ignored ... I/O operation on closed file" tracebacks to stderr at exit (found on a full tmpfs).
    import contextlib
    import errno
    import gc
    import sys

    import hazard.assessment.batch as batch

    class FillingFile:
        def __init__(self, handle):
            self.handle = handle

        def write(self, data):
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

        def __getattr__(self, name):
            return getattr(self.handle, name)

    real = batch.atomic_file

    @contextlib.contextmanager
    def filling(path):
        with real(path) as handle:
            yield FillingFile(handle) if path.name == "results.jsonl" else handle

    unraisable = []
    monkeypatch.setattr(sys, "unraisablehook", unraisable.append)
    monkeypatch.setattr(batch, "atomic_file", filling)
    write_lamp(tmp_path)
    (tmp_path / "m.csv").write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside\nA,lamp.csv,500,30,true\n"
    )
    result = run_cli(["batch", "m.csv", "--output", "out"], tmp_path)
    gc.collect()
    assert_exit_2(result, os.strerror(errno.ENOSPC))
    assert unraisable == []
