"""The product record: one flat set of fields, the same in a TOML file, a CSV row and CLI options.

Field names are a contract other tooling relies on; see README "Record fields".
"""

from __future__ import annotations

import difflib
import re
import tomllib
from dataclasses import dataclass
from functools import cached_property
from pathlib import Path
from typing import Annotated, Literal

from pydantic import (
    AfterValidator,
    BaseModel,
    BeforeValidator,
    ConfigDict,
    Field,
    StrictInt,
    StrictStr,
    ValidationError,
    field_validator,
    model_validator,
)

from hazard.errors import InputError, excerpt
from hazard.inputs.units import EXPOSURE_SI, IRRADIANCE_SI, RADIANCE_SI, parse_spectral_unit
from hazard.inputs.userfiles import read_user_file
from hazard.standards import LIMIT_SETS, RiskGroup

__all__ = [
    "CLAIMABLE",
    "MAGNITUDE_BOUNDS",
    "Anchor",
    "ProductRecord",
    "SourceSize",
    "claim_field",
    "load_record",
    "read_record_file",
    "record_from_fields",
]

_DEFAULT_UNIT = {"irradiance": IRRADIANCE_SI, "radiance": RADIANCE_SI, "radiant_exposure": EXPOSURE_SI}
CW_LONGEST_PULSE_S = 0.25
"""A lamp lit longer than this is a continuous-wave lamp (IEC 62471:2006 3.5) [s]."""
PULSED_PEAK_TO_AVERAGE = 10.0
"""A train whose peak power is at least this many times its average is a pulsed lamp (CIE S 017:2011, 17-1001),
whatever its pulse duration [1]."""
DAY_S = 86400.0
"""A daily exposure lasts at most a day [s]."""
_DURATION = re.compile(r"^\s*([0-9]+(?:\.[0-9]*)?(?:[eE][+-]?[0-9]+)?)\s*(µs|us|ms|s|sec|min|h|hr|d)?\s*$")
_DURATION_UNITS = {
    "µs": 1e-6,
    "us": 1e-6,
    "ms": 1e-3,
    "s": 1.0,
    "sec": 1.0,
    "min": 60.0,
    "h": 3600.0,
    "hr": 3600.0,
    "d": 86400.0,
}


def parse_duration_s(value: object) -> object:
    """A duration in seconds from a number, or from text like ``90s``, ``15min``, ``2h``, ``2 ms`` [s].

    Other values are returned as they are, for the field's own validation to refuse.

    Examples
    --------
    >>> parse_duration_s("15min"), parse_duration_s("2 h"), parse_duration_s("2ms"), parse_duration_s(30)
    (900.0, 7200.0, 0.002, 30)
    """
    if isinstance(value, str):
        match = _DURATION.match(value)
        if match is None:
            raise ValueError(f"{value[:40]!r} is not a duration: give seconds, or e.g. 90s, 15min, 2h, 5ms")
        return float(match.group(1)) * _DURATION_UNITS[match.group(2) or "s"]
    return value


SHORTEST_S = 1e-9
"""Shortest pulse or exposure read [s]: the exposure limits for incoherent sources do not reach below a
nanosecond (the retinal-thermal one starts at 10 µs and is held there), and shorter times overflow t^−1 terms."""


def _positive_duration(value: float) -> float:
    if not SHORTEST_S <= value <= DAY_S:
        raise ValueError(
            f"{value:g} s is not a usable duration: give at least {SHORTEST_S:g} s (1 ns) and at most {DAY_S:g} s "
            "(a day)"
        )
    return value


Duration = Annotated[float, BeforeValidator(parse_duration_s), AfterValidator(_positive_duration)]
"""A duration in seconds, from a nanosecond to a day; text with a unit (``15min``) is read [s]."""


