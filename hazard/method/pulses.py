"""Pulsed and flashing sources: each pulse against the exposure limit at its duration.

Trains are judged by their pulses and by their time average. A lamp is pulsed when each pulse is shorter than
0.25 s (IEC 62471:2006 3.5 calls a lamp lit longer a continuous-wave lamp), or when its peak power is at least
ten times its average (CIE S 017:2011, 17-1001). The rules applied here (IEC 62471:2006 6.2, from memory; no
public text of the clause was found):

- every pulse is compared with the exposure limits at its duration (half-peak width), on the peak spectrum:
  dose limits as doses (E·τ against 30 J/m² …), the retinal thermal limit 50000/(α·τ^0.25) with the 1.7 mrad
  field and α ≥ 1.7 mrad that belong to durations up to 0.25 s, held at its 10 µs value for shorter pulses;
- in a train, thermal limits also see the pulses add up: each pulse against its limit × N^−0.25, N the pulses
  within the thermal limit's longest duration (2006/25/EC Annex II Table 2.6, written for lasers, applied here
  by analogy, the reading that cannot call a hazardous train safe);
- a pulsed lamp over an exposure limit is RG3; a single pulse below every limit is Exempt; a train below every
  limit is grouped by the continuous-wave criteria on its time-averaged spectrum (the dose of N pulses is the
  time average times the duration). Pulse-width-modulated lighting is assessed that way too, as continuous light
  on its time-averaged spectrum (the approach IEC 62471-7:2023 takes for illumination sources).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from hazard.method.exposure_time import Viewed, limit_fractions
from hazard.standards import Hazard, LimitSet

__all__ = ["PulseArrays", "pulse_checks", "thermal_window_s"]


@dataclass(frozen=True)
class PulseArrays:
    """One hazard's pulse check for n products.

    Attributes
    ----------
    single : numpy.ndarray
        (n,) one pulse's value as a fraction of the limit at the pulse duration [1].
    repeated : numpy.ndarray
        (n,) the same fraction with the N^−0.25 rule of a train for thermal limits (equal to ``single``
        otherwise) [1].
    pulses_in_window : numpy.ndarray
        (n,) N, the pulses within the thermal window (1 for a single pulse or a photochemical hazard).
    """

    single: np.ndarray
    repeated: np.ndarray
    pulses_in_window: np.ndarray

    @property
    def fraction(self) -> np.ndarray:
        """(n,) the larger of the two fractions: over 1, a pulse exceeds its exposure limit [1]."""
        return np.fmax(self.single, self.repeated)


def thermal_window_s(hazard: Hazard) -> float:
    """The window in which pulses add up for a thermal limit: the longest duration of its own formula [s].

    10 s for the retina and the skin, 1000 s for the infrared eye limit.
    """
    finite = [p.up_to_s for p in hazard.exposure_limit.pieces if np.isfinite(p.up_to_s) and p.exponent != 0]
    return max(finite, default=10.0)


def pulse_checks(
    peak: Viewed, limit_set: LimitSet, pulse_duration_s: np.ndarray, rate_hz: np.ndarray
) -> dict[str, PulseArrays]:
    """Every hazard's pulse check for n products seen with their peak spectrum.

    Parameters
    ----------
    peak : Viewed
        The products with their peak (on-state) spectrum, at the assessment distance.
    limit_set : LimitSet
    pulse_duration_s : numpy.ndarray
        (n,) half-peak width of each pulse [s].
    rate_hz : numpy.ndarray
        (n,) pulse rate of a train [Hz]; NaN for a single pulse.

    Returns
    -------
    dict
        Symbol → :class:`PulseArrays`.
    """
    n = pulse_duration_s.size
    out = {}
    for hazard in limit_set.hazards:
        single = np.full(n, np.nan)
        for duration in np.unique(pulse_duration_s[np.isfinite(pulse_duration_s)]):  # a study's rows share one
            rows = np.flatnonzero(pulse_duration_s == duration)
            single[rows] = limit_fractions(hazard, peak, float(duration), rows)
        counts = np.ones(n)
        if hazard.effect == "thermal":
            window = thermal_window_s(hazard)
            counts = np.where(np.isnan(rate_hz), 1.0, np.maximum(1.0, np.nan_to_num(rate_hz) * window))
        out[hazard.symbol] = PulseArrays(single=single, repeated=single * counts**0.25, pulses_in_window=counts)
    return out
