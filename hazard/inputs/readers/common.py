"""What every reader shares: the raw table it returns, resource limits, reading and decoding the file."""

from __future__ import annotations

import hashlib
import math
import os
from dataclasses import dataclass, field

import numpy as np

from hazard.errors import InputError, excerpt
from hazard.inputs.userfiles import DEFAULT_MAX_BYTES, read_user_file

__all__ = ["MAX_FILE_MB_VARIABLE", "Limits", "RawSpectrum", "current_limits", "decode_text", "read_bytes", "to_nm"]

MAX_FILE_MB_VARIABLE = "HAZARD_MAX_FILE_MB"
"""Environment variable that sets the size limit of a spectrum file [MB]."""


@dataclass(frozen=True)
class Limits:
    """Resource limits for one spectrum file, applied while it is read so that any file costs bounded work.

    Attributes
    ----------
    max_bytes : int
        Files larger than this are refused before they are read [bytes].
    max_rows : int
        Tables with more data rows than this are refused [1].
    max_columns : int
        Tables with more columns than this are refused [1].
    max_cell_chars : int
        A cell longer than this is refused: no number or unit needs it [characters].
    max_workbook_rows : int
        Rows read from an .xlsx sheet at most: reading a workbook costs about 30 µs a row, 30 times more
        than text [1].
    max_workbook_columns : int
        Columns read from an .xlsx sheet at most [1].
    max_workbook_unpacked_bytes : int
        Largest size of an .xlsx file's parts uncompressed (a sheet of 10⁵ rows takes about 10 MB) [bytes].
    """

    max_bytes: int = DEFAULT_MAX_BYTES
    max_rows: int = 1_000_000
    max_columns: int = 10_000
    max_cell_chars: int = 1_000
    max_workbook_rows: int = 100_000
    max_workbook_columns: int = 64
    max_workbook_unpacked_bytes: int = 24 * 1024 * 1024


def current_limits() -> Limits:
    """The limits in force: defaults, with ``HAZARD_MAX_FILE_MB`` from the environment as the size limit [MB].

    Raises
    ------
    InputError
        When ``HAZARD_MAX_FILE_MB`` is not a positive number.
    """
    text = os.environ.get(MAX_FILE_MB_VARIABLE)
    if text is None:
        return Limits()
    try:
        megabytes = float(text)
    except ValueError:
        megabytes = math.nan
    if not (math.isfinite(megabytes) and 0 < megabytes <= 2**20):
        raise InputError(
            f"{MAX_FILE_MB_VARIABLE}={excerpt(text)} is not a size in MB",
            f"set it to a number of MB from above 0 to {2**20}, e.g. 50, or unset it",
            "environment",
        )
    return Limits(max_bytes=int(megabytes * 1024 * 1024))


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
        The value column's header cell, which may state the values' unit (other statements of the file, such
        as a ``unit`` key or a ``Unit:`` line, are in the reader's metadata).
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


def read_bytes(path: str, display_path: str, limits: Limits) -> tuple[bytes, str]:
    """The bytes of a spectrum file and their SHA-256: a regular, non-empty file within the size limit."""
    raw = read_user_file(
        path,
        what="spectrum file",
        display=display_path,
        max_bytes=limits.max_bytes,
        fix_missing="check the 'spectrum' path (relative to the record's folder)",
        fix_large=f"trim it to the spectrum, or raise {MAX_FILE_MB_VARIABLE}",
    )
    if not raw:
        raise InputError(
            "no data rows: the file is empty",
            "export the spectrum again: wavelength in nm, then the value",
            display_path,
        )
    return raw, hashlib.sha256(raw).hexdigest()


def decode_text(raw: bytes, display_path: str) -> str:
    """UTF-8 (with or without BOM), else Latin-1; binary content is refused."""
    if b"\x00" in raw[:4096]:
        raise InputError(
            "this is a binary file, not a text spectrum",
            "export the spectrum as CSV/TSV text, .xlsx or JSON",
            display_path,
        )
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        return raw.decode("latin-1")


def to_nm(wavelength: np.ndarray, scale: float) -> np.ndarray:
    """Wavelengths times the header's unit factor [nm].

    One beyond the float range becomes infinity, which validation refuses with its line (no warning on the way).
    """
    with np.errstate(over="ignore"):
        return wavelength * scale
