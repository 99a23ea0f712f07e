"""``assess``: one product from record to :class:`~hazard.result.Assessment`.

Data flows one way: record and spectrum (:mod:`hazard.inputs`) → weighted integrals on the spectrum's own
grid (:mod:`hazard.method.weighting`) → values, limits and groups (:mod:`hazard.method.evaluate`) → a frozen result.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from hazard._version import __version__
from hazard.cautions import select_cautions
from hazard.claims import DEFAULT_TOLERANCES, ClaimTolerances, check_claims
from hazard.formatting import UNIT_DISPLAY, format_duration_s
from hazard.guard import require_finite
from hazard.inputs import LoadedProduct, load_product, product_from_record
from hazard.method.classify import top_down_groups
from hazard.method.evaluate import Evaluation, ProductArrays, evaluate, integral_index, share_key
from hazard.method.geometry import FIVE_TIMES_RULE, SourceShape
from hazard.method.integrals import Integrated, integrate_spectra
from hazard.method.photometry import CCT_DUV_LIMIT, CCT_RANGE_K, VISIBLE_BAND_NM, cct_from_xyz
from hazard.method.weighting import coarse_steps_in
from hazard.record import ANCHORS, ProductRecord
from hazard.result import (
    Assessment,
    BlueLightTransfer,
    Geometry,
    HazardResult,
    LimitSetInfo,
    Photometry,
    Provenance,
    Scaling,
    SpectrumSummary,
)
from hazard.standards import DEFAULT_LIMIT_SET, GROUPS, LimitSet
from hazard.studies.distances import distance_study
from hazard.studies.remedies import remedies_study
from hazard.studies.uncertainty import uncertainty_study
from hazard.units import IRRADIANCE_SI
from weighting_tables import TABLE_NAMES, load_table

__all__ = ["assess", "evaluate_loaded", "evaluate_products", "build_assessment", "BatchEvaluation", "METHOD_TEXT",
           "STEEP_REGIONS_NM", "MAX_STEEP_STEP_NM"]

METHOD_TEXT = ("The spectrum is taken as linear between its samples; each weighted integral is the exact integral "
               "of that interpolant times the weighting function as tabulated (S_UV, B, R log-linear between their "
               "points; V and the CIE 1931 colour-matching functions linear), band ends and table points inserted as "
               "nodes; weights are zero outside their tables.")
STEEP_REGIONS_NM = ((200.0, 400.0), (380.0, 500.0))
"""Where the weights change steeply: sampling coarser than :data:`MAX_STEEP_STEP_NM` is flagged [nm]."""
MAX_STEEP_STEP_NM = 5.0
PLAUSIBLE_MAX_ILLUMINANCE_LX = 200e3
"""Above this illuminance at the assessment distance a unit slip is likely (method §5) [lx]."""
PLAUSIBLE_PEAK_IRRADIANCE = (1e-9, 1e4)
"""Peak spectral irradiance outside this range suggests a unit slip by 10³ or 10⁴ (common practice, no
published source) [W m⁻² nm⁻¹]."""


def source_shape(records: list[ProductRecord]) -> SourceShape:
    """Source sizes of records in metres; a source given by α becomes a disc of diameter α·d."""
    width, height = [], []
    for r in records:
        if r.source_diameter_mm is not None:
            width.append(r.source_diameter_mm), height.append(np.nan)
        elif r.source_width_mm is not None:
            width.append(r.source_width_mm), height.append(r.source_height_mm)
        else:
            width.append(r.source_alpha_mrad * 1e-3 * r.distance_mm), height.append(np.nan)
    return SourceShape(np.array(width) * 1e-3, np.array(height) * 1e-3)


def product_arrays(records: list[ProductRecord], raw: np.ndarray, covered: np.ndarray,
                   index: np.ndarray | None = None) -> ProductArrays:
    """Stack records and their integrals for :func:`~hazard.method.evaluate.evaluate`.

    With ``index``, product i uses ``records[index[i]]`` (many products sharing one validated record's
    geometry); otherwise product i uses ``records[i]``.
    """
    take = np.arange(len(records)) if index is None else np.asarray(index)
    distance = np.array([np.nan if r.reference_distance_mm is None else r.reference_distance_mm * 1e-3
                         for r in records])
    return ProductArrays(
        raw=np.atleast_2d(raw), covered=np.atleast_2d(covered),
        is_radiance=np.array([r.effective_quantity == "radiance" for r in records])[take],
        measurement_distance_m=distance[take], shape=source_shape(records).take(take),
        is_gls=np.array([r.lamp_type == "gls" for r in records])[take],
        anchor_photometric=np.array([_anchor_photometric(r) for r in records])[take],
        luminous_intensity_cd=np.array([np.nan if r.luminous_intensity_cd is None else r.luminous_intensity_cd
                                        for r in records])[take],
        peak_to_mean=np.array([r.peak_to_mean_radiance for r in records])[take],
        forced_distance_m=np.array([np.nan if r.at_distance_mm is None else r.at_distance_mm * 1e-3
                                    for r in records])[take])


def _anchor_photometric(record: ProductRecord) -> float:
    """The photometric value a relative spectrum must reproduce at its reference distance [lx or cd/m2]."""
    if record.quantity != "relative":
        return np.nan
    if record.illuminance_lx is not None:
        return record.illuminance_lx
    if record.luminous_intensity_cd is not None:
        return record.luminous_intensity_cd / (record.reference_distance_mm * 1e-3) ** 2
    return record.luminance_cd_m2


def _higher(a: str | None, b: str | None, limit_set: LimitSet) -> str | None:
    """The higher of two groups (None: no group)."""
    ranked = [g for g in (a, b) if g is not None]
    return max(ranked, key=limit_set.groups.index) if ranked else None


def _group_name(index: int) -> str | None:
    """The group of a group index; None for −1 (no group determined)."""
    return GROUPS[int(index)] if index >= 0 else None


def _float(x) -> float | None:
    x = float(x)
    return None if np.isnan(x) else x


def _missing_text(range_nm: tuple[float, float], band: tuple[float, float]) -> str:
    gaps = []
    if range_nm[0] > band[0]:
        gaps.append(f"{band[0]:g}–{min(range_nm[0], band[1]):g} nm")
    if range_nm[1] < band[1]:
        gaps.append(f"{max(range_nm[1], band[0]):g}–{band[1]:g} nm")
    return " and ".join(gaps)


def _hazard_results(ev: Evaluation, i: int, spectrum_range: tuple[float, float], limit_set: LimitSet
                    ) -> dict[str, HazardResult]:
    boundaries = limit_set.boundaries
    results = {}
    for symbol, h in ev.hazards.items():
        if not h.applicable[i]:
            continue
        spec = h.hazard
        grouped = spec.limits is not None
        limits = {g: float(h.limits[i, k]) for k, g in enumerate(boundaries)} if grouped else {}
        compared = {g: float(h.compared[i, k]) for k, g in enumerate(boundaries)} if grouped else {}
        band = f"{spec.band_nm[0]:g}–{spec.band_nm[1]:g} nm"
        if not h.assessed[i]:
            note = (f"Not assessed: the spectrum covers {spectrum_range[0]:g}–{spectrum_range[1]:g} nm and the "
                    f"band needs {band} (missing {_missing_text(spectrum_range, spec.band_nm)}); measure the "
                    f"missing range, or set no_emission_outside if the source emits nothing there.")
        elif not grouped:
            note = f"Assessed over {band}; exposure limit only, IEC 62471 gives this hazard no risk group."
        else:
            note = f"Assessed over {band}."
        if h.assessed[i] and h.raised_by_t_max[i]:
            note += (f" The group was raised to {GROUPS[h.group_index[i]]} because the exposure limit is reached "
                     f"after {format_duration_s(float(h.t_max_s[i]))}, before the time base of the group its "
                     f"tabulated limits give: a group never reads safer than its own t_max.")
        if h.assessed[i] and any(p.exponent == 0 and p.after_s > 0 and np.isclose(h.t_max_s[i], p.after_s)
                                 for p in spec.exposure_limit.pieces):
            note += (f" The limit for exposures longer than {format_duration_s(float(h.t_max_s[i]))} is exceeded, "
                     f"so t_max is that time: any longer exposure is over the limit.")
        valid_from = spec.exposure_limit.valid_from_s
        if h.assessed[i] and h.t_max_s[i] < valid_from:
            note += (f" t_max is below the {format_duration_s(valid_from)} lower end of the limit's range, so it "
                     f"is an extrapolation: treat it as immediate.")
        results[symbol] = HazardResult(
            symbol=symbol, title=spec.title, band_nm=spec.band_nm,
            weighting=None if spec.table is None else load_table(spec.table).symbol,
            value=float(h.value[i]) if h.assessed[i] else None, unit=spec.unit,
            t_max_s=_float(h.t_max_s[i]) if h.assessed[i] else None,
            risk_group=GROUPS[h.group_index[i]] if (h.assessed[i] and grouped) else None,
            assessed=bool(h.assessed[i]), limits=limits, compared=compared if h.assessed[i] else {},
            margins={g: compared[g] / limits[g] for g in limits} if h.assessed[i] else {},
            fov_rad=dict(zip(boundaries, spec.fov_rad)) if spec.fov_rad else {},
            alpha_rad={g: float(h.alpha_bounded[i, k]) for k, g in enumerate(boundaries)}
            if spec.limits_over_alpha else {},
            time_bases_s={g: float(t) for g, t in zip(boundaries, spec.time_bases_s)} if grouped else {},
            exposure_limit=spec.exposure_limit.text, note=note)
    return results


def _photometry(batch: "BatchEvaluation", i: int, covered: bool) -> Photometry:
    x, y = batch.chromaticity_x[i], batch.chromaticity_y[i]
    return Photometry(illuminance_lx=float(batch.evaluation.illuminance_lx[i]),
                      luminance_cd_m2=float(batch.evaluation.luminance_cd_m2[i]),
                      cct_k=_float(batch.cct_k[i]), duv=_float(batch.duv[i]),
                      chromaticity_xy=None if np.isnan(x) else (float(x), float(y)), covered=covered)


SWITCH_NEIGHBOURHOOD = 1.25
"""Within this factor of a switch between family members (small source, weak visual stimulus) the result says
what the other member would give, when that is worse (our rule, no published source) [1]."""


def _switch_warnings(ev: Evaluation, i: int, limit_set: LimitSet) -> list[str]:
    """Where the source sits near a switch between members of a family and the other member reads a higher
    group: a small change of size, distance or light would change the group (the standard's own step)."""
    out = []
    for family, members in limit_set.grouped_families:
        applied = [m for m in members if ev.hazards[m].applicable[i] and ev.hazards[m].assessed[i]]
        if len(members) < 2 or not applied:
            continue
        used = ev.hazards[applied[0]]
        for other in (ev.hazards[m] for m in members if m != applied[0]):
            spec = other.hazard
            if spec.applies in ("small_source", "large_source"):
                quantity, threshold, shown = ev.alpha_rad[i], limit_set.small_source_alpha_rad, "α"
                text = f"{quantity * 1e3:.3g} mrad, switch at {threshold * 1e3:g} mrad"
            else:
                quantity, threshold, shown = ev.luminance_cd_m2[i], limit_set.weak_stimulus_luminance_cd_m2, "L_v"
                text = f"{quantity:.3g} cd/m², switch at {threshold:g} cd/m²"
            near = 1 / SWITCH_NEIGHBOURHOOD <= quantity / threshold <= SWITCH_NEIGHBOURHOOD
            reading = int(top_down_groups(other.compared[i:i + 1], other.limits[i:i + 1])[0])
            if near and reading > used.group_index[i]:
                out.append(f"{family}: {shown} = {text}; {used.hazard.symbol} applies and gives "
                           f"{limit_set.groups[used.group_index[i]]}, but {spec.symbol} would give "
                           f"{limit_set.groups[reading]}: a small change of size, distance or light changes the "
                           f"group here (the standard's own step); have the laboratory confirm it")
    return out


def _warnings(loaded: LoadedProduct, ev: Evaluation, i: int, v_covered: bool) -> list[str]:
    record, spectrum = loaded.record, loaded.spectrum
    warnings = list(spectrum.warnings)
    lo, hi = spectrum.range_nm
    if record.at_distance_mm is not None:
        warnings.append(f"assessed at {record.at_distance_mm:g} mm by request (at_distance_mm), not at the "
                        f"standard's distance: the risk groups are a what-if, not a classification")
    for region in STEEP_REGIONS_NM:
        step = coarse_steps_in(spectrum.wavelength_nm, region, MAX_STEEP_STEP_NM)
        if step is not None and lo < region[1] and hi > region[0]:
            warnings.append(f"sampling step up to {step:g} nm in {region[0]:g}–{region[1]:g} nm, where the "
                            f"weights change steeply; values there are approximate (use ≤ {MAX_STEEP_STEP_NM:g} "
                            f"nm)")
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    size_mm = record.largest_dimension_mm
    d_ref = record.reference_distance_mm
    irradiance_input = record.effective_quantity == "irradiance"
    if irradiance_input and abs(d_a_mm - d_ref) > 1e-9:
        near = min(d_a_mm, d_ref)
        if near < FIVE_TIMES_RULE * size_mm:
            warnings.append(f"inverse-square scaling from {d_ref:g} mm to {d_a_mm:.4g} mm with a "
                            f"{size_mm:g} mm source: {near:.4g} mm is under five source sizes, so the scaled "
                            f"values are approximate; measure at the assessment distance")
    if not v_covered:
        warnings.append(f"the spectrum covers {lo:g}–{hi:g} nm, not all of V(λ)'s {VISIBLE_BAND_NM[0]:g}–"
                        f"{VISIBLE_BAND_NM[1]:g} nm: illuminance and luminance are lower bounds, and so is the "
                        f"weak-visual-stimulus test")
    if ev.illuminance_lx[i] > PLAUSIBLE_MAX_ILLUMINANCE_LX:
        warnings.append(f"illuminance {ev.illuminance_lx[i]:.3g} lx at the assessment distance is above "
                        f"{PLAUSIBLE_MAX_ILLUMINANCE_LX:.0f} lx: check the unit and the distance")
    if irradiance_input:
        peak = float(spectrum.value.max() * ev.anchor_scale[i])
        if not PLAUSIBLE_PEAK_IRRADIANCE[0] <= peak <= PLAUSIBLE_PEAK_IRRADIANCE[1]:
            cause = ("the anchor (a relative spectrum with little light within V(λ) is scaled enormously)"
                     if record.quantity == "relative" else
                     f"the unit ({record.unit_text!r}); a factor of 10³ or 10⁴ is a common slip")
            warnings.append(f"peak spectral irradiance {peak:.3g} {UNIT_DISPLAY[IRRADIANCE_SI]} is implausible for a "
                            f"lamp: check {cause}")
    if record.quantity == "radiance":
        fov = record.measurement_fov_mrad
        if fov is None:
            warnings.append("measurement_fov_mrad not given: a radiance measured over a wider field than the "
                            "limits' fields of view underestimates hot spots")
        elif fov > 11.0:
            warnings.append(f"radiance measured over {fov:g} mrad, wider than the 11 and 1.7 mrad fields of the "
                            f"RG1/RG2 limits: hot spots may be underestimated")
    return warnings


def _assumptions(loaded: LoadedProduct, ev: Evaluation, i: int) -> list[str]:
    record, (lo, hi) = loaded.record, loaded.spectrum.range_nm
    assumptions = []
    if record.no_emission_outside:
        assumptions.append(f"The record states the source emits nothing outside {lo:g}–{hi:g} nm; band parts "
                           f"outside that range count as zero.")
    if record.source_alpha_mrad is not None:
        assumptions.append(f"Source given by its angular subtense {record.source_alpha_mrad:g} mrad at "
                           f"{record.distance_mm:g} mm, treated as a disc of {record.largest_dimension_mm:.4g} mm.")
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    if record.quantity == "relative":
        assumptions.append(_anchor_text(record, float(ev.anchor_scale[i])))
    if record.lamp_type == "gls" and record.at_distance_mm is None and d_a_mm > 200.0 + 1e-9:
        assumptions.append(f"General lighting service lamp: assessed where it gives 500 lx, {d_a_mm:.0f} mm away; "
                           f"nearer than that (e.g. at 200 mm, as other lamps are assessed) its group can be "
                           f"higher: see the distances")
    if record.peak_to_mean_radiance > 1:
        assumptions.append(f"Peak-to-mean radiance {record.peak_to_mean_radiance:g} (record): radiance values and "
                           f"the radiance seen by fields of view smaller than the source are multiplied by it.")
    if record.effective_quantity == "irradiance":
        d_ref = record.reference_distance_mm
        if abs(d_a_mm - d_ref) > 1e-9:
            assumptions.append(f"Irradiance scaled from {d_ref:g} mm to {d_a_mm:.4g} mm by the "
                               f"inverse-square law (point source).")
        assumptions.append("Radiance derived as E/Ω_s from the irradiance and the stated source size, i.e. a "
                           "uniform source; LED arrays and hot spots can exceed this average.")
    else:
        assumptions.append("Irradiance derived as L·Ω_s from the measured radiance and the stated source size "
                           "(uniform source).")
    return assumptions


def _scaling(record: ProductRecord, scale: float) -> Scaling | None:
    if record.quantity != "relative":
        return None
    anchor = next(a for a in ANCHORS if getattr(record, a) is not None)
    return Scaling(anchor=anchor, anchor_value=getattr(record, anchor),
                   reference_distance_mm=None if anchor == "luminance_cd_m2" else record.reference_distance_mm,
                   scale_factor=scale, note=_anchor_text(record, scale))


def _anchor_text(record: ProductRecord, scale: float) -> str:
    """The scaling of a relative spectrum, stated so a reader can check it."""
    if record.illuminance_lx is not None:
        target = f"{record.illuminance_lx:g} lx at {record.distance_mm:g} mm"
    elif record.luminous_intensity_cd is not None:
        target = (f"{record.luminous_intensity_cd:g} cd, i.e. {_anchor_photometric(record):.4g} lx at "
                  f"{record.reference_distance_mm:g} mm by the inverse-square law")
    else:
        target = f"{record.luminance_cd_m2:g} cd/m² (so the spectrum is read as a radiance)"
    unit = UNIT_DISPLAY[record.unit_text]  # the SI unit the anchor scales the relative spectrum into
    return (f"Relative spectrum scaled by {scale:.6g} {unit} per unit so that 683 lm/W · ∫S(λ)V(λ)dλ reproduces "
            f"the stated {target}; every absolute value rests on that figure and on the spectrum's shape.")


PREVIEW_BINS = 240
"""Bins of the chart preview kept in the result, so reports render from saved JSON."""


def _four_digits(values: np.ndarray) -> np.ndarray:
    """Values rounded to four significant digits (a chart preview needs no more) [same unit]."""
    with np.errstate(all="ignore"):  # zeros and values near the float limits keep their value
        exponent = np.floor(np.log10(np.abs(values)))
        scale = 10.0 ** np.where(np.isfinite(exponent), 3 - exponent, 0)
        rounded = np.round(values * scale) / scale
    return np.where(np.isfinite(rounded) & np.isfinite(scale), rounded, values)


def _spectrum_summary(loaded: LoadedProduct, scale: float) -> SpectrumSummary:
    """Summary and a max-per-bin preview (keeps narrow lines visible) of the input spectrum, in SI units
    (a relative spectrum multiplied by its anchor's ``scale``)."""
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
        path=spectrum.path, quantity=loaded.record.effective_quantity, quantity_given=loaded.record.quantity,
        unit_given=loaded.metadata.get("unit_used", loaded.record.unit_text),
        points=int(wl.size), min_nm=float(wl[0]), max_nm=float(wl[-1]), peak_nm=float(wl[peak]),
        peak_value_si=float(value[peak]),
        preview_nm=np.round(centres[filled], 2).tolist(),
        preview_value_si=_four_digits(binned[filled]).tolist(), file_metadata=loaded.metadata.get("file_metadata", {}))


