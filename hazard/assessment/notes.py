"""What a result says beside its numbers: warnings and assumptions.

Warnings say what the method tolerates but doubts, assumptions what the result rests on; each is a sentence a reader can
act on.
"""

from __future__ import annotations

import numpy as np

from hazard.assessment.pipeline import anchor_photometric, radiance_fill, source_shape
from hazard.inputs.loading import LoadedProduct
from hazard.inputs.record import ProductRecord
from hazard.inputs.units import IRRADIANCE_SI
from hazard.method.classify import top_down_groups
from hazard.method.evaluate import Evaluation
from hazard.method.geometry import FIVE_TIMES_RULE
from hazard.method.photometry import VISIBLE_BAND_NM
from hazard.method.weighting import coarse_steps_in
from hazard.output.formatting import UNIT_DISPLAY, format_distance_mm, format_stated, format_value
from hazard.standards import LimitSet

__all__ = [
    "MAX_STEEP_STEP_NM",
    "PLAUSIBLE_MAX_ILLUMINANCE_LX",
    "PLAUSIBLE_PEAK_IRRADIANCE",
    "STEEP_REGIONS_NM",
    "SWITCH_NEIGHBOURHOOD",
    "anchor_text",
    "assumptions_for",
    "distance_rule",
    "switch_warnings",
    "warnings_for",
]


STEEP_REGIONS_NM = ((200.0, 400.0), (380.0, 500.0))
"""Where the weights change steeply: sampling coarser than :data:`MAX_STEEP_STEP_NM` is flagged [nm]."""


MAX_STEEP_STEP_NM = 5.0


PLAUSIBLE_MAX_ILLUMINANCE_LX = 200e3
"""Above this illuminance at the assessment distance a unit slip is likely (method §5) [lx]."""


PLAUSIBLE_PEAK_IRRADIANCE = (1e-9, 1e4)
"""Peak spectral irradiance outside this range suggests a unit slip by 10³ or 10⁴ (common practice, no
published source) [W m⁻² nm⁻¹]."""


SWITCH_NEIGHBOURHOOD = 1.25
"""Within this factor of a switch between family members (small source, weak visual stimulus) the result says
what the other member would give, when that is worse (our rule, no published source) [1]."""


def switch_warnings(ev: Evaluation, i: int, limit_set: LimitSet) -> list[str]:
    """Warnings for a source near a switch between the members of a family.

    One is given where the other member reads a higher group: a small change of size, distance or light would change the
    group (the standard's own step).
    """
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
                text = f"{format_value(quantity * 1e3)} mrad, switch at {format_stated(threshold * 1e3)} mrad"
            else:
                quantity, threshold, shown = ev.luminance_cd_m2[i], limit_set.weak_stimulus_luminance_cd_m2, "L_v"
                text = f"{format_value(quantity)} cd/m², switch at {format_stated(threshold)} cd/m²"
            near = 1 / SWITCH_NEIGHBOURHOOD <= quantity / threshold <= SWITCH_NEIGHBOURHOOD
            reading = int(top_down_groups(other.compared[i : i + 1], other.limits[i : i + 1])[0])
            if near and reading > used.group_index[i]:
                out.append(
                    f"{family}: {shown} = {text}; {used.hazard.symbol} applies and gives "
                    f"{limit_set.groups[used.group_index[i]]}, but {spec.symbol} would give "
                    f"{limit_set.groups[reading]}: a small change of size, distance or light changes the "
                    f"group here (the standard's own step); have the laboratory confirm it"
                )
    return out


