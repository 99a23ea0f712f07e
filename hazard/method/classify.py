"""Risk groups from compared values and limits: the top-down reading, and its agreement with t_max.

One implementation, used wherever a group is derived (the assessment, the studies, ``assess_many``, the batch
path) and to check a saved result before it is rendered.

Top down (method §3): a hazard is RG3 when the value compared at the RG2 boundary exceeds the RG2 limit as
applied there, else RG2 when the RG1 comparison fails, else RG1 when the Exempt comparison fails, else
Exempt. Reading bottom-up is wrong when the fields of view and α bounds differ per boundary: a small source
can pass the Exempt test (11 mrad) and fail the RG2 test (1.7 mrad).

A group also never reads safer than its own t_max: when the exposure limit is reached before a boundary's time
base (beyond the rounding of the tabulated limits), the group is raised to what t_max implies and the result
says so. For the limits of IEC 62471:2006 this only acts on the weak-stimulus hazard L_IR, whose limit up to
10 s is the retinal-thermal one on L_R.
"""

from __future__ import annotations

import numpy as np

__all__ = ["groups_from_t_max", "hazard_groups", "top_down_groups"]


def top_down_groups(compared: np.ndarray, limits: np.ndarray) -> np.ndarray:
    """Group index (0 Exempt … 3 RG3) read from the top boundary down.

    Parameters
    ----------
    compared, limits : numpy.ndarray
        (n, 3) values compared at, and limits applied at, the Exempt, RG1 and RG2 boundaries [unit].

    Returns
    -------
    numpy.ndarray
        (n,) int.

    Examples
    --------
    A small red source: within the Exempt limit (11 mrad field), over the RG2 limit (1.7 mrad field).

    >>> top_down_groups(np.array([[1.6e6, 1.6e6, 6.6e7]]), np.array([[2.5e6, 2.5e6, 4.2e7]])).tolist()
    [3]
    """
    over = np.asarray(compared) > np.asarray(limits)
    return np.where(over[:, 2], 3, np.where(over[:, 1], 2, np.where(over[:, 0], 1, 0)))


def groups_from_t_max(t_max_s: np.ndarray, time_bases_s: tuple[float, float, float], tolerance: float) -> np.ndarray:
    """Group index that a t_max implies.

    RG3 below the RG2 time base, RG2 below the RG1 base, RG1 below the Exempt base, else Exempt (NaN: never reached);
    each base lowered by ``tolerance`` (the table's rounding).

    Examples
    --------
    >>> groups_from_t_max(np.array([np.nan, 2e4, 50.0, 0.1]), (1e4, 100, 0.25), 0.03).tolist()
    [0, 0, 2, 3]
    """
    t = np.where(np.isnan(t_max_s), np.inf, t_max_s)
    base = np.asarray(time_bases_s, dtype=float) * (1 - tolerance)
    return np.where(t < base[2], 3, np.where(t < base[1], 2, np.where(t < base[0], 1, 0)))


def hazard_groups(
    compared: np.ndarray,
    limits: np.ndarray,
    t_max_s: np.ndarray,
    time_bases_s: tuple[float, float, float],
    tolerance: float,
) -> tuple[np.ndarray, np.ndarray]:
    """A hazard's groups: the top-down reading, raised where its t_max implies a higher group.

    Returns
    -------
    group, raised : numpy.ndarray
        (n,) group index, and (n,) bool where t_max raised it.
    """
    table = top_down_groups(compared, limits)
    implied = groups_from_t_max(t_max_s, time_bases_s, tolerance)
    return np.maximum(table, implied), implied > table
