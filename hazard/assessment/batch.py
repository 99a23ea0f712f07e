"""``hazard batch``: many products from a manifest, one bad product never stopping the others.

Outputs in the output folder, all written atomically:

- ``results.jsonl``: one assessment JSON per line (the contract of ``hazard assess --format json``), in
  manifest order;
- ``summary.csv``: one row per product (id, status, group, completeness, per-hazard value, group and t_max, emission
  and the largest pulse fraction, the day's exposure against the limit values,
  warning count, error, file stem), in manifest order;
- with ``pdf``: one report per product and ``summary.pdf``, a ranked overview.

Products stream through the workers in chunks and their results are written as they come, so memory does not
grow with the number of products: the run keeps, per product, only its id, file stem, the position of its
line in ``results.jsonl`` and any error. Every failure of one product (bad input, a number out of range, even
a defect of the tool) is caught at that product and recorded as its error.

While it runs, each finished chunk of new assessments is appended to ``results.jsonl.partial`` and flushed to
disk. Killed half-way, a rerun with ``resume`` reads what is there (a torn last line is dropped, and cut off
the file before it grows again), skips every product whose input hashes are unchanged and ends with the same
outputs as an uninterrupted run.

The output folder is claimed for the run (:class:`hazard.assessment.outfolder.OutputFolder`): never a folder holding
the run's inputs or the user's own files, one run at a time, leftovers of a killed run removed.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
from collections import deque
from collections.abc import Iterable, Iterator, Mapping
from concurrent.futures import Executor, ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path

from hazard.assessment.build import build_assessment
from hazard.assessment.lab_plan import PlanItem, rank_plan
from hazard.assessment.outfolder import OutputFolder, file_stems
from hazard.assessment.pipeline import evaluate_loaded
from hazard.assessment.progress import Progress
from hazard.errors import InputError
from hazard.exit_codes import EXIT_INTERNAL, EXIT_OK, EXIT_SOME_FAILED
from hazard.inputs.loading import LoadedProduct, product_from_record, spectrum_path
from hazard.inputs.manifest import ManifestRow, read_manifest
from hazard.inputs.readers.common import current_limits
from hazard.inputs.record import record_from_fields
from hazard.inputs.userfiles import read_user_file
from hazard.output.atomic import atomic_file, write_atomic
from hazard.output.claim_rows import CLAIM_COLUMNS, claim_rows
from hazard.output.plan_files import write_plan_items
from hazard.output.summary_table import Cell, csv_cell, summary_columns, summary_row
from hazard.output.workbook import FAILURE_COLUMNS, SummaryWorkbook
from hazard.result import Assessment, ReportIdentity
from hazard.standards import DEFAULT_LIMIT_SET, LimitSet

__all__ = [
    "RESULTS_NAME",
    "SUMMARY_NAME",
    "WORKBOOK_NAME",
    "BatchOutcome",
    "failure_line",
    "failure_reason",
    "load_row",
    "run_batch",
]

RESULTS_NAME = "results.jsonl"
SUMMARY_NAME = "summary.csv"
WORKBOOK_NAME = "summary.xlsx"
PARTIAL_SUFFIX = ".partial"
CHUNK_PRODUCTS = 128
"""Products loaded, assessed and flushed to the partial file at a time (one unit of work for a worker)."""
CHUNKS_AHEAD = 2
"""Chunks queued per worker beyond the one being written: enough to keep the workers busy, few enough that
memory stays bounded [1]."""
INTERNAL_FIX = "please report it; 'hazard --debug assess' on this product shows the traceback"


class LazyAssessments(Mapping):
    """Product id → :class:`~hazard.result.Assessment`, each read from ``results.jsonl`` when asked for.

    So a batch of any size holds only the position of each line.
    """

    def __init__(self, path: Path, positions: dict[str, tuple[int, int]]):
        self.path, self.positions = path, positions

    def line(self, product_id: str) -> bytes:
        """The product's JSON line as written."""
        offset, length = self.positions[product_id]
        with open(self.path, "rb") as handle:
            handle.seek(offset)
            return handle.read(length)

    def __getitem__(self, product_id: str) -> Assessment:
        return Assessment.model_validate_json(self.line(product_id))

    def __iter__(self) -> Iterator[str]:
        return iter(self.positions)

    def __len__(self) -> int:
        return len(self.positions)


