"""Batch runs: manifests with good and bad rows, resume after a kill, and assess_many against assess."""

import json
import signal
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import LINEUP, copy_lineup, run_process
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import hazard
from hazard.assessment.batch import run_batch
from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded
from hazard.cli import main
from hazard.errors import InputError


def _without_record_input(result: dict) -> dict:
    """A result with the record's own provenance entry removed (a manifest row has no TOML file), and so the seal
    over its content."""
    result = json.loads(json.dumps(result))
    spectrum = result["record"]["spectrum"]
    result["provenance"]["inputs"] = {spectrum: result["provenance"]["inputs"][spectrum]}
    result["provenance"]["result_sha256"] = ""
    return result


def test_folder_of_records_gives_the_same_json_as_assess(tmp_path):
    # project contract (issue: batch): good products are assessed exactly as `hazard assess` would
    folder = copy_lineup(tmp_path / "records")
    outcome = run_batch(folder, tmp_path / "out", studies=True)  # hazard assess includes the studies
    assert outcome.exit_code == 0 and len(outcome.assessments) == len(list(LINEUP.glob("*.toml")))
    lines = (tmp_path / "out" / "results.jsonl").read_text().splitlines()
    for line in lines:
        product_id = json.loads(line)["id"]
        record = folder / f"{product_id.lower()}.toml"
        single = CliRunner().invoke(main, ["assess", str(record), "--format", "json"])  # the command, in-process
        assert single.exit_code == 0
        assert json.loads(line) == json.loads(single.stdout)


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
    lines = [json.loads(x) for x in (tmp_path / "out" / "results.jsonl").read_text().splitlines()]
    assert [x["id"] for x in lines] == ["DESK", "SPOT"]
    single = hazard.assess(
        folder / "cl-desk-30.csv",
        {"id": "DESK", "distance_mm": 500, "source_diameter_mm": 30, "lamp_type": "gls", "no_emission_outside": True},
    )
    expected = _without_record_input(json.loads(single.model_dump_json()))
    assert _without_record_input(lines[0]) == expected
    assert "Traceback" not in result.stderr


def test_duplicate_ids_make_the_manifest_unusable(tmp_path):
    folder = copy_lineup(tmp_path)
    manifest = folder / "m.csv"
    manifest.write_text(
        "id,spectrum,distance_mm,source_diameter_mm\nA,cl-desk-30.csv,500,30\n"
        "B,cl-desk-30.csv,500,30\nA,cl-spot-65.csv,1000,60\n"
    )
    with pytest.raises(InputError, match=r"m.csv:4: duplicate id 'A' \(also at .*m.csv:2\)"):
        run_batch(manifest, tmp_path / "out")
    result = run_process("batch", str(manifest), "--output", str(tmp_path / "out"))
    assert result.returncode == 2 and result.stderr.count("\n") == 1 and "duplicate id" in result.stderr


def test_unknown_column_is_named_with_a_suggestion(tmp_path):
    manifest = tmp_path / "m.csv"
    manifest.write_text("id,spectrum,distance,source_diameter_mm\nA,a.csv,500,30\n")
    result = run_process("batch", str(manifest), "--output", str(tmp_path / "out"))
    assert result.returncode == 2 and "unknown column 'distance'" in result.stderr
    assert "distance_mm" in result.stderr


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
    copy_lineup(folder)
    rows = [f"P{i:04d},cl-heat-2k.csv,{1250 + i % 50},{1.6 + (i % 7) * 0.1:.1f},other,true" for i in range(count)]
    return _manifest_for(folder, rows)


@pytest.mark.parametrize("how", [signal.SIGKILL, signal.SIGINT])
def test_resume_after_a_kill_gives_the_same_summary(tmp_path, how):
    # project contract (issue: batch): killed half-way, --resume continues and ends with the same summary
    manifest = _big_manifest(tmp_path / "in", 400)
    clean = tmp_path / "clean"
    assert run_process("batch", str(manifest), "--output", str(clean)).returncode == 0
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
    resumed = run_process("batch", str(manifest), "--output", str(cut), "--resume")
    assert resumed.returncode == 0
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


# --- assess_many against assess -------------------------------------------------------------------------
GRID = np.arange(250.0, 1500.5, 2.5)


@st.composite
def products(draw):
    """A random smooth spectrum with lines, and random geometry."""
    bands = draw(
        st.lists(st.tuples(st.floats(260, 1450), st.floats(5, 200), st.floats(1e-4, 5)), min_size=1, max_size=4)
    )
    values = sum(a * np.exp(-0.5 * ((GRID - c) / w) ** 2) for c, w, a in bands)
    fields = {
        "distance_mm": draw(st.floats(100, 2000)),
        "source_diameter_mm": draw(st.floats(0.3, 80)),
        "lamp_type": draw(st.sampled_from(["gls", "other"])),
        "no_emission_outside": draw(st.booleans()),
    }
    return values, fields


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(products(), min_size=5, max_size=15))
def test_assess_many_equals_assess(tmp_path, items):
    # project contract (issue: batch): assess_many and assess share one implementation of the method
    import pandas as pd

    records = pd.DataFrame([{"id": f"P{i}", **fields} for i, (_, fields) in enumerate(items)])
    spectra = np.vstack([values for values, _ in items])
    frame = hazard.assess_many(records, GRID, spectra)
    for i, (values, fields) in enumerate(items):
        path = tmp_path / f"p{i}.csv"
        path.write_text("wavelength_nm,value\n" + "".join(f"{w!r},{v!r}\n" for w, v in zip(GRID, values, strict=True)))
        loaded = hazard.load_product(path, {"id": f"P{i}", **fields})  # hazard.assess without the studies
        single = build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=False)
        row = frame.iloc[i]
        assert row["risk_group"] == single.risk_group and row["complete"] == single.complete
        missing = pd.isna
        assert row["assessment_distance_mm"] == pytest.approx(single.assessment_distance_mm, rel=1e-9)
        assert row["illuminance_lx"] == pytest.approx(single.illuminance_lx, rel=1e-9, abs=1e-300)
        for symbol, h in single.hazards.items():
            group = row[f"{symbol}_group"]
            assert missing(group) if h.risk_group is None else group == h.risk_group
            assert row[f"{symbol}_assessed"] == h.assessed
            for got, want in ((row[f"{symbol}_value"], h.value), (row[f"{symbol}_t_max_s"], h.t_max_s)):
                if want is None:
                    assert missing(got)
                else:
                    assert got == pytest.approx(want, rel=1e-9, abs=1e-300)
        if single.photometry.cct_k is None:
            assert missing(row["cct_k"])
        else:
            assert row["cct_k"] == pytest.approx(single.photometry.cct_k, rel=1e-9)


def test_assess_many_reports_bad_products_without_stopping(tmp_path):
    import pandas as pd

    spectra = np.ones((3, GRID.size))
    spectra[1, 10] = np.nan
    records = pd.DataFrame(
        {"id": ["A", "B", "C"], "distance_mm": [200.0, 200.0, -1.0], "source_diameter_mm": [5.0, 5.0, 5.0]}
    )
    frame = hazard.assess_many(records, GRID, spectra)
    assert frame["status"].tolist() == ["ok", "error", "error"]
    assert "not finite" in frame.loc[1, "error"] and "distance_mm" in frame.loc[2, "error"]
