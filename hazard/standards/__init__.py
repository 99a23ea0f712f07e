"""Limit sets: the one source of the method's constants (:mod:`hazard.standards.model` says what a set holds).

:data:`DEFAULT_LIMIT_SET` is IEC 62471:2006; :data:`LIMIT_SETS` finds a set by the name a result records.
"""

from hazard.standards.iec62471_2006 import IEC_62471_2006
from hazard.standards.model import (
    GROUPS,
    BandShare,
    CautionTrigger,
    ExposureLimit,
    FieldOfView,
    Hazard,
    LimitPiece,
    LimitSet,
    RiskGroup,
    Viewing,
)

__all__ = [
    "DEFAULT_LIMIT_SET",
    "GROUPS",
    "IEC_62471_2006",
    "LIMIT_SETS",
    "BandShare",
    "CautionTrigger",
    "ExposureLimit",
    "FieldOfView",
    "Hazard",
    "LimitPiece",
    "LimitSet",
    "RiskGroup",
    "Viewing",
    "limit_set_named",
]

DEFAULT_LIMIT_SET = IEC_62471_2006
LIMIT_SETS = {s.name: s for s in (IEC_62471_2006,)}
"""Limit sets by name."""


def limit_set_named(name: str) -> LimitSet:
    """The limit set of that name.

    Raises
    ------
    KeyError
        When no set has that name.
    """
    return LIMIT_SETS[name]
