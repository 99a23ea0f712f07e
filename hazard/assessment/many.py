"""``assess_many``: many products at once, as a pandas DataFrame (one row per product).

The same method as :func:`hazard.assess` (the arrays of :mod:`hazard.method.evaluate`), without building a
result object per product. Spectra come either from the records' files, or as one in-memory matrix on a
common grid, which goes through one BLAS matrix product per chunk (:func:`hazard.method.integrals.integrate_matrix`).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from hazard.assessment.pipeline import BatchEvaluation, evaluate_loaded, evaluate_products
from hazard.errors import InputError
from hazard.inputs.loading import LoadedProduct, load_product, product_from_record
from hazard.inputs.record import ProductRecord, load_record, record_from_fields
from hazard.inputs.spectrum import VALUE_RULES, value_rule_broken
from hazard.inputs.units import parse_spectral_unit
from hazard.method.evaluate import integral_index
from hazard.method.integrals import integrate_matrix
from hazard.standards import DEFAULT_LIMIT_SET, GROUPS, LimitSet

__all__ = ["assess_many", "frame_columns"]


def frame_columns(limit_set: LimitSet = DEFAULT_LIMIT_SET) -> list[str]:
    """Columns of the DataFrame that :func:`assess_many` returns."""
    columns = [
        "id",
        "status",
        "error",
        "risk_group",
        "complete",
        "basis",
        "standard_risk_group",
        "assessment_distance_mm",
        "alpha_rad",
        "illuminance_lx",
        "luminance_cd_m2",
        "cct_k",
        "duv",
        "small_source",
        "weak_visual_stimulus",
    ]
    for h in limit_set.hazards:
        columns += [
            f"{h.symbol}_{part}"
            for part in ("applicable", "assessed", "value", "group", "lower_bound_group", "t_max_s")
        ]
        columns += [f"{h.symbol}_margin_{g}" for g in limit_set.boundaries]
    return columns


def _record(item, i: int) -> ProductRecord:
    """A record from what the caller gave (product ``i``)."""
    origin = f"record {i + 1}"
    if isinstance(item, (str, Path)):
        return load_record(item)
    if isinstance(item, dict):
        fields = {k: v for k, v in item.items() if v is not None and not (isinstance(v, float) and np.isnan(v))}
        return record_from_fields(fields, path=origin)
    if isinstance(item, ProductRecord):
        return item
    raise TypeError(f"{origin}: expected a ProductRecord, a dict of record fields or a path, got {type(item)}")


def _loaded(item, i: int) -> LoadedProduct:
    """A record and its spectrum from what the caller gave (product ``i``)."""
    if isinstance(item, (str, Path)):
        return load_product(item)
    return product_from_record(_record(item, i), Path.cwd(), f"record {i + 1}")


def _id_of(item, prepared) -> str:
    if isinstance(prepared, LoadedProduct):
        return prepared.record.id
    if isinstance(prepared, ProductRecord):
        return prepared.id
    return str(item.get("id")) if isinstance(item, dict) else str(getattr(item, "id", item))


def _check_grid(wavelength_nm: np.ndarray | None, spectra: np.ndarray) -> None:
    """The common grid must be 1-D, strictly increasing and match the spectra's columns."""
    grid = np.asarray(wavelength_nm, dtype=float)
    if grid.ndim != 1 or spectra.ndim != 2 or spectra.shape[1] != grid.size:
        raise ValueError(f"spectra must be (n, {grid.size}) for a grid of {grid.size} wavelengths, got {spectra.shape}")
    if not np.all(np.diff(grid) > 0):
        raise ValueError("wavelength_nm must be strictly increasing [nm]")


NO_LIGHT_TO_ANCHOR = "a relative spectrum with no light within V(λ) cannot be scaled by a photometric anchor"


def _distinct(records) -> tuple[list, list[str], np.ndarray]:
    """(distinct records without their ids, ids, index of each product's distinct record).

    Products that share every field but the id share one validation: batches measured on one set-up
    validate once.
    """
    if hasattr(records, "to_dict"):
        fields = records.drop(columns=["id"], errors="ignore")
        ids = records["id"].astype(str).tolist() if "id" in records else [""] * len(records)
        if fields.shape[1] == 0:
            return [{}], ids, np.zeros(len(records), dtype=int)
        index = fields.groupby(list(fields.columns), dropna=False, sort=False).ngroup().to_numpy()
        return fields.drop_duplicates().to_dict("records"), ids, index
    items = list(records)
    ids = [_id_of(item, None) for item in items]
    return items, ids, np.arange(len(items))


