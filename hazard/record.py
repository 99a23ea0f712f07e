"""The product record: one flat set of fields, the same in a TOML file, a CSV row and CLI options.

Field names are a contract other tooling relies on; see README "Record fields".
"""

from __future__ import annotations

import difflib
import re
import tomllib
from pathlib import Path
from typing import Literal

from pydantic import (
    BaseModel,
    ConfigDict,
    Field,
    StrictInt,
    StrictStr,
    ValidationError,
    field_validator,
    model_validator,
)

from hazard.errors import InputError
from hazard.units import IRRADIANCE_SI, RADIANCE_SI, parse_spectral_unit

__all__ = ["ProductRecord", "load_record", "record_from_fields"]

_DEFAULT_UNIT = {"irradiance": IRRADIANCE_SI, "radiance": RADIANCE_SI}
HAZARD_SYMBOLS = ("E_S", "E_UVA", "L_B", "E_B", "L_R", "L_IR", "E_IR", "E_H")
"""Symbols that may carry a claimed t_max (``claimed_t_max_s_<SYMBOL>``)."""
RELATIVE_UNITS = ("relative", "rel", "a.u.", "au", "arb", "1", "counts")
"""Units accepted for a relative spectrum (they all mean: no physical unit)."""
ANCHORS = ("illuminance_lx", "luminous_intensity_cd", "luminance_cd_m2")
"""Photometric anchors that scale a relative spectrum."""


