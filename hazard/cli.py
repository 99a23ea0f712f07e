"""The ``hazard`` command line.

Exit codes: 0 assessed; 1 internal error (traceback with ``--debug``); 2 bad input or usage (one line on
stderr). Heavy libraries (pandas, reportlab, colour-science) are imported inside the commands that use
them, so ``hazard --help`` answers fast.
"""

from __future__ import annotations

import json
import sys
import traceback
from pathlib import Path

import click

from hazard._version import __version__
from hazard.atomic import write_atomic

EXIT_OK, EXIT_INTERNAL, EXIT_INPUT, EXIT_CONTRADICTED = 0, 1, 2, 4

_RECORD_OPTIONS = [
    click.option("--id", "id_", help="Product id (default: the spectrum file's stem)."),
    click.option("--name", help="Product name."),
    click.option("--quantity", type=click.Choice(["irradiance", "radiance"]), help="What the spectrum holds."),
    click.option("--unit", help="Unit of the values, e.g. W/m2/nm, mW/m2/nm, uW/cm2/nm, W/m2/sr/nm."),
    click.option("--column", help="Value column (header name or 1-based number) when the file has several."),
    click.option("--distance-mm", type=float, help="Measurement distance [mm]."),
    click.option("--source-diameter-mm", type=float, help="Diameter of a round source [mm]."),
    click.option("--source-width-mm", type=float, help="Width of a rectangular source [mm]."),
    click.option("--source-height-mm", type=float, help="Height of a rectangular source [mm]."),
    click.option("--source-alpha-mrad", type=float, help="Angular subtense at --distance-mm [mrad]."),
    click.option("--lamp-type", type=click.Choice(["gls", "other"]),
                 help="gls: general lighting service (500 lx rule); other: 200 mm."),
    click.option("--no-emission-outside", is_flag=True, default=None,
                 help="The source emits nothing outside the measured range."),
    click.option("--measurement-fov-mrad", type=float, help="Field of view of a radiance measurement [mrad]."),
]


def _record_options(func):
    for option in reversed(_RECORD_OPTIONS):
        func = option(func)
    return func


def _overrides(options: dict) -> dict:
    fields = {("id" if k == "id_" else k): v for k, v in options.items()}
    column = fields.get("column")
    if isinstance(column, str) and column.isdigit():
        fields["column"] = int(column)
    return {k: v for k, v in fields.items() if v is not None}


class _Group(click.Group):
    """Turns input errors into one line and exit 2, anything else into exit 1."""

    def invoke(self, ctx: click.Context):
        from hazard.errors import InputError

        try:
            return super().invoke(ctx)
        except InputError as exc:
            click.echo(f"hazard: error: {exc}", err=True)
            ctx.exit(EXIT_INPUT)
        except (click.exceptions.Exit, click.exceptions.Abort, click.ClickException):
            raise
        except BrokenPipeError:  # output piped into e.g. `head`, which stopped reading
            import os

            os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
            ctx.exit(EXIT_OK)
        except Exception as exc:  # noqa: BLE001 - the last line of defence, reported as internal
            if ctx.obj and ctx.obj.get("debug"):
                traceback.print_exc()
            else:
                click.echo(f"hazard: internal error: {type(exc).__name__}: {exc} (rerun with --debug for "
                           f"the traceback, and please report it)", err=True)
            ctx.exit(EXIT_INTERNAL)


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
@_record_options
@click.option("--format", "output_format", type=click.Choice(["text", "json"]), default="text",
              show_default=True, help="Output format.")
@click.option("--output", type=click.Path(dir_okay=False, path_type=Path),
              help="Write the output to this file (atomically) instead of the terminal.")
@click.option("--pdf", "pdf_path", type=click.Path(dir_okay=False, path_type=Path),
              help="Also render the PDF report to this file.")
def assess(product: Path, output_format: str, output: Path | None, pdf_path: Path | None, **options) -> None:
    """Assess one product: RECORD.toml, or a spectrum file with record options.

    Example: hazard assess lamp.csv --distance-mm 200 --source-diameter-mm 5
    """
    from hazard.engine import assess as run_assessment

    assessment = run_assessment(product, _overrides(options))
    if pdf_path is not None:
        _write_report(assessment, pdf_path)
    if output_format == "json":
        text = assessment.model_dump_json(indent=2) + "\n"
    else:
        from hazard.textout import render_text

        text = render_text(assessment)
    if output is None:
        click.echo(text, nl=False)
    else:
        write_atomic(output, text.encode("utf-8"))
        click.echo(f"wrote {output} ({assessment.id}: {assessment.risk_group})", err=True)


def _write_report(assessment, pdf_path: Path) -> None:
    from reports import render_assessment_pdf, report_time

    write_atomic(pdf_path, render_assessment_pdf(assessment, report_time()))
    click.echo(f"wrote {pdf_path}", err=True)


