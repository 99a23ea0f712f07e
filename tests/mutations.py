"""Mutation of input files for fuzzing: shared by ``tests/inputs/test_fuzz.py`` (a short, deterministic run) and
``benchmarks/torture.py`` (a long campaign).

A mutation is a list of edits applied to a seed file's bytes: numbers swapped for extreme ones (the file stays
valid, its values do not), flips, insertions of tokens that have broken parsers before (NaN, overflowing
numbers, 5000-digit integers, NUL, CR-only line ends, long runs of spaces or brackets, deep nesting, path
escapes), deletions, duplications and truncation. Workbooks (.xlsx) are mutated
inside: one XML part is edited and the archive written again (or, now and then, the zip bytes themselves).

:func:`exercise` runs one input through the tool as a user would and classifies the outcome: ``"ok"`` (a
result that reads back), ``"input error"`` (one line), or a failure: ``"crash"`` (any other exception),
``"not one line"``, or ``"warning"`` (a Python warning, which would add a line to the command's stderr).
"""

from __future__ import annotations

import io
import random
import re
import warnings
import zipfile
from pathlib import Path

TOKENS = [
    b"NaN",
    b"nan",
    b"inf",
    b"-inf",
    b"1e999",
    b"-1e-400",
    b"1e-320",
    b"5e-324",
    b"1e300",
    b"1e305",
    b"-0",
    b"0",
    b"9" * 5000,
    b"1" * 30_000,
    b"\x00",
    b"\r",
    b"\r\n",
    b"\n",
    b"\n\n",
    b",",
    b";",
    b"\t",
    b'"',
    b"'",
    b"[",
    b"]",
    b"(",
    b")",
    b"{",
    b"}",
    b":",
    b"=",
    b"#",
    b" " * 3000,
    b"(" + b" " * 3000 + b"x(",
    b"[" * 2000,
    b"]" * 50,
    "²".encode(),
    "µ".encode(),
    "λ".encode(),
    b"\xff\xfe",
    b"\xe9",
    b"\xef\xbb\xbf",
    b"true",
    b"null",
    b"..",
    b"../../",
    b"/etc/passwd",
    b"\\u0000",
    b"\x1b[2J",
    b"-1",
    b"1,5",
    b"2,5e3",
    b"0x10",
    b"1_000",
    b"W/m2/nm",
    b"mW/m2/sr/nm",
    b"[W/m2/nm]",
    b"furlongs",
    b"column = 0\n",
    b'column = "\xc2\xb2"\n',
    b"distance_mm = 1e-300\n",
    b"distance_mm = 1e300\n",
    b"source_diameter_mm = 5e-324\n",
    b'spectrum = "../outside.csv"\n',
    b'quantity = "relative"\n',
    b"a = " + b"[" * 40 + b"]" * 40 + b"\n",
    b"x = 1979-05-27\n",
    b"<v>NaN</v>",
    b"</row>",
    b'<row r="3000000">',
    b'<c t="s"><v>99</v></c>',
    b"&#0;",
    b"<!--",
    b"]]>",
]
"""Byte strings that have broken a parser before, or sit at the edge of what one accepts."""


NUMBERS = [
    b"0",
    b"-0",
    b"1e308",
    b"1.7976931348623157e308",
    b"1e-308",
    b"5e-324",
    b"1e-320",
    b"1e999",
    b"-1e999",
    b"1e300",
    b"1e-300",
    b"1e305",
    b"-1",
    b"-0.5",
    b"9" * 400,
    b"0.0000001",
    b"3000",
    b"1e6",
    b"1e7",
]
"""Numbers at the edges of the float range and of the method's ranges, still valid in CSV, JSON and TOML."""
_NUMBER = re.compile(rb"\d+(?:\.\d+)?(?:[eE][+-]?\d+)?")


def _swap_number(data: bytearray, rng: random.Random) -> None:
    """Replace one number of ``data`` by an extreme one, keeping the file's syntax."""
    found = list(_NUMBER.finditer(data))
    if found:
        match = rng.choice(found)
        data[match.start() : match.end()] = rng.choice(NUMBERS)