class ProductRecord(BaseModel):
    """What the user tells about one product: where its spectrum is and how it was measured."""

    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)

    id: str = Field(min_length=1, description="Product identifier, unique within a batch.")
    name: str | None = Field(None, description="Human-readable product name.")
    vendor: str | None = Field(None, description="Who makes or sells the product.")
    model: str | None = Field(None, description="The vendor's model designation.")
    spectrum: str | None = Field(None, description="Spectrum file, relative to the record file's folder.")
    quantity: Literal["irradiance", "radiance", "relative"] = Field(
        "irradiance", description="What the spectrum holds: spectral irradiance, spectral radiance, or a "
                                  "relative spectrum scaled by a photometric anchor.")
    unit: str | None = Field(None, description="Unit of the spectral values, e.g. W/m2/nm, mW/m2/nm, "
                                               "uW/cm2/nm, W/m2/sr/nm. Default by quantity.")
    column: StrictStr | StrictInt | None = Field(None, description="Value column to use when the file has several "
                                                       "(header name or 1-based index).")
    distance_mm: float | None = Field(None, gt=0, description="Distance at which the spectrum was measured "
                                                              "[mm]; required for irradiance.")
    source_diameter_mm: float | None = Field(None, gt=0, description="Diameter of a round source [mm].")
    source_width_mm: float | None = Field(None, gt=0, description="Width of a rectangular source [mm].")
    source_height_mm: float | None = Field(None, gt=0, description="Height of a rectangular source [mm].")
    source_alpha_mrad: float | None = Field(None, gt=0, description="Angular subtense of the source at "
                                                                    "distance_mm [mrad].")
    lamp_type: Literal["gls", "other"] = Field(
        "other", description="'gls': general lighting service, assessed where it gives 500 lx (not nearer "
                             "than 200 mm); 'other': assessed at 200 mm.")
    no_emission_outside: bool = Field(False, description="Within the hazard bands (200-3000 nm) the source "
                                                         "emits nothing outside the measured range; gaps in "
                                                         "a band count as zero.")
    measurement_fov_mrad: float | None = Field(None, gt=0, description="Field of view of a radiance "
                                                                       "measurement [mrad].")
    illuminance_lx: float | None = Field(None, gt=0, description="Anchor of a relative spectrum: illuminance "
                                                                 "at distance_mm [lx].")
    luminous_intensity_cd: float | None = Field(None, gt=0, description="Anchor of a relative spectrum: "
                                                                        "luminous intensity [cd]; illuminance "
                                                                        "follows by the inverse-square law.")
    luminance_cd_m2: float | None = Field(None, gt=0, description="Anchor of a relative spectrum: luminance "
                                                                  "[cd/m2]; the spectrum is then a radiance.")
    uncertainty_pct: float | None = Field(None, ge=0, lt=100, description="Expanded uncertainty (k = 2) of the "
                                                                         "spectral values [%].")
    wavelength_uncertainty_nm: float | None = Field(None, ge=0, le=20, description="Uncertainty of the "
                                                                                   "wavelength scale [nm].")
    peak_to_mean_radiance: float = Field(1.0, ge=1, description="Peak-to-mean radiance of the source (LED "
                                                                "arrays, hot spots); multiplies the radiance "
                                                                "seen by fields of view smaller than the source.")
    at_distance_mm: float | None = Field(None, gt=0, description="Assess at this distance instead of the "
                                                                 "standard's (a what-if study: the group is "
                                                                 "then not the standard's classification) [mm].")
    claimed_risk_group: Literal["Exempt", "RG1", "RG2", "RG3"] | None = Field(
        None, description="The vendor's claimed overall risk group.")
    claimed_cct_k: float | None = Field(None, gt=0, description="The vendor's claimed CCT [K].")
    claimed_illuminance_lx: float | None = Field(None, gt=0, description="The vendor's claimed illuminance at "
                                                                         "distance_mm [lx].")
    claimed_t_max_s_E_S: float | None = Field(None, gt=0, description="Claimed t_max of E_S [s].")
    claimed_t_max_s_E_UVA: float | None = Field(None, gt=0, description="Claimed t_max of E_UVA [s].")
    claimed_t_max_s_L_B: float | None = Field(None, gt=0, description="Claimed t_max of L_B [s].")
    claimed_t_max_s_E_B: float | None = Field(None, gt=0, description="Claimed t_max of E_B [s].")
    claimed_t_max_s_L_R: float | None = Field(None, gt=0, description="Claimed t_max of L_R [s].")
    claimed_t_max_s_L_IR: float | None = Field(None, gt=0, description="Claimed t_max of L_IR [s].")
    claimed_t_max_s_E_IR: float | None = Field(None, gt=0, description="Claimed t_max of E_IR [s].")
    claimed_t_max_s_E_H: float | None = Field(None, gt=0, description="Claimed t_max of E_H [s].")

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
    def _consistent(self) -> "ProductRecord":
        rect = (self.source_width_mm, self.source_height_mm)
        forms = [self.source_diameter_mm is not None, any(v is not None for v in rect),
                 self.source_alpha_mrad is not None]
        if sum(forms) == 0:
            raise ValueError("missing source size: give source_diameter_mm, or source_width_mm and "
                             "source_height_mm, or source_alpha_mrad")
        if sum(forms) > 1:
            raise ValueError("give exactly one source size: source_diameter_mm, or source_width_mm + "
                             "source_height_mm, or source_alpha_mrad")
        if any(v is not None for v in rect) and None in rect:
            raise ValueError("source_width_mm and source_height_mm go together: give both")
        if self.quantity == "irradiance" and self.distance_mm is None:
            raise ValueError("distance_mm is required for an irradiance spectrum (the measurement distance)")
        anchors = [a for a in ANCHORS if getattr(self, a) is not None]
        if self.quantity == "relative":
            if self.unit is not None and self.unit.strip().lower() not in RELATIVE_UNITS:
                raise ValueError(f"a relative spectrum has no physical unit (got {self.unit!r}): leave unit out "
                                 f"or write \"relative\"")
            if len(anchors) != 1:
                raise ValueError("a relative spectrum needs exactly one anchor: illuminance_lx (with "
                                 "distance_mm), luminous_intensity_cd, or luminance_cd_m2")
            if anchors == ["illuminance_lx"] and self.distance_mm is None:
                raise ValueError("illuminance_lx needs distance_mm, the distance at which it was measured")
            return self
        if anchors:
            raise ValueError(f"{anchors[0]} scales a relative spectrum: set quantity = \"relative\" or remove it")
        if self.source_alpha_mrad is not None and self.distance_mm is None:
            raise ValueError("source_alpha_mrad needs distance_mm, the distance at which it was measured")
        try:
            unit = parse_spectral_unit(self.unit_text)
        except ValueError as exc:
            raise ValueError(str(exc)) from None
        if unit.per_steradian != (self.quantity == "radiance"):
            raise ValueError(f"unit {self.unit_text!r} does not fit quantity {self.quantity!r}: radiance units "
                             f"have /sr, irradiance units do not")
        return self

    @property
    def unit_text(self) -> str:
        """The unit as given, or the default for the quantity (relative spectra keep their own scale)."""
        if self.quantity == "relative":
            return RADIANCE_SI if self.luminance_cd_m2 is not None else IRRADIANCE_SI
        return self.unit or _DEFAULT_UNIT[self.quantity]

    @property
    def effective_quantity(self) -> str:
        """What the spectrum is after anchoring: a relative spectrum with a luminance anchor is a radiance,
        with an illuminance or intensity anchor an irradiance."""
        if self.quantity == "relative":
            return "radiance" if self.luminance_cd_m2 is not None else "irradiance"
        return self.quantity

    @property
    def reference_distance_mm(self) -> float | None:
        """Distance the irradiance refers to: distance_mm, or 1000 mm for a luminous-intensity anchor
        without one (E_v = I/d²) [mm]."""
        if self.distance_mm is None and self.quantity == "relative" and self.luminous_intensity_cd is not None:
            return 1000.0
        return self.distance_mm

    @property
    def claimed_t_max_s(self) -> dict[str, float]:
        """Claimed t_max per hazard symbol [s]."""
        return {s: v for s in HAZARD_SYMBOLS if (v := getattr(self, f"claimed_t_max_s_{s}")) is not None}

    @property
    def largest_dimension_mm(self) -> float | None:
        """Largest linear dimension of the source [mm], where the record gives it (or α and distance)."""
        if self.source_diameter_mm is not None:
            return self.source_diameter_mm
        if self.source_width_mm is not None:
            return max(self.source_width_mm, self.source_height_mm)
        return self.source_alpha_mrad * 1e-3 * self.distance_mm