@main.command()
@click.argument("result", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--output", type=click.Path(dir_okay=False, path_type=Path), required=True,
              help="PDF file to write.")
@click.option("--id", "product_id", help="With a results.jsonl of 'hazard batch': the product to render.")
def report(result: Path, output: Path, product_id: str | None) -> None:
    """Render the PDF report of a saved result (from `hazard assess --format json`, or one product of a
    batch's results.jsonl with --id), without recomputing it. The result is checked first: its groups must
    follow from its own values and limits."""
    from hazard.errors import InputError
    from hazard.verify import check_result

    assessment = _load_result(result, product_id)
    check_result(assessment, str(result))
    if output.resolve() == result.resolve():
        raise InputError("the PDF would replace the result it is made from", "give another --output", str(output))
    _write_report(assessment, output)


def _load_result(path: Path, product_id: str | None):
    """A saved assessment: the whole JSON file, or the line of a JSON-lines file whose id is ``product_id``."""
    from pydantic import ValidationError

    from hazard.errors import InputError
    from hazard.result import Assessment

    fix = "give a JSON file written by 'hazard assess --format json', or a results.jsonl with --id"
    try:
        raw = path.read_bytes()
    except FileNotFoundError:
        raise InputError("result file not found", fix, str(path)) from None
    except OSError as exc:
        raise InputError(f"cannot read the result ({exc.strerror})", fix, str(path)) from None
    line_number = None
    if product_id is not None:
        for number, line in enumerate(raw.splitlines(), start=1):
            try:
                if json.loads(line).get("id") == product_id:
                    raw, line_number = line, number
                    break
            except (ValueError, AttributeError):
                continue
        else:
            raise InputError(f"no result with id {product_id!r}", "check the id (see summary.csv)", str(path))
    try:
        return Assessment.model_validate_json(raw)
    except ValidationError as exc:
        first = exc.errors()[0]
        where = ".".join(map(str, first["loc"])) or "the top level"
        raise InputError(f"not an assessment result of this tool version ({first['msg']} at {where})", fix,
                         str(path), line_number) from None


def _finish_batch(outcome, output: Path, pdf: bool) -> None:
    from hazard.textout import render_batch_table

    click.echo(render_batch_table(outcome.ids, outcome.assessments, outcome.errors), nl=False)
    written = "results.jsonl, summary.csv" + (", one PDF per product and summary.pdf" if pdf else "")
    click.echo(f"\n{len(outcome.assessments)} assessed ({outcome.reused} reused), {len(outcome.errors)} failed; "
               f"wrote {written} in {output}")
    from hazard.cautions import PRE_SCREEN

    click.echo(f"Caution: {PRE_SCREEN}")


@main.command()
@click.argument("manifest", type=click.Path(path_type=Path))
@click.option("--output", type=click.Path(file_okay=False, path_type=Path), required=True,
              help="Folder for results.jsonl, summary.csv and the PDFs.")
@click.option("--pdf", is_flag=True, help="Also write one PDF per product and summary.pdf.")
@click.option("--jobs", type=click.IntRange(min=1), default=1, show_default=True,
              help="Worker processes for reading spectra and rendering PDFs.")
@click.option("--resume", is_flag=True, help="Continue an interrupted run: skip products whose inputs are "
                                             "unchanged since they were assessed.")
@click.option("--studies", is_flag=True, help="Also compute hazard distances and remedies (about 0.1 s per "
                                              "product).")
def batch(manifest: Path, output: Path, pdf: bool, jobs: int, resume: bool, studies: bool) -> None:
    """Assess every product of a CSV/.xlsx manifest or a folder of TOML records.

    Exit code 0 when all were assessed, 3 when some failed, 2 when the manifest itself is unusable.
    """
    from hazard.batch import run_batch

    outcome = run_batch(manifest, output, pdf=pdf, jobs=jobs, resume=resume, studies=studies)
    _finish_batch(outcome, output, pdf)
    sys.exit(outcome.exit_code)


def _lineup_folder() -> Path:
    """The bundled line-up: package data of an installed copy, or examples/lineup of a source checkout."""
    from importlib import resources

    try:
        return Path(str(resources.files("hazard.lineup")))
    except ModuleNotFoundError:
        source = Path(__file__).resolve().parents[1] / "examples" / "lineup"
        if not source.is_dir():
            raise
        return source


@main.command()
@click.option("--output", type=click.Path(file_okay=False, path_type=Path), default=Path("hazard-demo"),
              show_default=True, help="Folder for the demo's reports.")
@click.option("--jobs", type=click.IntRange(min=1), default=1, show_default=True,
              help="Worker processes for rendering PDFs.")
