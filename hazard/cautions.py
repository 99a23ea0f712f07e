"""Cautions shown with every result, chosen from what the assessment found.

Our own wording. The first caution is always present; the others are added when the findings call for them.
"""

from __future__ import annotations

__all__ = ["PRE_SCREEN", "select_cautions"]

PRE_SCREEN = ("Pre-screen only, not a certification: the risk group here is computed from the data supplied. "
              "Only an accredited laboratory, measuring under the applicable standard and local regulations, "
              "can classify this product.")
_NOT_DETERMINED = ("No risk group could be determined: none of the hazards with risk groups could be assessed "
                   "from this spectrum. Do not read this result as safe; measure the missing wavelength range "
                   "first.")
_INCOMPLETE = ("Some hazards could not be assessed from this spectrum, so the group shown is a lower bound; "
               "the product may belong to a higher group.")
_UV = ("Ultraviolet emission: shield eyes and skin (UV-blocking eyewear, covered skin) and keep people out "
       "of the direct beam.")
_UVC = ("UV-C emission below 280 nm: never expose people directly; operate only enclosed or interlocked, "
        "with eye and skin protection for anyone servicing it.")
_BRIGHT = ("High-radiance source: do not stare into it, do not view it through optics, and mount it so the "
           "eye does not meet it at close range.")
_INFRARED = ("Infrared and heat: the eye and skin can be overheated by radiation that looks dim or invisible; "
             "keep your distance and limit the exposure time.")

_RANK = {"Exempt": 0, "RG1": 1, "RG2": 2, "RG3": 3}


def select_cautions(groups: dict[str, str | None], complete: bool, uvc_fraction: float,
                    determined: bool = True) -> list[str]:
    """Cautions for a product.

    Parameters
    ----------
    groups : dict
        Hazard symbol → risk group (or None when not assessed or without groups).
    complete : bool
        Every applicable hazard was assessed.
    uvc_fraction : float
        Share of the S_UV-weighted irradiance below 280 nm [1].
    determined : bool
        A risk group was determined (some hazard with risk groups was assessed).

    Returns
    -------
    list of str
        :data:`PRE_SCREEN` first, then the specific advice.

    Examples
    --------
    >>> len(select_cautions({"E_S": "Exempt"}, True, 0.0))
    1
    """
    def at_least(symbols: tuple[str, ...], group: str) -> bool:
        return any(_RANK.get(groups.get(s) or "", -1) >= _RANK[group] for s in symbols)

    cautions = [PRE_SCREEN]
    if not determined:
        cautions.append(_NOT_DETERMINED)
    elif not complete:
        cautions.append(_INCOMPLETE)
    if at_least(("E_S", "E_UVA"), "RG1"):
        cautions.append(_UV)
    if uvc_fraction > 0.5 and at_least(("E_S",), "RG1"):
        cautions.append(_UVC)
    if at_least(("L_B", "E_B", "L_R"), "RG2"):
        cautions.append(_BRIGHT)
    if at_least(("E_IR", "L_IR"), "RG1"):
        cautions.append(_INFRARED)
    return cautions
