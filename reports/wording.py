"""Fixed report wording: what each risk group means, and the footer. Our own words.

The sentences describe the groups plainly; they do not replace the cautions chosen for each product
(``Assessment.cautions``), which the reports print in full.
"""

from __future__ import annotations

__all__ = [
    "FOOTER",
    "GROUP_MEANING",
    "GROUP_NAME",
    "LOWER_BOUND",
    "LOWER_BOUND_MEANING",
    "NOT_DETERMINED_MEANING",
    "PULSE_MEANING",
    "WHAT_IF_MEANING",
]

GROUP_NAME = {
    "Exempt": "Exempt group",
    "RG1": "Risk Group 1 (low risk)",
    "RG2": "Risk Group 2 (moderate risk)",
    "RG3": "Risk Group 3 (high risk)",
}
"""Long name of each group, shown beside the short label."""

GROUP_MEANING = {
    "Exempt": "Within the exposure limits for the Exempt time bases at the assessment distance: every assessed "
    "quantity stays within its Exempt limit there. Nearer, for longer, or with optics the limits can "
    "still be reached.",
    "RG1": "Low risk: ordinary use stays within the exposure limits; only unusually long exposure at close "
    "range could come near one.",
    "RG2": "Moderate risk: an exposure limit can be reached within minutes or seconds; safe use relies on "
    "people turning away from the source or keeping each exposure short.",
    "RG3": "High risk: an exposure limit can be reached even in a brief exposure; people must be kept out of "
    "the direct emission by design, guarding or enclosure.",
}
"""One sentence per group: what it means for the user of the lamp."""

PULSE_MEANING = {
    "single_within": "A single pulse: each hazard's pulse stays within its exposure limit at the pulse duration, so "
    "the lamp is Exempt by the single-pulse rule. Repeated flashes are a pulse train: state the rate to have them "
    "assessed together.",
    "over": "A pulse exceeds an exposure limit at its own duration: a pulsed lamp over an exposure limit is RG3, "
    "whatever its time average.",
    "train_within": "Every pulse stays within its own exposure limit; the group is that of the time-averaged values.",
}
"""What the pulse rules say about a pulsed lamp's group, shown with (or instead of) the group's meaning."""

LOWER_BOUND = "LOWER BOUND — not all hazards assessed"
"""Shown prominently when ``Assessment.complete`` is false."""

LOWER_BOUND_MEANING = (
    "This holds for the assessed hazards only; those not assessed may put the product in a higher group."
)
"""Follows the group's meaning when ``Assessment.complete`` is false."""

NOT_DETERMINED_MEANING = (
    "No hazard with risk groups could be assessed from this spectrum, so there is no risk "
    "group. Do not read this as safe: measure the missing wavelength range, or state "
    "no_emission_outside in the record if the source truly emits nothing outside the "
    "measured range."
)
"""Shown instead of a group's meaning when ``Assessment.risk_group`` is null."""

WHAT_IF_MEANING = (
    "What-if: assessed at a distance the record asks for (at_distance_mm), not at the standard's "
    "assessment distance, so this is not a classification."
)
"""Shown first when ``Assessment.basis`` is ``what-if``."""

FOOTER = "Pre-screen only — not a certification or a laboratory classification"
"""Left part of every page footer."""
