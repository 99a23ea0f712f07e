"""A validated spectrum on its own wavelength grid, in SI units (method §5).

:func:`validate_spectrum` applies every rule of the method to raw numbers read from a file: strictly
monotonic wavelengths in nm (descending input reversed, duplicates refused), finite values, dark-noise
negatives down to −1 % of the peak set to zero with a warning, larger negatives refused, µm-looking
wavelength columns refused with the fix, and the unit converted to W·m⁻²·nm⁻¹ (or ·sr⁻¹).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from hazard.errors import InputError

__all__ = ["NEGATIVE_TOLERANCE", "VALUE_RULES", "Spectrum", "validate_spectrum", "value_rule_broken"]

NEGATIVE_TOLERANCE = 0.01
"""Negatives down to this fraction of the peak are dark noise (method §5) [1]."""

_UM_LOOKING_MAX_NM = 100.0  # every band of the method lies above 180 nm: a column ending below 100 "nm" is µm
MAX_WAVELENGTH_NM = 1e6
"""Longest wavelength accepted: 1 mm, far beyond every band of the method (common practice, no published
source) [nm]."""
PEAK_RANGE_SI = {"irradiance": (0.0, 1e12), "radiance": (0.0, 1e12), "relative": (0.0, 1e30)}
"""Range of a spectrum's peak value in SI units (above the first, up to the second); beyond it the file's unit
is wrong or the numbers are not a measurement, and the method's products would leave the floating-point range
(common practice, no published source) [W m⁻² nm⁻¹, W m⁻² sr⁻¹ nm⁻¹, or 1 for a relative spectrum]."""
VALUE_RULES = (
    "a value is not finite (NaN or infinity)",
    "no positive value",
    f"negative beyond dark noise (more than {NEGATIVE_TOLERANCE:.0%} of the peak)",
    "the peak is not a plausible measurement in its unit",
)
"""The value rules of method §5, in the order they are checked (codes 0, 1, 2, 3 of :func:`value_rule_broken`)."""


def value_rule_broken(peak: np.ndarray, lowest: np.ndarray, peak_si: np.ndarray, quantity: np.ndarray) -> np.ndarray:
    """The first value rule (:data:`VALUE_RULES`) each spectrum breaks, from its extreme samples; −1 where none.

    The one implementation of the rules, for one spectrum read from a file (:func:`validate_spectrum`) and for
    a matrix of spectra in memory (:func:`hazard.assessment.many.assess_many`).

    Parameters
    ----------
    peak, lowest : numpy.ndarray
        Highest and lowest sample of each spectrum [its unit].
    peak_si : numpy.ndarray
        The highest sample in SI units [W m⁻² nm⁻¹ or W m⁻² sr⁻¹ nm⁻¹, or 1 for a relative spectrum].
    quantity : numpy.ndarray
        ``"irradiance"``, ``"radiance"`` or ``"relative"`` of each spectrum.

    Examples
    --------
    >>> value_rule_broken(np.array([1.0, 1.0, 0.0, np.nan]), np.array([-0.001, -0.5, 0.0, 0.0]),
    ...                   np.array([1.0, 1.0, 0.0, np.nan]), np.array(["irradiance"] * 4)).tolist()
    [-1, 2, 1, 0]
    """
    peak, lowest, peak_si = (np.asarray(x, dtype=float) for x in (peak, lowest, peak_si))
    kinds, which = np.unique(np.atleast_1d(quantity), return_inverse=True)  # a few kinds for any number of rows
    ranges = np.array([PEAK_RANGE_SI.get(str(q), PEAK_RANGE_SI["relative"]) for q in kinds]).reshape(-1, 2)
    low, high = ranges[which.ravel(), 0], ranges[which.ravel(), 1]
    with np.errstate(invalid="ignore"):
        finite = np.isfinite(peak) & np.isfinite(lowest)
        positive = peak > 0
        dark_noise = lowest >= -NEGATIVE_TOLERANCE * np.where(finite, peak, 0.0)
        plausible = (peak_si > low) & (peak_si <= high)
    return np.where(~finite, 0, np.where(~positive, 1, np.where(~dark_noise, 2, np.where(~plausible, 3, -1))))


@dataclass(frozen=True)
class Spectrum:
    """Spectral irradiance or radiance on a strictly increasing grid.

    Attributes
    ----------
    wavelength_nm : numpy.ndarray
        Strictly increasing wavelengths [nm].
    value : numpy.ndarray
        Spectral irradiance [W m⁻² nm⁻¹] or radiance [W m⁻² sr⁻¹ nm⁻¹], or a relative spectrum [1].
    quantity : str
        ``"irradiance"``, ``"radiance"`` or ``"relative"``.
    path : str
        Where it was read from, as the user named it.
    warnings : tuple of str
        What validation tolerated and changed.
    """

    wavelength_nm: np.ndarray
    value: np.ndarray
    quantity: str
    path: str
    warnings: tuple[str, ...] = field(default=())

    @property
    def range_nm(self) -> tuple[float, float]:
        """Shortest and longest wavelength [nm]."""
        return float(self.wavelength_nm[0]), float(self.wavelength_nm[-1])


def validate_spectrum(
    wavelength_nm: np.ndarray,
    value: np.ndarray,
    lines: np.ndarray,
    path: str,
    factor_to_si: float,
    quantity: str,
    warnings: tuple[str, ...] = (),
) -> Spectrum:
    """Apply the validation rules of method §5 and convert to SI.

    Parameters
    ----------
    wavelength_nm, value : numpy.ndarray
        Raw numbers as read [nm], [the file's unit].
    lines : numpy.ndarray
        1-based line number in the file of each row, for messages.
    path : str
        File name for messages.
    factor_to_si : float
        Multiplier from the file's unit to SI [1].
    quantity : str
        ``"irradiance"``, ``"radiance"`` or ``"relative"``.
    warnings : tuple of str
        Warnings the reader already recorded.

    Returns
    -------
    Spectrum

    Raises
    ------
    InputError
        For every breach of the method, naming the file, line and fix.

    Examples
    --------
    >>> s = validate_spectrum(np.array([500., 400.]), np.array([2., 1.]), np.array([2, 3]), "x.csv", 1e-3,
    ...                       "irradiance")
    >>> s.wavelength_nm.tolist(), s.value.tolist()
    ([400.0, 500.0], [0.001, 0.002])
    """
    wl = np.asarray(wavelength_nm, dtype=float)
    val = np.asarray(value, dtype=float)
    notes = list(warnings)
    if wl.size == 0:
        raise InputError("no data rows", "give two columns: wavelength in nm, spectral value", path)
    if wl.size == 1:
        raise InputError("only one data row", "a spectrum needs at least two wavelengths", path, int(lines[0]))
    for column, name in ((wl, "wavelength"), (val, "value")):
        bad = np.flatnonzero(~np.isfinite(column))
        if bad.size:
            raise InputError(
                f"{name} is not a finite number (NaN or infinity)",
                "replace it with a measured value or remove the row",
                path,
                int(lines[bad[0]]),
            )
    if wl.max() < _UM_LOOKING_MAX_NM:
        raise InputError(
            f"wavelengths run from {wl.min():g} to {wl.max():g}: this looks like µm, not nm",
            "multiply the wavelength column by 1000 so it is in nm",
            path,
            int(lines[0]),
        )
    beyond = np.flatnonzero(wl > MAX_WAVELENGTH_NM)
    if beyond.size:
        raise InputError(
            f"wavelength {wl[beyond[0]]:g} nm is beyond {MAX_WAVELENGTH_NM:g} nm (1 mm): not an optical spectrum",
            "give wavelengths in nm",
            path,
            int(lines[beyond[0]]),
        )
    nonpositive = np.flatnonzero(wl <= 0)
    if nonpositive.size:
        raise InputError(
            f"wavelength {wl[nonpositive[0]]:g} nm is not positive",
            "wavelengths are in nm and must be above zero",
            path,
            int(lines[nonpositive[0]]),
        )
    steps = np.diff(wl)
    if np.all(steps < 0):
        wl, val, lines = wl[::-1], val[::-1], lines[::-1]
        steps = -steps[::-1]
        notes.append(f"{path}: wavelengths were in descending order and have been reversed")
    duplicate = np.flatnonzero(steps == 0)
    if duplicate.size:
        i = duplicate[0]
        raise InputError(
            f"duplicate wavelength {wl[i]:g} nm (also on line {int(lines[i])})",
            "remove or average one of the two rows",
            path,
            int(lines[i + 1]),
        )
    backwards = np.flatnonzero(steps < 0)
    if backwards.size:
        i = backwards[0] + 1
        raise InputError(
            f"wavelength {wl[i]:g} nm breaks the order (previous row {wl[i - 1]:g} nm)",
            "sort the rows by wavelength",
            path,
            int(lines[i]),
        )
    peak = float(val.max())
    lowest = int(np.argmin(val))
    with np.errstate(over="ignore"):
        peak_si = peak * factor_to_si
    broken = int(value_rule_broken(np.array([peak]), val[[lowest]], np.array([peak_si]), np.array([quantity]))[0])
    if broken == 1:
        raise InputError("no positive value in the spectrum", "check the value column and its unit", path)
    if broken == 2:
        raise InputError(
            f"value {val[lowest]:g} at {wl[lowest]:g} nm is negative beyond dark noise "
            f"(more than {NEGATIVE_TOLERANCE:.0%} of the peak {peak:g})",
            "subtract the dark reading correctly or re-measure",
            path,
            int(lines[lowest]),
        )
    if broken == 3:
        low, high = PEAK_RANGE_SI.get(quantity, PEAK_RANGE_SI["relative"])
        raise InputError(
            f"peak value {peak:g} ({peak_si:g} in SI units) is outside {low:g} to {high:g}: not a "
            f"plausible measurement",
            "check the value column and its unit",
            path,
            int(lines[int(np.argmax(val))]),
        )
    negatives = val < 0
    if negatives.any():
        notes.append(
            f"{path}: {int(negatives.sum())} small negative value(s) (down to {val[lowest]:g}, "
            f"within {NEGATIVE_TOLERANCE:.0%} of the peak) set to zero as dark noise"
        )
        val = np.where(negatives, 0.0, val)
    wl = wl.copy()
    si = val * factor_to_si
    wl.flags.writeable = False
    si.flags.writeable = False
    return Spectrum(wl, si, quantity, path, tuple(notes))
