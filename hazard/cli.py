"""The ``hazard`` command line.

Exit codes: 0 assessed; 1 internal error (traceback with ``--debug``); 2 bad input or usage (one line on
stderr). Heavy libraries (pandas, reportlab, colour-science) are imported inside the commands that use
them, so ``hazard --help`` answers fast.
"""

from __future__ import annotations

import errno
import json
import os
import sys
import traceback
from collections.abc import Callable
from functools import partial
from pathlib import Path

import click

from hazard._version import __version__
from hazard.cli_options import record_options, record_overrides
from hazard.exit_codes import EXIT_CONTRADICTED, EXIT_INPUT, EXIT_INTERNAL, EXIT_OK, EXIT_SOME_FAILED
from hazard.output.atomic import remove_stale_temporaries, write_atomic

SCREEN_PRODUCTS = 200
"""A batch table on screen lists at most this many products; summary.csv has them all [1]."""
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


@main.command()
@click.argument("product", type=click.Path(dir_okay=False, path_type=Path))
@record_options
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
    product: Path, output_format: str, output: Path | None, pdf_path: Path | None, allow_outside: bool, **options
) -> None:
    """Assess one product: RECORD.toml, or a spectrum file with record options.

    Example: hazard assess lamp.csv --distance-mm 200 --source-diameter-mm 5
    """
    from hazard.assessment.build import assess as run_assessment
    from hazard.inputs.loading import load_product

    loaded = load_product(product, record_overrides(options), allow_outside=allow_outside)
    spectrum = (product.parent / loaded.record.spectrum) if loaded.record.spectrum else product
    _refuse_overwriting_inputs([output, pdf_path], [product, spectrum])
    assessment = run_assessment(loaded)
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
        click.echo(f"wrote {output} ({assessment.id}: {assessment.risk_group})", err=True)


def _write_file(path: Path, data: bytes) -> None:
    """Write one output atomically, first removing what a killed run left while writing the same file."""
    remove_stale_temporaries(path.parent, path.name)
    write_atomic(path, data)


def _write_report(assessment, pdf_path: Path) -> None:
    from hazard.reports import render_assessment_pdf, report_time

    _write_file(pdf_path, render_assessment_pdf(assessment, report_time()))
    click.echo(f"wrote {pdf_path}", err=True)


