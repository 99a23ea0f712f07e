"""The ``hazard`` command line.

Exit codes: 0 assessed; 1 internal error (traceback with ``--debug``); 2 bad input or usage (one line on
stderr). Heavy libraries (pandas, reportlab, colour-science) are imported inside the commands that use
them, so ``hazard --help`` answers fast.
"""

from __future__ import annotations

import csv
import dataclasses
import errno
import json
import os
import sys
import traceback
from collections.abc import Callable
from functools import partial
from pathlib import Path
from typing import TYPE_CHECKING, Any

import click

from hazard._version import __version__
from hazard.cli_options import ModelOptionsCommand, pop_identity, record_overrides
from hazard.exit_codes import EXIT_CONTRADICTED, EXIT_INPUT, EXIT_INTERNAL, EXIT_OK, EXIT_SOME_FAILED
from hazard.output.atomic import remove_stale_temporaries, write_atomic

if TYPE_CHECKING:
    from hazard.inputs.manifest import ManifestRow
    from hazard.result import Assessment

SCREEN_LEFTOVERS = 20
"""Leftover files of an earlier run named on screen (the rest are counted)."""
SCREEN_PRODUCTS = 200
"""A batch table on screen lists at most this many products; summary.csv has them all [1]."""
SCREEN_PLAN_ITEMS = 25
"""``hazard plan`` shows at most this many items on screen; plan.csv and plan.xlsx have them all [1]."""
MAX_RESULT_BYTES = 64 * 1024 * 1024
"""Largest saved result read by ``hazard report`` [bytes]."""

_ALLOW_OUTSIDE = click.option(
    "--allow-outside",
    is_flag=True,
    help="Let records and manifests name spectra outside their own folder (absolute paths, '..'): only for "
    "files you trust.",
)


class _Group(click.Group):
    """Turns input errors into one line and exit 2, anything else into exit 1."""

    def invoke(self, ctx: click.Context):
        from hazard.errors import InputError

        try:
            return super().invoke(ctx)
        except InputError as exc:
            click.echo(f"hazard: error: {exc}", err=True)
            ctx.exit(EXIT_INPUT)
        except click.UsageError as exc:  # one line, as every other refusal
            command = exc.ctx.command_path if exc.ctx is not None else "hazard"
            click.echo(f"hazard: error: {exc.format_message().rstrip('.')}; fix: see '{command} --help'", err=True)
            ctx.exit(EXIT_INPUT)
        except (click.exceptions.Exit, click.exceptions.Abort, click.ClickException):
            raise
        except BrokenPipeError:  # output piped into e.g. `head`, which stopped reading
            os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
            ctx.exit(EXIT_OK)
        except OSError as exc:  # mostly writing the outputs: a full disk, a read-only folder
            click.echo(f"hazard: error: {_os_error_text(exc)}", err=True)
            ctx.exit(EXIT_INPUT)
        except Exception as exc:  # the last line of defence, reported as internal
            if ctx.obj and ctx.obj.get("debug"):
                traceback.print_exc()
            else:
                click.echo(
                    f"hazard: internal error: {type(exc).__name__}: {exc} (rerun with --debug for "
                    f"the traceback, and please report it)",
                    err=True,
                )
            ctx.exit(EXIT_INTERNAL)


def _os_error_text(exc: OSError) -> str:
    """An operating-system error (mostly while writing the outputs) as one line with the fix."""
    from hazard.errors import InputError

    writing = {
        errno.ENOSPC: "free disk space and run again (a batch continues with --resume)",
        errno.EDQUOT: "free space within your quota and run again (a batch continues with --resume)",
        errno.EFBIG: "write to a file system that takes larger files",
        errno.EROFS: "write to a folder on a writable file system",
    }
    if exc.errno in writing:
        problem, fix = f"cannot write: {exc.strerror}", writing[exc.errno]
    elif exc.errno in (errno.EACCES, errno.EPERM):
        problem, fix = f"permission denied ({exc.strerror})", "use files and folders you may read and write"
    else:
        problem, fix = f"file system error: {exc.strerror or type(exc).__name__}", "check the files and free space"
    return str(InputError(problem, fix, None if exc.filename is None else os.fsdecode(exc.filename)))


