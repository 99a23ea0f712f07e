"""hazard: photobiological safety pre-screen of lamps and lamp systems (IEC 62471 / CIE S 009 method).

A pre-screen, not a certification. Public API:

- :func:`assess` — one product (TOML record, spectrum file + fields, or a record) → :class:`Assessment`
- :func:`load_product` — read and validate a record and its spectrum
- :class:`ProductRecord`, :class:`Assessment`, :class:`HazardResult` — the record and result models
- :class:`InputError` — bad input, with file, line and fix
- :data:`IEC_62471_2006` — the default limit set (hazard registry)

The names are imported on first use (numpy and pydantic load only when the engine is needed), so ``hazard --help``
starts as fast as the interpreter.
"""

from __future__ import annotations

from importlib import import_module
from typing import TYPE_CHECKING

from hazard._version import __version__

if TYPE_CHECKING:
    from hazard.assessment.build import assess
    from hazard.assessment.many import assess_many
    from hazard.errors import InputError
    from hazard.inputs.loading import load_product
    from hazard.inputs.record import ProductRecord
    from hazard.result import Assessment, HazardResult
    from hazard.standards import IEC_62471_2006

_HOMES = {
    "IEC_62471_2006": "hazard.standards",
    "Assessment": "hazard.result",
    "HazardResult": "hazard.result",
    "InputError": "hazard.errors",
    "ProductRecord": "hazard.inputs.record",
    "assess": "hazard.assessment.build",
    "assess_many": "hazard.assessment.many",
    "load_product": "hazard.inputs.loading",
}

__all__ = [
    "IEC_62471_2006",
    "Assessment",
    "HazardResult",
    "InputError",
    "ProductRecord",
    "__version__",
    "assess",
    "assess_many",
    "load_product",
]


def __getattr__(name: str) -> object:
    """A public name, imported from its module on first use (PEP 562)."""
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module 'hazard' has no attribute {name!r}")
    value = getattr(import_module(home), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
