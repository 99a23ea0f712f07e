"""One search for every "where does it change" question: a monotonic test bracketed on a log scale.

The studies ask where a product's group changes with distance, dimming or emitting area, and t_max asks
where a dose reaches its limit under a growing field of view. Each is a test that is false below some value
and true above it (or the reverse). :func:`log_search` narrows all brackets together: each round tests
``points`` values inside every open bracket in one call, so a product's whole study costs a few calls of the
method on arrays instead of dozens of sequential bisections.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

__all__ = ["log_search"]


def log_search(
    test: Callable[[np.ndarray, np.ndarray], np.ndarray],
    low: np.ndarray,
    high: np.ndarray,
    relative_precision: float = 1e-12,
    points: int = 31,
) -> tuple[np.ndarray, np.ndarray]:
    """For each job, the bracket [last false, first true] around the x in [low, high] where ``test`` turns true.

    Narrowed to ``relative_precision``.

    Parameters
    ----------
    test : callable
        ``test(x, jobs)`` → bool array like ``x``: x is (m, k) values, one row per job in ``jobs`` (indices into
        ``low``); the test must be false below the answer and true from it on (monotonic in x).
    low, high : numpy.ndarray
        (n,) bracket ends, 0 < low < high [unit of x]; the test is taken as false at ``low``, true at ``high``.
    relative_precision : float
        The bracket's width on return, relative [1].
    points : int
        Values tested per job and round.

    Returns
    -------
    below, above : numpy.ndarray
        (n,) the final bracket: the test is false at ``below`` (or it is ``low``) and true at ``above`` (or it
        is ``high``) [unit of x].

    Examples
    --------
    >>> below, above = log_search(lambda x, jobs: x ** 2 >= 2.0, np.array([1.0]), np.array([2.0]))
    >>> round(float(below[0]), 10), round(float(above[0]), 10), bool(above[0] ** 2 >= 2 > below[0] ** 2)
    (1.4142135624, 1.4142135624, True)
    """
    lo, hi = np.log(np.asarray(low, dtype=float)), np.log(np.asarray(high, dtype=float))
    lo, hi = lo.copy(), hi.copy()
    fractions = np.arange(1, points + 1) / (points + 1)
    tolerance = np.log1p(relative_precision)
    while True:
        jobs = np.flatnonzero(hi - lo > tolerance)
        if jobs.size == 0:
            return np.exp(lo), np.exp(hi)
        grid = lo[jobs, None] + (hi - lo)[jobs, None] * fractions[None, :]
        true = np.asarray(test(np.exp(grid), jobs), dtype=bool)
        first = np.argmax(true, axis=1)
        found = true[np.arange(jobs.size), first]
        new_hi = np.where(found, grid[np.arange(jobs.size), first], hi[jobs])
        new_lo = np.where(found, np.where(first > 0, grid[np.arange(jobs.size), first - 1], lo[jobs]), grid[:, -1])
        lo[jobs], hi[jobs] = new_lo, new_hi
