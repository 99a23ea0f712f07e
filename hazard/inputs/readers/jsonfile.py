"""Spectra as JSON, in one of three shapes.

``{"wavelength_nm": [...], "value": [...], "unit": "..."}``, ``[[w, v], ...]`` or ``[{"wavelength_nm": w, "value": v},
...]``.

The size limit applies before decoding; integers are read as floats (so a 5000-digit integer is an
overflow the validation names, not a decoder failure); nesting too deep for the decoder is refused.
"""

from __future__ import annotations

import json

import numpy as np

from hazard.errors import InputError, excerpt
from hazard.inputs.readers.common import Limits, RawSpectrum, current_limits, decode_text, read_bytes

__all__ = ["read_json"]

_FIX = 'give {"wavelength_nm": [...], "value": [...]} or a list of [wavelength_nm, value] pairs'


def _describe(item) -> str:
    """What a JSON item is, for a message (without rendering it: it may be nested deep)."""
    if isinstance(item, str):
        return f"text {excerpt(item)}"
    if isinstance(item, bool) or item is None:
        return json.dumps(item)
    kinds: dict[type, str] = {list: "an array", dict: "an object"}
    return kinds.get(type(item), type(item).__name__)


def _value_key(column: str | int | None, path: str) -> str:
    """The key of the value array or field: ``column`` by name, ``"value"`` by default."""
    if column is None:
        return "value"
    if isinstance(column, str) and not column.isdecimal():
        return column
    raise InputError(
        f"column {excerpt(column)} is a number, but this JSON file names its arrays",
        'give column as the name of the value array, e.g. column = "value"',
        path,
    )


def _pair_index(column: str | int | None, path: str) -> int:
    """Index of the value in each ``[wavelength, value, ...]`` entry: ``column`` counts the values from 1."""
    if column is None:
        return 1
    if isinstance(column, int) or (
        isinstance(column, str) and column.isascii() and column.isdecimal() and len(column) < 10
    ):
        number = int(column)
        if number < 1:
            raise InputError(
                f"column {number}: value columns count from 1 (the first value after the wavelength)",
                "give column = 1 or higher",
                path,
            )
        return number
    raise InputError(
        f"column {excerpt(column)} names a column, but this JSON file holds unnamed [wavelength, value] pairs",
        "give column as a number from 1",
        path,
    )


def _columns(data, column: str | int | None, path: str) -> tuple[list, list, dict]:
    if isinstance(data, dict):
        wavelength = data.get("wavelength_nm", data.get("wavelength"))
        key = _value_key(column, path)
        value = data.get(key)
        meta = {k: v for k, v in data.items() if not isinstance(v, (list, dict))}
        if not isinstance(wavelength, list) or not isinstance(value, list):
            raise InputError(f"no 'wavelength_nm' and {excerpt(key)} arrays", _FIX, path)
        if len(wavelength) != len(value):
            raise InputError(
                f"{len(wavelength)} wavelengths but {len(value)} values", "give arrays of equal length", path
            )
        return wavelength, value, meta
    if isinstance(data, list) and data and isinstance(data[0], dict):
        key = _value_key(column, path)
        try:
            pairs = [p["wavelength_nm"] for p in data], [p[key] for p in data]
        except (KeyError, TypeError):
            raise InputError(f"an entry lacks 'wavelength_nm' or {excerpt(key)}", _FIX, path) from None
        return (*pairs, _entry_statements(data, key, path))
    if isinstance(data, list) and all(isinstance(p, list) and len(p) >= 2 for p in data):
        index = _pair_index(column, path)
        widths = {len(p) for p in data}
        if data and index >= min(widths):
            raise InputError(
                f"column {index} does not exist: an entry holds {min(widths) - 1} value(s)",
                "give a column number that every entry has",
                path,
            )
        return [p[0] for p in data], [p[index] for p in data], {}
    raise InputError("not a spectrum", _FIX, path)


def _entry_statements(entries: list[dict], value_key: str, path: str) -> dict:
    """Text every entry of a list of objects states besides its numbers (e.g. a ``unit`` per entry).

    One value per key, or an error when entries disagree.
    """
    found: dict[str, set] = {}
    for entry in entries:
        for k, v in entry.items():
            if k not in ("wavelength_nm", value_key) and isinstance(v, str):
                found.setdefault(k, set()).add(v)
    for k, values in found.items():
        if len(values) > 1:
            raise InputError(
                f"the entries give different values for {excerpt(k)}: "
                f"{', '.join(excerpt(v, 20) for v in sorted(values)[:3])}",
                "give one value for the whole spectrum",
                path,
            )
    return {k: next(iter(values)) for k, values in found.items()}


def read_json(
    path: str, *, display_path: str, column: str | int | None = None, limits: Limits | None = None
) -> tuple[RawSpectrum, dict]:
    """Read a JSON spectrum; see :func:`hazard.inputs.readers.delimited.read_delimited`.

    Entry numbers stand in for line numbers in messages.
    """
    limits = limits or current_limits()
    raw, digest = read_bytes(path, display_path, limits)
    text = decode_text(raw, display_path)
    try:
        data = json.loads(text, parse_int=float)
    except json.JSONDecodeError as exc:
        raise InputError(f"not valid JSON ({exc.msg})", _FIX, display_path, exc.lineno) from None
    except RecursionError:
        raise InputError("arrays or objects nested too deep to be a spectrum", _FIX, display_path) from None
    except ValueError as exc:  # what the decoder refuses beyond its grammar
        raise InputError(f"not a readable JSON file ({type(exc).__name__})", _FIX, display_path) from None
    wavelength, value, meta = _columns(data, column, display_path)
    if len(wavelength) > limits.max_rows:
        raise InputError(
            f"{len(wavelength):,} entries, above the {limits.max_rows:,} limit", "resample the spectrum", display_path
        )
    numbers = np.arange(1, len(wavelength) + 1)
    for i, (w, v) in enumerate(zip(wavelength, value, strict=True)):
        for item in (w, v):
            if isinstance(item, bool) or not isinstance(item, (int, float)):
                raise InputError(
                    f"entry {i + 1}: {_describe(item)} is not a number",
                    "use numbers for wavelength and value",
                    display_path,
                )
    spectrum = RawSpectrum(np.array(wavelength, dtype=float), np.array(value, dtype=float), numbers, display_path)
    return spectrum, {
        "header": None,
        "value_column": column or "value",
        "comments": [],
        "metadata": meta,
        "sha256": digest,
    }
