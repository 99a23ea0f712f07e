"""``hazard assess`` as a user runs it: results that cannot be misread, bad input as one line in a real process, and
outputs that never replace inputs."""

import json
import os
import re
import subprocess
import sys

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    REPO,
    assert_error_line,
    assert_exit_2,
    file_hashes,
    run_cli,
    triangle_line,
    white_lamp,
    write_file,
    write_lamp,
    write_spectrum,
)

from hazard.cli import main

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""


SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]
HEADER = "wavelength_nm,value\n"
VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


def _lamp(wl):
    """A dim visible lamp [W m⁻² nm⁻¹] (invented test data)."""
    return 1e-3 * np.exp(-0.5 * ((wl - 560.0) / 80.0) ** 2)


# --- outputs that cannot be misread ----------------------------------------------------------------------
def test_nothing_assessable_has_no_group_anywhere(tmp_path, monkeypatch):
    # method §3: with no hazard that has risk groups assessed there is no group: null in JSON, "not determined"
    # in words, never "Exempt"
    write_spectrum(tmp_path / "vis.csv", VISIBLE_NM, _lamp(VISIBLE_NM))
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5"]
    as_json = CliRunner().invoke(main, ["assess", "vis.csv", *options, "--format", "json"])
    result = json.loads(as_json.stdout)
    assert result["risk_group"] is None and result["distances"] is None and result["remedies"] is None
    text = CliRunner().invoke(main, ["assess", "vis.csv", *options, "--pdf", "vis.pdf"]).stdout
    assert "NOT DETERMINED" in text and "Exempt" not in text.split("Overall risk group")[1].splitlines()[0]
    from pypdf import PdfReader

    first = " ".join(PdfReader(tmp_path / "vis.pdf").pages[0].extract_text().split())
    assert "Risk group not determined" in first and "Do not read this as safe" in first  # the answer, in words
    assert "Exempt group" not in first


def test_what_if_is_never_mistaken_for_a_classification(tmp_path, monkeypatch):
    # method §4: at_distance_mm is a what-if; the standard's group is named beside it
    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 365.0, 50.0))  # E_UVA = 50 W/m² at 200 mm
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside"]
    far = json.loads(CliRunner().invoke(main, ["assess", "uv.csv", *options, "--format", "json"], env={}).stdout)
    assert far["basis"] == "standard" and far["standard_risk_group"] is None
    (tmp_path / "uv.toml").write_text(
        'id = "UV"\nspectrum = "uv.csv"\ndistance_mm = 200.0\nsource_diameter_mm = 5.0\n'
        "no_emission_outside = true\nat_distance_mm = 5000.0\n"
    )
    what_if = json.loads(CliRunner().invoke(main, ["assess", "uv.toml", "--format", "json"]).stdout)
    assert what_if["basis"] == "what-if" and what_if["standard_risk_group"] == far["risk_group"]
    assert what_if["risk_group"] != far["risk_group"]  # E_UVA falls by (200/5000)² at 5 m (inverse square)
    text = CliRunner().invoke(main, ["assess", "uv.toml"]).stdout
    assert text.startswith("UV\nWHAT-IF at 5000 mm, not a classification") and far["risk_group"] in text.splitlines()[1]
    (tmp_path / "manifest.csv").write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside,"
        "at_distance_mm\nA,uv.csv,200,5,true,5000\nB,uv.csv,200,5,true,\n"
    )
    batch = CliRunner().invoke(main, ["batch", "manifest.csv", "--output", "out"])
    row_a = next(line for line in batch.stdout.splitlines() if line.startswith("A "))
    assert row_a.split()[1] == far["risk_group"] and "WHAT-IF at 5000 mm gives Exempt" in row_a
    import csv

    rows = list(csv.DictReader((tmp_path / "out" / "summary.csv").open()))
    assert [r["basis"] for r in rows] == ["what-if", "standard"]
    # the classification column always holds the standard's group; the what-if has its own columns
    assert [r["risk_group"] for r in rows] == [far["risk_group"]] * 2
    assert rows[0]["what_if_risk_group"] == "Exempt" and rows[0]["what_if_distance [mm]"] == "5000"


