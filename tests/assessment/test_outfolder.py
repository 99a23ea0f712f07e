"""Where a batch writes (hazard.assessment.outfolder): never over the user's files, one run per folder, one file per
product."""

import csv
import json
import os

import pytest
from conftest import (
    assert_one_line,
    write_manifest,
)

from hazard.errors import InputError


def test_batch_refuses_the_input_folder_and_foreign_folders(tmp_path):
    from hazard.assessment.batch import run_batch

    manifest = write_manifest(tmp_path, ["A"])
    (tmp_path / "summary.csv").write_text("the user's own file\n")
    with pytest.raises(InputError) as caught:
        run_batch(manifest, tmp_path)
    assert_one_line(caught.value, "holds this run's input", "new sub-folder")
    assert (tmp_path / "summary.csv").read_text() == "the user's own file\n"
    elsewhere = tmp_path / "mine"
    elsewhere.mkdir()
    (elsewhere / "notes.txt").write_text("keep me\n")
    with pytest.raises(InputError) as caught:
        run_batch(manifest, elsewhere)
    assert_one_line(caught.value, "files that hazard did not write")
    assert run_batch(manifest, tmp_path / "new" / "out").exit_code == 0  # a new sub-folder is fine


def test_colliding_ids_get_files_of_their_own(tmp_path):
    from hazard.assessment.batch import run_batch

    ids = ["lamp 1", "lamp_1", "a/b", "a_b", "summary", "...", "product", "Desk", "desk"]
    manifest = write_manifest(tmp_path, [f'"{i}"' for i in ids])
    outcome = run_batch(manifest, tmp_path / "out", per_product_json=True)
    assert outcome.exit_code == 0
    files = sorted(p.name for p in (tmp_path / "out").glob("*.json") if p.name != "outputs.json")
    assert len(files) == len(ids) and "summary.json" not in files
    with open(tmp_path / "out" / "summary.csv", newline="", encoding="utf-8") as handle:
        stems = {row["id"].strip('"'): row["file_stem"] for row in csv.DictReader(handle)}
    assert sorted(f"{stems[i]}.json" for i in ids) == files
    for i in ids:
        assert json.loads((tmp_path / "out" / f"{stems[i]}.json").read_text())["id"] == i


def test_one_run_at_a_time_and_one_batch_per_folder(tmp_path):
    from hazard.assessment.batch import run_batch
    from hazard.assessment.outfolder import OutputFolder

    manifest = write_manifest(tmp_path, ["A"])
    out = tmp_path / "out"
    with OutputFolder(out, manifest, []):
        with pytest.raises(InputError) as caught:
            run_batch(manifest, out)
        assert_one_line(caught.value, "another hazard run is writing into this folder", f"process {os.getpid()}")
    assert run_batch(manifest, out).exit_code == 0
    other = tmp_path / "other.csv"
    other.write_text(manifest.read_text())
    with pytest.raises(InputError) as caught:
        run_batch(other, out)
    assert_one_line(caught.value, "outputs of another batch")
