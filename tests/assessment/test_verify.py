"""A saved result is checked before it is rendered (hazard.assessment.verify)."""

import json

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import assess_pulsed, triangle_line, write_spectrum

from hazard.cli import main

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""


GRID_FINE_UV = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


def test_report_refuses_a_result_whose_groups_do_not_follow_from_its_numbers(tmp_path, monkeypatch):
    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 365.0, 150.0))  # E_UVA 150 W/m² > 100: RG3
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside", "--format", "json"]
    CliRunner().invoke(main, ["assess", "uv.csv", *options, "--output", "uv.json"])
    result = json.loads((tmp_path / "uv.json").read_text())
    assert result["risk_group"] == "RG3"
    assert CliRunner().invoke(main, ["report", "uv.json", "--output", "uv.pdf"]).exit_code == 0
    edited = json.loads(json.dumps(result))
    for h in edited["hazards"].values():  # every group changed to Exempt, every value left as it was
        if h["risk_group"] is not None:
            h["risk_group"] = "Exempt"
    edited["risk_group"] = "Exempt"
    (tmp_path / "edited.json").write_text(json.dumps(edited))
    refused = CliRunner().invoke(main, ["report", "edited.json", "--output", "edited.pdf"])
    assert refused.exit_code == 2 and not (tmp_path / "edited.pdf").exists()
    assert "edited.json: the result was changed after it was made" in refused.stderr
    # the same edit with its SHA-256 recomputed: the groups still have to follow from the numbers; the first
    # hazard that disagrees is named (E_S: S_UV(365) = 1.1e-4, so 150 W/m² give E_S ≈ 0.017 W/m², RG2)
    from hazard.result import Assessment

    resealed = Assessment.model_validate(edited).sealed()
    (tmp_path / "resealed.json").write_text(resealed.model_dump_json())
    refused = CliRunner().invoke(main, ["report", "resealed.json", "--output", "resealed.pdf"])
    assert refused.exit_code == 2
    assert "hazard E_S says Exempt but the compared values and limits give RG2" in refused.stderr
    for change in (
        lambda r: r["hazards"].pop("E_S"),  # a family left out
        lambda r: r["hazards"]["E_S"].update(
            limits={
                k: v * 1000
                for k, v in r["hazards"]["E_S"]["limits"].items()  # limits not the set's
            }
        ),
        lambda r: r.update(cautions=[]),  # cautions emptied
        lambda r: r["hazards"]["E_UVA"].update(value=r["hazards"]["E_UVA"]["value"] / 100),  # value ≠ what was compared
        lambda r: r["hazards"]["L_B"].update(value=r["hazards"]["L_B"]["compared"]["RG2"] / 2),  # average > radiance
        lambda r: r.update(assessment_distance_mm=20000.0),
    ):  # not the standard's
        tampered = json.loads(json.dumps(result))
        change(tampered)
        for h in tampered["hazards"].values():  # keep the margins consistent with the changed limits
            h["margins"] = {b: h["compared"][b] / h["limits"][b] for b in h["limits"]} if h["compared"] else {}
        (tmp_path / "t.json").write_text(Assessment.model_validate(tampered).sealed().model_dump_json())
        refused = CliRunner().invoke(main, ["report", "t.json", "--output", "t.pdf"])
        assert refused.exit_code == 2 and refused.stderr.count("\n") == 1, refused.stderr
    # one line of a batch's results.jsonl, by id
    (tmp_path / "results.jsonl").write_text(
        json.dumps(edited) + "\n" + Assessment.model_validate({**result, "id": "B"}).sealed().model_dump_json() + "\n"
    )
    assert CliRunner().invoke(main, ["report", "results.jsonl", "--id", "B", "--output", "b.pdf"]).exit_code == 0
    line = CliRunner().invoke(main, ["report", "results.jsonl", "--id", "uv", "--output", "c.pdf"])
    assert line.exit_code == 2 and "changed after it was made" in line.stderr
    whole = CliRunner().invoke(main, ["report", "results.jsonl", "--output", "d.pdf"])  # which product?
    assert whole.exit_code == 2 and "a results file of 2 lines, one product each; fix: name the product with --id" in (
        whole.stderr
    )


@pytest.mark.parametrize("rate_hz", [None, 5.0], ids=["single pulse", "train"])
def test_a_saved_pulsed_result_renders_after_its_check(tmp_path, rate_hz):
    # `hazard report` re-derives the groups with the pulse rules before it renders (hazard.assessment.verify)
    line = triangle_line(GRID_FINE_UV, 270.0, 0.02 / 0.05, 0.05)
    exposure = None if rate_hz is None else [{"distance_mm": 500, "duration_s": "1h"}]
    a = assess_pulsed(GRID_FINE_UV, line, rate_hz=rate_hz, exposure=exposure, studies=True)
    saved = tmp_path / "result.json"
    saved.write_text(a.model_dump_json(), encoding="utf-8")
    result = CliRunner().invoke(main, ["report", str(saved), "--output", str(tmp_path / "r.pdf")])
    assert result.exit_code == 0, result.output
    assert (tmp_path / "r.pdf").read_bytes().startswith(b"%PDF")