class ExposureEntry(BaseModel):
    """One daily exposure: a distance, a duration per day and what the person does there."""

    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)

    distance_mm: float = Field(ge=1e-3, le=1e8, description="Distance from the source [mm].")
    duration_s: Duration = Field(description="Time spent there in a day [s].")
    label: str | None = Field(None, max_length=200, description="What the person does, for the reader.")


def _check_pulses(record: ProductRecord) -> None:
    """A pulsed source: pulses shorter than 0.25 s (or a train with peak ≥ 10× average), a rate for a train."""
    duration, rate = record.pulse_duration_s, record.pulse_rate_hz
    if duration is None:
        raise ValueError(f"emission {record.emission!r} needs pulse_duration_s, the half-peak width of a pulse")
    if record.lamp_type == "gls":
        raise ValueError(
            "a general lighting service lamp is a continuous-wave lamp (IEC 62471:2006 3.5): set "
            'lamp_type = "other" or emission = "continuous"'
        )
    if record.quantity == "relative":
        raise ValueError(
            "a pulsed source needs an absolute spectrum (its peak, or one pulse's radiant exposure): a "
            "photometric anchor of a flash is ambiguous"
        )
    if record.emission == "single_pulse":
        if rate is not None:
            raise ValueError('a single pulse has no pulse_rate_hz: set emission = "pulse_train" or remove the rate')
        if duration >= CW_LONGEST_PULSE_S:
            raise ValueError(
                f"a pulse of {duration:g} s is not a pulse: a lamp lit {CW_LONGEST_PULSE_S:g} s or longer "
                f'is a continuous-wave lamp (IEC 62471:2006 3.5); set emission = "continuous"'
            )
        return
    if rate is None:
        raise ValueError("a pulse train needs pulse_rate_hz, the pulses per second")
    duty = duration * rate
    if duty > 1:
        raise ValueError(
            f"pulses of {duration:g} s at {rate:g} Hz overlap (duty cycle {duty:.3g} > 1): check the "
            f"duration and the rate"
        )
    if duration >= CW_LONGEST_PULSE_S and duty > 1 / PULSED_PEAK_TO_AVERAGE:
        raise ValueError(
            f"pulses of {duration:g} s with a peak {1 / duty:.3g}× the average are not a pulsed lamp "
            f"(pulses under {CW_LONGEST_PULSE_S:g} s, or a peak at least {PULSED_PEAK_TO_AVERAGE:g}× the "
            f'average; IEC 62471:2006 3.5, CIE S 017:2011 17-1001): set emission = "continuous"'
        )


CLAIMABLE = tuple(dict.fromkeys(symbol for limit_set in LIMIT_SETS.values() for symbol in limit_set.claimable))
"""Hazard symbols a record may claim a t_max for, from the limit sets (field :func:`claim_field`)."""


def claim_field(symbol: str) -> str:
    """The record field that holds a claimed t_max of ``symbol``."""
    return f"claimed_t_max_s_{symbol}"


AnchorField = Literal["illuminance_lx", "luminous_intensity_cd", "luminance_cd_m2"]
"""A record field that can anchor a relative spectrum."""


@dataclass(frozen=True)
class Anchor:
    """The photometric value a relative spectrum is scaled by.

    Attributes
    ----------
    field : str
        The record field: ``illuminance_lx``, ``luminous_intensity_cd`` or ``luminance_cd_m2``.
    value : float
        The stated value [lx, cd or cd m⁻²].
    """

    field: AnchorField
    value: float

    @property
    def is_radiance(self) -> bool:
        """A luminance anchor makes the spectrum a radiance."""
        return self.field == "luminance_cd_m2"


@dataclass(frozen=True)
class SourceSize:
    """The source's size as the record states it, in one typed value.

    Attributes
    ----------
    shape : str
        ``"disc"``, ``"rectangle"``, or ``"angle"`` (a disc given by its angular subtense at the measurement
        distance).
    width_mm : float
        Diameter, or width [mm] (for an angle: α·d).
    height_mm : float or None
        Height of a rectangle [mm].
    """

    shape: Literal["disc", "rectangle", "angle"]
    width_mm: float
    height_mm: float | None = None

    @property
    def largest_dimension_mm(self) -> float:
        """Largest linear dimension [mm]."""
        return max(self.width_mm, self.height_mm or 0.0)