def _transfer(ev: Evaluation, i: int, covered: np.ndarray, keys: dict[str, int], record: ProductRecord,
              limit_set: LimitSet) -> BlueLightTransfer | None:
    """IEC TR 62778 transfer quantities, where the spectrum covers both the blue-light band and V(λ) and the
    source is mainly visible (the report's quantities are made for white-light sources)."""
    blue = limit_set.transfer_quantity()
    if not (blue and covered[keys[blue]] and covered[keys["V"]] and ev.mainly_visible[i]
            and ev.blue_light_efficacy_w_per_lm[i] > 0):
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
        luminous_intensity_cd=float(ev.luminous_intensity_cd[i]), intensity_source=source,
        threshold_distance_mm=float(ev.threshold_distance_m[i]) * 1e3)


def _distance_rule(record: ProductRecord, d_a_mm: float) -> str:
    if record.at_distance_mm is not None:
        return (f"{record.at_distance_mm:g} mm as the record asks (at_distance_mm): a what-if study, not the "
                f"standard's classification distance")
    if record.lamp_type != "gls":
        return "200 mm: the standard's distance for lamps other than general lighting service"
    if d_a_mm > 200.0 + 1e-9:
        return "500 lx rule: general lighting service lamp, assessed where it gives 500 lx"
    return "200 mm: general lighting service lamp that gives 500 lx nearer than 200 mm, so the minimum applies"