def _frame(batch: BatchEvaluation | None, ids: list[str], good: list[int], errors: dict[int, str], limit_set: LimitSet):
    import pandas as pd

    n = len(ids)

    def spread(values, numeric: bool = True):
        if len(good) == n:
            return values
        out = np.full(n, np.nan) if numeric else np.full(n, None, dtype=object)
        if good:
            out[good] = values
        return out

    def groups(codes: np.ndarray):
        """Group names as a categorical column (codes −1: none), cheap for 10⁵ rows."""
        full = np.full(n, -1)
        full[good] = codes
        return pd.Categorical.from_codes(full, categories=pd.Index(GROUPS))

    data = {
        "id": ids,
        "status": ["error" if i in errors else "ok" for i in range(n)],
        "error": [errors.get(i) for i in range(n)],
    }
    if batch is not None:
        ev = batch.evaluation
        what_if = batch.what_if
        data.update(
            {
                "risk_group": groups(ev.group_index),
                "complete": spread(ev.complete, False),
                "basis": spread(np.where(what_if, "what-if", "standard"), False),
                "standard_risk_group": groups(np.where(what_if, batch.standard.group_index, -1)),
                "assessment_distance_mm": spread(ev.assessment_distance_m * 1e3),
                "alpha_rad": spread(ev.alpha_rad),
                "illuminance_lx": spread(ev.illuminance_lx),
                "luminance_cd_m2": spread(ev.luminance_cd_m2),
                "cct_k": spread(batch.cct_k),
                "duv": spread(batch.duv),
                "small_source": spread(ev.small_source, False),
                "weak_visual_stimulus": spread(ev.weak_visual_stimulus, False),
            }
        )
        for symbol, h in ev.hazards.items():
            grouped = h.hazard.limits is not None
            data[f"{symbol}_applicable"] = spread(h.applicable, False)
            data[f"{symbol}_assessed"] = spread(h.assessed, False)
            data[f"{symbol}_value"] = spread(np.where(h.assessed, h.value, np.nan))
            data[f"{symbol}_group"] = groups(np.where(h.assessed & grouped, h.group_index, -1))
            data[f"{symbol}_lower_bound_group"] = groups(np.where(h.lower_bound_index >= 1, h.lower_bound_index, -1))
            data[f"{symbol}_t_max_s"] = spread(np.where(h.assessed, h.t_max_s, np.nan))
            for k, g in enumerate(limit_set.boundaries):
                margin = h.compared[:, k] / h.limits[:, k] if grouped else np.nan
                data[f"{symbol}_margin_{g}"] = spread(np.where(h.assessed, margin, np.nan))
    return pd.DataFrame(data, columns=frame_columns(limit_set))


def assess_many(
    records,
    wavelength_nm: np.ndarray | None = None,
    spectra: np.ndarray | None = None,
    limit_set: LimitSet = DEFAULT_LIMIT_SET,
):
    """Pre-screen many products; one row per product, in the order given.

    Parameters
    ----------
    records : list or pandas.DataFrame
        Product records: ``ProductRecord`` objects, dicts of record fields, paths of TOML records, or a
        DataFrame whose columns are record fields. Record spectrum paths are relative to the working folder.
    wavelength_nm : numpy.ndarray, optional
        (m,) common grid of ``spectra`` [nm].
    spectra : numpy.ndarray, optional
        (n, m) spectral values in each record's unit, one row per record (float32 halves the memory);
        when given, the records' ``spectrum`` files are not read.
    limit_set : LimitSet

    Returns
    -------
    pandas.DataFrame
        Columns :func:`frame_columns`. A product that fails validation has ``status == "error"`` and its
        reason in ``error``; values of hazards that do not apply or were not assessed are NaN.
    """
    if spectra is None:
        items = records.to_dict("records") if hasattr(records, "to_dict") else list(records)
        errors: dict[int, str] = {}
        loaded: dict[int, LoadedProduct] = {}
        for i, item in enumerate(items):
            try:
                loaded[i] = _loaded(item, i)
            except InputError as exc:
                errors[i] = str(exc)
        ids = [_id_of(item, loaded.get(i)) for i, item in enumerate(items)]
        good = sorted(loaded)
        batch = evaluate_loaded([loaded[i] for i in good], limit_set) if good else None
        return _frame(batch, ids, good, errors, limit_set)
    _check_grid(wavelength_nm, spectra)  # first: a 1-D array has no row count to compare
    distinct, ids, index = _distinct(records)
    if len(ids) != spectra.shape[0]:
        raise ValueError(f"{len(ids)} records but {spectra.shape[0]} spectra")
    validated: list[ProductRecord | str] = []
    for k, item in enumerate(distinct):
        try:
            record = _record({"id": "-", **item} if isinstance(item, dict) else item, k)
            validated.append(record)
        except InputError as exc:
            validated.append(str(exc))
    is_record = [isinstance(r, ProductRecord) for r in validated]
    factors = np.array(
        [parse_spectral_unit(r.unit_text).factor_to_si if isinstance(r, ProductRecord) else 1.0 for r in validated]
    )[index]
    flags = np.array([isinstance(r, ProductRecord) and r.no_emission_outside for r in validated])[index]
    integrated, peak, lowest = integrate_matrix(
        np.asarray(wavelength_nm, dtype=float), spectra, flags, limit_set, factors
    )
    visual = integrated.raw[:, integral_index(limit_set)["V"]]
    quantity = np.array([r.quantity if isinstance(r, ProductRecord) else "relative" for r in validated])[index]
    relative = quantity == "relative"
    with np.errstate(over="ignore", invalid="ignore"):
        broken = value_rule_broken(peak, lowest, peak * factors, quantity)
    valid_values = (broken < 0) & ~(relative & ~(visual > 0))
    errors = {}
    for i in np.flatnonzero(~np.array(is_record)[index] | ~valid_values | (np.array(ids) == "")).tolist():
        problem = validated[index[i]]
        if isinstance(problem, str):
            errors[i] = f"{ids[i]}: {problem}"
        elif not ids[i]:
            errors[i] = f"record {i + 1}: the id is empty; fix: give every product an id"
        else:
            problem = VALUE_RULES[broken[i]] if broken[i] >= 0 else NO_LIGHT_TO_ANCHOR
            errors[i] = f"{ids[i]}: {problem}; fix: correct or remove this spectrum"
    good = [i for i in range(len(ids)) if i not in errors]
    if not good:
        return _frame(None, ids, good, errors, limit_set)
    if len(good) < len(ids):
        integrated = integrated.rows(good)
    usable = [k for k, ok in enumerate(is_record) if ok]
    renumber = np.full(len(validated), -1)
    renumber[usable] = np.arange(len(usable))
    records_used = [r for r in validated if isinstance(r, ProductRecord)]  # in the order of ``usable``
    batch = evaluate_products(records_used, integrated, limit_set, renumber[index[good]])
    return _frame(batch, ids, good, errors, limit_set)
