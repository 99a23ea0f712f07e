"""Classification at the edges of the method: top-down groups, t_max with the field of view of each duration,
partly filled fields of view, and results that cannot be misread (no group, what-if, units, saved results).

Spectra are assessed in memory (a validated spectrum and a record, the same path as a file) so that hypothesis
can try many sources; the CLI cases write files.
"""

import json
import math

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import gaussians, rank, triangle_line, write_spectrum
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from hazard.assessment.build import build_assessment
from hazard.assessment.pipeline import evaluate_loaded
from hazard.cli import main
from hazard.inputs.loading import LoadedProduct
from hazard.inputs.record import ProductRecord
from hazard.inputs.spectrum import validate_spectrum
from hazard.method.geometry import SourceShape, cone_rectangle_solid_angle, cone_solid_angle_sr
from hazard.standards import GROUPS

GRID = np.arange(200.0, 3000.5, 0.5)
"""Spans every hazard band (method §1) at 0.5 nm."""
SETTINGS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
ROUNDING = 0.03
"""IEC 62471:2006 Table 6.1 prints its limits to two digits (method §1, §3): a group and t_max agree within it."""


def _assess(values, **fields):
    """Assess an in-memory spectral irradiance on GRID (no studies)."""
    record = ProductRecord(id="p", spectrum="mem.csv", **{"distance_mm": 200.0, "no_emission_outside": True, **fields})
    spectrum = validate_spectrum(
        GRID, np.asarray(values, dtype=float), np.arange(GRID.size) + 2, "mem.csv", 1.0, "irradiance"
    )
    loaded = LoadedProduct(record=record, spectrum=spectrum, inputs={"mem.csv": "0" * 64}, metadata={})
    return build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=False)


def _top_down(compared, limits):
    """method §3, written out here: RG3 when the RG2 comparison fails, else RG2 when the RG1 one fails, else RG1
    when the Exempt one fails, else Exempt."""
    for boundary, above in (("RG2", "RG3"), ("RG1", "RG2"), ("Exempt", "RG1")):
        if compared[boundary] > limits[boundary]:
            return above
    return "Exempt"


def _group_from_t_max(t_max_s, bases, tolerance):
    """The group a t_max implies by the time bases of Table 6.1 (method §1: "a hazard is Exempt exactly when its
    t_max is null or at least the Exempt time base, RG1 when at least the RG1 base…")."""
    t = math.inf if t_max_s is None else t_max_s
    for boundary, above in (("RG2", "RG3"), ("RG1", "RG2"), ("Exempt", "RG1")):
        if t < bases[boundary] * (1 - tolerance):
            return above
    return "Exempt"


LINES = st.lists(
    st.tuples(st.floats(250.0, 2500.0), st.floats(2.0, 200.0), st.floats(-6.0, 2.0).map(lambda x: 10.0**x)),
    min_size=1,
    max_size=4,
)
"""Gaussian lines (centre nm, width nm, peak W/(m²·nm)) over eight decades."""
SHAPES = st.one_of(
    st.builds(lambda d: {"source_diameter_mm": d}, st.floats(-1.3, 2.0).map(lambda x: 10.0**x)),
    st.builds(
        lambda w, h: {"source_width_mm": w, "source_height_mm": h},
        st.floats(-1.3, 2.0).map(lambda x: 10.0**x),
        st.floats(-1.3, 2.0).map(lambda x: 10.0**x),
    ),
)
"""Discs and rectangles of 0.05-100 mm (the issue's range)."""


