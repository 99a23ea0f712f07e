"""Shared test helpers and the folders the tests read from (the same at any depth of tests/).

Test modules import the helpers with ``from conftest import …`` (tests/ is on the path, see pyproject.toml).
"""

import contextlib
import datetime
import hashlib
import io
import math
import os
import re
import shutil
import signal
import subprocess
import sys
import zipfile
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner
from hypothesis import strategies as st

from hazard.method.photometry import import_colour
from hazard.standards import GROUPS

# Test modules import this file a second time as plain ``conftest``: rewrite that copy's asserts too.
pytest.register_assert_rewrite("conftest")

REPO = Path(__file__).resolve().parents[1]
"""The repository's root folder."""
DATA = REPO / "tests" / "data"
"""The export corpus: one invented spectrum in ten dialects (tests/data)."""
LINEUP = REPO / "examples" / "lineup"
"""The invented demo line-up: a TOML record and a spectrum per product (examples/lineup)."""


@pytest.fixture(scope="session")
def colour():
    """colour-science (the reference library), imported without its notices about optional plotting and
    SciPy features, which say nothing about the values tested."""
    return import_colour()


# --- spectra ---------------------------------------------------------------------------------------------------
def write_spectrum(path, wavelength_nm, values, header="wavelength_nm,value"):
    """Write a two-column CSV spectrum and return its path."""
    lines = [header] + [f"{w!r},{v!r}" for w, v in zip(map(float, wavelength_nm), map(float, values), strict=True)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


DEFAULT_FIELDS = {"distance_mm": 200.0, "source_diameter_mm": 5.0}
"""Record fields of :func:`load_spectrum` unless a test gives its own: ``None`` removes one, as an option not given
does, and any source size replaces the default disc."""
SOURCE_SIZES = ("source_diameter_mm", "source_width_mm", "source_height_mm", "source_alpha_mrad")


def load_spectrum(wavelength_nm, values, product_id="spectrum", **fields):
    """The product ``hazard.load_product(f"{product_id}.csv", fields)`` gives for a CSV file of these numbers, without
    the file.

    Only the reader is replaced by the arrays (rows numbered as in a file with a header line; the SHA-256 is that of
    the arrays' bytes): the record is made from ``fields`` as command-line options make it, and the unit, the file's
    statements, validation (method §5) and the band checks run as for a file. For checks that only need the engine to
    see a spectrum; what files say and how they are read is tested on real files (tests/inputs).
    """
    from unittest import mock

    from hazard.inputs import loading
    from hazard.inputs.readers import RawSpectrum
    from hazard.inputs.record import record_from_fields

    wl, value = np.asarray(wavelength_nm, dtype=float), np.asarray(values, dtype=float)
    defaults = {k: v for k, v in DEFAULT_FIELDS.items() if not (k in SOURCE_SIZES and set(SOURCE_SIZES) & set(fields))}
    given = {k: v for k, v in {**defaults, **fields}.items() if v is not None}
    record = record_from_fields(
        {"id": product_id, **given, "spectrum": f"{product_id}.csv"}, path="command line", option_names=True
    )
    raw = RawSpectrum(wl, value, np.arange(wl.size) + 2, f"{product_id}.csv")
    digest = hashlib.sha256(np.stack([wl, value]).tobytes()).hexdigest()
    with mock.patch.object(loading, "read_spectrum", lambda *args, **kwargs: (raw, {"sha256": digest})):
        return loading.product_from_record(record, Path.cwd(), f"{product_id}.csv")


def assess_spectrum(wavelength_nm, values, *, studies=False, product_id="spectrum", **fields):
    """``hazard.assess`` of a spectrum held in memory (:func:`load_spectrum`).

    With ``studies``, hazard distances and remedies too, as ``hazard.assess`` computes them; without, the result has
    none (the uncertainty and daily-exposure studies run whenever the record asks for them, as in ``hazard.assess``).
    """
    from hazard.assessment.build import build_assessment
    from hazard.assessment.pipeline import evaluate_loaded

    loaded = load_spectrum(wavelength_nm, values, product_id, **fields)
    return build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=studies)