@dataclass(frozen=True)
class BatchEvaluation:
    """Everything computed for n products: integrals, the method's arrays, and colour. ``standard`` is the
    evaluation at the standard's distance (the same object as ``evaluation`` unless a record asks for a
    what-if distance); ``what_if`` marks the products assessed at a distance of the record's choosing."""

    limit_set: LimitSet
    integrated: Integrated
    evaluation: Evaluation
    standard: Evaluation
    what_if: np.ndarray
    chromaticity_x: np.ndarray
    chromaticity_y: np.ndarray
    cct_k: np.ndarray
    duv: np.ndarray


def evaluate_products(records: list[ProductRecord], integrated: Integrated,
                      limit_set: LimitSet = DEFAULT_LIMIT_SET, index: np.ndarray | None = None) -> BatchEvaluation:
    """Apply the method to n products whose integrals are known; colour only where V(λ) is covered and
    there is light. ``index`` maps products to ``records`` as in :func:`product_arrays`."""
    arrays = product_arrays(records, integrated.raw, integrated.covered, index)
    ev = evaluate(arrays, limit_set)
    standard = ev
    what_if = np.zeros(ev.group_index.size, dtype=bool)
    if arrays.forced_distance_m is not None:
        what_if = ~np.isnan(arrays.forced_distance_m)
        if what_if.any():
            standard = evaluate(dataclasses.replace(arrays, forced_distance_m=None), limit_set)
    v = integral_index(limit_set)["V"]
    nan = np.full(integrated.raw.shape[0], np.nan)
    x, y, cct, duv = nan.copy(), nan.copy(), nan.copy(), nan.copy()
    lit = integrated.covered[:, v] & (ev.illuminance_lx > 0)
    if lit.any():
        x[lit], y[lit], cct[lit], duv[lit] = cct_from_xyz(integrated.xyz[lit])
    return BatchEvaluation(limit_set, integrated, ev, standard, what_if, x, y, cct, duv)


