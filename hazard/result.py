"""The assessment result: frozen pydantic models, the JSON contract of ``hazard assess --format json``.

Reports render these and never compute hazard quantities themselves; a saved JSON file loads back with
:meth:`Assessment.model_validate_json`.
"""

from __future__ import annotations

import hashlib
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field

from hazard.standards import RiskGroup

__all__ = [
    "Assessment",
    "BandContribution",
    "BlueLightTransfer",
    "BoundaryDistance",
    "ClaimCheck",
    "DayExposure",
    "DistanceStudy",
    "Emission",
    "ExposureFraction",
    "ExposureResult",
    "ExposureStudy",
    "Geometry",
    "HazardBounds",
    "HazardResult",
    "LimitSetInfo",
    "Photometry",
    "Provenance",
    "PulseCheck",
    "Remedies",
    "Remedy",
    "ReportIdentity",
    "RiskGroup",
    "Scaling",
    "SpectralShares",
    "SpectrumSummary",
    "UncertaintyStudy",
]

Basis = Literal["standard", "what-if"]


class _Frozen(BaseModel):
    model_config = ConfigDict(frozen=True, extra="forbid")


class PulseCheck(_Frozen):
    """One hazard's pulses against the exposure limit at the pulse duration."""

    duration_s: float = Field(description="Half-peak width of a pulse [s].")
    dose_per_pulse: float = Field(description="The peak value times the pulse duration [unit·s: J/m² or J/(m²·sr)].")
    fraction: float = Field(description="A pulse as a fraction of the limit at its duration [1]; over 1 exceeds it.")
    fraction_in_train: float | None = Field(
        None,
        description="Thermal limits in a train: each pulse against its limit × N^−0.25, as a fraction [1]; null "
        "for a single pulse or a photochemical hazard.",
    )
    pulses_in_window: float | None = Field(None, description="N, pulses within the thermal window [1].")
    pulses_to_limit: float | None = Field(
        None,
        description="Pulses that together reach the limit: dose limits 1/fraction (within the limit's dose period), "
        "thermal limits fraction^−4 (the N^−0.25 rule) [1]; null where a pulse alone exceeds it, or where the "
        "count is beyond any number (a pulse far within its limit).",
    )

    @property
    def worst(self) -> float:
        """The larger of the pulse's two fractions of its limit [1]: over 1, a pulse exceeds it."""
        return max(self.fraction, self.fraction_in_train or 0.0)


class Emission(_Frozen):
    """How the source emits: continuous, a single pulse or a pulse train, and which rule set the group."""

    mode: Literal["single_pulse", "pulse_train"]
    pulse_duration_s: float = Field(description="Half-peak width of each pulse [s].")
    pulse_rate_hz: float | None = Field(description="Pulses per second of a train [Hz]; null for a single pulse.")
    duty_cycle: float | None = Field(description="Pulse duration × rate: the time-averaged share of the peak [1].")
    rule: str = Field(description="Which rule set the group, in a sentence.")


