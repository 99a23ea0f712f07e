"""The one integration routine for every weighted quantity (method §5 "Sampling").

The spectrum is taken as linear between its samples. A weighted integral ∫_{λ1}^{λ2} X(λ)·w(λ) dλ is the
exact integral of that interpolant times the weighting function *as tabulated* — with the table's own
interpolation rule between its points (log-linear for S_UV, B and R, linear for V(λ) and the colour-matching
functions). The band ends and the table's points inside the band are inserted as nodes, so on every
sub-interval both factors are smooth, and each sub-interval is integrated in closed form:

- linear weight: ∫ = h/6·[(2w_a + w_b)·X_a + (w_a + 2w_b)·X_b];
- log-linear weight, w = w_a·e^{u·s}, s ∈ [0, 1], u = ln(w_b/w_a): ∫ = w_a·h·[(E0 − E1)·X_a + E1·X_b],
  E0 = (e^u − 1)/u, E1 = (u·e^u − e^u + 1)/u²;
- unweighted: the trapezoid rule, which is exact for a linear X.

On a fine grid this is the trapezoid rule on the weighted samples; on a 1 nm grid where S_UV halves within
2 nm it removes the trapezoid's bias of up to about 1 %. The result is linear in the samples X_i, so it is
written once as a quadrature vector q with ∫ ≈ Σ q_i·X_i: the single-product path takes ``q @ X``, the
batch path stacks the vectors of all quantities into a matrix.
"""

from __future__ import annotations

from collections import OrderedDict
from collections.abc import Callable, Hashable, Sequence
from typing import Protocol

import numpy as np

__all__ = ["GridCache", "Weighting", "coarse_steps_in", "quadrature_matrix", "quadrature_weights"]

_SERIES_BELOW = 1e-3  # |u| under which E0 and E1 come from their Taylor series (no cancellation)


class Weighting(Protocol):
    """A tabulated weighting function.

    Points, values and an interpolation rule (``linear`` or ``log-linear``), zero outside its range.
    :class:`hazard.weighting_tables.WeightingTable` is one.
    """

    @property
    def wavelength_nm(self) -> np.ndarray:
        """Tabulated wavelengths [nm]."""

    @property
    def value(self) -> np.ndarray:
        """Weights at the tabulated wavelengths [1]."""

    @property
    def interpolation(self) -> str:
        """``linear`` or ``log-linear``."""

    def at(self, wavelength_nm: np.ndarray) -> np.ndarray:
        """Weight at the given wavelengths [nm] by the interpolation rule, zero outside the range [1]."""


def _interval_coefficients(
    h: np.ndarray, wa: np.ndarray, wb: np.ndarray, log_linear: bool
) -> tuple[np.ndarray, np.ndarray]:
    """Coefficients (c_a, c_b) with ∫ X·w = c_a·X_a + c_b·X_b on each interval of width h [nm]."""
    linear_a, linear_b = h / 6 * (2 * wa + wb), h / 6 * (wa + 2 * wb)
    if not log_linear:
        return linear_a, linear_b
    positive = (wa > 0) & (wb > 0)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        u = np.where(positive, np.log(np.where(positive, wb / np.where(wa > 0, wa, 1.0), 1.0)), 0.0)
        small = np.abs(u) < _SERIES_BELOW
        e0 = np.where(small, 1 + u / 2 + u**2 / 6 + u**3 / 24, np.expm1(u) / u)
        e1 = np.where(small, 0.5 + u / 3 + u**2 / 8 + u**3 / 30, (u * np.exp(u) - np.expm1(u)) / u**2)
    return (np.where(positive, wa * h * (e0 - e1), linear_a), np.where(positive, wa * h * e1, linear_b))


