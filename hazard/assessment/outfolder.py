"""Where a batch writes: one run at a time per folder, never over the user's files, one file name per product.

- :class:`OutputFolder` claims the output folder for a run: it refuses a folder that holds any of the run's
  input files, a folder already holding files that hazard did not write, and a folder holding another
  batch's outputs; it takes a lock (``.hazard-batch.lock``, which names the holder: process, host, start
  time, manifest) so that a second run into the same folder stops with a message instead of mixing outputs;
  and it removes the temporary files a killed run left behind.
- It records what a run wrote (``outputs.json``: file names and sizes) and finds the files an earlier run wrote that
  this one did not (a product gone from the manifest, a report no longer asked for): they are listed, and removed
  only when the user asks (``--clean``), never silently.
- :func:`file_stems` gives every product a file name stem of its own, even when ids differ only in
  characters a file name cannot hold (``lamp 1`` and ``lamp_1``), in case, or collide with the batch's own
  files (``summary``).
"""

from __future__ import annotations

import datetime
import fcntl
import hashlib
import json
import os
import re
import socket
from collections.abc import Iterable
from pathlib import Path
from typing import TextIO

from hazard.errors import InputError, excerpt
from hazard.output.atomic import remove_stale_temporaries, write_atomic

__all__ = ["LOCK_NAME", "OUTPUTS_NAME", "RESERVED_STEMS", "OutputFolder", "file_stems"]

LOCK_NAME = ".hazard-batch.lock"
OUTPUTS_NAME = "outputs.json"
"""The record of the files a run wrote, in the output folder."""
RESERVED_STEMS = ("summary", "results", "outputs", "plan")
_OUTPUT_SUFFIXES = (".pdf", ".json", ".jsonl", ".csv", ".xlsx")
"""Suffixes of the files a run writes: an earlier run without ``outputs.json`` is taken to have written these."""
"""Stems of the batch's own files, never given to a product."""
MAX_STEM_CHARS = 80
"""Longest stem taken from an id; longer ids are cut and get a hash suffix [characters]."""


def _hashed(product_id: str, digits: int) -> str:
    return hashlib.sha256(product_id.encode("utf-8", "surrogatepass")).hexdigest()[:digits]


def file_stems(ids: Iterable[str]) -> dict[str, str]:
    """A distinct file name stem per product id (``STEM.pdf``, ``STEM.json``).

    Letters, digits, '.', '-' and '_' are kept, the rest become '_'. Ids whose stems would collide (also
    when compared without case, as on macOS and Windows) or take a reserved name each get ``-`` and the
    first hex digits of their id's SHA-256, so the name depends only on the set of ids, not on their order.

    Examples
    --------
    >>> file_stems(["lamp 1", "lamp_1", "Desk", "summary"])
    {'lamp 1': 'lamp_1-430107f5', 'lamp_1': 'lamp_1-1711ac5b', 'Desk': 'Desk', 'summary': 'summary-761b7ad8'}
    """
    ids = list(ids)
    base = {}
    for product_id in ids:
        stem = re.sub(r"[^A-Za-z0-9._-]", "_", product_id).strip(".") or "product"
        base[product_id] = stem if len(stem) <= MAX_STEM_CHARS else f"{stem[:MAX_STEM_CHARS]}-{_hashed(product_id, 8)}"
    stems = dict(base)
    for digits in (8, 16, 64):
        taken: dict[str, list[str]] = {}
        for product_id, stem in stems.items():
            taken.setdefault(stem.casefold(), []).append(product_id)
        clashing = [
            i for group, members in taken.items() for i in members if len(members) > 1 or group in RESERVED_STEMS
        ]
        if not clashing:
            break
        for product_id in clashing:
            stems[product_id] = f"{base[product_id]}-{_hashed(product_id, digits)}"
    return stems


def _holder_text(path: Path) -> str:
    try:
        holder = json.loads(path.read_text(encoding="utf-8"))
        return (
            f"process {int(holder['pid'])} on {excerpt(holder['host'])} since {excerpt(holder['started'])}, "
            f"manifest {excerpt(holder['source'], 80)}"
        )
    except (OSError, ValueError, KeyError, TypeError):
        return "another process"


