"""The method checked by hand: limits from the exposure-limit formulas, t_max, geometry, distances, switches."""

import math

import numpy as np
import pytest
from conftest import assess_arrays, triangle_line

from hazard.method.geometry import SourceShape, cone_solid_angle_sr
from hazard.standards import IEC_62471_2006

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


# --- Table 6.1 limits reproduced from the exposure limits at the time bases ---------------------------
# Exposure-limit formulas of IEC 62471:2006 §4.3 (constants written here, independent of the registry).
def _el_e_s(t):  # 4.3.1: E_S·t ≤ 30 J/m2
    return 30 / t


def _el_e_uva(t):  # 4.3.2: E_UVA·t ≤ 10^4 J/m2 for t ≤ 1000 s, 10 W/m2 beyond
    return 1e4 / t if t <= 1000 else 10.0


def _el_l_b(t):  # 4.3.3: L_B·t ≤ 10^6 J/(m2 sr) for t ≤ 10^4 s, 100 W/(m2 sr) beyond
    return 1e6 / t if t <= 1e4 else 100.0


def _el_e_b(t):  # 4.3.4: E_B·t ≤ 100 J/m2 for t ≤ 100 s, 1 W/m2 beyond
    return 100 / t if t <= 100 else 1.0


def _el_l_r_alpha(t):  # 4.3.5: L_R ≤ 50000/(α t^0.25); returns the coefficient over α
    return 50000 / t**0.25


def _el_e_ir(t):  # 4.3.7: E_IR ≤ 18000 t^-0.75 for t ≤ 1000 s, 100 W/m2 beyond
    return 18000 * t**-0.75 if t <= 1000 else 100.0


@pytest.mark.parametrize(
    ("symbol", "formula"),
    [
        ("E_S", _el_e_s),
        ("E_UVA", _el_e_uva),
        ("L_B", _el_l_b),
        ("E_B", _el_e_b),
        ("L_R", _el_l_r_alpha),
        ("E_IR", _el_e_ir),
    ],
)
def test_table_6_1_limits_follow_from_exposure_limits(symbol, formula):
    # IEC 62471:2006 Table 6.1 prints the limits to two significant digits: 30/30000 s = 0.001 W/m2,
    # 50000·10^-0.25 ≈ 28000, 18000·100^-0.75 ≈ 570; the rounding is at most 1.5 % (10^4/300 = 33.3 → 33).
    hazard = IEC_62471_2006[symbol]
    for limit, t in zip(hazard.limits, hazard.time_bases_s, strict=True):
        assert limit == pytest.approx(formula(t), rel=0.015)


def test_table_6_1_named_values():
    # IEC 62471:2006 Table 6.1, as printed
    h = IEC_62471_2006
    assert h["E_S"].limits == (0.001, 0.003, 0.03)
    assert h["E_UVA"].limits == (10, 33, 100)
    assert h["L_B"].limits == (100, 10000, 4e6)
    assert h["E_B"].limits == (1.0, 1.0, 400)
    assert h["L_R"].limits == (28000, 28000, 71000)
    assert h["E_IR"].limits == (100, 570, 3200)
    assert 30 / 30000 == pytest.approx(0.001) and 50000 * 10**-0.25 == pytest.approx(28000, rel=0.005)
    assert 18000 * 100**-0.75 == pytest.approx(570, rel=0.002)


# --- narrow lines: weight × irradiance, and t_max -------------------------------------------------------
def test_actinic_line_gives_weight_times_irradiance_and_t_max(tmp_path):
    # A 270 nm line of 0.01 W/m2: S_UV(270) = 1.0 (IEC 62471:2006 Table 4.1), so E_S = 0.01 W/m2,
    # t_max = 30/E_S = 3000 s (IEC 62471:2006 §4.3.1), group RG2 (0.003 < 0.01 ≤ 0.03, Table 6.1).
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 270.0, 0.01 / 0.05, 0.05), no_emission_outside=True)
    e_s = a.hazards["E_S"]
    assert e_s.value == pytest.approx(0.01, rel=1e-3)
    assert e_s.t_max_s == pytest.approx(3000, rel=1e-3)
    assert e_s.risk_group == "RG2"


def test_254_nm_line(tmp_path):
    # S_UV(254) = 0.5 (IEC 62471:2006 Table 4.1): a 0.002 W/m2 line at 254 nm gives E_S = 0.001 W/m2
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 254.0, 0.002 / 0.05, 0.05), no_emission_outside=True)
    assert a.hazards["E_S"].value == pytest.approx(0.001, rel=1e-3)