@dataclass
class BatchOutcome:
    """What a batch run produced, in manifest order.

    Attributes
    ----------
    ids : list of str
        Products in manifest order.
    assessments : Mapping
        id → Assessment of the products assessed (read back from ``results.jsonl`` on access).
    errors : dict
        id → one-line reason for the products that failed.
    internal : set of str
        Products whose failure was a defect of the tool, not of their input.
    reused : int
        Products taken unchanged from an earlier run (``resume``).
    stems : dict
        id → stem of the product's own files.
    report_failures : dict
        id → why its PDF report could not be rendered (a defect of the tool; the other reports are written).
    written : list of str
        Names of the files this run wrote in the output folder.
    leftovers : list of str
        Files an earlier run wrote there that this run did not (kept, or removed with ``clean``).
    cleaned : bool
        The leftovers were removed.
    """

    ids: list[str] = field(default_factory=list)
    assessments: Mapping[str, Assessment] = field(default_factory=dict)
    errors: dict[str, str] = field(default_factory=dict)
    internal: set[str] = field(default_factory=set)
    reused: int = 0
    stems: dict[str, str] = field(default_factory=dict)
    report_failures: dict[str, str] = field(default_factory=dict)
    written: list[str] = field(default_factory=list)
    leftovers: list[str] = field(default_factory=list)
    cleaned: bool = False

    @property
    def exit_code(self) -> int:
        """The batch's exit code.

        0 when every product was assessed, 3 when some failed on their input, 1 when the tool failed on one or on its
        report (after writing every other output).
        """
        if self.internal or self.report_failures:
            return EXIT_INTERNAL
        return EXIT_SOME_FAILED if self.errors else EXIT_OK


@dataclass(frozen=True)
class _Earlier:
    """Where an earlier run's result of a product sits, and what it was computed from."""

    path: str
    offset: int
    length: int
    inputs: str
    studies: bool
    identity: str

    def read(self) -> bytes:
        with open(self.path, "rb") as handle:
            handle.seek(self.offset)
            return handle.read(self.length)


@dataclass(frozen=True)
class _Product:
    """One product's outcome as a worker returns it: all the main process writes, nothing more."""

    product_id: str
    line: bytes | None
    summary: dict[str, Cell]
    claims: list[dict[str, Cell]]
    error: str | None = None
    internal: bool = False
    reused: bool = False
    pretty: bytes | None = None


def load_row(row: ManifestRow, allow_outside: bool = False) -> LoadedProduct:
    """Validate one manifest row and read its spectrum.

    The spectrum must lie inside the manifest's folder tree unless ``allow_outside``.

    Raises
    ------
    InputError
    """
    if row.problem is not None:
        raise row.problem
    record = record_from_fields(row.fields, path=row.origin, text=row.text)
    return product_from_record(record, row.base_dir, row.origin, row.inputs, root=None if allow_outside else row.root)


def failure_line(product_id: str, reason: str) -> bytes:
    """The ``results.jsonl`` line of a product that could not be assessed (``"status": "error"``).

    Examples
    --------
    >>> failure_line("LAMP-7", "lamp7.csv:3: not a number")
    b'{"id": "LAMP-7", "status": "error", "error": "lamp7.csv:3: not a number", "kind": "hazard.failure"}'
    """
    line = {"id": product_id, "status": "error", "error": reason, "kind": "hazard.failure"}
    return json.dumps(line, ensure_ascii=False).encode("utf-8")


def failure_reason(row: ManifestRow, exc: BaseException) -> tuple[str, bool]:
    """A product's failure as (one-line reason, whether it is a defect of the tool)."""
    if isinstance(exc, InputError):
        return str(exc), False
    if isinstance(exc, OSError):
        return str(
            InputError(
                f"cannot read input ({exc.strerror or type(exc).__name__})",
                "check the file and its permissions",
                row.origin,
            )
        ), False
    if isinstance(exc, ArithmeticError):
        return str(
            InputError(
                f"the computation left the range of numbers ({type(exc).__name__})",
                "check the record's distances and source size and the spectrum's unit",
                row.origin,
            )
        ), False
    return str(InputError(f"internal error ({type(exc).__name__}: {exc})", INTERNAL_FIX, row.origin)), True


