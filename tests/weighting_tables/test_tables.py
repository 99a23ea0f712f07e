"""Weighting tables against the published values (fingerprints and spot values)."""

import hashlib
from importlib import resources

import numpy as np
import pytest

from hazard.weighting_tables import TABLE_NAMES, TableError, load_table


@pytest.mark.parametrize(
    ("name", "rows", "lo", "hi"),
    [
        ("s_uv", 54, 200, 400),  # IEC 62471:2006 Table 4.1: 200-400 nm, 54 tabulated points
        ("blue_light", 28, 300, 700),  # IEC 62471:2006 Table 4.2: B over 300-700 nm
        ("retinal_thermal", 31, 380, 1400),  # IEC 62471:2006 Table 4.2: R over 380-1400 nm
        ("v_photopic", 471, 360, 830),  # CIE 1924 V(λ), 360-830 nm at 1 nm (CIE S 010)
    ],
)
def test_fingerprint(name, rows, lo, hi):
    table = load_table(name)
    assert table.wavelength_nm.size == rows
    assert table.range_nm == (lo, hi)
    raw = (resources.files("hazard.weighting_tables") / f"{name}.csv").read_bytes()
    assert table.sha256 == hashlib.sha256(raw).hexdigest() == table.metadata["sha256"]
    assert table.metadata["source"] and table.metadata["interpolation"] in ("linear", "log-linear")


@pytest.mark.parametrize(
    ("name", "wavelength_nm", "expected"),
    [
        # IEC 62471:2006 Table 4.1 (ICNIRP 2004), printed to two or three significant digits
        ("s_uv", 200, 0.030),
        ("s_uv", 254, 0.5),
        ("s_uv", 270, 1.0),
        ("s_uv", 280, 0.88),
        ("s_uv", 300, 0.30),
        ("s_uv", 305, 0.06),
        ("s_uv", 313, 0.006),
        ("s_uv", 320, 0.0010),
        ("s_uv", 350, 0.0002),
        ("s_uv", 400, 3.0e-5),
        # IEC 62471:2006 Table 4.2 (ICNIRP 1997): B(λ)
        ("blue_light", 300, 0.01),
        ("blue_light", 380, 0.01),
        ("blue_light", 400, 0.10),
        ("blue_light", 435, 1.0),
        ("blue_light", 440, 1.0),
        ("blue_light", 450, 0.94),
        ("blue_light", 480, 0.45),
        ("blue_light", 500, 0.10),
        ("blue_light", 550, 10 ** ((450 - 550) / 50)),
        ("blue_light", 600, 0.001),
        ("blue_light", 650, 0.001),
        ("blue_light", 700, 0.001),
        # IEC 62471:2006 Table 4.2: R(λ)
        ("retinal_thermal", 380, 0.1),
        ("retinal_thermal", 440, 10.0),
        ("retinal_thermal", 450, 9.4),
        ("retinal_thermal", 500, 1.0),
        ("retinal_thermal", 600, 1.0),
        ("retinal_thermal", 700, 1.0),
        ("retinal_thermal", 800, 10 ** ((700 - 800) / 500)),
        ("retinal_thermal", 1000, 10 ** ((700 - 1000) / 500)),
        ("retinal_thermal", 1100, 0.2),
        ("retinal_thermal", 1175, 0.2 * 10 ** (0.02 * (1150 - 1175))),
        ("retinal_thermal", 1300, 0.02),
        ("retinal_thermal", 1400, 0.02),
    ],
)
def test_spot_values(name, wavelength_nm, expected):
    assert load_table(name).at(wavelength_nm) == pytest.approx(expected, rel=1e-9)


def test_retinal_thermal_is_ten_times_blue_light_below_500_nm():
    # IEC 62471:2006 Table 4.2: R(λ) = 10·B(λ) for 380-500 nm (both tabulated at 5 nm)
    wl = np.arange(380.0, 500.0, 5.0)
    np.testing.assert_allclose(load_table("retinal_thermal").at(wl), 10 * load_table("blue_light").at(wl))


def test_formula_segments_are_exact_between_points():
    # IEC 62471:2006 Table 4.2 formulas, between the stored points (end points stored to 12 digits)
    wl = np.array([512.3, 577.7, 599.9])
    np.testing.assert_allclose(load_table("blue_light").at(wl), 10 ** ((450 - wl) / 50), rtol=1e-10)
    wl = np.array([703.1, 850.0, 1048.5])
    np.testing.assert_allclose(load_table("retinal_thermal").at(wl), 10 ** ((700 - wl) / 500), rtol=1e-10)


def test_s_uv_one_nanometre_values_between_points():
    # Directive 2006/25/EC Annex I Table 1.2 lists S(λ) per nm; log-linear interpolation of Table 4.1 lies
    # within about 0.5 % of it (method §2). From memory: S(271) ≈ 0.99, S(262) ≈ 0.72.
    table = load_table("s_uv")
    assert table.at(271) == pytest.approx(0.99, rel=0.01)
    assert table.at(262) == pytest.approx(0.72, rel=0.02)


def test_weights_are_zero_outside_their_tables():
    # method §2: outside its band a weight is zero
    assert load_table("s_uv").at(199.9) == 0 and load_table("s_uv").at(400.1) == 0
    assert load_table("blue_light").at(700.5) == 0 and load_table("retinal_thermal").at(1400.5) == 0


def test_v_lambda_matches_colour_science(colour):
    # CIE 1924 photopic V(λ) as distributed by colour-science (a reference library)
    reference = colour.colorimetry.SDS_LEFS_PHOTOPIC["CIE 1924 Photopic Standard Observer"]
    table = load_table("v_photopic")
    np.testing.assert_allclose(table.value, reference.values, rtol=1e-12)
    assert table.at(555) == pytest.approx(1.0)  # CIE 1924: V(555 nm) = 1


def test_every_table_loads_and_is_listed():
    assert {load_table(n).name for n in TABLE_NAMES} == set(TABLE_NAMES)


def test_edited_table_is_refused(tmp_path, monkeypatch):
    # A table whose bytes no longer match its recorded SHA-256 is refused (style.md habit 1)
    import hazard.weighting_tables

    folder = tmp_path / "weighting_tables"
    folder.mkdir()
    for name in TABLE_NAMES:
        for suffix in (".csv", ".toml"):
            src = resources.files("hazard.weighting_tables") / f"{name}{suffix}"
            (folder / f"{name}{suffix}").write_bytes(src.read_bytes())
    csv = folder / "s_uv.csv"
    csv.write_text(csv.read_text().replace("270.0,1.0", "270.0,1.1"))
    monkeypatch.setattr(hazard.weighting_tables.resources, "files", lambda _: folder)
    hazard.weighting_tables.load_table.cache_clear()
    try:
        with pytest.raises(TableError, match="SHA-256"):
            hazard.weighting_tables.load_table("s_uv")
    finally:
        monkeypatch.undo()
        hazard.weighting_tables.load_table.cache_clear()