def test_blue_line_small_source_e_b_and_t_max(tmp_path):
    # B = 1.0 over 435-440 nm (Table 4.2): a line at 437.5 nm sits on that plateau. A 2 mm source at 200 mm
    # has α = 0.01 rad < 0.011: E_B applies (Table 6.1). E_B = 2 W/m2 → t_max = 100/E_B = 50 s (§4.3.4);
    # 1 < 2 ≤ 400 → RG2.
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 437.5, 2.0), source_diameter_mm=2.0, no_emission_outside=True)
    assert "E_B" in a.hazards and "L_B" not in a.hazards
    assert a.hazards["E_B"].value == pytest.approx(2.0, rel=1e-9)
    assert a.hazards["E_B"].t_max_s == pytest.approx(50, rel=1e-3)
    assert a.hazards["E_B"].risk_group == "RG2"


def test_blue_line_large_source_l_b_with_fov_averaging(tmp_path):
    # A 10 mm disc at 200 mm: α = 0.05 rad ≥ 0.011, so L_B applies. Source radiance L = E_B/Ω_s with
    # Ω_s = 2π(1 − cos(atan(D/2d))) (method §4); at the Exempt boundary the 0.1 rad field is larger than the
    # source, so the compared radiance is E_B/Ω(0.1 rad) (IEC 62471:2006 Table 6.1 fields of view).
    a = assess_arrays(
        tmp_path,
        GRID,
        triangle_line(GRID, 437.5, 10.0),
        source_diameter_mm=10.0,  # B = 1 plateau
        no_emission_outside=True,
    )
    l_b = a.hazards["L_B"]
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(10 / 400)))
    omega_exempt = 2 * math.pi * (1 - math.cos(0.05))
    assert l_b.value == pytest.approx(10 / omega_s, rel=1e-3)
    assert l_b.compared["Exempt"] == pytest.approx(10 / omega_exempt, rel=1e-3)
    assert l_b.compared["RG1"] == pytest.approx(l_b.value)  # 0.011 rad field is filled by the source
    assert l_b.t_max_s == pytest.approx(1e6 / l_b.value, rel=1e-9)  # §4.3.3: t = 10^6 / L_B


def test_retinal_thermal_alpha_bounds(tmp_path):
    # A 1 mm source at 200 mm: α = 0.005 rad. Exempt/RG1 limits use α bounded to ≥ 0.011 rad, RG2 to
    # ≥ 0.0017 rad (IEC 62471:2006 Table 6.1): 28000/0.011 and 71000/0.005 W/(m2 sr).
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 600.0, 1.0), source_diameter_mm=1.0, no_emission_outside=True)
    l_r = a.hazards["L_R"]
    assert l_r.limits["Exempt"] == pytest.approx(28000 / 0.011)
    assert l_r.limits["RG2"] == pytest.approx(71000 / 0.005)
    assert l_r.alpha_rad == {"Exempt": pytest.approx(0.011), "RG1": pytest.approx(0.011), "RG2": pytest.approx(0.005)}


def test_weak_visual_stimulus_switches_to_l_ir(tmp_path):
    # An 850 nm-only source has luminance far below 10 cd/m2: L_IR (780-1400 nm) replaces L_R
    # (IEC 62471:2006 §4.3.6, Table 6.1); R(850) = 10^((700-850)/500) (Table 4.2).
    a = assess_arrays(
        tmp_path, GRID, triangle_line(GRID, 850.0, 5.0), source_diameter_mm=10.0, no_emission_outside=True
    )
    assert a.geometry.weak_visual_stimulus and "L_IR" in a.hazards and "L_R" not in a.hazards
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(10 / 400)))
    assert a.hazards["L_IR"].value == pytest.approx(5.0 * 10 ** (-150 / 500) / omega_s, rel=2e-3)
    assert a.hazards["L_IR"].limits["Exempt"] == pytest.approx(6000 / 0.05)


def test_ir_and_skin_thermal_t_max(tmp_path):
    # E_IR = 400 W/m2 (unweighted 780-3000 nm): t_max = (18000/400)^(4/3) s (§4.3.7); E_H over 380-3000 nm
    # is the same 400 W/m2 here: t_max = (20000/400)^(4/3) ≈ 184 s > 10 s, so no t_max within the
    # skin-thermal limit's range (§4.3.8: t < 10 s).
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 1500.0, 400.0), no_emission_outside=True)
    assert a.hazards["E_IR"].value == pytest.approx(400, rel=1e-6)
    assert a.hazards["E_IR"].t_max_s == pytest.approx((18000 / 400) ** (4 / 3), rel=1e-6)
    assert a.hazards["E_IR"].risk_group == "RG1"  # 100 < 400 ≤ 570
    assert a.hazards["E_H"].t_max_s is None and a.hazards["E_H"].risk_group is None
    hot = assess_arrays(tmp_path, GRID, triangle_line(GRID, 1500.0, 5000.0), name="hot", no_emission_outside=True)
    assert hot.hazards["E_H"].t_max_s == pytest.approx((20000 / 5000) ** (4 / 3), rel=1e-6)


