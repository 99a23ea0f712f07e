"""``assess`` and ``build_assessment``: one product's frozen :class:`~hazard.result.Assessment`.

It is built from the arrays of an evaluation, with its hazards, studies, claims, cautions and provenance, and sealed
with its own SHA-256.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

import numpy as np

from hazard._version import __version__
from hazard.assessment.cautions import select_cautions
from hazard.assessment.claims import DEFAULT_TOLERANCES, ClaimBasis, ClaimTolerances, check_claims
from hazard.assessment.guard import require_finite
from hazard.assessment.notes import assumptions_for, distance_rule, switch_warnings, warnings_for
from hazard.assessment.pipeline import BatchEvaluation, evaluate_loaded, product_arrays
from hazard.assessment.summaries import (
    cct_reason,
    illuminance_at_record_distance_lx,
    optional_float,
    photometry_summary,
    scaling_summary,
    spectrum_summary,
    transfer_summary,
)
from hazard.inputs.loading import LoadedProduct, load_product, product_from_record
from hazard.inputs.record import ProductRecord
from hazard.inputs.spectrum import Spectrum
from hazard.method.contributions import NEGLIGIBLE_SHARE_OF_EXEMPT, spectral_shares
from hazard.method.evaluate import Evaluation, HazardArrays, evaluate, integral_index, share_key
from hazard.method.integrals import integrate_spectra, widest_gap_nm
from hazard.output.formatting import UNIT_DISPLAY, format_duration_s, format_value
from hazard.result import (
    Assessment,
    DistanceStudy,
    Emission,
    ExposureStudy,
    Geometry,
    HazardResult,
    LimitSetInfo,
    Provenance,
    PulseCheck,
    Remedies,
    ReportIdentity,
    SpectralShares,
    UncertaintyStudy,
)
from hazard.standards import DEFAULT_LIMIT_SET, GROUPS, LimitSet
from hazard.standards.directive_2006_25 import DIRECTIVE_2006_25
from hazard.studies.exposure import Exposure, exposure_study
from hazard.studies.joint import distances_and_remedies
from hazard.studies.uncertainty import uncertainty_study
from hazard.weighting_tables import TABLE_NAMES, load_table

__all__ = ["METHOD_TEXT", "assess", "build_assessment", "limit_set_info"]


METHOD_TEXT = (
    "The spectrum is taken as linear between its samples; each weighted integral is the exact integral "
    "of that interpolant times the weighting function as tabulated (S_UV, B, R log-linear between their "
    "points; V and the CIE 1931 colour-matching functions linear), band ends and table points inserted as "
    "nodes; weights are zero outside their tables."
)


def _higher(a: str | None, b: str | None, limit_set: LimitSet) -> str | None:
    """The higher of two groups (None: no group)."""
    ranked = [g for g in (a, b) if g is not None]
    return max(ranked, key=limit_set.groups.index) if ranked else None


def _group_name(index: int) -> str | None:
    """The group of a group index; None for −1 (no group determined)."""
    return GROUPS[int(index)] if index >= 0 else None


def _missing_text(range_nm: tuple[float, float], band: tuple[float, float]) -> str:
    gaps = []
    if range_nm[0] > band[0]:
        gaps.append(f"{band[0]:g}–{min(range_nm[0], band[1]):g} nm")
    if range_nm[1] < band[1]:
        gaps.append(f"{max(range_nm[1], band[0]):g}–{band[1]:g} nm")
    return " and ".join(gaps)


def _hazard_results(ev: Evaluation, i: int, wavelength_nm: np.ndarray, limit_set: LimitSet) -> dict[str, HazardResult]:
    boundaries = limit_set.boundaries
    spectrum_range = (float(wavelength_nm[0]), float(wavelength_nm[-1]))
    results = {}
    for symbol, h in ev.hazards.items():
        if not h.applicable[i]:
            continue
        spec = h.hazard
        grouped = spec.limits is not None
        limits = {g: float(h.limits[i, k]) for k, g in enumerate(boundaries)} if grouped else {}
        compared = {g: float(h.compared[i, k]) for k, g in enumerate(boundaries)} if grouped else {}
        band = f"{spec.band_nm[0]:g}–{spec.band_nm[1]:g} nm"
        lower = int(h.lower_bound_index[i])
        hole = None if h.assessed[i] else widest_gap_nm(wavelength_nm, spec.band_nm)
        if not h.assessed[i]:
            note = (
                f"Not assessed: the spectrum has no samples between {hole[0]:g} and {hole[1]:g} nm, inside the band "
                f"{band}; across such a gap the spectrum is unknown: measure it without the gap."
                if hole is not None
                else f"Not assessed: the spectrum covers {spectrum_range[0]:g}–{spectrum_range[1]:g} nm and the "
                f"band needs {band} (missing {_missing_text(spectrum_range, spec.band_nm)}); measure the "
                f"missing range, or set no_emission_outside if the source emits nothing there."
            )
            if lower >= 1:
                boundary = boundaries[lower - 1]
                note += (
                    f" The measured part alone already exceeds the {boundary} limit "
                    f"({format_value(float(h.compared[i, lower - 1]))} against "
                    f"{format_value(float(h.limits[i, lower - 1]))} {UNIT_DISPLAY[spec.unit]}): "
                    f"at least {GROUPS[lower]}."
                )
        elif not grouped:
            note = f"Assessed over {band}; exposure limit only, IEC 62471 gives this hazard no risk group."
        else:
            note = f"Assessed over {band}."
        if h.assessed[i] and h.raised_by_t_max[i]:
            note += (
                f" The group was raised to {GROUPS[h.group_index[i]]} because the exposure limit is reached "
                f"after {format_duration_s(float(h.t_max_s[i]))}, before the time base of the group its "
                f"tabulated limits give: a group never reads safer than its own t_max."
            )
        if h.assessed[i] and any(
            p.exponent == 0 and p.after_s > 0 and np.isclose(h.t_max_s[i], p.after_s)
            for p in spec.exposure_limit.pieces
        ):
            note += (
                f" The limit for exposures longer than {format_duration_s(float(h.t_max_s[i]))} is exceeded, "
                f"so t_max is that time: any longer exposure is over the limit."
            )
        if h.assessed[i] and h.t_max_s[i] == 0:
            note += " The limit is exceeded from the first instant of exposure (t_max 0 s)."
        pulse = _pulse_check(ev, h, i) if (ev.pulsed[i] and h.pulse is not None and h.assessed[i]) else None
        if pulse is not None and ev.single_pulse[i]:
            # one pulse has no continuous exposure: its group comes from the pulse against the limit at its duration
            limits, compared = {}, {}
        if pulse is not None and grouped:
            over = max(pulse.fraction, pulse.fraction_in_train or 0.0) > 1
            note += (
                " A pulse exceeds its exposure limit: RG3 (pulsed lamps)."
                if over
                else " Every pulse is within its exposure limit"
                + (": Exempt (single pulse)." if ev.single_pulse[i] else "; the group is that of the time average.")
            )
        results[symbol] = HazardResult(
            symbol=symbol,
            title=spec.title,
            band_nm=spec.band_nm,
            weighting=None if spec.table is None else load_table(spec.table).symbol,
            value=float(h.value[i]) if h.assessed[i] else None,
            unit=spec.unit,
            t_max_s=optional_float(h.t_max_s[i]) if h.assessed[i] else None,
            risk_group=GROUPS[h.group_index[i]] if (h.assessed[i] and grouped) else None,
            assessed=bool(h.assessed[i]),
            limits=limits,
            compared=compared if h.assessed[i] else {},
            margins={g: compared[g] / limits[g] for g in limits} if h.assessed[i] else {},
            fov_rad=dict(zip(boundaries, spec.fov_rad, strict=True)) if spec.fov_rad else {},
            alpha_rad={g: float(h.alpha_bounded[i, k]) for k, g in enumerate(boundaries)}
            if spec.limits_over_alpha
            else {},
            time_bases_s={g: float(t) for g, t in zip(boundaries, spec.time_bases_s, strict=True)}
            if spec.time_bases_s is not None  # exactly when grouped (Hazard)
            else {},
            exposure_limit=spec.exposure_limit.text,
            note=note,
            pulse=pulse,
            hole_nm=hole,
            lower_bound_group=GROUPS[lower] if (lower >= 1 and not h.assessed[i]) else None,
        )
    return results


def _pulse_check(ev: Evaluation, h: HazardArrays, i: int) -> PulseCheck:
    """One hazard's pulse check as it goes into the result (:mod:`hazard.method.pulses`)."""
    check = h.pulse
    if check is None:
        raise ValueError("no pulse check")  # the caller asks only where there is one
    duration = float(ev.pulse_duration_s[i])
    duty = 1.0 if ev.single_pulse[i] else duration * float(ev.pulse_rate_hz[i])
    peak = float(h.value[i]) / duty  # a train's values are of its time average
    single = float(check.single[i])
    thermal_train = h.hazard.effect == "thermal" and not ev.single_pulse[i]
    with np.errstate(over="ignore", divide="ignore"):  # a pulse far below its limit: beyond any count, none
        count = np.float64(single) ** (-1.0 if h.hazard.effect == "photochemical" else -4.0)
    to_limit = float(count) if 0 < single <= 1 and np.isfinite(count) else None
    return PulseCheck(
        duration_s=duration,
        dose_per_pulse=peak * duration,
        fraction=single,
        fraction_in_train=float(check.repeated[i]) if thermal_train else None,
        pulses_in_window=float(check.pulses_in_window[i]) if thermal_train else None,
        pulses_to_limit=to_limit,
    )


