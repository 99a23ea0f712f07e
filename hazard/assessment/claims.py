"""Vendor claims checked against the computed assessment, within the stated measurement uncertainty.

A claim is checked at every variant of the record's stated uncertainty (scale ±u and wavelength shift ±Δλ, the
variants of :mod:`hazard.studies.uncertainty`; the nominal assessment alone when the record states none):

- ``consistent``: it holds at every variant;
- ``contradicted``: it fails at every variant (only this verdict gives ``hazard check`` exit code 4: a buyer can
  reject a vendor on it);
- ``inconclusive``: it holds at some variants and fails at others (both outcomes are named): a laboratory
  measurement with a smaller uncertainty decides it;
- ``not checkable``: the data cannot tell (a hazard not assessed, no distance, a lower-bound group that the
  claim does not exceed).

The risk group and t_max claims hold at ``claimed_distance_mm`` (the standard's assessment distance when the
record does not state one); the illuminance claim at the record's ``distance_mm``. A claimed group fails where
the computed group is higher; a claimed t_max fails where the computed one is shorter by more than the
tolerance; CCT and illuminance fail where they differ by more than the tolerance. CCT is checked at the nominal
spectrum only (a scale factor does not change it; a wavelength shift of a few tenths of a nanometre moves it by
far less than its tolerance, common practice, no published source). Tolerances are our defaults, stated in every
verdict: CCT max(150 K, 5 %) (common practice for white-light tolerances, no published source), illuminance and
t_max 10 % (typical spectroradiometric uncertainty, common practice, no published source).
"""

from __future__ import annotations

from dataclasses import dataclass

from hazard.inputs.record import ProductRecord
from hazard.output.formatting import format_distance_mm, format_duration_s, format_signed, format_stated, format_value
from hazard.result import ClaimCheck, HazardBounds, HazardResult, UncertaintyStudy
from hazard.standards import GROUPS