def test_a_what_if_row_reads_at_one_distance_in_every_summary(tmp_path, monkeypatch):
    # The same 365 nm lamp twice: B at the standard's 200 mm (E_UVA = 2 W/m², Exempt), A as a what-if at 30 mm,
    # where the inverse-square law gives 2 × (200/30)² = 88.9 W/m²: RG2 (IEC 62471:2006 Table 6.1, E_UVA 33 to
    # 100 W/m²). Every summary keeps the classification (Exempt) as the product's group and marks the what-if's own
    # figures, so no row carries a group its hazard columns contradict.
    import csv

    from openpyxl import load_workbook
    from pypdf import PdfReader

    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 365.0, 2.0))
    monkeypatch.chdir(tmp_path)
    (tmp_path / "manifest.csv").write_text(
        "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside,at_distance_mm\n"
        "A,uv.csv,200,5,true,30\nB,uv.csv,200,5,true,\n"
    )
    batch = CliRunner().invoke(main, ["batch", "manifest.csv", "--output", "out", "--html", "--pdf"])
    assert batch.exit_code == 0, batch.stderr
    with (tmp_path / "out" / "summary.csv").open(newline="") as handle:
        header = next(csv.reader(handle))
        handle.seek(0)
        rows = {r["id"]: r for r in csv.DictReader(handle)}
    assert header[header.index("hazard_columns_at [mm]") + 1] == "E_S value [W m-2]"  # right before the hazards
    a, b = rows["A"], rows["B"]
    assert a["risk_group"] == b["risk_group"] == "Exempt" and a["assessment_distance [mm]"] == "200"
    assert (a["hazard_columns_at [mm]"], a["E_UVA value [W m-2]"], a["E_UVA group"]) == ("30.0", "88.9", "RG2")
    assert (b["hazard_columns_at [mm]"], b["E_UVA value [W m-2]"], b["E_UVA group"]) == ("200", "2.00", "Exempt")
    assert a["what_if_risk_group"] == "RG2" and a["deciding_hazards"] == "what-if at 30 mm: E_S, E_UVA"
    assert a["margin"].startswith("what-if at 30 mm: E_UVA: 2.7× RG1 limit")  # 88.9 / 33
    sheet = load_workbook(tmp_path / "out" / "summary.xlsx", read_only=True)["products"]
    cells = [list(r) for r in sheet.iter_rows(values_only=True)]
    assert list(cells[0]) == header  # the workbook has the same columns
    row_a = dict(zip(header, next(r for r in cells[1:] if r[0] == "A"), strict=False))  # trailing empty cells cut
    assert row_a["hazard_columns_at [mm]"] == 30 and row_a["risk_group"] == "Exempt"
    # summary.pdf: the what-if's deciding hazards and margin are marked; it ranks after B, whose margin is the
    # classification's (reports/ranking.py), and its borderline margin (88.9 % of the RG2 limit) counts for none
    first = " ".join(PdfReader(tmp_path / "out" / "summary.pdf").pages[0].extract_text().split())
    assert "what-if at 30 mm: E_S, E_UVA" in first and "what-if at 30 mm: E_UVA: 2.7× RG1 limit" in first
    assert first.index("2 A") > first.index("1 B") and "borderline: 0" in first
    assert "WHAT-IF at 30 mm gives RG2" in first and "BORDERLINE at the what-if distance (30 mm)" in first
    page = (tmp_path / "out" / "summary.html").read_text(encoding="utf-8")
    html_a = re.search(r'<tr [^>]*data-id="A">(.*?)</tr>', page, re.S).group(1)
    assert ">Exempt<" in html_a and "what-if at 30 mm: E_S, E_UVA" in html_a
    assert 'aria-label="Headroom: what-if at 30 mm: ' in html_a  # the drawing is of the what-if distance


def test_a_what_if_names_its_own_deciding_hazards_and_both_groups(tmp_path, monkeypatch):
    # The small red emitter of method §3 (0.1 mm at 200 mm, E_R = 150 W/m², R = 1 at 650 nm, IEC 62471:2006
    # Table 4.2) is RG3 at the standard's 200 mm by L_R. At 1000 mm it is Exempt: the what-if's deciding
    # hazards are those in its own Exempt group, L_R among them, and L_R is the one closest to its limit (its
    # 11 mrad average is 150·(0.2)²/Ω(11 mrad) = 6.3e4 W/(m²·sr) against 28000/0.011 = 2.5e6: 2.5 %; E_B is
    # B(650) = 0.001 × 150 × 0.04 = 6e-3 W/m² against 1 W/m²: 0.6 %).
    write_spectrum(tmp_path / "red.csv", GRID, triangle_line(GRID, 650.0, 150.0))
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "0.1", "--no-emission-outside", "--at-distance-mm"]
    ran = CliRunner().invoke(main, ["assess", "red.csv", *options, "1000", "--format", "json", "--output", "r.json"])
    assert ran.exit_code == 0
    assert "(red: what-if at 1000 mm: Exempt; at the standard's distance: RG3)" in ran.stderr
    result = json.loads((tmp_path / "r.json").read_text())
    assert result["risk_group"] == "Exempt" and result["standard_risk_group"] == "RG3"
    assert "L_R" in result["deciding_hazards"]
    closest = max(result["deciding_hazards"], key=lambda s: result["hazards"][s]["margins"]["Exempt"])
    assert closest == "L_R"
    assert result["hazards"]["L_R"]["margins"]["Exempt"] == pytest.approx(0.025, rel=0.03)
    # noise-level hazards (E_S, E_UVA, E_IR far below their limits) are not split by wavelength band
    assert set(result["contributions"]) == {"E_B", "L_R", "E_H"} and result["remedies"]["uv_bands"] == {}
    text = CliRunner().invoke(main, ["assess", "red.csv", *options[:-1]]).stdout
    assert not re.search(r"\de[+-]\d", text)  # no exponent form ("1e+02 %") anywhere in the text output


