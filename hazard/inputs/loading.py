"""From what the user names (a TOML record, or a spectrum file plus options) to a record and a spectrum."""

from __future__ import annotations

import hashlib
import os
from dataclasses import dataclass
from pathlib import Path

from hazard.errors import InputError, excerpt
from hazard.inputs.readers import read_spectrum
from hazard.inputs.record import ProductRecord, read_record_file, record_from_fields
from hazard.inputs.spectrum import Spectrum, validate_spectrum
from hazard.inputs.statements import file_metadata, metadata_warnings, resolve_unit
from hazard.inputs.userfiles import regular_file_size
from hazard.method.photometry import VISIBLE_BAND_NM
from hazard.method.weighting import quadrature_weights
from hazard.standards import LIMIT_SETS
from hazard.weighting_tables import load_table

__all__ = ["ALLOW_OUTSIDE_OPTION", "LoadedProduct", "load_product", "product_from_record", "spectrum_path"]

ALLOW_OUTSIDE_OPTION = "--allow-outside"
"""The option that lets a record name a spectrum outside its own folder tree."""

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
        raise InputError(
            f"the relative spectrum {spectrum.path} has no light within V(λ)'s "
            f"{VISIBLE_BAND_NM[0]:g}-{VISIBLE_BAND_NM[1]:g} nm, so a photometric anchor cannot scale it",
            "give an absolute spectrum (irradiance or radiance) instead",
            origin,
        )


def _check_overlaps_bands(spectrum: Spectrum, origin: str) -> None:
    """Refuse a spectrum that lies wholly outside every hazard band.

    It holds nothing to assess and is most likely on another wavelength scale; it is refused rather than read as zero
    everywhere.
    """
    bands = [h.band_nm for s in LIMIT_SETS.values() for h in s.hazards]
    low, high = min(b[0] for b in bands), max(b[1] for b in bands)
    lo, hi = spectrum.range_nm
    if hi <= low or lo >= high:
        raise InputError(
            f"the spectrum covers {lo:g}–{hi:g} nm, wholly outside {low:g}–{high:g} nm where every "
            f"hazard band lies: nothing could be assessed",
            "check that the wavelength column is in nm",
            origin,
        )


def _spectrum_name(record: ProductRecord, origin: str) -> str:
    """The spectrum file name the record gives; refused when it gives none."""
    if not record.spectrum:
        raise InputError("the record names no spectrum file", 'add spectrum = "FILE.csv"', origin)
    return record.spectrum


def spectrum_path(record: ProductRecord, base_dir: Path, origin: str, root: Path | None) -> Path:
    """The spectrum file a record names, relative to ``base_dir``.

    With ``root``, it must lie inside that folder tree (symbolic links resolved), so a record from elsewhere cannot make
    the tool read, or tell about, files outside it.

    Raises
    ------
    InputError
        No spectrum named, or (with ``root``) an absolute path or one that leads out of ``root``.
    """
    name = _spectrum_name(record, origin)
    path = base_dir / name
    if root is None:
        return path
    fix = (
        f"keep the spectra in the folder of the record or manifest (or below it), or give "
        f"{ALLOW_OUTSIDE_OPTION} if you trust where it points"
    )
    if "\x00" in name:
        raise InputError("the spectrum path contains a NUL byte", "remove the control character", origin)
    if Path(name).is_absolute() or Path(name).drive:
        raise InputError(f"spectrum path {excerpt(name)} is absolute", fix, origin)
    top = os.path.realpath(root)
    if os.path.commonpath([top, os.path.realpath(path)]) != top:
        raise InputError(f"spectrum path {excerpt(name)} leads outside the folder {excerpt(root, 80)}", fix, origin)
    return path


def product_from_record(
    record: ProductRecord,
    base_dir: Path,
    origin: str,
    record_inputs: dict[str, str] | None = None,
    *,
    root: Path | None = None,
) -> LoadedProduct:
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
    root : Path, optional
        Folder tree the spectrum must lie in (see :func:`spectrum_path`); anywhere when None.
    """
    name = _spectrum_name(record, origin)
    path = spectrum_path(record, base_dir, origin, root)
    raw, metadata = read_spectrum(str(path), display_path=name, column=record.column)
    unit, unit_warnings = resolve_unit(record, raw, metadata, origin)
    metadata["unit_used"] = unit.text
    metadata["file_metadata"] = file_metadata(metadata)
    warnings = (*raw.warnings, *unit_warnings, *metadata_warnings(record, metadata, raw.path))
    factor, quantity = unit.factor_to_si, record.quantity
    if quantity == "radiant_exposure" and record.pulse_duration_s is not None:
        # one pulse's exposure over its half-peak width: the peak of a pulse of that width (method: pulsed sources)
        factor, quantity = factor / record.pulse_duration_s, record.effective_quantity
    spectrum = validate_spectrum(raw.wavelength_nm, raw.value, raw.lines, raw.path, factor, quantity, warnings)
    _check_overlaps_bands(spectrum, origin)
    if record.quantity == "relative":
        _check_anchorable(spectrum, origin)
    inputs = dict(record_inputs or {})
    inputs[name] = metadata["sha256"]
    return LoadedProduct(record=record, spectrum=spectrum, inputs=inputs, metadata=metadata)


def load_product(path: str | Path, overrides: dict | None = None, *, allow_outside: bool = True) -> LoadedProduct:
    """Load a product from a TOML record, or from a spectrum file with ``overrides`` as its record fields.

    Parameters
    ----------
    path : str or Path
        ``RECORD.toml`` or a spectrum file.
    overrides : dict, optional
        Record fields given as options; they replace the record's own.
    allow_outside : bool
        Let a TOML record name a spectrum outside its own folder tree (absolute, or leading out with ``..``
        or a symbolic link). The command line refuses that unless told otherwise; from Python, a record you
        pass is trusted.

    Raises
    ------
    InputError
    """
    path = Path(path)
    overrides = {k: v for k, v in (overrides or {}).items() if v is not None}
    if path.suffix.lower() in RECORD_SUFFIXES:
        fields, text, raw = read_record_file(path)
        fields.update(overrides)
        record = record_from_fields(fields, path=str(path), text=text, from_options=frozenset(overrides))
        digest = hashlib.sha256(raw).hexdigest()
        return product_from_record(
            record, path.parent, str(path), {path.name: digest}, root=None if allow_outside else path.parent
        )
    regular_file_size(
        path, what="file", display=str(path), fix_missing="give a RECORD.toml or a spectrum file that exists"
    )
    fields = {"id": path.stem, **overrides, "spectrum": path.name}
    record = record_from_fields(fields, path="command line", option_names=True)
    return product_from_record(record, path.parent, str(path))