def _refuse_overwriting_inputs(outputs: list[Path | None], inputs: list[Path]) -> None:
    """An output path must not be an input, nor two outputs one file.

    Raises
    ------
    InputError
    """
    from hazard.errors import InputError

    given = [p for p in outputs if p is not None]
    real = {os.path.realpath(p) for p in inputs}
    for k, path in enumerate(given):
        here = os.path.realpath(path)
        if here in real:
            raise InputError("the output would replace an input file", "name another output file", str(path))
        if any(os.path.realpath(other) == here for other in given[:k]):
            raise InputError("two outputs name the same file", "give --output and --pdf different files", str(path))


@click.group(cls=_Group, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="hazard")
@click.option("--debug", is_flag=True, help="Show tracebacks of internal errors.")
@click.pass_context
def main(ctx: click.Context, debug: bool) -> None:
    """Photobiological safety pre-screen of lamps (IEC 62471 / CIE S 009 method).

    A pre-screen, not a certification: final classification belongs to an accredited laboratory.
    """
    ctx.obj = {"debug": debug}


@main.command(cls=ModelOptionsCommand, record=True, identity=True)
@click.argument("product", type=click.Path(dir_okay=False, path_type=Path))
@click.option(
    "--format",
    "output_format",
    type=click.Choice(["text", "json"]),
    default="text",
    show_default=True,
    help="Output format.",
)
@click.option(
    "--output",
    type=click.Path(dir_okay=False, path_type=Path),
    help="Write the output to this file (atomically) instead of the terminal.",
)
@click.option(
    "--pdf",
    "pdf_path",
    type=click.Path(dir_okay=False, path_type=Path),
    help="Also render the PDF report to this file.",
)
@_ALLOW_OUTSIDE
def assess(
    product: Path, output_format: str, output: Path | None, pdf_path: Path | None, allow_outside: bool, **options: Any
) -> None:
    """Assess one product: RECORD.toml, or a spectrum file with record options.

    Example: hazard assess lamp.csv --distance-mm 200 --source-diameter-mm 5
    """
    from hazard.assessment.build import assess as run_assessment
    from hazard.inputs.loading import load_product
    from hazard.inputs.settings import report_identity

    identity = report_identity(pop_identity(options))
    loaded = load_product(product, record_overrides(options), allow_outside=allow_outside)
    spectrum = (product.parent / loaded.record.spectrum) if loaded.record.spectrum else product
    _refuse_overwriting_inputs([output, pdf_path], [product, spectrum])
    assessment = run_assessment(loaded, identity=identity)
    if pdf_path is not None:
        _write_report(assessment, pdf_path)
    if output_format == "json":
        text = assessment.model_dump_json(indent=2) + "\n"
    else:
        from hazard.output.text import render_text

        text = render_text(assessment)
    if output is None:
        click.echo(text, nl=False)
    else:
        _write_file(output, text.encode("utf-8"))
        from hazard.output.formatting import group_words

        a = assessment
        words = group_words(a.risk_group, a.complete, a.basis, a.assessment_distance_mm)
        if a.basis == "what-if":
            words += f"; at the standard's distance: {group_words(a.standard_risk_group, a.complete)}"
        click.echo(f"wrote {output} ({a.id}: {words})", err=True)


def _write_file(path: Path, data: bytes) -> None:
    """Write one output atomically, first removing what a killed run left while writing the same file."""
    remove_stale_temporaries(path.parent, path.name)
    write_atomic(path, data)


def _write_report(assessment, pdf_path: Path) -> None:
    from hazard.reports import render_assessment_pdf, report_time

    _write_file(pdf_path, render_assessment_pdf(assessment, report_time()))
    click.echo(f"wrote {pdf_path}", err=True)