class HazardResult(_Frozen):
    """One hazard quantity at the assessment distance."""

    symbol: str = Field(description="Quantity symbol of the limit set.")
    title: str = Field(description="What the hazard is.")
    band_nm: tuple[float, float] = Field(description="Integration band [nm].")
    weighting: str | None = Field(description="Weighting function symbol, or null for an unweighted band.")
    value: float | None = Field(
        description="Value at the assessment distance; for radiance quantities the source's own radiance E/Ω_s [unit]."
    )
    unit: str = Field(description="Unit of value and limits.")
    t_max_s: float | None = Field(
        description="Exposure time at which the exposure limit is reached [s]; null "
        "when not reached within the limit's time range."
    )
    risk_group: RiskGroup | None = Field(
        description="Group of this hazard; null when not assessed or when the hazard has no risk groups."
    )
    assessed: bool = Field(description="False when the spectrum does not cover the band.")
    limits: dict[str, float] = Field(description="Group limits as applied (after α bounds) [unit].")
    compared: dict[str, float] = Field(
        description="Value compared with each limit: the field-of-view "
        "average for radiance quantities [unit]; empty when not "
        "assessed."
    )
    margins: dict[str, float] = Field(description="compared / limit per group boundary [1]; ≤ 1 is within.")
    fov_rad: dict[str, float] = Field(description="Averaging field of view per group (radiance) [rad].")
    alpha_rad: dict[str, float] = Field(description="Bounded α used in each group limit (thermal) [rad].")
    time_bases_s: dict[str, float] = Field(description="Exposure duration behind each group limit [s].")
    exposure_limit: str | None = Field(description="The exposure limit formula.")
    note: str = Field(description="Why the hazard was or was not assessed, in a sentence.")
    pulse: PulseCheck | None = Field(None, description="Pulsed sources: the pulses against the exposure limit.")
    hole_nm: tuple[float, float] | None = Field(
        None,
        description="Not assessed because the spectrum has no samples between these wavelengths inside the band "
        "(a step wider than max(20 nm, a tenth of the band)) [nm].",
    )
    lower_bound_group: RiskGroup | None = Field(
        None,
        description="Not assessed, yet the measured part of the band alone already gives this group (above "
        "Exempt): the hazard's group is at least this, since spectra and weights are non-negative.",
    )


class Photometry(_Frozen):
    """Photometric and colorimetric values."""

    illuminance_lx: float | None = Field(description="Illuminance at the assessment distance [lx].")
    luminance_cd_m2: float | None = Field(description="Average luminance of the source [cd/m2].")
    cct_k: float | None = Field(description="Correlated colour temperature (CIE 1931 2°, Robertson 1968) [K].")
    duv: float | None = Field(description="Distance from the Planckian locus in CIE 1960 uv [1].")
    chromaticity_xy: tuple[float, float] | None = Field(description="CIE 1931 x, y [1].")
    covered: bool = Field(
        description="The spectrum covers V(λ)'s 360–830 nm band (or the record says the "
        "source emits nothing outside it)."
    )
    visible_negligible: bool = Field(
        False,
        description="Under 10⁻⁶ of the radiant power (200–3000 nm) is luminous (V(λ)-weighted): the photometric "
        "values are a tail of no meaning, and no colour is computed.",
    )


class Geometry(_Frozen):
    """Distances and source geometry."""

    measurement_distance_mm: float | None = Field(description="Distance at which the spectrum was measured [mm].")
    assessment_distance_mm: float = Field(description="Distance at which the hazards are assessed [mm].")
    distance_rule: str = Field(description="Why this assessment distance.")
    alpha_rad: float = Field(description="Angular subtense of the source at the assessment distance [rad].")
    source_solid_angle_sr: float = Field(description="Solid angle of the source at the assessment distance [sr].")
    largest_dimension_mm: float = Field(description="Largest linear dimension of the source [mm].")
    small_source: bool = Field(
        description="α below the limit set's small-source bound: the small-source members of the families apply."
    )
    weak_visual_stimulus: bool = Field(
        description="Luminance below the limit set's weak-stimulus bound: the "
        "weak-stimulus members of the families apply."
    )


class SpectrumSummary(_Frozen):
    """The input spectrum in brief, with a preview for charts (not for computation)."""

    path: str = Field(description="Spectrum file as named in the record.")
    quantity: str = Field(
        description="What the values are: irradiance or radiance (a relative spectrum after its anchor's scaling)."
    )
    quantity_given: str = Field(description="What the record said: irradiance, radiance or relative.")
    unit_given: str = Field(description="Unit of the file's values.")
    points: int = Field(description="Number of samples.")
    min_nm: float
    max_nm: float
    peak_nm: float = Field(description="Wavelength of the highest sample [nm].")
    peak_value_si: float = Field(description="Highest sample [W/m2/nm or W/m2/sr/nm].")
    preview_nm: list[float] = Field(description="Bin centres of the chart preview [nm].")
    preview_value_si: list[float] = Field(
        description="Highest sample in each preview bin, 4 significant digits, for charts only [SI]."
    )
    file_metadata: dict[str, str] = Field(
        default_factory=dict,
        description="Metadata lines of the spectrum file (key → value, the first 40, cut to 120 characters).",
    )


