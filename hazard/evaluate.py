"""The method on arrays: from weighted integrals to values, limits, groups and t_max (method §1, §3, §4).

Everything here works on many products at once (one row each), so that the single-product path
(:func:`hazard.engine.assess`) and the batch path share one implementation of the physics.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hazard.geometry import (
    GLS_ILLUMINANCE_LX,
    MIN_ASSESSMENT_DISTANCE_M,
    SourceShape,
    cone_solid_angle_sr,
    inverse_square_factor,
)
from hazard.hazards import Hazard, LimitSet
from hazard.photometry import K_M_LM_PER_W, VISIBLE_BAND_NM

UVC_BAND_NM = (200.0, 280.0)
"""UV-C part of the actinic band (CIE UV-C 100-280 nm, within the S_UV table) [nm]."""

__all__ = ["UVC_BAND_NM", "IntegralSpec", "integral_specs", "ProductArrays", "HazardArrays", "Evaluation", "evaluate"]


@dataclass(frozen=True)
class IntegralSpec:
    """One weighted integral the method needs: a key, a band [nm] and a weighting table (or None)."""

    key: str
    band_nm: tuple[float, float]
    table: str | None


def integral_specs(limit_set: LimitSet) -> list[IntegralSpec]:
    """The integrals of a limit set: one per hazard, then ``V`` for photometry and ``UVC`` (S_UV-weighted
    irradiance below 280 nm, for the cautions)."""
    specs = [IntegralSpec(h.symbol, h.band_nm, h.table) for h in limit_set.hazards]
    return specs + [IntegralSpec("V", VISIBLE_BAND_NM, "v_photopic"), IntegralSpec("UVC", UVC_BAND_NM, "s_uv")]


@dataclass(frozen=True)
class ProductArrays:
    """Per-product inputs to :func:`evaluate`, one row per product.

    Attributes
    ----------
    raw : numpy.ndarray
        (n, k) weighted integrals of the spectrum as given, in the order of :func:`integral_specs`:
        irradiance at the measurement distance [W m⁻²] or radiance [W m⁻² sr⁻¹].
    covered : numpy.ndarray
        (n, k) the spectrum spans the integral's band, or the record says there is no emission outside.
    is_radiance : numpy.ndarray
        (n,) the spectrum is a radiance.
    measurement_distance_m : numpy.ndarray
        (n,) measurement distance [m]; NaN where not given (radiance).
    shape : SourceShape
        Source sizes [m].
    is_gls : numpy.ndarray
        (n,) general lighting service lamp (500 lx rule).
    anchor_photometric : numpy.ndarray
        (n,) for a relative spectrum, the photometric value it must reproduce: illuminance at the
        measurement distance [lx] or luminance [cd m⁻²]; NaN for an absolute spectrum.
    luminous_intensity_cd : numpy.ndarray
        (n,) luminous intensity when the record states it [cd]; NaN otherwise.
    peak_to_mean : numpy.ndarray, optional
        (n,) peak-to-mean radiance of the source (≥ 1): fields of view smaller than the source see the
        peak, not the average [1]. Ones when not given.
    forced_distance_m : numpy.ndarray, optional
        (n,) assess at this distance instead of the standard's rule [m]; NaN (or not given) for the rule.
    """

    raw: np.ndarray
    covered: np.ndarray
    is_radiance: np.ndarray
    measurement_distance_m: np.ndarray
    shape: SourceShape
    is_gls: np.ndarray
    anchor_photometric: np.ndarray
    luminous_intensity_cd: np.ndarray
    peak_to_mean: np.ndarray | None = None
    forced_distance_m: np.ndarray | None = None

    def rows(self, index: np.ndarray) -> "ProductArrays":
        """The products at ``index`` (repeats allowed), e.g. one product many times for a what-if sweep."""
        def pick(a):
            return None if a is None else a[index]
        return ProductArrays(raw=self.raw[index], covered=self.covered[index], is_radiance=self.is_radiance[index],
                             measurement_distance_m=self.measurement_distance_m[index],
                             shape=self.shape.take(index), is_gls=self.is_gls[index],
                             anchor_photometric=self.anchor_photometric[index],
                             luminous_intensity_cd=self.luminous_intensity_cd[index],
                             peak_to_mean=pick(self.peak_to_mean), forced_distance_m=pick(self.forced_distance_m))


@dataclass(frozen=True)
class HazardArrays:
    """Results of one hazard for n products. Group indices: 0 Exempt … 3 RG3, −1 none.

    ``limits``, ``compared``, ``alpha_bounded`` are (n, 3) over Exempt, RG1, RG2; NaN where not defined.
    """

    hazard: Hazard
    value: np.ndarray
    t_max_s: np.ndarray
    group_index: np.ndarray
    applicable: np.ndarray
    assessed: np.ndarray
    limits: np.ndarray
    compared: np.ndarray
    alpha_bounded: np.ndarray


@dataclass(frozen=True)
class Evaluation:
    """Results for n products: geometry, photometry and every hazard."""

    assessment_distance_m: np.ndarray
    alpha_rad: np.ndarray
    source_solid_angle_sr: np.ndarray
    illuminance_lx: np.ndarray
    luminance_cd_m2: np.ndarray
    small_source: np.ndarray
    weak_visual_stimulus: np.ndarray
    hazards: dict[str, HazardArrays]
    group_index: np.ndarray
    complete: np.ndarray
    anchor_scale: np.ndarray
    blue_light_efficacy_w_per_lm: np.ndarray
    threshold_illuminance_lx: np.ndarray
    luminous_intensity_cd: np.ndarray
    threshold_distance_m: np.ndarray


def _assessment_distance_m(arrays: ProductArrays, v_raw: np.ndarray) -> np.ndarray:
    """200 mm, or for GLS lamps the distance giving 500 lx but not less than 200 mm (IEC 62471:2006, 5.1.2)."""
    d_m = arrays.measurement_distance_m
    with np.errstate(divide="ignore", invalid="ignore"):
        lum_or_illum = K_M_LM_PER_W * v_raw
        from_irradiance = d_m * np.sqrt(lum_or_illum / GLS_ILLUMINANCE_LX)
        needed_sr = np.where(lum_or_illum > 0, GLS_ILLUMINANCE_LX / lum_or_illum, np.inf)
    d500 = from_irradiance
    solve = np.flatnonzero(arrays.is_radiance & arrays.is_gls)
    if solve.size:
        d500 = d500.copy()
        d500[solve] = arrays.shape.take(solve).distance_for_solid_angle_m(needed_sr[solve])
    return np.where(arrays.is_gls, np.fmax(MIN_ASSESSMENT_DISTANCE_M, np.nan_to_num(d500)),
                    MIN_ASSESSMENT_DISTANCE_M)


def _t_max_s(hazard: Hazard, value: np.ndarray, alpha: np.ndarray) -> np.ndarray:
    """t = (value / C)^(1/k) where below the top of the limit's time range, else NaN [s]."""
    limit = hazard.exposure_limit
    if limit is None:
        return np.full(value.shape, np.nan)
    c = limit.coefficient / np.clip(alpha, *limit.alpha_bounds_rad) if limit.over_alpha else limit.coefficient
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):  # huge t is simply "not reached"
        t = (value / c) ** (1.0 / limit.exponent)
    return np.where((value > 0) & (t < limit.t_range_s[1]), t, np.nan)


