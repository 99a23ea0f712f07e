"""The method on arrays (hazard.method.evaluate), checked by hand: the values, limits and t_max of narrow lines, fields
of view a source fills partly, the assessment distance (inverse square, the 500 lx rule of GLS lamps) and the
switches between hazards."""

import math

import numpy as np
import pytest
from conftest import assess_spectrum, gaussians, log_uniform, rank, triangle_line
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from hazard.method.geometry import cone_solid_angle_sr

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


GRID_HALF_NM = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""

FAST = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])

GRID_1_NM = np.arange(200.0, 3000.5, 1.0)
"""200–3000 nm at 1 nm: spans every hazard band (method §1), so coverage never decides."""

LINES = st.lists(
    st.tuples(st.floats(200.0, 3000.0), st.floats(1.0, 300.0), log_uniform(1e-6, 10.0)), min_size=1, max_size=4
)
"""Gaussian lines anywhere in 200–3000 nm, narrow (1 nm) to broad, over seven decades [nm, nm, W m⁻² nm⁻¹]."""

GRID_FINE_TO_500 = np.concatenate([np.arange(200.0, 500.0, 0.01), np.arange(500.0, 3000.5, 0.5)])


# --- narrow lines: weight × irradiance, and t_max -------------------------------------------------------
def test_actinic_line_gives_weight_times_irradiance_and_t_max():
    # A 270 nm line of 0.01 W/m2: S_UV(270) = 1.0 (IEC 62471:2006 Table 4.1), so E_S = 0.01 W/m2,
    # t_max = 30/E_S = 3000 s (IEC 62471:2006 §4.3.1), group RG2 (0.003 < 0.01 ≤ 0.03, Table 6.1).
    a = assess_spectrum(GRID, triangle_line(GRID, 270.0, 0.01 / 0.05, 0.05), no_emission_outside=True)
    e_s = a.hazards["E_S"]
    assert e_s.value == pytest.approx(0.01, rel=1e-3)
    assert e_s.t_max_s == pytest.approx(3000, rel=1e-3)
    assert e_s.risk_group == "RG2"


def test_254_nm_line():
    # S_UV(254) = 0.5 (IEC 62471:2006 Table 4.1): a 0.002 W/m2 line at 254 nm gives E_S = 0.001 W/m2
    a = assess_spectrum(GRID, triangle_line(GRID, 254.0, 0.002 / 0.05, 0.05), no_emission_outside=True)
    assert a.hazards["E_S"].value == pytest.approx(0.001, rel=1e-3)


def test_blue_line_small_source_e_b_and_t_max():
    # B = 1.0 over 435-440 nm (Table 4.2): a line at 437.5 nm sits on that plateau. A 2 mm source at 200 mm
    # has α = 0.01 rad < 0.011: E_B applies (Table 6.1). E_B = 2 W/m2 → t_max = 100/E_B = 50 s (§4.3.4);
    # 1 < 2 ≤ 400 → RG2.
    a = assess_spectrum(GRID, triangle_line(GRID, 437.5, 2.0), source_diameter_mm=2.0, no_emission_outside=True)
    assert "E_B" in a.hazards and "L_B" not in a.hazards
    assert a.hazards["E_B"].value == pytest.approx(2.0, rel=1e-9)
    assert a.hazards["E_B"].t_max_s == pytest.approx(50, rel=1e-3)
    assert a.hazards["E_B"].risk_group == "RG2"


