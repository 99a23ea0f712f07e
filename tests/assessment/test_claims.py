"""Vendor claims (hazard.assessment.claims): verdicts, and claims judged at the standard's distance."""

import json

import numpy as np
from click.testing import CliRunner
from conftest import claim_record, triangle_line, write_spectrum

import hazard
from hazard.cli import main

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""


def test_claims_and_cautions_follow_the_standard_distance_not_the_what_if(tmp_path, monkeypatch):
    # A UV lamp that is RG2 at the standard's 200 mm and Exempt at 5 m: a claim of Exempt is contradicted (claims
    # are about the classification), and the UV caution stays (a what-if never lowers a caution)
    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 365.0, 50.0))
    (tmp_path / "uv.toml").write_text(
        'id = "UV"\nspectrum = "uv.csv"\ndistance_mm = 200.0\nsource_diameter_mm = 5.0\n'
        "no_emission_outside = true\nat_distance_mm = 5000.0\n"
        'claimed_risk_group = "Exempt"\n'
    )
    monkeypatch.chdir(tmp_path)
    check = CliRunner().invoke(main, ["check", "uv.toml"])
    assert check.exit_code == 4, check.stdout
    assert "computed RG2 at the standard's distance" in check.stdout and "not used for claims" in check.stdout
    result = json.loads(CliRunner().invoke(main, ["assess", "uv.toml", "--format", "json"]).stdout)
    assert result["risk_group"] == "Exempt" and result["standard_risk_group"] == "RG2"
    assert any(c.startswith("Ultraviolet emission") for c in result["cautions"])


def _verdicts(path):
    return {c.field: c.verdict for c in hazard.assess(path).claims}


def test_claims_verdicts(tmp_path):
    # The spotlight computes as RG1 by L_B (IEC 62471:2006 Table 6.1) with CCT ≈ 6500 K
    spot = claim_record(
        tmp_path, "cl-spot-65", claimed_risk_group="Exempt", claimed_cct_k=6400.0, claimed_t_max_s_E_B=50.0
    )
    assert _verdicts(spot) == {
        "claimed_risk_group": "contradicted",
        "claimed_cct_k": "consistent",
        "claimed_t_max_s_E_B": "not checkable",
    }
    desk = claim_record(tmp_path, "cl-desk-30", claimed_risk_group="RG1", claimed_cct_k=4000.0)
    assert _verdicts(desk) == {
        "claimed_risk_group": "consistent",  # Exempt is within a claim of RG1
        "claimed_cct_k": "contradicted",
    }  # ≈ 3000 K vs 4000 K, beyond max(150 K, 5 %)