@SETTINGS
@given(
    lines=LINES,
    shape=SHAPES,
    distance_mm=st.sampled_from([50.0, 200.0, 700.0, 2000.0]),
    peak_to_mean=st.sampled_from([1.0, 1.0, 3.0]),
)
def test_groups_agree_with_their_values_limits_and_t_max(lines, shape, distance_mm, peak_to_mean):
    a = _assess(gaussians(GRID, lines), distance_mm=distance_mm, peak_to_mean_radiance=peak_to_mean, **shape)
    grouped = []
    for symbol, h in a.hazards.items():
        if h.risk_group is None:
            continue
        grouped.append(h.risk_group)
        # (a) the group is the top-down reading of its own compared values and limits (method §3); only a t_max
        # that reaches the limit before the group's time base may raise it, and the note then says so
        reading = _top_down(h.compared, h.limits)
        assert rank(h.risk_group) >= rank(reading), symbol
        if h.risk_group != reading:
            assert "raised" in h.note, (symbol, h.note)
        # (b) group and t_max agree with the time bases (IEC 62471:2006 Table 6.1; 3 % for its rounding): t_max
        # never implies a worse group; a worse group than t_max implies comes only from the table's rounding
        # (the value is within 3 % of the boundary below) or from L_IR, whose limit holds beyond 10 s, the time
        # base of its RG2 boundary (IEC 62471:2006 4.3.6)
        implied = _group_from_t_max(h.t_max_s, h.time_bases_s, ROUNDING)
        assert rank(implied) <= rank(h.risk_group), (symbol, h.t_max_s, h.risk_group)
        if rank(h.risk_group) > rank(_group_from_t_max(h.t_max_s, h.time_bases_s, -ROUNDING)):
            below = GROUPS[rank(h.risk_group) - 1]
            within_rounding = h.margins[below] <= 1 + ROUNDING
            weak_stimulus_step = symbol == "L_IR" and h.t_max_s is not None and h.t_max_s <= 10.0
            assert within_rounding or weak_stimulus_step, (symbol, h.t_max_s, h.risk_group, h.margins)
    # (c) the overall group is the highest (method §3), null when none was determined
    assert a.risk_group == (GROUPS[max(map(rank, grouped))] if grouped else None)


@SETTINGS
@given(lines=LINES, shape=SHAPES, scale=st.floats(1.0, 1e3))
def test_scaling_a_spectrum_up_never_lowers_a_group(lines, shape, scale):
    # (d) every compared value grows with the spectrum (non-negative weights, method §2); the limits depend on
    # the geometry only. The weak-visual-stimulus switch (10 cd/m2, IEC 62471:2006 4.3.6) is a documented
    # exception (tests/test_invariants.py), so the luminance class is held fixed.
    values = gaussians(GRID, lines)
    base, grown = _assess(values, **shape), _assess(values * scale, **shape)
    assume(base.geometry.weak_visual_stimulus == grown.geometry.weak_visual_stimulus)
    for symbol, h in base.hazards.items():
        assert rank(grown.hazards[symbol].risk_group) >= rank(h.risk_group), symbol
    assert rank(grown.risk_group) >= rank(base.risk_group)


def test_small_red_emitter_is_rg3_not_exempt():
    # A 0.1 mm red emitter at 200 mm (α = 0.5 mrad) delivering 150 W/m² R-weighted (R = 1 at 650 nm, IEC
    # 62471:2006 Table 4.2). Exempt test: 11 mrad field, α ≥ 11 mrad: 150/Ω(11 mrad) = 1.58e6 ≤ 28000/0.011
    # = 2.55e6. RG2 test: 1.7 mrad field, α ≥ 1.7 mrad: 150/Ω(1.7 mrad) = 6.6e7 > 71000/0.0017 = 4.2e7: RG3.
    a = _assess(triangle_line(GRID, 650.0, 150.0, 1.0), source_diameter_mm=0.1)
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
    a = _assess(triangle_line(GRID, 850.0, e_r / r_850, 1.0), source_diameter_mm=1.0)
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
    a = _assess(triangle_line(GRID, 437.5, e_b, 1.0), source_width_mm=0.1, source_height_mm=40.0)  # B = 1
    l_b = a.hazards["L_B"]
    radiance = l_b.value
    chord = 2 * math.sqrt(0.0055**2 - 0.00025**2)
    expected = radiance * 0.0005 * chord / cone_solid_angle_sr(0.011)
    assert l_b.compared["RG1"] == pytest.approx(expected, rel=0.01)
    assert radiance / l_b.compared["RG1"] > 15