def evaluate_loaded(products: list[LoadedProduct], limit_set: LimitSet = DEFAULT_LIMIT_SET) -> BatchEvaluation:
    """Integrate and evaluate loaded products (spectra sharing a grid share one matrix product)."""
    integrated = integrate_spectra([p.spectrum.wavelength_nm for p in products],
                                   [p.spectrum.value for p in products],
                                   [p.record.no_emission_outside for p in products], limit_set)
    return evaluate_products([p.record for p in products], integrated, limit_set)


def _cct_reason(batch: BatchEvaluation, i: int, v_covered: bool) -> str:
    """Why product ``i`` has no CCT (empty when it has one)."""
    if not v_covered:
        return "the spectrum does not cover V(λ)'s 360–830 nm band"
    if not batch.evaluation.illuminance_lx[i] > 0:
        return "the spectrum has no visible light"
    if np.isnan(batch.cct_k[i]):
        return (f"its chromaticity is too far from the Planckian locus for a CCT (|Duv| > {CCT_DUV_LIMIT:g} or "
                f"outside {CCT_RANGE_K[0]:g}–{CCT_RANGE_K[1]:g} K)")
    return ""


def _illuminance_at_record_distance(record: ProductRecord, ev: Evaluation, i: int) -> float | None:
    """Illuminance at the record's distance_mm [lx], by the same geometry the assessment used."""
    if record.distance_mm is None:
        return None
    d_m, d_a = record.distance_mm * 1e-3, float(ev.assessment_distance_m[i])
    if record.effective_quantity == "radiance":
        return float(ev.luminance_cd_m2[i] * source_shape([record]).solid_angle_sr(d_m)[0])
    return float(ev.illuminance_lx[i] * (d_a / d_m) ** 2)


