"""A batch's summary as one self-contained web page, ``summary.html``.

No server, no network: the styles, the script and every chart are inside the file, and the only links are to the
products' own PDF and JSON files beside it. The page holds the ranked table of :func:`hazard.reports.rank_assessments`
(sortable by any column, filterable by group, vendor, flags, basis and text), a small drawing of each product's
headroom on the shared scale of :mod:`hazard.reports.headroom`, and, on request, a chart of every product's
contributions by wavelength for one hazard. It works with the keyboard (the column headings are buttons, the filters
are form controls with labels), names every group in text, and prints as a plain table.

Rendering only: every figure comes from the results and is formatted by :mod:`hazard.output.formatting`.
"""

from __future__ import annotations

import datetime
import json
from html import escape
from importlib import resources
from pathlib import Path
from typing import Protocol

from hazard.output.atomic import write_atomic
from hazard.output.formatting import group_words, hazard_margin_text, pulse_decides, what_if_at, what_if_prefix
from hazard.reports.headroom import scale_position
from hazard.reports.layout import start_report
from hazard.reports.ranking import is_borderline, rank_assessments, ranks_by_margin, tightest_margin
from hazard.reports.studies import minimum_text
from hazard.reports.style import GROUP_FILL, ZONE_TINT
from hazard.reports.timestamp import format_report_time
from hazard.reports.wording import FOOTER, GROUP_NAME
from hazard.result import Assessment

__all__ = ["HTML_NAME", "HTML_PRODUCTS", "render_summary_html", "write_summary_html"]

HTML_NAME = "summary.html"
HTML_PRODUCTS = 5000
"""Products listed on the page at most (the highest ranked); summary.csv has them all [1]."""

_FLAG_NAMES = {
    "borderline": "borderline",
    "incomplete": "incomplete (lower bound)",
    "contradicted": "vendor claim contradicted",
    "inconclusive": "vendor claim inconclusive",
    "what-if": "what-if distance",
}


class _Outcome(Protocol):
    """What :func:`write_summary_html` needs of a batch's outcome (:class:`hazard.assessment.batch.BatchOutcome`)."""

    ids: list[str]
    errors: dict[str, str]
    stems: dict[str, str]
    written: list[str]

    @property
    def assessments(self): ...


def _asset(name: str) -> str:
    """A style sheet or script shipped beside this module, to be put inside the page."""
    return resources.files("hazard.reports").joinpath(name).read_text(encoding="utf-8")


def _hex(colour) -> str:
    return "#" + colour.hexval()[2:].upper()


def _flags(a: Assessment) -> list[str]:
    """The product's flags (keys of :data:`_FLAG_NAMES`); borderline only of a classification (see :func:`_row`)."""
    flags = []
    if ranks_by_margin(a) and is_borderline(a):
        flags.append("borderline")
    if not a.complete:
        flags.append("incomplete")
    for verdict in ("contradicted", "inconclusive"):
        if any(c.verdict == verdict for c in a.claims):
            flags.append(verdict)
    if a.basis == "what-if":
        flags.append("what-if")
    return flags


