"""From a record to its spectrum file (hazard.inputs.loading): files not found, and spectra outside the folder of the
record or manifest."""

import pytest
from conftest import (
    MANIFEST_HEAD,
    write_lamp,
    write_toml,
)

import hazard
from hazard.errors import InputError

SIZE = {"distance_mm": 200.0, "source_diameter_mm": 5.0}


def test_spectrum_file_not_found(tmp_path):
    with pytest.raises(InputError, match=r"missing\.csv: file not found"):
        hazard.assess(tmp_path / "missing.csv", SIZE)
    write_toml(tmp_path / "record.toml", id="x", spectrum="nope.csv", distance_mm=200.0, source_diameter_mm=5.0)
    # the record's spectrum path is named as the record gives it (relative to the record's folder)
    with pytest.raises(InputError, match=r"^nope\.csv: spectrum file not found; fix: check the 'spectrum' path"):
        hazard.load_product(tmp_path / "record.toml")


# --- confinement: a manifest cannot reach outside its folder ---------------------------------------------------
def test_spectrum_paths_outside_the_manifest_folder_are_refused(tmp_path):
    from hazard.assessment.batch import run_batch

    secret = tmp_path / "secret"
    secret.mkdir()
    (secret / "s.csv").write_text("wavelength_nm,value\n400,SECRET-CONTENT\n")
    vendor = tmp_path / "vendor"
    vendor.mkdir()
    write_lamp(vendor)
    (vendor / "link.csv").symlink_to(secret / "s.csv")
    manifest = vendor / "m.csv"
    manifest.write_text(
        MANIFEST_HEAD + "A,lamp.csv,500,30,true\nB,../secret/s.csv,500,30,true\n"
        f"C,{secret / 's.csv'},500,30,true\nD,link.csv,500,30,true\nE,../secret/none.csv,500,30,true\n"
    )
    outcome = run_batch(manifest, tmp_path / "out")
    assert list(outcome.assessments) == ["A"]
    for product in "BCDE":
        assert "--allow-outside" in outcome.errors[product]
        assert "SECRET" not in outcome.errors[product] and "not found" not in outcome.errors[product]
    assert "SECRET" not in (tmp_path / "out" / "summary.csv").read_text()
    allowed = run_batch(manifest, tmp_path / "out2", allow_outside=True)
    assert "text 'SECRET-CONTENT'" in allowed.errors["B"]  # read only when the user allows it
