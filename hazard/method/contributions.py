"""Where each hazard's weighted sum comes from: its share per wavelength band.

A hazard's value is Σ_i q_i·X_i with the quadrature vector q of its band and weighting (:mod:`hazard.method.weighting`).
Each term q_i·X_i is spread evenly over its sample's cell (halfway to each neighbour), and a band takes the part of
the cells within it (the first and last band also what lies beyond the hazard's band ends), so the value is split
exactly: the bands' shares add up to 1 (to rounding). Narrow hazard bands (up to 400 nm wide, the UV and blue
ones) are split into 5 nm bands, wider ones into 10 nm bands; the shares are kept to three significant digits, which
is what a chart needs, and the result stays small (at most a few hundred numbers a hazard).
"""

from __future__ import annotations

import numpy as np

from hazard.method.weighting import quadrature_weights
from hazard.standards import LimitSet
from hazard.weighting_tables import load_table

__all__ = ["NARROW_BAND_NM", "SHARE_FLOOR", "band_step_nm", "spectral_shares"]

NARROW_BAND_NM = 400.0
"""Hazard bands up to this width are split into 5 nm bands, wider ones into 10 nm bands [nm]."""
SHARE_FLOOR = 1e-5
"""Shares below this are written as 0, which keeps the result compact [1]."""


def band_step_nm(band_nm: tuple[float, float]) -> float:
    """Width of the bands a hazard's value is split into [nm]."""
    return 5.0 if band_nm[1] - band_nm[0] <= NARROW_BAND_NM else 10.0


def _three_digits(values: np.ndarray) -> list[float]:
    """Shares rounded to three significant digits, those under :data:`SHARE_FLOOR` as 0."""
    return [0.0 if v < SHARE_FLOOR else float(f"{v:.3g}") for v in values]


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
    grid = np.asarray(wavelength_nm, dtype=float)
    samples = np.maximum(np.asarray(value, dtype=float), 0.0)
    out = {}
    for symbol in symbols:
        hazard = limit_set[symbol]
        weight = None if hazard.table is None else load_table(hazard.table)
        terms = quadrature_weights(grid, hazard.band_nm, weight) * samples
        total = terms.sum()
        if not total > 0:
            continue
        low, high = hazard.band_nm
        step = band_step_nm(hazard.band_nm)
        count = int(np.ceil((high - low) / step))
        cells = np.concatenate([grid[:1], (grid[:-1] + grid[1:]) / 2, grid[-1:]])
        cumulative = np.concatenate([[0.0], np.cumsum(terms)])
        inner = np.interp(low + step * np.arange(1, count), cells, cumulative)
        shares = np.diff(np.concatenate([[0.0], inner, [total]])) / total
        filled = np.flatnonzero(shares >= SHARE_FLOOR)
        first, last = int(filled[0]), int(filled[-1])
        out[symbol] = (low + first * step, step, _three_digits(shares[first : last + 1]))
    return out
