"""Cautions shown with every result, chosen from what the assessment found.

Our own wording. The first caution is always present; the others are added when the findings call for them.
"""

from __future__ import annotations

from hazard.standards import LimitSet

__all__ = ["CAUTIONS", "PRE_SCREEN", "select_cautions"]

PRE_SCREEN = (
    "Pre-screen only, not a certification: the risk group here is computed from the data supplied. "
    "Only an accredited laboratory, measuring under the applicable standard and local regulations, "
    "can classify this product. Ultraviolet and high-radiance sources can harm eyes and skin before "
    "anything is felt: protect both whatever the group."
)
_NOT_DETERMINED = (
    "No risk group could be determined: none of the hazards with risk groups could be assessed "
    "from this spectrum. Do not read this result as safe; measure the missing wavelength range "
    "first."
)
_INCOMPLETE = (
    "Some hazards could not be assessed from this spectrum, so the group shown is a lower bound; "
    "the product may belong to a higher group."
)
CAUTIONS = {
    "uv": (
        "Ultraviolet emission: shield eyes and skin (UV-blocking eyewear, covered skin) and keep people out "
        "of the direct beam."
    ),
    "uvc": (
        "UV-C emission below 280 nm: never expose people directly; operate only enclosed or interlocked, "
        "with eye and skin protection for anyone servicing it."
    ),
    "bright": (
        "High-radiance source: do not stare into it, do not view it through optics, and mount it so the "
        "eye does not meet it at close range."
    ),
    "infrared": (
        "Infrared and heat: the eye and skin can be overheated by radiation that looks dim or invisible; "
        "keep your distance and limit the exposure time."
    ),
}
"""The specific cautions by the key a limit set's :class:`~hazard.standards.CautionTrigger` names, in the order
they are printed."""


def select_cautions(
    limit_set: LimitSet,
    groups: dict[str, str | None],
    shares: dict[tuple[str, str], float],
    complete: bool,
    determined: bool = True,
) -> list[str]:
    """Cautions for a product.

    Parameters
    ----------
    limit_set : LimitSet
        Whose hazards say which caution each group calls for.
    groups : dict
        Hazard symbol → risk group (or None when not assessed or without groups).
    shares : dict
        (hazard symbol, share name) → the share of the hazard's value in that sub-band [1].
    complete : bool
        Every applicable hazard was assessed.
    determined : bool
        A risk group was determined (some hazard with risk groups was assessed).

    Returns
    -------
    list of str
        :data:`PRE_SCREEN` first, then the specific advice.

    Examples
    --------
    >>> from hazard.standards import DEFAULT_LIMIT_SET
    >>> len(select_cautions(DEFAULT_LIMIT_SET, {}, {}, True))
    1
    """

    def fires(hazard, trigger) -> bool:
        group = groups.get(hazard.symbol)
        reached = group is not None and limit_set.groups.index(group) >= limit_set.groups.index(trigger.from_group)
        share = shares.get((hazard.symbol, trigger.share), 0.0) if trigger.share else 1.0
        return reached and (trigger.share is None or share > trigger.share_above)

    cautions = [PRE_SCREEN]
    if not determined:
        cautions.append(_NOT_DETERMINED)
    elif not complete:
        cautions.append(_INCOMPLETE)
    chosen = {t.caution for h in limit_set.hazards for t in h.cautions if fires(h, t)}
    return cautions + [text for key, text in CAUTIONS.items() if key in chosen]
