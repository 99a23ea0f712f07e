"""Groups within the measurement uncertainty: scale ±u (expanded, k = 2) and wavelength shift ±Δλ.

The spectrum is re-weighted with its wavelength scale shifted by −Δλ, 0 and +Δλ (which matters where S_UV
and B(λ) are steep), and each shifted spectrum is scaled by 1 − u, 1 and 1 + u; all nine variants are
assessed as rows of one evaluation. A hazard's bounds are the extremes over the variants; a product whose
overall group differs between them is ``borderline``.
"""

from __future__ import annotations

import numpy as np

from hazard.inputs.spectrum import Spectrum
from hazard.method.evaluate import ProductArrays
from hazard.method.families import evaluate_rows, family_groups, family_member, family_t_max, family_values
from hazard.method.integrals import integrate_spectra
from hazard.output.formatting import format_stated
from hazard.result import HazardBounds, UncertaintyStudy
from hazard.standards import LimitSet

__all__ = ["uncertainty_study"]


def uncertainty_study(
    arrays: ProductArrays,
    spectrum: Spectrum,
    no_emission_outside: bool,
    limit_set: LimitSet,
    uncertainty_pct: float,
    wavelength_uncertainty_nm: float,
) -> UncertaintyStudy:
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
    shifted = integrate_spectra(
        [spectrum.wavelength_nm + s for s in shifts], [spectrum.value] * 3, [no_emission_outside] * 3, limit_set
    )
    scales = np.array([1 - u, 1.0, 1 + u])
    ev = evaluate_rows(arrays, 9, limit_set, raw=np.repeat(shifted.raw, 3, axis=0), raw_scale=np.tile(scales, 3))
    nominal, minus, plus = 4, 1, 7  # (shift index × 3 + scale index)
    bounds = []
    names = limit_set.groups
    for name, members in limit_set.grouped_families:
        values, groups = family_values(ev, members), family_groups(ev, members)
        if np.all(np.isnan(values)):
            continue
        finite = values[~np.isnan(values)]
        assessed = groups[groups >= 0]
        member = family_member(ev, members, nominal)
        t_max = family_t_max(ev, members)
        reached = t_max[~np.isnan(t_max)]
        bounds.append(
            HazardBounds(
                family=name,
                criterion=member,
                unit=None if member is None else limit_set[member].unit,
                value_low=float(finite.min()),
                value_high=float(finite.max()),
                value_shift_minus=None if np.isnan(values[minus]) else float(values[minus]),
                value_shift_plus=None if np.isnan(values[plus]) else float(values[plus]),
                group_low=names[assessed.min()] if assessed.size else None,
                group_high=names[assessed.max()] if assessed.size else None,
                t_max_shortest_s=float(reached.min()) if reached.size else None,
                t_max_longest_s=float(reached.max()) if reached.size == t_max.size else None,
            )
        )
    overall = ev.group_index
    group_of = [names[g] if g >= 0 else None for g in overall]
    low, high = group_of[int(np.argmin(overall))], group_of[int(np.argmax(overall))]
    verdict = "borderline" if low != high else "robust"
    if high is None:
        note = "no risk group could be determined at any variant"
    elif verdict == "borderline":
        note = (
            f"within ±{format_stated(uncertainty_pct)} % (k = 2) and ±{format_stated(shift)} nm the product may be "
            f"{low or 'undetermined'} "
            f"or {high}: send it to the laboratory"
        )
    else:
        note = (
            f"the group {group_of[nominal]} holds across ±{format_stated(uncertainty_pct)} % (k = 2) and "
            f"±{format_stated(shift)} nm"
        )
    return UncertaintyStudy(
        uncertainty_pct=uncertainty_pct,
        wavelength_uncertainty_nm=shift,
        hazards=bounds,
        risk_group_low=low,
        risk_group_high=high,
        verdict=verdict,
        note=note,
    )