def test_blue_line_large_source_l_b_with_fov_averaging():
    # A 10 mm disc at 200 mm: α = 0.05 rad ≥ 0.011, so L_B applies. Source radiance L = E_B/Ω_s with
    # Ω_s = 2π(1 − cos(atan(D/2d))) (method §4); at the Exempt boundary the 0.1 rad field is larger than the
    # source, so the compared radiance is E_B/Ω(0.1 rad) (IEC 62471:2006 Table 6.1 fields of view).
    a = assess_spectrum(
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


def test_retinal_thermal_alpha_bounds():
    # A 1 mm source at 200 mm: α = 0.005 rad. Exempt/RG1 limits use α bounded to ≥ 0.011 rad, RG2 to
    # ≥ 0.0017 rad (IEC 62471:2006 Table 6.1): 28000/0.011 and 71000/0.005 W/(m2 sr).
    a = assess_spectrum(GRID, triangle_line(GRID, 600.0, 1.0), source_diameter_mm=1.0, no_emission_outside=True)
    l_r = a.hazards["L_R"]
    assert l_r.limits["Exempt"] == pytest.approx(28000 / 0.011)
    assert l_r.limits["RG2"] == pytest.approx(71000 / 0.005)
    assert l_r.alpha_rad == {"Exempt": pytest.approx(0.011), "RG1": pytest.approx(0.011), "RG2": pytest.approx(0.005)}


def test_weak_visual_stimulus_switches_to_l_ir():
    # An 850 nm-only source has luminance far below 10 cd/m2: L_IR (780-1400 nm) replaces L_R
    # (IEC 62471:2006 §4.3.6, Table 6.1); R(850) = 10^((700-850)/500) (Table 4.2).
    a = assess_spectrum(GRID, triangle_line(GRID, 850.0, 5.0), source_diameter_mm=10.0, no_emission_outside=True)
    assert a.geometry.weak_visual_stimulus and "L_IR" in a.hazards and "L_R" not in a.hazards
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(10 / 400)))
    assert a.hazards["L_IR"].value == pytest.approx(5.0 * 10 ** (-150 / 500) / omega_s, rel=2e-3)
    assert a.hazards["L_IR"].limits["Exempt"] == pytest.approx(6000 / 0.05)


def test_ir_and_skin_thermal_t_max():
    # E_IR = 400 W/m2 (unweighted 780-3000 nm): t_max = (18000/400)^(4/3) s (§4.3.7); E_H over 380-3000 nm
    # is the same 400 W/m2 here: t_max = (20000/400)^(4/3) ≈ 184 s > 10 s, so no t_max within the
    # skin-thermal limit's range (§4.3.8: t < 10 s).
    a = assess_spectrum(GRID, triangle_line(GRID, 1500.0, 400.0), no_emission_outside=True)
    assert a.hazards["E_IR"].value == pytest.approx(400, rel=1e-6)
    assert a.hazards["E_IR"].t_max_s == pytest.approx((18000 / 400) ** (4 / 3), rel=1e-6)
    assert a.hazards["E_IR"].risk_group == "RG1"  # 100 < 400 ≤ 570
    assert a.hazards["E_H"].t_max_s is None and a.hazards["E_H"].risk_group is None
    hot = assess_spectrum(GRID, triangle_line(GRID, 1500.0, 5000.0), no_emission_outside=True)
    assert hot.hazards["E_H"].t_max_s == pytest.approx((20000 / 5000) ** (4 / 3), rel=1e-6)


def test_inverse_square_scaling_to_200_mm():
    # Irradiance measured at 400 mm scales by (400/200)^2 = 4 to the 200 mm assessment distance
    # (IEC 62471:2006 §5.1.2; point-source law, method §4)
    a = assess_spectrum(GRID, triangle_line(GRID, 1500.0, 10.0), distance_mm=400.0, no_emission_outside=True)
    assert a.assessment_distance_mm == 200
    assert a.hazards["E_IR"].value == pytest.approx(40, rel=1e-9)


def test_gls_distance_from_the_500_lx_rule():
    # GLS lamps: assessed where E_v = 500 lx, not nearer than 200 mm (IEC 62471:2006 §5.1.2). With E_v(d_m)
    # measured at 500 mm the inverse-square law puts 500 lx at d = 500 mm · sqrt(E_v(d_m)/500).
    wl = np.arange(380.0, 781.0, 1.0)
    values = np.exp(-0.5 * ((wl - 560) / 60) ** 2) * 0.02
    other = assess_spectrum(wl, values, distance_mm=500.0, no_emission_outside=True)
    e_v_at_200 = other.illuminance_lx  # 'other' lamps are assessed at 200 mm
    e_v_at_500 = e_v_at_200 * (200 / 500) ** 2
    gls = assess_spectrum(wl, values, distance_mm=500.0, lamp_type="gls", no_emission_outside=True)
    assert gls.assessment_distance_mm == pytest.approx(500 * math.sqrt(e_v_at_500 / 500), rel=1e-9)
    assert gls.illuminance_lx == pytest.approx(500, rel=1e-9)
    dim = assess_spectrum(wl, values / 1000, distance_mm=500.0, lamp_type="gls", no_emission_outside=True)
    assert dim.assessment_distance_mm == 200  # under 500 lx even at 200 mm: the minimum applies


