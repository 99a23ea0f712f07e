"""Spectrometer export dialects, relative spectra with photometric anchors, vendor claims, malformed files."""

import subprocess
import sys

import numpy as np
import pytest
from conftest import DATA, claim_record, write_spectrum

import hazard
from hazard.errors import InputError
from hazard.inputs.loading import product_from_record
from hazard.inputs.record import ProductRecord

REFERENCE = np.loadtxt(DATA / "reference.txt")  # invented test spectrum, W/m2/nm (tests/data, our own)
SIZE = {"distance_mm": 500.0, "source_diameter_mm": 20.0}


def _load(name, **fields):
    record = ProductRecord(id="x", spectrum=name, **{**SIZE, **fields})
    return product_from_record(record, DATA, name)


@pytest.mark.parametrize(
    ("name", "fields"),
    [
        ("comma.csv", {}),
        ("semicolon_decimal_comma.csv", {}),  # mW/m²/nm from the header, UTF-8 BOM, CRLF
        ("tab_latin1.tsv", {}),  # µW/(cm²·nm) from a Latin-1 header
        ("whitespace.txt", {}),
        ("several_columns.csv", {"column": "irradiance"}),  # chosen by name without its unit
        ("several_columns.csv", {"column": 3}),  # chosen by number among the value columns
        ("workbook.xlsx", {}),
        ("arrays.json", {}),
        ("pairs.json", {}),
        ("micrometre_header_descending.csv", {}),  # µm by header, descending rows
    ],
)
def test_every_dialect_reads_to_the_same_spectrum(name, fields):
    # project corpus (tests/data): each file holds the spectrum of reference.txt in another dialect
    product = _load(name, **fields)
    np.testing.assert_allclose(product.spectrum.wavelength_nm, REFERENCE[:, 0], rtol=1e-9)
    np.testing.assert_allclose(product.spectrum.value, REFERENCE[:, 1], rtol=2e-6)  # printed to 6 digits


def test_metadata_lines_are_kept():
    product = _load("semicolon_decimal_comma.csv")
    assert product.metadata["metadata"]["Integration time"] == "120 ms"
    assert product.metadata["decimal_comma"] is True and product.metadata["unit_used"] == "mW/m²/nm"


def test_header_unit_contradicting_the_record_is_refused():
    # the header states mW/m²/nm; a record claiming W/m2/nm would be off by 10^3 (method §5 unit slips)
    with pytest.raises(InputError, match=r"the record says unit 'W/m2/nm' but the file's header cell says"):
        _load("semicolon_decimal_comma.csv", unit="W/m2/nm")
    assert _load("semicolon_decimal_comma.csv", unit="mW/m2/nm").spectrum.value[0] == pytest.approx(
        REFERENCE[0, 1], rel=2e-6
    )


def test_irregular_grid_integrates_on_its_own_grid(tmp_path):
    # An array spectrometer's ~0.3 nm irregular grid gives the same quantities as a regular 0.1 nm grid of
    # the same smooth spectrum, within the trapezoid rule's error (method §5: own grid, no resampling).
    rng = np.random.default_rng(3)
    irregular = np.cumsum(rng.uniform(0.2, 0.4, 8000)) + 300.0
    irregular = irregular[irregular <= 1100]
    regular = np.arange(300.0, 1100.0, 0.1)

    def shape(w):
        return 0.05 * np.exp(-0.5 * ((w - 460) / 20) ** 2) + 0.1 * np.exp(-0.5 * ((w - 800) / 90) ** 2)

    a = hazard.assess(
        write_spectrum(tmp_path / "i.csv", irregular, shape(irregular)), {**SIZE, "no_emission_outside": True}
    )
    b = hazard.assess(
        write_spectrum(tmp_path / "r.csv", regular, shape(regular)), {**SIZE, "no_emission_outside": True}
    )
    for symbol in ("E_UVA", "L_B", "L_R", "E_IR", "E_H"):
        assert a.hazards[symbol].value == pytest.approx(b.hazards[symbol].value, rel=2e-3)