def quadrature_weights(
    grid_nm: np.ndarray, band_nm: tuple[float, float], weight: Weighting | None = None
) -> np.ndarray:
    """Quadrature vector for ∫_band X·w dλ on ``grid_nm``.

    Parameters
    ----------
    grid_nm : numpy.ndarray
        Strictly increasing wavelengths of the spectrum [nm].
    band_nm : tuple of float
        Integration band [nm]; the part outside the grid contributes nothing (coverage is checked by
        the caller).
    weight : Weighting, optional
        The weighting function; None for an unweighted band.

    Returns
    -------
    numpy.ndarray
        q with ∫ X·w dλ = q @ X for X linear between samples [nm].

    Examples
    --------
    A triangle of peak 2 W·m⁻²·nm⁻¹ at 450 nm sampled at 1 nm, integrated over 449.5–450.5 nm unweighted:

    >>> grid = np.array([449.0, 450.0, 451.0])
    >>> float(quadrature_weights(grid, (449.5, 450.5)) @ np.array([0.0, 2.0, 0.0]))
    1.5
    """
    grid = np.asarray(grid_nm, dtype=float)
    q = np.zeros(grid.size)
    a, b = max(band_nm[0], grid[0]), min(band_nm[1], grid[-1])
    if a >= b:
        return q
    inside = [grid[(grid > a) & (grid < b)]]
    if weight is not None:
        table = np.asarray(weight.wavelength_nm, dtype=float)
        inside.append(table[(table > a) & (table < b)])
    nodes = np.unique(np.concatenate([[a, b], *inside]))
    h = np.diff(nodes)
    w = np.ones(nodes.size) if weight is None else weight.at(nodes)
    log_linear = weight is not None and weight.interpolation == "log-linear"
    ca, cb = _interval_coefficients(h, w[:-1], w[1:], log_linear)
    node_weight = np.zeros(nodes.size)
    node_weight[:-1] += ca
    node_weight[1:] += cb
    left = np.clip(np.searchsorted(grid, nodes, side="right") - 1, 0, grid.size - 2)
    t = (nodes - grid[left]) / (grid[left + 1] - grid[left])
    np.add.at(q, left, node_weight * (1 - t))
    np.add.at(q, left + 1, node_weight * t)
    return q


def quadrature_matrix(grid_nm: np.ndarray, bands: Sequence[tuple[tuple[float, float], Weighting | None]]) -> np.ndarray:
    """Stack :func:`quadrature_weights` for several (band, weight) pairs: shape (grid, quantities) [nm]."""
    return np.column_stack([quadrature_weights(grid_nm, band, weight) for band, weight in bands])


class GridCache:
    """Quadrature matrices kept per wavelength grid (the most recently used ``size`` of them).

    Products measured on one set-up share a grid, and the uncertainty study's shifted grids repeat from product
    to product: their matrices are built once. The arrays handed out are read-only.

    Parameters
    ----------
    size : int
        Matrices kept [1].
    """

    def __init__(self, size: int):
        self.size = size
        self._kept: OrderedDict[tuple[bytes, Hashable], np.ndarray] = OrderedDict()

    def get(self, grid_nm: np.ndarray, what: Hashable, build: Callable[[np.ndarray], np.ndarray]) -> np.ndarray:
        """The matrix ``build(grid)`` for ``grid_nm`` and ``what`` (a hashable description of its columns)."""
        grid = np.ascontiguousarray(grid_nm, dtype=float)
        key = (grid.tobytes(), what)
        matrix = self._kept.get(key)
        if matrix is not None:
            self._kept.move_to_end(key)
            return matrix
        matrix = build(grid)
        matrix.flags.writeable = False
        self._kept[key] = matrix
        if len(self._kept) > self.size:
            self._kept.popitem(last=False)
        return matrix


def coarse_steps_in(grid_nm: np.ndarray, region_nm: tuple[float, float], max_step_nm: float) -> float | None:
    """Largest grid step over ``max_step_nm`` that overlaps ``region_nm``, or None [nm]."""
    grid = np.asarray(grid_nm, dtype=float)
    left, right = grid[:-1], grid[1:]
    overlapping = (right > region_nm[0]) & (left < region_nm[1])
    steps = (right - left)[overlapping]
    if steps.size and steps.max() > max_step_nm:
        return float(steps.max())
    return None