__all__ = ["DEFAULT_TOLERANCES", "ClaimBasis", "ClaimTolerances", "check_claims", "verdict_counts"]


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
        A claimed t_max longer than computed by more than this fails [%].
    """

    cct_k: float = 150.0
    cct_pct: float = 5.0
    illuminance_pct: float = 10.0
    t_max_pct: float = 10.0


DEFAULT_TOLERANCES = ClaimTolerances()


@dataclass(frozen=True)
class ClaimBasis:
    """The computed product the claims are checked against.

    Attributes
    ----------
    distance_mm : float
        Where the group and t_max claims are checked [mm].
    risk_group : str or None
        Overall group there; None when none could be determined.
    complete : bool
        Every applicable hazard was assessed (else ``risk_group`` is a lower bound).
    not_assessed : list of str
        Hazards not assessed.
    hazards : dict
        Hazard results there.
    variants : UncertaintyStudy or None
        The product there across the stated uncertainty; None when the record states none.
    cct_k : float or None
        Computed CCT [K]; None with ``cct_reason`` saying why.
    cct_reason : str
    illuminance_lx : float or None
        Computed illuminance at the record's ``distance_mm`` [lx]; None when it cannot be checked.
    """

    distance_mm: float
    risk_group: str | None
    complete: bool
    not_assessed: list[str]
    hazards: dict[str, HazardResult]
    variants: UncertaintyStudy | None
    cct_k: float | None
    cct_reason: str
    illuminance_lx: float | None

    @property
    def uncertainty_text(self) -> str:
        """The stated uncertainty in words, e.g. "±20 % (k = 2) and ±0.5 nm"."""
        u = self.variants
        if u is None:
            return ""
        return f"±{format_stated(u.uncertainty_pct)} % (k = 2) and ±{format_stated(u.wavelength_uncertainty_nm)} nm"


def _verdict(holds_everywhere: bool, holds_somewhere: bool) -> str:
    if holds_everywhere:
        return "consistent"
    return "inconclusive" if holds_somewhere else "contradicted"


def _group_range(low: str | None, high: str | None) -> str:
    """The groups over the variants in words: "RG1 at every variant", "Exempt to RG1"."""
    if low == high:
        return f"{low or 'not determined'} at every variant"
    return f"{low or 'not determined'} to {high or 'not determined'}"


def _group_claim(claimed: str, basis: ClaimBasis) -> ClaimCheck:
    computed = basis.risk_group
    low, high = computed, computed
    if basis.variants is not None:
        low, high = basis.variants.risk_group_low, basis.variants.risk_group_high
    rank = {g: k for k, g in enumerate(GROUPS)}
    base = dict(
        claim="risk group",
        field="claimed_risk_group",
        claimed=claimed,
        computed=computed,
        tolerance="none: groups are compared as ordered classes",
        distance_mm=basis.distance_mm,
        computed_range=None if basis.variants is None else _group_range(low, high),
    )
    if computed is None or high is None:
        return ClaimCheck(
            **base,
            verdict="not checkable",
            reason=f"no risk group could be determined: {', '.join(basis.not_assessed)} not assessed",
        )
    where = f"at {format_distance_mm(basis.distance_mm)}"
    qualifier = "at least " if not basis.complete else ""
    low_rank = -1 if low is None else rank[low]
    verdict = _verdict(rank[claimed] >= rank[high], rank[claimed] >= low_rank)
    if verdict == "contradicted":
        spread = f" ({low} or higher across {basis.uncertainty_text})" if basis.variants is not None else ""
        reason = f"the spectrum gives {qualifier}{computed}{spread} {where} where {claimed} is claimed"
        return ClaimCheck(**base, verdict=verdict, reason=reason)
    if verdict == "inconclusive":
        reason = (
            f"within {basis.uncertainty_text} the product is {low or 'not determined'} to {high} {where}: the claim "
            f"holds at {low or 'the lowest variant'} and fails at {high}; a measurement with a smaller uncertainty "
            "decides it"
        )
        return ClaimCheck(**base, verdict=verdict, reason=reason)
    if not basis.complete:
        return ClaimCheck(
            **base,
            verdict="not checkable",
            reason=f"{computed} is only a lower bound: {', '.join(basis.not_assessed)} not assessed",
        )
    note = "" if computed == claimed else f" (the claim is more cautious than the computed {computed})"
    held = f", and holds across {basis.uncertainty_text}" if basis.variants is not None else ""
    return ClaimCheck(**base, verdict=verdict, reason=f"the spectrum gives {computed} {where}{note}{held}")


def _close_claim(
    claim: str,
    field: str,
    claimed: float,
    computed: tuple[float, float, float] | None,
    tolerance: float,
    unit: str,
    tolerance_text: str,
    missing: str,
) -> ClaimCheck:
    """A value claim (CCT, illuminance) against ``computed`` = (lowest, nominal, highest) over the variants."""
    base = dict(claim=claim, field=field, claimed=f"{format_stated(claimed)} {unit}", tolerance=tolerance_text)
    if computed is None:
        return ClaimCheck(**base, computed=None, verdict="not checkable", reason=missing)
    low, nominal, high = computed
    spread = low != high
    verdict = _verdict(
        abs(low - claimed) <= tolerance and abs(high - claimed) <= tolerance,
        claimed - tolerance <= high and claimed + tolerance >= low,
    )
    difference = nominal - claimed
    reason = f"computed differs by {format_signed(difference)} {unit}"
    if spread:
        reason += (
            f" (from {format_signed(low - claimed)} to {format_signed(high - claimed)} {unit} across the stated "
            f"uncertainty)"
        )
    reason += {"consistent": ", within", "inconclusive": ", partly beyond", "contradicted": ", beyond"}[verdict]
    reason += f" ±{format_value(tolerance)} {unit}"
    return ClaimCheck(
        **base,
        computed=f"{format_value(nominal, 4)} {unit}",
        computed_range=f"{format_value(low, 4)} to {format_value(high, 4)} {unit}" if spread else None,
        verdict=verdict,
        reason=reason,
    )


def _bounds(symbol: str, variants: UncertaintyStudy | None) -> HazardBounds | None:
    if variants is None:
        return None
    return next((b for b in variants.hazards if b.criterion == symbol), None)


def _t_max_claim(symbol: str, claimed: float, basis: ClaimBasis, tolerances: ClaimTolerances) -> ClaimCheck:
    hazard = basis.hazards.get(symbol)
    base = dict(
        claim=f"t_max of {symbol}",
        field=f"claimed_t_max_s_{symbol}",
        claimed=f"{format_stated(claimed)} s",
        tolerance=f"{format_stated(tolerances.t_max_pct)} % shorter than claimed",
        distance_mm=basis.distance_mm,
    )
    if hazard is None:
        return ClaimCheck(
            **base,
            computed=None,
            verdict="not checkable",
            reason=(
                f"{symbol} does not apply to this source at {format_distance_mm(basis.distance_mm)} (see the "
                f"hazards assessed)"
            ),
        )
    if not hazard.assessed:
        return ClaimCheck(**base, computed=None, verdict="not checkable", reason=hazard.note)
    shortest = longest = hazard.t_max_s
    bounds = _bounds(symbol, basis.variants)
    if bounds is not None:
        shortest, longest = bounds.t_max_shortest_s, bounds.t_max_longest_s
    threshold = claimed * (1 - tolerances.t_max_pct / 100)
    verdict = _verdict(shortest is None or shortest >= threshold, longest is None or longest >= threshold)
    nominal = "not reached" if hazard.t_max_s is None else format_duration_s(hazard.t_max_s)
    spread = None
    if bounds is not None:
        words = [("not reached" if t is None else format_duration_s(t)) for t in (shortest, longest)]
        spread = f"{words[0]} to {words[1]}"
    where = f"at {format_distance_mm(basis.distance_mm)}"
    outcome = {
        "consistent": "is not shorter than claimed",
        "inconclusive": f"is shorter than claimed at some variants of {basis.uncertainty_text}, not at others",
        "contradicted": "is shorter than claimed",
    }[verdict]
    if hazard.t_max_s is None and verdict == "consistent":
        reason = f"the exposure limit is not reached within its time range {where}"
    else:
        reason = f"computed t_max {nominal} {where}" + (f" ({spread} across the uncertainty)" if spread else "")
        reason += f" {outcome}"
    return ClaimCheck(
        **base,
        computed="not reached" if hazard.t_max_s is None else f"{format_value(hazard.t_max_s, 4)} s",
        computed_range=spread,
        verdict=verdict,
        reason=reason,
    )


def check_claims(
    record: ProductRecord, basis: ClaimBasis, tolerances: ClaimTolerances = DEFAULT_TOLERANCES
) -> list[ClaimCheck]:
    """Every claim the record makes, with its verdict.

    Parameters
    ----------
    record : ProductRecord
        Holds the ``claimed_*`` fields.
    basis : ClaimBasis
        The computed product at the claims' distance, with its uncertainty variants.
    tolerances : ClaimTolerances
    """
    checks = []
    if record.claimed_risk_group is not None:
        checks.append(_group_claim(record.claimed_risk_group, basis))
    if record.claimed_cct_k is not None:
        tolerance = max(tolerances.cct_k, tolerances.cct_pct / 100 * record.claimed_cct_k)
        cct = None if basis.cct_k is None else (basis.cct_k, basis.cct_k, basis.cct_k)
        checks.append(
            _close_claim(
                "CCT",
                "claimed_cct_k",
                record.claimed_cct_k,
                cct,
                tolerance,
                "K",
                f"±max({format_stated(tolerances.cct_k)} K, {format_stated(tolerances.cct_pct)} %)",
                basis.cct_reason,
            )
        )
    if record.claimed_illuminance_lx is not None:
        missing = (
            "the spectrum was scaled to a stated illuminance, so it cannot check one"
            if record.illuminance_lx is not None
            else "no distance_mm to compute it at"
        )
        e = None if record.illuminance_lx is not None else basis.illuminance_lx
        u = (record.uncertainty_pct or 0.0) / 100
        tolerance = tolerances.illuminance_pct / 100 * record.claimed_illuminance_lx
        checks.append(
            _close_claim(
                "illuminance",
                "claimed_illuminance_lx",
                record.claimed_illuminance_lx,
                None if e is None else (e * (1 - u), e, e * (1 + u)),
                tolerance,
                "lx",
                f"±{format_stated(tolerances.illuminance_pct)} %",
                missing,
            )
        )
    for symbol, claimed in record.claimed_t_max_s.items():
        checks.append(_t_max_claim(symbol, claimed, basis, tolerances))
    return checks


def verdict_counts(claims: list[ClaimCheck]) -> dict[str, int]:
    """Claims per verdict, every verdict present (0 when none), in the order of the verdicts."""
    order = ("consistent", "inconclusive", "contradicted", "not checkable")
    return {v: sum(c.verdict == v for c in claims) for v in order}
