"""The method on arrays: from weighted integrals to values, limits, groups and t_max (method §1, §3, §4).

Everything here works on many products at once (one row each), so that the single-product path
(:func:`hazard.assessment.build.assess`) and the batch path share one implementation of the physics.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from hazard.method.classify import hazard_groups
from hazard.method.exposure_time import time_to_limit_s
from hazard.method.geometry import (
    GLS_ILLUMINANCE_LX,
    MIN_ASSESSMENT_DISTANCE_M,
    FieldGeometry,
    SourceShape,
)
from hazard.method.photometry import K_M_LM_PER_W, VISIBLE_BAND_NM
from hazard.method.pulses import PulseArrays, pulse_checks
from hazard.standards import Hazard, LimitSet

VISIBLE_RADIATION_NM = (380.0, 780.0)
"""Visible radiation (CIE S 017, 17-21-003), for the share of the emission that is light [nm]."""
OPTICAL_RANGE_NM = (200.0, 3000.0)
"""Where the hazard bands lie; the measured part of it is the emission the share is taken of [nm]."""
MAINLY_VISIBLE_SHARE = 0.5
"""A source is mainly visible when at least this share of its measured 200-3000 nm emission is visible
radiation; only then do the blue-light transfer values of IEC TR 62778 (made for white-light sources) apply
(our rule, no published source) [1]."""

__all__ = [
    "MAINLY_VISIBLE_SHARE",
    "OPTICAL_RANGE_NM",
    "VISIBLE_RADIATION_NM",
    "Evaluation",
    "HazardArrays",
    "IntegralSpec",
    "ProductArrays",
    "evaluate",
    "integral_index",
    "integral_specs",
    "share_key",
]


@dataclass(frozen=True)
class IntegralSpec:
    """One weighted integral the method needs: a key, a band [nm] and a weighting table (or None)."""

    key: str
    band_nm: tuple[float, float]
    table: str | None


def share_key(symbol: str, share: str) -> str:
    """Key of the integral of a hazard's sub-band (a :class:`~hazard.standards.BandShare` without steps)."""
    return f"{symbol}|{share}"


def integral_specs(limit_set: LimitSet) -> list[IntegralSpec]:
    """The integrals of a limit set.

    One per hazard, ``V`` for photometry, one per sub-band share of a hazard (weighted as the hazard, for cautions),
    ``VIS`` and ``ALL`` (unweighted 380-780 nm and 200-3000 nm, for the share of visible radiation).
    """
    specs = [IntegralSpec(h.symbol, h.band_nm, h.table) for h in limit_set.hazards]
    specs.append(IntegralSpec("V", VISIBLE_BAND_NM, "v_photopic"))
    specs += [
        IntegralSpec(share_key(h.symbol, share.name), share.band_nm, h.table)
        for h in limit_set.hazards
        for share in h.shares
        if share.step_nm is None
    ]
    return [*specs, IntegralSpec("VIS", VISIBLE_RADIATION_NM, None), IntegralSpec("ALL", OPTICAL_RANGE_NM, None)]