def _headroom_svg(a: Assessment) -> str:
    """Each grouped hazard of ``a`` as a row of the shared scale: four zones and a bar to the hazard's place.

    A what-if's drawing is of its own distance and is headed so ("what-if at 30 mm").
    """
    rows = [
        h
        for h in a.hazards.values()
        if h.assessed and h.limits and h.margins and not pulse_decides(h) and next(iter(h.margins.values())) > 0
    ]
    groups = a.limit_set.groups
    if not rows:
        return '<span class="muted">no scale to draw</span>'
    label_w, zone_w, row_h = 44, 34, 11
    width, height = label_w + zone_w * len(groups), row_h * len(rows)
    words = what_if_prefix(a) + "; ".join(f"{h.symbol} {h.risk_group}, {hazard_margin_text(h)}" for h in rows)
    parts = [f'<span class="muted">{escape(what_if_at(a))}</span><br>'] if a.basis == "what-if" else []
    parts.append(
        f'<svg class="headroom" role="img" width="{width}" height="{height}" viewBox="0 0 {width} {height}" '
        f'aria-label="Headroom: {escape(words)}"><title>Headroom: {escape(words)}</title>'
    )
    for i, h in enumerate(rows):
        y = i * row_h
        parts.append(f'<text x="0" y="{y + 8.5}">{escape(h.symbol)}</text>')
        for k, group in enumerate(groups):
            parts.append(
                f'<rect x="{label_w + k * zone_w}" y="{y + 1}" width="{zone_w}" height="{row_h - 2}" '
                f'fill="{_hex(ZONE_TINT[group])}"/>'
            )
        place = min(max(scale_position(h.margins), 0.0), len(groups)) * zone_w
        parts.append(
            f'<rect x="{label_w}" y="{y + 4.5}" width="{place:.1f}" height="2" fill="#1F2A36"/>'
            f'<circle cx="{label_w + place:.1f}" cy="{y + 5.5}" r="3" fill="#1F2A36"/>'
        )
    for k in range(1, len(groups)):
        parts.append(
            f'<line x1="{label_w + k * zone_w}" y1="0" x2="{label_w + k * zone_w}" y2="{height}" stroke="#1F2A36" '
            f'stroke-width="0.8"/>'
        )
    parts.append("</svg>")
    return "".join(parts)


def _group_cell(a: Assessment) -> tuple[str, str]:
    """The classification group in words with its swatch, and its sort key (higher groups sort high)."""
    group = a.classification_group
    groups = a.limit_set.groups
    rank = -1 if group is None else groups.index(group)
    words = group_words(group, a.complete)
    swatch = "" if group is None else f'<span class="swatch" style="background:{_hex(GROUP_FILL[group])}"></span>'
    title = GROUP_NAME.get(group or "", "no group could be determined")
    return f'{swatch}<span title="{escape(title)}">{escape(words)}</span>', str(rank)


def _links(stem: str, files: set[str]) -> str:
    links = [
        f'<a href="{escape(stem)}.{kind}">{kind.upper()}<span class="visually-hidden"> of {escape(stem)}</span></a>'
        for kind in ("pdf", "json")
        if f"{stem}.{kind}" in files
    ]
    return " ".join(links) or '<span class="muted">—</span>'


def _row(rank: int, a: Assessment, stem: str, files: set[str]) -> str:
    """One product's table row.

    The group is the classification's; a what-if's own figures (deciding hazards, margin, headroom, a borderline
    verdict) are headed "what-if at N mm" and its margin sorts as unknown (the classification's is not in the result).
    """
    group_html, group_key = _group_cell(a)
    tightest = tightest_margin(a)
    at = what_if_prefix(a)
    margin = "—" if tightest is None else f"{at}{tightest.symbol}: {hazard_margin_text(a.hazards[tightest.symbol])}"
    ratio = "" if tightest is None or not ranks_by_margin(a) else repr(tightest.ratio)
    vendor = str(a.record.get("vendor", ""))
    flags = _flags(a)
    distance, distance_key = "—", ""
    if a.distances is not None:
        distance = minimum_text(a.distances, "Exempt", metres=False)
        found = a.distances.minimum_distance_mm.get("Exempt")
        distance_key = "1e99" if found is None else repr(found)
    names = [_FLAG_NAMES[f] for f in flags]
    if a.basis == "what-if":
        names[names.index(_FLAG_NAMES["what-if"])] += (
            f" ({group_words(a.risk_group, a.complete, a.basis, a.assessment_distance_mm)}"
            + (", borderline there" if is_borderline(a) else "")
            + ")"
        )
    flag_text = ", ".join(names) or "—"
    group = a.classification_group or "not determined"
    cells = [
        (str(rank), str(rank), ""),
        (f'<span class="id">{escape(a.id)}</span><br><span class="name">{escape(a.name or "")}</span>', a.id, ""),
        (escape(vendor) or "—", vendor, ""),
        (group_html, group_key, ""),
        (escape(what_if_at(a) or a.basis), a.basis, ""),
        (escape(at + ", ".join(a.deciding_hazards) if a.deciding_hazards else "—"), ", ".join(a.deciding_hazards), ""),
        (escape(margin), ratio, ""),
        (escape(distance), distance_key, ""),
        (escape(flag_text), " ".join(flags), ""),
        (_headroom_svg(a), "", ' class="chart"'),
        (_links(stem, files), "", ""),
    ]
    tds = "".join(f'<td data-sort="{escape(key)}"{extra}>{html}</td>' for html, key, extra in cells)
    return (
        f'<tr data-group="{escape(group)}" data-vendor="{escape(vendor)}" data-flags="{" ".join(flags)}" '
        f'data-basis="{escape(a.basis)}" data-id="{escape(a.id)}">{tds}</tr>'
    )


