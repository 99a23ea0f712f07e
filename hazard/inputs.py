"""From what the user names (a TOML record, or a spectrum file plus options) to a record and a spectrum."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from pathlib import Path

from hazard.errors import InputError
from hazard.readers import read_spectrum
from hazard.record import ProductRecord, load_record, record_from_fields
from hazard.spectrum import Spectrum
from hazard.units import parse_spectral_unit

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
    unit = parse_spectral_unit(record.unit_text)
    spectrum, metadata = read_spectrum(str(base_dir / record.spectrum), display_path=record.spectrum,
                                       quantity=record.quantity, factor_to_si=unit.factor_to_si,
                                       column=record.column)
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
