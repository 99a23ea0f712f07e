"""One product's result (hazard.assessment.build): bands the spectrum does not cover, the statement that nothing is
emitted outside them, and quiet output."""

import warnings

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import (
    white_lamp,
    write_spectrum,
)

import hazard
from hazard.cli import main

SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}


SIZE_OPTIONS = ["--distance-mm", "200", "--source-diameter-mm", "5"]


VISIBLE_NM = np.arange(380.0, 781.0, 1.0)


# Bands of method §1 (IEC 62471:2006 §4.3) and what a 380–780 nm spectrum misses of each
_MISSING_FROM_380_780 = {
    "E_S": "200–380 nm",
    "E_UVA": "315–380 nm",
    "L_B": "300–380 nm",
    "E_B": "300–380 nm",
    "L_R": "780–1400 nm",
    "E_IR": "780–3000 nm",
    "E_H": "780–3000 nm",
}


@pytest.mark.parametrize(("diameter_mm", "blue"), [(5.0, "L_B"), (1.0, "E_B")])
def test_band_not_covered_is_not_assessed(tmp_path, monkeypatch, diameter_mm, blue):
    # α = D/200 mm: 0.025 rad → L_B, 0.005 rad → E_B (IEC 62471:2006 Table 6.1, α < 0.011 rad). The lamp is dim
    # enough that no measured part alone exceeds an Exempt limit (L_B about 12 W/(m²·sr) against 100)
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, 0.01 * white_lamp(VISIBLE_NM))
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": diameter_mm})
    expected = {"E_S", "E_UVA", blue, "L_R", "E_IR", "E_H"}
    # method §5: a hazard is assessed only when the spectrum spans its band; method §3: with no hazard that has
    # risk groups assessed there is no group at all (never "Exempt")
    assert a.complete is False and a.risk_group is None and a.deciding_hazards == []
    assert set(a.not_assessed) == expected
    assert not a.geometry.weak_visual_stimulus  # bright lamp: L_R, not L_IR (method §1)
    for symbol in expected:
        h = a.hazards[symbol]
        assert h.assessed is False and h.value is None and h.risk_group is None and h.t_max_s is None
        missing = _MISSING_FROM_380_780[symbol]
        assert f"missing {missing}" in h.note, h.note
        assert "no_emission_outside" in h.note  # the fix is named
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(
        main, ["assess", "lamp.csv", "--distance-mm", "200", "--source-diameter-mm", str(diameter_mm)]
    )
    assert result.exit_code == 0
    overall = next(line for line in result.stdout.splitlines() if line.startswith("Overall risk group"))
    assert overall.startswith("Overall risk group: NOT DETERMINED") and "Exempt" not in overall
    assert "measure the missing wavelength range" in result.stdout  # the fix is named


def test_a_bright_lamp_measured_in_part_is_at_least_what_its_measured_part_gives(tmp_path):
    # The same spectrum at full brightness: its L_B over 380-700 nm alone, E_B/Ω_s = 1.2e3 W/(m²·sr) for a 5 mm disc
    # at 200 mm, is over the L_B Exempt limit of 100 (IEC 62471:2006 Table 6.1). B(λ) and the spectrum are
    # non-negative, so adding 300-380 nm can only raise it: at least RG1 (a lower bound), never "not determined".
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": 5.0})
    l_b = a.hazards["L_B"]
    assert not l_b.assessed and l_b.lower_bound_group == "RG1" and a.risk_group == "RG1" and not a.complete
    full = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True})
    assert full.hazards["L_B"].compared["Exempt"] > 100 and full.hazards["L_B"].risk_group == "RG1"
    holed = np.concatenate([np.arange(380.0, 430.0), np.arange(560.0, 781.0)])  # a 130 nm hole: no bound from it
    path = write_spectrum(tmp_path / "holed.csv", holed, white_lamp(holed))
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True})
    assert not a.hazards["L_B"].assessed and a.hazards["L_B"].lower_bound_group is None
    assert "no samples between 429 and 560 nm" in a.hazards["L_B"].note and a.hazards["L_B"].hole_nm == (429.0, 560.0)
    from hazard.assessment.verify import check_result

    check_result(a, "holed.json")  # a result with a hole reads back as made (hazard report checks it so)


def test_band_gap_assumed_empty_with_no_emission_outside(tmp_path, monkeypatch):
    path = write_spectrum(tmp_path / "lamp.csv", VISIBLE_NM, white_lamp(VISIBLE_NM))
    a = hazard.assess(path, {**SIZE, "no_emission_outside": True})
    # method §5: the gap counts as zero and the assumption is printed in every output
    assert a.complete is True and a.not_assessed == []
    assert all(h.assessed and h.value is not None for h in a.hazards.values())
    assert a.hazards["E_IR"].value == 0.0  # nothing beyond 780 nm by the record's statement
    assumption = "emits nothing outside 380–780 nm"
    assert any(assumption in text for text in a.assumptions)
    monkeypatch.chdir(tmp_path)
    text = CliRunner().invoke(main, ["assess", "lamp.csv", *SIZE_OPTIONS, "--no-emission-outside"])
    as_json = CliRunner().invoke(
        main, ["assess", "lamp.csv", *SIZE_OPTIONS, "--no-emission-outside", "--format", "json"]
    )
    assert text.exit_code == 0 and as_json.exit_code == 0
    assert assumption in text.stdout and assumption in as_json.stdout


# --- quiet output ------------------------------------------------------------------------------------------
def test_valid_input_raises_no_python_warnings(tmp_path):
    wl = np.arange(300.0, 1101.0, 1.0)
    values = np.exp(-0.5 * ((wl - 960) / 15) ** 2)  # an IR LED: its UV tail leaves E_S ≈ 4e-308 W/m2
    path = write_spectrum(tmp_path / "ir.csv", wl, values)
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # a valid input must not make numpy or Python warn (style.md, habit 8)
        a = hazard.assess(path, {**SIZE, "no_emission_outside": True})
    assert a.hazards["E_S"].t_max_s is None  # method §1: 30/E_S is far beyond 30000 s


def test_no_lower_bound_rests_on_a_partly_measured_v_lambda(tmp_path):
    # A relative spectrum is scaled so that ∫V reproduces its stated illuminance; measured only up to 700 nm, its
    # ∫V misses 700-830 nm, so the scale and every value are overstated, and the measured UV part is no longer a
    # true lower bound of E_S. No bound is given then (the product stays "not determined" for that hazard); the same
    # spectrum as an absolute irradiance, whose scale is its own, gives one.
    wl = np.arange(250.0, 700.5, 1.0)
    values = 0.02 * np.exp(-0.5 * ((wl - 300.0) / 5.0) ** 2) + 0.01 * np.exp(-0.5 * ((wl - 550.0) / 60.0) ** 2)
    path = write_spectrum(tmp_path / "lamp.csv", wl, values)
    size = {"distance_mm": 200.0, "source_diameter_mm": 5.0}
    absolute = hazard.assess(path, size)
    assert absolute.hazards["E_S"].lower_bound_group is not None  # S_UV(300) = 0.3: far over 0.001 W/m²
    relative = hazard.assess(path, {**size, "quantity": "relative", "illuminance_lx": 500.0})
    assert not relative.hazards["E_S"].assessed and relative.hazards["E_S"].lower_bound_group is None