def integral_index(limit_set: LimitSet) -> dict[str, int]:
    """Column of each integral key in the (n, k) arrays of :func:`integral_specs`."""
    return {spec.key: k for k, spec in enumerate(integral_specs(limit_set))}


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
    gap_free : numpy.ndarray
        (n, k) the integral has no wide gap between samples, so over the measured part it is a lower bound of the
        band's value (:class:`~hazard.method.integrals.Integrated`).
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
    pulse_duration_s : numpy.ndarray, optional
        (n,) half-peak width of each pulse of a pulsed source, whose ``raw`` integrals are then of its peak
        (on-state) spectrum [s]; NaN (or not given) for a continuous source.
    pulse_rate_hz : numpy.ndarray, optional
        (n,) pulse rate of a pulse train [Hz]; NaN (or not given) for a single pulse or a continuous source.
    radiance_fill : numpy.ndarray, optional
        (n,) for a measured radiance, the factor by which the reading understates the source's own radiance: a
        meter whose field of view is wider than the source averages over its whole field, so the source's
        radiance is the reading × Ω_fov/Ω_s (method §4, L_γ = E/max(Ω_s, Ω_γ), read backwards) [1]. Ones when
        not given.
    """

    raw: np.ndarray
    covered: np.ndarray
    gap_free: np.ndarray
    is_radiance: np.ndarray
    measurement_distance_m: np.ndarray
    shape: SourceShape
    is_gls: np.ndarray
    anchor_photometric: np.ndarray
    luminous_intensity_cd: np.ndarray
    peak_to_mean: np.ndarray | None = None
    forced_distance_m: np.ndarray | None = None
    pulse_duration_s: np.ndarray | None = None
    pulse_rate_hz: np.ndarray | None = None
    radiance_fill: np.ndarray | None = None

    def rows(self, index: np.ndarray) -> ProductArrays:
        """The products at ``index`` (repeats allowed), e.g. one product many times for a what-if sweep."""

        def pick(a):
            return None if a is None else a[index]

        return ProductArrays(
            raw=self.raw[index],
            covered=self.covered[index],
            gap_free=self.gap_free[index],
            is_radiance=self.is_radiance[index],
            measurement_distance_m=self.measurement_distance_m[index],
            shape=self.shape.take(index),
            is_gls=self.is_gls[index],
            anchor_photometric=self.anchor_photometric[index],
            luminous_intensity_cd=self.luminous_intensity_cd[index],
            peak_to_mean=pick(self.peak_to_mean),
            forced_distance_m=pick(self.forced_distance_m),
            pulse_duration_s=pick(self.pulse_duration_s),
            pulse_rate_hz=pick(self.pulse_rate_hz),
            radiance_fill=pick(self.radiance_fill),
        )


@dataclass(frozen=True)
class HazardArrays:
    """Results of one hazard for n products. Group indices: 0 Exempt … 3 RG3, −1 none.

    ``limits``, ``compared``, ``alpha_bounded`` are (n, 3) over Exempt, RG1, RG2; NaN where not defined.
    ``raised_by_t_max`` marks groups raised to agree with t_max (:mod:`hazard.method.classify`). For pulsed
    sources ``pulse`` holds the pulse check (:mod:`hazard.method.pulses`) and the values, limits and t_max are
    those of the time-averaged spectrum of a train (of the peak of a single pulse, whose group comes from the
    pulse check alone).
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
    raised_by_t_max: np.ndarray
    lower_bound_index: np.ndarray
    pulse: PulseArrays | None = None

    def at_least(self) -> np.ndarray:
        """(n,) the group this hazard is known to reach (−1: nothing known).

        Its group where assessed, else a lower bound above Exempt from the measured part of its band.
        """
        return np.maximum(self.group_index, np.where(self.lower_bound_index >= 1, self.lower_bound_index, -1))


@dataclass(frozen=True)
class Evaluation:
    """Results for n products: geometry, photometry and every hazard.

    ``group_index`` is the highest group over the assessed hazards with groups, −1 where there is none (no
    group determined); ``complete`` is false where an applicable hazard could not be assessed.
    """

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
    mainly_visible: np.ndarray
    viewed: Viewed
    pulsed: np.ndarray
    single_pulse: np.ndarray
    pulse_duration_s: np.ndarray
    pulse_rate_hz: np.ndarray


def _assessment_distance_m(arrays: ProductArrays, v_raw: np.ndarray) -> np.ndarray:
    """200 mm, or for GLS lamps the distance giving 500 lx but not less than 200 mm (IEC 62471:2006, 5.1.2)."""
    d_m = arrays.measurement_distance_m
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):  # a tiny luminance needs no finite sr
        lum_or_illum = K_M_LM_PER_W * v_raw
        from_irradiance = d_m * np.sqrt(lum_or_illum / GLS_ILLUMINANCE_LX)
        needed_sr = np.where(lum_or_illum > 0, GLS_ILLUMINANCE_LX / lum_or_illum, np.inf)
    d500 = from_irradiance
    solve = np.flatnonzero(arrays.is_radiance & arrays.is_gls)
    if solve.size:
        d500 = d500.copy()
        d500[solve] = arrays.shape.take(solve).distance_for_solid_angle_m(needed_sr[solve])
    return np.where(arrays.is_gls, np.fmax(MIN_ASSESSMENT_DISTANCE_M, np.nan_to_num(d500)), MIN_ASSESSMENT_DISTANCE_M)


def _applicable(hazard: Hazard, limit_set: LimitSet, alpha: np.ndarray, luminance: np.ndarray) -> np.ndarray:
    small = alpha < limit_set.small_source_alpha_rad
    weak = luminance < limit_set.weak_stimulus_luminance_cd_m2
    return {
        "always": np.ones_like(small),
        "small_source": small,
        "large_source": ~small,
        "weak_visual_stimulus": weak,
        "visual_stimulus": ~weak,
    }[hazard.applies]


