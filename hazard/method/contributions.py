"""Where each hazard's weighted sum comes from: its share per wavelength band.

A hazard's value is Σ_i q_i·X_i with the quadrature vector q of its band and weighting (:mod:`hazard.method.weighting`).
Each term q_i·X_i is spread evenly over its sample's cell (halfway to each neighbour), and a band takes the part of
the cells within it (the first and last band also what lies beyond the hazard's band ends), so the value is split
exactly: the bands' shares add up to 1 (to rounding). Narrow hazard bands (up to 400 nm wide, the UV and blue
ones) are split into 5 nm bands, wider ones into 10 nm bands; the shares are kept to three significant digits, which
is what a chart needs, and the result stays small (at most a few hundred numbers a hazard).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from hazard.method.weighting import quadrature_weights
from hazard.standards import LimitSet
from hazard.weighting_tables import load_table

__all__ = ["BAND_STEPS_NM", "NEGLIGIBLE_SHARE_OF_EXEMPT", "SHARE_FLOOR", "band_step_nm", "spectral_shares"]

BAND_STEPS_NM = ((400.0, 5.0), (1100.0, 10.0), (float("inf"), 20.0))
"""(widest hazard band, width of its parts): the steps a hazard's value is split into, by its band's width [nm]."""
NEGLIGIBLE_SHARE_OF_EXEMPT = 1e-3
"""A hazard whose value is under this fraction of its Exempt limit is not split by band: where a spectrum's noise
floor or a line's far tail comes from says nothing about the product (common practice, no published source: a
thousandth of the limit is far below any measurement's uncertainty) [1]."""
SHARE_FLOOR = 1e-5
"""Shares below this are written as 0, which keeps the result compact [1]."""


def band_step_nm(band_nm: tuple[float, float]) -> float:
    """Width of the bands a hazard's value is split into [nm]."""
    return next(step for widest, step in BAND_STEPS_NM if band_nm[1] - band_nm[0] <= widest)


def _three_digits(values: np.ndarray) -> list[float]:
    """Shares (≤ 1) rounded to three significant digits, those under :data:`SHARE_FLOOR` as 0.

    An integer over an exact power of ten, so each is the float nearest its three-digit decimal.
    """
    kept = np.where(values >= SHARE_FLOOR, values, 0.0)
    with np.errstate(divide="ignore"):
        scale = 10.0 ** (2 - np.floor(np.log10(np.where(kept > 0, kept, 1.0))))
    return (np.round(kept * scale) / scale).tolist()


@lru_cache(maxsize=64)
def _matrix(grid: bytes, bands: tuple[tuple[tuple[float, float], str | None], ...]) -> np.ndarray:
    """Quadrature vectors (hazards, grid) of bands and weightings on a grid (its float64 bytes), once per grid."""
    spectrum_grid = np.frombuffer(grid)
    return np.vstack(
        [quadrature_weights(spectrum_grid, band, None if table is None else load_table(table)) for band, table in bands]
    )


def spectral_shares(
    wavelength_nm: np.ndarray, value: np.ndarray, limit_set: LimitSet, symbols: list[str]
) -> dict[str, tuple[float, float, list[float]]]:
    """Each named hazard's value split by wavelength band.

    Parameters
    ----------
    wavelength_nm : numpy.ndarray
        The spectrum's strictly increasing grid [nm].
    value : numpy.ndarray
        Its samples, any scale (negative samples count as zero) [any spectral unit].
    limit_set : LimitSet
        Where the hazards' bands and weightings come from.
    symbols : list of str
        Hazards to split (those assessed with a value above zero).

    Returns
    -------
    dict
        Symbol → (lower edge of the first band [nm], band width [nm], share of the value from each band [1]), the
        bands trimmed to those from the first to the last with a share; hazards whose value is 0 are left out.

    Examples
    --------
    A flat spectrum over 300–400 nm: E_UVA (315–400 nm, unweighted) takes an equal share from each full 5 nm band.

    >>> from hazard.standards import DEFAULT_LIMIT_SET
    >>> grid = np.arange(300.0, 400.5, 1.0)
    >>> start, step, share = spectral_shares(grid, np.ones(grid.size), DEFAULT_LIMIT_SET, ["E_UVA"])["E_UVA"]
    >>> start, step, len(share), share[0], round(sum(share), 6)
    (315.0, 5.0, 17, 0.0588, 0.9996)
    """
    grid = np.ascontiguousarray(wavelength_nm, dtype=float)
    hazards = [limit_set[symbol] for symbol in symbols]
    if not hazards:
        return {}
    matrix = _matrix(grid.tobytes(), tuple((tuple(h.band_nm), h.table) for h in hazards))
    terms = matrix * np.maximum(np.asarray(value, dtype=float), 0.0)  # (hazards, grid), each row contiguous
    totals = terms.sum(axis=1)
    cumulative = np.zeros((len(hazards), grid.size + 1))  # at the cells' edges
    np.cumsum(terms, axis=1, out=cumulative[:, 1:])
    cells = np.concatenate([grid[:1], (grid[:-1] + grid[1:]) / 2, grid[-1:]])
    steps = [band_step_nm(h.band_nm) for h in hazards]
    counts = [int(np.ceil((h.band_nm[1] - h.band_nm[0]) / step)) for h, step in zip(hazards, steps, strict=True)]
    inner = [h.band_nm[0] + step * np.arange(1, n) for h, step, n in zip(hazards, steps, counts, strict=True)]
    edges = np.concatenate(inner)
    column = np.repeat(np.arange(len(hazards)), [n - 1 for n in counts])
    place = np.interp(edges, cells, np.arange(cells.size, dtype=float))  # fractional row of ``cumulative``
    row = np.minimum(place.astype(int), cells.size - 2)
    below = cumulative[column, row]
    at_edges = below + (place - row) * (cumulative[column, row + 1] - below)
    out = {}
    offset = 0
    for k, (symbol, hazard, step, n) in enumerate(zip(symbols, hazards, steps, counts, strict=True)):
        cut = at_edges[offset : offset + n - 1]
        offset += n - 1
        total = totals[k]
        if not total > 0:
            continue
        shares = np.diff(np.concatenate([[0.0], cut, [total]])) / total
        filled = np.flatnonzero(shares >= SHARE_FLOOR)
        first, last = int(filled[0]), int(filled[-1])
        out[symbol] = (hazard.band_nm[0] + first * step, step, _three_digits(shares[first : last + 1]))
    return out
