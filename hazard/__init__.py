"""hazard: photobiological safety pre-screen of lamps and lamp systems (IEC 62471 / CIE S 009 method).

A pre-screen, not a certification. Public API:

- :func:`assess` — one product (TOML record, spectrum file + fields, or a record) → :class:`Assessment`
- :func:`load_product` — read and validate a record and its spectrum
- :class:`ProductRecord`, :class:`Assessment`, :class:`HazardResult` — the record and result models
- :class:`InputError` — bad input, with file, line and fix
- :data:`IEC_62471_2006` — the default limit set (hazard registry)
"""

from hazard._version import __version__
from hazard.assessment.build import assess
from hazard.assessment.many import assess_many
from hazard.errors import InputError
from hazard.inputs.loading import load_product
from hazard.inputs.record import ProductRecord
from hazard.result import Assessment, HazardResult
from hazard.standards import IEC_62471_2006

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
