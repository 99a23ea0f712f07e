"""Batch runs (hazard.assessment.batch): manifests with good and bad rows, resume after a kill, one bad product
never stopping the others."""

import json
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from click.testing import CliRunner
from conftest import (
    DATA,
    LINEUP,
    copy_lineup,
    run_cli,
    run_process,
    write_manifest,
)

import hazard
from hazard.assessment.batch import run_batch
from hazard.cli import main


def _without_record_input(result: dict) -> dict:
    """A result with the record's own provenance entry removed (a manifest row has no TOML file), and so the seal
    over its content."""
    result = json.loads(json.dumps(result))
    spectrum = result["record"]["spectrum"]
    result["provenance"]["inputs"] = {spectrum: result["provenance"]["inputs"][spectrum]}
    result["provenance"]["result_sha256"] = ""
    return result


def test_folder_of_records_gives_the_same_json_as_assess(tmp_path, lineup_all):
    # project contract (issue: batch): good products are assessed exactly as `hazard assess` would
    folder = copy_lineup(tmp_path / "records")
    outcome = run_batch(folder, tmp_path / "out", studies=True)  # hazard assess includes the studies
    assert outcome.exit_code == 0 and len(outcome.assessments) == len(lineup_all) == len(list(LINEUP.glob("*.toml")))
    lines = [json.loads(line) for line in (tmp_path / "out" / "results.jsonl").read_text().splitlines()]
    for line in lines:
        assert line == json.loads(lineup_all[line["id"].lower()].model_dump_json())  # hazard.assess of the record
    # and the command prints what hazard.assess returns (the command, in-process)
    single = CliRunner().invoke(main, ["assess", str(folder / "cl-desk-30.toml"), "--format", "json"])
    assert single.exit_code == 0
    assert json.loads(single.stdout) == next(line for line in lines if line["id"] == "CL-DESK-30")


def test_manifest_with_good_and_bad_rows(tmp_path):
    folder = copy_lineup(tmp_path)
    (folder / "broken.csv").write_text("wavelength_nm,value\n400,1\n410,abc\n")
    manifest = folder / "manifest.csv"
    manifest.write_text(
        "id,spectrum,distance_mm,source_diameter_mm,lamp_type,no_emission_outside\n"
        "DESK,cl-desk-30.csv,500,30,gls,true\n"
        "MISSING,nowhere.csv,200,5,other,true\n"
        "BROKEN,broken.csv,200,5,other,true\n"
        "NEGDIST,cl-desk-30.csv,-5,30,gls,true\n"
        "NOSIZE,cl-desk-30.csv,500,,gls,true\n"
        "SPOT,cl-spot-65.csv,1000,60,other,true\n"
    )
    result = run_process("batch", str(manifest), "--output", str(tmp_path / "out"), "--studies")
    assert result.returncode == 3  # project contract: 3 when some products failed
    summary = (tmp_path / "out" / "summary.csv").read_text().splitlines()
    assert [line.split(",")[0] for line in summary[1:]] == [
        "DESK",
        "MISSING",
        "BROKEN",
        "NEGDIST",
        "NOSIZE",
        "SPOT",
    ]  # sorted as given
    rows = {line.split(",")[0]: line for line in summary[1:]}
    assert ",ok," in rows["DESK"] and ",ok," in rows["SPOT"]
    assert "spectrum file not found" in rows["MISSING"]
    assert "text 'abc' in a number column" in rows["BROKEN"] and "broken.csv:3" in rows["BROKEN"]
    assert "distance_mm" in rows["NEGDIST"] and "manifest.csv:5" in rows["NEGDIST"]
    assert "missing source size" in rows["NOSIZE"]
    every = [json.loads(x) for x in (tmp_path / "out" / "results.jsonl").read_text().splitlines()]
    # README "Batch runs": a line per product in manifest order, a failed one with status "error" and its reason
    assert [x["id"] for x in every] == [line.split(",")[0] for line in summary[1:]]
    assert all((x.get("status") == "error") == (x["id"] not in ("DESK", "SPOT")) for x in every)
    assert all(x["error"] in rows[x["id"]] for x in every if x.get("status") == "error")
    lines = [x for x in every if x.get("status") != "error"]
    assert [x["id"] for x in lines] == ["DESK", "SPOT"]
    single = hazard.assess(
        folder / "cl-desk-30.csv",
        {"id": "DESK", "distance_mm": 500, "source_diameter_mm": 30, "lamp_type": "gls", "no_emission_outside": True},
    )
    expected = _without_record_input(json.loads(single.model_dump_json()))
    assert _without_record_input(lines[0]) == expected
    assert "Traceback" not in result.stderr