def test_cone_rectangle_solid_angle_against_a_dense_sum():
    # An independent numeric integral: the solid angle of {x² + y² ≤ tan²θ} ∩ {|x| ≤ p, |y| ≤ q} in the plane at
    # unit distance, summing the solid-angle kernel 1/(1 + x² + y²)^{3/2} on a fine grid (definition of the solid
    # angle of a flat region seen from a point)
    for theta, p, q in ((0.0055, 0.0025, 3.0), (0.0055, 0.002, 0.004), (0.05, 0.03, 0.02), (0.05, 0.06, 0.01)):
        reach = math.tan(theta)
        x = np.linspace(-min(p, reach), min(p, reach), 4001)
        y = np.linspace(-min(q, reach), min(q, reach), 4001)
        xx, yy = np.meshgrid(x, y)
        kernel = (xx**2 + yy**2 <= reach**2) / (1 + xx**2 + yy**2) ** 1.5
        dense = np.trapezoid(np.trapezoid(kernel, y, axis=0), x)
        assert float(cone_rectangle_solid_angle(np.array(theta), np.array(p), np.array(q))) == pytest.approx(
            dense, rel=5e-5
        )  # the grid's staircase edge of the circle limits the sum's own accuracy


def test_long_strip_field_fraction_on_the_sphere():
    # A 1 × 1200 mm strip at 200 mm, 11 mrad field: a flat drawing of the strip with its area Ω_s narrows its
    # central width; on the sphere the cone holds 0.5581 of its area (independent review: exact integration and
    # Monte Carlo gave 0.5581)
    strip = SourceShape(np.array([0.001]), np.array([1.2]))
    assert float(strip.field_fraction(0.2, 0.011)[0]) == pytest.approx(0.5581, abs=1e-4)


def test_disc_sources_keep_e_over_the_larger_solid_angle():
    # method §4: for a uniform disc, the field average is E/max(Ω_s, Ω_γ), i.e. L·min(Ω_s, Ω_γ)/Ω_γ
    shape = SourceShape(np.array([0.001, 0.01]), np.array([np.nan, np.nan]))
    for fov in (0.0017, 0.011, 0.1):
        omega_s, omega_g = shape.solid_angle_sr(0.2), cone_solid_angle_sr(fov)
        np.testing.assert_allclose(shape.field_fraction(0.2, fov), np.minimum(omega_s, omega_g) / omega_g, rtol=1e-12)


def test_blue_light_just_over_11_mrad_does_not_read_exempt_beside_a_short_t_max():
    # A 2.4 mm source at 200 mm (α = 12 mrad: L_B) with E_B = 0.7 W/m². Exempt is judged with the 0.1 rad field:
    # 0.7/Ω(0.1 rad) = 89 ≤ 100. Its own radiance, 0.7/Ω_s ≈ 6.2e3, reaches 10⁶ J/(m²·sr) in 161 s, but over
    # 100 s the field grows as 1.1·√t mrad (IEC 62471:2006 4.3.3) and the dose E·t/Ω_γ stays below 10⁶ until
    # the 0.1 rad field: t = 10⁶·Ω(0.1 rad)/0.7 = 11200 s > 10⁴ s, so the limit is not reached.
    a = _assess(triangle_line(GRID, 437.5, 0.7, 1.0), source_diameter_mm=2.4)
    l_b = a.hazards["L_B"]
    assert l_b.risk_group == "Exempt" and l_b.t_max_s is None
    assert 1e6 / l_b.value < 200  # what the source's own radiance would have given


# --- outputs that cannot be misread ----------------------------------------------------------------------
VISIBLE = np.arange(380.0, 781.0, 1.0)


def _lamp(wl):
    return 1e-3 * np.exp(-0.5 * ((wl - 560.0) / 80.0) ** 2)