def assess_pulsed(wavelength_nm, line, *, dose=True, duration_s=1e-3, rate_hz=None, studies=False, **fields):
    """A pulsed source of ``line``: one pulse's radiant exposure [J m⁻² nm⁻¹], or with ``dose=False`` its peak
    irradiance [W m⁻² nm⁻¹]; a single pulse, or a train at ``rate_hz`` [Hz], of ``duration_s`` [s]."""
    record = {
        "no_emission_outside": True,
        "emission": "single_pulse" if rate_hz is None else "pulse_train",
        "pulse_duration_s": duration_s,
        **({"pulse_rate_hz": rate_hz} if rate_hz is not None else {}),
        **({"quantity": "radiant_exposure", "unit": "J/m2/nm"} if dose else {}),
        **fields,
    }
    return assess_spectrum(wavelength_nm, line, studies=studies, **record)


def triangle_line(grid_nm, centre_nm, peak, half_width_nm=1.0):
    """A triangular line of the given peak and half-width at the base: area = peak × half-width."""
    return peak * np.clip(1 - np.abs(np.asarray(grid_nm) - centre_nm) / half_width_nm, 0, None)


def gaussians(wavelength_nm, lines):
    """A sum of Gaussian lines (centre nm, σ nm, peak W m⁻² nm⁻¹) on the grid [W m⁻² nm⁻¹]."""
    wl = np.asarray(wavelength_nm, dtype=float)
    out = np.zeros_like(wl)
    for centre, sigma, amplitude in lines:
        out += amplitude * np.exp(-0.5 * ((wl - centre) / sigma) ** 2)
    return out


def log_uniform(lo, hi):
    """A hypothesis strategy of floats spread evenly in log scale between ``lo`` and ``hi``."""
    return st.floats(math.log10(lo), math.log10(hi)).map(lambda x: 10.0**x)


def white_lamp(wavelength_nm):
    """A bright white-ish lamp: two broad Gaussians [W m⁻² nm⁻¹] (invented test data)."""
    wl = np.asarray(wavelength_nm, dtype=float)
    return 0.02 * np.exp(-0.5 * ((wl - 450) / 12) ** 2) + 0.03 * np.exp(-0.5 * ((wl - 570) / 60) ** 2)


LAMP_NM = np.arange(380.0, 781.0, 5.0)
"""The grid of :func:`write_lamp` [nm]."""
LAMP_FIELDS = {"distance_mm": 500.0, "source_diameter_mm": 30.0, "no_emission_outside": True}
"""Record fields that go with :func:`write_lamp`'s spectrum (as the rows of :data:`MANIFEST_HEAD` give them)."""
MANIFEST_HEAD = "id,spectrum,distance_mm,source_diameter_mm,no_emission_outside\n"


def write_lamp(folder: Path, name: str = "lamp.csv") -> Path:
    """:func:`white_lamp` on :data:`LAMP_NM`, written to ``folder/name``."""
    return write_spectrum(folder / name, LAMP_NM, white_lamp(LAMP_NM))


def write_manifest(folder: Path, ids, spectrum="lamp.csv") -> Path:
    """``folder/m.csv``: one row per id, each the lamp of :func:`write_lamp` (written beside it)."""
    write_lamp(folder)
    path = folder / "m.csv"
    path.write_text(MANIFEST_HEAD + "".join(f"{i},{spectrum},500,30,true\n" for i in ids))
    return path


def rank(group):
    """Exempt < RG1 < RG2 < RG3 (IEC 62471:2006 §6.1); −1 for no group."""
    return -1 if group is None else GROUPS.index(group)


# --- files -----------------------------------------------------------------------------------------------------
def write_file(path, content):
    """Write text (UTF-8) or bytes to ``path`` and return it."""
    if isinstance(content, bytes):
        path.write_bytes(content)
    else:
        path.write_text(content, encoding="utf-8")
    return path


def write_toml(path, **fields):
    """A TOML record of ``fields`` (strings quoted, booleans in lower case) at ``path``."""
    lines = [
        f"{k} = {v!r}" if isinstance(v, str) else f"{k} = {str(v).lower() if isinstance(v, bool) else v}"
        for k, v in fields.items()
    ]
    return write_file(path, "\n".join(lines) + "\n")


