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

__all__ = ["RecordCommand", "option_name", "parse_table_option", "record_options", "record_overrides"]

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


class RecordCommand(click.Command):
    """A command with one option per record field, made from the record model when first needed.

    The options follow the command's arguments, before its own options, as :func:`record_options` would place
    them; they are made on the first call of :meth:`get_params` (help, parsing, completion).
    """

    _record_params_added = False

    def get_params(self, ctx: click.Context) -> list[click.Parameter]:
        """The command's parameters, the record options among them."""
        if not self._record_params_added:
            self._record_params_added = True

            def collect() -> None:
                """A stand-in for a callback, only to collect the options' parameters."""

            record_options(collect)
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