def _studies(loaded: LoadedProduct, batch: BatchEvaluation, i: int, distances_and_remedies: bool) -> dict:
    """Uncertainty (when the record states one), hazard distances and remedies of product ``i``; none when no
    risk group could be determined (a study of hazards that were not assessed would say nothing true)."""
    record, limit_set, ev = loaded.record, batch.limit_set, batch.evaluation
    arrays = product_arrays([record], batch.integrated.raw[i], batch.integrated.covered[i])
    out = {}
    if ev.group_index[i] < 0:
        return out
    if record.uncertainty_pct or record.wavelength_uncertainty_nm:
        out["uncertainty"] = uncertainty_study(arrays, loaded.spectrum, record.no_emission_outside, limit_set,
                                               record.uncertainty_pct or 0.0, record.wavelength_uncertainty_nm or 0.0)
    if distances_and_remedies:
        out["distances"] = distance_study(arrays, limit_set, record.largest_dimension_mm)
        d_a = float(ev.assessment_distance_m[i])
        if record.effective_quantity == "radiance":
            geometric = float(ev.source_solid_angle_sr[i])
        else:
            geometric = (record.reference_distance_mm * 1e-3 / d_a) ** 2
        assessed = {symbol for symbol, h in ev.hazards.items() if h.assessed[i]}
        out["remedies"] = remedies_study(arrays, loaded.spectrum, float(ev.anchor_scale[i]) * geometric, limit_set,
                                         assessed)
    return out