class SpectralShares(_Frozen):
    """Where one hazard's weighted sum comes from: its share from each wavelength band, for charts."""

    start_nm: float = Field(description="Lower edge of the first band [nm].")
    step_nm: float = Field(description="Width of every band [nm].")
    share: list[float] = Field(
        description="Fraction of the hazard's value from each band, in rising wavelength, three significant digits "
        "(under 10⁻⁵ written as 0); they add up to 1 [1]."
    )


class BlueLightTransfer(_Frozen):
    """Blue-light transfer quantities of IEC TR 62778:2014.

    The report has since been replaced by IEC 62471-7:2023, whose details this tool does not implement.
    """

    k_bv_w_per_lm: float = Field(
        description="Blue-light hazard efficacy of luminous radiation K_B,v: blue-light "
        "weighted over luminous radiance (or irradiance over illuminance) "
        "[W/lm]."
    )
    threshold_illuminance_lx: float = Field(
        description="E_thr: illuminance at which the blue-light weighted "
        "irradiance reaches the limit set's transfer threshold "
        "[lx]."
    )
    luminous_intensity_cd: float = Field(description="Luminous intensity used for d_thr [cd].")
    intensity_source: str = Field(description="Where the luminous intensity comes from.")
    threshold_distance_mm: float = Field(
        description="d_thr = √(I_v/E_thr): nearer than this the threshold is exceeded [mm]."
    )


class Scaling(_Frozen):
    """How a relative spectrum was made absolute."""

    anchor: Literal["illuminance_lx", "luminous_intensity_cd", "luminance_cd_m2"]
    anchor_value: float = Field(description="The stated photometric value [lx, cd or cd/m2].")
    reference_distance_mm: float | None = Field(description="Distance the scaled irradiance refers to [mm].")
    scale_factor: float = Field(description="W/m2/nm (or W/m2/sr/nm) per unit of the relative spectrum.")
    note: str


class ClaimCheck(_Frozen):
    """One vendor claim against the computed value."""

    claim: str = Field(description="What is claimed, e.g. 'risk group', 'CCT', or a hazard's t_max.")
    field: str = Field(description="The record field holding the claim.")
    claimed: str = Field(description="The claimed value as stated.")
    computed: str | None = Field(description="The computed value, or null when it cannot be computed.")
    tolerance: str | None = Field(description="The tolerance applied.")
    verdict: Literal["consistent", "inconclusive", "contradicted", "not checkable"] = Field(
        description="consistent: holds at every variant of the stated uncertainty; contradicted: fails at every "
        "one; inconclusive: holds at some and fails at others; not checkable: the data cannot tell."
    )
    reason: str = Field(description="Why, in a sentence.")
    distance_mm: float | None = Field(
        None, description="Distance the claim was checked at [mm]; null for claims without one (CCT)."
    )
    computed_range: str | None = Field(
        None, description="The computed value across the stated uncertainty, lowest to highest; null without one."
    )


class BoundaryDistance(_Frozen):
    """Where one hazard family crosses one group boundary."""

    family: str = Field(description="The hazard family (see LimitSetInfo.families).")
    group: str = Field(description="Beyond distance_mm the family is in this group or a lower one.")
    distance_mm: float | None = Field(description="The crossing distance [mm]; null when there is none in range.")
    criterion: str | None = Field(description="The family member that applies at that distance.")
    note: str


