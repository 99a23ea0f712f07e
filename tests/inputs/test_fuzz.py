"""Mutation fuzzing of every reader, of TOML records and of manifests: whatever the bytes, the tool gives a
result that reads back or one input error of one line, and ends.

Contract: hazard/cli.py and DEVELOPERS.md ("bad input: one line, exit 2; exit 1 only for defects"). The
number of examples is small and fixed (derandomized) so that the suite stays fast; set HAZARD_FUZZ_EXAMPLES
for a longer run, or run ``python benchmarks/torture.py`` for the full campaign (10⁴ and more per reader).
"""

import os
import shutil
import signal
from pathlib import Path

import pytest
from conftest import DATA, LINEUP
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from mutations import exercise, mutate, mutate_workbook

EXAMPLES = int(os.environ.get("HAZARD_FUZZ_EXAMPLES", "12"))
TIME_BOUND_S = 20
"""A hang detector, not a speed target: the slowest legitimate example takes well under a second."""
SPECTRUM_SEEDS = sorted(p.name for p in DATA.iterdir() if p.suffix in (".csv", ".tsv", ".txt", ".json", ".xlsx"))

FUZZ = settings(
    max_examples=EXAMPLES,
    deadline=None,
    derandomize=True,
    database=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)


def _bounded_exercise(path: Path, kind: str) -> tuple[str, str]:
    def expire(*_):
        raise TimeoutError(f"{path.name}: still running after {TIME_BOUND_S} s")

    previous = signal.signal(signal.SIGALRM, expire)
    signal.setitimer(signal.ITIMER_REAL, TIME_BOUND_S)
    try:
        return exercise(path, kind)
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def _check(outcome: tuple[str, str]) -> None:
    kind, detail = outcome
    assert kind in ("ok", "input error"), f"{kind}: {detail}"


@pytest.fixture(scope="module")
def workspace(tmp_path_factory):
    """A folder with the lineup's spectra (for records and manifests) and the seed files."""
    folder = tmp_path_factory.mktemp("fuzz")
    for path in LINEUP.glob("cl-desk-30.*"):
        shutil.copy(path, folder / path.name)
    return folder


@FUZZ
@given(seed=st.sampled_from(SPECTRUM_SEEDS), rng=st.randoms(use_true_random=False))
def test_mutated_spectrum_files(workspace, seed, rng):
    data = (DATA / seed).read_bytes()
    path = workspace / f"spectrum{Path(seed).suffix}"
    path.write_bytes(mutate_workbook(data, rng) if seed.endswith(".xlsx") else mutate(data, rng))
    _check(_bounded_exercise(path, "spectrum"))


@FUZZ
@given(rng=st.randoms(use_true_random=False))
def test_mutated_records(workspace, rng):
    path = workspace / "record.toml"
    path.write_bytes(mutate((LINEUP / "cl-desk-30.toml").read_bytes(), rng))
    _check(_bounded_exercise(path, "record"))


MANIFEST = (
    b"id,spectrum,distance_mm,source_diameter_mm,lamp_type,no_emission_outside,column,unit\n"
    b"A,cl-desk-30.csv,500,30,gls,true,,W/m2/nm\nB,cl-desk-30.csv,200,5,other,false,1,\n"
)


@FUZZ
@given(rng=st.randoms(use_true_random=False), workbook=st.booleans())
def test_mutated_manifests(workspace, rng, workbook):
    if workbook:
        import io

        import openpyxl

        book = openpyxl.Workbook()
        for line in MANIFEST.decode().splitlines():
            book.active.append([c or None for c in line.split(",")])
        buffer = io.BytesIO()
        book.save(buffer)
        path = workspace / "manifest.xlsx"
        path.write_bytes(mutate_workbook(buffer.getvalue(), rng))
    else:
        path = workspace / "manifest.csv"
        path.write_bytes(mutate(MANIFEST, rng))
    _check(_bounded_exercise(path, "manifest"))