def warnings_for(loaded: LoadedProduct, ev: Evaluation, i: int, v_covered: bool) -> list[str]:
    """Warnings on product ``i``: what-if distance, coarse sampling, scaling of irradiance near the source.

    Also a spectrum that does not cover V(λ) (``v_covered`` false), implausible illuminance or peak irradiance, and
    a radiance measured over too wide a field. The spectrum's own warnings come first.
    """
    record, spectrum = loaded.record, loaded.spectrum
    warnings = list(spectrum.warnings)
    lo, hi = spectrum.range_nm
    if record.at_distance_mm is not None:
        warnings.append(
            f"assessed at {format_distance_mm(record.at_distance_mm)} by request (at_distance_mm), not at the "
            f"standard's distance: the risk groups are a what-if, not a classification"
        )
    for region in STEEP_REGIONS_NM:
        step = coarse_steps_in(spectrum.wavelength_nm, region, MAX_STEEP_STEP_NM)
        if step is not None and lo < region[1] and hi > region[0]:
            warnings.append(
                f"sampling step up to {format_stated(step)} nm in {format_stated(region[0])}–"
                f"{format_stated(region[1])} nm, where the weights change steeply; values there are approximate (use ≤ "
                f"{format_stated(MAX_STEEP_STEP_NM)} "
                f"nm)"
            )
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    size_mm = record.largest_dimension_mm
    irradiance_input = record.effective_quantity == "irradiance"
    d_ref = record.irradiance_distance_mm if irradiance_input else None
    if d_ref is not None and abs(d_a_mm - d_ref) > 1e-9:
        near = min(d_a_mm, d_ref)
        if near < FIVE_TIMES_RULE * size_mm:
            warnings.append(
                f"irradiance scaled from {format_stated(d_ref)} mm to {format_distance_mm(d_a_mm)} with a "
                f"{format_stated(size_mm)} mm source: {format_distance_mm(near)} is under five source sizes, so the "
                f"scaled values are approximate (the larger of the point-source and Lambertian-source laws was "
                f"taken); measure at the assessment distance"
            )
    if not v_covered:
        warnings.append(
            f"the spectrum covers {format_stated(lo)}–{format_stated(hi)} nm, not all of V(λ)'s "
            f"{format_stated(VISIBLE_BAND_NM[0])}–{format_stated(VISIBLE_BAND_NM[1])} nm: illuminance and luminance "
            f"are lower bounds, and so is the weak-visual-stimulus test"
        )
    if ev.illuminance_lx[i] > PLAUSIBLE_MAX_ILLUMINANCE_LX:
        warnings.append(
            f"illuminance {format_value(ev.illuminance_lx[i])} lx at the assessment distance is above "
            f"{format_stated(PLAUSIBLE_MAX_ILLUMINANCE_LX)} lx: check the unit and the distance"
        )
    if irradiance_input:
        peak = float(spectrum.value.max() * ev.anchor_scale[i])
        if not PLAUSIBLE_PEAK_IRRADIANCE[0] <= peak <= PLAUSIBLE_PEAK_IRRADIANCE[1]:
            cause = (
                "the anchor (a relative spectrum with little light within V(λ) is scaled enormously)"
                if record.quantity == "relative"
                else f"the unit ({record.unit_text!r}); a factor of 10³ or 10⁴ is a common slip"
            )
            warnings.append(
                f"peak spectral irradiance {format_value(peak)} {UNIT_DISPLAY[IRRADIANCE_SI]} is implausible for a "
                f"lamp: check {cause}"
            )
    if record.quantity == "radiance":
        fov = record.measurement_fov_mrad
        if fov is None:
            warnings.append(
                "measurement_fov_mrad not given: a radiance measured over a wider field than the "
                "limits' fields of view underestimates hot spots"
            )
        elif fov > 11.0:
            warnings.append(
                f"radiance measured over {format_stated(fov)} mrad, wider than the 11 and 1.7 mrad fields of the "
                f"RG1/RG2 limits: hot spots may be underestimated"
            )
    return warnings


