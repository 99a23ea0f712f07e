"""The terminal view of an assessment: a compact table a safety engineer reads at a glance."""

from __future__ import annotations

from hazard.output.formatting import (
    NOT_DETERMINED,
    UNIT_DISPLAY,
    computed_text,
    dimming_percent,
    distance_beyond_mm,
    emission_text,
    format_distance_mm,
    format_duration_s,
    format_fraction,
    format_limit,
    format_percent,
    format_pulse_count,
    format_stated,
    format_times,
    format_value,
    group_words,
    hazard_margin_text,
    source_size_text,
    tightest_deciding,
    what_if_at,
)
from hazard.result import Assessment

__all__ = ["overall_lines", "render_batch_table", "render_claims", "render_text"]


def _columns(boundaries: list[str]) -> tuple[str, ...]:
    return ("Hazard", "Quantity", "Value", "Unit", "Compared", *boundaries, "t_max", "Group", "Margin")


def _compared(h, boundaries: list[str]) -> str:
    """The values compared with the Exempt / RG1 / RG2 limits.

    Field-of-view averages for radiance; one value when all three are the same.
    """
    if not h.compared:
        return "—"
    values = [h.compared[g] for g in boundaries]
    if len(set(values)) == 1:
        return "= value" if values[0] == h.value else format_value(values[0])
    return " / ".join(format_value(v) for v in values)


def _rows(assessment: Assessment) -> list[tuple[str, ...]]:
    rows = []
    boundaries = assessment.limit_set.boundaries
    for symbol, h in assessment.hazards.items():
        limits = [format_limit(h.limits.get(g)) for g in boundaries]
        rows.append(
            (
                symbol,
                h.title,
                format_value(h.value) if h.assessed else "not assessed",
                UNIT_DISPLAY.get(h.unit, h.unit),
                _compared(h, boundaries),
                *limits,
                format_duration_s(h.t_max_s),
                h.risk_group
                or ("EL only" if h.assessed else f"≥{h.lower_bound_group}" if h.lower_bound_group else "—"),
                hazard_margin_text(h),
            )
        )
    return rows


def _table(columns: tuple[str, ...], rows: list[tuple[str, ...]]) -> list[str]:
    widths = [max(len(r[i]) for r in [columns, *rows]) for i in range(len(columns))]

    def line(r: tuple[str, ...]) -> str:
        return "  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)).rstrip()

    return [line(columns), line(tuple("-" * w for w in widths)), *(line(r) for r in rows)]


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
    title = f"{a.id}  {a.name}" if a.name else a.id
    photometric = ["visible emission negligible"] if p.visible_negligible else [f"{format_value(p.illuminance_lx)} lx"]
    if p.cct_k is not None:
        photometric.append(f"CCT {p.cct_k:.0f} K")
    lines = [
        title,
        *overall_lines(a),
        f"Assessed at {format_distance_mm(a.assessment_distance_mm)} ({g.distance_rule})",
        f"Source: α = {format_value(g.alpha_rad * 1e3)} mrad, "
        f"{source_size_text(a.record) or format_value(g.largest_dimension_mm) + ' mm'}"
        f"{', small source (E_B)' if g.small_source else ''}"
        f"{', weak visual stimulus (L_IR)' if g.weak_visual_stimulus else ''};  " + ", ".join(photometric),
        "",
        *_table(_columns(a.limit_set.boundaries), _rows(a)),
        "Value: for L_B, L_R, L_IR the source's own radiance; Compared: what was compared with the Exempt / RG1 / "
        "RG2 limits (field-of-view averages). Limits as applied (thermal: after the α bounds). Margin: value ÷ "
        "limit at the boundary below the hazard's group and the one above it. t_max: time to reach the exposure "
        "limit (—: not reached).",
    ]
    if a.scaling is not None:
        lines += ["", f"Scaling: {a.scaling.note}"]
    t = a.blue_light_transfer
    if t is not None:
        lines += [
            "",
            f"Blue-light transfer (IEC TR 62778): K_B,v = {format_value(t.k_bv_w_per_lm * 1e3)} mW/lm; the "
            f"blue-light irradiance reaches its threshold at E_thr = "
            f"{format_value(t.threshold_illuminance_lx)} lx, i.e. nearer than "
            f"d_thr = {distance_beyond_mm(t.threshold_distance_mm)} "
            f"(I_v = {format_value(t.luminous_intensity_cd)} cd, {t.intensity_source})",
        ]
    if a.claims:
        lines += ["", *render_claims(a)]
    lines += _emission_lines(a) + _exposure_lines(a) + _studies(a)
    for heading, items in (("Warnings", a.warnings), ("Assumptions", a.assumptions)):
        if items:
            lines += ["", f"{heading}:"] + [f"  - {item}" for item in items]
    lines += ["", f"Caution: {a.cautions[0]}"] + [f"         {c}" for c in a.cautions[1:]]
    return "\n".join(lines) + "\n"