def demo(output: Path, jobs: int) -> None:
    """Assess the bundled line-up of invented products (Corvel Lightworks, a made-up company): one PDF and
    one JSON per product, a summary CSV and summary.pdf."""
    from hazard.batch import run_batch

    lineup = _lineup_folder()
    click.echo("Demo: invented products of Corvel Lightworks, a made-up company; no real product or "
               "measurement.\n")
    outcome = run_batch(lineup, output, pdf=True, jobs=jobs, per_product_json=True, studies=True)
    _finish_batch(outcome, output, pdf=True)
    sys.exit(outcome.exit_code)


@main.command()
@click.argument("source", type=click.Path(path_type=Path))
@click.option("--format", "output_format", type=click.Choice(["text", "json"]), default="text",
              show_default=True, help="Output format (json: one assessment per line).")
@click.option("--cct-tolerance-k", type=float, default=150.0, show_default=True, help="CCT tolerance [K].")
@click.option("--cct-tolerance-pct", type=float, default=5.0, show_default=True,
              help="CCT tolerance [% of the claim]; the larger of the two applies.")
@click.option("--illuminance-tolerance-pct", type=float, default=10.0, show_default=True,
              help="Illuminance tolerance [%].")
@click.option("--t-max-tolerance-pct", type=float, default=10.0, show_default=True,
              help="A claimed t_max longer than computed by more than this is contradicted [%].")
def check(source: Path, output_format: str, cct_tolerance_k: float, cct_tolerance_pct: float,
          illuminance_tolerance_pct: float, t_max_tolerance_pct: float) -> None:
    """Check vendor claims (claimed_risk_group, claimed_cct_k, claimed_illuminance_lx, claimed_t_max_s_*)
    of a RECORD.toml, a CSV/.xlsx manifest or a folder of records.

    Exit code 4 when any claim is contradicted (so a pipeline can gate on it), 3 when a product could not be
    assessed, 2 for unusable input, else 0.
    """
    from hazard.batch import load_row
    from hazard.claims import ClaimTolerances
    from hazard.engine import assess as run_assessment
    from hazard.errors import InputError
    from hazard.manifest import read_manifest
    from hazard.textout import render_claims

    tolerances = ClaimTolerances(cct_tolerance_k, cct_tolerance_pct, illuminance_tolerance_pct, t_max_tolerance_pct)
    if source.suffix.lower() == ".toml":
        items = [(source.stem, lambda: run_assessment(source, tolerances=tolerances))]
    else:
        items = [(row.product_id, (lambda row=row: run_assessment(load_row(row), tolerances=tolerances)))
                 for row in read_manifest(source)]
    contradicted = failed = False
    for label, run in items:
        try:
            assessment = run()
        except InputError as exc:
            failed = True
            click.echo(f"{label}: error: {exc}", err=True)
            continue
        contradicted |= any(c.verdict == "contradicted" for c in assessment.claims)
        if output_format == "json":
            click.echo(assessment.model_dump_json())
            continue
        from hazard.formatting import group_words

        what_if = (f"; the record's what-if at {assessment.assessment_distance_mm:.0f} mm gives "
                   f"{group_words(assessment.risk_group, assessment.complete)}, not used for claims"
                   if assessment.basis == "what-if" else "")
        click.echo(f"{assessment.id}: computed {group_words(assessment.classification_group, assessment.complete)} "
                   f"at the standard's distance{what_if}")
        click.echo("\n".join(render_claims(assessment)) if assessment.claims else "  no claims in the record")
        click.echo("")
    if output_format == "text":
        from hazard.cautions import PRE_SCREEN

        click.echo(f"Caution: {PRE_SCREEN}")
    sys.exit(EXIT_CONTRADICTED if contradicted else (3 if failed else EXIT_OK))


@main.command()
def tables() -> None:
    """List the weighting tables with source, range, interpolation and SHA-256."""
    from weighting_tables import TABLE_NAMES, load_table

    for name in TABLE_NAMES:
        t = load_table(name)
        lo, hi = t.range_nm
        click.echo(f"{t.symbol:<5} {name:<16} {lo:g}–{hi:g} nm, {t.wavelength_nm.size} rows, "
                   f"{t.interpolation} interpolation, zero outside")
        click.echo(f"      source: {t.metadata['source']}")
        click.echo(f"      sha256: {t.sha256}")


@main.command()
@click.argument("which", type=click.Choice(["record", "result"]))
def schema(which: str) -> None:
    """Print the JSON Schema of a product record or of an assessment result."""
    from hazard.record import ProductRecord
    from hazard.result import Assessment

    model = ProductRecord if which == "record" else Assessment
    click.echo(json.dumps(model.model_json_schema(), indent=2, ensure_ascii=False))


if __name__ == "__main__":
    sys.exit(main())
