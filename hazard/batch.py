"""``hazard batch``: many products from a manifest, one bad product never stopping the others.

Outputs in the output folder, all written atomically:

- ``results.jsonl``: one assessment JSON per line (the contract of ``hazard assess --format json``), in
  manifest order;
- ``summary.csv``: one row per product (id, status, group, completeness, per-hazard value, group and t_max,
  warning count, error), in manifest order;
- with ``pdf``: one report per product and ``summary.pdf``, a ranked overview.

While it runs, each finished chunk of assessments is appended to ``results.jsonl.partial`` and flushed to
disk. Killed half-way, a rerun with ``resume`` reads what is there (ignoring a torn last line), skips every
product whose input hashes are unchanged and ends with the same outputs as an uninterrupted run.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import re
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path

from hazard.atomic import write_atomic
from hazard.engine import build_assessment, evaluate_loaded
from hazard.errors import InputError
from hazard.formatting import NOT_DETERMINED
from hazard.inputs import LoadedProduct, product_from_record
from hazard.manifest import ManifestRow, read_manifest
from hazard.method.photometry import import_colour
from hazard.progress import Progress
from hazard.record import record_from_fields
from hazard.result import Assessment
from hazard.standards import DEFAULT_LIMIT_SET, LimitSet

__all__ = ["BatchOutcome", "run_batch", "summary_rows", "SUMMARY_NAME", "RESULTS_NAME", "EXIT_SOME_FAILED"]

RESULTS_NAME = "results.jsonl"
SUMMARY_NAME = "summary.csv"
PARTIAL_SUFFIX = ".partial"
EXIT_SOME_FAILED = 3
CHUNK_PRODUCTS = 128
"""Products loaded, assessed and flushed to the partial file at a time (one unit of work for a worker)."""


@dataclass
class BatchOutcome:
    """What a batch run produced, in manifest order."""

    ids: list[str] = field(default_factory=list)
    assessments: dict[str, Assessment] = field(default_factory=dict)
    errors: dict[str, str] = field(default_factory=dict)
    reused: int = 0

    @property
    def exit_code(self) -> int:
        """0 when every product was assessed, 3 when some failed."""
        return EXIT_SOME_FAILED if self.errors else 0


def load_row(row: ManifestRow) -> LoadedProduct:
    """Validate one manifest row and read its spectrum.

    Raises
    ------
    InputError
    """
    if row.problem is not None:
        raise row.problem
    record = record_from_fields(row.fields, path=row.origin, text=row.text)
    return product_from_record(record, row.base_dir, row.origin, row.inputs)


def _load_or_error(row: ManifestRow) -> LoadedProduct | str:
    try:
        return load_row(row)
    except InputError as exc:
        return str(exc)
    except OSError as exc:
        return f"{row.origin}: cannot read input ({exc.strerror or exc}); fix: check the file and its permissions"


def _current_inputs(row: ManifestRow) -> dict[str, str] | None:
    """The input hashes a fresh assessment of ``row`` would record, or None when they cannot be known."""
    spectrum = row.fields.get("spectrum")
    if row.problem is not None or not isinstance(spectrum, str):
        return None
    try:
        digest = hashlib.sha256((row.base_dir / spectrum).read_bytes()).hexdigest()
    except OSError:
        return None
    return dict(sorted({**row.inputs, spectrum: digest}.items()))


def _previous_results(folder: Path) -> dict[str, str]:
    """id → JSON line from an earlier run's final and partial results; a torn last line is ignored."""
    found: dict[str, str] = {}
    for path in (folder / RESULTS_NAME, folder / (RESULTS_NAME + PARTIAL_SUFFIX)):
        if not path.exists():
            continue
        for line in path.read_text(encoding="utf-8").splitlines():
            try:
                found[json.loads(line)["id"]] = line
            except (json.JSONDecodeError, KeyError, TypeError):
                continue
    return found


def _hazard_columns(limit_set: LimitSet) -> list[str]:
    return [f"{h.symbol}_{part}" for h in limit_set.hazards for part in ("value", "group", "t_max_s")]


