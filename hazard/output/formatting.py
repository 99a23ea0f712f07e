"""Number, duration and margin formatting shared by the text output and the PDF report."""

from __future__ import annotations

import math
import re

from hazard.result import Assessment, ClaimCheck, Emission, HazardResult, Photometry

__all__ = [
    "NOT_DETERMINED",
    "PLAIN_RANGE",
    "PULSE_LIMIT",
    "UNIT_DISPLAY",
    "format_distance_mm",
    "format_duration_s",
    "format_fraction",
    "format_limit",
    "format_margin",
    "format_percent",
    "format_pulse_count",
    "format_signed",
    "format_stated",
    "format_times",
    "format_value",
    "group_words",
    "hazard_margin",
    "hazard_margin_text",
    "margin_to_next",
    "photometry_text",
    "pulse_decides",
    "source_size_text",
    "superscript",
    "tightest_deciding",
    "unit_text",
    "what_if_at",
    "what_if_prefix",
]

_SUPERSCRIPT = str.maketrans("0123456789-+", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺")
PLAIN_RANGE = (1e-3, 1e5)
"""Numbers whose magnitude lies in this range are printed without a power of ten [1]."""


def superscript(text: str) -> str:
    """Digits and signs of ``text`` as superscript characters: ``'-4'`` → ``'⁻⁴'``."""
    return text.translate(_SUPERSCRIPT)


_UNIT_TOKEN = re.compile(r"([A-Za-zµμ]+)\^?([-−⁻]?[0-9⁰¹²³⁴⁵⁶⁷⁸⁹]+)?")
_PLAIN_DIGITS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻−", "0123456789--")


def unit_text(unit: str) -> str:
    """A unit as written for people: superscript powers, ``µ`` for micro, one ``/`` before a bracketed denominator.

    Units that do not read as products of powers of symbols come back unchanged.

    Examples
    --------
    >>> unit_text("W/m2/sr/nm"), unit_text("uW/cm^2/nm"), unit_text("W m-2"), unit_text("cd/m2"), unit_text("K")
    ('W/(m²·sr·nm)', 'µW/(cm²·nm)', 'W/m²', 'cd/m²', 'K')
    """
    text = unit.replace("·", " ").replace("*", " ").strip()
    powers: dict[str, int] = {}
    for index, part in enumerate(text.split("/")):
        sign = 1 if index == 0 else -1
        cleaned = part.replace("(", " ").replace(")", " ")
        if not cleaned.strip() or _UNIT_TOKEN.sub("", cleaned).strip():
            return unit
        for base, power in _UNIT_TOKEN.findall(cleaned):
            symbol = "µ" + base[1:] if base[0] in "uμ" and len(base) > 1 else base
            powers[symbol] = powers.get(symbol, 0) + sign * (int(power.translate(_PLAIN_DIGITS)) if power else 1)

    def written(items: list[tuple[str, int]]) -> str:
        return "·".join(base + (superscript(str(power)) if power != 1 else "") for base, power in items)

    above = [(b, p) for b, p in powers.items() if p > 0]
    below = [(b, -p) for b, p in powers.items() if p < 0]
    if not below:
        return written(above) or unit
    denominator = written(below)
    return f"{written(above) or '1'}/{denominator if len(below) == 1 else f'({denominator})'}"


UNIT_DISPLAY = {code: unit_text(code) for code in ("W/m2", "W/m2/sr", "W/m2/nm", "W/m2/sr/nm")}
"""How each SI unit code of the results is written for people (one spelling in every output)."""
PULSE_LIMIT = "pulse limit"
"""The boundary a pulsed hazard's margin is taken at when its pulse check sets the group."""
NOT_DETERMINED = "not determined"
"""The overall group in words when no hazard with risk groups could be assessed."""
_DURATION_UNITS = (
    (3600.0, 3600.0, "h"),
    (60.0, 60.0, "min"),
    (1.0, 0.1, "s"),
    (1e-3, 1e-4, "ms"),
    (1e-6, -math.inf, "µs"),
)  # (seconds per unit, shown from, unit)


def format_value(value: float | None, digits: int = 3) -> str:
    """A value with ``digits`` significant digits (trailing zeros dropped), or an em dash for None.

    Magnitudes in :data:`PLAIN_RANGE` are written out; others as a significand times a power of ten with a
    superscript exponent, so no output holds ``e+04`` or ``^``.

    Examples
    --------
    >>> format_value(0.000523991), format_value(46154.5596), format_value(None)
    ('5.24×10⁻⁴', '46200', '—')
    >>> format_value(12.3456), format_value(2336912.6), format_value(4e6), format_value(0.001)
    ('12.3', '2.34×10⁶', '4×10⁶', '0.001')
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    if value == 0:
        return "0"
    significand, exponent_text = f"{value:.{digits - 1}e}".split("e")
    exponent = int(exponent_text)
    if math.log10(PLAIN_RANGE[0]) <= exponent < math.log10(PLAIN_RANGE[1]):
        decimals = max(digits - 1 - exponent, 0)
        text = f"{float(significand) * 10.0**exponent:.{decimals}f}"
        return text.rstrip("0").rstrip(".") if "." in text else text
    significand = significand.rstrip("0").rstrip(".") if "." in significand else significand
    return f"{significand}×10{superscript(str(exponent))}"


def format_stated(value: float | None) -> str:
    """A number stated by the user or a standard (a distance, a tolerance, a wavelength), up to six significant digits.

    Written as :func:`format_value` writes numbers, so a stated 10⁸ mm never reads ``1e+08``.

    Examples
    --------
    >>> format_stated(1000.0), format_stated(0.5), format_stated(380.25), format_stated(1e8), format_stated(1e-5)
    ('1000', '0.5', '380.25', '1×10⁸', '1×10⁻⁵')
    """
    return format_value(value, 6)


def format_signed(value: float) -> str:
    """A difference with its sign, three significant digits (:func:`format_value`).

    Examples
    --------
    >>> format_signed(12.345), format_signed(-995000.0), format_signed(0.0)
    ('+12.3', '-9.95×10⁵', '+0')
    """
    return format_value(value) if value < 0 else "+" + format_value(value)


def format_distance_mm(distance_mm: float) -> str:
    """A distance as written for people: whole millimetres from 10 mm to 10⁵ mm, else three significant digits.

    Examples
    --------
    >>> format_distance_mm(200.0), format_distance_mm(2323.46), format_distance_mm(2.5), format_distance_mm(0.002)
    ('200 mm', '2323 mm', '2.5 mm', '0.002 mm')
    >>> format_distance_mm(447213.6), format_distance_mm(1e8)
    ('4.47×10⁵ mm', '1×10⁸ mm')
    """
    if 10 <= distance_mm < PLAIN_RANGE[1]:
        return f"{distance_mm:.0f} mm"
    return f"{format_value(distance_mm)} mm"


def what_if_at(assessment: Assessment) -> str:
    """``'what-if at 30 mm'`` for a what-if result; empty for one at the standard's distance."""
    if assessment.basis != "what-if":
        return ""
    return f"what-if at {format_distance_mm(assessment.assessment_distance_mm)}"


def what_if_prefix(assessment: Assessment) -> str:
    """``'what-if at 30 mm: '`` before a figure of a what-if result; nothing before one at the standard's distance.

    Every summary puts it before the what-if's own figures (deciding hazards, margins, the uncertainty verdict), so
    none of them can be read as the standard's classification beside which they stand.
    """
    at = what_if_at(assessment)
    return f"{at}: " if at else ""


def _significant(value: float, digits: int, direction: str) -> float:
    """``value`` > 0 rounded to ``digits`` significant digits towards ``"up"`` or ``"down"``."""
    exponent = math.floor(math.log10(value)) - digits + 1
    scaled = value / 10.0**exponent
    scaled = round(scaled, 9)  # floating noise (1.2300000000001) is not a digit
    step = math.ceil(scaled) if direction == "up" else math.floor(scaled)
    return step * 10.0**exponent


def plain(value: float) -> str:
    """A positive number already rounded, without trailing zeros, written as :func:`format_value` writes numbers.

    Examples
    --------
    >>> plain(1.02), plain(227.0), plain(0.0015), plain(2.5e14), plain(3e-7)
    ('1.02', '227', '0.0015', '2.5×10¹⁴', '3×10⁻⁷')
    """
    return format_value(value, 15)  # every digit the rounding kept, none of the float's noise beyond them


def round_up(value: float, digits: int = 3) -> str:
    """``value`` rounded up at ``digits`` significant digits.

    The safe way to print how far a limit is exceeded or a distance to keep.

    Examples
    --------
    >>> round_up(1.0001), round_up(99.6), round_up(226.04), round_up(25300.0)
    ('1.01', '99.6', '227', '25300')
    """
    return plain(_significant(value, digits, "up"))


def format_times(factor: float) -> str:
    """A factor > 0 rounded up at three significant digits, written as :func:`format_value` writes numbers.

    The safe way to print how far a limit is exceeded or by how much a source must be enlarged.

    Examples
    --------
    >>> format_times(1.0001), format_times(835.56), format_times(1593.2), format_times(2.3412e6)
    ('1.01', '836', '1600', '2.35×10⁶')
    """
    return format_value(_significant(factor, 3, "up"))


def round_down(value: float, digits: int = 3) -> str:
    """``value`` rounded down at ``digits`` significant digits: the safe way to print a dimming factor or a time.

    Examples
    --------
    >>> round_down(66.72), round_down(0.24999, 2)
    ('66.7', '0.24')
    """
    return plain(_significant(value, digits, "down"))


def distance_beyond_mm(distance_mm: float) -> str:
    """A distance beyond which something holds, rounded up.

    Whole millimetres from 10 mm to 10⁵ mm, two significant digits below, three with a power of ten above (a product
    is never said to be safe nearer than it is).

    Examples
    --------
    >>> distance_beyond_mm(226.04), distance_beyond_mm(0.2501), distance_beyond_mm(2.3412e6)
    ('227 mm', '0.26 mm', '2.35×10⁶ mm')
    """
    if distance_mm >= PLAIN_RANGE[1]:
        return f"{format_times(distance_mm)} mm"
    return f"{math.ceil(distance_mm)} mm" if distance_mm >= 10 else f"{round_up(distance_mm, 2)} mm"


def dimming_percent(factor: float) -> str:
    """A dimming factor as a percentage of today's output, rounded down at three significant digits.

    Dimming to the printed figure always reaches the group.

    Examples
    --------
    >>> dimming_percent(0.66672)
    '66.6 %'
    """
    return f"{round_down(factor * 100)} %"


def format_limit(value: float | None) -> str:
    """A limit as the standard prints it: three significant digits, no trailing zeros.

    Examples
    --------
    >>> format_limit(0.001), format_limit(4e6), format_limit(2336912.6), format_limit(28000.0), format_limit(None)
    ('0.001', '4×10⁶', '2.34×10⁶', '28000', '—')
    """
    return format_value(value)


def format_duration_s(seconds: float | None) -> str:
    """A duration in the largest sensible unit (µs, ms, s, min, h).

    Rounded down at two significant digits (a time to a limit is never printed longer than it is).

    Examples
    --------
    >>> format_duration_s(263.49), format_duration_s(0.2499), format_duration_s(9000), format_duration_s(None)
    ('4.3 min', '0.24 s', '2.5 h', '—')
    >>> format_duration_s(2e-9), format_duration_s(0.0)
    ('0.002 µs', 'at once')

    Zero: the limit is exceeded by any exposure, however brief (a limit held at its shortest-time value).
    """
    if seconds is None:
        return "—"
    if seconds <= 0:
        return "at once"
    scale, unit = next((scale, unit) for scale, threshold, unit in _DURATION_UNITS if seconds >= threshold)
    amount = seconds / scale
    return f"{round_down(amount, 2)} {unit}" if amount < 10 else f"{math.floor(amount):.0f} {unit}"


def format_percent(ratio: float) -> str:
    """A ratio ≤ 1 as a percentage with up to three significant digits, never in exponent form.

    Examples
    --------
    >>> format_percent(0.38), format_percent(0.9999), format_percent(0.0045), format_percent(1e-7)
    ('38 %', '100 %', '0.45 %', '<0.01 %')
    """
    percent = ratio * 100
    if percent < 0.01:
        return "<0.01 %"
    digits = 3 if percent >= 1 else 2
    text = f"{percent:.{digits}g}"
    if "e" in text:  # 99.96 → 1e+02 at two digits: print the whole number instead
        text = f"{percent:.0f}"
    return f"{text} %"


def format_pulse_count(count: float) -> str:
    """A number of pulses, rounded down; "over a million" beyond.

    Examples
    --------
    >>> format_pulse_count(438012.7), format_pulse_count(4.1e9)
    ('4.38×10⁵', 'over a million')
    """
    return round_down(count) if count < 1e6 else "over a million"


def format_fraction(ratio: float) -> str:
    """An exposure as a share of its limit: a percentage up to the limit, a multiple (rounded up) beyond.

    Examples
    --------
    >>> format_fraction(0.2164), format_fraction(5.832), format_fraction(1.00001)
    ('21.6 % of limit', '5.84× limit', '1.01× limit')
    """
    return f"{format_percent(ratio)} of limit" if ratio <= 1 else f"{_times(ratio)} limit"


def _times(ratio: float) -> str:
    """A ratio > 1 as a multiple, rounded up at three significant digits (never "1×"): ``'1.02×'``, ``'99.6×'``."""
    return f"{format_times(ratio)}×"


def margin_to_next(risk_group: str | None, margins: dict[str, float]) -> tuple[str, float] | None:
    """The boundary that matters for a hazard in ``risk_group`` and the ratio value/limit there.

    For a group with an upper limit it is that limit (ratio ≤ 1: how much headroom is left); for the highest
    group it is the last boundary's limit (ratio > 1: how far over). None when the hazard has no groups.
    """
    if risk_group is None or not margins:
        return None
    boundary = risk_group if risk_group in margins else list(margins)[-1]
    return boundary, margins[boundary]


def format_margin(risk_group: str | None, margins: dict[str, float]) -> str:
    """The ratio value/limit at the nearest boundary below the hazard's group and above it.

    Examples
    --------
    >>> format_margin("Exempt", {"Exempt": 0.38, "RG1": 0.1, "RG2": 0.001})
    '38 % of Exempt limit'
    >>> format_margin("RG2", {"Exempt": 180.0, "RG1": 1.8, "RG2": 0.0045})
    '1.8× RG1 limit; 0.45 % of RG2 limit'
    >>> format_margin("RG3", {"Exempt": 300.0, "RG1": 100.0, "RG2": 3.2})
    '3.2× RG2 limit'
    """
    if risk_group is None or not margins:
        return "—"
    boundaries = list(margins)  # in rising order; a group beyond the last boundary is the highest
    rank = boundaries.index(risk_group) if risk_group in boundaries else len(boundaries)
    parts = []
    if rank > 0:
        below = boundaries[rank - 1]
        parts.append(
            f"{_times(margins[below])} {below} limit"
            if margins[below] > 1
            else f"{format_percent(margins[below])} of {below} limit"
        )
    if rank < len(boundaries):
        above = boundaries[rank]
        parts.append(
            f"{format_percent(margins[above])} of {above} limit"
            if margins[above] <= 1
            else f"{_times(margins[above])} {above} limit"
        )
    return "; ".join(parts)


def group_words(
    risk_group: str | None, complete: bool = True, basis: str = "standard", distance_mm: float | None = None
) -> str:
    """The overall group as words for a heading.

    ``'RG2'``, ``'RG1 (lower bound)'``, ``'not determined'``, ``'what-if at 500 mm: Exempt'``.

    Examples
    --------
    >>> group_words("RG1", complete=False), group_words(None), group_words("Exempt", True, "what-if", 500.0)
    ('RG1 (lower bound)', 'not determined', 'what-if at 500 mm: Exempt')
    """
    text = NOT_DETERMINED if risk_group is None else risk_group + ("" if complete else " (lower bound)")
    if basis == "what-if":
        at = "" if distance_mm is None else f" at {format_distance_mm(distance_mm)}"
        return f"what-if{at}: {text}"
    return text


def pulse_decides(h: HazardResult) -> bool:
    """The hazard's group comes from its pulse check: a single pulse, or a pulse over its limit."""
    return h.pulse is not None and h.risk_group is not None and (not h.limits or h.pulse.worst > 1)


def hazard_margin(h: HazardResult) -> tuple[str, float] | None:
    """The boundary that matters for a hazard and the ratio value/limit there (:func:`margin_to_next`).

    Where the pulse check sets the group it is the pulse's own exposure limit (:data:`PULSE_LIMIT`).
    """
    if pulse_decides(h) and h.pulse is not None:
        return PULSE_LIMIT, h.pulse.worst
    return margin_to_next(h.risk_group, h.margins)


def tightest_deciding(assessment: Assessment) -> tuple[str, str, float] | None:
    """(symbol, boundary, ratio) of the deciding hazard nearest its boundary (:func:`hazard_margin`).

    The largest ratio value/limit among ``deciding_hazards`` (least headroom, or furthest over the RG2 limit), ties
    to the later symbol; None when no deciding hazard has groups.
    """
    found = [(s, *m) for s in assessment.deciding_hazards if (m := hazard_margin(assessment.hazards[s])) is not None]
    return max(found, key=lambda t: (t[2], t[0]), default=None)


def hazard_margin_text(h: HazardResult) -> str:
    """A hazard's margin in words (:func:`format_margin`); a pulse's share of its own limit where it decides."""
    if pulse_decides(h) and h.pulse is not None:
        return f"a pulse at {format_fraction(h.pulse.worst)}"
    return format_margin(h.risk_group, h.margins)


def computed_text(claim: ClaimCheck) -> str:
    """A claim's computed value, with its range across the stated uncertainty when there is one."""
    text = claim.computed or "—"
    if not claim.computed_range:
        return text
    if claim.computed_range.endswith("at every variant"):
        return f"{text} (at every variant of the uncertainty)"
    return f"{text} ({claim.computed_range} within the uncertainty)"


def source_size_text(record: dict) -> str | None:
    """The source's size as the record gives it: ``'60 × 40 mm'``, ``'30 mm across'``, ``'α = 12 mrad at 500 mm'``.

    None when the record states none of them.

    Examples
    --------
    >>> source_size_text({"source_width_mm": 60.0, "source_height_mm": 40.0})
    '60 × 40 mm'
    >>> source_size_text({"source_diameter_mm": 30.0})
    '30 mm across'
    """
    if record.get("source_width_mm") is not None and record.get("source_height_mm") is not None:
        return f"{format_value(record['source_width_mm'], 6)} × {format_value(record['source_height_mm'], 6)} mm"
    if record.get("source_diameter_mm") is not None:
        return f"{format_value(record['source_diameter_mm'], 6)} mm across"
    if record.get("source_alpha_mrad") is not None and record.get("distance_mm") is not None:
        return f"α = {format_value(record['source_alpha_mrad'], 6)} mrad at {format_value(record['distance_mm'], 6)} mm"
    return None


def photometry_text(p: Photometry) -> str:
    """Illuminance and luminance in words, or that the visible emission is negligible."""
    if p.visible_negligible:
        return "negligible: the visible emission is under a millionth of the radiant power (no colour is given)"
    return (
        f"{format_value(p.illuminance_lx)} lx at the assessment distance; luminance "
        f"{format_value(p.luminance_cd_m2)} cd/m²"
    )


def emission_text(e: Emission) -> str:
    """How a pulsed source emits, in words (the text output and the PDF say it alike).

    ``'a single pulse of 1 ms'``, or ``'a pulse train, 100 µs pulses at 2 Hz (duty cycle 2×10⁻⁴)'``.
    """
    if e.pulse_rate_hz is None:
        return f"a single pulse of {format_duration_s(e.pulse_duration_s)}"
    return (
        f"a pulse train, {format_duration_s(e.pulse_duration_s)} pulses at {format_value(e.pulse_rate_hz)} Hz "
        f"(duty cycle {format_value(e.duty_cycle)})"
    )
