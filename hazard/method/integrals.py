"""Weighted integrals of many spectra against one quadrature matrix per wavelength grid.

The columns are the integrals of :func:`hazard.method.evaluate.integral_specs` followed by CIE 1931 X, Y, Z; the
matrix comes from :mod:`hazard.method.weighting`, the one integration routine.

Two ways to apply it, same numbers:

- :func:`integrate_matrix`: n spectra on a common grid, one BLAS matrix product per bounded-memory chunk.
  Fastest; its last bits may depend on how BLAS blocks the chunk.
- :func:`integrate_spectra`: spectra read from files, each on its own grid (the matrix is built once per
  distinct grid), each product summed on its own in a fixed order, so a product's result is bit-for-bit
  the same whether it is assessed alone or in a batch. ``hazard assess`` and ``hazard batch`` use this.

A grid's matrix is built once per process and limit set (:func:`integral_matrix` keeps the most recent ones).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hazard.method.evaluate import integral_specs
from hazard.method.photometry import cmf_quadrature
from hazard.method.weighting import GridCache, quadrature_matrix
from hazard.standards import LimitSet
from hazard.weighting_tables import load_table

__all__ = ["CHUNK_ROWS", "Integrated", "coverage", "integral_matrix", "integrate_matrix", "integrate_spectra"]

CHUNK_ROWS = 512
"""Spectra handled at once: small enough to stay in cache between the check and the product, and to bound
any temporary copy to CHUNK_ROWS × grid × 8 bytes."""


@dataclass(frozen=True)
class Integrated:
    """Integrals of n spectra.

    Attributes
    ----------
    raw : numpy.ndarray
        (n, k) integrals in the order of :func:`integral_specs` [W m⁻² or W m⁻² sr⁻¹].
    xyz : numpy.ndarray
        (n, 3) CIE 1931 tristimulus integrals ∫X·x̄ dλ etc. (same scale as ``raw``).
    covered : numpy.ndarray
        (n, k) the integral's band is spanned by the spectrum (or emission outside it is ruled out) and has no
        gap between samples wider than :func:`widest_gap_nm` allows.
    gap_free : numpy.ndarray
        (n, k) no such gap: the integral over the measured part is then at most the band's true value (spectra
        and weights are non-negative), a lower bound where the band is not covered.
    """

    raw: np.ndarray
    xyz: np.ndarray
    covered: np.ndarray
    gap_free: np.ndarray

    def rows(self, index) -> Integrated:
        """The products at ``index`` (an int keeps a row of its own)."""
        index = np.atleast_1d(index)
        return Integrated(self.raw[index], self.xyz[index], self.covered[index], self.gap_free[index])


_MATRICES = GridCache(32)
"""Integral matrices of the most recent grids (≈ 0.5 MB each on a 1 nm grid from 200 to 3000 nm)."""


def integral_matrix(grid_nm: np.ndarray, limit_set: LimitSet) -> np.ndarray:
    """Quadrature matrix (grid, k + 3): every integral of the limit set, then X, Y, Z [nm].

    Built once per grid and set of integrals, then kept (the most recent 32); the array returned is read-only.
    """
    specs = tuple(integral_specs(limit_set))  # the integrals themselves, not the set's name, describe the columns

    def build(grid: np.ndarray) -> np.ndarray:
        weights = [(s.band_nm, None if s.table is None else load_table(s.table)) for s in specs]
        return np.hstack([quadrature_matrix(grid, weights), cmf_quadrature(grid)])

    return _MATRICES.get(grid_nm, specs, build)


_GAP_FREE = GridCache(32)
"""Which integrals of the most recent grids have no hole (:func:`coverage`)."""

GAP_FLOOR_NM = 20.0
"""A step between neighbouring samples up to this wide never makes a band unusable [nm]."""
GAP_SHARE_OF_BAND = 0.1
"""Nor does one up to this share of the band's width (a 222 nm step in the 780–3000 nm band) [1]."""


def widest_gap_nm(grid_nm: np.ndarray, band_nm: tuple[float, float]) -> tuple[float, float] | None:
    """The widest step between neighbouring samples within a band, when it is wider than the band allows.

    A band allows steps up to max(:data:`GAP_FLOOR_NM`, :data:`GAP_SHARE_OF_BAND` × its width): coarse but
    regular sampling (10 nm in the UV, 100 nm in the infrared) passes, while a hole (an export with the visible
    rows missing, a few points read off a datasheet) does not; across a hole the spectrum is unknown, not
    approximately linear (method §5, read on the safe side; the widths are common practice, no published source).

    Returns
    -------
    tuple of float or None
        (start, end) of that step [nm], or None.

    Examples
    --------
    >>> widest_gap_nm(np.array([200.0, 300.0, 400.0, 900.0, 3000.0]), (380.0, 1400.0))
    (400.0, 900.0)
    >>> widest_gap_nm(np.arange(200.0, 3001.0, 10.0), (200.0, 400.0)) is None
    True
    """
    lo, hi = band_nm
    allowed = max(GAP_FLOOR_NM, GAP_SHARE_OF_BAND * (hi - lo))
    starts, ends = grid_nm[:-1], grid_nm[1:]
    inside = (ends > lo) & (starts < hi)
    if not inside.any():
        return None
    steps = np.where(inside, np.minimum(ends, hi) - np.maximum(starts, lo), 0.0)
    k = int(np.argmax(steps))
    return (float(starts[k]), float(ends[k])) if steps[k] > allowed else None