def test_radiance_input_gives_irradiance_by_source_solid_angle():
    # From radiance to irradiance: E = L·Ω_s (method §4). A 20 mm disc seen from 200 mm.
    a = assess_spectrum(
        GRID,
        triangle_line(GRID, 1500.0, 1000.0),
        quantity="radiance",
        unit="W/m2/sr/nm",
        distance_mm=None,  # a radiance needs no measurement distance
        source_diameter_mm=20.0,
        no_emission_outside=True,
    )
    omega_s = 2 * math.pi * (1 - math.cos(math.atan(20 / 400)))
    assert a.hazards["E_IR"].value == pytest.approx(1000 * omega_s, rel=1e-9)


def _assess(values, **fields):
    """An irradiance on GRID_HALF_NM assessed in memory at 200 mm, nothing emitted outside it (no studies)."""
    return assess_spectrum(GRID_HALF_NM, values, **{"no_emission_outside": True, "source_diameter_mm": None, **fields})


def test_small_red_emitter_is_rg3_not_exempt():
    # A 0.1 mm red emitter at 200 mm (α = 0.5 mrad) delivering 150 W/m² R-weighted (R = 1 at 650 nm, IEC
    # 62471:2006 Table 4.2). Exempt test: 11 mrad field, α ≥ 11 mrad: 150/Ω(11 mrad) = 1.58e6 ≤ 28000/0.011
    # = 2.55e6. RG2 test: 1.7 mrad field, α ≥ 1.7 mrad: 150/Ω(1.7 mrad) = 6.6e7 > 71000/0.0017 = 4.2e7: RG3.
    a = _assess(triangle_line(GRID_HALF_NM, 650.0, 150.0, 1.0), source_diameter_mm=0.1)
    l_r = a.hazards["L_R"]
    assert l_r.compared["RG2"] == pytest.approx(150 / cone_solid_angle_sr(0.0017), rel=1e-3)
    assert l_r.compared["Exempt"] <= l_r.limits["Exempt"] and l_r.compared["RG2"] > l_r.limits["RG2"]
    assert l_r.risk_group == "RG3" and a.risk_group == "RG3"
    # §4.3.5 with the 1.7 mrad field up to 0.25 s: t = (50000 / (0.0017 · L_1.7))^4, below the RG2 base 0.25 s
    assert l_r.t_max_s == pytest.approx((50000 / (0.0017 * l_r.compared["RG2"])) ** 4, rel=1e-6)
    assert l_r.t_max_s < 0.25


@pytest.mark.parametrize(("e_r", "group"), [(40.0, "Exempt"), (60.0, "RG3")])
def test_ir_emitter_against_6000_over_alpha_at_11_mrad(e_r, group):
    # An 850 nm emitter of 1 mm at 200 mm (α = 5 mrad, bounded to 11 mrad) is a weak visual stimulus: L_IR with
    # γ = 11 mrad and α ≥ 11 mrad at every boundary (method §3). Limit 6000/0.011 = 5.45e5 W/(m²·sr); the
    # field average is E_R/Ω(11 mrad): E_R = 40 W/m² gives 4.2e5 (Exempt), 60 W/m² gives 6.3e5 (RG3).
    r_850 = 10 ** ((700 - 850) / 500)  # IEC 62471:2006 Table 4.2
    a = _assess(triangle_line(GRID_HALF_NM, 850.0, e_r / r_850, 1.0), source_diameter_mm=1.0)
    l_ir = a.hazards["L_IR"]
    assert a.geometry.weak_visual_stimulus
    assert l_ir.fov_rad == {"Exempt": 0.011, "RG1": 0.011, "RG2": 0.011}
    assert l_ir.alpha_rad == {"Exempt": pytest.approx(0.011), "RG1": pytest.approx(0.011), "RG2": pytest.approx(0.011)}
    assert l_ir.compared["RG2"] == pytest.approx(e_r / cone_solid_angle_sr(0.011), rel=1e-3)
    assert l_ir.risk_group == group
    if group == "Exempt":
        assert l_ir.t_max_s is None
    else:  # exceeded by any exposure beyond 10 s (IEC 62471:2006 4.3.6); below 28000/α, so not before 10 s
        assert l_ir.t_max_s == pytest.approx(10.0) and "longer than 10 s" in l_ir.note


def test_thin_strip_fills_the_field_only_along_its_length():
    # A 0.1 × 40 mm strip at 200 mm: 0.5 × 200 mrad. The 11 mrad cone holds a 0.5 mrad wide band of it, so the
    # average is L × (width × chord) / Ω_γ (method §4), chord = 2·√(5.5² − 0.25²) mrad; E/max(Ω_s, Ω_γ) would
    # give the full radiance L, 17× more.
    e_b = 2.0
    a = _assess(triangle_line(GRID_HALF_NM, 437.5, e_b, 1.0), source_width_mm=0.1, source_height_mm=40.0)  # B = 1
    l_b = a.hazards["L_B"]
    radiance = l_b.value
    chord = 2 * math.sqrt(0.0055**2 - 0.00025**2)
    expected = radiance * 0.0005 * chord / cone_solid_angle_sr(0.011)
    assert l_b.compared["RG1"] == pytest.approx(expected, rel=0.01)
    assert radiance / l_b.compared["RG1"] > 15