@main.command()
@click.argument("result", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--output", type=click.Path(dir_okay=False, path_type=Path), required=True, help="PDF file to write.")
@click.option("--id", "product_id", help="With a results.jsonl of 'hazard batch': the product to render.")
def report(result: Path, output: Path, product_id: str | None) -> None:
    """Render the PDF report of a saved result, without recomputing it.

    The result comes from `hazard assess --format json`, or is one product of a batch's results.jsonl with --id. It is
    checked first: unchanged since it was made, and its groups must follow from its own values and limits.
    """
    from hazard.assessment.verify import check_result

    _refuse_overwriting_inputs([output], [result])
    assessment = _load_result(result, product_id)
    check_result(assessment, str(result))
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
                if json.loads(line).get("id") == product_id:
                    return line, number
            except (ValueError, AttributeError):
                continue
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
    written = "results.jsonl, summary.csv" + (", one PDF per product and summary.pdf" if pdf else "")
    click.echo(
        f"\n{len(outcome.assessments)} assessed ({outcome.reused} reused), {len(outcome.errors)} failed; "
        f"wrote {written} in {output}"
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


@main.command()
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
@_ALLOW_OUTSIDE
@click.option(
    "--html",
    is_flag=True,
    help="Also write summary.html, a self-contained page for the browser, and one JSON per product.",
)
def batch(
    manifest: Path, output: Path, pdf: bool, jobs: int, resume: bool, studies: bool, allow_outside: bool, html: bool
) -> None:
    """Assess every product of a CSV/.xlsx manifest or a folder of TOML records.

    The output folder must be new, empty, or written by an earlier run of the same manifest; it may not hold
    the run's inputs (name a new sub-folder instead), and one run at a time writes into it.

    Exit code 0 when all were assessed, 3 when some failed, 2 when the manifest or the output folder is
    unusable, 1 when the tool failed on a product (every output is still written).
    """
    from hazard.assessment.batch import run_batch

    outcome = run_batch(
        manifest,
        output,
        pdf=pdf,
        jobs=jobs,
        resume=resume,
        studies=studies,
        allow_outside=allow_outside,
        per_product_json=html,
    )
    _write_html(outcome, output, html)
    _finish_batch(outcome, output, pdf)
    sys.exit(outcome.exit_code)


def _write_html(outcome, output: Path, html: bool) -> None:
    """With ``html``, the batch's summary.html beside its other outputs."""
    if html:
        from hazard.reports.html_summary import write_summary_html

        click.echo(f"wrote {write_summary_html(outcome, output)}", err=True)


def _lineup_folder() -> Path:
    """The bundled line-up, package data of the installed tool."""
    from importlib import resources

    return Path(str(resources.files("hazard.lineup")))


@main.command()
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
def demo(output: Path, jobs: int, html: bool) -> None:
    """Assess the bundled line-up of invented products (Corvel Lightworks, a made-up company).

    One PDF and one JSON per product, a summary CSV and summary.pdf.
    """
    from hazard.assessment.batch import run_batch

    lineup = _lineup_folder()
    click.echo("Demo: invented products of Corvel Lightworks, a made-up company; no real product or measurement.\n")
    outcome = run_batch(lineup, output, pdf=True, jobs=jobs, per_product_json=True, studies=True)
    _write_html(outcome, output, html)
    _finish_batch(outcome, output, pdf=True)
    sys.exit(outcome.exit_code)


@main.command()
@click.argument("source", type=click.Path(path_type=Path))
@click.option(
    "--format",
    "output_format",
    type=click.Choice(["text", "json"]),
    default="text",
    show_default=True,
    help="Output format (json: one assessment per line).",
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
    help="A claimed t_max longer than computed by more than this is contradicted [%].",
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
) -> None:
    """Check vendor claims of a RECORD.toml, a CSV/.xlsx manifest or a folder of records.

    The claims are claimed_risk_group, claimed_cct_k, claimed_illuminance_lx and claimed_t_max_s_*.

    Exit code 4 when any claim is contradicted (so a pipeline can gate on it), 3 when a product could not be
    assessed, 2 for unusable input, 1 when the tool failed on a product, else 0.
    """
    from hazard.assessment.batch import failure_reason, load_row
    from hazard.assessment.build import assess as run_assessment
    from hazard.assessment.claims import ClaimTolerances
    from hazard.errors import one_line
    from hazard.inputs.loading import load_product
    from hazard.inputs.manifest import ManifestRow, read_manifest
    from hazard.output.text import render_claims
    from hazard.result import Assessment

    tolerances = ClaimTolerances(cct_tolerance_k, cct_tolerance_pct, illuminance_tolerance_pct, t_max_tolerance_pct)
    items: list[tuple[ManifestRow, Callable[[], Assessment]]]
    if source.suffix.lower() == ".toml":
        items = [
            (
                ManifestRow(str(source), {}, source.parent, {}),
                lambda: run_assessment(load_product(source, allow_outside=allow_outside), tolerances=tolerances),
            )
        ]
    else:

        def assess_row(row: ManifestRow) -> Assessment:
            return run_assessment(load_row(row, allow_outside), tolerances=tolerances)

        items = [(row, partial(assess_row, row)) for row in read_manifest(source)]
    contradicted = failed = internal = False
    for row, run in items:
        try:
            assessment = run()
        except Exception as exc:  # the boundary of one product: nothing it does stops the others
            reason, defect = failure_reason(row, exc)
            failed, internal = True, internal or defect
            click.echo(
                f"{one_line(row.product_id if row.fields else Path(row.origin).stem, 80)}: error: {reason}", err=True
            )
            continue
        contradicted |= any(c.verdict == "contradicted" for c in assessment.claims)
        if output_format == "json":
            click.echo(assessment.model_dump_json())
            continue
        from hazard.output.formatting import group_words

        what_if = (
            f"; the record's what-if at {assessment.assessment_distance_mm:.0f} mm gives "
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
    if output_format == "text":
        from hazard.assessment.cautions import PRE_SCREEN

        click.echo(f"Caution: {PRE_SCREEN}")
    sys.exit(
        EXIT_INTERNAL if internal else EXIT_CONTRADICTED if contradicted else (EXIT_SOME_FAILED if failed else EXIT_OK)
    )


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
def schema(which: str) -> None:
    """Print the JSON Schema of a product record or of an assessment result."""
    from hazard.inputs.record import ProductRecord
    from hazard.result import Assessment

    model = ProductRecord if which == "record" else Assessment
    click.echo(json.dumps(model.model_json_schema(), indent=2, ensure_ascii=False))


if __name__ == "__main__":
    sys.exit(main())
