"""From what the user names (a TOML record, or a spectrum file plus options) to a record and a spectrum."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from pathlib import Path

from hazard.errors import InputError
from hazard.file_statements import file_metadata, metadata_warnings, resolve_unit
from hazard.method.photometry import VISIBLE_BAND_NM
from hazard.method.weighting import quadrature_weights
from hazard.readers import read_spectrum
from hazard.record import ProductRecord, load_record, record_from_fields
from hazard.spectrum import Spectrum, validate_spectrum
from weighting_tables import load_table

__all__ = ["LoadedProduct", "load_product", "product_from_record"]

RECORD_SUFFIXES = (".toml",)


@dataclass(frozen=True)
class LoadedProduct:
    """A validated record, its spectrum, and the SHA-256 of every input file.

    Attributes
    ----------
    record : ProductRecord
    spectrum : Spectrum
    inputs : dict
        Input file, as the user named it, → SHA-256 of its bytes.
    metadata : dict
        What the spectrum reader found beside the numbers.
    """

    record: ProductRecord
    spectrum: Spectrum
    inputs: dict[str, str]
    metadata: dict


def _check_anchorable(spectrum: Spectrum, origin: str) -> None:
    """A photometric anchor can only scale a spectrum that has visible light (V(λ) > 0 somewhere)."""
    visual = quadrature_weights(spectrum.wavelength_nm, VISIBLE_BAND_NM, load_table("v_photopic"))
    if not float(visual @ spectrum.value) > 0:
        raise InputError(f"the relative spectrum {spectrum.path} has no light within V(λ)'s "
                         f"{VISIBLE_BAND_NM[0]:g}-{VISIBLE_BAND_NM[1]:g} nm, so a photometric anchor cannot scale it",
                         "give an absolute spectrum (irradiance or radiance) instead", origin)


def product_from_record(record: ProductRecord, base_dir: Path, origin: str,
                        record_inputs: dict[str, str] | None = None) -> LoadedProduct:
    """Read the spectrum a record names, relative to ``base_dir``.

    Parameters
    ----------
    record : ProductRecord
    base_dir : Path
        Folder the record's ``spectrum`` path is relative to.
    origin : str
        Where the record came from, for messages.
    record_inputs : dict, optional
        Hashes of the record's own file(s), to carry into the provenance.
    """
    if not record.spectrum:
        raise InputError("the record names no spectrum file", "add spectrum = \"FILE.csv\"", origin)
    raw, metadata = read_spectrum(str(base_dir / record.spectrum), display_path=record.spectrum,
                                  column=record.column)
    unit, unit_warnings = resolve_unit(record, raw, metadata, origin)
    metadata["unit_used"] = unit.text
    metadata["file_metadata"] = file_metadata(metadata)
    warnings = (*raw.warnings, *unit_warnings, *metadata_warnings(record, metadata["file_metadata"], raw.path))
    spectrum = validate_spectrum(raw.wavelength_nm, raw.value, raw.lines, raw.path, unit.factor_to_si,
                                 record.quantity, warnings)
    if record.quantity == "relative":
        _check_anchorable(spectrum, origin)
    inputs = dict(record_inputs or {})
    inputs[record.spectrum] = metadata["sha256"]
    return LoadedProduct(record=record, spectrum=spectrum, inputs=inputs, metadata=metadata)


def load_product(path: str | Path, overrides: dict | None = None) -> LoadedProduct:
    """Load a product from a TOML record, or from a spectrum file with ``overrides`` as its record fields.

    Parameters
    ----------
    path : str or Path
        ``RECORD.toml`` or a spectrum file.
    overrides : dict, optional
        Record fields given as options; they replace the record's own.

    Raises
    ------
    InputError
    """
    path = Path(path)
    overrides = {k: v for k, v in (overrides or {}).items() if v is not None}
    if path.suffix.lower() in RECORD_SUFFIXES:
        record = load_record(path, overrides)
        digest = hashlib.sha256(path.read_bytes()).hexdigest()
        return product_from_record(record, path.parent, str(path), {path.name: digest})
    if not path.exists():
        raise InputError("file not found", "give a RECORD.toml or a spectrum file that exists", str(path))
    fields = {"id": path.stem, **overrides, "spectrum": path.name}
    record = record_from_fields(fields, path="command line", option_names=True)
    return product_from_record(record, path.parent, str(path))