def test_blue_light_just_over_11_mrad_does_not_read_exempt_beside_a_short_t_max():
    # A 2.4 mm source at 200 mm (α = 12 mrad: L_B) with E_B = 0.7 W/m². Exempt is judged with the 0.1 rad field:
    # 0.7/Ω(0.1 rad) = 89 ≤ 100. Its own radiance, 0.7/Ω_s ≈ 6.2e3, reaches 10⁶ J/(m²·sr) in 161 s, but over
    # 100 s the field grows as 1.1·√t mrad (IEC 62471:2006 4.3.3) and the dose E·t/Ω_γ stays below 10⁶ until
    # the 0.1 rad field: t = 10⁶·Ω(0.1 rad)/0.7 = 11200 s > 10⁴ s, so the limit is not reached.
    a = _assess(triangle_line(GRID_HALF_NM, 437.5, 0.7, 1.0), source_diameter_mm=2.4)
    l_b = a.hazards["L_B"]
    assert l_b.risk_group == "Exempt" and l_b.t_max_s is None
    assert 1e6 / l_b.value < 200  # what the source's own radiance would have given


@FAST
@given(first=LINES, added=LINES, diameter_mm=st.floats(0.5, 30.0))
def test_gls_distance_never_shrinks_when_the_spectrum_grows(first, added, diameter_mm):
    """GLS lamps are assessed where they give 500 lx, not nearer than 200 mm (IEC 62471:2006 §5.1.2; method
    §4). More light moves that point further away, which lowers the irradiance there, so the group of a GLS
    lamp may legitimately improve as its spectrum grows (next test); what must hold is the distance rule."""
    a = gaussians(GRID_1_NM, first)
    b = gaussians(GRID_1_NM, added)
    fields = {"source_diameter_mm": diameter_mm, "distance_mm": 500.0, "lamp_type": "gls"}
    base = assess_spectrum(GRID_1_NM, a, **fields)
    grown = assess_spectrum(GRID_1_NM, a + b, **fields)
    assert grown.assessment_distance_mm >= base.assessment_distance_mm * (1 - 1e-12)
    for result in (base, grown):
        assert result.assessment_distance_mm >= 200.0  # not nearer than 200 mm
        if result.assessment_distance_mm > 200.0:
            assert result.illuminance_lx == pytest.approx(500.0, rel=1e-9)  # the 500 lx point
        else:
            assert result.illuminance_lx <= 500.0 * (1 + 1e-9)  # under 500 lx even at 200 mm


def test_gls_group_can_improve_when_the_spectrum_grows():
    uv = gaussians(GRID_1_NM, [(300.0, 15.0, 1e-4)])
    light = gaussians(GRID_1_NM, [(555.0, 30.0, 1.0)])  # no UV to speak of: its 300 nm tail is e^-36
    fields = {"source_diameter_mm": 10.0, "distance_mm": 200.0, "lamp_type": "gls"}
    base = assess_spectrum(GRID_1_NM, uv, **fields)
    grown = assess_spectrum(GRID_1_NM, uv + light, **fields)
    assert base.assessment_distance_mm == 200.0 and grown.assessment_distance_mm > 1000.0
    # the UV irradiance falls by the inverse-square law to the farther 500 lx point (method §4)
    ratio = (base.assessment_distance_mm / grown.assessment_distance_mm) ** 2
    assert grown.hazards["E_S"].value == pytest.approx(base.hazards["E_S"].value * ratio, rel=1e-6)
    assert base.hazards["E_S"].value > 0.001  # above the Exempt limit at 200 mm (Table 6.1)
    assert grown.risk_group is not None and rank(grown.risk_group) < rank(base.risk_group)


def _illuminant(colour, name):
    sd = colour.SDS_ILLUMINANTS[name]
    return np.asarray(sd.wavelengths, dtype=float), np.asarray(sd.values, dtype=float)