def _applicable(hazard: Hazard, limit_set: LimitSet, alpha: np.ndarray, luminance: np.ndarray) -> np.ndarray:
    small = alpha < limit_set.small_source_alpha_rad
    weak = luminance < limit_set.weak_stimulus_luminance_cd_m2
    return {"always": np.ones_like(small), "small_source": small, "large_source": ~small,
            "weak_visual_stimulus": weak, "visual_stimulus": ~weak}[hazard.applies]


def _hazard_arrays(hazard: Hazard, limit_set: LimitSet, irradiance: np.ndarray, covered: np.ndarray,
                   arrays: ProductArrays, distance_m: np.ndarray, omega_s: np.ndarray, alpha: np.ndarray,
                   luminance: np.ndarray) -> HazardArrays:
    n = irradiance.size
    nan3 = np.full((n, 3), np.nan)
    if hazard.kind == "radiance":
        peak = np.ones(n) if arrays.peak_to_mean is None else arrays.peak_to_mean
        value = irradiance / omega_s * peak  # the peak radiance: what a small field of view can see
        compared = nan3.copy() if hazard.fov_rad is None else np.column_stack(
            [irradiance / np.maximum(omega_s, fov) * np.where(fov < omega_s, peak, 1.0)
             for fov in (cone_solid_angle_sr(g) for g in hazard.fov_rad)])
    else:
        value = irradiance
        compared = np.repeat(value[:, None], 3, axis=1)
    limits, alpha_bounded = nan3.copy(), nan3.copy()
    group = np.full(n, -1)
    if hazard.limits is not None:
        for g, coefficient in enumerate(hazard.limits):
            if hazard.limits_over_alpha:
                alpha_bounded[:, g] = arrays.shape.alpha_rad(distance_m, hazard.alpha_bounds_rad[g])
                limits[:, g] = coefficient / alpha_bounded[:, g]
            else:
                limits[:, g] = coefficient
        within = compared <= limits
        group = np.where(within[:, 0], 0, np.where(within[:, 1], 1, np.where(within[:, 2], 2, 3)))
    applicable = _applicable(hazard, limit_set, alpha, luminance)
    assessed = applicable & covered
    return HazardArrays(hazard=hazard, value=value, t_max_s=_t_max_s(hazard, value, alpha),
                        group_index=np.where(assessed, group, -1), applicable=applicable, assessed=assessed,
                        limits=limits, compared=compared, alpha_bounded=alpha_bounded)