def _shares(raw: np.ndarray, keys: dict[str, int], limit_set: LimitSet) -> dict[tuple[str, str], float]:
    """(symbol, share) → the share of a hazard's value in its sub-band (0 when the value is 0) [1]."""
    out = {}
    for h in limit_set.hazards:
        total = raw[keys[h.symbol]]
        for share in h.shares:
            if share.step_nm is None:
                out[(h.symbol, share.name)] = float(raw[keys[share_key(h.symbol, share.name)]] / total) \
                    if total > 0 else 0.0
    return out


def build_assessment(loaded: LoadedProduct, batch: BatchEvaluation, i: int,
                     tolerances: ClaimTolerances = DEFAULT_TOLERANCES, studies: bool = True) -> Assessment:
    """The result of product ``i`` of an evaluation; vendor claims checked with ``tolerances``. With
    ``studies``, hazard distances and remedies too (the uncertainty study runs whenever the record states
    an uncertainty)."""
    record, spectrum, limit_set = loaded.record, loaded.spectrum, batch.limit_set
    ev, covered, raw = batch.evaluation, batch.integrated.covered[i], batch.integrated.raw[i]
    keys = integral_index(limit_set)
    v_covered = bool(covered[keys["V"]])
    hazards = _hazard_results(ev, i, spectrum.range_nm, limit_set)
    overall = _group_name(ev.group_index[i])
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    what_if = record.at_distance_mm is not None
    # claims and cautions are about the product as the standard classifies it: at the standard's distance;
    # a what-if never lowers a caution (each hazard's higher group of the two)
    standard = _hazard_results(batch.standard, i, spectrum.range_nm, limit_set) if what_if else hazards
    standard_overall = _group_name(batch.standard.group_index[i])
    standard_distance_mm = float(batch.standard.assessment_distance_m[i]) * 1e3
    groups = {s: _higher(h.risk_group, standard[s].risk_group if s in standard else None, limit_set)
              for s, h in hazards.items()}
    tables = {name: {"symbol": t.symbol, "source": t.metadata["source"], "edition": t.metadata["edition"],
                     "sha256": t.sha256} for name in TABLE_NAMES for t in [load_table(name)]}
    return require_finite(Assessment(
        id=record.id, name=record.name, risk_group=overall, complete=bool(ev.complete[i]),
        basis="what-if" if what_if else "standard",
        standard_risk_group=standard_overall if what_if else None,
        standard_assessment_distance_mm=standard_distance_mm if what_if else None,
        assessment_distance_mm=d_a_mm, alpha_rad=float(ev.alpha_rad[i]),
        illuminance_lx=float(ev.illuminance_lx[i]), hazards=hazards,
        not_assessed=[s for s, h in hazards.items() if not h.assessed],
        deciding_hazards=[s for s, g in groups.items() if overall is not None and g == overall],
        geometry=Geometry(
            measurement_distance_mm=record.distance_mm, assessment_distance_mm=d_a_mm,
            distance_rule=_distance_rule(record, d_a_mm), alpha_rad=float(ev.alpha_rad[i]),
            source_solid_angle_sr=float(ev.source_solid_angle_sr[i]),
            largest_dimension_mm=float(record.largest_dimension_mm), small_source=bool(ev.small_source[i]),
            weak_visual_stimulus=bool(ev.weak_visual_stimulus[i])),
        photometry=_photometry(batch, i, v_covered),
        spectrum=_spectrum_summary(loaded, float(ev.anchor_scale[i])),
        blue_light_transfer=_transfer(ev, i, covered, keys, record, limit_set),
        scaling=_scaling(record, float(ev.anchor_scale[i])),
        **_studies(loaded, batch, i, studies),
        record=record.model_dump(exclude_none=True),
        warnings=_warnings(loaded, ev, i, v_covered) + _switch_warnings(ev, i, limit_set),
        assumptions=_assumptions(loaded, ev, i),
        cautions=select_cautions(limit_set, groups, _shares(raw, keys, limit_set), bool(ev.complete[i]),
                                 determined=overall is not None or standard_overall is not None),
        claims=check_claims(record, risk_group=standard_overall, complete=bool(ev.complete[i]),
                            not_assessed=[s for s, h in standard.items() if not h.assessed], hazards=standard,
                            cct_k=_float(batch.cct_k[i]), cct_reason=_cct_reason(batch, i, v_covered),
                            illuminance_at_record_distance_lx=_illuminance_at_record_distance(record, ev, i),
                            assessment_distance_mm=standard_distance_mm, tolerances=tolerances),
        provenance=Provenance(tool_version=__version__, limit_set=limit_set.name, tables=tables,
                              inputs=dict(sorted(loaded.inputs.items())), method=METHOD_TEXT),
        limit_set=limit_set_info(limit_set)).sealed())


