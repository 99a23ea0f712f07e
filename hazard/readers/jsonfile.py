"""Spectra as JSON: ``{"wavelength_nm": [...], "value": [...], "unit": "..."}``, ``[[w, v], ...]`` or
``[{"wavelength_nm": w, "value": v}, ...]``."""

from __future__ import annotations

import json

import numpy as np

from hazard.errors import InputError
from hazard.readers.common import Limits, RawSpectrum, current_limits, decode_text, read_bytes

__all__ = ["read_json"]

_FIX = ('give {"wavelength_nm": [...], "value": [...]} or a list of [wavelength_nm, value] pairs')


def _columns(data, column: str | int | None, path: str) -> tuple[list, list, str | None, dict]:
    if isinstance(data, dict):
        wavelength = data.get("wavelength_nm", data.get("wavelength"))
        key = column if isinstance(column, str) else "value"
        value = data.get(key)
        meta = {k: v for k, v in data.items() if not isinstance(v, list)}
        if not isinstance(wavelength, list) or not isinstance(value, list):
            raise InputError(f"no 'wavelength_nm' and {key!r} arrays", _FIX, path)
        if len(wavelength) != len(value):
            raise InputError(f"{len(wavelength)} wavelengths but {len(value)} values", "give arrays of equal "
                             "length", path)
        unit = data.get("unit") if isinstance(data.get("unit"), str) else None
        return wavelength, value, unit, meta
    if isinstance(data, list) and data and isinstance(data[0], dict):
        key = column if isinstance(column, str) else "value"
        try:
            return [p["wavelength_nm"] for p in data], [p[key] for p in data], None, {}
        except (KeyError, TypeError):
            raise InputError(f"an entry lacks 'wavelength_nm' or {key!r}", _FIX, path) from None
    if isinstance(data, list) and all(isinstance(p, list) and len(p) >= 2 for p in data):
        index = column if isinstance(column, int) else 1
        return [p[0] for p in data], [p[index] if index < len(p) else None for p in data], None, {}
    raise InputError("not a spectrum", _FIX, path)


def read_json(path: str, *, display_path: str, column: str | int | None = None,
              limits: Limits | None = None) -> tuple[RawSpectrum, dict]:
    """Read a JSON spectrum; see :func:`hazard.readers.delimited.read_delimited`. Entry numbers stand in
    for line numbers in messages."""
    limits = limits or current_limits()
    raw, digest = read_bytes(path, display_path, limits)
    text = decode_text(raw, display_path)
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(f"not valid JSON ({exc.msg})", _FIX, display_path, exc.lineno) from None
    wavelength, value, unit, meta = _columns(data, column, display_path)
    if len(wavelength) > limits.max_rows:
        raise InputError(f"{len(wavelength):,} entries, above the {limits.max_rows:,} limit", "resample the "
                         "spectrum", display_path)
    numbers = np.arange(1, len(wavelength) + 1)
    for i, (w, v) in enumerate(zip(wavelength, value)):
        for item in (w, v):
            if isinstance(item, bool) or not isinstance(item, (int, float)):
                raise InputError(f"entry {i + 1}: {item!r} is not a number", "use numbers for wavelength and "
                                 "value", display_path)
    spectrum = RawSpectrum(np.array(wavelength, dtype=float), np.array(value, dtype=float), numbers, display_path,
                           header_cell=unit, header_line=None)
    return spectrum, {"header": None, "value_column": column or "value", "comments": [], "metadata": meta,
                      "sha256": digest}
