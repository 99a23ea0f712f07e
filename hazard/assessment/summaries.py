"""The parts of a result that summarise the input and the light.

Spectrum preview, photometry and colour, blue-light transfer values, the scaling of a relative spectrum.
"""

from __future__ import annotations

import numpy as np

from hazard.assessment.notes import anchor_text
from hazard.assessment.pipeline import BatchEvaluation, source_shape
from hazard.inputs.loading import LoadedProduct
from hazard.inputs.record import ProductRecord
from hazard.method.evaluate import Evaluation
from hazard.method.photometry import CCT_DUV_LIMIT, CCT_RANGE_K, LUMINOUS_SHARE_FLOOR
from hazard.output.formatting import format_value
from hazard.result import (
    BlueLightTransfer,
    Photometry,
    Scaling,
    SpectrumSummary,
)
from hazard.standards import LimitSet

__all__ = [
    "PREVIEW_BINS",
    "cct_reason",
    "illuminance_at_record_distance_lx",
    "optional_float",
    "photometry_summary",
    "scaling_summary",
    "spectrum_summary",
    "transfer_summary",
]


def optional_float(x) -> float | None:
    """``x`` as a float, None for NaN."""
    x = float(x)
    return None if np.isnan(x) else x


def photometry_summary(batch: BatchEvaluation, i: int, covered: bool) -> Photometry:
    """Illuminance, luminance, CCT, Duv and chromaticity of product ``i``; ``covered`` when V(λ) is covered."""
    x, y = batch.chromaticity_x[i], batch.chromaticity_y[i]
    return Photometry(
        illuminance_lx=float(batch.evaluation.illuminance_lx[i]),
        luminance_cd_m2=float(batch.evaluation.luminance_cd_m2[i]),
        cct_k=optional_float(batch.cct_k[i]),
        duv=optional_float(batch.duv[i]),
        chromaticity_xy=None if np.isnan(x) else (float(x), float(y)),
        covered=covered,
        visible_negligible=bool(batch.visible_negligible[i]),
    )


def scaling_summary(record: ProductRecord, scale: float) -> Scaling | None:
    """How a relative spectrum was scaled by its anchor (``scale`` per unit); None for an absolute spectrum."""
    anchor = record.anchor
    if record.quantity != "relative" or anchor is None:
        return None
    return Scaling(
        anchor=anchor.field,
        anchor_value=anchor.value,
        reference_distance_mm=None if anchor.is_radiance else record.reference_distance_mm,
        scale_factor=scale,
        note=anchor_text(record, scale),
    )


PREVIEW_BINS = 240
"""Bins of the chart preview kept in the result, so reports render from saved JSON."""


def _four_digits(values: np.ndarray) -> np.ndarray:
    """Values rounded to four significant digits (a chart preview needs no more) [same unit]."""
    with np.errstate(all="ignore"):  # zeros and values near the float limits keep their value
        exponent = np.floor(np.log10(np.abs(values)))
        scale = 10.0 ** np.where(np.isfinite(exponent), 3 - exponent, 0)
        rounded = np.round(values * scale) / scale
    return np.where(np.isfinite(rounded) & np.isfinite(scale), rounded, values)


def spectrum_summary(loaded: LoadedProduct, scale: float) -> SpectrumSummary:
    """Summary and a max-per-bin preview (keeps narrow lines visible) of the input spectrum.

    In SI units (a relative spectrum multiplied by its anchor's ``scale``).
    """
    spectrum = loaded.spectrum
    wl, value = spectrum.wavelength_nm, spectrum.value * scale
    edges = np.linspace(wl[0], wl[-1], PREVIEW_BINS + 1)
    index = np.clip(np.searchsorted(edges, wl, side="right") - 1, 0, PREVIEW_BINS - 1)
    binned = np.full(PREVIEW_BINS, -np.inf)
    np.maximum.at(binned, index, value)
    filled = np.isfinite(binned)
    centres = (edges[:-1] + edges[1:]) / 2
    peak = int(np.argmax(value))
    return SpectrumSummary(
        path=spectrum.path,
        quantity=loaded.record.effective_quantity,
        quantity_given=loaded.record.quantity,
        unit_given=loaded.metadata.get("unit_used", loaded.record.unit_text),
        points=int(wl.size),
        min_nm=float(wl[0]),
        max_nm=float(wl[-1]),
        peak_nm=float(wl[peak]),
        peak_value_si=float(value[peak]),
        preview_nm=np.round(centres[filled], 2).tolist(),
        preview_value_si=_four_digits(binned[filled]).tolist(),
        file_metadata=loaded.metadata.get("file_metadata", {}),
    )