class DistanceStudy(_Frozen):
    """The product re-assessed across distance (same geometry as the assessment)."""

    distance_mm: list[float] = Field(description="Distances of the curves [mm].")
    group: list[str | None] = Field(description="Overall group at each distance.")
    family_group: dict[str, list[str | None]] = Field(description="Group of each hazard family at each distance.")
    t_max_s: dict[str, list[float | None]] = Field(
        description="t_max of each family at each distance [s]; null where the limit is not reached."
    )
    boundaries: list[BoundaryDistance]
    minimum_distance_mm: dict[str, float | None] = Field(
        description="Least distance beyond which the product is "
        "in each group or lower [mm]; 0 when it is "
        "at every distance from 10 mm; null when not "
        "reached within 100 m; absent when no hazard "
        "family was assessed."
    )
    near_field_below_mm: float = Field(
        description="Five source sizes: nearer, inverse-square values are approximate [mm]."
    )


class HazardBounds(_Frozen):
    """One hazard family within the measurement uncertainty."""

    family: str
    criterion: str | None = Field(None, description="The family member assessed at the nominal point.")
    unit: str | None = Field(None, description="Unit of the values.")
    value_low: float | None = Field(description="Lowest value over the uncertainty variants [unit].")
    value_high: float | None
    value_shift_minus: float | None = Field(description="Value with the wavelength scale shifted by −Δλ.")
    value_shift_plus: float | None = Field(description="Value with the wavelength scale shifted by +Δλ.")
    group_low: str | None
    group_high: str | None
    t_max_shortest_s: float | None = Field(
        None, description="Shortest t_max over the variants [s]; null when the limit is reached at none."
    )
    t_max_longest_s: float | None = Field(
        None, description="Longest t_max over the variants [s]; null when the limit is not reached at some variant."
    )


class UncertaintyStudy(_Frozen):
    """Groups at the bounds of the stated uncertainty."""

    uncertainty_pct: float = Field(description="Expanded (k = 2) scale uncertainty applied [%].")
    wavelength_uncertainty_nm: float = Field(description="Wavelength shift applied, ± [nm].")
    hazards: list[HazardBounds]
    risk_group_low: str | None = Field(
        description="Lowest overall group over the variants; null when none is determined."
    )
    risk_group_high: str | None
    verdict: Literal["robust", "borderline"] = Field(
        description="borderline when the overall group can change within the uncertainty."
    )
    note: str


class Remedy(_Frozen):
    """What brings a hazard family, or the product, into a lower group."""

    target: str = Field(description="Hazard family, or 'product'.")
    group: str = Field(description="The lower group aimed at.")
    dimming_factor: float | None = Field(
        description="Multiply the emission (or use a neutral filter of this transmission) [1]; null when not reachable."
    )
    area_factor: float | None = Field(
        description="Radiance hazards: enlarge the emitting area by this factor "
        "(a diffuser, same power) [1]; null when not applicable or not "
        "reachable (see note)."
    )
    note: str = Field("", description="Why a factor is null, when it is.")


class BandContribution(_Frozen):
    """Share of a UV quantity from one 5 nm band."""

    band_nm: tuple[float, float]
    value: float = Field(description="Contribution at the assessment distance [W/m2].")
    share: float = Field(description="Fraction of the total [1].")


class Remedies(_Frozen):
    """What it would take to reach lower groups."""

    remedies: list[Remedy]
    uv_bands: dict[str, list[BandContribution]] = Field(
        description="Hazards split by fixed-width bands (the UV "
        "hazards by 5 nm), largest first "
        "(bands with a share of at least 0.1 %)."
    )
    note: str


class ExposureFraction(_Frozen):
    """One hazard family in one exposure of the day."""

    criterion: str = Field(description="The family member that applies at the exposure's distance.")
    fraction: float = Field(description="The exposure as a fraction of its limit for that duration [1].")
    pulse_fraction: float | None = Field(
        None, description="A pulse train: its largest single pulse against its own limit there [1]; null otherwise."
    )

    @property
    def worst(self) -> float:
        """The larger of the dose's and a single pulse's fraction of the limit [1]: over 1 exceeds it."""
        return max(self.fraction, self.pulse_fraction or 0.0)

    allowed_duration_s: float | None = Field(
        description="Longest duration at that distance within the limit (t_max there) [s]; null when not reached "
        "within a day."
    )
    shortest_distance_mm: float | None = Field(
        description="Least distance beyond which that duration stays within the limit [mm]; 0 when it does from "
        "10 mm; null when not within 100 m."
    )
    note: str = Field(description="How the shortest distance was found.")