def test_xlsx_manifest(tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    folder = copy_lineup(tmp_path)
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["id", "spectrum", "distance_mm", "source_diameter_mm", "lamp_type", "no_emission_outside"])
    sheet.append(["DESK", "cl-desk-30.csv", 500, 30, "gls", True])
    book.save(folder / "m.xlsx")
    outcome = run_batch(folder / "m.xlsx", tmp_path / "out")
    csv_outcome = run_batch(_manifest_for(folder, ["DESK,cl-desk-30.csv,500,30,gls,true"]), tmp_path / "out2")
    assert outcome.assessments["DESK"].hazards == csv_outcome.assessments["DESK"].hazards


def _manifest_for(folder: Path, rows: list[str]) -> Path:
    path = folder / "manifest.csv"
    path.write_text(
        "id,spectrum,distance_mm,source_diameter_mm,lamp_type,no_emission_outside\n" + "\n".join(rows) + "\n"
    )
    return path


def _big_manifest(folder: Path, count: int) -> Path:
    """``count`` products on the curing lamp's spectrum (about 150 rows: reading it is a small part of a product's
    work), at varied distances and sizes."""
    copy_lineup(folder)
    rows = [f"P{i:04d},cl-cure-365.csv,{1250 + i % 50},{1.6 + (i % 7) * 0.1:.1f},other,true" for i in range(count)]
    return _manifest_for(folder, rows)


@pytest.fixture(scope="module")
def big_batch(tmp_path_factory):
    """A manifest of 400 products and the outputs of an uninterrupted run of it (the command, in-process)."""
    folder = tmp_path_factory.mktemp("big")
    manifest = _big_manifest(folder / "in", 400)
    clean = folder / "clean"
    assert run_cli(["batch", str(manifest), "--output", str(clean)], folder).exit_code == 0
    return manifest, clean


@pytest.mark.parametrize("how", [signal.SIGKILL, signal.SIGINT])
def test_resume_after_a_kill_gives_the_same_summary(tmp_path, big_batch, how):
    # project contract (issue: batch): killed half-way, --resume continues and ends with the same summary
    manifest, clean = big_batch
    cut = tmp_path / "cut"
    # a shell without job control starts background jobs with SIGINT ignored; give the child the default
    process = subprocess.Popen(
        [sys.executable, "-m", "hazard.cli", "batch", str(manifest), "--output", str(cut)],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
        preexec_fn=lambda: signal.signal(signal.SIGINT, signal.SIG_DFL),
    )
    partial = cut / "results.jsonl.partial"
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline and process.poll() is None:
        if partial.exists() and partial.stat().st_size > 0:
            process.send_signal(how)  # repeated until it takes: a signal may land before the handler is armed
        time.sleep(0.005)
    process.wait(timeout=60)
    killed = process.returncode != 0
    assert killed, "the run finished before it could be interrupted; raise the product count"
    assert not (cut / "summary.csv").exists()  # nothing final was written by the interrupted run
    resumed = run_cli(["batch", str(manifest), "--output", str(cut), "--resume"], tmp_path)
    assert resumed.exit_code == 0
    reused = int(resumed.stdout.split("assessed (")[1].split(" reused")[0])
    assert 0 < reused < 400
    assert (cut / "summary.csv").read_bytes() == (clean / "summary.csv").read_bytes()
    assert (cut / "results.jsonl").read_bytes() == (clean / "results.jsonl").read_bytes()
    assert not partial.exists()


def test_resume_reassesses_a_changed_input(tmp_path):
    folder = copy_lineup(tmp_path / "in")
    manifest = _manifest_for(folder, ["A,cl-desk-30.csv,500,30,gls,true", "B,cl-spot-65.csv,1000,60,other,true"])
    run_batch(manifest, tmp_path / "out")
    spectrum = folder / "cl-spot-65.csv"
    spectrum.write_text(spectrum.read_text().replace("# Invented", "# edited; Invented", 1))
    outcome = run_batch(manifest, tmp_path / "out", resume=True)
    assert outcome.reused == 1  # only A is unchanged (its inputs' SHA-256 match)


