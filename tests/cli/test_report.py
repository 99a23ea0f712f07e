"""``hazard report``: a result that does not read back is refused in one line."""

import re

from conftest import (
    LAMP_FIELDS,
    assert_exit_2,
    run_cli,
    write_lamp,
)

import hazard


def test_report_refuses_a_result_that_does_not_read_back(tmp_path):
    good = hazard.assess(write_lamp(tmp_path), {**LAMP_FIELDS, "id": "P"}).model_dump_json()
    cases = {
        "deep.json": "[" * 100_000,
        "torn.json": good[:300],
        "nan.json": re.sub(r'"value":[0-9.e+-]+', '"value":NaN', good, count=1),
    }
    for name, text in cases.items():
        (tmp_path / name).write_text(text)
        assert_exit_2(run_cli(["report", name, "--output", "r.pdf"], tmp_path), name)
    (tmp_path / "good.json").write_text(good)
    assert_exit_2(run_cli(["report", "good.json", "--output", "good.json"], tmp_path), "would replace an input")
    assert not (tmp_path / "r.pdf").exists()