def file_hashes(folder):
    """SHA-256 of every file below ``folder``: shows a file changed, appeared or vanished."""
    return {
        str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
        for p in sorted(folder.rglob("*"))
        if p.is_file()
    }


def write_xlsx(path: Path, rows, sheet_xml_edit=None) -> Path:
    """An .xlsx workbook of ``rows``; ``sheet_xml_edit`` (bytes → bytes) changes its first sheet's XML."""
    import openpyxl

    book = openpyxl.Workbook()
    for row in rows:
        book.active.append(row)
    buffer = io.BytesIO()
    book.save(buffer)
    if sheet_xml_edit is None:
        path.write_bytes(buffer.getvalue())
        return path
    source = zipfile.ZipFile(io.BytesIO(buffer.getvalue()))
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as out:
        for item in source.infolist():
            data = source.read(item.filename)
            if item.filename == "xl/worksheets/sheet1.xml":
                data = sheet_xml_edit(data)
            out.writestr(item, data)
    return path


def copy_lineup(folder: Path) -> Path:
    """The line-up's records and spectra copied into ``folder`` (created)."""
    folder.mkdir(parents=True, exist_ok=True)
    for path in LINEUP.glob("cl-*"):
        shutil.copy(path, folder / path.name)
    return folder


def claim_record(folder: Path, stem: str, **claims) -> Path:
    """A line-up record copied into ``folder`` beside its spectrum, with its own claims replaced by ``claims``."""
    shutil.copy(LINEUP / f"{stem}.csv", folder / f"{stem}.csv")  # beside the record: spectra stay in its folder
    text = (LINEUP / f"{stem}.toml").read_text()
    text = "".join(line for line in text.splitlines(keepends=True) if not line.startswith("claimed_"))
    text += "".join(f"{k} = {v!r}\n".replace("'", '"') for k, v in claims.items())
    path = folder / f"{stem}.toml"
    path.write_text(text)
    return path


# --- results and messages --------------------------------------------------------------------------------------
def same_result(a, b):
    """Two assessments agree apart from warnings, the input files' hashes (the files' bytes differ) and the seal."""
    strip = {"warnings": True, "provenance": {"inputs", "result_sha256"}}
    return a.model_dump(exclude=strip) == b.model_dump(exclude=strip)


@contextlib.contextmanager
def bounded(seconds: float):
    """Fail instead of hanging: a case that once took minutes (or forever) must end; 10× margin and more."""

    def expire(*_):
        raise TimeoutError(f"still running after {seconds} s")

    previous = signal.signal(signal.SIGALRM, expire)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def assert_one_line(exc, *fragments: str) -> str:
    """An input error's message is one line holding every fragment; returns it."""
    text = str(exc)
    assert "\n" not in text and "\r" not in text and len(text) < 1200
    for fragment in fragments:
        assert fragment in text, text
    return text


def run_process(*args, cwd=None):
    """The real command in a fresh interpreter: ``python -m hazard.cli ARGS``."""
    return subprocess.run([sys.executable, "-m", "hazard.cli", *args], capture_output=True, text=True, cwd=cwd)


def run_cli(args, cwd: Path):
    """The command in this process (CliRunner), run from ``cwd``."""
    from hazard.cli import main

    old = os.getcwd()
    os.chdir(cwd)
    try:
        return CliRunner().invoke(main, args)
    finally:
        os.chdir(old)


def assert_exit_2(result, *fragments: str) -> str:
    """A CliRunner result of bad input: exit 2 and one line 'hazard: error: …' holding every fragment."""
    assert result.exit_code == 2, (result.exit_code, result.stderr, result.exception)
    lines = result.stderr.splitlines()
    assert len(lines) == 1 and lines[0].startswith("hazard: error: "), result.stderr
    for fragment in fragments:
        assert fragment in lines[0], lines[0]
    return lines[0]


