"""The method applied to many products at once.

Records and integrals are stacked into arrays and evaluated at the assessment distance (and at the standard's, for
what-if records), with chromaticity and CCT.

Data flows one way: record and spectrum (:mod:`hazard.inputs.loading`) → weighted integrals on the spectrum's own
grid (:mod:`hazard.method.integrals`) → values, limits and groups (:mod:`hazard.method.evaluate`) → results
(:mod:`hazard.assessment.build`).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from hazard.inputs.loading import LoadedProduct
from hazard.inputs.record import ProductRecord
from hazard.method.evaluate import Evaluation, ProductArrays, evaluate, integral_index
from hazard.method.geometry import SourceShape, cone_solid_angle_sr
from hazard.method.integrals import Integrated, integrate_spectra
from hazard.method.photometry import LUMINOUS_SHARE_FLOOR, cct_from_xyz
from hazard.standards import DEFAULT_LIMIT_SET, LimitSet

__all__ = [
    "BatchEvaluation",
    "anchor_photometric",
    "evaluate_loaded",
    "evaluate_products",
    "product_arrays",
    "source_shape",
]


def source_shape(records: list[ProductRecord]) -> SourceShape:
    """Source sizes of records in metres; a source given by α becomes a disc of diameter α·d."""
    width = np.array([r.source.width_mm for r in records])
    height = np.array([np.nan if r.source.height_mm is None else r.source.height_mm for r in records])
    return SourceShape(width * 1e-3, height * 1e-3)


def product_arrays(
    records: list[ProductRecord], integrated: Integrated, index: np.ndarray | None = None
) -> ProductArrays:
    """Stack records and their integrals for :func:`~hazard.method.evaluate.evaluate`.

    With ``index``, product i uses ``records[index[i]]`` (many products sharing one validated record's
    geometry); otherwise product i uses ``records[i]``.
    """
    take = np.arange(len(records)) if index is None else np.asarray(index)
    distance = np.array(
        [np.nan if r.reference_distance_mm is None else r.reference_distance_mm * 1e-3 for r in records]
    )
    shape = source_shape(records)
    return ProductArrays(
        raw=np.atleast_2d(integrated.raw),
        covered=np.atleast_2d(integrated.covered),
        gap_free=np.atleast_2d(integrated.gap_free),
        is_radiance=np.array([r.effective_quantity == "radiance" for r in records])[take],
        measurement_distance_m=distance[take],
        shape=shape.take(take),
        is_gls=np.array([r.lamp_type == "gls" for r in records])[take],
        anchor_photometric=np.array([anchor_photometric(r) for r in records])[take],
        luminous_intensity_cd=np.array(
            [np.nan if r.luminous_intensity_cd is None else r.luminous_intensity_cd for r in records]
        )[take],
        peak_to_mean=np.array([r.peak_to_mean_radiance for r in records])[take],
        forced_distance_m=np.array([np.nan if r.at_distance_mm is None else r.at_distance_mm * 1e-3 for r in records])[
            take
        ],
        pulse_duration_s=np.array([np.nan if r.pulse_duration_s is None else r.pulse_duration_s for r in records])[
            take
        ],
        pulse_rate_hz=np.array([np.nan if r.pulse_rate_hz is None else r.pulse_rate_hz for r in records])[take],
        radiance_fill=radiance_fill(records, shape, distance)[take],
    )


def radiance_fill(records: list[ProductRecord], shape: SourceShape, distance_m: np.ndarray) -> np.ndarray:
    """Per record, max(1, Ω_fov/Ω_s): how much a radiance reading understates the source's radiance [1].

    A meter with a field of view wider than the source (seen from ``distance_m``, where it measured) averages the
    source over its whole field; a narrower field reads the source's own radiance. Ones for records that are not
    a measured radiance or state no field of view.
    """
    fov = np.array(
        [
            r.measurement_fov_mrad * 1e-3 if r.effective_quantity == "radiance" and r.measurement_fov_mrad else np.nan
            for r in records
        ]
    )
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = cone_solid_angle_sr(fov) / shape.solid_angle_sr(distance_m)
    return np.where(np.isnan(ratio), 1.0, np.maximum(ratio, 1.0))


def anchor_photometric(record: ProductRecord) -> float:
    """The photometric value a relative spectrum must reproduce at its reference distance [lx or cd/m2].

    NaN for an absolute spectrum.
    """
    anchor = record.anchor
    if record.quantity != "relative" or anchor is None:
        return np.nan
    if anchor.field == "luminous_intensity_cd":
        return anchor.value / (record.irradiance_distance_mm * 1e-3) ** 2
    return anchor.value


@dataclass(frozen=True)
class BatchEvaluation:
    """Everything computed for n products: integrals, the method's arrays, and colour.

    ``standard`` is the evaluation at the standard's distance (the same object as ``evaluation`` unless a record asks
    for a what-if distance); ``what_if`` marks the products assessed at a distance of the record's choosing;
    ``visible_negligible`` those whose luminous share is under :data:`~hazard.method.photometry.LUMINOUS_SHARE_FLOOR`.
    """

    limit_set: LimitSet
    integrated: Integrated
    evaluation: Evaluation
    standard: Evaluation
    what_if: np.ndarray
    chromaticity_x: np.ndarray
    chromaticity_y: np.ndarray
    cct_k: np.ndarray
    duv: np.ndarray
    visible_negligible: np.ndarray


def evaluate_products(
    records: list[ProductRecord],
    integrated: Integrated,
    limit_set: LimitSet = DEFAULT_LIMIT_SET,
    index: np.ndarray | None = None,
) -> BatchEvaluation:
    """Apply the method to n products whose integrals are known.

    Colour only where V(λ) is covered and there is light. ``index`` maps products to ``records`` as in
    :func:`product_arrays`.
    """
    arrays = product_arrays(records, integrated, index)
    ev = evaluate(arrays, limit_set)
    standard = ev
    what_if = np.zeros(ev.group_index.size, dtype=bool)
    if arrays.forced_distance_m is not None:
        what_if = ~np.isnan(arrays.forced_distance_m)
        if what_if.any():
            standard = evaluate(dataclasses.replace(arrays, forced_distance_m=None), limit_set)
    keys = integral_index(limit_set)
    v = keys["V"]
    nan = np.full(integrated.raw.shape[0], np.nan)
    x, y, cct, duv = nan.copy(), nan.copy(), nan.copy(), nan.copy()
    luminous, radiant = integrated.raw[:, v], integrated.raw[:, keys["ALL"]]
    negligible = (luminous > 0) & (luminous < LUMINOUS_SHARE_FLOOR * radiant)
    lit = integrated.covered[:, v] & (ev.illuminance_lx > 0) & ~negligible
    if lit.any():
        x[lit], y[lit], cct[lit], duv[lit] = cct_from_xyz(integrated.xyz[lit])
    return BatchEvaluation(limit_set, integrated, ev, standard, what_if, x, y, cct, duv, negligible)


def evaluate_loaded(products: list[LoadedProduct], limit_set: LimitSet = DEFAULT_LIMIT_SET) -> BatchEvaluation:
    """Integrate and evaluate loaded products (spectra sharing a grid share one matrix product)."""
    integrated = integrate_spectra(
        [p.spectrum.wavelength_nm for p in products],
        [p.spectrum.value for p in products],
        [p.record.no_emission_outside for p in products],
        limit_set,
    )
    return evaluate_products([p.record for p in products], integrated, limit_set)