def test_band_shares_read_as_percentages(tmp_path, monkeypatch):
    # A UV line within one 5 nm band (266.5–268.5 nm) puts all of E_S there: "100 %", never "1e+02 %"
    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 267.5, 0.01))
    monkeypatch.chdir(tmp_path)
    text = CliRunner().invoke(main, ["assess", "uv.csv", *SIZE_OPTIONS, "--no-emission-outside"]).stdout
    assert "E_S comes mostly from 265–270 nm 100 %" in text


def test_a_limit_exceeded_at_once_prints_and_renders(tmp_path, monkeypatch):
    # A green line of E_R = 10⁴ W/m² from a 2 mm disc at 200 mm (R = 1 at 550 nm, IEC 62471:2006 Table 4.2): the
    # disc (α = 10 mrad) fills every field, so L_R = E/Ω_s = 10⁴/7.85e-5 = 1.27e8 W/(m²·sr), over even the L_R
    # limit at 10 µs, 50000/(0.01·(1e-5)^0.25) = 8.9e7 (§4.3.5), so t_max is 0: printed "at once", never a crash
    write_spectrum(tmp_path / "green.csv", GRID, triangle_line(GRID, 550.0, 1e4))
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "2", "--no-emission-outside", "--pdf", "g.pdf"]
    ran = CliRunner().invoke(main, ["assess", "green.csv", *options])
    assert ran.exit_code == 0, ran.stderr
    l_r = next(line for line in ran.stdout.splitlines() if line.startswith("L_R "))
    assert " at once " in l_r and " RG3 " in l_r
    from pypdf import PdfReader

    assert "t_max at once" in " ".join(PdfReader(tmp_path / "g.pdf").pages[0].extract_text().split())


def test_a_pulse_far_within_its_limit_counts_no_pulses_to_reach_it(tmp_path, monkeypatch):
    # A 450 nm Gaussian (σ 10 nm) pulsed at 10 µs and 2 kHz: its far tail in 780-3000 nm is ~1e-290 of its peak,
    # so E_IR's pulse is so far within its limit that fraction^-4 pulses (the N^-0.25 rule) overflow a float:
    # that count is "none" (null), never a crash (it once stopped the text output with exit 1)
    wl = np.arange(300.0, 3001.0, 1.0)
    write_spectrum(tmp_path / "pt.csv", wl, np.exp(-0.5 * ((wl - 450.0) / 10.0) ** 2))
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside", "--format", "json"]
    pulses = ["--emission", "pulse_train", "--pulse-duration-s", "10us", "--pulse-rate-hz", "2000"]
    ran = CliRunner().invoke(main, ["assess", "pt.csv", *options, *pulses])
    assert ran.exit_code == 0, ran.stderr
    assert json.loads(ran.stdout)["hazards"]["E_IR"]["pulse"]["pulses_to_limit"] is None
    assert CliRunner().invoke(main, ["assess", "pt.csv", *options[:-2], *pulses]).exit_code == 0


def _assess_in_a_process(args, cwd):
    """The real command in a fresh interpreter, as a user runs it."""
    env = {**os.environ, "PYTHONPATH": os.pathsep.join(filter(None, [str(REPO), os.environ.get("PYTHONPATH")]))}
    return subprocess.run(
        [sys.executable, "-m", "hazard.cli", "assess", *args],
        capture_output=True,
        text=True,
        cwd=cwd,
        env=env,
        timeout=120,
    )


def test_real_process_exit_code_and_one_line(tmp_path):
    # A fresh interpreter: the exit status and stderr a shell script sees (hazard/cli.py: exit 2, one line)
    write_file(tmp_path / "text.csv", HEADER + "500,0.1\n501,0.2\n502,abc\n503,0.1\n")
    before = file_hashes(tmp_path)
    result = _assess_in_a_process(["text.csv", *SIZE_OPTIONS], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "text.csv:4: text 'abc' in a number column")
    assert file_hashes(tmp_path) == before


def test_real_process_missing_file(tmp_path):
    result = _assess_in_a_process(["missing.csv", *SIZE_OPTIONS], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "missing.csv", "file not found")


def test_real_process_invalid_toml_names_the_line(tmp_path):
    write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    write_file(tmp_path / "record.toml", 'id = "x"\nspectrum = "lamp.csv"\ndistance_mm = 200\nsource_diameter_mm 5\n')
    result = _assess_in_a_process(["record.toml"], tmp_path)
    assert_error_line(result.returncode, result.stdout, result.stderr, "record.toml:4: not valid TOML")


# --- outputs never touch inputs -------------------------------------------------------------------------------
def test_assess_refuses_to_write_over_its_input(tmp_path):
    path = write_lamp(tmp_path)
    before = path.read_bytes()
    for option in ("--output", "--pdf"):
        result = run_cli(
            ["assess", "lamp.csv", "--distance-mm", "500", "--source-diameter-mm", "30", option, "lamp.csv"], tmp_path
        )
        assert_exit_2(result, "would replace an input file")
    assert path.read_bytes() == before