def summary_rows(outcome: BatchOutcome, limit_set: LimitSet = DEFAULT_LIMIT_SET) -> list[dict]:
    """One summary row per product, in manifest order (the columns of ``summary.csv``)."""
    rows = []
    for product_id in outcome.ids:
        row = {"id": product_id, "status": "ok", "risk_group": "", "group_note": "", "complete": "", "basis": "",
               "what_if_distance_mm": "", "what_if_risk_group": "", "warning_count": "",
               "claims_contradicted": "", "claims": "", "uncertainty": "", "group_range": "",
               "min_distance_exempt_mm": "", "error": ""}
        row.update(dict.fromkeys(_hazard_columns(limit_set), ""))
        if product_id in outcome.errors:
            row.update(status="error", error=outcome.errors[product_id])
        else:
            a = outcome.assessments[product_id]
            group = a.classification_group
            row.update(risk_group=group or NOT_DETERMINED, complete=str(a.complete).lower(), basis=a.basis,
                       group_note="" if a.complete or group is None else "lower bound")
            if a.basis == "what-if":
                row.update(what_if_distance_mm=repr(a.assessment_distance_mm),
                           what_if_risk_group=a.risk_group or NOT_DETERMINED)
            row.update(
                       warning_count=len(a.warnings),
                       claims_contradicted=sum(c.verdict == "contradicted" for c in a.claims),
                       claims="; ".join(f"{c.field}: {c.verdict}" for c in a.claims))
            if a.uncertainty is not None:
                row.update(uncertainty=a.uncertainty.verdict,
                           group_range=f"{a.uncertainty.risk_group_low}-{a.uncertainty.risk_group_high}")
            if a.distances is not None and "Exempt" in a.distances.minimum_distance_mm:
                found = a.distances.minimum_distance_mm["Exempt"]
                row["min_distance_exempt_mm"] = (repr(found) if found is not None else
                                                 f"not within {a.distances.distance_mm[-1]:.0f}")
            for symbol, h in a.hazards.items():
                row[f"{symbol}_value"] = "" if h.value is None else repr(h.value)
                row[f"{symbol}_group"] = h.risk_group or ("not assessed" if not h.assessed else "")
                row[f"{symbol}_t_max_s"] = "" if h.t_max_s is None else repr(h.t_max_s)
        rows.append(row)
    return rows


def _summary_csv(outcome: BatchOutcome, limit_set: LimitSet) -> bytes:
    columns = ["id", "status", "risk_group", "group_note", "complete", "basis", "what_if_distance_mm",
               "what_if_risk_group",
               *_hazard_columns(limit_set), "warning_count", "claims_contradicted", "claims", "uncertainty",
               "group_range", "min_distance_exempt_mm", "error"]
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=columns, lineterminator="\n")
    writer.writeheader()
    writer.writerows(summary_rows(outcome, limit_set))
    return buffer.getvalue().encode("utf-8")


def safe_file_stem(product_id: str) -> str:
    """A file name stem from a product id: letters, digits, '.', '-' and '_' kept, the rest as '_'."""
    return re.sub(r"[^A-Za-z0-9._-]", "_", product_id).strip(".") or "product"


def _render_one(job: tuple[str, str]) -> None:
    """Worker: render one saved result to a PDF file (top level, so a process pool can call it)."""
    from reports import render_assessment_pdf, report_time

    text, target = job
    write_atomic(Path(target), render_assessment_pdf(Assessment.model_validate_json(text), report_time()))


def _write_pdfs(folder: Path, outcome: BatchOutcome, lines: dict[str, str], jobs: int) -> None:
    from reports import render_summary_pdf, report_time
    from reports.fonts import report_fonts

    work = [(lines[i], str(folder / f"{safe_file_stem(i)}.pdf")) for i in outcome.ids if i in lines]
    progress = Progress(len(work), "reports")
    if jobs > 1 and len(work) > 1:
        report_fonts()  # register the fonts once here; the workers inherit them
        with ProcessPoolExecutor(max_workers=jobs) as pool:
            for _ in pool.map(_render_one, work, chunksize=4):
                progress.advance()
    else:
        for job in work:
            _render_one(job)
            progress.advance()
    progress.close()
    errors = [(i, outcome.errors[i]) for i in outcome.ids if i in outcome.errors]
    assessments = [outcome.assessments[i] for i in outcome.ids if i in outcome.assessments]
    write_atomic(folder / "summary.pdf", render_summary_pdf(assessments, errors, report_time()))