def _digest(inputs: dict) -> str:
    return hashlib.sha256(json.dumps(dict(sorted(inputs.items())), sort_keys=True).encode()).hexdigest()


def _current_inputs(row: ManifestRow, allow_outside: bool) -> str | None:
    """Digest of the input hashes a fresh assessment of ``row`` would record.

    None when they cannot be known (the product is then assessed again, which names the problem).
    """
    spectrum = row.fields.get("spectrum")
    if row.problem is not None or not isinstance(spectrum, str) or not spectrum:
        return None
    try:
        record = record_from_fields(row.fields, path=row.origin, text=row.text)
        path = spectrum_path(record, row.base_dir, row.origin, None if allow_outside else row.root)
        raw = read_user_file(path, what="spectrum file", max_bytes=current_limits().max_bytes)
    except (InputError, OSError):
        return None
    return _digest({**row.inputs, spectrum: hashlib.sha256(raw).hexdigest()})


def _complete_lines(path: Path) -> Iterator[tuple[int, bytes]]:
    """(offset, line without its newline) of each complete line; a torn last line is left out."""
    offset = 0
    with open(path, "rb") as handle:
        for line in handle:
            if not line.endswith(b"\n"):
                return
            yield offset, line[:-1]
            offset += len(line)


def _previous_results(folder: Path) -> dict[str, _Earlier]:
    """Product id → where an earlier run's final or partial result is (the partial file wins).

    Lines that do not read as a result (torn, damaged, not UTF-8) are skipped and recomputed.
    """
    found: dict[str, _Earlier] = {}
    for path in (folder / RESULTS_NAME, folder / (RESULTS_NAME + PARTIAL_SUFFIX)):
        if not path.is_file():
            continue
        for offset, line in _complete_lines(path):
            try:
                result = json.loads(line)
                earlier = _Earlier(
                    str(path),
                    offset,
                    len(line),
                    _digest(result["provenance"]["inputs"]),
                    result.get("distances") is not None,
                    json.dumps(result["provenance"].get("identity"), sort_keys=True),
                )
                found[str(result["id"])] = earlier
            except (ValueError, KeyError, TypeError, AttributeError):
                continue
    return found


def _cut_torn_tail(path: Path) -> None:
    """Cut a partial file after its last complete line, so that appended lines start on a line of their own."""
    if not path.is_file():
        return
    size = path.stat().st_size
    with open(path, "rb+") as handle:
        keep = 0
        for offset, line in _complete_lines(path):
            keep = offset + len(line) + 1
        if keep < size:
            handle.truncate(keep)


@dataclass(frozen=True)
class _Job:
    """A chunk of rows for a worker, with what it needs to know of each."""

    rows: list[ManifestRow]
    stems: list[str]
    earlier: dict[str, _Earlier]
    studies: bool
    limit_set: LimitSet
    allow_outside: bool
    pretty: bool
    identity: ReportIdentity | None


def _finished(job: _Job, k: int, assessment: Assessment, line: bytes, reused: bool) -> _Product:
    row = job.rows[k]
    pretty = (assessment.model_dump_json(indent=2) + "\n").encode("utf-8") if job.pretty else None
    return _Product(
        row.product_id,
        line,
        summary_row(row.product_id, job.stems[k], assessment, None, job.limit_set),
        claim_rows(assessment),
        reused=reused,
        pretty=pretty,
    )


def _failed(job: _Job, k: int, exc: BaseException) -> _Product:
    row = job.rows[k]
    reason, internal = failure_reason(row, exc)
    return _Product(
        row.product_id,
        None,
        summary_row(row.product_id, job.stems[k], None, reason, job.limit_set, row.fields),
        [],
        reason,
        internal,
    )


