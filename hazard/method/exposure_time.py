"""t_max: the exposure duration at which a hazard's exposure limit is first reached (method §1).

The time axis is cut where the limit's formula changes (:class:`~hazard.standards.LimitPiece`) and where the
viewing rule changes (:class:`~hazard.standards.Viewing`: the field of view γ and the α bounds that belong to
each duration). On each cut the limit is a power law C·t^k and, for a fixed field, the compared value is
constant, so the time is (value/C)^(1/k) in closed form; where the field grows with the duration (blue light,
γ = 1.1·√t mrad from 100 s) the dose value·t never falls with t and the time is found by
:func:`hazard.method.search.log_search`.
t_max is the earliest time over all cuts, so it sees the same fields and α bounds as the group boundaries.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import cache
from typing import Protocol

import numpy as np

from hazard.method.search import log_search
from hazard.standards import FieldOfView, Hazard, LimitPiece

__all__ = ["time_to_limit_s"]


RadianceAt = Callable[..., np.ndarray]
"""(symbol, γ [rad], rows=None) → the field-averaged radiance of that quantity [W m⁻² sr⁻¹], one per product
(or per product at ``rows``)."""
ValueOf = Callable[[str], np.ndarray]
"""symbol → the irradiance value of that quantity [W m⁻²], one per product."""
AlphaIn = Callable[[tuple[float, float]], np.ndarray]
"""α bounds [rad] → the bounded angular subtense, one per product [rad]."""
Cut = tuple[float, float, LimitPiece, FieldOfView | None, tuple[float, float] | None]
"""(after [s], up to [s], the limit's piece, the field of view or None, the α bounds [rad] or None)."""


@cache
def _cuts(hazard: Hazard) -> list[Cut]:
    """(after, up_to, piece, field of view, α bounds) for every stretch of duration with one formula.

    Each stretch also has one viewing rule; a growing field is cut where it reaches its cap, beyond which it is fixed.
    """
    cuts: list[Cut] = []
    for piece in hazard.exposure_limit.pieces:
        if not hazard.viewing:
            cuts.append((piece.after_s, piece.up_to_s, piece, None, None))
            continue
        start = 0.0
        for rule in hazard.viewing:
            a, b = max(piece.after_s, start), min(piece.up_to_s, rule.up_to_s)
            start = rule.up_to_s
            if a >= b:
                continue
            fov, growth = rule.fov, rule.fov.growth_rad_per_sqrt_s
            if fov.grows and growth is not None and np.isfinite(fov.cap_rad):
                t_cap = (fov.cap_rad / growth) ** 2
                if a < t_cap:
                    cuts.append((a, min(b, t_cap), piece, fov, rule.alpha_bounds_rad))
                if b > t_cap:
                    cuts.append((max(a, t_cap), b, piece, FieldOfView(fixed_rad=fov.cap_rad), rule.alpha_bounds_rad))
                continue
            cuts.append((a, b, piece, fov, rule.alpha_bounds_rad))
    return cuts


def _closed_form(value: np.ndarray, coefficient: np.ndarray, exponent: float, a: float, b: float) -> np.ndarray:
    """Earliest t in (a, b] with value > coefficient·t^exponent.

    Reached exactly at the time the two are equal; NaN where not within the cut.
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if exponent == 0:
            return np.where(value > coefficient, a, np.nan)
        t = (value / coefficient) ** (1.0 / exponent)
    t = np.where(value > 0, t, np.inf)
    return np.where(t <= b, np.maximum(t, a), np.nan)


def _growing(exceeded: Callable[[np.ndarray, np.ndarray], np.ndarray], n: int, a: float, b: float) -> np.ndarray:
    """Earliest t in [a, b] where the monotonic ``exceeded(t, rows)`` holds (t and rows flat, one each).

    NaN where it does not hold at b.
    """
    every = np.arange(n)
    at_end = exceeded(np.full(n, b), every)
    at_start = exceeded(np.full(n, a), every)
    out = np.where(at_start, a, np.nan)
    rows = np.flatnonzero(at_end & ~at_start)
    if rows.size:

        def test(t, jobs):
            return exceeded(t.ravel(), np.repeat(rows[jobs], t.shape[1])).reshape(t.shape)

        out[rows] = log_search(test, np.full(rows.size, a), np.full(rows.size, b))[1]
    return out


def time_to_limit_s(
    hazard: Hazard, n: int, value_of: ValueOf, radiance_at: RadianceAt, alpha_in: AlphaIn
) -> np.ndarray:
    """t_max of ``hazard`` for n products [s]; NaN where the limit is not reached within its durations.

    Parameters
    ----------
    hazard : Hazard
    n : int
        Products.
    value_of : callable
        Irradiance values by symbol (irradiance hazards).
    radiance_at : callable
        Field-averaged radiance by symbol and field of view (radiance hazards).
    alpha_in : callable
        Bounded α for a pair of bounds.

    Returns
    -------
    numpy.ndarray
        (n,) [s].
    """
    earliest = np.full(n, np.inf)
    for a, b, piece, fov, bounds in _cuts(hazard):
        symbol = piece.quantity or hazard.symbol
        if not piece.over_alpha:
            coefficient = np.full(n, piece.coefficient)
        elif bounds is None:
            raise ValueError(f"{hazard.symbol}: a limit over α needs α bounds")
        else:
            coefficient = piece.coefficient / alpha_in(bounds)
        if fov is None:
            reach = _closed_form(value_of(symbol), coefficient, piece.exponent, a, b)
        elif not fov.grows:
            reach = _closed_form(radiance_at(symbol, fov.fixed_rad), coefficient, piece.exponent, a, b)
        else:

            def exceeded(t, rows, symbol=symbol, coefficient=coefficient, piece=piece, fov=fov):
                return radiance_at(symbol, fov.at(t), rows) > coefficient[rows] * t**piece.exponent

            reach = _growing(exceeded, n, max(a, 1e-9), b)
        earliest = np.fmin(earliest, reach)
    return np.where(np.isfinite(earliest), earliest, np.nan)


def piece_at(hazard: Hazard, t_s: float) -> LimitPiece | None:
    """The piece of the exposure limit that covers duration ``t_s`` (after < t ≤ up to); None beyond them."""
    return next((p for p in hazard.exposure_limit.pieces if p.after_s < t_s <= p.up_to_s), None)


def limit_value(hazard: Hazard, t_s: float, alpha_rad: float | None = None) -> float:
    """The exposure limit for duration ``t_s`` [the hazard's unit].

    coefficient·t^exponent, over α when the piece says so; NaN where no piece covers ``t_s``.
    """
    piece = piece_at(hazard, t_s)
    if piece is None:
        return float("nan")
    coefficient = piece.coefficient / alpha_rad if (piece.over_alpha and alpha_rad is not None) else piece.coefficient
    return float(coefficient * t_s**piece.exponent)


class Viewed(Protocol):
    """What a duration's comparison needs of products seen at a distance (:class:`hazard.method.evaluate.Viewed`)."""

    def value(self, symbol: str) -> np.ndarray: ...

    def field_radiance(
        self, symbol: str, fov_rad: np.ndarray | float, rows: np.ndarray | None = None
    ) -> np.ndarray: ...

    def alpha(self, bounds_rad: tuple[float, float]) -> np.ndarray: ...


def limit_fraction(hazard: Hazard, viewed: Viewed, t_s: float, row: int) -> float:
    """An exposure of duration ``t_s`` as a fraction of its limit, for product ``row`` of ``viewed`` [1].

    Radiance is averaged over the field of view that belongs to the duration and α is bounded as the duration's
    viewing rule says; NaN where the limit has no value for that duration.
    """
    return float(limit_fractions(hazard, viewed, t_s, np.array([row]))[0])


def limit_fractions(hazard: Hazard, viewed: Viewed, t_s: float, rows: np.ndarray) -> np.ndarray:
    """:func:`limit_fraction` of the products at ``rows``, all exposed for ``t_s`` [1].

    Each row's number is the one :func:`limit_fraction` gives it alone (the same operations, element by element).
    """
    piece = piece_at(hazard, t_s)
    if piece is None:
        return np.full(rows.size, np.nan)
    rule = hazard.viewing_at(t_s)
    symbol = piece.quantity or hazard.symbol
    if rule is None:
        compared = viewed.value(symbol)[rows]
    else:
        compared = viewed.field_radiance(symbol, rule.fov.at(t_s), rows)
    if not piece.over_alpha:
        return compared / limit_value(hazard, t_s)
    if rule is None or rule.alpha_bounds_rad is None:
        raise ValueError(f"{hazard.symbol}: a limit over α needs α bounds at {t_s:g} s")
    alpha = viewed.alpha(rule.alpha_bounds_rad)[rows]
    return compared / (piece.coefficient / alpha * t_s**piece.exponent)