SINGLE_PULSE_RULE = (
    "single pulse: each hazard's pulse against its exposure limit at the pulse duration; within every limit the lamp "
    "is Exempt, over one it is RG3 (IEC 62471:2006 6.2, from memory)"
)
PULSE_TRAIN_RULE = (
    "pulse train: each pulse against its exposure limit at the pulse duration (thermal limits × N^−0.25 for the "
    "pulses within their window, as 2006/25/EC Annex II Table 2.6 does for lasers); over one it is RG3, within "
    "every one the group is the continuous-wave group of the time-averaged spectrum (IEC 62471:2006 6.2, from "
    "memory). Pulse-width-modulated lighting is thus assessed as continuous light on its time-averaged spectrum, "
    "the approach IEC 62471-7:2023 takes for illumination sources."
)


def _emission(record: ProductRecord) -> Emission | None:
    """The emission block of a pulsed source; None for a continuous one."""
    if record.emission == "continuous" or record.pulse_duration_s is None:
        return None
    train = record.emission == "pulse_train"
    rate = record.pulse_rate_hz if train else None
    return Emission(
        mode=record.emission,
        pulse_duration_s=record.pulse_duration_s,
        pulse_rate_hz=rate,
        duty_cycle=None if rate is None else record.pulse_duration_s * rate,
        rule=PULSE_TRAIN_RULE if train else SINGLE_PULSE_RULE,
    )