def test_led_b_series_is_not_uv_or_ir_hazardous_at_office_levels(colour):
    # A white LED spectrum (CIE 15:2018 LED-B1..B5) scaled to 500 lx at 200 mm has no UV or IR emission in
    # its data, so E_S, E_UVA and E_IR are far below Exempt (IEC 62471:2006 Table 6.1), and its blue-light
    # hazard ratio K_B,v = L_B/L_v lies in the range reported for white LEDs, 0.2-1.2 mW/lm
    # (IEC TR 62778:2014 Annex C, from memory).
    for name in ("LED-B1", "LED-B3", "LED-B5"):
        wl, values = _illuminant(colour, name)
        probe = assess_spectrum(wl, values, no_emission_outside=True, source_diameter_mm=20.0)
        scaled = values * 500 / probe.illuminance_lx
        a = assess_spectrum(wl, scaled, no_emission_outside=True, source_diameter_mm=20.0)
        assert a.illuminance_lx == pytest.approx(500)
        for symbol in ("E_S", "E_UVA", "E_IR"):
            assert a.hazards[symbol].risk_group == "Exempt"
        k_bv = a.hazards["L_B"].value / a.photometry.luminance_cd_m2
        assert 0.2e-3 < k_bv < 1.2e-3


def test_peak_to_mean_multiplies_radiance_in_small_fields():
    # method §4: a non-uniform source exceeds the average radiance E/Ω_s; the record's peak-to-mean ratio
    # multiplies the radiance seen by fields of view smaller than the source (project design, issue 6).
    values = triangle_line(GRID_FINE_TO_500, 437.5, 5.0)
    uniform = assess_spectrum(GRID_FINE_TO_500, values, source_diameter_mm=15.0, no_emission_outside=True)
    hot = assess_spectrum(
        GRID_FINE_TO_500,
        values,
        source_diameter_mm=15.0,
        no_emission_outside=True,
        peak_to_mean_radiance=3.0,
    )
    u, h = uniform.hazards["L_B"], hot.hazards["L_B"]
    assert h.value == pytest.approx(3 * u.value)
    for group in ("RG1", "RG2"):  # 0.011 and 0.0017 rad fields are inside a 15 mm source at 200 mm (α = 0.075)
        assert h.compared[group] == pytest.approx(3 * u.compared[group])
    assert h.compared["Exempt"] == pytest.approx(u.compared["Exempt"])  # the 0.1 rad field is wider than it
    assert h.t_max_s == pytest.approx(u.t_max_s / 3)  # §4.3.3: t = 10^6 / L_B


@pytest.mark.parametrize(("fov_mrad", "fill"), [(1.0, 1.0), (100.0, None)])
def test_radiance_read_over_a_field_wider_than_the_source(fov_mrad, fill):
    # method §4: a field γ wider than the source averages it, L_γ = E/max(Ω_s, Ω_γ); read backwards, a meter
    # with a 100 mrad field on a 1 mm disc at 200 mm (5 mrad) reads the source's radiance × Ω_s/Ω_fov, so the
    # source's own radiance is the reading × Ω_fov/Ω_s (about 400), and E = reading × Ω_fov. A 1 mrad field
    # is filled by the source and reads its radiance.
    from hazard.method.geometry import SourceShape

    reading = 1000.0  # L_B read by the meter [W/(m²·sr)], B = 1 at 437.5 nm (IEC 62471:2006 Table 4.2)
    a = _assess(
        triangle_line(GRID_HALF_NM, 437.5, reading, 1.0),
        quantity="radiance",
        distance_mm=200.0,
        source_diameter_mm=1.0,
        measurement_fov_mrad=fov_mrad,
    )
    omega_s = float(SourceShape(np.array([1e-3]), np.array([np.nan])).solid_angle_sr(0.2)[0])
    expected_fill = fill if fill is not None else float(cone_solid_angle_sr(fov_mrad * 1e-3)) / omega_s
    assert expected_fill == pytest.approx(400.0, rel=1e-3) or fill == 1.0
    assert a.hazards["L_R"].value == pytest.approx(10 * reading * expected_fill, rel=2e-3)  # R = 10·B
    # the 5 mrad source is small (α < 11 mrad): E_B = L·Ω_s at 200 mm
    assert a.hazards["E_B"].value == pytest.approx(reading * expected_fill * omega_s, rel=2e-3)
    # E_B = 1000 × Ω_s = 0.0196 W/m² read as it is (Exempt), 7.85 W/m² corrected: over 1, under 400 (Table 6.1)
    assert a.risk_group == ("Exempt" if fill == 1.0 else "RG2")
    assert any("wider than the source" in s for s in a.assumptions) == (fill is None)
