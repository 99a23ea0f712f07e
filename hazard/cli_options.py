"""Command-line options generated from the record model: every record field is an option of ``hazard assess``.

The option is the field's name with dashes (``distance_mm`` → ``--distance-mm``), its help the field's
description, its choices the field's literal values. A list of tables (``[[exposure]]`` in TOML) is an option
that may be repeated, each value ``key=value`` pairs joined by commas. Values go to the record as text or numbers
and the record's own validation reads them (human durations like ``15min`` included), so the options and a TOML
record can never disagree.

The options are made from the model when a command first needs them (its help or its arguments), by
:class:`RecordCommand`: the record model, and with it pydantic, is not imported to print ``hazard --help``.
"""

from __future__ import annotations

import types
import typing
from collections.abc import Callable
from typing import Any, Literal

import click

if typing.TYPE_CHECKING:
    from pydantic import BaseModel
    from pydantic.fields import FieldInfo

__all__ = [
    "ModelOptionsCommand",
    "field_table",
    "option_name",
    "parse_table_option",
    "pop_identity",
    "record_options",
    "record_overrides",
]

POSITIONAL = frozenset({"spectrum"})
"""Record fields given otherwise on the command line (the product argument)."""


def option_name(field: str) -> str:
    """The option of a record field: ``distance_mm`` → ``--distance-mm``."""
    return "--" + field.replace("_", "-")


def _members(annotation: Any) -> list[Any]:
    """The types a (possibly optional) annotation admits, None left out."""
    origin = typing.get_origin(annotation)
    if origin in (typing.Union, types.UnionType):
        return [m for arg in typing.get_args(annotation) if arg is not type(None) for m in _members(arg)]
    if origin is typing.Annotated:
        return _members(typing.get_args(annotation)[0])
    return [annotation]


def _table_model(annotation: Any) -> type[BaseModel] | None:
    """The model of a list-of-tables field (``list[ExposureEntry]``), else None."""
    from pydantic import BaseModel

    for member in _members(annotation):
        if typing.get_origin(member) is list:
            (item,) = typing.get_args(member)
            if isinstance(item, type) and issubclass(item, BaseModel):
                return item
    return None


def parse_table_option(text: str, model: type[BaseModel], option: str) -> dict[str, str]:
    """One value of a repeated table option: ``distance_mm=300,duration_s=10min,label=loading`` → a dict.

    Raises
    ------
    click.BadParameter
        A pair without ``=``, or a key the table does not have.
    """
    table: dict[str, str] = {}
    for pair in filter(None, (p.strip() for p in text.split(","))):
        key, sep, value = pair.partition("=")
        key = key.strip()
        if not sep or key not in model.model_fields:
            keys = ", ".join(model.model_fields)
            raise click.BadParameter(f"{pair!r} is not key=value with a key of {keys}", param_hint=option)
        table[key] = value.strip()
    return table


def _option(field: str, info: FieldInfo) -> Callable:
    """The click option of one record field."""
    name, help_text = option_name(field), info.description or ""
    members = _members(info.annotation)
    table = _table_model(info.annotation)
    if table is not None:
        keys = ",".join(f"{k}=…" for k in table.model_fields)
        return click.option(
            name, field, multiple=True, metavar=keys.upper().replace("=…", "=V"), help=f"{help_text} Repeat for more."
        )
    if members == [bool]:
        return click.option(name, field, is_flag=True, default=None, help=help_text)
    literals = [v for m in members if typing.get_origin(m) is Literal for v in typing.get_args(m)]
    if literals:
        return click.option(name, field, type=click.Choice(literals), help=help_text)
    if members == [float] and not _reads_text(info.annotation):
        return click.option(name, field, type=float, help=help_text)
    return click.option(name, field, type=str, help=help_text)


def _reads_text(annotation: Any) -> bool:
    """The field parses text itself before validating it (a duration like ``15min``)."""
    from pydantic import BeforeValidator

    origin = typing.get_origin(annotation)
    if origin in (typing.Union, types.UnionType):
        return any(_reads_text(arg) for arg in typing.get_args(annotation))
    if origin is typing.Annotated:
        return any(isinstance(m, BeforeValidator) for m in typing.get_args(annotation)[1:])
    return False