RELATIVE_UNITS = ("relative", "rel", "a.u.", "au", "arb", "1", "counts")
"""Units accepted for a relative spectrum (they all mean: no physical unit)."""
ANCHORS: tuple[AnchorField, ...] = ("illuminance_lx", "luminous_intensity_cd", "luminance_cd_m2")
"""Photometric anchors that scale a relative spectrum."""
MAX_RECORD_BYTES = 1024 * 1024
"""Largest TOML record read; a record is a few hundred bytes [bytes]."""
MAX_COLUMN_NUMBER = 1_000_000
"""Largest value-column number accepted [1]."""
_GEOMETRY = "outside it no measurement geometry can be computed"
_ANGLE = "no angle exceeds π rad"
MAGNITUDE_BOUNDS: dict[str, tuple[float, float, str, str, str]] = {
    # field: (lowest, highest, unit, what it is, why). Common practice, no published source: each range holds
    # every real measurement by orders of magnitude, and keeps the geometry and the studies within the range
    # of floating-point numbers (no overflow, no division by a vanishing number).
    "distance_mm": (1e-3, 1e8, "mm", "distance", _GEOMETRY),
    "at_distance_mm": (1e-3, 1e8, "mm", "distance", _GEOMETRY),
    "source_diameter_mm": (1e-4, 1e6, "mm", "source size", _GEOMETRY),
    "source_width_mm": (1e-4, 1e6, "mm", "source size", _GEOMETRY),
    "source_height_mm": (1e-4, 1e6, "mm", "source size", _GEOMETRY),
    "source_alpha_mrad": (1e-6, 3141.59, "mrad", "angular subtense", _ANGLE),
    "measurement_fov_mrad": (1e-6, 3141.59, "mrad", "field of view", _ANGLE),
    "illuminance_lx": (1e-6, 1e9, "lx", "illuminance", "ten thousand times full sunlight is beyond any lamp"),
    "luminous_intensity_cd": (1e-6, 1e12, "cd", "luminous intensity", "beyond any lamp"),
    "luminance_cd_m2": (1e-6, 1e12, "cd/m2", "luminance", "a thousand times the sun's luminance is beyond any lamp"),
    "peak_to_mean_radiance": (1.0, 1e4, "", "peak-to-mean ratio", "beyond any LED array or hot spot"),
    "exposure_distance_mm": (1e-3, 1e8, "mm", "distance", _GEOMETRY),
    "pulse_rate_hz": (1e-6, 1e9, "Hz", "pulse rate", "from one pulse in eleven days to a gigahertz"),
    "claimed_cct_k": (100.0, 1e6, "K", "colour temperature", "outside any light source's"),
    "claimed_illuminance_lx": (1e-6, 1e9, "lx", "illuminance", "beyond any lamp"),
    "claimed_distance_mm": (1e-3, 1e8, "mm", "distance", _GEOMETRY),
    **{
        claim_field(symbol): (1e-6, 1e12, "s", "exposure time", "from a microsecond to 30 000 years")
        for symbol in CLAIMABLE
    },
}
"""Range of each physical field [its unit]: lowest, highest, unit, what it is, why the bound."""