def assumptions_for(loaded: LoadedProduct, ev: Evaluation, i: int) -> list[str]:
    """What the result of product ``i`` rests on, one sentence each.

    No emission outside the measured range, a source given by its angular subtense, the anchor of a relative
    spectrum, the 500 lx distance of a GLS lamp, a peak-to-mean radiance, and how irradiance and radiance were
    derived from each other.
    """
    record, (lo, hi) = loaded.record, loaded.spectrum.range_nm
    assumptions = []
    if record.no_emission_outside:
        assumptions.append(
            f"The record states the source emits nothing outside {format_stated(lo)}–{format_stated(hi)} nm; band "
            f"parts outside that range count as zero."
        )
    if record.source_alpha_mrad is not None:
        assumptions.append(
            f"Source given by its angular subtense {format_stated(record.source_alpha_mrad)} mrad at "
            f"{format_stated(record.distance_mm)} mm, treated as a disc of "
            f"{format_value(record.largest_dimension_mm, 4)} mm."
        )
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    if record.quantity == "relative":
        assumptions.append(anchor_text(record, float(ev.anchor_scale[i])))
    if record.lamp_type == "gls" and record.at_distance_mm is None and d_a_mm > 200.0 + 1e-9:
        assumptions.append(
            f"General lighting service lamp: assessed where it gives 500 lx, {format_distance_mm(d_a_mm)} away; "
            f"nearer than that (e.g. at 200 mm, as other lamps are assessed) its group can be "
            f"higher: see the distances"
        )
    if record.peak_to_mean_radiance > 1:
        assumptions.append(
            f"Peak-to-mean radiance {format_stated(record.peak_to_mean_radiance)} (record): radiance values and "
            f"the radiance seen by fields of view smaller than the source are multiplied by it."
        )
    if record.effective_quantity == "irradiance":
        d_ref = record.irradiance_distance_mm
        if abs(d_a_mm - d_ref) > 1e-9:
            assumptions.append(
                f"Irradiance scaled from {format_stated(d_ref)} mm to {format_distance_mm(d_a_mm)} by the "
                f"inverse-square law (point source), or by the law of a uniform Lambertian source where that gives "
                f"more (near a large source)."
            )
        assumptions.append(
            "Radiance derived as E/Ω_s from the irradiance and the stated source size, i.e. a "
            "uniform source; LED arrays and hot spots can exceed this average."
        )
    else:
        assumptions.append(
            "Irradiance derived as L·Ω_s from the measured radiance and the stated source size (uniform source)."
        )
        fill = float(
            radiance_fill([record], source_shape([record]), np.array([record.distance_mm or np.nan]) * 1e-3)[0]
        )
        if fill > 1:
            assumptions.append(
                f"The radiance was measured over a {record.measurement_fov_mrad:g} mrad field, wider than the source "
                f"seen from {record.distance_mm:g} mm: the meter averaged the source over its whole field, so the "
                f"source's own radiance is taken as the reading × {fill:.4g} (Ω_fov/Ω_s)."
            )
    return assumptions


def anchor_text(record: ProductRecord, scale: float) -> str:
    """The scaling of a relative spectrum, stated so a reader can check it."""
    anchor = record.anchor
    if anchor is None:
        return ""
    if anchor.field == "illuminance_lx":
        target = f"{format_stated(anchor.value)} lx at {format_stated(record.distance_mm)} mm"
    elif anchor.field == "luminous_intensity_cd":
        target = (
            f"{format_stated(anchor.value)} cd, i.e. {format_value(anchor_photometric(record), 4)} lx at "
            f"{format_stated(record.reference_distance_mm)} mm by the inverse-square law"
        )
    else:
        target = f"{format_stated(anchor.value)} cd/m² (so the spectrum is read as a radiance)"
    unit = UNIT_DISPLAY[record.unit_text]  # the SI unit the anchor scales the relative spectrum into
    return (
        f"Relative spectrum scaled by {format_stated(scale)} {unit} per unit so that 683 lm/W · ∫S(λ)V(λ)dλ reproduces "
        f"the stated {target}; every absolute value rests on that figure and on the spectrum's shape."
    )


def distance_rule(record: ProductRecord, d_a_mm: float) -> str:
    """Which rule set the assessment distance ``d_a_mm`` [mm]: a what-if, 200 mm, or the GLS lamps' 500 lx."""
    if record.at_distance_mm is not None:
        return (
            f"{format_distance_mm(record.at_distance_mm)} as the record asks (at_distance_mm): a what-if study, not "
            f"the standard's classification distance"
        )
    if record.lamp_type != "gls":
        return "200 mm: the standard's distance for lamps other than general lighting service"
    if d_a_mm > 200.0 + 1e-9:
        return "500 lx rule: general lighting service lamp, assessed where it gives 500 lx"
    return "200 mm: general lighting service lamp that gives 500 lx nearer than 200 mm, so the minimum applies"