def _exposure(loaded: LoadedProduct, limit_set: LimitSet = DIRECTIVE_2006_25) -> ExposureStudy | None:
    """The record's daily exposures against the workplace exposure limit values; None when it states none.

    The spectrum is integrated again for ``limit_set`` (its bands and fields of view are its own).
    """
    record = loaded.record
    if not record.exposures:
        return None
    spectrum = loaded.spectrum
    integrated = integrate_spectra([spectrum.wavelength_nm], [spectrum.value], [record.no_emission_outside], limit_set)
    arrays = product_arrays([record], integrated)
    exposures = [
        Exposure(label=e.label or f"exposure {k}", distance_m=e.distance_mm * 1e-3, duration_s=e.duration_s)
        for k, e in enumerate(record.exposures, start=1)
    ]
    return exposure_study(arrays, limit_set, exposures)


def _studies(
    loaded: LoadedProduct, batch: BatchEvaluation, i: int, with_distances: bool
) -> dict[str, UncertaintyStudy | DistanceStudy | Remedies]:
    """Uncertainty (when the record states one), hazard distances and remedies of product ``i``.

    None of them when no risk group could be determined (a study of hazards that were not assessed would say nothing
    true).
    """
    record, limit_set, ev = loaded.record, batch.limit_set, batch.evaluation
    arrays = product_arrays([record], batch.integrated.rows(i))
    out: dict[str, UncertaintyStudy | DistanceStudy | Remedies] = {}
    if ev.group_index[i] < 0:
        return out
    if record.uncertainty_pct or record.wavelength_uncertainty_nm:
        out["uncertainty"] = _variants(loaded, arrays, limit_set)
    if with_distances:
        d_a = float(ev.assessment_distance_m[i])
        if record.effective_quantity == "radiance":
            geometric = float(ev.source_solid_angle_sr[i])
        else:
            geometric = float(arrays.shape.irradiance_scaling(record.irradiance_distance_mm * 1e-3, d_a)[0])
        assessed = {symbol for symbol, h in ev.hazards.items() if h.assessed[i]}
        out["distances"], out["remedies"] = distances_and_remedies(
            arrays,
            loaded.spectrum,
            float(ev.anchor_scale[i]) * geometric,
            limit_set,
            assessed,
            record.largest_dimension_mm,
        )
    return out


def _variants(loaded: LoadedProduct, arrays, limit_set: LimitSet) -> UncertaintyStudy:
    """The product of ``arrays`` across the record's stated uncertainty."""
    record = loaded.record
    return uncertainty_study(
        arrays,
        loaded.spectrum,
        record.no_emission_outside,
        limit_set,
        record.uncertainty_pct or 0.0,
        record.wavelength_uncertainty_nm or 0.0,
    )