class ProductRecord(BaseModel):
    """What the user tells about one product: where its spectrum is and how it was measured."""

    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)

    id: str = Field(min_length=1, max_length=200, description="Product identifier, unique within a batch.")
    name: str | None = Field(None, max_length=1000, description="Human-readable product name.")
    vendor: str | None = Field(None, max_length=1000, description="Who makes or sells the product.")
    model: str | None = Field(None, max_length=1000, description="The vendor's model designation.")
    spectrum: str | None = Field(
        None, max_length=4096, description="Spectrum file, relative to the record file's folder."
    )
    quantity: Literal["irradiance", "radiance", "relative", "radiant_exposure"] = Field(
        "irradiance",
        description="What the spectrum holds: spectral irradiance, spectral radiance, a relative spectrum scaled by "
        "a photometric anchor, or the radiant exposure of one pulse (J/m2/nm, or J/m2/sr/nm for a radiance dose).",
    )
    unit: str | None = Field(
        None,
        max_length=200,
        description="Unit of the spectral values, e.g. W/m2/nm, mW/m2/nm, uW/cm2/nm, W/m2/sr/nm. Default by quantity.",
    )
    column: StrictStr | StrictInt | None = Field(
        None, description="Value column to use when the file has several (header name or 1-based index)."
    )
    distance_mm: float | None = Field(
        None, gt=0, description="Distance at which the spectrum was measured [mm]; required for irradiance."
    )
    source_diameter_mm: float | None = Field(None, gt=0, description="Diameter of a round source [mm].")
    source_width_mm: float | None = Field(None, gt=0, description="Width of a rectangular source [mm].")
    source_height_mm: float | None = Field(None, gt=0, description="Height of a rectangular source [mm].")
    source_alpha_mrad: float | None = Field(
        None, gt=0, description="Angular subtense of the source at distance_mm [mrad]."
    )
    lamp_type: Literal["gls", "other"] = Field(
        "other",
        description="'gls': general lighting service, assessed where it gives 500 lx (not nearer "
        "than 200 mm); 'other': assessed at 200 mm.",
    )
    no_emission_outside: bool = Field(
        False,
        description="Within the hazard bands (200-3000 nm) the source "
        "emits nothing outside the measured range; gaps in "
        "a band count as zero.",
    )
    measurement_fov_mrad: float | None = Field(
        None,
        gt=0,
        description="Field of view of a radiance measurement [mrad] (full angle); needs distance_mm, where it was "
        "measured: a field wider than the source is corrected by Ω_fov/Ω_s.",
    )
    illuminance_lx: float | None = Field(
        None, gt=0, description="Anchor of a relative spectrum: illuminance at distance_mm [lx]."
    )
    luminous_intensity_cd: float | None = Field(
        None,
        gt=0,
        description="Anchor of a relative spectrum: "
        "luminous intensity [cd]; illuminance "
        "follows by the inverse-square law.",
    )
    luminance_cd_m2: float | None = Field(
        None, gt=0, description="Anchor of a relative spectrum: luminance [cd/m2]; the spectrum is then a radiance."
    )
    uncertainty_pct: float | None = Field(
        None, ge=0, lt=100, description="Expanded uncertainty (k = 2) of the spectral values [%]."
    )
    wavelength_uncertainty_nm: float | None = Field(
        None, ge=0, le=20, description="Uncertainty of the wavelength scale [nm]."
    )
    peak_to_mean_radiance: float = Field(
        1.0,
        ge=1,
        description="Peak-to-mean radiance of the source (LED "
        "arrays, hot spots); multiplies the radiance "
        "seen by fields of view smaller than the source.",
    )
    at_distance_mm: float | None = Field(
        None,
        gt=0,
        description="Assess at this distance instead of the "
        "standard's (a what-if study: the group is "
        "then not the standard's classification) [mm].",
    )
    emission: Literal["continuous", "single_pulse", "pulse_train"] = Field(
        "continuous",
        description="'continuous' (lit for more than 0.25 s), 'single_pulse' or 'pulse_train'; a pulsed source's "
        "spectrum is its peak (or, with quantity radiant_exposure, one pulse's exposure).",
    )
    pulse_duration_s: Duration | None = Field(
        None, description="Half-peak width of each pulse [s]; human durations like 2ms are read."
    )
    pulse_rate_hz: float | None = Field(None, gt=0, description="Pulses per second of a pulse train [Hz].")
    exposure_distance_mm: float | None = Field(
        None, gt=0, description="Distance of one daily exposure to assess against the exposure limits [mm]."
    )
    exposure_duration_s: Duration | None = Field(
        None, description="Time spent at exposure_distance_mm in a day [s]; human durations like 15min, 2h are read."
    )
    exposure: list[ExposureEntry] | None = Field(
        None, description="Several daily exposures (TOML [[exposure]] tables of distance_mm, duration_s, label)."
    )
    claimed_risk_group: RiskGroup | None = Field(None, description="The vendor's claimed overall risk group.")
    claimed_cct_k: float | None = Field(None, gt=0, description="The vendor's claimed CCT [K].")
    claimed_illuminance_lx: float | None = Field(
        None, gt=0, description="The vendor's claimed illuminance at distance_mm [lx]."
    )
    claimed_distance_mm: float | None = Field(
        None,
        gt=0,
        description="Distance at which the vendor's risk group and t_max claims hold [mm]; the standard's "
        "assessment distance when not stated.",
    )
    # One claimed t_max field per claimable hazard of the limit sets, generated from them (never hand-written):
    for _symbol in CLAIMABLE:
        __annotations__[claim_field(_symbol)] = "float | None"
        locals()[claim_field(_symbol)] = Field(None, gt=0, description=f"Claimed t_max of {_symbol} [s].")
    del _symbol

    @field_validator(*MAGNITUDE_BOUNDS)
    @classmethod
    def _within_bounds(cls, value: float | None, info) -> float | None:
        if value is None:
            return value
        low, high, unit, what, why = MAGNITUDE_BOUNDS[info.field_name]
        if not low <= value <= high:
            raise ValueError(
                f"{value:g}{' ' + unit if unit else ''} is not a usable {what}: give {low:g} to "
                f"{high:g}{' ' + unit if unit else ''} ({why})"
            )
        return value

    @field_validator("id")
    @classmethod
    def _printable_id(cls, product_id: str) -> str:
        if not product_id.isprintable():
            raise ValueError(
                f"the id {excerpt(product_id)} holds a control character (a line break, tab or "
                f"similar): give a printable id"
            )
        return product_id

    @field_validator("column")
    @classmethod
    def _column_number(cls, column: str | int | None) -> str | int | None:
        number = column if isinstance(column, int) else None
        if isinstance(column, str):
            if len(column) > 1000:
                raise ValueError("a column name of more than 1000 characters: give the header's name or a number")
            if column.isdigit():  # "12", but also "²" or "١": only plain decimal digits make a number
                if not (column.isascii() and len(column) <= 7):
                    raise ValueError(
                        f"column {excerpt(column)} is not a column number: give a number from 1 "
                        f"written with the digits 0-9, or a header name"
                    )
                number = int(column)
        if number is not None and not 1 <= number <= MAX_COLUMN_NUMBER:
            raise ValueError(
                f"column {number} does not exist: value columns count from 1 (the first column after the wavelength)"
            )
        return column

    @field_validator("unit")
    @classmethod
    def _unit_readable(cls, unit: str | None) -> str | None:
        if unit is None or unit.strip().lower() in RELATIVE_UNITS:
            return unit
        try:
            parse_spectral_unit(unit)
        except ValueError as exc:
            raise ValueError(str(exc)) from None
        return unit

    @model_validator(mode="after")
    def _consistent(self) -> ProductRecord:
        rect = (self.source_width_mm, self.source_height_mm)
        forms = [
            self.source_diameter_mm is not None,
            any(v is not None for v in rect),
            self.source_alpha_mrad is not None,
        ]
        if sum(forms) == 0:
            raise ValueError(
                "missing source size: give source_diameter_mm, or source_width_mm and "
                "source_height_mm, or source_alpha_mrad"
            )
        if sum(forms) > 1:
            raise ValueError(
                "give exactly one source size: source_diameter_mm, or source_width_mm + "
                "source_height_mm, or source_alpha_mrad"
            )
        if any(v is not None for v in rect) and None in rect:
            raise ValueError("source_width_mm and source_height_mm go together: give both")
        if self.quantity == "irradiance" and self.distance_mm is None:
            raise ValueError("distance_mm is required for an irradiance spectrum (the measurement distance)")
        if self.source_alpha_mrad is not None and self.distance_mm is None:
            raise ValueError("source_alpha_mrad needs distance_mm, the distance at which it was measured")
        if self.measurement_fov_mrad is not None and self.distance_mm is None and self.quantity != "irradiance":
            raise ValueError(
                "measurement_fov_mrad needs distance_mm, where the radiance was measured: a meter whose field is "
                "wider than the source reads low by the ratio of the solid angles"
            )
        anchors = [a for a in ANCHORS if getattr(self, a) is not None]
        if self.quantity == "relative":
            if self.unit is not None and self.unit.strip().lower() not in RELATIVE_UNITS:
                raise ValueError(
                    f'a relative spectrum has no physical unit (got {self.unit!r}): leave unit out or write "relative"'
                )
            if len(anchors) != 1:
                raise ValueError(
                    "a relative spectrum needs exactly one anchor: illuminance_lx (with "
                    "distance_mm), luminous_intensity_cd, or luminance_cd_m2"
                )
            if anchors == ["illuminance_lx"] and self.distance_mm is None:
                raise ValueError("illuminance_lx needs distance_mm, the distance at which it was measured")
            return self
        if anchors:
            raise ValueError(f'{anchors[0]} scales a relative spectrum: set quantity = "relative" or remove it')
        try:
            unit = parse_spectral_unit(self.unit_text)
        except ValueError as exc:
            raise ValueError(str(exc)) from None
        if self.quantity == "radiant_exposure":
            if not unit.energy:
                raise ValueError(
                    f"unit {self.unit_text!r} is a power: the radiant exposure of a pulse is in J, "
                    f"e.g. J/m2/nm, mJ/cm2/nm or J/m2/sr/nm"
                )
        elif unit.energy or unit.per_steradian != (self.quantity == "radiance"):
            raise ValueError(
                f"unit {self.unit_text!r} does not fit quantity {self.quantity!r}: radiance units "
                f"have /sr, irradiance units do not, and J is for quantity radiant_exposure"
            )
        return self

    @model_validator(mode="after")
    def _emission_consistent(self) -> ProductRecord:
        """Pulses described completely, exposures completely (method: pulsed sources, exposure scenarios)."""
        pulsed = self.emission != "continuous"
        if not pulsed and (self.pulse_duration_s is not None or self.pulse_rate_hz is not None):
            raise ValueError(
                'pulse_duration_s and pulse_rate_hz describe a pulsed source: set emission = "single_pulse" or '
                '"pulse_train", or remove them'
            )
        if self.quantity == "radiant_exposure" and not pulsed:
            raise ValueError(
                'a radiant-exposure spectrum is the exposure of one pulse: set emission = "single_pulse" or '
                '"pulse_train" and pulse_duration_s'
            )
        if pulsed:
            _check_pulses(self)
        if (self.exposure_distance_mm is None) != (self.exposure_duration_s is None):
            raise ValueError("exposure_distance_mm and exposure_duration_s go together: give both")
        if self.emission == "single_pulse" and self.exposures:
            raise ValueError(
                'a single pulse has no daily duration: describe repeated flashes as emission = "pulse_train" with '
                "pulse_rate_hz, or remove the exposures"
            )
        return self

    @property
    def unit_text(self) -> str:
        """The unit as given, or the default for the quantity (relative spectra keep their own scale)."""
        return (
            _DEFAULT_UNIT[self.effective_quantity]
            if self.quantity == "relative"
            else (self.unit or _DEFAULT_UNIT[self.quantity])
        )

    @property
    def exposures(self) -> list[ExposureEntry]:
        """Every daily exposure the record states: the flat fields first, then the [[exposure]] tables."""
        flat = []
        if self.exposure_distance_mm is not None and self.exposure_duration_s is not None:
            flat.append(ExposureEntry(distance_mm=self.exposure_distance_mm, duration_s=self.exposure_duration_s))
        return flat + list(self.exposure or [])

    @property
    def effective_quantity(self) -> Literal["irradiance", "radiance"]:
        """What the spectrum is after anchoring.

        A relative spectrum with a luminance anchor is a radiance, with an illuminance or intensity anchor an
        irradiance.
        """
        if self.quantity == "relative":
            return "radiance" if self.anchor is not None and self.anchor.is_radiance else "irradiance"
        if self.quantity == "radiant_exposure":
            return "radiance" if parse_spectral_unit(self.unit_text).per_steradian else "irradiance"
        return self.quantity

    @property
    def reference_distance_mm(self) -> float | None:
        """Distance the irradiance refers to [mm].

        distance_mm, or 1000 mm for a luminous-intensity anchor without one (E_v = I/d²).
        """
        if self.distance_mm is None and self.quantity == "relative" and self.luminous_intensity_cd is not None:
            return 1000.0
        return self.distance_mm

    @property
    def irradiance_distance_mm(self) -> float:
        """:attr:`reference_distance_mm` of a spectrum that is, or is anchored to, an irradiance [mm].

        The validator requires a distance for every such record, so only a radiance record has none.
        """
        distance = self.reference_distance_mm
        if distance is None:
            raise ValueError("a radiance record has no irradiance distance")  # excluded by the validator
        return distance

    @property
    def claimed_t_max_s(self) -> dict[str, float]:
        """Claimed t_max per hazard symbol [s]."""
        return {s: v for s in CLAIMABLE if (v := getattr(self, claim_field(s))) is not None}

    @property
    def makes_claims(self) -> bool:
        """The record states at least one vendor claim (a claimed group, CCT, illuminance or t_max)."""
        claimed = (self.claimed_risk_group, self.claimed_cct_k, self.claimed_illuminance_lx)
        return any(v is not None for v in claimed) or bool(self.claimed_t_max_s)

    @cached_property
    def source(self) -> SourceSize:
        """The source size as one typed value (the validator has made sure exactly one form is given)."""
        if self.source_diameter_mm is not None:
            return SourceSize("disc", self.source_diameter_mm)
        if self.source_width_mm is not None and self.source_height_mm is not None:
            return SourceSize("rectangle", self.source_width_mm, self.source_height_mm)
        if self.source_alpha_mrad is None or self.distance_mm is None:
            raise ValueError("a record without a source size")  # excluded by the validator
        return SourceSize("angle", self.source_alpha_mrad * 1e-3 * self.distance_mm)

    @cached_property
    def anchor(self) -> Anchor | None:
        """The photometric anchor of a relative spectrum; None for an absolute one."""
        for name in ANCHORS:
            value = getattr(self, name)
            if value is not None:
                return Anchor(name, value)
        return None

    @property
    def largest_dimension_mm(self) -> float:
        """Largest linear dimension of the source [mm] (for a source given by α: α·d)."""
        return self.source.largest_dimension_mm


