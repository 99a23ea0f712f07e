"""One reader per file format; each returns ``(RawSpectrum, metadata)``.

:func:`read_spectrum` picks the reader from the file name: ``.xlsx`` workbooks, ``.json`` arrays, and
delimited text for everything else (``.csv``, ``.tsv``, ``.txt``, instrument exports). Validation and
unit conversion happen afterwards, once for every format (:mod:`hazard.inputs.spectrum`).
"""

from __future__ import annotations

from pathlib import Path

from hazard.inputs.readers.common import Limits, RawSpectrum, current_limits
from hazard.inputs.readers.delimited import read_delimited
from hazard.inputs.readers.jsonfile import read_json
from hazard.inputs.readers.xlsx import read_xlsx

__all__ = ["Limits", "RawSpectrum", "current_limits", "read_spectrum"]

_BY_SUFFIX = {".xlsx": read_xlsx, ".json": read_json}


def read_spectrum(
    path: str, *, display_path: str, column: str | int | None = None, limits: Limits | None = None
) -> tuple[RawSpectrum, dict]:
    """Read one spectrum file with the reader for its format.

    Parameters
    ----------
    path : str
        File to open.
    display_path : str
        How to name the file in messages and provenance.
    column : str or int, optional
        Which value column to use when the file has several.
    limits : Limits, optional
        Size and row limits; :func:`current_limits` when not given.

    Returns
    -------
    tuple of (RawSpectrum, dict)
        The numbers as read, and metadata (including ``sha256`` of the file's bytes, which every reader
        records from the bytes it read, and ``format``).
    """
    reader = _BY_SUFFIX.get(Path(path).suffix.lower(), read_delimited)
    spectrum, metadata = reader(path, display_path=display_path, column=column, limits=limits)
    metadata["format"] = reader.__name__.removeprefix("read_")
    return spectrum, metadata