def test_nothing_assessable_has_no_group_anywhere(tmp_path, monkeypatch):
    # method §3: with no hazard that has risk groups assessed there is no group: null in JSON, "not determined"
    # in words, never "Exempt"
    write_spectrum(tmp_path / "vis.csv", VISIBLE, _lamp(VISIBLE))
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5"]
    as_json = CliRunner().invoke(main, ["assess", "vis.csv", *options, "--format", "json"])
    result = json.loads(as_json.stdout)
    assert result["risk_group"] is None and result["distances"] is None and result["remedies"] is None
    text = CliRunner().invoke(main, ["assess", "vis.csv", *options, "--pdf", "vis.pdf"]).stdout
    assert "NOT DETERMINED" in text and "Exempt" not in text.split("Overall risk group")[1].splitlines()[0]
    from pypdf import PdfReader

    first = " ".join(PdfReader(tmp_path / "vis.pdf").pages[0].extract_text().split())
    assert "not determined Overall risk group: Not determined" in first  # the tile, then its words
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
    assert rows[0]["what_if_risk_group"] == "Exempt" and rows[0]["what_if_distance_mm"] == "5000.0"


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


@pytest.mark.parametrize(
    ("header", "problem"),
    [
        ("E (furlongs/fortnight)", "a unit this tool does not read"),
        ("Counts", "not a calibrated spectral irradiance or radiance"),
        ("Irradiance (W/m2)", "a power per area without /nm"),
        ("Signal [%]", "not a calibrated spectral irradiance or radiance"),
    ],
)
def test_units_are_never_guessed(tmp_path, monkeypatch, header, problem):
    # method §5: units are converted, never guessed; a header that says something else is refused (exit 2) with
    # the file, the line and the fix, unless the record states the unit itself
    write_spectrum(tmp_path / "lamp.csv", VISIBLE, _lamp(VISIBLE), header=f"wavelength_nm,{header}")
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside"]
    refused = CliRunner().invoke(main, ["assess", "lamp.csv", *options])
    assert refused.exit_code == 2
    message = refused.stderr.strip()
    assert message.count("\n") == 0 and message.startswith("hazard: error: lamp.csv:1: the header cell says")
    assert problem in message and "state the unit in the record" in message
    stated = CliRunner().invoke(main, ["assess", "lamp.csv", *options, "--unit", "uW/cm2/nm", "--format", "json"])
    assert stated.exit_code == 0
    assert any(header in w for w in json.loads(stated.stdout)["warnings"])


def test_file_metadata_is_kept_and_a_contradicting_distance_is_named(tmp_path):
    import hazard

    path = tmp_path / "lamp.csv"
    path.write_text(
        "Instrument: a spectroradiometer\nDistance: 500 mm\nwavelength_nm,value\n"
        + "".join(f"{w},{v}\n" for w, v in zip(VISIBLE, _lamp(VISIBLE), strict=True))
    )
    a = hazard.assess(path, {"distance_mm": 200.0, "source_diameter_mm": 5.0, "no_emission_outside": True})
    assert a.spectrum.file_metadata == {"Instrument": "a spectroradiometer", "Distance": "500 mm"}
    assert any("states 500 mm" in w and "distance_mm is 200 mm" in w for w in a.warnings)