class OutputFolder:
    """The output folder of one batch run, claimed while the run lasts (a context manager).

    Parameters
    ----------
    folder : Path
        The output folder (created if needed).
    source : Path
        The manifest or folder of records, recorded in the lock file.
    inputs : iterable of Path
        Every input file of the run (manifest, records, spectra).

    Raises
    ------
    InputError
        On entering: the folder holds an input, holds files hazard did not write, holds another batch's
        outputs, cannot be written, or another run holds it.
    """

    def __init__(self, folder: Path, source: Path, inputs: Iterable[Path]):
        self.folder, self.source, self.inputs = Path(folder), Path(source), inputs
        self._handle: TextIO | None = None
        self._earlier: set[str] = set()

    def _read_earlier_outputs(self) -> set[str]:
        """Names of the files an earlier run wrote here (from its ``outputs.json``, else by their suffix)."""
        try:
            record = json.loads((self.folder / OUTPUTS_NAME).read_text(encoding="utf-8"))
            names = [str(f["name"]) for f in record["files"]] + [str(n) for n in record.get("kept_from_earlier", [])]
            return {n for n in names if "/" not in n and n not in (OUTPUTS_NAME, LOCK_NAME)}
        except FileNotFoundError:
            return {
                entry.name
                for entry in os.scandir(self.folder)
                if entry.is_file(follow_symlinks=False) and entry.name.endswith(_OUTPUT_SUFFIXES)
            }
        except (OSError, ValueError, KeyError, TypeError):
            return set()

    def leftovers(self, written: Iterable[str]) -> list[str]:
        """Files an earlier run wrote here that this run did not write and that are still there, sorted."""
        keep = set(written) | {OUTPUTS_NAME, LOCK_NAME}
        return sorted(n for n in self._earlier - keep if (self.folder / n).is_file())

    def remove(self, names: Iterable[str]) -> None:
        """Delete these files of the folder (the leftovers of an earlier run, on the user's request)."""
        for name in names:
            (self.folder / name).unlink(missing_ok=True)

    def record_outputs(self, written: Iterable[str], kept: Iterable[str] = ()) -> None:
        """Write ``outputs.json`` atomically: this run's files with their sizes [bytes], and the ones it kept.

        The earlier runs' files kept in the folder are listed so that a later run still knows them as hazard's own;
        both lists are sorted by name.
        """
        files = [{"name": n, "bytes": (self.folder / n).stat().st_size} for n in sorted(set(written))]
        record = {"source": os.path.realpath(self.source), "files": files, "kept_from_earlier": sorted(set(kept))}
        text = json.dumps(record, indent=1) + "\n"
        write_atomic(self.folder / OUTPUTS_NAME, text.encode("utf-8"))

    def _refuse_inputs(self) -> None:
        if not self.folder.exists():
            return
        here = os.path.realpath(self.folder)
        folders: dict[str, str] = {}  # each folder resolved once: a batch may name 10⁵ files in a few folders
        for path in self.inputs:
            text = os.fspath(path)
            if os.path.islink(text):
                where = os.path.dirname(os.path.realpath(text))
            else:
                parent = os.path.dirname(text) or "."
                where = folders.get(parent) or folders.setdefault(parent, os.path.realpath(parent))
            if where == here:
                raise InputError(
                    f"the output folder holds this run's input {excerpt(Path(path).name, 80)}",
                    "name a new sub-folder for the outputs, e.g. --output "
                    f"{os.path.join(str(self.folder), 'hazard-out')}",
                    str(self.folder),
                )

    def _refuse_foreign(self, lock: Path) -> None:
        """A folder without hazard's lock file that holds anything is the user's: refuse it."""
        if lock.exists():
            previous = None
            try:
                previous = json.loads(lock.read_text(encoding="utf-8")).get("source")
            except (OSError, ValueError, AttributeError):
                pass
            if previous is not None and previous != os.path.realpath(self.source):
                raise InputError(
                    f"the folder holds the outputs of another batch (manifest {excerpt(previous, 80)})",
                    "name another --output folder, or delete this one first",
                    str(self.folder),
                )
            return
        if any(True for _ in os.scandir(self.folder)):
            raise InputError(
                "the output folder already holds files that hazard did not write",
                "name a new or empty folder for the outputs",
                str(self.folder),
            )

    def __enter__(self) -> OutputFolder:
        if self.folder.exists() and not self.folder.is_dir():
            raise InputError(
                "the output path is a file, not a folder", "name a folder for the outputs", str(self.folder)
            )
        self._refuse_inputs()
        self.folder.mkdir(parents=True, exist_ok=True)
        lock = self.folder / LOCK_NAME
        self._refuse_foreign(lock)
        handle = open(lock, "a+", encoding="utf-8")
        try:
            fcntl.flock(handle.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            handle.close()
            raise InputError(
                f"another hazard run is writing into this folder ({_holder_text(lock)})",
                "wait for it to finish, or name another --output folder",
                str(self.folder),
            ) from None
        except BaseException:
            handle.close()
            raise
        self._handle = handle
        holder = {
            "pid": os.getpid(),
            "host": socket.gethostname(),
            "started": datetime.datetime.now(datetime.UTC).isoformat(timespec="seconds"),
            "source": os.path.realpath(self.source),
        }
        handle.seek(0)
        handle.truncate()
        handle.write(json.dumps(holder) + "\n")
        handle.flush()
        remove_stale_temporaries(self.folder)
        self._earlier = self._read_earlier_outputs()
        return self

    def __exit__(self, *exc) -> None:
        if self._handle is not None:
            fcntl.flock(self._handle.fileno(), fcntl.LOCK_UN)
            self._handle.close()
            self._handle = None
