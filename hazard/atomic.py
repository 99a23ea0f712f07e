"""Atomic file output: a temporary file in the target folder, then a rename over the target."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

__all__ = ["write_atomic"]


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def write_atomic(path: str | Path, data: bytes) -> None:
    """Write ``data`` to ``path`` so that a reader sees either the old file or the whole new one.

    The temporary file gets the permissions a plain ``open`` would give (0666 less the umask), is flushed
    to disk, and replaces ``path`` by ``os.replace``; on any failure it is removed and ``path`` is untouched.
    """
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    handle, temp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(handle, "wb") as out:
            out.write(data)
            out.flush()
            os.fsync(out.fileno())
        os.chmod(temp, 0o666 & ~_umask())
        os.replace(temp, path)
    except BaseException:
        Path(temp).unlink(missing_ok=True)
        raise
