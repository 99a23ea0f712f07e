"""The terminal view of an assessment: a compact table a safety engineer reads at a glance."""

from __future__ import annotations

from hazard.formatting import UNIT_DISPLAY, format_duration_s, format_limit, format_margin, format_value
from hazard.result import Assessment

__all__ = ["render_text"]

_COLUMNS = ("Hazard", "Quantity", "Value", "Unit", "Exempt", "RG1", "RG2", "t_max", "Group", "Margin")


def _rows(assessment: Assessment) -> list[tuple[str, ...]]:
    rows = []
    for symbol, h in assessment.hazards.items():
        limits = [format_limit(h.limits.get(g)) for g in ("Exempt", "RG1", "RG2")]
        rows.append((symbol, h.title, format_value(h.value) if h.assessed else "not assessed",
                     UNIT_DISPLAY.get(h.unit, h.unit), *limits, format_duration_s(h.t_max_s),
                     h.risk_group or ("EL only" if h.assessed else "—"), format_margin(h.risk_group, h.margins)))
    return rows


def _table(rows: list[tuple[str, ...]]) -> list[str]:
    widths = [max(len(r[i]) for r in [_COLUMNS, *rows]) for i in range(len(_COLUMNS))]
    line = lambda r: "  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip()  # noqa: E731
    return [line(_COLUMNS), line(tuple("-" * w for w in widths)), *(line(r) for r in rows)]


def render_text(assessment: Assessment) -> str:
    """The assessment as plain text for a terminal.

    Parameters
    ----------
    assessment : Assessment

    Returns
    -------
    str
    """
    a, g, p = assessment, assessment.geometry, assessment.photometry
    status = "complete" if a.complete else f"INCOMPLETE, lower bound: not assessed {', '.join(a.not_assessed)}"
    decided = f"; set by {', '.join(a.deciding_hazards)}" if a.risk_group != "Exempt" else ""
    title = f"{a.id}  {a.name}" if a.name else a.id
    photometric = [f"{format_value(p.illuminance_lx)} lx"]
    if p.cct_k is not None:
        photometric.append(f"CCT {p.cct_k:.0f} K")
    lines = [
        title,
        f"Overall risk group: {a.risk_group}  ({status}{decided})",
        f"Assessed at {a.assessment_distance_mm:.0f} mm ({g.distance_rule})",
        f"Source: α = {g.alpha_rad * 1e3:.3g} mrad, {g.largest_dimension_mm:g} mm"
        f"{', small source (E_B)' if g.small_source else ''}"
        f"{', weak visual stimulus (L_IR)' if g.weak_visual_stimulus else ''};  " + ", ".join(photometric),
        "",
        *_table(_rows(a)),
        "Limits are those applied at each group boundary (thermal: after α bounds); margin is value/limit at "
        "the group's upper boundary.",
    ]
    if a.scaling is not None:
        lines += ["", f"Scaling: {a.scaling.note}"]
    t = a.blue_light_transfer
    if t is not None:
        lines += ["", f"Blue-light transfer (IEC TR 62778): K_B,v = {t.k_bv_w_per_lm * 1e3:.3g} mW/lm; E_B reaches "
                      f"1 W/m² at E_thr = {format_value(t.threshold_illuminance_lx)} lx, i.e. nearer than "
                      f"d_thr = {t.threshold_distance_mm:.0f} mm (I_v = {format_value(t.luminous_intensity_cd)} cd, "
                      f"{t.intensity_source})"]
    if a.claims:
        lines += ["", *render_claims(a)]
    lines += _studies(a)
    for heading, items in (("Warnings", a.warnings), ("Assumptions", a.assumptions)):
        if items:
            lines += ["", f"{heading}:"] + [f"  - {item}" for item in items]
    lines += ["", f"Caution: {a.cautions[0]}"] + [f"         {c}" for c in a.cautions[1:]]
    return "\n".join(lines) + "\n"


