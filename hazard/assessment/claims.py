"""Vendor claims checked against the computed assessment: consistent, contradicted, or not checkable.

A claim is contradicted only when the computed value is worse than claimed beyond the tolerance (a higher
risk group, a shorter t_max) or differs beyond it (CCT, illuminance). Tolerances are our defaults, stated
in every verdict: CCT max(150 K, 5 %) (common practice for white-light tolerances, no published source),
illuminance and t_max 10 % (typical spectroradiometric uncertainty, common practice, no published source).
"""

from __future__ import annotations

from dataclasses import dataclass

from hazard.inputs.record import ProductRecord
from hazard.output.formatting import format_duration_s
from hazard.result import ClaimCheck, HazardResult
from hazard.standards import GROUPS

__all__ = ["DEFAULT_TOLERANCES", "ClaimTolerances", "check_claims"]


@dataclass(frozen=True)
class ClaimTolerances:
    """Tolerances for claims.

    Attributes
    ----------
    cct_k, cct_pct : float
        CCT tolerance: the larger of ``cct_k`` [K] and ``cct_pct`` of the claim [%].
    illuminance_pct : float
        Illuminance tolerance [%].
    t_max_pct : float
        A claimed t_max longer than computed by more than this is contradicted [%].
    """

    cct_k: float = 150.0
    cct_pct: float = 5.0
    illuminance_pct: float = 10.0
    t_max_pct: float = 10.0


DEFAULT_TOLERANCES = ClaimTolerances()


def _group_claim(claimed: str, computed: str | None, complete: bool, not_assessed: list[str]) -> ClaimCheck:
    base = dict(
        claim="risk group",
        field="claimed_risk_group",
        claimed=claimed,
        computed=computed,
        tolerance="none: groups are compared as ordered classes",
    )
    if computed is None:
        return ClaimCheck(
            **base,
            verdict="not checkable",
            reason=f"no risk group could be determined: {', '.join(not_assessed)} not assessed",
        )
    worse = GROUPS.index(computed) > GROUPS.index(claimed)
    if worse:
        qualifier = "at least " if not complete else ""
        return ClaimCheck(
            **base,
            verdict="contradicted",
            reason=f"the spectrum gives {qualifier}{computed} where {claimed} is claimed",
        )
    if not complete:
        return ClaimCheck(
            **base,
            verdict="not checkable",
            reason=f"{computed} is only a lower bound: {', '.join(not_assessed)} not assessed",
        )
    note = "" if computed == claimed else f" (the claim is more cautious than the computed {computed})"
    return ClaimCheck(**base, verdict="consistent", reason=f"the spectrum gives {computed}{note}")


def _close_claim(
    claim: str,
    field: str,
    claimed: float,
    computed: float | None,
    tolerance: float,
    unit: str,
    tolerance_text: str,
    missing: str,
) -> ClaimCheck:
    base = dict(claim=claim, field=field, claimed=f"{claimed:g} {unit}", tolerance=tolerance_text)
    if computed is None:
        return ClaimCheck(**base, computed=None, verdict="not checkable", reason=missing)
    shown = f"{computed:.4g} {unit}"
    difference = computed - claimed
    verdict = "contradicted" if abs(difference) > tolerance else "consistent"
    relation = "beyond" if verdict == "contradicted" else "within"
    return ClaimCheck(
        **base,
        computed=shown,
        verdict=verdict,
        reason=f"computed differs by {difference:+.3g} {unit}, {relation} ±{tolerance:.3g} {unit}",
    )


def _t_max_claim(
    symbol: str, claimed: float, hazard: HazardResult | None, tolerances: ClaimTolerances, distance_mm: float
) -> ClaimCheck:
    base = dict(
        claim=f"t_max of {symbol}",
        field=f"claimed_t_max_s_{symbol}",
        claimed=f"{claimed:g} s",
        tolerance=f"{tolerances.t_max_pct:g} % shorter than claimed",
    )
    if hazard is None:
        return ClaimCheck(
            **base,
            computed=None,
            verdict="not checkable",
            reason=f"{symbol} does not apply to this source (see the hazards assessed)",
        )
    if not hazard.assessed:
        return ClaimCheck(**base, computed=None, verdict="not checkable", reason=hazard.note)
    if hazard.t_max_s is None:
        return ClaimCheck(
            **base,
            computed="not reached",
            verdict="consistent",
            reason=f"the exposure limit is not reached within its time range at {distance_mm:.0f} mm",
        )
    shorter = hazard.t_max_s < claimed * (1 - tolerances.t_max_pct / 100)
    return ClaimCheck(
        **base,
        computed=f"{hazard.t_max_s:.4g} s",
        verdict="contradicted" if shorter else "consistent",
        reason=f"computed t_max {format_duration_s(hazard.t_max_s)} at {distance_mm:.0f} mm"
        + (" is shorter than claimed" if shorter else " is not shorter than claimed"),
    )


def check_claims(
    record: ProductRecord,
    *,
    risk_group: str | None,
    complete: bool,
    not_assessed: list[str],
    hazards: dict[str, HazardResult],
    cct_k: float | None,
    cct_reason: str,
    illuminance_at_record_distance_lx: float | None,
    assessment_distance_mm: float,
    tolerances: ClaimTolerances = DEFAULT_TOLERANCES,
) -> list[ClaimCheck]:
    """Every claim the record makes, with its verdict.

    Parameters
    ----------
    record : ProductRecord
        Holds the ``claimed_*`` fields.
    risk_group, complete, not_assessed, hazards
        The computed assessment.
    cct_k : float or None
        Computed CCT [K]; None with ``cct_reason`` saying why.
    illuminance_at_record_distance_lx : float or None
        Computed illuminance at the record's ``distance_mm`` [lx]; None when it cannot be checked.
    assessment_distance_mm : float
        Where t_max was computed [mm].
    tolerances : ClaimTolerances
    """
    checks = []
    if record.claimed_risk_group is not None:
        checks.append(_group_claim(record.claimed_risk_group, risk_group, complete, not_assessed))
    if record.claimed_cct_k is not None:
        tolerance = max(tolerances.cct_k, tolerances.cct_pct / 100 * record.claimed_cct_k)
        checks.append(
            _close_claim(
                "CCT",
                "claimed_cct_k",
                record.claimed_cct_k,
                cct_k,
                tolerance,
                "K",
                f"±max({tolerances.cct_k:g} K, {tolerances.cct_pct:g} %)",
                cct_reason,
            )
        )
    if record.claimed_illuminance_lx is not None:
        missing = (
            "the spectrum was scaled to a stated illuminance, so it cannot check one"
            if record.illuminance_lx is not None
            else "no distance_mm to compute it at"
        )
        tolerance = tolerances.illuminance_pct / 100 * record.claimed_illuminance_lx
        checks.append(
            _close_claim(
                "illuminance",
                "claimed_illuminance_lx",
                record.claimed_illuminance_lx,
                None if record.illuminance_lx is not None else illuminance_at_record_distance_lx,
                tolerance,
                "lx",
                f"±{tolerances.illuminance_pct:g} %",
                missing,
            )
        )
    for symbol, claimed in record.claimed_t_max_s.items():
        checks.append(_t_max_claim(symbol, claimed, hazards.get(symbol), tolerances, assessment_distance_mm))
    return checks
