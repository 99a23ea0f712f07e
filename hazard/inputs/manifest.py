"""Batch input: a CSV or .xlsx manifest (one product record per row) or a folder of TOML records.

Each row carries the record fields of :class:`hazard.inputs.record.ProductRecord`; ``spectrum`` paths are relative
to the manifest's folder (or to each TOML file's folder) and must stay inside that folder tree unless the run
allows otherwise (:func:`hazard.inputs.spectrum_path`). A manifest that cannot be used at all (missing, not a
regular file, unreadable, no ``id`` column, an unknown column, duplicate ids, beyond a size limit) raises
:class:`~hazard.errors.InputError`; a bad row is left for the batch to report on its own.

Reading costs bounded work for any file: the manifest is read up to a size limit, CSV in any line-ending
convention (LF, CRLF, CR) with the separator taken from the header row, .xlsx streamed
(:mod:`hazard.inputs.readers.workbook`), and rows counted against a limit.
"""

from __future__ import annotations

import csv
import datetime
import difflib
import hashlib
import io
import json
import os
from dataclasses import dataclass, field
from pathlib import Path

from hazard.errors import InputError, excerpt
from hazard.inputs.readers.common import current_limits
from hazard.inputs.readers.workbook import workbook_rows
from hazard.inputs.record import ProductRecord, read_record_file
from hazard.inputs.userfiles import read_user_file

__all__ = ["MAX_MANIFEST_BYTES", "MAX_MANIFEST_ROWS", "ManifestRow", "is_manifest", "read_manifest"]

MAX_MANIFEST_BYTES = 256 * 1024 * 1024
"""Largest CSV manifest read (10⁶ rows of a few fields) [bytes]."""
MAX_MANIFEST_ROWS = 1_000_000
"""Most products in one manifest [1]."""
MAX_FIELD_CHARS = 128 * 1024
"""Longest CSV cell read; longer ones are refused with their line (the CSV reader's own limit) [characters]."""
_SEPARATORS = (",", ";", "\t")