_COLUMNS = (
    ("#", "number"),
    ("Product", "text"),
    ("Vendor", "text"),
    ("Group", "number"),
    ("Basis", "text"),
    ("Deciding hazards", "text"),
    ("Tightest margin", "number"),
    ("Min. distance to Exempt", "number"),
    ("Flags", "text"),
    ("Headroom", ""),
    ("Files", ""),
)


def _contribution_data(assessments: list[Assessment]) -> dict:
    """Product id → hazard → [first band's lower edge, band width, shares], for the chart drawn on request."""
    return {
        a.id: {symbol: [c.start_nm, c.step_nm, c.share] for symbol, c in a.contributions.items()} for a in assessments
    }


def _script_json(data: object) -> str:
    """JSON safe inside a script element (no ``</``)."""
    return json.dumps(data, separators=(",", ":"), sort_keys=True, ensure_ascii=True).replace("</", "<\\/")


def render_summary_html(
    assessments: list[Assessment],
    errors: list[tuple[str, str]],
    stems: dict[str, str],
    files: set[str] | None = None,
    rendered_at: datetime.datetime | None = None,
) -> str:
    """The batch summary as one self-contained HTML page.

    Parameters
    ----------
    assessments : list of Assessment
        The products assessed (ranked here).
    errors : list of (str, str)
        Products that could not be assessed: id and reason (its first line is shown).
    stems : dict
        Product id → stem of its files (``STEM.pdf``, ``STEM.json``).
    files : set of str, optional
        Names of the files beside the page; only those are linked.
    rendered_at : datetime.datetime, optional
        Timezone-aware time printed as the page's date; defaults to :func:`reports.report_time`.

    Returns
    -------
    str
        The page; the same input and ``rendered_at`` give the same text.
    """
    moment, _, _ = start_report(rendered_at)
    files = files or set()
    ranked = rank_assessments(assessments)
    shown = ranked[:HTML_PRODUCTS]
    groups = list(assessments[0].limit_set.groups) if assessments else ["Exempt", "RG1", "RG2", "RG3"]
    tools = ", ".join(sorted({f"hazard {a.provenance.tool_version}" for a in assessments})) or "—"
    limit_sets = ", ".join(sorted({a.provenance.limit_set for a in assessments})) or "—"
    identity = next((a.provenance.identity for a in assessments if a.provenance.identity is not None), None)
    issuer = "" if identity is None else f" · {identity.header_text()}"
    counts = [(g, sum(a.classification_group == g for a in assessments)) for g in reversed(groups)]
    undetermined = sum(a.classification_group is None for a in assessments)
    what_if = sum(a.basis == "what-if" for a in assessments)
    cautions: dict[str, list[str]] = {}
    for a in ranked:
        for caution in a.cautions:
            cautions.setdefault(caution, []).append(a.id)
    vendors = sorted({str(a.record.get("vendor")) for a in assessments if a.record.get("vendor")})
    hazards = sorted({s for a in assessments for s in a.contributions}, key=lambda s: _hazard_order(assessments, s))
    e = escape
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en">',
        "<head>",
        '<meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>Photobiological safety pre-screen — batch summary ({len(assessments)} products)</title>",
        f"<style>\n{_asset('html_summary.css')}</style>",
        "</head>",
        "<body>",
        '<a class="skip" href="#products">Skip to the products</a>',
        "<header>",
        '<p class="kicker">Photobiological safety pre-screen · batch summary</p>',
        f"<h1>{len(assessments)} products assessed, {len(errors)} failed</h1>",
        f'<p class="meta">Report date {e(format_report_time(moment))} · Tool {e(tools)} · '
        f"Limit set {e(limit_sets)}{e(issuer)}</p>",
        "</header>",
        "<main>",
        '<section class="cautions" aria-labelledby="cautions-h">',
        '<h2 id="cautions-h">Cautions</h2>',
        "<ul>",
        *[
            f"<li><strong>{e('All products' if len(ids) == len(assessments) else ', '.join(ids))}:</strong> "
            f"{e(text)}</li>"
            for text, ids in cautions.items()
        ],
        "</ul>",
        "</section>",
        '<p class="counts">',
        " · ".join(
            [f'<span class="swatch" style="background:{_hex(GROUP_FILL[g])}"></span>{e(g)}: {n}' for g, n in counts]
            + ([f"not determined: {undetermined}"] if undetermined else [])
            + [f"incomplete: {sum(not a.complete for a in assessments)}"]
            + ([f"what-if: {what_if}"] if what_if else [])
            + [f"borderline: {sum(ranks_by_margin(a) and is_borderline(a) for a in assessments)}"]
        ),
        "</p>",
        '<section id="products" aria-labelledby="products-h">',
        '<h2 id="products-h">Products, highest risk first</h2>',
        _filters(groups, vendors, bool(undetermined)),
        '<table id="ranked">',
        "<caption>Ranked by group at the standard's distance (RG3 first); within a group borderline products first, "
        "then the deciding hazard closest to its next boundary. Column headings sort the table; the filters above "
        "narrow it. Headroom: each hazard with risk groups on a scale of four zones (Exempt, RG1, RG2, RG3; the "
        "limits at the zone edges), the bar ending at its value. A what-if (assessed at a distance the record asks "
        "for) is no classification: its Group is the standard's, its own figures are headed 'what-if at N mm', and "
        "it ranks after its group's products assessed at the standard's distance.</caption>",
        "<thead><tr>",
        *[
            '<th scope="col"'
            + (f' data-type="{kind}" aria-sort="{"ascending" if k == 0 else "none"}"' if kind else "")
            + ">"
            + (f'<button type="button" data-col="{k}">{e(name)}</button>' if kind else e(name))
            + "</th>"
            for k, (name, kind) in enumerate(_COLUMNS)
        ],
        "</tr></thead>",
        "<tbody>",
        *[_row(rank, a, stems.get(a.id, a.id), files) for rank, a in enumerate(shown, start=1)],
        "</tbody>",
        "</table>",
        (
            f'<p class="note">{len(ranked) - len(shown)} lower-ranked products are not listed here: every product '
            f"is in summary.csv.</p>"
            if len(ranked) > len(shown)
            else ""
        ),
        "</section>",
        '<section class="spectra" aria-labelledby="spectra-h">',
        '<h2 id="spectra-h">Where each product\'s hazard values come from</h2>',
        '<p><label for="spectra-hazard">Hazard</label> <select id="spectra-hazard">'
        + "".join(f'<option value="{e(s)}">{e(s)}</option>' for s in hazards)
        + '</select> <button type="button" id="spectra-show" aria-expanded="false" aria-controls="spectra-chart">'
        "Show the chart</button></p>",
        '<div id="spectra-chart" hidden></div>',
        "</section>",
        '<section aria-labelledby="failed-h">',
        '<h2 id="failed-h">Products that could not be assessed</h2>',
        _failed(errors),
        "</section>",
        "</main>",
        f"<footer><p>{e(FOOTER)}: an accredited laboratory classifies a product under the applicable standard and "
        f"local regulations.</p></footer>",
        f'<script type="application/json" id="contributions">{_script_json(_contribution_data(shown))}</script>',
        f"<script>\n{_asset('html_summary.js')}</script>",
        "</body>",
        "</html>",
    ]
    return "\n".join(p for p in parts if p) + "\n"


