"""Action spectra and V(λ) as validated data files.

Each table is a ``NAME.csv`` (``wavelength_nm,value``) with a ``NAME.toml`` beside it that states the
source, edition, range, interpolation rule and the CSV's SHA-256. :func:`load_table` checks all of these
on load and refuses a table that does not match its metadata.

Tables: ``s_uv`` (S_UV, 200-400 nm), ``blue_light`` (B, 300-700 nm), ``retinal_thermal`` (R, 380-1400 nm),
``v_photopic`` (CIE 1924 V, 360-830 nm). The CIE 1931 2° colour-matching functions x̄, ȳ, z̄ (360-830 nm) are
``cie1931_2deg.csv``, three value columns, checked the same way by :func:`load_colour_matching`.
"""

from __future__ import annotations

import hashlib
import tomllib
from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

__all__ = ["CMF_FILE", "TABLE_NAMES", "TableError", "WeightingTable", "load_colour_matching", "load_table"]

TABLE_NAMES = ("s_uv", "blue_light", "retinal_thermal", "v_photopic")
CMF_FILE = "cie1931_2deg"
"""Stem of the CIE 1931 2° colour-matching functions' CSV and TOML files."""
_CMF_HEADER = "wavelength_nm,x_bar,y_bar,z_bar"
_INTERPOLATIONS = ("linear", "log-linear")


class TableError(ValueError):
    """A bundled table does not match its metadata (the installation is damaged or was edited)."""


@dataclass(frozen=True)
class WeightingTable:
    """One weighting function as published, with its provenance.

    Attributes
    ----------
    name : str
        File stem, e.g. ``"s_uv"``.
    symbol : str
        The standard's symbol, e.g. ``"S_UV"``.
    wavelength_nm : numpy.ndarray
        Tabulated wavelengths, strictly increasing [nm].
    value : numpy.ndarray
        Relative weight at each wavelength, all positive [1].
    interpolation : str
        ``"linear"`` or ``"log-linear"`` (linear in the logarithm of the weight).
    metadata : dict
        The whole metadata file (source, edition, note, ...).
    sha256 : str
        SHA-256 of the CSV file's bytes.
    """

    name: str
    symbol: str
    wavelength_nm: np.ndarray
    value: np.ndarray
    interpolation: str
    metadata: dict
    sha256: str

    @property
    def range_nm(self) -> tuple[float, float]:
        """First and last tabulated wavelength [nm]."""
        return float(self.wavelength_nm[0]), float(self.wavelength_nm[-1])

    def at(self, wavelength_nm: np.ndarray | float) -> np.ndarray:
        """Weight at the given wavelengths by the table's interpolation rule, zero outside its range.

        Parameters
        ----------
        wavelength_nm : array_like
            Wavelengths [nm].

        Returns
        -------
        numpy.ndarray
            Weights [1], same shape as the input.
        """
        wl = np.asarray(wavelength_nm, dtype=float)
        lo, hi = self.range_nm
        inside = (wl >= lo) & (wl <= hi)
        if self.interpolation == "log-linear":
            weights = np.exp(np.interp(wl, self.wavelength_nm, np.log(self.value)))
        else:
            weights = np.interp(wl, self.wavelength_nm, self.value)
        return np.where(inside, weights, 0.0)


def _fail(name: str, problem: str) -> TableError:
    return TableError(
        f"weighting table {name!r}: {problem}; reinstall the package or run "
        f"'python -m weighting_tables.regenerate' from a source checkout"
    )


@cache
def load_table(name: str) -> WeightingTable:
    """Load and validate one bundled table.

    Parameters
    ----------
    name : str
        One of :data:`TABLE_NAMES`.

    Returns
    -------
    WeightingTable

    Raises
    ------
    TableError
        When the CSV's hash, row count, range or values disagree with the metadata.
    """
    if name not in TABLE_NAMES:
        raise KeyError(f"unknown weighting table {name!r}; known: {', '.join(TABLE_NAMES)}")
    meta, digest, wl, values = _read_checked(name, "wavelength_nm,value")
    value = values[:, 0]
    if not np.all(value > 0):
        raise _fail(name, "weights must be finite and positive")
    value.flags.writeable = False
    return WeightingTable(
        name=name,
        symbol=meta["symbol"],
        wavelength_nm=wl,
        value=value,
        interpolation=meta["interpolation"],
        metadata=meta,
        sha256=digest,
    )


def _read_checked(name: str, header: str) -> tuple[dict, str, np.ndarray, np.ndarray]:
    """A bundled CSV checked against its metadata: (metadata, SHA-256, wavelengths [nm], value columns).

    Raises
    ------
    TableError
        When the hash, header, row count, range, order or finiteness disagree with the metadata.
    """
    folder = resources.files(__name__)
    raw = (folder / f"{name}.csv").read_bytes()
    meta = tomllib.loads((folder / f"{name}.toml").read_text(encoding="utf-8"))
    digest = hashlib.sha256(raw).hexdigest()
    if digest != meta.get("sha256"):
        raise _fail(name, f"SHA-256 {digest[:12]}… does not match the metadata")
    lines = raw.decode("utf-8").splitlines()
    if lines[0] != header:
        raise _fail(name, f"header must be {header!r}")
    data = np.array([[float(x) for x in line.split(",")] for line in lines[1:]])
    wl, values = data[:, 0], data[:, 1:]
    if len(wl) != meta["rows"]:
        raise _fail(name, f"{len(wl)} rows, metadata says {meta['rows']}")
    if wl[0] != meta["wavelength_min_nm"] or wl[-1] != meta["wavelength_max_nm"]:
        raise _fail(name, "range differs from the metadata")
    if not np.all(np.diff(wl) > 0):
        raise _fail(name, "wavelengths are not strictly increasing")
    if not np.all(np.isfinite(values)):
        raise _fail(name, "weights must be finite")
    if meta["interpolation"] not in _INTERPOLATIONS:
        raise _fail(name, f"unknown interpolation {meta['interpolation']!r}")
    wl.flags.writeable = False
    return meta, digest, wl, values


@cache
def load_colour_matching() -> tuple[WeightingTable, WeightingTable, WeightingTable]:
    """The CIE 1931 2° colour-matching functions x̄, ȳ, z̄ as three linear tables, checked like :func:`load_table`.

    Raises
    ------
    TableError
        When the CSV disagrees with its metadata, or a value is negative.
    """
    meta, digest, wl, values = _read_checked(CMF_FILE, _CMF_HEADER)
    if np.any(values < 0):
        raise _fail(CMF_FILE, "colour-matching functions are never negative")
    tables = []
    for k, axis in enumerate("xyz"):
        column = np.ascontiguousarray(values[:, k])
        column.flags.writeable = False
        tables.append(
            WeightingTable(
                name=f"cie1931_{axis}",
                symbol=axis,
                wavelength_nm=wl,
                value=column,
                interpolation=meta["interpolation"],
                metadata=meta,
                sha256=digest,
            )
        )
    return tables[0], tables[1], tables[2]