@dataclass(frozen=True, slots=True)
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
    root : Path or None
        The folder tree the ``spectrum`` path must lie in (the manifest's folder, or the folder of records).
    """

    origin: str
    fields: dict
    base_dir: Path
    inputs: dict[str, str]
    problem: InputError | None = None
    text: str | None = field(default=None, repr=False)
    root: Path | None = None

    @property
    def product_id(self) -> str:
        """The row's id, or its origin when it has none."""
        return str(self.fields.get("id") or self.origin)


def _row_digest(fields: dict) -> str:
    return hashlib.sha256(json.dumps(fields, sort_keys=True, ensure_ascii=False).encode()).hexdigest()


def _check_columns(columns: list[str], path: str) -> None:
    known = set(ProductRecord.model_fields)
    if "id" not in columns:
        raise InputError(
            "the manifest has no 'id' column",
            "add a header row naming the record fields, with 'id' and 'spectrum' among them",
            path,
            1,
        )
    seen = set()
    for column in columns:
        if column not in known:
            close = difflib.get_close_matches(column[:100], known, n=1)
            hint = f"rename it to {close[0]!r}" if close else "remove it or see 'hazard schema record'"
            raise InputError(f"unknown column {excerpt(column)}", hint, path, 1)
        if column in seen:
            raise InputError(f"column {column!r} appears twice", "keep one of them", path, 1)
        seen.add(column)


def _cell(value):
    """A cell as a record field value: text stripped; dates and times (from a workbook) as ISO text."""
    if isinstance(value, str):
        return value.strip()
    if isinstance(value, datetime.datetime) and value.time() == datetime.time():
        return value.date().isoformat()  # a workbook's date cell: a date, not midnight of that date
    if isinstance(value, (datetime.date, datetime.time, datetime.timedelta)):
        return str(value)
    return value


def _table_rows(header: list, rows, path: Path) -> list[ManifestRow]:
    """Rows from (line number, cells) pairs under ``header``, counted against :data:`MAX_MANIFEST_ROWS`."""
    header = [str(_cell(h)) if h is not None else "" for h in header]
    _check_columns([h for h in header if h], str(path))
    manifest, folder = path.name, path.parent
    result: list[ManifestRow] = []
    for number, cells in rows:
        fields = {
            h: value
            for h, c in zip(header, cells, strict=False)
            if h and (value := _cell(c)) is not None and value != ""
        }
        if not fields:
            continue
        extra = [c for c in cells[len(header) :] if _cell(c) not in (None, "")]
        problem = (
            InputError(
                f"the row has {len(extra)} more cell(s) than the header has columns ({excerpt(str(extra[0]))} is "
                "the first); its fields may have shifted",
                "quote a cell that holds the delimiter, or remove the extra cells",
                str(path),
                number,
            )
            if extra
            else None
        )
        if len(result) >= MAX_MANIFEST_ROWS:
            raise InputError(f"more than {MAX_MANIFEST_ROWS:,} products", "split the manifest", str(path), number)
        result.append(
            ManifestRow(
                origin=f"{path}:{number}",
                fields=fields,
                base_dir=folder,
                root=folder,
                inputs={f"{manifest}:{fields.get('id', number)}": _row_digest(fields)},
                problem=problem,
            )
        )
    if not result:
        raise InputError("the manifest lists no products", "add one row per product under the header", str(path))
    return result


def _decode(raw: bytes) -> str:
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        return raw.decode("latin-1")


def _csv_lines(reader, path: Path):
    """(line number, cells) of a CSV reader, each CSV error one input error naming its line."""
    while True:
        try:
            cells = next(reader)
        except StopIteration:
            return
        except csv.Error as exc:
            raise InputError(
                f"not a readable CSV row ({excerpt(exc, 80)})",
                f"save the manifest again as CSV; keep cells under {MAX_FIELD_CHARS // 1024} KiB",
                str(path),
                reader.line_num,
            ) from None
        yield reader.line_num, cells


def is_manifest(path: Path) -> bool:
    """Whether ``path`` holds several products (a manifest) rather than one spectrum or record.

    A folder, a workbook, or a text table whose header row names the record fields ``id`` and ``spectrum`` (a
    spectrum file's header names wavelengths and values).
    """
    if path.is_dir() or path.suffix.lower() == ".xlsx":
        return True
    if path.suffix.lower() == ".toml":
        return False
    if not path.is_file():  # missing, a pipe, a device: the manifest reader names what is wrong, without reading
        return True
    with open(path, "rb") as handle:
        first = _decode(handle.read(64 * 1024)).lstrip("\ufeff").partition("\n")[0]
    separator = max(_SEPARATORS, key=first.count)
    cells = {cell.strip().strip('"').strip().lower() for cell in first.split(separator)}
    return {"id", "spectrum"} <= cells


def _read_csv(path: Path) -> list[ManifestRow]:
    raw = read_user_file(
        path,
        what="manifest",
        max_bytes=MAX_MANIFEST_BYTES,
        fix_missing="give a CSV or .xlsx manifest, or a folder of TOML records",
        fix_large="split the manifest",
    )
    text = _decode(raw)
    if b"\x00" in raw[:4096]:
        raise InputError("this is a binary file, not a CSV manifest", "give a CSV or .xlsx manifest", str(path))
    first = text.lstrip("\ufeff").splitlines()[0] if text.strip() else ""
    separator = max(_SEPARATORS, key=first.count)  # the header names fields, none of which holds a separator
    limit = csv.field_size_limit()
    csv.field_size_limit(MAX_FIELD_CHARS)
    try:  # newline=None reads LF, CRLF and CR-only files (old spreadsheet exports) alike
        lines = _csv_lines(csv.reader(io.StringIO(text, newline=None), delimiter=separator), path)
        header = next(lines, None)
        if header is None:
            raise InputError("the manifest is empty", "give a header row and one row per product", str(path))
        return _table_rows(header[1], lines, path)
    finally:
        csv.field_size_limit(limit)


def _read_xlsx(path: Path) -> list[ManifestRow]:
    limits = current_limits()
    raw = read_user_file(
        path,
        what="manifest",
        max_bytes=limits.max_bytes,
        fix_missing="give a CSV or .xlsx manifest, or a folder of TOML records",
        fix_large="split the manifest, or save it as CSV",
    )
    rows = workbook_rows(
        raw,
        str(path),
        max_rows=limits.max_workbook_rows + 1,
        max_columns=limits.max_workbook_columns,
        max_unpacked_bytes=limits.max_workbook_unpacked_bytes,
        what="manifest",
    )
    if not rows:
        raise InputError("the workbook's first sheet is empty", "put the header row in row 1", str(path))
    return _table_rows(rows[0][1], rows[1:], path)


def _read_folder(folder: Path) -> list[ManifestRow]:
    result = []
    for path in sorted(folder.glob("*.toml")):
        try:
            fields, text, raw = read_record_file(path)
        except InputError as problem:
            result.append(ManifestRow(str(path), {}, path.parent, {}, problem, root=folder))
            continue
        inputs = {path.name: hashlib.sha256(raw).hexdigest()}
        result.append(ManifestRow(str(path), fields, path.parent, inputs, text=text, root=folder))
        if len(result) > MAX_MANIFEST_ROWS:
            raise InputError(f"more than {MAX_MANIFEST_ROWS:,} records", "split the folder", str(folder))
    if not result:
        raise InputError("no *.toml records in this folder", "give a manifest file or a folder of records", str(folder))
    return result


def read_manifest(path: str | Path) -> list[ManifestRow]:
    """Rows of a CSV/.xlsx manifest or of a folder of TOML records, in the order given.

    Raises
    ------
    InputError
        When the manifest as a whole cannot be used (including duplicate ids, naming both rows).
    """
    path = Path(path)
    if "\x00" in os.fspath(path):
        raise InputError("the manifest path contains a NUL byte", "remove the control character", repr(str(path)))
    if path.is_dir():
        rows = _read_folder(path)
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
            raise InputError(
                f"duplicate id {excerpt(product_id)} (also at {seen[product_id]})",
                "give every product its own id",
                row.origin,
            )
        seen[product_id] = row.origin
    return rows
