"""The last line of defence where a result is built: every number in it is finite, or the product is refused.

JSON has no infinity: a value that overflowed would be written as ``null`` and the result would no longer
read back. Record and spectrum bounds (:mod:`hazard.inputs.record`, :mod:`hazard.inputs.spectrum`) keep the method
within the floating-point range; this check names what overflowed should anything still do so.
"""

from __future__ import annotations

import math
import re

import pydantic_core

from hazard.errors import InputError
from hazard.result import Assessment

__all__ = ["first_non_finite", "require_finite"]

_BARE_CONSTANT = re.compile(rb"[:,\[]\s*-?(?:Infinity|NaN)")


def first_non_finite(value, path: str = "") -> tuple[str, float] | None:
    """Where the first infinite or NaN float sits in nested dicts and lists (dotted path), and its value.

    Examples
    --------
    >>> first_non_finite({"a": [1.0, {"b": float("inf")}]})
    ('a[1].b', inf)
    >>> first_non_finite({"a": 1.0}) is None
    True
    """
    if isinstance(value, float):
        return None if math.isfinite(value) else (path, value)
    if isinstance(value, dict):
        items = ((f"{path}.{key}" if path else str(key), item) for key, item in value.items())
    elif isinstance(value, (list, tuple)):
        items = ((f"{path}[{index}]", item) for index, item in enumerate(value))
    else:
        return None
    for where, item in items:
        found = first_non_finite(item, where)
        if found is not None:
            return found
    return None


def require_finite(assessment: Assessment) -> Assessment:
    """``assessment`` itself when all its numbers are finite.

    Raises
    ------
    InputError
        Naming the product and the first quantity that overflowed (or is not a number).
    """
    dumped = assessment.model_dump()
    # a fast pass in compiled code (the model's own JSON would write infinity as null); a text that merely
    # reads "NaN" is told apart below
    if _BARE_CONSTANT.search(pydantic_core.to_json(dumped, inf_nan_mode="constants")) is None:
        return assessment
    found = first_non_finite(dumped)
    if found is None:
        return assessment
    where, value = found
    raise InputError(
        f"product {assessment.id!r}: {where} came out as {value} (the computation left the range of "
        f"floating-point numbers)",
        "check the record's distances and source size and the spectrum's unit and magnitude",
        None,
    )
