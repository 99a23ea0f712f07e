"""Batch input: a CSV or .xlsx manifest (one product record per row) or a folder of TOML records.

Each row carries the record fields of :class:`hazard.record.ProductRecord`; ``spectrum`` paths are relative
to the manifest's folder (or to each TOML file's folder). A manifest that cannot be used at all (missing,
unreadable, no ``id`` column, an unknown column, duplicate ids) raises :class:`~hazard.errors.InputError`;
a bad row is left for the batch to report on its own.
"""

from __future__ import annotations

import csv
import difflib
import hashlib
import io
import json
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

from hazard.errors import InputError
from hazard.record import ProductRecord

__all__ = ["ManifestRow", "read_manifest"]


@dataclass(frozen=True)
class ManifestRow:
    """One product as the manifest gives it.

    Attributes
    ----------
    origin : str
        Where it came from, for messages: ``manifest.csv:7`` or ``records/lamp.toml``.
    fields : dict
        Record fields (empty cells left out); for an unreadable TOML file, empty.
    base_dir : Path
        Folder the ``spectrum`` path is relative to.
    inputs : dict
        The row's own input (file or manifest row) → SHA-256, for provenance and ``--resume``.
    problem : InputError or None
        Why the row could not even be read (a TOML file with a syntax error).
    text : str or None
        The TOML text, to find line numbers in messages.
    """

    origin: str
    fields: dict
    base_dir: Path
    inputs: dict[str, str]
    problem: InputError | None = None
    text: str | None = field(default=None, repr=False)

    @property
    def product_id(self) -> str:
        """The row's id, or its origin when it has none."""
        return str(self.fields.get("id") or self.origin)


def _row_digest(fields: dict) -> str:
    return hashlib.sha256(json.dumps(fields, sort_keys=True, ensure_ascii=False).encode()).hexdigest()


def _check_columns(columns: list[str], path: str) -> None:
    known = set(ProductRecord.model_fields)
    if "id" not in columns:
        raise InputError("the manifest has no 'id' column", "add a header row naming the record fields, with "
                         "'id' and 'spectrum' among them", path, 1)
    for column in columns:
        if column not in known:
            close = difflib.get_close_matches(column, known, n=1)
            hint = f"rename it to {close[0]!r}" if close else "remove it or see 'hazard schema record'"
            raise InputError(f"unknown column {column!r}", hint, path, 1)


def _table_rows(header: list[str], rows: list[tuple[int, list]], path: Path) -> list[ManifestRow]:
    header = [str(h).strip() if h is not None else "" for h in header]
    _check_columns([h for h in header if h], str(path))
    manifest = path.name
    result = []
    for number, cells in rows:
        fields = {h: (c.strip() if isinstance(c, str) else c) for h, c in zip(header, cells)
                  if h and c is not None and not (isinstance(c, str) and not c.strip())}
        if not fields:
            continue
        origin = f"{path}:{number}"
        result.append(ManifestRow(origin=origin, fields=fields, base_dir=path.parent,
                                  inputs={f"{manifest}:{fields.get('id', number)}": _row_digest(fields)}))
    return result


def _read_csv(path: Path) -> list[ManifestRow]:
    raw = path.read_bytes()
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        text = raw.decode("latin-1")
    dialect = csv.Sniffer().sniff(text.split("\n", 1)[0], delimiters=",;\t") if text.strip() else csv.excel
    reader = csv.reader(io.StringIO(text), dialect)
    lines = [(reader.line_num, row) for row in reader]
    if not lines:
        raise InputError("the manifest is empty", "give a header row and one row per product", str(path))
    (_, header), body = lines[0], lines[1:]
    return _table_rows(header, body, path)


def _read_xlsx(path: Path) -> list[ManifestRow]:
    try:
        import openpyxl
    except ImportError:  # pragma: no cover - openpyxl is a declared dependency
        raise InputError("reading .xlsx needs openpyxl", "pip install openpyxl, or save as CSV", str(path)) from None
    try:
        sheet = openpyxl.load_workbook(path, read_only=True, data_only=True).worksheets[0]
    except Exception as exc:  # noqa: BLE001 - openpyxl raises many types for a damaged file
        raise InputError(f"cannot read the workbook ({exc})", "save it again as .xlsx or CSV", str(path)) from None
    rows = [(number, list(cells)) for number, cells in enumerate(sheet.iter_rows(values_only=True), start=1)]
    if not rows:
        raise InputError("the workbook's first sheet is empty", "put the header row in row 1", str(path))
    return _table_rows(rows[0][1], rows[1:], path)


def _read_folder(folder: Path) -> list[ManifestRow]:
    result = []
    for path in sorted(folder.glob("*.toml")):
        raw = path.read_bytes()
        inputs = {path.name: hashlib.sha256(raw).hexdigest()}
        text = raw.decode("utf-8-sig", errors="replace")
        try:
            fields = tomllib.loads(text)
        except tomllib.TOMLDecodeError as exc:
            problem = InputError(f"not valid TOML ({exc})", "write one 'field = value' per line", str(path))
            result.append(ManifestRow(str(path), {}, path.parent, inputs, problem))
            continue
        result.append(ManifestRow(str(path), fields, path.parent, inputs, text=text))
    if not result:
        raise InputError("no *.toml records in this folder", "give a manifest file or a folder of records",
                         str(folder))
    return result


def read_manifest(path: str | Path) -> list[ManifestRow]:
    """Rows of a CSV/.xlsx manifest or of a folder of TOML records, in the order given.

    Raises
    ------
    InputError
        When the manifest as a whole cannot be used (including duplicate ids, naming both rows).
    """
    path = Path(path)
    if path.is_dir():
        rows = _read_folder(path)
    elif not path.exists():
        raise InputError("manifest not found", "give a CSV or .xlsx manifest, or a folder of TOML records",
                         str(path))
    elif path.suffix.lower() == ".xlsx":
        rows = _read_xlsx(path)
    else:
        rows = _read_csv(path)
    seen: dict[str, str] = {}
    for row in rows:
        if "id" not in row.fields:
            continue
        product_id = str(row.fields["id"])
        if product_id in seen:
            raise InputError(f"duplicate id {product_id!r} (also at {seen[product_id]})",
                             "give every product its own id", row.origin)
        seen[product_id] = row.origin
    return rows