def mutate(data: bytes, rng: random.Random, edits: int | None = None) -> bytes:
    """``data`` with ``edits`` random edits (1 to 4 when not given)."""
    data = bytearray(data)
    numbers_only = rng.random() < 0.3  # the file stays valid: its values reach the method
    for _ in range(edits if edits is not None else rng.randint(1, 4)):
        where = rng.randint(0, len(data))
        kind = 0.0 if numbers_only else rng.random()
        if kind < 0.25:
            _swap_number(data, rng)
        elif kind < 0.45:
            data[where:where] = rng.choice(TOKENS)
        elif kind < 0.55 and data:
            end = min(len(data), where + rng.randint(1, 40))
            data[where:end] = rng.choice(TOKENS)
        elif kind < 0.64 and data:
            data[min(where, len(data) - 1)] = rng.randrange(256)
        elif kind < 0.72 and data:
            del data[where : where + rng.randint(1, 200)]
        elif kind < 0.82 and data:
            span = bytes(data[where : where + rng.randint(1, 400)])
            data[where:where] = span * rng.randint(1, 50)
        elif kind < 0.9:
            del data[where:]
        else:
            data[where:where] = bytes(rng.randrange(256) for _ in range(rng.randint(1, 16)))
    return bytes(data)


def mutate_workbook(data: bytes, rng: random.Random) -> bytes:
    """An .xlsx with one of its XML parts mutated (or, one time in eight, its zip bytes)."""
    if rng.random() < 0.125:
        return mutate(data, rng)
    source = zipfile.ZipFile(io.BytesIO(data))
    names = [i.filename for i in source.infolist()]
    sheets = [n for n in names if "worksheets/" in n or "sharedStrings" in n]
    target = rng.choice(sheets) if sheets and rng.random() < 0.8 else rng.choice(names)
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as archive:
        for item in source.infolist():
            part = source.read(item.filename)
            archive.writestr(item, mutate(part, rng) if item.filename == target else part)
    return out.getvalue()


SPECTRUM_FIELDS = {"distance_mm": 500.0, "source_diameter_mm": 30.0, "no_emission_outside": True}


def exercise(path: Path, kind: str, studies: bool = False) -> tuple[str, str]:
    """Run one input through the tool in this process; (outcome, detail).

    ``kind``: ``"spectrum"`` (a spectrum file with record options, as ``hazard assess FILE``), ``"record"``
    (a TOML record) or ``"manifest"`` (a CSV/.xlsx manifest: each of its first five rows loaded and
    assessed, as ``hazard batch`` does). With ``studies``, hazard distances and remedies are computed too.
    Every result must read back from its JSON.
    """
    from hazard.assessment.build import build_assessment
    from hazard.assessment.pipeline import evaluate_loaded
    from hazard.errors import InputError
    from hazard.result import Assessment

    def assess(loaded):
        result = build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=studies)
        Assessment.model_validate_json(result.model_dump_json())

    def one_line(exc: InputError) -> tuple[str, str]:
        text = str(exc)
        if "\n" in text or "\r" in text or len(text) > 2000:
            return "not one line", text[:300]
        return "input error", text

    with warnings.catch_warnings(record=True) as caught:  # a warning would be a second line on stderr
        warnings.simplefilter("always")
        outcome = _outcome(path, kind, assess, one_line)
    if outcome[0] in ("ok", "input error") and caught:
        return "warning", f"{caught[0].category.__name__}: {caught[0].message}"
    return outcome


def _outcome(path: Path, kind: str, assess, one_line) -> tuple[str, str]:
    import traceback

    from hazard.assessment.batch import load_row
    from hazard.errors import InputError
    from hazard.inputs.loading import load_product
    from hazard.inputs.manifest import read_manifest

    try:
        if kind == "spectrum":
            assess(load_product(path, dict(SPECTRUM_FIELDS, id="fuzz")))
        elif kind == "record":
            assess(load_product(path, allow_outside=False))
        else:
            outcomes = []
            for row in read_manifest(path)[:5]:
                try:
                    assess(load_row(row))
                except InputError as exc:
                    outcomes.append(one_line(exc))
            bad = [o for o in outcomes if o[0] != "input error"]
            if bad:
                return bad[0]
        return "ok", ""
    except InputError as exc:
        return one_line(exc)
    except Exception:  # a crash is what the fuzzing looks for
        return "crash", traceback.format_exc(limit=-3)
