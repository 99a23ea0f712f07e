"""Reading the files a user names: regular files only, a bounded number of bytes, every failure one input error.

A FIFO, a device (``/dev/zero``), a socket or a folder is refused before it is opened (and the file opened,
without blocking, is checked again with ``fstat``, so a path swapped meanwhile cannot stall the run); a file
larger than the limit is refused from its size, and reading stops one byte past the limit should it grow
meanwhile. Missing files, a NUL byte or an over-long name in the path, symbolic-link loops and permission
problems each become one :class:`~hazard.errors.InputError` naming the file and the fix.
"""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path

from hazard.errors import InputError

__all__ = ["DEFAULT_MAX_BYTES", "read_user_file", "regular_file_size"]

DEFAULT_MAX_BYTES = 50 * 1024 * 1024
"""Largest input file read by default [bytes] (``HAZARD_MAX_FILE_MB`` changes it for spectra)."""

_KINDS = (
    (stat.S_ISDIR, "a folder"),
    (stat.S_ISFIFO, "a named pipe (FIFO)"),
    (stat.S_ISCHR, "a device"),
    (stat.S_ISBLK, "a device"),
    (stat.S_ISSOCK, "a socket"),
)


def _open_error(exc: OSError, what: str, display: str, fix_missing: str) -> InputError:
    if exc.errno in (errno.ENOENT, errno.ENOTDIR):
        return InputError(f"{what} not found", fix_missing, display)
    if exc.errno == errno.ENAMETOOLONG:
        return InputError(f"the {what}'s path is too long for the file system", "give a shorter file name", display)
    if exc.errno == errno.ELOOP:
        return InputError(f"the {what}'s path is a loop of symbolic links", "point the link at a real file", display)
    if exc.errno in (errno.EACCES, errno.EPERM):
        return InputError(f"cannot read the {what}: permission denied", "make the file readable", display)
    return InputError(
        f"cannot open the {what} ({exc.strerror or type(exc).__name__})", "check the file and its folder", display
    )


def _open_regular(path: str | Path, what: str, display: str, fix_missing: str) -> tuple[int, os.stat_result]:
    """A read-only descriptor of ``path`` and its status, refusing everything but a regular file."""
    text = os.fspath(path)
    if "\x00" in text:
        raise InputError(
            f"the {what}'s path contains a NUL byte", "remove the control character from the path", display
        )
    try:
        _refuse_irregular(os.stat(text), what, display)  # before opening: opening a device can act on it
        descriptor = os.open(
            text, os.O_RDONLY | os.O_NONBLOCK | getattr(os, "O_CLOEXEC", 0) | getattr(os, "O_NOCTTY", 0)
        )
    except OSError as exc:
        raise _open_error(exc, what, display, fix_missing) from None
    try:
        status = os.fstat(descriptor)
        _refuse_irregular(status, what, display)  # what was opened, should the path have changed meanwhile
    except OSError as exc:
        os.close(descriptor)
        raise _open_error(exc, what, display, fix_missing) from None
    except InputError:
        os.close(descriptor)
        raise
    return descriptor, status


def _refuse_irregular(status: os.stat_result, what: str, display: str) -> None:
    if not stat.S_ISREG(status.st_mode):
        kind = next((name for test, name in _KINDS if test(status.st_mode)), "not a regular file")
        raise InputError(f"{kind}, not a {what}", "name a regular file", display)


def _too_large(size_bytes: int, max_bytes: int, what: str, display: str, fix: str) -> InputError:
    return InputError(
        f"{what} is {size_bytes / 2**20:.2f} MB, above the {max_bytes / 2**20:.2f} MB limit", fix, display
    )


def regular_file_size(path: str | Path, *, what: str, display: str, fix_missing: str) -> int:
    """Size of a regular file [bytes], with the same refusals as :func:`read_user_file`, reading nothing."""
    descriptor, status = _open_regular(path, what, display, fix_missing)
    os.close(descriptor)
    return status.st_size


def read_user_file(
    path: str | Path,
    *,
    what: str,
    display: str | None = None,
    fix_missing: str = "check the path",
    max_bytes: int = DEFAULT_MAX_BYTES,
    fix_large: str = "give a smaller file",
) -> bytes:
    """All bytes of a regular file of at most ``max_bytes``.

    Parameters
    ----------
    path : str or Path
        File to read.
    what : str
        What the file is, for messages (``"spectrum file"``, ``"record"``, ``"manifest"``).
    display : str, optional
        How to name the file in messages; ``path`` by default.
    fix_missing : str
        The fix named when the file does not exist.
    max_bytes : int
        Largest size accepted [bytes].
    fix_large : str
        The fix named when the file is too large.

    Raises
    ------
    InputError
        Missing, not a regular file, unreadable, or too large.
    """
    display = os.fspath(path) if display is None else display
    descriptor, status = _open_regular(path, what, display, fix_missing)
    with os.fdopen(descriptor, "rb") as handle:
        if status.st_size > max_bytes:
            raise _too_large(status.st_size, max_bytes, what, display, fix_large)
        try:
            data = handle.read(max_bytes + 1)
        except OSError as exc:
            raise _open_error(exc, what, display, fix_missing) from None
    if len(data) > max_bytes:
        raise _too_large(len(data), max_bytes, what, display, fix_large)
    return data
