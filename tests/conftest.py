"""Shared test helpers and the folders the tests read from (the same at any depth of tests/)."""

from pathlib import Path

import pytest

from hazard.method.photometry import import_colour

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


def write_spectrum(path, wavelength_nm, values, header="wavelength_nm,value"):
    """Write a two-column CSV spectrum and return its path."""
    lines = [header] + [f"{w!r},{v!r}" for w, v in zip(map(float, wavelength_nm), map(float, values), strict=True)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def assess_arrays(folder, wavelength_nm, values, name="spectrum", **fields):
    """Assess an in-memory spectrum: written to ``folder/name.csv`` and assessed with ``fields``."""
    import hazard

    path = write_spectrum(folder / f"{name}.csv", wavelength_nm, values)
    defaults = {"distance_mm": 200.0, "source_diameter_mm": 5.0}
    return hazard.assess(path, {**defaults, **fields})


def triangle_line(grid_nm, centre_nm, peak, half_width_nm=1.0):
    """A triangular line of the given peak and half-width at the base: area = peak × half-width."""
    import numpy as np

    return peak * np.clip(1 - np.abs(np.asarray(grid_nm) - centre_nm) / half_width_nm, 0, None)