def _studies(a: Assessment) -> list[str]:
    """Uncertainty, hazard distances and remedies, as short lines."""
    lines = []
    if a.uncertainty is not None:
        u = a.uncertainty
        lines += ["", f"Uncertainty: {u.verdict.upper()} — {u.note}"]
    if a.distances is not None:
        shown = []
        for group, d in a.distances.minimum_distance_mm.items():
            shown.append(f"{group} beyond {d:.0f} mm" if d else f"{group} at any distance" if d == 0
                         else f"{group} not within 100 m")
        lines += ["", "Distances: " + "; ".join(shown)
                  + f" (values nearer than {a.distances.near_field_below_mm:.0f} mm are approximate)"]
    if a.remedies is not None:
        product = [r for r in a.remedies.remedies if r.target == "product" and r.dimming_factor is not None]
        if product:
            lines += ["", "What it would take: " + "; ".join(
                f"{r.group}: dim to {r.dimming_factor * 100:.3g} % of today's output" for r in product)]
        for r in a.remedies.remedies:
            if r.area_factor is not None:
                lines.append(f"  {r.target} → {r.group}: or enlarge the emitting area ×{r.area_factor:.3g} (diffuser)")
        for symbol, bands in a.remedies.uv_bands.items():
            shown = [b for k, b in enumerate(bands[:3]) if k == 0 or b.share >= 0.01]  # the rest is noise
            top = ", ".join(f"{b.band_nm[0]:g}–{b.band_nm[1]:g} nm {b.share * 100:.2g} %" for b in shown)
            lines.append(f"  {symbol} comes mostly from {top}")
    return lines


def render_claims(assessment: Assessment) -> list[str]:
    """The vendor-claim checks as table lines: claim, claimed, computed, tolerance, verdict, reason."""
    header = ("Claim", "Claimed", "Computed", "Tolerance", "Verdict", "Reason")
    rows = [(c.claim, c.claimed, c.computed or "—", c.tolerance or "—", c.verdict.upper() if c.verdict ==
             "contradicted" else c.verdict, c.reason) for c in assessment.claims]
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(5)]
    line = lambda r: "  ".join([*(c.ljust(w) for c, w in zip(r[:5], widths)), r[5]]).rstrip()  # noqa: E731
    return ["Vendor claims:", line(header), *(line(r) for r in rows)]


def render_batch_table(ids: list[str], assessments: dict[str, Assessment], errors: dict[str, str]) -> str:
    """One line per product: id, overall group, completeness, the deciding hazards and margin, flags
    (borderline within the stated uncertainty, contradicted vendor claims), or the error.

    Parameters
    ----------
    ids : list of str
        Products in the order to show.
    assessments : dict
        id → Assessment for the products assessed.
    errors : dict
        id → one-line reason for the products that failed.
    """
    rows = []
    for product_id in ids:
        if product_id in errors:
            rows.append((product_id, "error", "", "", "", errors[product_id]))
            continue
        a = assessments[product_id]
        deciding = ", ".join(a.deciding_hazards) if a.risk_group != "Exempt" else ""
        margin = ""
        if a.deciding_hazards and a.risk_group != "Exempt":
            h = a.hazards[a.deciding_hazards[0]]
            margin = format_margin(h.risk_group, h.margins)
        flags = []
        if a.uncertainty is not None and a.uncertainty.verdict == "borderline":
            flags.append(f"BORDERLINE {a.uncertainty.risk_group_low}-{a.uncertainty.risk_group_high}")
        contradicted = sum(c.verdict == "contradicted" for c in a.claims)
        if contradicted:
            flags.append(f"{contradicted} claim(s) CONTRADICTED")
        rows.append((product_id, a.risk_group, "complete" if a.complete else "INCOMPLETE", deciding, margin,
                     "; ".join(flags)))
    header = ("Product", "Group", "Assessment", "Set by", "Margin", "Flags / error")
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(5)]
    line = lambda r: "  ".join([*(c.ljust(w) for c, w in zip(r[:5], widths)), r[5]]).rstrip()  # noqa: E731
    return "\n".join([line(header), line(tuple("-" * w for w in widths) + ("-" * 13,)),
                      *(line(r) for r in rows)]) + "\n"