def test_report_refuses_a_result_whose_groups_do_not_follow_from_its_numbers(tmp_path, monkeypatch):
    write_spectrum(tmp_path / "uv.csv", GRID, triangle_line(GRID, 365.0, 150.0))  # E_UVA 150 W/m² > 100: RG3
    monkeypatch.chdir(tmp_path)
    options = ["--distance-mm", "200", "--source-diameter-mm", "5", "--no-emission-outside", "--format", "json"]
    CliRunner().invoke(main, ["assess", "uv.csv", *options, "--output", "uv.json"])
    result = json.loads((tmp_path / "uv.json").read_text())
    assert result["risk_group"] == "RG3"
    assert CliRunner().invoke(main, ["report", "uv.json", "--output", "uv.pdf"]).exit_code == 0
    edited = json.loads(json.dumps(result))
    for h in edited["hazards"].values():  # every group changed to Exempt, every value left as it was
        if h["risk_group"] is not None:
            h["risk_group"] = "Exempt"
    edited["risk_group"] = "Exempt"
    (tmp_path / "edited.json").write_text(json.dumps(edited))
    refused = CliRunner().invoke(main, ["report", "edited.json", "--output", "edited.pdf"])
    assert refused.exit_code == 2 and not (tmp_path / "edited.pdf").exists()
    assert "edited.json: the result was changed after it was made" in refused.stderr
    # the same edit with its SHA-256 recomputed: the groups still have to follow from the numbers; the first
    # hazard that disagrees is named (E_S: S_UV(365) = 1.1e-4, so 150 W/m² give E_S ≈ 0.017 W/m², RG2)
    from hazard.result import Assessment

    resealed = Assessment.model_validate(edited).sealed()
    (tmp_path / "resealed.json").write_text(resealed.model_dump_json())
    refused = CliRunner().invoke(main, ["report", "resealed.json", "--output", "resealed.pdf"])
    assert refused.exit_code == 2
    assert "hazard E_S says Exempt but the compared values and limits give RG2" in refused.stderr
    for change in (
        lambda r: r["hazards"].pop("E_S"),  # a family left out
        lambda r: r["hazards"]["E_S"].update(
            limits={
                k: v * 1000
                for k, v in r["hazards"]["E_S"]["limits"].items()  # limits not the set's
            }
        ),
        lambda r: r.update(cautions=[]),  # cautions emptied
        lambda r: r.update(assessment_distance_mm=20000.0),
    ):  # not the standard's
        tampered = json.loads(json.dumps(result))
        change(tampered)
        for h in tampered["hazards"].values():  # keep the margins consistent with the changed limits
            h["margins"] = {b: h["compared"][b] / h["limits"][b] for b in h["limits"]} if h["compared"] else {}
        (tmp_path / "t.json").write_text(Assessment.model_validate(tampered).sealed().model_dump_json())
        refused = CliRunner().invoke(main, ["report", "t.json", "--output", "t.pdf"])
        assert refused.exit_code == 2 and refused.stderr.count("\n") == 1, refused.stderr
    # one line of a batch's results.jsonl, by id
    (tmp_path / "results.jsonl").write_text(
        json.dumps(edited) + "\n" + Assessment.model_validate({**result, "id": "B"}).sealed().model_dump_json() + "\n"
    )
    assert CliRunner().invoke(main, ["report", "results.jsonl", "--id", "B", "--output", "b.pdf"]).exit_code == 0
    line = CliRunner().invoke(main, ["report", "results.jsonl", "--id", "uv", "--output", "c.pdf"])
    assert line.exit_code == 2 and "changed after it was made" in line.stderr


def test_margins_name_the_boundary_below_and_above(tmp_path):
    # method §3 "margins": a grow light 1.8× over its RG1 limit reads so, not only as a small share of RG2
    from hazard.output.formatting import format_margin

    assert format_margin("RG2", {"Exempt": 180.0, "RG1": 1.8, "RG2": 0.0045}) == "1.8× RG1 limit; 0.45 % of RG2 limit"
    assert "e+" not in format_margin("Exempt", {"Exempt": 0.99996, "RG1": 0.3, "RG2": 0.01})


def test_blue_light_transfer_only_for_mainly_visible_sources():
    # IEC TR 62778 transfer values are made for white-light sources: an IR emitter with a trace of visible light
    # gets none
    visible_trace = triangle_line(GRID, 555.0, 1e-4, 5.0)
    ir = _assess(triangle_line(GRID, 940.0, 5.0, 20.0) + visible_trace, source_diameter_mm=5.0)
    white = _assess(gaussians(GRID, [(450.0, 10.0, 0.5), (580.0, 60.0, 0.4)]), source_diameter_mm=5.0)
    assert ir.blue_light_transfer is None and white.blue_light_transfer is not None
