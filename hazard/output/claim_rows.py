"""Vendor claims as flat rows, one per claim: ``hazard check --format csv|json`` and the workbook's claims sheet."""

from __future__ import annotations

from hazard.output.summary_table import round_significant
from hazard.result import Assessment

__all__ = ["CLAIM_COLUMNS", "claim_rows"]

CLAIM_COLUMNS = (
    "id",
    "name",
    "vendor",
    "model",
    "claim",
    "field",
    "claimed",
    "computed",
    "computed_range",
    "distance_mm",
    "tolerance",
    "verdict",
    "reason",
)
"""The columns of a claim row; ``distance_mm`` is where the claim was checked [mm], to 3 significant digits."""


def claim_rows(assessment: Assessment) -> list[dict[str, str | float | None]]:
    """One row per vendor claim of ``assessment``, keyed by :data:`CLAIM_COLUMNS` (None where there is nothing)."""
    record = assessment.record
    product = {
        "id": assessment.id,
        "name": assessment.name,
        "vendor": record.get("vendor"),
        "model": record.get("model"),
    }
    return [
        {
            **product,
            "claim": c.claim,
            "field": c.field,
            "claimed": c.claimed,
            "computed": c.computed,
            "computed_range": c.computed_range,
            "distance_mm": round_significant(c.distance_mm),
            "tolerance": c.tolerance,
            "verdict": c.verdict,
            "reason": c.reason,
        }
        for c in assessment.claims
    ]
