"""Hazard families across what-if variants: the group, t_max and value of whichever member applies.

Blue light is L_B for a large source and E_B for a small one, so a study across distance must follow the
switch; retinal thermal is L_R, or L_IR for a weak visual stimulus. Every study (distance, uncertainty,
remedies) evaluates variants of one product as rows of :func:`hazard.method.evaluate.evaluate` and reads them here.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from hazard.method.evaluate import Evaluation, ProductArrays, evaluate
from hazard.standards import LimitSet

__all__ = ["evaluate_rows", "family_groups", "family_member", "family_t_max", "family_values"]


def _members(ev: Evaluation, members: tuple[str, ...]):
    for symbol in members:
        h = ev.hazards[symbol]
        yield h, h.applicable & h.assessed


def _pick(ev: Evaluation, members: tuple[str, ...], part: str, empty: float) -> np.ndarray:
    """(n,) ``part`` of the applicable, assessed member at each row; ``empty`` where there is none."""
    out = np.full(ev.assessment_distance_m.size, empty)
    for h, mask in _members(ev, members):
        out[mask] = getattr(h, part)[mask]
    return out


def family_groups(ev: Evaluation, members: tuple[str, ...]) -> np.ndarray:
    """(n,) group index 0-3 of the applicable member; −1 if none."""
    return _pick(ev, members, "group_index", -1).astype(int)


def family_t_max(ev: Evaluation, members: tuple[str, ...]) -> np.ndarray:
    """(n,) t_max of the applicable member [s]; NaN where not reached or none applies."""
    return _pick(ev, members, "t_max_s", np.nan)


def family_values(ev: Evaluation, members: tuple[str, ...]) -> np.ndarray:
    """(n,) value of the applicable member [its unit]; NaN where none applies."""
    return _pick(ev, members, "value", np.nan)


def family_member(ev: Evaluation, members: tuple[str, ...], row: int) -> str | None:
    """The member that applies at ``row`` (assessed or not); None when none does."""
    return next((symbol for symbol in members if ev.hazards[symbol].applicable[row]), None)


def evaluate_rows(
    arrays: ProductArrays,
    count: int,
    limit_set: LimitSet,
    *,
    raw=None,
    raw_scale=None,
    forced_distance_m=None,
    size_scale=None,
) -> Evaluation:
    """Evaluate ``count`` variants of the single product in ``arrays``.

    Parameters
    ----------
    arrays : ProductArrays
        One product.
    raw : numpy.ndarray, optional
        (count, k) integrals to use instead of the product's (e.g. of a wavelength-shifted spectrum).
    raw_scale : numpy.ndarray, optional
        (count,) multiplier of its integrals (dimming, a filter, a scale uncertainty) [1].
    forced_distance_m : numpy.ndarray, optional
        (count,) distances to assess at [m].
    size_scale : numpy.ndarray, optional
        (count,) multiplier of the source's linear size, same emitted power (a diffuser) [1]. A measured
        radiance falls by its square; a measured irradiance is unchanged.
    """
    rows = arrays.rows(np.zeros(count, dtype=int))
    factor = np.ones(count) if raw_scale is None else np.asarray(raw_scale, dtype=float)
    shape = rows.shape
    if size_scale is not None:
        size_scale = np.asarray(size_scale, dtype=float)
        shape = type(shape)(shape.width_m * size_scale, shape.height_m * size_scale)
        factor = np.where(rows.is_radiance, factor / size_scale**2, factor)
    raw = (rows.raw if raw is None else raw) * factor[:, None]
    anchor = rows.anchor_photometric * factor  # a relative spectrum's anchor scales with it
    forced = rows.forced_distance_m if forced_distance_m is None else np.asarray(forced_distance_m, dtype=float)
    variant = dataclasses.replace(  # every other field (pulses, peak-to-mean) as the product has it
        rows,
        raw=raw,
        shape=shape,
        anchor_photometric=anchor,
        luminous_intensity_cd=rows.luminous_intensity_cd * factor,
        forced_distance_m=forced,
    )
    return evaluate(variant, limit_set)