def _record_options() -> list[Callable]:
    """One option decorator per record field (in the record's order)."""
    from hazard.inputs.record import ProductRecord

    return [_option(f, info) for f, info in ProductRecord.model_fields.items() if f not in POSITIONAL]


def record_options(func: Callable) -> Callable:
    """Decorate a command with one option per record field (in the record's order)."""
    for option in reversed(_record_options()):
        func = option(func)
    return func


def _identity_options() -> list[Callable]:
    """One option decorator per report-identity field (``--organisation``, ``--document-number``…)."""
    from hazard.result import ReportIdentity

    return [
        click.option(option_name(field), field, help=f"{info.description} Replaces hazard.toml's [report] value.")
        for field, info in ReportIdentity.model_fields.items()
    ]


class ModelOptionsCommand(click.Command):
    """A command with options made from the models when first needed.

    One option per record field (``record=True``) and one per report-identity field (``identity=True``).

    The options follow the command's arguments, before its own options, as :func:`record_options` would place
    them; they are made on the first call of :meth:`get_params` (help, parsing, completion), so that printing
    ``hazard --help`` imports neither the models nor pydantic.
    """

    def __init__(self, *args: Any, record: bool = False, identity: bool = False, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self._pending = [make for make, wanted in ((_record_options, record), (_identity_options, identity)) if wanted]

    def get_params(self, ctx: click.Context) -> list[click.Parameter]:
        """The command's parameters, the model options among them."""
        if self._pending:
            makers, self._pending = self._pending, []

            def collect() -> None:
                """A stand-in for a callback, only to collect the options' parameters."""

            for make in reversed(makers):
                for option in reversed(make()):
                    option(collect)
            made: list[click.Parameter] = getattr(collect, "__click_params__", [])
            after = max((k + 1 for k, p in enumerate(self.params) if isinstance(p, click.Argument)), default=0)
            self.params[after:after] = list(reversed(made))
        return super().get_params(ctx)


def record_overrides(options: dict[str, Any]) -> dict[str, Any]:
    """The record fields the user gave as options (tables parsed, a numeric column number made an int)."""
    from hazard.inputs.record import ProductRecord

    fields = {k: v for k, v in options.items() if v is not None and v != ()}
    for field, values in list(fields.items()):
        table = _table_model(ProductRecord.model_fields[field].annotation)
        if table is not None:
            fields[field] = [parse_table_option(v, table, option_name(field)) for v in values]
    column = fields.get("column")
    if isinstance(column, str) and column.isascii() and column.isdecimal() and len(column) <= 7:
        fields["column"] = int(column)
    return fields


def pop_identity(options: dict[str, Any]) -> dict[str, str | None]:
    """Take the report-identity options out of a command's options (the rest are record fields)."""
    from hazard.result import ReportIdentity

    return {field: options.pop(field, None) for field in ReportIdentity.model_fields}


def _default_text(field: str, info: FieldInfo) -> str:
    if info.is_required():
        return "required"
    default = info.get_default()
    if default is None or field in POSITIONAL:
        return "—"
    return f"`{str(default).lower() if isinstance(default, bool) else default}`"


def field_table() -> str:
    """The record's fields as a Markdown table (field, option, meaning, default), generated from the model.

    The README's field table is this text (a test compares them), so a new field is documented the moment it exists.
    """
    from hazard.inputs.record import ProductRecord

    lines = ["| field | option | meaning | default |", "|---|---|---|---|"]
    for field, info in ProductRecord.model_fields.items():
        option = "argument" if field in POSITIONAL else f"`{option_name(field)}`"
        meaning = (info.description or "").replace("|", "\\|")
        lines.append(f"| `{field}` | {option} | {meaning} | {_default_text(field, info)} |")
    return "\n".join(lines) + "\n"