def _reuse(job: _Job, k: int) -> _Product | None:
    """The earlier result of row ``k`` when its inputs are unchanged and it reads back; else None."""
    row = job.rows[k]
    earlier = job.earlier.get(row.product_id)
    identity = json.dumps(None if job.identity is None else job.identity.model_dump(), sort_keys=True)
    if (
        earlier is None
        or earlier.studies != job.studies
        or earlier.identity != identity
        or earlier.inputs != _current_inputs(row, job.allow_outside)
    ):
        return None
    try:
        line = earlier.read()
        assessment = Assessment.model_validate_json(line)
    except (OSError, ValueError):
        return None
    return _finished(job, k, assessment, line, reused=True) if assessment.id == row.product_id else None


def _assess(job: _Job, k: int, loaded: LoadedProduct, batch, position: int) -> _Product:
    """Product ``k``'s result, every failure caught at this product."""
    try:
        if batch is None:
            batch, position = evaluate_loaded([loaded], job.limit_set), 0
        assessment = build_assessment(loaded, batch, position, studies=job.studies, identity=job.identity)
        return _finished(job, k, assessment, assessment.model_dump_json().encode("utf-8"), reused=False)
    except Exception as exc:  # the boundary of one product: nothing it does stops the others
        return _failed(job, k, exc)


def _run_job(job: _Job) -> list[_Product]:
    """Worker: reuse, or load, assess and serialise, each row of a chunk.

    Top level, so a process pool can run it; every product's numbers are independent of the others in its
    chunk (:func:`hazard.method.integrals.integrate_spectra`), so any split of the work gives the same lines.
    """
    out: dict[int, _Product] = {}
    for k in range(len(job.rows)):
        if (earlier := _reuse(job, k)) is not None:
            out[k] = earlier
    loaded: dict[int, LoadedProduct] = {}
    for k, row in enumerate(job.rows):
        if k in out:
            continue
        try:
            loaded[k] = load_row(row, job.allow_outside)
        except Exception as exc:  # the boundary of one product
            out[k] = _failed(job, k, exc)
    batch = None
    if loaded:
        try:
            batch = evaluate_loaded(list(loaded.values()), job.limit_set)
        except Exception:  # one product broke the shared evaluation: evaluate each on its own
            batch = None
    for position, (k, product) in enumerate(loaded.items()):
        out[k] = _assess(job, k, product, batch, position)
    return [out[k] for k in range(len(job.rows))]


def _in_order(pool: Executor | None, work, jobs: Iterable, ahead: int) -> Iterator:
    """``work`` applied to each of ``jobs``, results in order.

    At most ``ahead`` are queued at a time, so a batch of any size holds only a few chunks in memory.
    """
    if pool is None:
        yield from map(work, jobs)
        return
    pending: deque = deque()
    for job in jobs:
        pending.append(pool.submit(work, job))
        if len(pending) >= ahead:
            yield pending.popleft().result()
    while pending:
        yield pending.popleft().result()


def _input_files(source: Path, rows: list[ManifestRow]) -> Iterator[Path]:
    """Every file the run reads: the manifest (or each record) and the spectra named."""
    records = source.is_dir()
    if not records:
        yield source
    for row in rows:
        if records:
            yield Path(row.origin)
        spectrum = row.fields.get("spectrum")
        if isinstance(spectrum, str) and spectrum and "\x00" not in spectrum:
            yield row.base_dir / spectrum


def _render_one(job: tuple[str, int, int, str]) -> str | None:
    """Worker: render one saved result to a PDF file (top level, so a process pool can call it).

    None when written, else why not (one product's report never stops the others').
    """
    from hazard.reports import render_assessment_pdf, report_time

    path, offset, length, target = job
    try:
        with open(path, "rb") as handle:
            handle.seek(offset)
            line = handle.read(length)
        write_atomic(Path(target), render_assessment_pdf(Assessment.model_validate_json(line), report_time()))
    except OSError:
        raise  # a full disk or a read-only folder stops the run with its one line
    except Exception as exc:  # the boundary of one report
        return f"{Path(target).name}: internal error while rendering ({type(exc).__name__}: {exc})"
    return None


