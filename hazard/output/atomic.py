"""Atomic file output: a temporary file in the target folder, then a rename over the target.

Temporary files are named ``.NAME.PID-XXXXXXXX.hazard.tmp`` (PID: the writing process), so that a later run can
tell the leftovers of a killed run from the files of a run still writing, and remove only the former
(:func:`remove_stale_temporaries`).
"""

from __future__ import annotations

import os
import re
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import BinaryIO

__all__ = ["atomic_file", "remove_stale_temporaries", "write_atomic"]

_SUFFIX = ".hazard.tmp"
_TEMPORARY = re.compile(r"^\..*\.(\d+)-[a-z0-9_]+" + re.escape(_SUFFIX) + "$")


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


@contextmanager
def atomic_file(path: str | Path) -> Iterator[BinaryIO]:
    """A binary file to write ``path`` through.

    On a normal exit it is flushed to disk and replaces ``path`` (by ``os.replace``); on an exception it is removed and
    ``path`` is untouched.

    The file gets the permissions a plain ``open`` would give (0666 less the umask).

    Examples
    --------
    >>> import tempfile, pathlib
    >>> target = pathlib.Path(tempfile.mkdtemp()) / "out.txt"
    >>> with atomic_file(target) as out:
    ...     _ = out.write(b"done")
    >>> target.read_bytes()
    b'done'
    """
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, temp = tempfile.mkstemp(prefix=f".{path.name}.{os.getpid()}-", suffix=_SUFFIX, dir=path.parent)
    try:
        with os.fdopen(handle, "wb") as out:
            yield out
            out.flush()
            os.fsync(out.fileno())
        os.chmod(temp, 0o666 & ~_umask())
        os.replace(temp, path)
    except BaseException:
        Path(temp).unlink(missing_ok=True)
        raise


def write_atomic(path: str | Path, data: bytes) -> None:
    """Write ``data`` to ``path`` so that a reader sees either the old file or the whole new one."""
    with atomic_file(path) as out:
        out.write(data)


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except (ProcessLookupError, OverflowError):  # no such process (or no valid process id)
        return False
    except PermissionError:  # another user's process: leave its files alone
        return True
    return True


def remove_stale_temporaries(folder: str | Path, name: str | None = None) -> int:
    """Remove the temporary files a killed run left in ``folder`` (only for target ``name`` when given).

    Files of processes still running are kept.

    Returns
    -------
    int
        How many were removed.
    """
    removed = 0
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return 0
    for entry in entries:
        match = _TEMPORARY.match(entry.name)
        if match is None or (name is not None and not entry.name.startswith(f".{name}.")):
            continue
        if _alive(int(match.group(1))):
            continue
        try:
            os.unlink(entry.path)
            removed += 1
        except OSError:
            continue
    return removed