@pytest.mark.parametrize(
    ("irradiance", "group"), [(0.999e-3, "Exempt"), (1.001e-3, "RG1"), (0.0299, "RG2"), (0.0301, "RG3")]
)
def test_group_boundaries_at_or_below(tmp_path, irradiance, group):
    # IEC 62471:2006 §6.1: a value at or below a group's limit is in that group; above RG2 is RG3
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 270.0, irradiance / 0.05, 0.05), no_emission_outside=True)
    assert a.hazards["E_S"].risk_group == group and a.risk_group == group


# --- geometry and distances --------------------------------------------------------------------------
def test_solid_angles():
    # Geometry (method §4): a 0.011 rad cone is 9.503e-5 sr ≈ πγ²/4; a small disc is ≈ π(D/2)²/d²;
    # a small rectangle ≈ w·h/d².
    assert cone_solid_angle_sr(0.011) == pytest.approx(math.pi * 0.011**2 / 4, rel=1e-5)
    disc = SourceShape(np.array([0.001]), np.array([np.nan]))
    assert disc.solid_angle_sr(1.0)[0] == pytest.approx(math.pi * 0.0005**2, rel=1e-6)
    rect = SourceShape(np.array([0.002]), np.array([0.001]))
    assert rect.solid_angle_sr(1.0)[0] == pytest.approx(2e-6, rel=1e-6)
    assert rect.alpha_rad(1.0)[0] == pytest.approx(0.0015)  # mean of the two angular dimensions


def test_inverse_square_scaling_to_200_mm(tmp_path):
    # Irradiance measured at 400 mm scales by (400/200)^2 = 4 to the 200 mm assessment distance
    # (IEC 62471:2006 §5.1.2; point-source law, method §4)
    a = assess_arrays(tmp_path, GRID, triangle_line(GRID, 1500.0, 10.0), distance_mm=400.0, no_emission_outside=True)
    assert a.assessment_distance_mm == 200
    assert a.hazards["E_IR"].value == pytest.approx(40, rel=1e-9)


def test_gls_distance_from_the_500_lx_rule(tmp_path):
    # GLS lamps: assessed where E_v = 500 lx, not nearer than 200 mm (IEC 62471:2006 §5.1.2). With E_v(d_m)
    # measured at 500 mm the inverse-square law puts 500 lx at d = 500 mm · sqrt(E_v(d_m)/500).
    wl = np.arange(380.0, 781.0, 1.0)
    values = np.exp(-0.5 * ((wl - 560) / 60) ** 2) * 0.02
    other = assess_arrays(tmp_path, wl, values, name="other", distance_mm=500.0, no_emission_outside=True)
    e_v_at_200 = other.illuminance_lx  # 'other' lamps are assessed at 200 mm
    e_v_at_500 = e_v_at_200 * (200 / 500) ** 2
    gls = assess_arrays(tmp_path, wl, values, name="gls", distance_mm=500.0, lamp_type="gls", no_emission_outside=True)
    assert gls.assessment_distance_mm == pytest.approx(500 * math.sqrt(e_v_at_500 / 500), rel=1e-9)
    assert gls.illuminance_lx == pytest.approx(500, rel=1e-9)
    dim = assess_arrays(
        tmp_path, wl, values / 1000, name="dim", distance_mm=500.0, lamp_type="gls", no_emission_outside=True
    )
    assert dim.assessment_distance_mm == 200  # under 500 lx even at 200 mm: the minimum applies


def test_radiance_input_gives_irradiance_by_source_solid_angle(tmp_path):
    # From radiance to irradiance: E = L·Ω_s (method §4). A 20 mm disc seen from 200 mm.
    import hazard

    path = tmp_path / "rad.csv"
    path.write_text(
        "wavelength_nm,value\n"
        + "".join(f"{w},{v}\n" for w, v in zip(GRID, triangle_line(GRID, 1500.0, 1000.0), strict=True))
    )
    a = hazard.assess(
        path,
        {
            "quantity": "radiance",
            "unit": "W/m2/sr/nm",
            "source_diameter_mm": 20.0,
            "no_emission_outside": True,
            "measurement_fov_mrad": 5.0,
        },
    )
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(20 / 400)))
    assert a.hazards["E_IR"].value == pytest.approx(1000 * omega_s, rel=1e-9)
