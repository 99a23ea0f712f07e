"""``hazard check``: the exit code of contradicted claims, and a failing product does not stop the others."""

from conftest import (
    claim_record,
    run_cli,
    run_process,
    write_manifest,
)


def test_check_exit_codes(tmp_path):
    bad = claim_record(tmp_path, "cl-spot-65", claimed_risk_group="Exempt")
    good = claim_record(tmp_path, "cl-desk-30", claimed_risk_group="Exempt")

    contradicted = run_process("check", str(bad))  # a real process: its exit code is what scripts see
    assert contradicted.returncode == 4 and "CONTRADICTED" in contradicted.stdout  # project contract: exit 4
    consistent = run_cli(["check", str(good)], tmp_path)  # in-process
    assert consistent.exit_code == 0 and "consistent" in consistent.stdout


def test_check_goes_on_after_a_failing_product(tmp_path, monkeypatch):
    import hazard.assessment.build as engine

    real = engine.build_assessment

    def failing(loaded, *args, **kwargs):
        if loaded.record.id == "BAD":
            raise OverflowError("math range error")
        return real(loaded, *args, **kwargs)

    monkeypatch.setattr(engine, "build_assessment", failing)
    write_manifest(tmp_path, ["A", "BAD", "C"])
    result = run_cli(["check", "m.csv"], tmp_path)
    assert result.exit_code == 3
    assert result.stdout.count(": computed ") == 2 and "BAD: error:" in result.stderr
