"""One row per product for people who open the batch summary in a spreadsheet (``summary.csv``, ``summary.xlsx``).

The columns name the product (id, name, vendor, model, its own file stem), give its classification (the group at the
standard's distance) and, for a what-if, the group at the distance the record asks for, then the distance the
per-hazard figures were computed at (``hazard_columns_at [mm]``) followed by those figures: each hazard's value, group
and t_max with the unit in the header, the pulse fraction, the uncertainty verdict; then the claims, the day's
exposure and any error. A what-if result holds no per-hazard figures at the standard's distance, so a what-if row's
hazard columns are the what-if's: ``hazard_columns_at [mm]`` says so by its distance, and every text figure of the
what-if (deciding hazards, margin, uncertainty, group range) starts with "what-if at N mm:". Numbers are rounded to
3 significant digits here; full precision stays in ``results.jsonl``. Units in headers are written in ASCII SI notation
(``W m-2 sr-1``) so that every spreadsheet program shows them alike.
"""

from __future__ import annotations

import math

from hazard.output.formatting import NOT_DETERMINED, hazard_margin_text, tightest_deciding, what_if_prefix
from hazard.result import Assessment
from hazard.standards import DEFAULT_LIMIT_SET, LimitSet

__all__ = [
    "Cell",
    "csv_cell",
    "hazard_headers",
    "inert_text",
    "round_significant",
    "summary_columns",
    "summary_row",
]

Cell = str | int | float | bool | None
"""A cell of the summary: text, a count, a number (already rounded), a yes/no, or empty."""
SIGNIFICANT_DIGITS = 3
"""Digits kept of every number in the summary [1]."""
HAZARD_COLUMNS_AT = "hazard_columns_at [mm]"
"""The column holding the distance the per-hazard figures of the row were computed at: the standard's assessment
distance, or a what-if's own distance."""


def ascii_unit(unit: str) -> str:
    """A unit code of the results in ASCII SI notation: ``W/m2/sr`` → ``W m-2 sr-1``.

    Examples
    --------
    >>> ascii_unit("W/m2"), ascii_unit("W/m2/sr"), ascii_unit("J/m2")
    ('W m-2', 'W m-2 sr-1', 'J m-2')
    """
    head, *divisors = unit.split("/")
    parts = [head]
    for d in divisors:
        base, power = (d[:-1], d[-1]) if d[-1].isdigit() else (d, "1")
        parts.append(f"{base}-{power}")
    return " ".join(parts)


def hazard_headers(symbol: str, unit: str) -> tuple[str, str, str]:
    """The value, group and t_max columns of one hazard, units in brackets."""
    return f"{symbol} value [{ascii_unit(unit)}]", f"{symbol} group", f"{symbol} t_max [s]"


def summary_columns(limit_set: LimitSet = DEFAULT_LIMIT_SET) -> list[str]:
    """The columns of the summary, in order."""
    return [
        "id",
        "status",
        "name",
        "vendor",
        "model",
        "file_stem",
        "basis",
        "assessment_distance [mm]",
        "risk_group",
        "group_note",
        "complete",
        "what_if_distance [mm]",
        "what_if_risk_group",
        "deciding_hazards",
        "margin",
        HAZARD_COLUMNS_AT,
        *(c for h in limit_set.hazards for c in hazard_headers(h.symbol, h.unit)),
        "emission",
        "pulse_max_fraction [1]",
        "uncertainty",
        "group_range",
        "claims_contradicted",
        "claims_inconclusive",
        "claims",
        "min_distance_exempt [mm]",
        "day_within_limits",
        "day_max_fraction [1]",
        "day_max_family",
        "warning_count",
        "error",
    ]


def round_significant(value: float | None, digits: int = SIGNIFICANT_DIGITS) -> float | None:
    """``value`` rounded to ``digits`` significant digits; None for None or NaN.

    Examples
    --------
    >>> round_significant(9.74690968163925e-09), round_significant(46154.5596), round_significant(0.0)
    (9.75e-09, 46200.0, 0.0)
    """
    if value is None or math.isnan(value):
        return None
    if value == 0 or math.isinf(value):
        return value
    return round(value, digits - 1 - math.floor(math.log10(abs(value))))


_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
"""First characters that make a spreadsheet read a text cell as a formula (OWASP, "CSV injection")."""


def inert_text(value: Cell) -> Cell:
    """Text that a spreadsheet shows as text: a leading ``'`` before a formula's first character.

    A product name like ``=HYPERLINK(…)`` from a vendor's manifest must not run when a colleague opens the summary;
    ``results.jsonl`` keeps the text as given.

    Examples
    --------
    >>> inert_text("=1+1"), inert_text("Desk lamp"), inert_text(-2.5)
    ("'=1+1", 'Desk lamp', -2.5)
    """
    if isinstance(value, str) and value.startswith(_FORMULA_STARTS):
        return "'" + value
    return value


