"""``hazard.toml``: the working folder's settings, today the report identity (who issues the reports).

.. code-block:: toml

    [report]
    organisation = "Corvel Lightworks, product safety"
    document_number = "PS-2026-014"
    prepared_by = "A. Engineer"
    checked_by = "B. Reviewer"
    note = "Pre-screen before the laboratory order."

Command-line options (``--organisation`` …) replace the file's values. A file that is not valid TOML, holds an
unknown key or a value of the wrong kind is one error naming the file and line.
"""

from __future__ import annotations

from pathlib import Path

from pydantic import ValidationError

from hazard.errors import InputError, excerpt
from hazard.inputs.record import parse_toml
from hazard.inputs.userfiles import read_user_file
from hazard.result import ReportIdentity

__all__ = ["SETTINGS_NAME", "report_identity"]

SETTINGS_NAME = "hazard.toml"
"""The settings file, read from the working folder when it exists."""
_MAX_SETTINGS_BYTES = 64 * 1024


def _line_of(text: str, key: str) -> int | None:
    for number, line in enumerate(text.splitlines(), start=1):
        if line.strip().startswith(key):
            return number
    return None


def report_identity(options: dict[str, str | None], folder: Path | None = None) -> ReportIdentity | None:
    """The report identity from ``folder``/hazard.toml (the working folder by default) and the options.

    Parameters
    ----------
    options : dict
        ``ReportIdentity`` field → value given on the command line (None when not given).
    folder : Path, optional
        Where to look for ``hazard.toml``.

    Returns
    -------
    ReportIdentity or None
        None when neither the file nor the options name anything.

    Raises
    ------
    InputError
        The settings file is unreadable or holds something other than the ``[report]`` keys.
    """
    path = (folder or Path.cwd()) / SETTINGS_NAME
    fields: dict = {}
    text = ""
    if path.is_file():
        raw = read_user_file(path, what="settings file", max_bytes=_MAX_SETTINGS_BYTES, fix_large="keep it short")
        try:
            text = raw.decode("utf-8-sig")
        except UnicodeDecodeError:
            raise InputError("settings file is not UTF-8 text", "save it as UTF-8", str(path)) from None
        settings = parse_toml(text, str(path))
        unknown = sorted(set(settings) - {"report"})
        if unknown or not isinstance(settings.get("report", {}), dict):
            raise InputError(
                f"unknown setting {excerpt(unknown[0] if unknown else 'report', 40)}",
                "hazard.toml holds one [report] table (organisation, document_number, prepared_by, checked_by, note)",
                str(path),
                _line_of(text, unknown[0]) if unknown else _line_of(text, "report"),
            )
        fields = dict(settings.get("report", {}))
    fields.update({k: v for k, v in options.items() if v is not None})
    try:
        identity = ReportIdentity.model_validate(fields)
    except ValidationError as exc:
        first = exc.errors()[0]
        key = ".".join(map(str, first["loc"]))
        raise InputError(
            f"report setting {excerpt(key, 40)}: {first['msg']}",
            "give text for organisation, document_number, prepared_by, checked_by and note only",
            f"--{key.replace('_', '-')}" if options.get(key) is not None else str(path),
            _line_of(text, key) if text else None,
        ) from None
    return identity if identity.model_dump(exclude_none=True) else None