def assert_error_line(exit_code, stdout, stderr, *fragments):
    """Bad input as a user sees it: exit 2, nothing on stdout, one line 'hazard: error: …' on stderr."""
    # hazard/cli.py and DEVELOPERS.md: bad input → exit 2 and one line 'hazard: error: FILE:LINE: problem; fix'
    assert exit_code == 2, stderr
    assert stdout == ""
    lines = stderr.splitlines()
    assert len(lines) == 1, stderr
    assert lines[0].startswith("hazard: error: ")
    assert "Traceback" not in stderr
    for fragment in fragments:
        assert fragment in lines[0]
    return lines[0]


# --- the demo line-up and its reports ----------------------------------------------------------------------------
RENDERED_AT = datetime.datetime(2024, 6, 1, 12, 0, tzinfo=datetime.UTC)
"""The report time of every rendered PDF (a fixed time gives identical bytes)."""
# examples/README.md: "the line-up spans the groups: Exempt (desk lamp, indicator), RG1 (spotlight, IR
# illuminator), RG2 (far-UV-C lamp, horticulture spotlight), RG3 (curing lamp, germicidal lamp, heater)"
EXPECTED_GROUP = {
    "cl-desk-30": "Exempt",
    "cl-pip-470": "Exempt",
    "cl-spot-65": "RG1",
    "cl-ir-940": "RG1",
    "cl-far-222": "RG2",
    "cl-grow-30": "RG2",
    "cl-cure-365": "RG3",
    "cl-germ-254": "RG3",
    "cl-heat-2k": "RG3",
}
FOOTER = "Pre-screen only — not a certification"  # project contract: README "a pre-screen, not a certification"


def normalise(text: str) -> str:
    """``text`` with every run of white space made one space."""
    return re.sub(r"\s+", " ", text).strip()


def pdf_pages(pdf: bytes) -> list[str]:
    """Whitespace-normalised text of each page (pypdf breaks lines where the layout wraps them)."""
    from pypdf import PdfReader

    return [normalise(page.extract_text()) for page in PdfReader(io.BytesIO(pdf)).pages]


@pytest.fixture(scope="session")
def lineup_all():
    """The result of every line-up record (file stem → result), as ``hazard.assess`` gives it: computed once."""
    import hazard

    return {path.stem: hazard.assess(path) for path in sorted(LINEUP.glob("*.toml"))}


@pytest.fixture(scope="session")
def lineup(lineup_all):
    """The results of the line-up products of :data:`EXPECTED_GROUP`."""
    return {stem: lineup_all[stem] for stem in EXPECTED_GROUP}


def lineup_product(stem: str, spectrum_factor: float = 1.0, **fields):
    """A line-up product (an irradiance spectrum) held in memory, its spectrum times ``spectrum_factor``, ``fields``
    replacing its record's.

    Without its daily exposures and its measurement uncertainty: they say nothing of its values, groups and margins,
    and their studies (which ``hazard.assess`` runs whenever a record states them) are tested on their own.
    """
    import hazard

    loaded = hazard.load_product(LINEUP / f"{stem}.toml")
    assert loaded.record.effective_quantity == "irradiance", stem  # its values are then in W/m2/nm
    own = loaded.record.model_dump(exclude_none=True, exclude={"id", "spectrum", "unit", *NOT_FOR_GROUPS})
    return load_spectrum(
        loaded.spectrum.wavelength_nm,
        loaded.spectrum.value * spectrum_factor,
        loaded.record.id,
        **{**own, "unit": "W/m2/nm", **fields},
    )


NOT_FOR_GROUPS = (
    "exposure",
    "exposure_distance_mm",
    "exposure_duration_s",
    "uncertainty_pct",
    "wavelength_uncertainty_nm",
)
"""Record fields that ask for studies beside the groups (daily exposures, measurement uncertainty)."""


def with_tightest(a, new_id: str, group: str, margins: dict[str, float]):
    """``a`` re-labelled: one deciding hazard (E_UVA) in ``group`` with the given value/limit ratios, and no
    uncertainty study (the line-up records state an uncertainty), so the margin rule flags it."""
    hazard_result = a.hazards["E_UVA"].model_copy(update={"risk_group": group, "margins": margins})
    return a.model_copy(
        update={
            "id": new_id,
            "risk_group": group,
            "deciding_hazards": ["E_UVA"],
            "hazards": {**a.hazards, "E_UVA": hazard_result},
            "uncertainty": None,
        }
    )