def csv_cell(value: Cell) -> str:
    """A cell as CSV text: numbers to 3 significant digits, yes/no as ``true``/``false``, empty for None.

    Numbers are in plain notation from 10⁻⁴ to 10⁹, in exponent notation beyond; text is made inert
    (:func:`inert_text`).

    Examples
    --------
    >>> csv_cell(0.000239), csv_cell(46200.0), csv_cell(200.0), csv_cell(9.75e-09), csv_cell(True), csv_cell(None)
    ('0.000239', '46200', '200', '9.75e-09', 'true', '')
    """
    if value is None:
        return ""
    if isinstance(value, bool):
        return str(value).lower()
    if isinstance(value, float):
        if value == 0 or not math.isfinite(value):
            return f"{value:g}"
        exponent = math.floor(math.log10(abs(value)))
        if -4 <= exponent < 9:
            return f"{value:.{max(0, SIGNIFICANT_DIGITS - 1 - exponent)}f}"
        return f"{value:.{SIGNIFICANT_DIGITS - 1}e}"
    return str(inert_text(value))


def summary_row(
    product_id: str,
    stem: str,
    assessment: Assessment | None,
    error: str | None,
    limit_set: LimitSet = DEFAULT_LIMIT_SET,
    fields: dict | None = None,
) -> dict[str, Cell]:
    """One product's row: the columns of :func:`summary_columns` with typed, rounded cells.

    ``risk_group`` and ``assessment_distance [mm]`` are the standard's classification ("not determined" when there is
    none); a what-if adds its own group and distance in the ``what_if_*`` columns. The per-hazard columns hold the
    figures computed at ``hazard_columns_at [mm]``: the classification's distance, or the what-if's, whose text
    figures then start with "what-if at N mm:". A failed product keeps what its manifest row says of it (``fields``:
    name, vendor, model) and its error.
    """
    row: dict[str, Cell] = dict.fromkeys(summary_columns(limit_set))
    described = assessment.record if assessment is not None else (fields or {})
    row.update(
        id=product_id,
        status="ok",
        file_stem=stem,
        **{k: _text(described.get(k)) for k in ("name", "vendor", "model")},
    )
    if error is not None or assessment is None:
        row.update(status="error", error=error or "")
        return row
    a = assessment
    group = a.classification_group
    what_if = a.basis == "what-if"
    row.update(
        basis=a.basis,
        risk_group=group or NOT_DETERMINED,
        group_note="" if a.complete or group is None else "lower bound",
        complete=a.complete,
        warning_count=len(a.warnings),
        claims_contradicted=sum(c.verdict == "contradicted" for c in a.claims),
        claims_inconclusive=sum(c.verdict == "inconclusive" for c in a.claims),
        claims="; ".join(f"{c.field}: {c.verdict}" for c in a.claims),
    )
    row["assessment_distance [mm]"] = round_significant(
        a.standard_assessment_distance_mm if what_if else a.assessment_distance_mm
    )
    row[HAZARD_COLUMNS_AT] = round_significant(a.assessment_distance_mm)
    if what_if:
        row["what_if_distance [mm]"] = round_significant(a.assessment_distance_mm)
        row["what_if_risk_group"] = a.risk_group or NOT_DETERMINED
    at = what_if_prefix(a)  # the figures below are the what-if's own: never to be read as the classification's
    if a.deciding_hazards:
        row["deciding_hazards"] = at + ", ".join(a.deciding_hazards)
    tightest = tightest_deciding(a)
    if tightest is not None:  # the deciding hazard nearest to the next group up (or furthest over, in RG3)
        row["margin"] = f"{at}{tightest[0]}: {hazard_margin_text(a.hazards[tightest[0]])}"
    if a.uncertainty is not None:
        row.update(
            uncertainty=at + a.uncertainty.verdict,
            group_range=f"{at}{a.uncertainty.risk_group_low}-{a.uncertainty.risk_group_high}",
        )
    if a.distances is not None and "Exempt" in a.distances.minimum_distance_mm:
        found = a.distances.minimum_distance_mm["Exempt"]
        row["min_distance_exempt [mm]"] = (
            round_significant(found) if found is not None else f"not within {a.distances.distance_mm[-1]:.0f}"
        )
    row["emission"] = "continuous" if a.emission is None else a.emission.mode
    if a.emission is not None:
        worst = max((h.pulse.worst for h in a.hazards.values() if h.pulse is not None), default=None)
        row["pulse_max_fraction [1]"] = round_significant(worst)
    x = a.exposure
    if x is not None:
        row["day_within_limits"] = x.within
        if x.most_family is not None:
            row["day_max_fraction [1]"] = round_significant(x.day[x.most_family].worst)
            row["day_max_family"] = x.most_family
    for symbol, h in a.hazards.items():
        value_column, group_column, t_max_column = hazard_headers(symbol, limit_set[symbol].unit)
        row[value_column] = round_significant(h.value)
        row[group_column] = h.risk_group or (
            (f"not assessed, at least {h.lower_bound_group}" if h.lower_bound_group else "not assessed")
            if not h.assessed
            else None
        )
        row[t_max_column] = round_significant(h.t_max_s)
    return row


def _text(value: object) -> str | None:
    return None if value is None else str(value)