def overall_lines(a: Assessment) -> list[str]:
    """The overall group in words, what it means and what decides it.

    A what-if opens with the standard's group and calls its own a what-if group, never the overall risk group; an
    undetermined group names the fix.
    """
    what_if = a.basis == "what-if"
    label = f"What-if group at {format_distance_mm(a.assessment_distance_mm)}" if what_if else "Overall risk group"
    if a.risk_group is None:
        head = [
            f"{label}: {NOT_DETERMINED.upper()} — no hazard with risk groups could be assessed "
            f"(not assessed: {', '.join(a.not_assessed) or 'none'}); measure the missing wavelength range, or "
            f"state no_emission_outside if the source truly emits nothing outside the measured range"
        ]
    else:
        status = "complete" if a.complete else f"INCOMPLETE, lower bound: not assessed {', '.join(a.not_assessed)}"
        decided = f"; set by {', '.join(a.deciding_hazards)}" if a.risk_group != "Exempt" else ""
        meaning = (
            (
                " — within the exposure limits for the Exempt time bases at the assessment distance"
                if a.complete
                else " — the hazards assessed are within their Exempt limits; those not assessed can raise the group"
            )
            if a.risk_group == "Exempt"
            else ""
        )
        if a.emission is not None:
            meaning = (
                " — a pulse exceeds its exposure limit (a pulsed lamp over a limit is RG3)"
                if a.pulse_exceeds
                else " — each pulse within its exposure limit (single-pulse rule)"
                if a.emission.mode == "single_pulse"
                else meaning + " (time-averaged values; every pulse within its own limit)"
            )
        words = group_words(a.risk_group, a.complete) + (" (not a classification)" if what_if else "")
        head = [f"{label}: {words}{meaning}  ({status}{decided})"]
    if what_if:
        standard_mm = a.standard_assessment_distance_mm
        head.insert(
            0,
            f"WHAT-IF at {format_distance_mm(a.assessment_distance_mm)}, not a classification: the standard's "
            f"distance{'' if standard_mm is None else f' ({format_distance_mm(standard_mm)})'} gives "
            f"{group_words(a.standard_risk_group, a.complete)}",
        )
    return head


def _emission_lines(a: Assessment) -> list[str]:
    """A pulsed source: its pulses, the rule that set the group, and each hazard's pulse against its limit."""
    e = a.emission
    if e is None:
        return []
    values = "of the peak" if e.pulse_rate_hz is None else "values, limits and t_max of the time average"
    head = f"Emission: {emission_text(e)}; {values}."
    lines = ["", head, f"  Rule: {e.rule}"]
    for symbol, h in a.hazards.items():
        p = h.pulse
        if p is None:
            continue
        unit = UNIT_DISPLAY.get(h.unit, h.unit).replace("W", "J", 1)
        parts = [f"{format_value(p.dose_per_pulse)} {unit} per pulse, {format_fraction(p.fraction)} at its duration"]
        if p.fraction_in_train is not None:
            parts.append(
                f"{format_fraction(p.fraction_in_train)} with {format_value(p.pulses_in_window)} pulses in the window"
            )
        if p.pulses_to_limit is not None:
            parts.append(f"{format_pulse_count(p.pulses_to_limit)} pulses reach the limit")
        lines.append(f"  {symbol}: " + "; ".join(parts))
    return lines