class ExposureResult(_Frozen):
    """One task of the day: where and how long, and each hazard family's share of its limit."""

    label: str
    distance_mm: float
    duration_s: float
    hazards: dict[str, ExposureFraction] = Field(description="Hazard family → its fraction of the limit.")


class DayExposure(_Frozen):
    """A hazard family over the whole day."""

    fraction: float = Field(description="The day's exposure as a fraction of the limit [1]; over 1 exceeds it.")
    pulse_fraction: float | None = Field(
        None, description="A pulse train: the largest single pulse of the day against its own limit [1]."
    )

    @property
    def worst(self) -> float:
        """The larger of the dose's and a single pulse's fraction of the limit [1]: over 1 exceeds it."""
        return max(self.fraction, self.pulse_fraction or 0.0)

    rule: str = Field(description="How the exposures were combined.")


class ExposureStudy(_Frozen):
    """A day of exposures against the exposure limit values."""

    limit_set: str = Field(description="The exposure limits judged by.")
    exposures: list[ExposureResult]
    day: dict[str, DayExposure] = Field(description="Hazard family → the day as a fraction of its limit.")
    curve_distance_mm: list[float] = Field(description="Distances of the allowed-stay curves, rising [mm].")
    allowed_duration_s: dict[str, list[float | None]] = Field(
        description="Hazard family → its longest stay within the limit at each curve distance (t_max there) [s]; "
        "null when not reached within a day."
    )
    most_family: str | None = Field(description="The family that uses most of the day's allowance.")
    most_exposure: str | None = Field(description="The exposure that uses most of that family's allowance.")
    within: bool = Field(description="Every family stays within its limit over the day.")
    note: str


class LimitSetInfo(_Frozen):
    """What a renderer needs of the limit set the result was made with."""

    name: str
    groups: list[str] = Field(description="Risk groups in rising order.")
    boundaries: list[str] = Field(description="Groups whose upper limits are tabulated, in rising order.")
    families: dict[str, list[str]] = Field(description="Hazard family → its member symbols.")
    grouped_families: list[str] = Field(description="Families with risk groups.")
    small_source_alpha_rad: float = Field(description="Below this α the small-source members apply [rad].")
    weak_stimulus_luminance_cd_m2: float = Field(
        description="Below this luminance the weak-stimulus members apply [cd/m²]."
    )


class ReportIdentity(_Frozen):
    """Who issues the report: printed in every PDF page's header and kept in the result's provenance.

    Given as options (``--organisation`` …) or in the ``[report]`` table of a ``hazard.toml`` in the working folder.
    """

    organisation: str | None = Field(None, max_length=200, description="Organisation issuing the report.")
    document_number: str | None = Field(None, max_length=100, description="The report's document number.")
    prepared_by: str | None = Field(None, max_length=200, description="Who prepared the report.")
    checked_by: str | None = Field(None, max_length=200, description="Who checked the report.")
    note: str | None = Field(None, max_length=2000, description="A free note printed with the provenance.")

    def header_text(self) -> str:
        """The page-header line: organisation, document number, prepared and checked by (those given)."""
        parts = [
            self.organisation,
            self.document_number and f"Doc. {self.document_number}",
            self.prepared_by and f"Prepared by {self.prepared_by}",
            self.checked_by and f"Checked by {self.checked_by}",
        ]
        return " · ".join(p for p in parts if p)


class Provenance(_Frozen):
    """What produced the result, for traceability."""

    tool_version: str
    limit_set: str
    tables: dict[str, dict[str, str]] = Field(description="Table name → source, edition, sha256.")
    inputs: dict[str, str] = Field(description="Input file (as named in the record) → SHA-256.")
    method: str = Field(description="Integration and interpolation rule.")
    identity: ReportIdentity | None = Field(None, description="Who issues the report; null when nobody was named.")
    result_sha256: str = Field(
        "",
        description="SHA-256 of this result's JSON with this field empty: a result "
        "changed after it was made no longer matches it.",
    )