@dataclass(frozen=True)
class Viewed:
    """The products as seen at their assessment distance: what every hazard's comparison needs.

    What depends only on the geometry (each field of view's share of the source, each pair of α bounds) is computed
    once per object and reused by every hazard and boundary that asks for it.
    """

    irradiance: dict[str, np.ndarray]
    shape: SourceShape
    distance_m: np.ndarray
    field: FieldGeometry
    peak_to_mean: np.ndarray
    _geometry: dict = dataclasses.field(default_factory=dict, init=False, repr=False, compare=False)

    @property
    def omega_s(self) -> np.ndarray:
        """Source solid angle [sr]."""
        return self.field.omega_s

    def value(self, symbol: str) -> np.ndarray:
        """Irradiance of a quantity at the assessment distance [W m⁻²]."""
        return self.irradiance[symbol]

    def radiance(self, symbol: str) -> np.ndarray:
        """The source's own (peak) radiance of a quantity, E/Ω_s × peak-to-mean [W m⁻² sr⁻¹]."""
        return self.irradiance[symbol] / self.omega_s * self.peak_to_mean

    def field_radiance(self, symbol: str, fov_rad: np.ndarray | float, rows: np.ndarray | None = None) -> np.ndarray:
        """Radiance averaged over a field of view γ centred on the source [W m⁻² sr⁻¹] (method §4).

        For all products or those at ``rows``.

        L·f for a uniform source, f the fraction of the field the source fills; with a peak-to-mean ratio p
        the field may see p·L over what it covers, but never more than all of the source's power:
        (E/Ω_s)·min(p·f, Ω_s/Ω_γ).
        """
        if rows is None and np.ndim(fov_rad) == 0:  # one field for all: its share is kept for the next hazard
            key = ("field", float(fov_rad))
            if key not in self._geometry:
                self._geometry[key] = self._seen_share(self.field, slice(None), fov_rad)
            return self.irradiance[symbol] / self.field.omega_s * self._geometry[key]
        take = slice(None) if rows is None else rows
        seen = self.field if rows is None else self.field.take(rows)
        return self.irradiance[symbol][take] / seen.omega_s * self._seen_share(seen, take, fov_rad)

    def _seen_share(self, seen: FieldGeometry, take: slice | np.ndarray, fov_rad: np.ndarray | float) -> np.ndarray:
        """min(p·f, Ω_s/Ω_γ) of :meth:`field_radiance` for the products ``take`` seen as ``seen`` [1]."""
        fraction, omega_g = seen.fraction_and_cone(fov_rad)  # Ω_γ once, for the share and for the ceiling
        return np.minimum(self.peak_to_mean[take] * fraction, seen.omega_s / omega_g)

    def alpha(self, bounds_rad: tuple[float, float]) -> np.ndarray:
        """α with each side bounded first, then averaged (method §4) [rad]; kept per pair of bounds."""
        key = ("alpha", bounds_rad)
        if key not in self._geometry:
            self._geometry[key] = self.shape.alpha_rad(self.distance_m, bounds_rad)
        return self._geometry[key]