def evaluate(arrays: ProductArrays, limit_set: LimitSet) -> Evaluation:
    """Apply the method to n products.

    Parameters
    ----------
    arrays : ProductArrays
    limit_set : LimitSet

    Returns
    -------
    Evaluation
    """
    keys = [spec.key for spec in integral_specs(limit_set)]
    v, b = keys.index("V"), keys.index("L_B")
    with np.errstate(divide="ignore", invalid="ignore"):
        anchor_scale = np.where(np.isnan(arrays.anchor_photometric), 1.0,
                                arrays.anchor_photometric / (K_M_LM_PER_W * arrays.raw[:, v]))
    raw = arrays.raw * anchor_scale[:, None]
    distance = _assessment_distance_m(arrays, raw[:, v])
    if arrays.forced_distance_m is not None:
        distance = np.where(np.isnan(arrays.forced_distance_m), distance, arrays.forced_distance_m)
    omega_s = arrays.shape.solid_angle_sr(distance)
    alpha = arrays.shape.alpha_rad(distance)
    d_m = np.nan_to_num(arrays.measurement_distance_m, nan=1.0)
    scale = np.where(arrays.is_radiance, omega_s, inverse_square_factor(d_m, distance))
    irradiance = raw * scale[:, None]
    illuminance = K_M_LM_PER_W * irradiance[:, v]
    luminance = illuminance / omega_s
    transfer = _blue_light_transfer(arrays, raw[:, b], raw[:, v], d_m)
    hazards = {h.symbol: _hazard_arrays(h, limit_set, irradiance[:, i], arrays.covered[:, i], arrays, distance,
                                        omega_s, alpha, luminance)
               for i, h in enumerate(limit_set.hazards)}
    group = np.max(np.column_stack([h.group_index for h in hazards.values()]), axis=1)
    complete = np.all(np.column_stack([h.assessed | ~h.applicable for h in hazards.values()]), axis=1)
    return Evaluation(assessment_distance_m=distance, alpha_rad=alpha, source_solid_angle_sr=omega_s,
                      illuminance_lx=illuminance, luminance_cd_m2=luminance,
                      small_source=alpha < limit_set.small_source_alpha_rad,
                      weak_visual_stimulus=luminance < limit_set.weak_stimulus_luminance_cd_m2,
                      hazards=hazards, group_index=np.maximum(group, 0), complete=complete,
                      anchor_scale=anchor_scale, **transfer)


def _blue_light_transfer(arrays: ProductArrays, blue: np.ndarray, visual: np.ndarray, d_m: np.ndarray) -> dict:
    """IEC TR 62778:2014 transfer quantities: K_B,v = E_B/E_v [W lm⁻¹], the illuminance E_thr = 1/K_B,v at
    which E_B reaches 1 W m⁻² (the small-source RG1/RG2 boundary for t_max = 100 s) [lx], and the distance at
    which that illuminance falls, d_thr = √(I_v/E_thr) [m].

    I_v is the record's luminous intensity when given; otherwise E_v·d² at the measurement distance
    (inverse-square estimate) for irradiance, or L_v times the source's projected area for radiance.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        efficacy = np.where(visual > 0, blue / (K_M_LM_PER_W * visual), np.nan)
        threshold = np.where(efficacy > 0, 1.0 / efficacy, np.nan)
        width, height = arrays.shape.width_m, arrays.shape.height_m
        area = np.where(arrays.shape.is_disc, np.pi * width ** 2 / 4, width * np.nan_to_num(height))
        estimated = np.where(arrays.is_radiance, K_M_LM_PER_W * visual * area, K_M_LM_PER_W * visual * d_m ** 2)
        intensity = np.where(np.isnan(arrays.luminous_intensity_cd), estimated, arrays.luminous_intensity_cd)
        distance = np.sqrt(intensity / threshold)
    return {"blue_light_efficacy_w_per_lm": efficacy, "threshold_illuminance_lx": threshold,
            "luminous_intensity_cd": intensity, "threshold_distance_m": distance}