def _hazard_order(assessments: list[Assessment], symbol: str) -> int:
    order = list(assessments[0].hazards)
    return order.index(symbol) if symbol in order else len(order)


def _filters(groups: list[str], vendors: list[str], undetermined: bool) -> str:
    e = escape
    group_boxes = "".join(
        f'<label><input type="checkbox" name="group" value="{e(g)}" checked> {e(g)}</label>'
        for g in [*reversed(groups), *(["not determined"] if undetermined else [])]
    )
    flag_boxes = "".join(
        f'<label><input type="checkbox" name="flag" value="{e(k)}"> {e(text)}</label>'
        for k, text in _FLAG_NAMES.items()
    )
    vendor_options = "".join(f'<option value="{e(v)}">{e(v)}</option>' for v in vendors)
    return (
        '<form class="filters" role="search" aria-label="Filter the products" onsubmit="return false">'
        f"<fieldset><legend>Group</legend>{group_boxes}</fieldset>"
        f"<fieldset><legend>Only products flagged</legend>{flag_boxes}</fieldset>"
        '<p><label for="f-vendor">Vendor</label> <select id="f-vendor"><option value="">all vendors</option>'
        f"{vendor_options}</select></p>"
        '<p><label for="f-basis">Basis</label> <select id="f-basis"><option value="">all</option>'
        '<option value="standard">standard distance</option><option value="what-if">what-if distance</option>'
        "</select></p>"
        '<p><label for="f-text">Product contains</label> <input type="search" id="f-text"></p>'
        '<p><output id="f-count" aria-live="polite"></output></p>'
        "</form>"
    )