def _claim_basis(
    loaded: LoadedProduct, batch: BatchEvaluation, i: int, variants: UncertaintyStudy | None, v_covered: bool
) -> ClaimBasis:
    """The product at the claims' distance (``claimed_distance_mm``, else the standard's), across its uncertainty.

    ``variants`` is the product's own uncertainty study, reused when the claims' distance is the assessment's.
    """
    record, limit_set, wavelength_nm = loaded.record, batch.limit_set, loaded.spectrum.wavelength_nm
    standard_mm = float(batch.standard.assessment_distance_m[i]) * 1e3
    own_mm = float(batch.evaluation.assessment_distance_m[i]) * 1e3
    distance_mm = standard_mm if record.claimed_distance_mm is None else record.claimed_distance_mm
    at_standard = bool(np.isclose(distance_mm, standard_mm, rtol=1e-12, atol=0.0))
    arrays = dataclasses.replace(
        product_arrays([record], batch.integrated.rows(i)),
        forced_distance_m=None if at_standard else np.array([distance_mm * 1e-3]),
    )
    ev, row = (batch.standard, i) if at_standard else (evaluate(arrays, limit_set), 0)
    if not (record.uncertainty_pct or record.wavelength_uncertainty_nm) or ev.group_index[row] < 0:
        variants = None
    elif variants is None or not np.isclose(distance_mm, own_mm, rtol=1e-12, atol=0.0):
        variants = _variants(loaded, arrays, limit_set)
    group = _group_name(ev.group_index[row])
    hazards = _hazard_results(ev, row, wavelength_nm, limit_set)
    return ClaimBasis(
        distance_mm=distance_mm,
        risk_group=group,
        complete=bool(ev.complete[row]),
        not_assessed=[s for s, h in hazards.items() if not h.assessed],
        hazards=hazards,
        variants=variants,
        cct_k=optional_float(batch.cct_k[i]),
        cct_reason=cct_reason(batch, i, v_covered),
        illuminance_lx=illuminance_at_record_distance_lx(record, batch.evaluation, i),
    )


def _shares(raw: np.ndarray, keys: dict[str, int], limit_set: LimitSet) -> dict[tuple[str, str], float]:
    """(symbol, share) → the share of a hazard's value in its sub-band (0 when the value is 0) [1]."""
    out = {}
    for h in limit_set.hazards:
        total = raw[keys[h.symbol]]
        for share in h.shares:
            if share.step_nm is None:
                out[(h.symbol, share.name)] = (
                    float(raw[keys[share_key(h.symbol, share.name)]] / total) if total > 0 else 0.0
                )
    return out


def _contributions(
    spectrum: Spectrum, hazards: dict[str, HazardResult], limit_set: LimitSet
) -> dict[str, SpectralShares]:
    """Where each assessed hazard's value comes from, by wavelength band (none for a negligible value)."""
    symbols = [
        s
        for s, h in hazards.items()
        if h.assessed and h.value and (not h.margins or max(h.margins.values()) >= NEGLIGIBLE_SHARE_OF_EXEMPT)
    ]
    split = spectral_shares(spectrum.wavelength_nm, spectrum.value, limit_set, symbols)
    return {s: SpectralShares(start_nm=start, step_nm=step, share=share) for s, (start, step, share) in split.items()}