def limit_set_info(limit_set: LimitSet) -> LimitSetInfo:
    """What a renderer needs of a limit set, as it is stored in a result."""
    return LimitSetInfo(name=limit_set.name, groups=list(limit_set.groups), boundaries=list(limit_set.boundaries),
                        families={name: list(members) for name, members in limit_set.families},
                        grouped_families=[name for name, _ in limit_set.grouped_families],
                        small_source_alpha_rad=limit_set.small_source_alpha_rad,
                        weak_stimulus_luminance_cd_m2=limit_set.weak_stimulus_luminance_cd_m2)


def assess(product: str | Path | ProductRecord | LoadedProduct, overrides: dict | None = None,
           limit_set: LimitSet = DEFAULT_LIMIT_SET, tolerances: ClaimTolerances = DEFAULT_TOLERANCES) -> Assessment:
    """Pre-screen one product.

    Parameters
    ----------
    product : str, Path, ProductRecord or LoadedProduct
        A ``RECORD.toml``, a spectrum file (with ``overrides`` as record fields), a record (its spectrum path
        relative to the working folder), or an already loaded product.
    overrides : dict, optional
        Record fields that replace the record's own (as the CLI options do).
    limit_set : LimitSet
        Limits to apply; IEC 62471:2006 by default.
    tolerances : ClaimTolerances
        Tolerances for the record's vendor claims.

    Returns
    -------
    Assessment

    Raises
    ------
    hazard.errors.InputError
        Bad record or spectrum.
    """
    if isinstance(product, LoadedProduct):
        loaded = product
    elif isinstance(product, ProductRecord):
        loaded = product_from_record(product, Path.cwd(), product.id)
    else:
        loaded = load_product(product, overrides)
    return build_assessment(loaded, evaluate_loaded([loaded], limit_set), 0, tolerances)