class Assessment(_Frozen):
    """The complete pre-screen of one product."""

    id: str
    name: str | None
    risk_group: RiskGroup | None = Field(
        description="Highest group over the assessed hazards with risk groups; a "
        "lower bound when complete is false; null when no such hazard "
        "could be assessed (no group determined)."
    )
    complete: bool = Field(description="Every applicable hazard was assessed.")
    basis: Basis = Field(
        "standard",
        description="'standard': assessed at the standard's distance, a "
        "classification; 'what-if': at a distance the record asks for "
        "(at_distance_mm), not a classification.",
    )
    standard_risk_group: RiskGroup | None = Field(
        None, description="For a what-if result: the group at the standard's assessment distance."
    )
    standard_assessment_distance_mm: float | None = Field(
        None, description="For a what-if result: the standard's assessment distance [mm]."
    )
    assessment_distance_mm: float
    alpha_rad: float
    illuminance_lx: float | None
    hazards: dict[str, HazardResult]
    not_assessed: list[str] = Field(description="Applicable hazards whose band the spectrum does not cover.")
    deciding_hazards: list[str] = Field(
        description="Hazards that set the overall group (empty when none is determined)."
    )
    geometry: Geometry
    photometry: Photometry
    spectrum: SpectrumSummary
    contributions: dict[str, SpectralShares] = Field(
        default_factory=dict,
        description="Each assessed hazard with a value above 0: where its weighted sum comes from, by wavelength band.",
    )
    blue_light_transfer: BlueLightTransfer | None = Field(
        None, description="IEC TR 62778 transfer quantities, where B(λ) and V(λ) are covered."
    )
    claims: list[ClaimCheck] = Field(default_factory=list, description="Vendor claims in the record, checked.")
    distances: DistanceStudy | None = Field(None, description="Hazard distances and t_max against distance.")
    uncertainty: UncertaintyStudy | None = Field(None, description="Groups within the stated uncertainty.")
    remedies: Remedies | None = Field(None, description="Dimming, diffuser and UV-band findings.")
    scaling: Scaling | None = Field(
        None, description="Photometric scaling of a relative spectrum; null for an absolute one."
    )
    emission: Emission | None = Field(
        None, description="Pulsed sources: the pulses and the rule that set the group; null for a continuous source."
    )
    exposure: ExposureStudy | None = Field(
        None, description="The day's exposures the record states, against the exposure limit values."
    )
    record: dict = Field(description="The product record as used.")
    warnings: list[str]
    assumptions: list[str]
    cautions: list[str]
    provenance: Provenance
    limit_set: LimitSetInfo = Field(description="The limit set's groups, boundaries and families, for renderers.")
    kind: Literal["hazard.assessment"] = "hazard.assessment"

    def content_sha256(self) -> str:
        """SHA-256 of the result's JSON with ``provenance.result_sha256`` empty."""
        blank = self.model_copy(update={"provenance": self.provenance.model_copy(update={"result_sha256": ""})})
        return hashlib.sha256(blank.model_dump_json().encode("utf-8")).hexdigest()

    def sealed(self) -> Assessment:
        """A copy of the result with its :meth:`content_sha256` recorded in the provenance."""
        return self.model_copy(
            update={"provenance": self.provenance.model_copy(update={"result_sha256": self.content_sha256()})}
        )

    @property
    def classification_group(self) -> RiskGroup | None:
        """The group the standard's distance gives.

        ``risk_group`` of a standard result, ``standard_risk_group`` of a what-if. Summaries, rankings and claims use
        this one.
        """
        return self.standard_risk_group if self.basis == "what-if" else self.risk_group

    @property
    def pulse_exceeds(self) -> bool:
        """A pulsed source with a pulse over its exposure limit (which makes it RG3)."""
        return any(h.pulse is not None and h.pulse.worst > 1 for h in self.hazards.values())