def _line_of(text: str, key: str) -> int | None:
    match = re.search(rf"^[ \t]*{re.escape(key)}[ \t]*=", text, flags=re.MULTILINE)  # no \s: linear time
    return None if match is None else text.count("\n", 0, match.start()) + 1


def _as_input_error(
    exc: ValidationError, path: str, text: str | None, option_names: bool, from_options: frozenset[str] = frozenset()
) -> InputError:
    """The first pydantic error as one line naming the field (or option), its line and the fix.

    A field in ``from_options`` was given on the command line: the message names the option, not the file.
    """
    error = exc.errors()[0]
    key = str(error["loc"][0]) if error["loc"] else None
    if key in from_options:
        path, text, option_names = "command line", None, True
    message = error["msg"].removeprefix("Value error, ")
    if key is None and text:  # a rule across fields: point at the first field it names that the file sets
        named = sorted(
            (message.find(f), f)
            for f in ProductRecord.model_fields
            if re.search(rf"\b{f}\b", message) and _line_of(text, f) is not None
        )
        key_for_line = named[0][1] if named else None
    else:
        key_for_line = key
    line = _line_of(text, key_for_line) if (text and key_for_line) else None
    if option_names:
        message = re.sub(
            r"\b("
            + "|".join(sorted((f for f in ProductRecord.model_fields if "_" in f), key=len, reverse=True))
            + r")\b",
            lambda m: "--" + m.group(1).replace("_", "-"),
            message,
        )
    label = f"--{key.replace('_', '-')}" if (option_names and key) else key
    if error["type"] == "extra_forbidden" and key is not None:
        close = difflib.get_close_matches(key, ProductRecord.model_fields, n=1)
        hint = f"did you mean {close[0]!r}?" if close else "see 'hazard schema record' for the fields"
        return InputError(f"unknown field {key!r}", hint, path, line)
    if error["type"] == "missing":
        return InputError(f"required field {label!r} is missing", f"add {label}", path, line)
    if key:
        return InputError(f"{label}: {message}", "correct this field (see 'hazard schema record')", path, line)
    return InputError(message, "correct the record (see 'hazard schema record')", path, line)


