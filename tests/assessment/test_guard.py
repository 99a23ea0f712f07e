"""The last line of defence (hazard.assessment.guard): a result holding a number that is not finite never leaves the
engine."""

import pytest
from conftest import (
    LAMP_FIELDS,
    assert_one_line,
    write_lamp,
)

import hazard
from hazard.errors import InputError


def test_a_result_that_overflowed_never_leaves_the_engine(tmp_path):
    from hazard.assessment.guard import require_finite

    good = hazard.assess(write_lamp(tmp_path), {**LAMP_FIELDS, "id": "P"})
    assert require_finite(good) is good
    hazards = dict(good.hazards)
    hazards["E_B" if "E_B" in hazards else "L_B"] = next(iter(hazards.values())).model_copy(
        update={"value": float("inf")}
    )
    with pytest.raises(InputError) as caught:
        require_finite(good.model_copy(update={"hazards": hazards}))
    assert_one_line(caught.value, "product 'P'", "came out as inf")
