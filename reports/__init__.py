"""PDF reports of assessment results: one product's report and a batch summary.

Rendering only: these functions read :class:`hazard.result.Assessment` objects (fresh or loaded from their
JSON) and never compute a hazard quantity. Output is deterministic for a given ``rendered_at``.

- :func:`render_assessment_pdf` — one product, A4: page 1 the answers (group in words, each hazard's headroom, group
  and t_max against distance, what would change it, where each hazard's value comes from); page 2 the hazards in
  detail; then distance, uncertainty and remedies when the result holds those studies; the input, its provenance and
  the cautions at the end
- :func:`render_summary_pdf` — a batch ranked by group and headroom, with the products that failed
- :func:`rank_assessments` — the summary's order, as a pure function
- :func:`report_time` — ``SOURCE_DATE_EPOCH`` as UTC when set, else now
"""

from hazard.reports.product_pdf import render_assessment_pdf
from hazard.reports.ranking import rank_assessments
from hazard.reports.summary_pdf import render_summary_pdf
from hazard.reports.timestamp import report_time

__all__ = ["rank_assessments", "render_assessment_pdf", "render_summary_pdf", "report_time"]