def _exposure_lines(a: Assessment) -> list[str]:
    """The day's exposures: each against the limit values, the day's totals, and where the day goes wrong."""
    x = a.exposure
    if x is None:
        return []
    verdict = "within the limit values" if x.within else "EXCEEDS the limit values"
    lines = ["", f"Daily exposure ({x.limit_set}): {verdict}"]
    if x.most_family is not None:
        lines[-1] += (
            f"; most of the allowance: {x.most_family} ({format_fraction(x.day[x.most_family].worst)} over the "
            f"day), mostly from {x.most_exposure!r}"
        )
    rows: list[tuple[str, ...]] = []
    notes = []
    for e in x.exposures:
        for f in e.hazards.values():
            farther = f.shortest_distance_mm is not None and f.shortest_distance_mm > e.distance_mm
            flagged = farther and f.worst <= 1
            if flagged:
                notes.append(f"  * {f.criterion} at {e.label!r}: {f.note}")
            rows.append(
                (
                    e.label,
                    distance_beyond_mm(e.distance_mm),
                    format_duration_s(e.duration_s),
                    f.criterion,
                    format_fraction(f.worst),
                    format_duration_s(f.allowed_duration_s),
                    "—"
                    if f.shortest_distance_mm is None
                    else "any"
                    if f.shortest_distance_mm == 0
                    else distance_beyond_mm(f.shortest_distance_mm) + ("*" if flagged else ""),
                )
            )
    lines += [
        "  " + line
        for line in _table(
            ("Exposure", "Distance", "Duration", "Hazard", "Share", "Allowed there", "Within beyond"), rows
        )
    ]
    day = "; ".join(f"{family} {format_fraction(d.worst)}" for family, d in x.day.items())
    lines += [
        *notes,
        f"  Over the day: {day}",
        "  Allowed there: the longest stay at that distance (—: not reached in a day). Within beyond: the least "
        "distance from which that duration stays within the limit (any: from 10 mm; —: not within 100 m).",
        f"  {x.note}",
    ]
    return lines


def _studies(a: Assessment) -> list[str]:
    """Uncertainty, hazard distances and remedies, as short lines."""
    lines = []
    at = what_if_at(a)  # the uncertainty and the remedies of a what-if are at its own distance
    where = f" ({at})" if at else ""
    if a.uncertainty is not None:
        u = a.uncertainty
        lines += ["", f"Uncertainty{where}: {u.verdict.upper()} — {u.note}"]
    if a.distances is not None:
        shown = []
        for group, d in a.distances.minimum_distance_mm.items():
            name = group if group == "Exempt" else f"{group} or lower"
            shown.append(
                f"{name} beyond {distance_beyond_mm(d)}"
                if d
                else f"{name} at any distance"
                if d == 0
                else f"{name} not within 100 m"
            )
        scope = "" if a.complete else "assessed hazards only; "
        lines += [
            "",
            "Distances: "
            + "; ".join(shown)
            + f" ({scope}values nearer than {distance_beyond_mm(a.distances.near_field_below_mm)} are "
            f"approximate)",
        ]
    if a.remedies is not None:
        product = [
            (r.group, r.dimming_factor)
            for r in a.remedies.remedies
            if r.target == "product" and r.dimming_factor is not None
        ]
        if product:
            lines += [
                "",
                f"What it would take{where}"
                + ("" if a.complete else " (measured data only: hazards not assessed may need more)")
                + ": "
                + "; ".join(
                    f"{group}: dim to {dimming_percent(factor)} of today's output" for group, factor in product
                ),
            ]
        for r in a.remedies.remedies:
            if r.area_factor is not None:
                lines.append(
                    f"  {r.target} → {r.group}: or enlarge the emitting area ×{format_times(r.area_factor)} (diffuser)"
                )
        for symbol, bands in a.remedies.uv_bands.items():
            main = [b for k, b in enumerate(bands[:3]) if k == 0 or b.share >= 0.01]  # the rest is noise
            top = ", ".join(
                f"{format_stated(b.band_nm[0])}–{format_stated(b.band_nm[1])} nm {format_percent(b.share)}"
                for b in main
            )
            lines.append(f"  {symbol} comes mostly from {top}")
    return lines