def _assess_chunk(job: tuple[list[ManifestRow], bool, LimitSet]) -> list[tuple[str, str | None, str | None]]:
    """Worker: load, assess and serialise a chunk of rows → (id, JSON line or None, error or None) each.

    Top level, so a process pool can run it; every product's numbers are independent of the others in its
    chunk (:func:`hazard.method.integrals.integrate_spectra`), so any split of the work gives the same lines.
    """
    rows, studies, limit_set = job
    loaded = [_load_or_error(row) for row in rows]
    good = [item for item in loaded if isinstance(item, LoadedProduct)]
    batch = evaluate_loaded(good, limit_set) if good else None
    out, position = [], 0
    for row, item in zip(rows, loaded):
        if isinstance(item, str):
            out.append((row.product_id, None, item))
            continue
        out.append((row.product_id, build_assessment(item, batch, position, studies=studies).model_dump_json(),
                    None))
        position += 1
    return out


def run_batch(source: str | Path, output_dir: str | Path, *, pdf: bool = False, jobs: int = 1,
              resume: bool = False, per_product_json: bool = False, studies: bool = False,
              limit_set: LimitSet = DEFAULT_LIMIT_SET) -> BatchOutcome:
    """Assess every product of a manifest or folder of records.

    Parameters
    ----------
    source : str or Path
        CSV or .xlsx manifest, or a folder of TOML records.
    output_dir : str or Path
        Where the outputs go (created if needed).
    pdf : bool
        Also render one report per product and ``summary.pdf``.
    jobs : int
        Worker processes for reading and assessing products and for rendering PDFs.
    resume : bool
        Reuse results of an earlier (possibly interrupted) run whose input hashes are unchanged.
    per_product_json : bool
        Also write one ``ID.json`` per product.
    studies : bool
        Also compute hazard distances and remedies per product (about 0.1 s each); the uncertainty study
        runs whenever a record states an uncertainty.

    Returns
    -------
    BatchOutcome

    Raises
    ------
    InputError
        When the manifest itself is unusable.
    """
    rows = read_manifest(source)
    folder = Path(output_dir)
    folder.mkdir(parents=True, exist_ok=True)
    partial = folder / (RESULTS_NAME + PARTIAL_SUFFIX)
    previous = _previous_results(folder) if resume else {}
    if not resume:
        partial.unlink(missing_ok=True)
    outcome = BatchOutcome(ids=[row.product_id for row in rows])
    lines: dict[str, str] = {}
    todo = []
    for row in rows:
        line = previous.get(row.product_id)
        earlier = json.loads(line) if line is not None else None
        if (earlier is not None and earlier["provenance"]["inputs"] == _current_inputs(row)
                and (earlier.get("distances") is not None) == studies):
            lines[row.product_id] = line
            outcome.assessments[row.product_id] = Assessment.model_validate_json(line)
            outcome.reused += 1
        else:
            todo.append(row)
    progress = Progress(len(rows), "products")
    progress.advance(outcome.reused)
    chunks = [(todo[k:k + CHUNK_PRODUCTS], studies, limit_set) for k in range(0, len(todo), CHUNK_PRODUCTS)]
    pool = None
    if jobs > 1 and len(chunks) > 1:
        import_colour()  # once here, inherited by the workers instead of imported by each
        pool = ProcessPoolExecutor(max_workers=jobs)
    try:
        with open(partial, "a", encoding="utf-8") as sink:
            results = pool.map(_assess_chunk, chunks) if pool is not None else map(_assess_chunk, chunks)
            for chunk_result in results:  # in order, so the partial file grows in manifest order
                for product_id, line, error in chunk_result:
                    if error is not None:
                        outcome.errors[product_id] = error
                        continue
                    lines[product_id] = line
                    outcome.assessments[product_id] = Assessment.model_validate_json(line)
                    sink.write(line + "\n")
                sink.flush()
                os.fsync(sink.fileno())
                progress.advance(len(chunk_result))
    finally:
        if pool is not None:
            pool.shutdown(cancel_futures=True)
        progress.close()
    write_atomic(folder / RESULTS_NAME,
                 "".join(lines[i] + "\n" for i in outcome.ids if i in lines).encode("utf-8"))
    write_atomic(folder / SUMMARY_NAME, _summary_csv(outcome, limit_set))
    if per_product_json:
        for product_id, assessment in outcome.assessments.items():
            write_atomic(folder / f"{safe_file_stem(product_id)}.json",
                         (assessment.model_dump_json(indent=2) + "\n").encode("utf-8"))
    if pdf:
        _write_pdfs(folder, outcome, lines, jobs)
    partial.unlink(missing_ok=True)
    return outcome