def _hazard_arrays(
    hazard: Hazard,
    limit_set: LimitSet,
    viewed: Viewed,
    covered: np.ndarray,
    gap_free: np.ndarray,
    alpha: np.ndarray,
    luminance: np.ndarray,
    luminance_known: np.ndarray,
    bounds_valid: np.ndarray,
) -> HazardArrays:
    """One hazard for n products; where its band is only partly measured, the group of the measured part.

    That part's integral is at most the band's value (non-negative spectra and weights), and the top-down reading
    only rises with the values compared, so its group is a lower bound of the hazard's group. Only where
    ``bounds_valid`` (nothing else rests on a partly measured V(λ): the scale of a relative spectrum, the 500 lx
    distance of a GLS lamp), and not for the weak-stimulus hazard while the luminance that selects it is itself
    only partly measured (``luminance_known``).
    """
    n = alpha.size
    nan3 = np.full((n, 3), np.nan)
    radiance = hazard.kind == "radiance"
    value = viewed.radiance(hazard.symbol) if radiance else viewed.value(hazard.symbol)
    t_max = time_to_limit_s(hazard, n, viewed.value, viewed.field_radiance, viewed.alpha)
    compared, limits, alpha_bounded = nan3.copy(), nan3.copy(), nan3.copy()
    group, raised = np.full(n, -1), np.zeros(n, dtype=bool)
    if hazard.limits is not None and hazard.time_bases_s is not None:  # both or neither (Hazard)
        fovs, bounds = hazard.fov_rad or (), hazard.alpha_bounds_rad or ()
        for k, coefficient in enumerate(hazard.limits):
            compared[:, k] = viewed.field_radiance(hazard.symbol, fovs[k]) if radiance else value
            if hazard.limits_over_alpha:
                alpha_bounded[:, k] = viewed.alpha(bounds[k])
                limits[:, k] = coefficient / alpha_bounded[:, k]
            else:
                limits[:, k] = coefficient
        group, raised = hazard_groups(compared, limits, t_max, hazard.time_bases_s, limit_set.table_rounding)
    applicable = _applicable(hazard, limit_set, alpha, luminance)
    assessed = applicable & covered
    partial = applicable & ~covered & gap_free & bounds_valid
    if hazard.applies == "weak_visual_stimulus":
        partial &= luminance_known
    return HazardArrays(
        hazard=hazard,
        value=value,
        t_max_s=t_max,
        group_index=np.where(assessed, group, -1),
        applicable=applicable,
        assessed=assessed,
        limits=limits,
        compared=compared,
        alpha_bounded=alpha_bounded,
        raised_by_t_max=assessed & raised,
        lower_bound_index=np.where(partial, group, -1),
    )


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
    keys = integral_index(limit_set)
    v = keys["V"]
    with np.errstate(divide="ignore", invalid="ignore"):
        anchor_scale = np.where(
            np.isnan(arrays.anchor_photometric), 1.0, arrays.anchor_photometric / (K_M_LM_PER_W * arrays.raw[:, v])
        )
    n = arrays.raw.shape[0]
    pulse_duration = np.full(n, np.nan) if arrays.pulse_duration_s is None else arrays.pulse_duration_s
    rate = np.full(n, np.nan) if arrays.pulse_rate_hz is None else arrays.pulse_rate_hz
    pulsed = ~np.isnan(pulse_duration)
    train = pulsed & ~np.isnan(rate)
    peak_raw = arrays.raw * anchor_scale[:, None]  # a pulsed source's integrals are of its peak spectrum
    raw = peak_raw * np.where(train, pulse_duration * np.nan_to_num(rate), 1.0)[:, None]  # a train: time average
    distance = _assessment_distance_m(arrays, raw[:, v])
    if arrays.forced_distance_m is not None:
        distance = np.where(np.isnan(arrays.forced_distance_m), distance, arrays.forced_distance_m)
    field = arrays.shape.seen_from(distance)
    omega_s = field.omega_s
    alpha = arrays.shape.alpha_rad(distance)
    d_m = np.nan_to_num(arrays.measurement_distance_m, nan=1.0)
    fill = np.ones(n) if arrays.radiance_fill is None else arrays.radiance_fill
    scale = np.where(arrays.is_radiance, omega_s * fill, arrays.shape.irradiance_scaling(d_m, distance))
    irradiance = raw * scale[:, None]
    illuminance = K_M_LM_PER_W * irradiance[:, v]
    luminance = illuminance / omega_s
    blue = limit_set.transfer_quantity()
    transfer = _blue_light_transfer(
        arrays,
        raw[:, keys[blue]] if blue else np.full(raw.shape[0], np.nan),
        raw[:, v],
        d_m,
        limit_set.transfer_threshold_w_m2 or np.nan,
    )
    peak = np.ones(distance.size) if arrays.peak_to_mean is None else arrays.peak_to_mean
    viewed = Viewed(
        irradiance={h.symbol: irradiance[:, i] for i, h in enumerate(limit_set.hazards)},
        shape=arrays.shape,
        distance_m=distance,
        field=field,
        peak_to_mean=peak,
    )
    luminance_known = arrays.covered[:, keys["V"]]
    bounds_valid = luminance_known | (np.isnan(arrays.anchor_photometric) & ~arrays.is_gls)
    hazards = {
        h.symbol: _hazard_arrays(
            h,
            limit_set,
            viewed,
            arrays.covered[:, i],
            arrays.gap_free[:, i],
            alpha,
            luminance,
            luminance_known,
            bounds_valid,
        )
        for i, h in enumerate(limit_set.hazards)
    }
    if pulsed.any():
        peak_viewed = dataclasses.replace(
            viewed, irradiance={h.symbol: peak_raw[:, i] * scale for i, h in enumerate(limit_set.hazards)}
        )
        checks = pulse_checks(peak_viewed, limit_set, pulse_duration, rate)
        hazards = {s: _with_pulses(h, checks[s], pulsed, train, rate) for s, h in hazards.items()}
    group = np.max(np.column_stack([h.at_least() for h in hazards.values()]), axis=1)
    complete = np.all(np.column_stack([h.assessed | ~h.applicable for h in hazards.values()]), axis=1)
    visible, total = raw[:, keys["VIS"]], raw[:, keys["ALL"]]
    return Evaluation(
        assessment_distance_m=distance,
        alpha_rad=alpha,
        source_solid_angle_sr=omega_s,
        illuminance_lx=illuminance,
        luminance_cd_m2=luminance,
        small_source=alpha < limit_set.small_source_alpha_rad,
        weak_visual_stimulus=luminance < limit_set.weak_stimulus_luminance_cd_m2,
        hazards=hazards,
        group_index=group,
        complete=complete,
        anchor_scale=anchor_scale,
        mainly_visible=visible >= MAINLY_VISIBLE_SHARE * total,
        viewed=viewed,
        pulsed=pulsed,
        single_pulse=pulsed & ~train,
        pulse_duration_s=pulse_duration,
        pulse_rate_hz=rate,
        **transfer,
    )