@main.command(cls=ModelOptionsCommand, identity=True)
@click.argument("result", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--output", type=click.Path(dir_okay=False, path_type=Path), required=True, help="PDF file to write.")
@click.option("--id", "product_id", help="With a results.jsonl of 'hazard batch': the product to render.")
def report(result: Path, output: Path, product_id: str | None, **options: str | None) -> None:
    """Render the PDF report of a saved result, without recomputing it.

    The result comes from `hazard assess --format json`, or is one product of a batch's results.jsonl with --id. It is
    checked first: unchanged since it was made, and its groups must follow from its own values and limits.
    """
    from hazard.assessment.verify import check_result

    _refuse_overwriting_inputs([output], [result])
    assessment = _load_result(result, product_id)
    check_result(assessment, str(result))
    given = {k: v for k, v in pop_identity(options).items() if v is not None}
    if given:  # the options replace the stored identity's fields, for this rendering only
        from hazard.result import ReportIdentity

        stored = assessment.provenance.identity
        identity = ReportIdentity.model_validate({**(stored.model_dump() if stored else {}), **given})
        assessment = assessment.model_copy(
            update={"provenance": assessment.provenance.model_copy(update={"identity": identity})}
        )
    _write_report(assessment, output)


def _result_line(path: Path, product_id: str, fix: str) -> tuple[bytes, int]:
    """The line of a JSON-lines file whose id is ``product_id``.

    Read one line at a time (a batch's results can be large).
    """
    from hazard.errors import InputError
    from hazard.inputs.userfiles import regular_file_size

    regular_file_size(path, what="results file", display=str(path), fix_missing=fix)
    with open(path, "rb") as handle:
        for number, line in enumerate(handle, start=1):
            try:
                found = json.loads(line)
                if found.get("id") != product_id:
                    continue
            except (ValueError, AttributeError):
                continue
            if found.get("status") == "error":
                raise InputError(
                    f"product {product_id!r} could not be assessed in that batch: {found.get('error')}",
                    "correct its input and run the batch again",
                    str(path),
                    number,
                )
            return line, number
    raise InputError(f"no result with id {product_id!r}", "check the id (see summary.csv)", str(path))


def _load_result(path: Path, product_id: str | None):
    """A saved assessment: the whole JSON file, or the line of a JSON-lines file whose id is ``product_id``."""
    from pydantic import ValidationError

    from hazard.assessment.guard import first_non_finite
    from hazard.errors import InputError
    from hazard.inputs.userfiles import read_user_file
    from hazard.result import Assessment

    fix = "give a JSON file written by 'hazard assess --format json', or a results.jsonl with --id"
    line_number = None
    if product_id is None:
        raw = read_user_file(
            path,
            what="result file",
            max_bytes=MAX_RESULT_BYTES,
            fix_missing=fix,
            fix_large="give one result written by 'hazard assess --format json', or --id",
        )
        lines = raw.strip().splitlines()
        if len(lines) > 1 and all(line.startswith(b"{") and line.endswith(b"}") for line in lines):
            # one product per line (a batch's results.jsonl): say which option picks one
            raise InputError(
                f"a results file of {len(lines)} lines, one product each", "name the product with --id", str(path)
            )
    else:
        raw, line_number = _result_line(path, product_id, fix)
    try:
        assessment = Assessment.model_validate_json(raw)
    except ValidationError as exc:
        first = exc.errors()[0]
        where = ".".join(map(str, first["loc"])) or "the top level"
        raise InputError(
            f"not an assessment result of this tool version ({first['msg']} at {where})", fix, str(path), line_number
        ) from None
    found = first_non_finite(assessment.model_dump())
    if found is not None:
        raise InputError(f"not an assessment result: {found[0]} is {found[1]}", fix, str(path), line_number)
    return assessment


def _finish_batch(outcome, output: Path, pdf: bool) -> None:
    from hazard.output.text import render_batch_table

    shown = outcome.ids[:SCREEN_PRODUCTS]
    click.echo(
        render_batch_table(
            shown,
            {i: outcome.assessments[i] for i in shown if i in outcome.assessments},
            {i: outcome.errors[i] for i in shown if i in outcome.errors},
        ),
        nl=False,
    )
    if len(outcome.ids) > len(shown):
        click.echo(f"… and {len(outcome.ids) - len(shown)} more products: every one is in summary.csv")
    written = "results.jsonl, summary.csv, summary.xlsx"
    written += ", plan.csv, plan.xlsx" if "plan.csv" in outcome.written else ""
    written += ", one PDF per product and summary.pdf" if pdf else ""
    click.echo(
        f"\n{len(outcome.assessments)} assessed ({outcome.reused} reused), {len(outcome.errors)} failed; "
        f"wrote {written} in {output} (listed in outputs.json)"
    )
    if outcome.leftovers:
        names = ", ".join(outcome.leftovers[:SCREEN_LEFTOVERS])
        more = (
            f" and {len(outcome.leftovers) - SCREEN_LEFTOVERS} more"
            if len(outcome.leftovers) > SCREEN_LEFTOVERS
            else ""
        )
        action = "removed (--clean)" if outcome.cleaned else "kept; --clean removes them"
        click.echo(
            f"{len(outcome.leftovers)} file(s) of an earlier run are not part of this one ({action}): {names}{more}"
        )
    if outcome.internal:
        click.echo(
            f"hazard: internal error on {len(outcome.internal)} product(s), recorded in summary.csv; please report it",
            err=True,
        )
    for failure in outcome.report_failures.values():
        click.echo(f"hazard: {failure}; please report it", err=True)
    from hazard.assessment.cautions import PRE_SCREEN

    click.echo(f"Caution: {PRE_SCREEN}")


@main.command(cls=ModelOptionsCommand, identity=True)
@click.argument("manifest", type=click.Path(path_type=Path))
@click.option(
    "--output",
    type=click.Path(file_okay=False, path_type=Path),
    required=True,
    help="Folder for results.jsonl, summary.csv and the PDFs.",
)
@click.option("--pdf", is_flag=True, help="Also write one PDF per product and summary.pdf.")
@click.option(
    "--jobs",
    type=click.IntRange(min=1),
    default=1,
    show_default=True,
    help="Worker processes for reading spectra and rendering PDFs.",
)
@click.option(
    "--resume",
    is_flag=True,
    help="Continue an interrupted run: skip products whose inputs are unchanged since they were assessed.",
)
@click.option("--studies", is_flag=True, help="Also compute hazard distances and remedies (about 0.1 s per product).")
@click.option(
    "--plan",
    "lab_plan",
    is_flag=True,
    help="Also write the laboratory test plan (plan.csv, plan.xlsx; a section of summary.pdf with --pdf).",
)
@click.option(
    "--clean",
    is_flag=True,
    help="Remove the files an earlier run wrote into the folder that this run did not (they are listed either way).",
)
@_ALLOW_OUTSIDE
@click.option(
    "--html",
    is_flag=True,
    help="Also write summary.html, a self-contained page for the browser, and one JSON per product.",
)
def batch(
    manifest: Path,
    output: Path,
    pdf: bool,
    jobs: int,
    resume: bool,
    studies: bool,
    lab_plan: bool,
    clean: bool,
    allow_outside: bool,
    html: bool,
    **options: str | None,
) -> None:
    """Assess every product of a CSV/.xlsx manifest or a folder of TOML records.

    The output folder must be new, empty, or written by an earlier run of the same manifest; it may not hold
    the run's inputs (name a new sub-folder instead), and one run at a time writes into it. Files an earlier run
    wrote there and this one did not are listed, and removed only with --clean. outputs.json lists what the run
    wrote.

    Exit code 0 when all were assessed, 3 when some failed, 2 when the manifest or the output folder is
    unusable, 1 when the tool failed on a product (every output is still written).
    """
    from hazard.assessment.batch import run_batch
    from hazard.inputs.settings import report_identity

    outcome = run_batch(
        manifest,
        output,
        pdf=pdf,
        jobs=jobs,
        resume=resume,
        studies=studies,
        allow_outside=allow_outside,
        clean=clean,
        identity=report_identity(pop_identity(options)),
        plan=lab_plan,
        per_product_json=html,
        html=html,
    )
    _finish_batch(outcome, output, pdf)
    sys.exit(outcome.exit_code)


def _lineup_folder() -> Path:
    """The bundled line-up, package data of the installed tool."""
    from importlib import resources

    return Path(str(resources.files("hazard.lineup")))


@main.command(cls=ModelOptionsCommand, identity=True)
@click.option(
    "--output",
    type=click.Path(file_okay=False, path_type=Path),
    default=Path("hazard-demo"),
    show_default=True,
    help="Folder for the demo's reports.",
)
@click.option(
    "--jobs", type=click.IntRange(min=1), default=1, show_default=True, help="Worker processes for rendering PDFs."
)
@click.option("--html", is_flag=True, help="Also write summary.html, a self-contained page for the browser.")
def demo(output: Path, jobs: int, html: bool, **options: str | None) -> None:
    """Assess the bundled line-up of invented products (Corvel Lightworks, a made-up company).

    One PDF and one JSON per product, a summary CSV and summary.pdf.
    """
    from hazard.assessment.batch import run_batch

    lineup = _lineup_folder()
    click.echo("Demo: invented products of Corvel Lightworks, a made-up company; no real product or measurement.\n")
    from hazard.inputs.settings import report_identity

    identity = report_identity(pop_identity(options))
    outcome = run_batch(
        lineup, output, pdf=True, jobs=jobs, per_product_json=True, studies=True, identity=identity, html=html
    )
    _finish_batch(outcome, output, pdf=True)
    sys.exit(outcome.exit_code)


def _products(
    source: Path, allow_outside: bool, tolerances, overrides: dict | None = None
) -> list[tuple[ManifestRow, Callable[[], Assessment]]]:
    """The products of a record, a spectrum file, a manifest or a folder of records, each with its run.

    ``overrides`` (record options) replace the record's values, or every row's. Assessing is left to the caller,
    one product at a time, so that one failure never stops the others.
    """
    from hazard.assessment.batch import load_row
    from hazard.assessment.build import assess as run_assessment
    from hazard.inputs.loading import load_product
    from hazard.inputs.manifest import ManifestRow, is_manifest, read_manifest

    if not is_manifest(source):
        return [
            (
                ManifestRow(str(source), {}, source.parent, {}),
                lambda: run_assessment(
                    load_product(source, overrides, allow_outside=allow_outside), tolerances=tolerances
                ),
            )
        ]

    def assess_row(row: ManifestRow) -> Assessment:
        if overrides:  # the options replace every row's own values
            row = dataclasses.replace(row, fields={**row.fields, **overrides})
        return run_assessment(load_row(row, allow_outside), tolerances=tolerances)

    return [(row, partial(assess_row, row)) for row in read_manifest(source)]


def _row_label(row: ManifestRow) -> str:
    """A product in a message: its id, or the stem of its file when the id is not known."""
    from hazard.errors import one_line

    return one_line(row.product_id if row.fields else Path(row.origin).stem, 80)


@main.command(cls=ModelOptionsCommand, record=True)
@click.argument("source", type=click.Path(path_type=Path))
@click.option(
    "--format",
    "output_format",
    type=click.Choice(["text", "csv", "json"]),
    default="text",
    show_default=True,
    help="text: a table per product; csv or json (one object per line): the claims alone, one row per claim.",
)
@click.option("--cct-tolerance-k", type=float, default=150.0, show_default=True, help="CCT tolerance [K].")
@click.option(
    "--cct-tolerance-pct",
    type=float,
    default=5.0,
    show_default=True,
    help="CCT tolerance [% of the claim]; the larger of the two applies.",
)
@click.option(
    "--illuminance-tolerance-pct", type=float, default=10.0, show_default=True, help="Illuminance tolerance [%]."
)
@click.option(
    "--t-max-tolerance-pct",
    type=float,
    default=10.0,
    show_default=True,
    help="A claimed t_max longer than computed by more than this fails [%].",
)
@_ALLOW_OUTSIDE
def check(
    source: Path,
    output_format: str,
    cct_tolerance_k: float,
    cct_tolerance_pct: float,
    illuminance_tolerance_pct: float,
    t_max_tolerance_pct: float,
    allow_outside: bool,
    **options: Any,
) -> None:
    """Check vendor claims of a RECORD.toml, a spectrum file, a CSV/.xlsx manifest or a folder of records.

    Every record field is an option (as for ``hazard assess``): it replaces the record's value, or every row's.

    The claims are claimed_risk_group, claimed_cct_k, claimed_illuminance_lx and claimed_t_max_s_*, the group and
    t_max at claimed_distance_mm (the standard's distance when not stated). Each is checked across the record's
    stated uncertainty: consistent (holds at every variant), inconclusive (holds at some, fails at others),
    contradicted (fails at every one) or not checkable. A count of each ends the output (on stderr for csv/json).

    Exit code 4 when any claim is contradicted (so a pipeline can gate on it; inconclusive claims do not), 3 when
    a product of a manifest could not be assessed, 2 for unusable input (a single product's included), 1 when the tool
    failed on a product, else 0.
    """
    from hazard.assessment.batch import failure_reason
    from hazard.assessment.claims import ClaimTolerances
    from hazard.errors import InputError
    from hazard.inputs.manifest import is_manifest
    from hazard.output.text import render_claims

    tolerances = ClaimTolerances(cct_tolerance_k, cct_tolerance_pct, illuminance_tolerance_pct, t_max_tolerance_pct)
    single = not is_manifest(source)
    from hazard.assessment.claims import verdict_counts
    from hazard.output.claim_rows import CLAIM_COLUMNS, claim_rows

    failed = internal = False
    claims = []
    table = csv.DictWriter(sys.stdout, CLAIM_COLUMNS, lineterminator="\n") if output_format == "csv" else None
    if table is not None:
        table.writeheader()
    products = 0
    items = _products(source, allow_outside, tolerances, record_overrides(options))
    for row, run in items:
        try:
            assessment = run()
        except Exception as exc:  # the boundary of one product: nothing it does stops the others
            if single and isinstance(exc, InputError):  # one product's bad input is the command's (exit 2)
                raise
            reason, defect = failure_reason(row, exc)
            failed, internal = True, internal or defect
            click.echo(f"{_row_label(row)}: error: {reason}", err=True)
            continue
        products += 1
        claims += assessment.claims
        if table is not None:
            table.writerows(claim_rows(assessment))
            continue
        if output_format == "json":
            for claim in claim_rows(assessment):
                click.echo(json.dumps(claim, ensure_ascii=False))
            continue
        from hazard.output.formatting import format_distance_mm, group_words

        what_if = (
            f"; the record's what-if at {format_distance_mm(assessment.assessment_distance_mm)} gives "
            f"{group_words(assessment.risk_group, assessment.complete)}, not used for claims"
            if assessment.basis == "what-if"
            else ""
        )
        click.echo(
            f"{assessment.id}: computed {group_words(assessment.classification_group, assessment.complete)} "
            f"at the standard's distance{what_if}"
        )
        click.echo("\n".join(render_claims(assessment)) if assessment.claims else "  no claims in the record")
        click.echo("")
    counts = verdict_counts(claims)
    errors = len(items) - products
    click.echo(
        f"{len(claims)} claim(s) of {products} product(s): "
        + ", ".join(f"{n} {verdict}" for verdict, n in counts.items())
        + (f"; {errors} product(s) could not be assessed" if errors else ""),
        err=output_format != "text",
    )
    if output_format == "text":
        from hazard.assessment.cautions import PRE_SCREEN

        click.echo(f"Caution: {PRE_SCREEN}")
    sys.exit(
        EXIT_INTERNAL
        if internal
        else EXIT_CONTRADICTED
        if counts["contradicted"]
        else (EXIT_SOME_FAILED if failed else EXIT_OK)
    )


@main.command()
@click.argument("source", type=click.Path(path_type=Path))
@click.option(
    "--output",
    type=click.Path(file_okay=False, path_type=Path),
    required=True,
    help="Folder for plan.csv and plan.xlsx (made if missing; earlier plan files there are replaced).",
)
@_ALLOW_OUTSIDE
def plan(source: Path, output: Path, allow_outside: bool) -> None:
    """What to ask the laboratory, ranked: for a RECORD.toml, a CSV/.xlsx manifest or a folder of records.

    Per product: hazards not assessed and the wavelength range to add, borderline hazards and the uncertainty that
    settles them, imaging radiance measurements for small or non-uniform sources, the assessment distance, and
    vendor claims left open. Items that could raise a group come first. Writes plan.csv and plan.xlsx.

    Exit code 3 when a product could not be assessed (it gets a "fix input" row), 2 for unusable input, 1 when the
    tool failed on a product, else 0.
    """
    from hazard.assessment.batch import failure_reason
    from hazard.assessment.cautions import PRE_SCREEN
    from hazard.assessment.claims import DEFAULT_TOLERANCES
    from hazard.assessment.lab_plan import rank_plan
    from hazard.output.plan_files import PLAN_CSV, PLAN_XLSX, write_plan_items
    from hazard.output.plan_text import render_plan_table

    products = _products(source, allow_outside, DEFAULT_TOLERANCES)
    inputs = _plan_inputs(source, products)
    assessments: list[Assessment] = []
    errors: list[tuple[str, str]] = []
    internal = False
    for row, run in products:
        try:
            assessment = run()
        except Exception as exc:  # the boundary of one product: nothing it does stops the others
            reason, defect = failure_reason(row, exc)
            internal |= defect
            errors.append((_row_label(row), reason))
            click.echo(f"{_row_label(row)}: error: {reason}", err=True)
            continue
        assessments.append(assessment)
        inputs.append(row.base_dir / assessment.spectrum.path)
    _refuse_overwriting_inputs([output / PLAN_CSV, output / PLAN_XLSX], inputs)
    items = rank_plan(assessments, errors)
    written = write_plan_items(output, items)
    click.echo(render_plan_table(items, SCREEN_PLAN_ITEMS), nl=False)
    click.echo(
        f"\n{len(items)} items for {len(assessments)} products assessed, {len(errors)} failed; wrote "
        f"{', '.join(p.name for p in written)} in {output}"
    )
    click.echo(f"Caution: {PRE_SCREEN}")
    sys.exit(EXIT_INTERNAL if internal else EXIT_SOME_FAILED if errors else EXIT_OK)


def _plan_inputs(source: Path, products: list[tuple[ManifestRow, Callable[[], Assessment]]]) -> list[Path]:
    """Every file the plan reads: the source (or each record of a folder) and the spectra the rows name."""
    inputs = [source]
    for row, _ in products:
        if source.is_dir():
            inputs.append(Path(row.origin))
        spectrum = row.fields.get("spectrum")
        if isinstance(spectrum, str) and spectrum and "\x00" not in spectrum:
            inputs.append(row.base_dir / spectrum)
    return inputs


@main.command()
def tables() -> None:
    """List the weighting tables with source, range, interpolation and SHA-256."""
    from hazard.weighting_tables import TABLE_NAMES, load_table

    for name in TABLE_NAMES:
        t = load_table(name)
        lo, hi = t.range_nm
        click.echo(
            f"{t.symbol:<5} {name:<16} {lo:g}–{hi:g} nm, {t.wavelength_nm.size} rows, "
            f"{t.interpolation} interpolation, zero outside"
        )
        click.echo(f"      source: {t.metadata['source']}")
        click.echo(f"      sha256: {t.sha256}")


@main.command()
@click.argument("which", type=click.Choice(["record", "result"]))
@click.option(
    "--format",
    "output_format",
    type=click.Choice(["json", "markdown"]),
    default="json",
    show_default=True,
    help="json: the JSON Schema; markdown: the record's fields as the README's table.",
)
def schema(which: str, output_format: str) -> None:
    """Print the JSON Schema of a product record or of an assessment result (or the record's field table)."""
    from hazard.inputs.record import ProductRecord
    from hazard.result import Assessment

    if output_format == "markdown":
        if which != "record":
            raise click.UsageError("--format markdown gives the record's field table: use 'hazard schema record'")
        from hazard.cli_options import field_table

        click.echo(field_table(), nl=False)
        return
    model = ProductRecord if which == "record" else Assessment
    click.echo(json.dumps(model.model_json_schema(), indent=2, ensure_ascii=False))


if __name__ == "__main__":
    sys.exit(main())