def build_assessment(
    loaded: LoadedProduct,
    batch: BatchEvaluation,
    i: int,
    tolerances: ClaimTolerances = DEFAULT_TOLERANCES,
    studies: bool = True,
    identity: ReportIdentity | None = None,
) -> Assessment:
    """The result of product ``i`` of an evaluation, vendor claims checked with ``tolerances``.

    With ``studies``, hazard distances and remedies too (the uncertainty study runs whenever the record states an
    uncertainty). ``identity`` (who issues the report) goes into the provenance.
    """
    record, spectrum, limit_set = loaded.record, loaded.spectrum, batch.limit_set
    ev, covered, raw = batch.evaluation, batch.integrated.covered[i], batch.integrated.raw[i]
    keys = integral_index(limit_set)
    v_covered = bool(covered[keys["V"]])
    hazards = _hazard_results(ev, i, spectrum.wavelength_nm, limit_set)
    overall = _group_name(ev.group_index[i])
    d_a_mm = float(ev.assessment_distance_m[i]) * 1e3
    what_if = record.at_distance_mm is not None
    # claims and cautions are about the product as the standard classifies it: at the standard's distance;
    # a what-if never lowers a caution (each hazard's higher group of the two)
    standard = _hazard_results(batch.standard, i, spectrum.wavelength_nm, limit_set) if what_if else hazards
    standard_overall = _group_name(batch.standard.group_index[i])
    standard_distance_mm = float(batch.standard.assessment_distance_m[i]) * 1e3
    groups = {
        s: _higher(h.risk_group, standard[s].risk_group if s in standard else None, limit_set)
        for s, h in hazards.items()
    }
    studies_found = _studies(loaded, batch, i, studies)
    own_variants = studies_found.get("uncertainty")
    if not isinstance(own_variants, UncertaintyStudy):
        own_variants = None
    tables = {
        name: {"symbol": t.symbol, "source": t.metadata["source"], "edition": t.metadata["edition"], "sha256": t.sha256}
        for name in TABLE_NAMES
        for t in [load_table(name)]
    }
    return require_finite(
        Assessment(
            id=record.id,
            name=record.name,
            risk_group=overall,
            complete=bool(ev.complete[i]),
            basis="what-if" if what_if else "standard",
            standard_risk_group=standard_overall if what_if else None,
            standard_assessment_distance_mm=standard_distance_mm if what_if else None,
            assessment_distance_mm=d_a_mm,
            alpha_rad=float(ev.alpha_rad[i]),
            illuminance_lx=float(ev.illuminance_lx[i]),
            hazards=hazards,
            not_assessed=[s for s, h in hazards.items() if not h.assessed],
            deciding_hazards=[
                s for s, h in hazards.items() if overall is not None and overall in (h.risk_group, h.lower_bound_group)
            ],
            geometry=Geometry(
                measurement_distance_mm=record.distance_mm,
                assessment_distance_mm=d_a_mm,
                distance_rule=distance_rule(record, d_a_mm),
                alpha_rad=float(ev.alpha_rad[i]),
                source_solid_angle_sr=float(ev.source_solid_angle_sr[i]),
                largest_dimension_mm=float(record.largest_dimension_mm),
                small_source=bool(ev.small_source[i]),
                weak_visual_stimulus=bool(ev.weak_visual_stimulus[i]),
            ),
            photometry=photometry_summary(batch, i, v_covered),
            spectrum=spectrum_summary(loaded, float(ev.anchor_scale[i])),
            contributions=_contributions(spectrum, hazards, limit_set),
            blue_light_transfer=transfer_summary(ev, i, covered, keys, record, limit_set),
            scaling=scaling_summary(record, float(ev.anchor_scale[i])),
            emission=_emission(record),
            exposure=_exposure(loaded),
            **studies_found,
            record=record.model_dump(exclude_none=True),
            warnings=warnings_for(loaded, ev, i, v_covered) + switch_warnings(ev, i, limit_set),
            assumptions=assumptions_for(loaded, ev, i),
            cautions=select_cautions(
                limit_set,
                groups,
                _shares(raw, keys, limit_set),
                bool(ev.complete[i]),
                determined=overall is not None or standard_overall is not None,
            ),
            claims=check_claims(record, _claim_basis(loaded, batch, i, own_variants, v_covered), tolerances)
            if record.makes_claims
            else [],
            provenance=Provenance(
                tool_version=__version__,
                limit_set=limit_set.name,
                tables=tables,
                inputs=dict(sorted(loaded.inputs.items())),
                method=METHOD_TEXT,
                identity=identity,
            ),
            limit_set=limit_set_info(limit_set),
        ).sealed()
    )


def limit_set_info(limit_set: LimitSet) -> LimitSetInfo:
    """What a renderer needs of a limit set, as it is stored in a result."""
    return LimitSetInfo(
        name=limit_set.name,
        groups=list(limit_set.groups),
        boundaries=list(limit_set.boundaries),
        families={name: list(members) for name, members in limit_set.families},
        grouped_families=[name for name, _ in limit_set.grouped_families],
        small_source_alpha_rad=limit_set.small_source_alpha_rad,
        weak_stimulus_luminance_cd_m2=limit_set.weak_stimulus_luminance_cd_m2,
    )


def assess(
    product: str | Path | ProductRecord | LoadedProduct,
    overrides: dict | None = None,
    limit_set: LimitSet = DEFAULT_LIMIT_SET,
    tolerances: ClaimTolerances = DEFAULT_TOLERANCES,
    identity: ReportIdentity | None = None,
) -> Assessment:
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
    identity : ReportIdentity, optional
        Who issues the report (kept in the provenance, printed on every PDF page).

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
    return build_assessment(loaded, evaluate_loaded([loaded], limit_set), 0, tolerances, identity=identity)