def _write_pdfs(
    folder: Path, outcome: BatchOutcome, assessed: LazyAssessments, jobs: int, plan: list[PlanItem] | None
) -> None:
    from hazard.reports import render_summary_pdf, report_time
    from hazard.reports.fonts import report_fonts

    ids = [i for i in outcome.ids if i in assessed.positions]
    work = ((str(assessed.path), *assessed.positions[i], str(folder / f"{outcome.stems[i]}.pdf")) for i in ids)
    progress = Progress(len(ids), "reports")
    pool = None
    if jobs > 1 and len(ids) > 1:
        report_fonts()  # register the fonts once here; the workers inherit them
        pool = ProcessPoolExecutor(max_workers=jobs)
    try:
        for product_id, failure in zip(ids, _in_order(pool, _render_one, work, 4 * jobs), strict=True):
            if failure is not None:
                outcome.report_failures[product_id] = failure
            else:
                outcome.written.append(f"{outcome.stems[product_id]}.pdf")
            progress.advance()
    finally:
        if pool is not None:
            pool.shutdown(cancel_futures=True)
        progress.close()
    errors = [(i, outcome.errors[i]) for i in outcome.ids if i in outcome.errors]
    # the summary's renderer takes whole results: it holds one per assessed product while it ranks them
    write_atomic(
        folder / "summary.pdf",
        render_summary_pdf([assessed[i] for i in outcome.ids if i in assessed], errors, report_time(), plan),
    )
    outcome.written.append("summary.pdf")


