"""Groups within the measurement uncertainty: scale ±u (expanded, k = 2) and wavelength shift ±Δλ.

The spectrum is re-weighted with its wavelength scale shifted by −Δλ, 0 and +Δλ (which matters where S_UV
and B(λ) are steep), and each shifted spectrum is scaled by 1 − u, 1 and 1 + u; all nine variants are
assessed as rows of one evaluation. A hazard's bounds are the extremes over the variants; a product whose
overall group differs between them is ``borderline``.
"""

from __future__ import annotations

import numpy as np

from hazard.evaluate import ProductArrays
from hazard.families import evaluate_rows, family_groups, overall_groups
from hazard.hazards import GROUPS, LimitSet
from hazard.integrals import integrate_spectra
from hazard.result import HazardBounds, UncertaintyStudy
from hazard.spectrum import Spectrum

__all__ = ["uncertainty_study"]


def _family_values(ev, members: tuple[str, ...]) -> np.ndarray:
    out = np.full(ev.assessment_distance_m.size, np.nan)
    for symbol in members:
        h = ev.hazards[symbol]
        mask = h.applicable & h.assessed
        out[mask] = h.value[mask]
    return out


def uncertainty_study(arrays: ProductArrays, spectrum: Spectrum, no_emission_outside: bool, limit_set: LimitSet,
                      uncertainty_pct: float, wavelength_uncertainty_nm: float) -> UncertaintyStudy:
    """Assess the nine variants of one product and summarise the group bounds.

    Parameters
    ----------
    arrays : ProductArrays
        The product as assessed (one row).
    spectrum : Spectrum
        Its spectrum, re-integrated on shifted grids.
    uncertainty_pct : float
        Expanded scale uncertainty u [%].
    wavelength_uncertainty_nm : float
        Wavelength-scale uncertainty Δλ [nm].
    """
    u, shift = uncertainty_pct / 100, wavelength_uncertainty_nm
    shifts = np.array([-shift, 0.0, shift])
    shifted = integrate_spectra([spectrum.wavelength_nm + s for s in shifts], [spectrum.value] * 3,
                                [no_emission_outside] * 3, limit_set)
    scales = np.array([1 - u, 1.0, 1 + u])
    ev = evaluate_rows(arrays, 9, limit_set, raw=np.repeat(shifted.raw, 3, axis=0), raw_scale=np.tile(scales, 3))
    nominal, minus, plus = 4, 1, 7  # (shift index × 3 + scale index)
    bounds = []
    for name, members in limit_set.families:
        values, groups = _family_values(ev, members), family_groups(ev, members)
        if np.all(np.isnan(values)):
            continue
        finite = values[~np.isnan(values)]
        assessed = groups[groups >= 0]
        member = next((ev.hazards[m] for m in members if ev.hazards[m].applicable[nominal]), None)
        bounds.append(HazardBounds(
            family=name, criterion=None if member is None else member.hazard.symbol,
            unit=None if member is None else member.hazard.unit,
            value_low=float(finite.min()), value_high=float(finite.max()),
            value_shift_minus=None if np.isnan(values[minus]) else float(values[minus]),
            value_shift_plus=None if np.isnan(values[plus]) else float(values[plus]),
            group_low=GROUPS[assessed.min()] if assessed.size else None,
            group_high=GROUPS[assessed.max()] if assessed.size else None))
    overall = overall_groups(ev, limit_set)
    name = [GROUPS[g] if g >= 0 else None for g in overall]
    low, high = name[int(np.argmin(overall))], name[int(np.argmax(overall))]
    verdict = "borderline" if low != high else "robust"
    if high is None:
        note = "no risk group could be determined at any variant"
    elif verdict == "borderline":
        note = (f"within ±{uncertainty_pct:g} % (k = 2) and ±{shift:g} nm the product may be {low or 'undetermined'} "
                f"or {high}: send it to the laboratory")
    else:
        note = f"the group {name[nominal]} holds across ±{uncertainty_pct:g} % (k = 2) and ±{shift:g} nm"
    return UncertaintyStudy(uncertainty_pct=uncertainty_pct, wavelength_uncertainty_nm=shift, hazards=bounds,
                            risk_group_low=low, risk_group_high=high, verdict=verdict, note=note)