def record_from_fields(
    fields: dict,
    *,
    path: str,
    text: str | None = None,
    option_names: bool = False,
    from_options: frozenset[str] = frozenset(),
) -> ProductRecord:
    """Validate a dict of record fields (from TOML, a CSV row or CLI options).

    Parameters
    ----------
    fields : dict
        Field name → value.
    path : str
        Where the fields came from, for messages.
    text : str, optional
        The file's text, to find line numbers.
    option_names : bool
        Name fields as CLI options (``--distance-mm``) in messages.
    from_options : frozenset of str
        Fields given as CLI options over a file's: an error in one names the option, not the file.

    Raises
    ------
    InputError
    """
    try:
        return ProductRecord(**fields)
    except ValidationError as exc:
        raise _as_input_error(exc, path, text, option_names, from_options) from None


def read_record_file(path: str | Path) -> tuple[dict, str, bytes]:
    """The fields of a TOML record, its text (for line numbers in messages) and its bytes (for the hash).

    Raises
    ------
    InputError
        Not a regular file, too large, not UTF-8, or not valid TOML.
    """
    raw = read_user_file(
        path,
        what="record",
        max_bytes=MAX_RECORD_BYTES,
        fix_missing="check the path",
        fix_large="a record is a few lines of 'field = value'",
    )
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("record is not UTF-8 text", "save the TOML file as UTF-8", str(path)) from None
    return parse_toml(text, str(path)), text, raw


def parse_toml(text: str, path: str) -> dict:
    """The fields of a TOML text.

    Raises
    ------
    InputError
        Not valid TOML (naming the line), or beyond what the parser can hold (nesting, huge integers).
    """
    fix = "write one 'field = value' per line; quote text values"
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        match = re.search(r"line (\d+)", str(exc))
        raise InputError(f"not valid TOML ({exc})", fix, path, int(match.group(1)) if match else None) from None
    except RecursionError:
        raise InputError("not a record: arrays or tables nested too deep", fix, path) from None
    except ValueError as exc:  # e.g. an integer of more than 4300 digits
        raise InputError(f"not a usable TOML value ({excerpt(exc, 80)})", fix, path) from None


def load_record(path: str | Path, overrides: dict | None = None) -> ProductRecord:
    """Read a TOML product record; ``overrides`` (e.g. CLI options) replace fields.

    Raises
    ------
    InputError
        Unreadable TOML, unknown or invalid fields.
    """
    fields, text, _ = read_record_file(path)
    fields.update(overrides or {})
    return record_from_fields(fields, path=str(path), text=text, from_options=frozenset(overrides or {}))