def _failed(errors: list[tuple[str, str]]) -> str:
    if not errors:
        return "<p>None: every product was assessed.</p>"
    rows = "".join(
        f"<tr><td>{escape(product)}</td><td>{escape((reason.strip().splitlines() or ['—'])[0])}</td></tr>"
        for product, reason in errors
    )
    return (
        '<table class="failed"><thead><tr><th scope="col">Product</th><th scope="col">Why it could not be assessed'
        f"</th></tr></thead><tbody>{rows}</tbody></table>"
    )


def write_summary_html(outcome: _Outcome, folder: Path, rendered_at: datetime.datetime | None = None) -> Path:
    """Write a batch's ``summary.html`` into its output folder (atomically) and return its path.

    Parameters
    ----------
    outcome : BatchOutcome
        What :func:`hazard.assessment.batch.run_batch` returned: the ids, the assessments, the errors and each
        product's file stem.
    folder : Path
        The batch's output folder; the page links the products' PDF and JSON files found there.
    rendered_at : datetime.datetime, optional
        Timezone-aware time printed as the page's date; defaults to :func:`reports.report_time`.
    """
    folder = Path(folder)
    assessed = outcome.assessments
    assessments = [assessed[i] for i in outcome.ids if i in assessed]
    errors = [(i, outcome.errors[i]) for i in outcome.ids if i in outcome.errors]
    files = {name for name in outcome.written if name.endswith((".pdf", ".json"))}
    target = folder / HTML_NAME
    write_atomic(target, render_summary_html(assessments, errors, outcome.stems, files, rendered_at).encode("utf-8"))
    return target