def transfer_summary(
    ev: Evaluation, i: int, covered: np.ndarray, keys: dict[str, int], record: ProductRecord, limit_set: LimitSet
) -> BlueLightTransfer | None:
    """IEC TR 62778 transfer quantities, where they apply.

    They are given where the spectrum covers both the blue-light band and V(λ), the source is mainly visible (the
    report's quantities are made for white-light sources) and they are finite (a source with next to no blue light has
    no threshold worth printing). A single pulse has none: the quantities are made for continuous viewing (a
    pulse train's are those of its time average).
    """
    blue = limit_set.transfer_quantity()
    finite = all(
        np.isfinite(x[i])
        for x in (
            ev.blue_light_efficacy_w_per_lm,
            ev.threshold_illuminance_lx,
            ev.luminous_intensity_cd,
            ev.threshold_distance_m,
        )
    )
    if not (
        blue
        and not ev.single_pulse[i]
        and covered[keys[blue]]
        and covered[keys["V"]]
        and ev.mainly_visible[i]
        and finite
        and ev.blue_light_efficacy_w_per_lm[i] > 0
    ):
        return None
    if record.luminous_intensity_cd is not None:
        source = "stated in the record"
    elif record.effective_quantity == "radiance":
        source = "estimated as luminance × projected source area"
    else:
        source = f"estimated as E_v·d² at {record.reference_distance_mm:g} mm (inverse-square law)"
    return BlueLightTransfer(
        k_bv_w_per_lm=float(ev.blue_light_efficacy_w_per_lm[i]),
        threshold_illuminance_lx=float(ev.threshold_illuminance_lx[i]),
        luminous_intensity_cd=float(ev.luminous_intensity_cd[i]),
        intensity_source=source,
        threshold_distance_mm=float(ev.threshold_distance_m[i]) * 1e3,
    )


def cct_reason(batch: BatchEvaluation, i: int, v_covered: bool) -> str:
    """Why product ``i`` has no CCT (empty when it has one)."""
    if not v_covered:
        return "the spectrum does not cover V(λ)'s 360–830 nm band"
    if not batch.evaluation.illuminance_lx[i] > 0:
        return "the spectrum has no visible light"
    if batch.visible_negligible[i]:
        return (
            f"its visible emission is negligible (under {format_value(LUMINOUS_SHARE_FLOOR)} of the radiant power is "
            f"luminous)"
        )
    if np.isnan(batch.cct_k[i]):
        return (
            f"its chromaticity is too far from the Planckian locus for a CCT (|Duv| > {CCT_DUV_LIMIT:g} or "
            f"outside {CCT_RANGE_K[0]:g}–{CCT_RANGE_K[1]:g} K)"
        )
    return ""


def illuminance_at_record_distance_lx(record: ProductRecord, ev: Evaluation, i: int) -> float | None:
    """Illuminance at the record's distance_mm [lx], by the same geometry the assessment used."""
    if record.distance_mm is None:
        return None
    d_m, d_a = record.distance_mm * 1e-3, float(ev.assessment_distance_m[i])
    if record.effective_quantity == "radiance":
        return float(ev.luminance_cd_m2[i] * source_shape([record]).solid_angle_sr(d_m)[0])
    return float(ev.illuminance_lx[i] * (d_a / d_m) ** 2)
