"""Every number people read is written in the project's notation: the text output of ``hazard assess`` and the PDFs and
summary.html of ``hazard batch`` never hold an exponent form such as ``2.31e+05 lx`` or ``×1.6e+03``."""

import re

import html5lib
import numpy as np
import pytest
from conftest import gaussians, run_cli, triangle_line, white_lamp, write_spectrum, write_toml

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band at 0.5 nm."""
VISIBLE_NM = np.arange(380.0, 781.0, 1.0)
EXPONENT = re.compile(r"\d[eE][+-]?\d")
"""Python's exponent form (``1e+08``, ``2.31e-05``); README "Every output writes numbers one way" forbids it."""
SHA256 = re.compile(r"\b[0-9a-f]{16,}\b")
"""Hashes the reports print (input files, tables): hexadecimal, where ``2e3`` is no number."""


def _records(folder):
    """Products whose figures lie far from everyday magnitudes (all invented test data)."""
    write_spectrum(folder / "white.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    write_spectrum(folder / "uv.csv", GRID, triangle_line(GRID, 365.0, 2.0))  # E_UVA = 2 W/m² at 200 mm
    write_spectrum(folder / "ir.csv", GRID, triangle_line(GRID, 940.0, 5000.0, 20.0))  # 10⁵ W/m² at 940 nm
    write_spectrum(folder / "blue.csv", GRID, triangle_line(GRID, 450.0, 50.0, 10.0))
    write_spectrum(folder / "red.csv", VISIBLE_NM, gaussians(VISIBLE_NM, [(720.0, 5.0, 1.0)]))
    size = {"distance_mm": 200.0, "no_emission_outside": True}
    # a GLS lamp of 10⁸ lx at 1 m is assessed where it gives 500 lx: 1000 mm × √(10⁸/500) = 4.47×10⁵ mm by the
    # inverse-square law (IEC 62471:2006 §5.2.1); claims and an uncertainty of extreme magnitudes
    write_toml(
        folder / "gls.toml",
        id="GLS",
        spectrum="white.csv",
        quantity="relative",
        illuminance_lx=1e8,
        distance_mm=1000.0,
        source_diameter_mm=60.0,
        no_emission_outside=True,
        lamp_type="gls",
        claimed_illuminance_lx=1e9,
        claimed_cct_k=1e6,
        claimed_t_max_s_L_B=1e12,
        claimed_risk_group="Exempt",
        uncertainty_pct=1e-5,
        wavelength_uncertainty_nm=1e-5,
    )
    # an IR emitter of 0.2 µm: a radiance of about 4×10¹⁶ W/(m²·sr), a t_max of 0 s; a day's exposure at 10⁸ mm
    write_toml(
        folder / "ir.toml",
        id="IR",
        spectrum="ir.csv",
        source_diameter_mm=2e-4,
        exposure_distance_mm=1e8,
        exposure_duration_s=1e-6,
        **size,
    )
    # what-ifs at 30 mm, at 0.002 mm and at 10⁸ mm
    for name, at in (("whatif", 30.0), ("near", 0.002), ("far", 1e8)):
        write_toml(
            folder / f"{name}.toml",
            id=name.upper(),
            spectrum="uv.csv",
            source_diameter_mm=5.0,
            at_distance_mm=at,
            **size,
        )
    # a pulse train of 10 µs pulses at 2 kHz: 2×10⁶ pulses in the 1000 s window; a diffuser of about ×1000
    write_toml(
        folder / "pulses.toml",
        id="PULSES",
        spectrum="blue.csv",
        source_diameter_mm=0.5,
        emission="pulse_train",
        pulse_duration_s=1e-5,
        pulse_rate_hz=2000.0,
        **size,
    )
    # a deep-red indicator: B(λ) ends at 700 nm (IEC 62471:2006 Table 4.2), so K_B,v is a few 10⁻⁵ mW/lm
    write_toml(folder / "red.toml", id="RED", spectrum="red.csv", source_diameter_mm=0.1, **size)
    return sorted(folder.glob("*.toml"))


def _no_exponent(text: str, where: str) -> None:
    found = EXPONENT.search(SHA256.sub("", text))
    assert found is None, (where, SHA256.sub("", text)[max(found.start() - 60, 0) : found.end() + 20])


@pytest.fixture(scope="module")
def folder(tmp_path_factory):
    records = tmp_path_factory.mktemp("notation") / "records"
    records.mkdir()
    _records(records)
    return records


def test_text_output_has_no_exponent_form(folder):
    texts = {}
    for record in sorted(folder.glob("*.toml")):
        ran = run_cli(["assess", record.name], folder)
        assert ran.exit_code == 0, (record.name, ran.stderr, ran.exception)  # a t_max of 0 s once stopped it (exit 1)
        texts[record.stem] = ran.stdout
        _no_exponent(ran.stdout + ran.stderr, record.name)
    # the figures above, in the project's notation
    assert "Assessed at 4.47×10⁵ mm (500 lx rule" in texts["gls"]
    assert "What-if group at 30 mm: RG2 (not a classification)" in texts["whatif"]  # 2 × (200/30)² = 88.9 W/m²
    assert "WHAT-IF at 0.002 mm" in texts["near"] and "WHAT-IF at 1×10⁸ mm" in texts["far"]
    assert re.search(r"K_B,v = [\d.]+×10⁻⁵ mW/lm", texts["red"])
    assert "with 2×10⁶ pulses in the window" in texts["pulses"]  # 2000 Hz × 1000 s (E_IR's thermal window)


def test_pdfs_and_summary_page_have_no_exponent_form(folder, tmp_path):
    from pypdf import PdfReader

    out = tmp_path / "out"
    ran = run_cli(["batch", str(folder), "--output", str(out), "--pdf", "--html", "--plan", "--studies"], tmp_path)
    assert ran.exit_code == 0, (ran.stdout, ran.stderr, ran.exception)
    _no_exponent(ran.stdout, "batch screen")
    pdfs = sorted(out.glob("*.pdf"))
    assert len(pdfs) == len(list(folder.glob("*.toml"))) + 1  # one per product and summary.pdf
    for pdf in pdfs:
        _no_exponent("\n".join(page.extract_text() for page in PdfReader(pdf).pages), pdf.name)
    page = html5lib.parse((out / "summary.html").read_text(encoding="utf-8"), namespaceHTMLElements=False)
    for hidden in [*page.iter("script"), *page.iter("style")]:  # data for the script and styles: not read by people
        hidden.clear()
    _no_exponent(" ".join(page.itertext()), "summary.html")