def render_claims(assessment: Assessment) -> list[str]:
    """The vendor-claim checks as table lines: claim, claimed, computed, tolerance, verdict, reason."""
    header = ("Claim", "Claimed", "Computed", "Tolerance", "Verdict", "Reason")
    rows = [
        (
            c.claim,
            c.claimed,
            computed_text(c),
            c.tolerance or "—",
            c.verdict.upper() if c.verdict in ("contradicted", "inconclusive") else c.verdict,
            c.reason,
        )
        for c in assessment.claims
    ]
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(5)]

    def line(r: tuple[str, ...]) -> str:
        return "  ".join([*(c.ljust(w) for c, w in zip(r[:5], widths, strict=True)), r[5]]).rstrip()

    return ["Vendor claims:", line(header), *(line(r) for r in rows)]


def render_batch_table(ids: list[str], assessments: dict[str, Assessment], errors: dict[str, str]) -> str:
    """One line per product: id, overall group, completeness, the deciding hazards and margin, flags.

    The flags mark results borderline within the stated uncertainty and contradicted vendor claims; a product that
    failed shows its error.

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
        standard = a.basis == "standard"  # a what-if row shows the standard's group; its own is a flag
        deciding = ", ".join(a.deciding_hazards) if standard and a.risk_group not in (None, "Exempt") else ""
        margin = ""
        tightest = tightest_deciding(a) if standard else None
        closest = None if tightest is None else tightest[0]
        if closest is not None:  # for an Exempt product: the hazard nearest its Exempt limit, named
            margin = (
                hazard_margin_text(a.hazards[closest])
                if deciding
                else f"{closest}: " + hazard_margin_text(a.hazards[closest])
            )
        flags = []
        if not standard:
            flags.append(
                f"WHAT-IF at {format_distance_mm(a.assessment_distance_mm)} gives "
                f"{group_words(a.risk_group, a.complete)} (not a classification)"
            )
        if a.uncertainty is not None and a.uncertainty.verdict == "borderline":
            span = f"{a.uncertainty.risk_group_low}-{a.uncertainty.risk_group_high}"
            flags.append(f"BORDERLINE {span}" if standard else f"BORDERLINE {span} at the what-if distance")
        for verdict in ("contradicted", "inconclusive"):
            count = sum(c.verdict == verdict for c in a.claims)
            if count:
                flags.append(f"{count} claim(s) {verdict.upper()}")
        rows.append(
            (
                product_id,
                group_words(a.classification_group, a.complete),
                "complete" if a.complete else "INCOMPLETE",
                deciding,
                margin,
                "; ".join(flags),
            )
        )
    header = ("Product", "Group", "Assessment", "Set by", "Margin", "Flags / error")
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(5)]

    def line(r: tuple[str, ...]) -> str:
        return "  ".join([*(c.ljust(w) for c, w in zip(r[:5], widths, strict=True)), r[5]]).rstrip()

    return "\n".join([line(header), line((*("-" * w for w in widths), "-" * 13)), *(line(r) for r in rows)]) + "\n"