def _with_pulses(
    h: HazardArrays, check: PulseArrays, pulsed: np.ndarray, train: np.ndarray, rate_hz: np.ndarray
) -> HazardArrays:
    """A hazard's groups with the pulse rules of :mod:`hazard.method.pulses`.

    A pulse over its limit is RG3; a single pulse within every limit is Exempt (and has no continuous t_max); a
    train within them keeps its group from the time-averaged spectrum. A train's t_max is also never longer than
    its pulses allow: 0 where one pulse exceeds its limit, and for thermal limits the time the N^−0.25 rule takes
    to reach it (N = fraction^−4 pulses at ``rate_hz``).
    """
    over = check.fraction > 1
    grouped = h.group_index >= 0
    single = pulsed & ~train
    group = np.where(grouped & over & pulsed, 3, np.where(grouped & single, 0, h.group_index))
    partial = h.lower_bound_index >= 0  # a pulse over its limit in the measured part alone is over it in the whole
    lower = np.where(partial & over & pulsed, 3, np.where(partial & single, -1, h.lower_bound_index))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):  # a pulse far within: never (inf)
        by_pulses = np.where(check.single > 1, 0.0, np.where(check.repeated > 1, check.single**-4.0 / rate_hz, np.nan))
    return dataclasses.replace(
        h,
        group_index=group,
        lower_bound_index=lower,
        t_max_s=np.where(single, np.nan, np.where(train, np.fmin(h.t_max_s, by_pulses), h.t_max_s)),
        pulse=check,
        raised_by_t_max=h.raised_by_t_max & ~single,
    )


def _blue_light_transfer(
    arrays: ProductArrays, blue: np.ndarray, visual: np.ndarray, d_m: np.ndarray, threshold_w_m2: float
) -> dict:
    """IEC TR 62778:2014 transfer quantities.

    K_B,v = E_B/E_v [W lm⁻¹], the illuminance E_thr = E_B,thr/K_B,v at which the blue-light irradiance reaches the limit
    set's threshold [lx], and the distance at which that illuminance falls, d_thr = √(I_v/E_thr) [m]. NaN where the set
    has no transfer quantity.

    I_v is the record's luminous intensity when given; otherwise E_v·d² at the measurement distance
    (inverse-square estimate) for irradiance, or L_v times the source's projected area for radiance.
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        efficacy = np.where(visual > 0, blue / (K_M_LM_PER_W * visual), np.nan)
        threshold = np.where(efficacy > 0, threshold_w_m2 / efficacy, np.nan)
        width, height = arrays.shape.width_m, arrays.shape.height_m
        area = np.where(arrays.shape.is_disc, np.pi * width**2 / 4, width * np.nan_to_num(height))
        fill = 1.0 if arrays.radiance_fill is None else arrays.radiance_fill
        estimated = np.where(arrays.is_radiance, K_M_LM_PER_W * visual * fill * area, K_M_LM_PER_W * visual * d_m**2)
        intensity = np.where(np.isnan(arrays.luminous_intensity_cd), estimated, arrays.luminous_intensity_cd)
        distance = np.sqrt(intensity / threshold)
    return {
        "blue_light_efficacy_w_per_lm": efficacy,
        "threshold_illuminance_lx": threshold,
        "luminous_intensity_cd": intensity,
        "threshold_distance_m": distance,
    }
