"""The one integration routine for every weighted quantity (method §5 "Sampling").

A weighted integral ∫_{λ1}^{λ2} X(λ)·w(λ) dλ is computed on the spectrum's own grid: the band ends are
inserted as nodes (X interpolated linearly there), the weight is evaluated at every node by its table's
interpolation rule, and the trapezoid rule is applied. The result is linear in the samples X_i, so it is
written once as a quadrature vector q with ∫ ≈ Σ q_i·X_i. The single-product path takes ``q @ X``; the
batch path stacks the vectors of all quantities into a matrix and multiplies many spectra at once.
"""

from __future__ import annotations

from typing import Callable

import numpy as np

__all__ = ["quadrature_weights", "quadrature_matrix", "coarse_steps_in"]

WeightFunction = Callable[[np.ndarray], np.ndarray]


def quadrature_weights(grid_nm: np.ndarray, band_nm: tuple[float, float],
                       weight: WeightFunction | None = None) -> np.ndarray:
    """Quadrature vector for ∫_band X·w dλ on ``grid_nm``.

    Parameters
    ----------
    grid_nm : numpy.ndarray
        Strictly increasing wavelengths of the spectrum [nm].
    band_nm : tuple of float
        Integration band [nm]; the part outside the grid contributes nothing (coverage is checked by
        the caller).
    weight : callable, optional
        Weight at given wavelengths [1]; None for an unweighted band.

    Returns
    -------
    numpy.ndarray
        q with ∫ X·w dλ ≈ q @ X [nm].

    Examples
    --------
    A line of 2 W·m⁻²·nm⁻¹ sampled at 1 nm, integrated over 449.5–450.5 nm with a flat weight:

    >>> grid = np.array([449.0, 450.0, 451.0])
    >>> float(quadrature_weights(grid, (449.5, 450.5)) @ np.array([0.0, 2.0, 0.0]))
    1.5
    """
    grid = np.asarray(grid_nm, dtype=float)
    q = np.zeros(grid.size)
    a, b = max(band_nm[0], grid[0]), min(band_nm[1], grid[-1])
    if a >= b:
        return q
    inner = np.flatnonzero((grid > a) & (grid < b))
    nodes = np.concatenate(([a], grid[inner], [b]))
    spacing = np.diff(nodes)
    trapezoid = np.zeros(nodes.size)
    trapezoid[:-1] += spacing / 2
    trapezoid[1:] += spacing / 2
    node_weight = trapezoid * (1.0 if weight is None else weight(nodes))
    np.add.at(q, inner, node_weight[1:-1])
    for end, w in ((a, node_weight[0]), (b, node_weight[-1])):
        i = int(np.clip(np.searchsorted(grid, end, side="right") - 1, 0, grid.size - 2))
        t = (end - grid[i]) / (grid[i + 1] - grid[i])
        q[i] += w * (1 - t)
        q[i + 1] += w * t
    return q


def quadrature_matrix(grid_nm: np.ndarray, bands: list[tuple[tuple[float, float], WeightFunction | None]]
                      ) -> np.ndarray:
    """Stack :func:`quadrature_weights` for several (band, weight) pairs: shape (grid, quantities) [nm]."""
    return np.column_stack([quadrature_weights(grid_nm, band, weight) for band, weight in bands])


def coarse_steps_in(grid_nm: np.ndarray, region_nm: tuple[float, float], max_step_nm: float) -> float | None:
    """Largest grid step over ``max_step_nm`` that overlaps ``region_nm``, or None [nm]."""
    grid = np.asarray(grid_nm, dtype=float)
    left, right = grid[:-1], grid[1:]
    overlapping = (right > region_nm[0]) & (left < region_nm[1])
    steps = (right - left)[overlapping]
    if steps.size and steps.max() > max_step_nm:
        return float(steps.max())
    return None