# --- malformed files ------------------------------------------------------------------------------------
def test_malformed_files_in_a_batch_do_not_stop_the_others(tmp_path, monkeypatch):
    from hazard.assessment.batch import run_batch

    (tmp_path / "truncated.csv").write_text("wavelength_nm,value\n400,0.1\n401,0.2\n402,")
    (tmp_path / "binary.csv").write_bytes(b"\x00\x01\x02PK\x03\x04" * 20)
    (tmp_path / "huge.csv").write_text(
        "wavelength_nm,value\n" + "".join(f"{400 + i * 1e-3:.3f},1\n" for i in range(30000))
    )
    (tmp_path / "good.csv").write_text((DATA / "comma.csv").read_text())
    manifest = tmp_path / "m.csv"
    manifest.write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside,column\n"
        "T,truncated.csv,500,20,true,\nB,binary.csv,500,20,true,\nH,huge.csv,500,20,true,\n"
        "W,good.csv,500,20,true,power\nG,good.csv,500,20,true,\n"
    )
    monkeypatch.setenv("HAZARD_MAX_FILE_MB", "0.2")  # the size limit is configurable (method: resource limits)
    outcome = run_batch(manifest, tmp_path / "out")
    assert set(outcome.assessments) == {"G"}
    assert "binary file" in outcome.errors["B"]
    assert "above the 0.20 MB limit" in outcome.errors["H"]
    assert "no value column named 'power'" in outcome.errors["W"]
    assert "truncated.csv:4: empty cell in a number column (the file may be truncated)" in outcome.errors["T"]


# --- one bad product never loses the batch --------------------------------------------------------------------
@pytest.mark.parametrize(("raised", "status"), [(OverflowError("math range error"), 3), (RuntimeError("a defect"), 1)])
def test_a_failure_after_loading_is_that_products_error(tmp_path, monkeypatch, raised, status):
    import hazard.assessment.batch as batch

    real = batch.build_assessment

    def failing(loaded, *args, **kwargs):
        if loaded.record.id == "BAD":
            raise raised
        return real(loaded, *args, **kwargs)

    monkeypatch.setattr(batch, "build_assessment", failing)
    manifest = write_manifest(tmp_path, ["A", "BAD", "C"])
    outcome = batch.run_batch(manifest, tmp_path / "out")
    assert outcome.exit_code == status and list(outcome.assessments) == ["A", "C"]
    summary = (tmp_path / "out" / "summary.csv").read_text().splitlines()
    assert [line.split(",")[:2] for line in summary[1:]] == [["A", "ok"], ["BAD", "error"], ["C", "ok"]]
    assert ("internal error" in outcome.errors["BAD"]) == (status == 1)
    for line in (tmp_path / "out" / "results.jsonl").read_text().splitlines():
        if json.loads(line).get("status") == "error":  # README "Batch runs": a failed product's line
            assert json.loads(line)["id"] == "BAD"
            continue
        hazard.Assessment.model_validate_json(line)  # every written result reads back


def test_a_report_that_fails_to_render_does_not_stop_the_others(tmp_path, monkeypatch):
    import hazard.reports
    from hazard.assessment.batch import run_batch

    real = hazard.reports.render_assessment_pdf

    def failing(assessment, *args, **kwargs):
        if assessment.id == "BAD":
            raise ValueError("a defect")
        return real(assessment, *args, **kwargs)

    monkeypatch.setattr(hazard.reports, "render_assessment_pdf", failing)
    outcome = run_batch(write_manifest(tmp_path, ["A", "BAD"]), tmp_path / "out", pdf=True)
    assert outcome.exit_code == 1 and "a defect" in outcome.report_failures["BAD"]
    assert (tmp_path / "out" / "A.pdf").exists() and (tmp_path / "out" / "summary.pdf").exists()
    assert not (tmp_path / "out" / "BAD.pdf").exists()


def test_resume_survives_a_torn_utf8_tail_and_removes_stale_temporaries(tmp_path):
    from hazard.assessment.batch import run_batch

    manifest = write_manifest(tmp_path, ["A", "B", "C"])
    out = tmp_path / "out"
    run_batch(manifest, out)
    clean = (out / "results.jsonl").read_bytes()
    first = clean.split(b"\n")[0]
    (out / "results.jsonl").unlink()
    (out / "summary.csv").unlink()
    (out / "results.jsonl.partial").write_bytes(first + b"\n" + "é".encode()[:1] + first[:50])  # a full disk
    stale = out / ".summary.csv.4194304-abcdefgh.hazard.tmp"  # a killed run's (no such process id)
    stale.write_text("half")
    outcome = run_batch(manifest, out, resume=True)
    assert outcome.reused == 1 and (out / "results.jsonl").read_bytes() == clean
    assert not stale.exists() and not (out / "results.jsonl.partial").exists()