def run_batch(
    source: str | Path,
    output_dir: str | Path,
    *,
    pdf: bool = False,
    jobs: int = 1,
    resume: bool = False,
    per_product_json: bool = False,
    studies: bool = False,
    allow_outside: bool = False,
    limit_set: LimitSet = DEFAULT_LIMIT_SET,
    clean: bool = False,
    identity: ReportIdentity | None = None,
    plan: bool = False,
    html: bool = False,
) -> BatchOutcome:
    """Assess every product of a manifest or folder of records.

    Parameters
    ----------
    source : str or Path
        CSV or .xlsx manifest, or a folder of TOML records.
    output_dir : str or Path
        Where the outputs go (created if needed): a new or empty folder, or one an earlier run of the same
        manifest wrote; never a folder holding the run's inputs.
    pdf : bool
        Also render one report per product and ``summary.pdf``.
    jobs : int
        Worker processes for reading and assessing products and for rendering PDFs.
    resume : bool
        Reuse results of an earlier (possibly interrupted) run whose input hashes are unchanged.
    per_product_json : bool
        Also write one ``STEM.json`` per product.
    studies : bool
        Also compute hazard distances and remedies per product (about 0.1 s each); the uncertainty study
        runs whenever a record states an uncertainty.
    allow_outside : bool
        Let spectrum paths lead outside the manifest's folder tree (absolute paths, ``..``).
    clean : bool
        Remove the files an earlier run wrote into the folder that this run did not write (they are listed in
        ``BatchOutcome.leftovers`` either way, and kept without ``clean``).
    identity : ReportIdentity, optional
        Who issues the reports: in every result's provenance and on every PDF page.
    html : bool
        Also write ``summary.html``, one self-contained page for the browser (linking the files this run wrote).
    plan : bool
        Also write the laboratory test plan (``plan.csv``, ``plan.xlsx``; a section of ``summary.pdf`` with ``pdf``).

    Returns
    -------
    BatchOutcome

    Raises
    ------
    InputError
        When the manifest itself is unusable, or the output folder cannot be used.
    """
    source, folder = Path(source), Path(output_dir)
    rows = read_manifest(source)
    ids = [row.product_id for row in rows]
    stems = file_stems(ids)
    outcome = BatchOutcome(ids=ids, stems=stems)
    with OutputFolder(folder, source, _input_files(source, rows)) as claimed:
        partial = folder / (RESULTS_NAME + PARTIAL_SUFFIX)
        previous = _previous_results(folder) if resume else {}
        if resume:
            _cut_torn_tail(partial)
        else:
            partial.unlink(missing_ok=True)
        chunks = (rows[k : k + CHUNK_PRODUCTS] for k in range(0, len(rows), CHUNK_PRODUCTS))
        work = (
            _Job(
                chunk,
                [stems[r.product_id] for r in chunk],
                {r.product_id: previous[r.product_id] for r in chunk if r.product_id in previous},
                studies,
                limit_set,
                allow_outside,
                per_product_json,
                identity,
            )
            for chunk in chunks
        )
        positions: dict[str, tuple[int, int]] = {}
        progress = Progress(len(rows), "products")
        pool = None
        if jobs > 1 and len(rows) > CHUNK_PRODUCTS:
            pool = ProcessPoolExecutor(max_workers=jobs)
        columns = summary_columns(limit_set)
        workbook = SummaryWorkbook(columns, CLAIM_COLUMNS, [c for c in columns if c.endswith("risk_group")])
        try:
            with (
                atomic_file(folder / RESULTS_NAME) as results,
                atomic_file(folder / SUMMARY_NAME) as summary,
                open(partial, "ab") as journal,
            ):
                text = io.StringIO()
                table = csv.writer(text, lineterminator="\n")
                table.writerow(columns)
                for chunk in _in_order(pool, _run_job, work, CHUNKS_AHEAD * jobs + 1):
                    for product in chunk:  # in manifest order
                        values = list(product.summary.values())
                        table.writerow([csv_cell(v) for v in values])
                        workbook.add_product(values)
                        for claim in product.claims:
                            workbook.add_claim([claim[c] for c in CLAIM_COLUMNS])
                        if product.error is not None:
                            outcome.errors[product.product_id] = product.error
                            if product.internal:
                                outcome.internal.add(product.product_id)
                            workbook.add_failure([product.summary[c] for c in FAILURE_COLUMNS])
                            results.write(failure_line(product.product_id, product.error) + b"\n")
                            continue
                        positions[product.product_id] = (results.tell(), len(product.line))
                        results.write(product.line + b"\n")
                        if product.reused:
                            outcome.reused += 1
                        else:
                            journal.write(product.line + b"\n")
                        if product.pretty is not None:
                            write_atomic(folder / f"{stems[product.product_id]}.json", product.pretty)
                            outcome.written.append(f"{stems[product.product_id]}.json")
                    summary.write(text.getvalue().encode("utf-8"))
                    text.seek(0)
                    text.truncate()
                    journal.flush()
                    os.fsync(journal.fileno())
                    progress.advance(len(chunk))
            outcome.written += [RESULTS_NAME, SUMMARY_NAME]
            workbook.save(folder / WORKBOOK_NAME)
            outcome.written.append(WORKBOOK_NAME)
        except OSError as exc:  # a full disk, a folder made read-only meanwhile: name the folder
            workbook.discard()
            if exc.filename is None:
                raise OSError(exc.errno, exc.strerror, str(folder)) from exc
            raise
        except BaseException:  # an interrupt, a defect: the unsaved workbook must not complain when collected
            workbook.discard()
            raise
        finally:
            if pool is not None:
                pool.shutdown(cancel_futures=True)
            progress.close()
        outcome.assessments = assessed = LazyAssessments(folder / RESULTS_NAME, positions)
        items = None
        if plan:
            errors = [(i, outcome.errors[i]) for i in outcome.ids if i in outcome.errors]
            items = rank_plan((assessed[i] for i in outcome.ids if i in assessed), errors)
            outcome.written += [p.name for p in write_plan_items(folder, items)]
        if pdf:
            _write_pdfs(folder, outcome, assessed, jobs, items)
        if html:
            from hazard.reports.html_summary import write_summary_html

            outcome.written.append(write_summary_html(outcome, folder).name)
        partial.unlink(missing_ok=True)
        outcome.leftovers = claimed.leftovers(outcome.written)
        if clean:
            claimed.remove(outcome.leftovers)
            outcome.cleaned = True
        claimed.record_outputs(outcome.written, kept=[] if clean else outcome.leftovers)
    return outcome