def _line_of(text: str, key: str) -> int | None:
    match = re.search(rf"^\s*{re.escape(key)}\s*=", text, flags=re.MULTILINE)
    return None if match is None else text.count("\n", 0, match.start()) + 1


def _as_input_error(exc: ValidationError, path: str, text: str | None, option_names: bool) -> InputError:
    """The first pydantic error as one line naming the field (or option), its line and the fix."""
    error = exc.errors()[0]
    key = str(error["loc"][0]) if error["loc"] else None
    message = error["msg"].removeprefix("Value error, ")
    if key is None and text:  # a rule across fields: point at the first field it names that the file sets
        named = sorted((message.find(f), f) for f in ProductRecord.model_fields
                       if re.search(rf"\b{f}\b", message) and _line_of(text, f) is not None)
        key_for_line = named[0][1] if named else None
    else:
        key_for_line = key
    line = _line_of(text, key_for_line) if (text and key_for_line) else None
    if option_names:
        message = re.sub(r"\b(" + "|".join(sorted((f for f in ProductRecord.model_fields if "_" in f), key=len,
                                                   reverse=True)) + r")\b",
                         lambda m: "--" + m.group(1).replace("_", "-"), message)
    label = f"--{key.replace('_', '-')}" if (option_names and key) else key
    if error["type"] == "extra_forbidden":
        close = difflib.get_close_matches(key, ProductRecord.model_fields, n=1)
        hint = f"did you mean {close[0]!r}?" if close else "see 'hazard schema record' for the fields"
        return InputError(f"unknown field {key!r}", hint, path, line)
    if error["type"] == "missing":
        return InputError(f"required field {label!r} is missing", f"add {label}", path, line)
    if key:
        return InputError(f"{label}: {message}", "correct this field (see 'hazard schema record')", path, line)
    return InputError(message, "correct the record (see 'hazard schema record')", path, line)


def record_from_fields(fields: dict, *, path: str, text: str | None = None,
                       option_names: bool = False) -> ProductRecord:
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

    Raises
    ------
    InputError
    """
    try:
        return ProductRecord(**fields)
    except ValidationError as exc:
        raise _as_input_error(exc, path, text, option_names) from None


def load_record(path: str | Path, overrides: dict | None = None) -> ProductRecord:
    """Read a TOML product record; ``overrides`` (e.g. CLI options) replace fields.

    Raises
    ------
    InputError
        Unreadable TOML, unknown or invalid fields.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise InputError("record file not found", "check the path", str(path)) from None
    except UnicodeDecodeError:
        raise InputError("record is not UTF-8 text", "save the TOML file as UTF-8", str(path)) from None
    try:
        fields = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        match = re.search(r"line (\d+)", str(exc))
        raise InputError(f"not valid TOML ({exc})", "write one 'field = value' per line; quote text values",
                         str(path), int(match.group(1)) if match else None) from None
    fields.update(overrides or {})
    return record_from_fields(fields, path=str(path), text=text)
