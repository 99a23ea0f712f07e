"""What every reader shares: the raw table it returns, resource limits, text decoding."""

from __future__ import annotations

import hashlib
import os
from dataclasses import dataclass, field

import numpy as np

from hazard.errors import InputError

__all__ = ["RawSpectrum", "Limits", "current_limits", "check_size", "read_bytes", "decode_text"]


@dataclass(frozen=True)
class Limits:
    """Resource limits for one spectrum file.

    Attributes
    ----------
    max_bytes : int
        Files larger than this are refused before they are read [bytes].
    max_rows : int
        Tables with more data rows than this are refused [1].
    """

    max_bytes: int = 50 * 1024 * 1024
    max_rows: int = 1_000_000


def current_limits() -> Limits:
    """The limits in force: defaults, with ``HAZARD_MAX_FILE_MB`` from the environment as the size limit [MB]."""
    return Limits(max_bytes=int(float(os.environ.get("HAZARD_MAX_FILE_MB", "50")) * 1024 * 1024))


@dataclass(frozen=True)
class RawSpectrum:
    """Numbers as read, before validation and unit conversion.

    Attributes
    ----------
    wavelength_nm : numpy.ndarray
        Wavelengths as read [nm] (a µm column named so in its header is already converted).
    value : numpy.ndarray
        Values in the file's unit.
    lines : numpy.ndarray
        1-based line (or row) number of each sample in the file.
    path : str
        The file as the user named it.
    header_cell : str or None
        What the file says of the values: the value column's header cell, or the unit a JSON file states.
    header_line : int or None
        1-based line (or row) of that header cell.
    warnings : tuple of str
        What the reader tolerated.
    """

    wavelength_nm: np.ndarray
    value: np.ndarray
    lines: np.ndarray
    path: str
    header_cell: str | None = None
    header_line: int | None = None
    warnings: tuple[str, ...] = field(default=())


def check_size(path: str, display_path: str, limits: Limits) -> int:
    """Size of ``path`` in bytes, refusing a missing, non-regular or oversized file without reading it."""
    try:
        size = os.stat(path).st_size
    except FileNotFoundError:
        raise InputError("spectrum file not found", "check the 'spectrum' path (relative to the record's "
                         "folder)", display_path) from None
    if os.path.isdir(path):
        raise InputError("spectrum path is a folder", "name a spectrum file", display_path)
    if size > limits.max_bytes:
        raise InputError(f"file is {size / 2**20:.2f} MB, above the {limits.max_bytes / 2**20:.2f} MB limit",
                         "trim it to the spectrum, or raise HAZARD_MAX_FILE_MB", display_path)
    if size == 0:
        raise InputError("no data rows: the file is empty", "export the spectrum again: wavelength in nm, then "
                         "the value", display_path)
    return size


def read_bytes(path: str, display_path: str, limits: Limits) -> tuple[bytes, str]:
    """The file's bytes and their SHA-256, after :func:`check_size`."""
    check_size(path, display_path, limits)
    with open(path, "rb") as handle:
        raw = handle.read()
    return raw, hashlib.sha256(raw).hexdigest()


def decode_text(raw: bytes, display_path: str) -> str:
    """UTF-8 (with or without BOM), else Latin-1; binary content is refused."""
    if b"\x00" in raw[:4096]:
        raise InputError("this is a binary file, not a text spectrum",
                         "export the spectrum as CSV/TSV text, .xlsx or JSON", display_path)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        return raw.decode("latin-1")
