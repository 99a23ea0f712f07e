"""Spectral units: parse what users and instruments write, convert to SI per nanometre.

Internally spectral irradiance is W·m⁻²·nm⁻¹ and spectral radiance W·m⁻²·sr⁻¹·nm⁻¹ (wavelength stays in
nm, as in the standards' tables); the radiant exposure of one pulse is J·m⁻²·nm⁻¹ (or ·sr⁻¹).
:func:`parse_spectral_unit` accepts the usual spellings: ``W/m2/nm``, ``mW/m^2/nm``, ``uW/cm2/nm``,
``µW/(cm²·nm)``, ``W m-2 nm-1``, ``W·m⁻²·sr⁻¹·nm⁻¹``, ``W/m2/um``, ``mJ/cm2/nm``.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache

__all__ = ["EXPOSURE_SI", "IRRADIANCE_SI", "RADIANCE_EXPOSURE_SI", "RADIANCE_SI", "SpectralUnit", "parse_spectral_unit"]

IRRADIANCE_SI = "W/m2/nm"
RADIANCE_SI = "W/m2/sr/nm"
EXPOSURE_SI = "J/m2/nm"
RADIANCE_EXPOSURE_SI = "J/m2/sr/nm"

# Decimal exponents, so that every factor is an exact power of ten.
_POWER_PREFIX = {"": 0, "k": 3, "m": -3, "u": -6, "n": -9}
_LENGTH = {"m": 0, "cm": -2, "mm": -3}
_SPECTRAL = {"nm": 0, "um": -3}  # per µm → per nm
_TOKEN = re.compile(r"([A-Za-z]+)\^?(-?\d+)?")


@dataclass(frozen=True)
class SpectralUnit:
    """A parsed spectral unit.

    Attributes
    ----------
    text : str
        The unit as written.
    factor_to_si : float
        Multiply a value in this unit by this to get W·m⁻²·nm⁻¹ (or ·sr⁻¹) [1].
    per_steradian : bool
        True for spectral radiance units.
    energy : bool
        True for an energy (J) per area per wavelength: the radiant exposure of a pulse.
    """

    text: str
    factor_to_si: float
    per_steradian: bool
    energy: bool = False


def _normalise(text: str) -> str:
    table = str.maketrans({"µ": "u", "μ": "u", "²": "2", "⁻": "-", "¹": "1", "·": " ", "⋅": " ", "*": " ", "×": " "})
    return text.translate(table).strip()


def _exponents(text: str) -> dict[str, int]:
    """Unit tokens with their exponents; tokens after '/' (or inside '/(...)') count negative."""
    exponents: dict[str, int] = {}
    parts = re.split(r"/", text)
    for index, part in enumerate(parts):
        sign = 1 if index == 0 else -1
        cleaned = part.replace("(", " ").replace(")", " ")
        if _TOKEN.sub("", cleaned).strip():
            raise ValueError(f"cannot read {part!r}")
        for base, power in _TOKEN.findall(cleaned):
            exponents[base] = exponents.get(base, 0) + sign * (int(power) if power else 1)
    return exponents


@lru_cache(maxsize=256)
def parse_spectral_unit(text: str) -> SpectralUnit:
    """Parse a spectral irradiance or radiance unit.

    Parameters
    ----------
    text : str
        The unit, e.g. ``"uW/cm2/nm"``.

    Returns
    -------
    SpectralUnit

    Raises
    ------
    ValueError
        When the text is not power per area per wavelength (optionally per steradian).

    Examples
    --------
    >>> parse_spectral_unit("uW/cm2/nm").factor_to_si
    0.01
    >>> parse_spectral_unit("W m-2 sr-1 nm-1").per_steradian
    True
    >>> unit = parse_spectral_unit("mJ/cm2/nm"); unit.energy, unit.factor_to_si
    (True, 10.0)
    """
    try:
        exponents = _exponents(_normalise(text))
    except ValueError as exc:
        raise ValueError(f"unknown unit {text!r} ({exc})") from None
    power = [b for b in exponents if b[-1:] in ("W", "J") and b[:-1] in _POWER_PREFIX]
    length = [b for b in exponents if b in _LENGTH]
    spectral = [b for b in exponents if b in _SPECTRAL]
    known = set(power) | set(length) | set(spectral) | {"sr"}
    ok = (
        len(power) == 1
        and exponents[power[0]] == 1
        and len(length) == 1
        and exponents[length[0]] == -2
        and len(spectral) == 1
        and exponents[spectral[0]] == -1
        and exponents.get("sr", -1) == -1
        and set(exponents) <= known
    )
    if not ok:
        raise ValueError(
            f"unknown unit {text!r}: expected power per area per wavelength, "
            f"e.g. W/m2/nm, mW/m2/nm, uW/cm2/nm, W/cm2/nm or the /sr forms (J for the exposure of a pulse)"
        )
    factor = 10.0 ** (_POWER_PREFIX[power[0][:-1]] - 2 * _LENGTH[length[0]] + _SPECTRAL[spectral[0]])
    per_sr = "sr" in exponents
    return SpectralUnit(text=text, factor_to_si=factor, per_steradian=per_sr, energy=power[0].endswith("J"))