# --- relative spectra with a photometric anchor ------------------------------------------------------
def test_illuminant_a_scaled_to_1000_lx(colour, tmp_path):
    # colour-science's CIE illuminant A (relative) anchored to 1000 lx at 500 mm: the scale factor is
    # 1000 / (683 ∫S V dλ), with colour-science's own photometry giving 683 ∫S V dλ (CIE S 010, K_m = 683).
    sd = colour.SDS_ILLUMINANTS["A"]
    path = write_spectrum(tmp_path / "a.csv", sd.wavelengths, sd.values)
    a = hazard.assess(
        path,
        {
            "quantity": "relative",
            "illuminance_lx": 1000.0,
            "distance_mm": 500.0,
            "source_diameter_mm": 10.0,
            "no_emission_outside": True,
        },
    )
    expected_scale = 1000.0 / colour.luminous_flux(sd)
    assert a.scaling.scale_factor == pytest.approx(expected_scale, rel=1e-3)
    assert a.illuminance_lx == pytest.approx(1000.0 * (500 / 200) ** 2, rel=1e-9)  # inverse-square to 200 mm
    # the absolute spectrum: E_λ(560 nm) at 500 mm = scale · S(560); the preview holds it at 200 mm scaling
    # to the measurement distance is the record's job, so compare E_UVA (unweighted 315-400 nm) instead
    uva_relative = float(
        np.trapezoid(
            sd.values[(sd.wavelengths >= 315) & (sd.wavelengths <= 400)],
            sd.wavelengths[(sd.wavelengths >= 315) & (sd.wavelengths <= 400)],
        )
    )
    assert a.hazards["E_UVA"].value == pytest.approx(expected_scale * uva_relative * (500 / 200) ** 2, rel=2e-3)
    assert any("scaled by" in text for text in a.assumptions)


def test_led_b3_with_luminous_intensity(colour, tmp_path):
    # CIE LED-B3 (CIE 15:2018, via colour-science) with I_v = 250 cd: E_v at 200 mm = I/d² = 6250 lx
    # (inverse-square law)
    sd = colour.SDS_ILLUMINANTS["LED-B3"]
    path = write_spectrum(tmp_path / "b3.csv", sd.wavelengths, sd.values)
    a = hazard.assess(
        path,
        {
            "quantity": "relative",
            "luminous_intensity_cd": 250.0,
            "source_diameter_mm": 5.0,
            "no_emission_outside": True,
        },
    )
    assert a.illuminance_lx == pytest.approx(250.0 / 0.2**2, rel=1e-9)
    assert a.blue_light_transfer.luminous_intensity_cd == 250.0
    # TR 62778: d_thr = √(I/E_thr), E_thr = 1/K_B,v
    t = a.blue_light_transfer
    assert t.threshold_distance_mm == pytest.approx(1e3 * np.sqrt(250.0 * t.k_bv_w_per_lm), rel=1e-9)


def test_relative_spectrum_short_of_a_band_follows_the_coverage_rule(tmp_path):
    wl = np.arange(400.0, 701.0, 1.0)
    path = write_spectrum(tmp_path / "rel.csv", wl, np.exp(-0.5 * ((wl - 550) / 60) ** 2))
    a = hazard.assess(
        path, {"quantity": "relative", "illuminance_lx": 500.0, "distance_mm": 500.0, "source_diameter_mm": 20.0}
    )
    assert not a.complete and "E_S" in a.not_assessed  # method §5 coverage


def test_relative_spectrum_needs_one_anchor(tmp_path):
    path = write_spectrum(tmp_path / "rel.csv", [500.0, 600.0], [1.0, 1.0])
    with pytest.raises(InputError, match="exactly one anchor"):
        hazard.assess(path, {"quantity": "relative", "source_diameter_mm": 5.0})
    with pytest.raises(InputError, match="scales a relative spectrum"):
        hazard.assess(path, {"illuminance_lx": 5.0, "distance_mm": 200.0, "source_diameter_mm": 5.0})


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


def test_check_exit_codes(tmp_path):
    bad = claim_record(tmp_path, "cl-spot-65", claimed_risk_group="Exempt")
    good = claim_record(tmp_path, "cl-desk-30", claimed_risk_group="Exempt")

    def run(p):
        return subprocess.run([sys.executable, "-m", "hazard.cli", "check", str(p)], capture_output=True, text=True)

    contradicted, consistent = run(bad), run(good)
    assert contradicted.returncode == 4 and "CONTRADICTED" in contradicted.stdout  # project contract: exit 4
    assert consistent.returncode == 0 and "consistent" in consistent.stdout


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