def coverage(grid_nm: np.ndarray, no_emission_outside: bool, limit_set: LimitSet) -> tuple[np.ndarray, np.ndarray]:
    """Which integrals the spectrum can be trusted for, and which are free of wide gaps.

    An integral is trusted when the spectrum spans its band, or the record rules out emission outside the measured
    range (method §5), and no gap between samples inside the band is wider than :func:`widest_gap_nm` allows (the
    record's statement is about what lies outside the measured range, not about holes in it).

    Returns
    -------
    covered, gap_free : numpy.ndarray
        (k,) bool each, in the order of :func:`integral_specs`.
    """
    lo, hi = float(grid_nm[0]), float(grid_nm[-1])
    specs = tuple(integral_specs(limit_set))
    gap_free = _GAP_FREE.get(
        grid_nm, specs, lambda grid: np.array([widest_gap_nm(grid, s.band_nm) is None for s in specs])
    )
    spans = np.array([no_emission_outside or (lo <= s.band_nm[0] and hi >= s.band_nm[1]) for s in specs])
    return spans & gap_free, gap_free


def _fill(
    out: Integrated,
    rows,
    products: np.ndarray,
    grid_nm: np.ndarray,
    no_emission_outside: np.ndarray,
    limit_set: LimitSet,
) -> None:
    """Store the integrals ``products`` (rows × (k + 3)) of spectra on ``grid_nm`` into rows ``rows``."""
    k = out.raw.shape[1]
    out.raw[rows], out.xyz[rows] = products[:, :k], products[:, k:]
    spans, gap_free = coverage(grid_nm, False, limit_set)
    out.covered[rows] = (spans[None, :] | np.asarray(no_emission_outside, dtype=bool)[:, None]) & gap_free[None, :]
    out.gap_free[rows] = gap_free[None, :]


def _empty(n: int, limit_set: LimitSet) -> Integrated:
    k = len(integral_specs(limit_set))
    return Integrated(
        raw=np.empty((n, k)),
        xyz=np.empty((n, 3)),
        covered=np.empty((n, k), dtype=bool),
        gap_free=np.empty((n, k), dtype=bool),
    )


def integrate_matrix(
    grid_nm: np.ndarray,
    values: np.ndarray,
    no_emission_outside: np.ndarray,
    limit_set: LimitSet,
    factor_to_si: np.ndarray | None = None,
    chunk_rows: int = CHUNK_ROWS,
) -> tuple[Integrated, np.ndarray, np.ndarray]:
    """Integrals of n spectra on one grid, and each spectrum's highest and lowest sample.

    Negative samples count as zero (dark noise, method §5; the caller judges the lowest sample against
    the peak). Each chunk is checked and multiplied while it is in cache: one pass over the data.

    float32 spectra are multiplied in float32 (half the memory traffic); every term is non-negative, so
    the sum's relative rounding error stays below m·2⁻²⁴ (1.7e-4 for 2801 samples) and is typically about
    1e-6, far below any measurement uncertainty. float64 spectra are multiplied in float64.

    Parameters
    ----------
    grid_nm : numpy.ndarray
        (m,) strictly increasing wavelengths [nm].
    values : numpy.ndarray
        (n, m) spectral values, float32 or float64 [W m⁻² nm⁻¹ or W m⁻² sr⁻¹ nm⁻¹].
    no_emission_outside : numpy.ndarray
        (n,) bool, per product.
    factor_to_si : numpy.ndarray, optional
        (n,) multiplier from each row's unit to SI [1]; applied to the integrals (they are linear).
    chunk_rows : int
        Rows handled at once; the caller's array is never modified.

    Returns
    -------
    tuple of (Integrated, numpy.ndarray, numpy.ndarray)
        The integrals, and the (n,) highest and lowest sample of each row (NaN or ±inf show in them).
    """
    dtype: type[np.floating] = np.float32 if values.dtype == np.float32 else np.float64
    matrix = integral_matrix(grid_nm, limit_set).astype(dtype)
    flags = np.asarray(no_emission_outside, dtype=bool)
    out = _empty(values.shape[0], limit_set)
    peak, lowest = np.empty(values.shape[0]), np.empty(values.shape[0])
    from threadpoolctl import threadpool_limits

    with threadpool_limits(limits=1, user_api="blas"):  # a chunk is too small to share: threads wait on each other
        for start in range(0, values.shape[0], chunk_rows):
            rows = slice(start, start + chunk_rows)
            chunk = values[rows]
            peak[rows], lowest[rows] = chunk.max(axis=1), chunk.min(axis=1)
            if (lowest[rows] < 0).any():  # not .min(): a NaN row (refused later) must not spare its neighbours
                chunk = np.maximum(chunk, 0)
            with np.errstate(invalid="ignore", over="ignore"):  # a NaN or ±inf row is refused by the caller
                products = chunk.astype(dtype, copy=False) @ matrix
            _fill(out, rows, products, grid_nm, flags[rows], limit_set)
    if factor_to_si is not None:
        out.raw[:] *= factor_to_si[:, None]
        out.xyz[:] *= factor_to_si[:, None]
    return out, peak, lowest


def integrate_spectra(
    grids: list[np.ndarray], values: list[np.ndarray], no_emission_outside: list[bool], limit_set: LimitSet
) -> Integrated:
    """Integrals of n spectra, each on its own grid (a grid's matrix is built once and shared).

    Each product is reduced on its own, ``Σ_i q_i·X_i`` in a fixed order, so its integrals do not depend
    on which other products are in the batch.
    """
    out = _empty(len(grids), limit_set)
    for i, (grid, value) in enumerate(zip(grids, values, strict=True)):
        products = np.sum(np.asarray(value, dtype=float)[:, None] * integral_matrix(grid, limit_set), axis=0)
        _fill(out, [i], products[None, :], grid, np.array([no_emission_outside[i]]), limit_set)
    return out
