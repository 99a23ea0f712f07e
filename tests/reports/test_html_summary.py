"""The batch's summary.html: valid HTML, self-contained, every product with its group in words; in a real browser
(headless Chromium driven by playwright) the table sorts and filters and the contributions chart draws on request."""

import datetime
import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import html5lib
import pytest
from conftest import LINEUP

from hazard.assessment.batch import run_batch
from hazard.reports.html_summary import HTML_NAME, render_summary_html, write_summary_html
from hazard.reports.ranking import rank_assessments

RENDERED_AT = datetime.datetime(2024, 6, 1, 12, 0, tzinfo=datetime.UTC)
# examples/README.md: the line-up spans the groups, RG3 first in the ranking (reports/ranking.py)
RG3 = {"CL-CURE-365", "CL-GERM-254", "CL-HEAT-2K", "CL-XEN-UV"}


@pytest.fixture(scope="module")
def batch(tmp_path_factory):
    out = tmp_path_factory.mktemp("html") / "out"
    outcome = run_batch(LINEUP, out, per_product_json=True, studies=True)
    page = write_summary_html(outcome, out, RENDERED_AT)
    return outcome, page


def test_page_is_valid_and_self_contained(batch):
    outcome, page = batch
    text = page.read_text(encoding="utf-8")
    # WHATWG HTML parsing (html5lib implements it): strict mode raises on any parse error
    html5lib.HTMLParser(strict=True, namespaceHTMLElements=False).parse(text)
    # project contract (issue "a batch page for the browser"): no server, no network, no external scripts or fonts
    assert not re.search(r"(?i)\b(?:https?|ftp):|//[a-z0-9.-]+\.[a-z]{2,}/|<link\b|\bsrc\s*=|@import|url\(", text)
    hrefs = re.findall(r'href="([^"]+)"', text)
    assert hrefs and all(h.startswith("#") or (page.parent / h).is_file() for h in hrefs)  # only its own files
    # every product, its group in words, its JSON linked; cautions shown (project contract: hazard/cautions.py)
    assessments = [outcome.assessments[i] for i in outcome.ids]
    for a in assessments:
        row = re.search(rf'<tr data-group="[^"]*"[^>]*data-id="{re.escape(a.id)}">(.*?)</tr>', text, re.S)
        assert row and f">{a.classification_group}<" in row.group(1) and f'href="{a.id}.json"' in row.group(1)
        for caution in a.cautions:
            assert caution.replace("'", "&#x27;") in text
    assert "Pre-screen only" in text


def test_page_names_failed_products_and_is_deterministic(batch):
    outcome, _ = batch
    assessments = [outcome.assessments[i] for i in outcome.ids]
    errors = [("CL-BAD-1", "bad.csv: line 3: wavelengths look like µm <not nm>; fix: give nm\nsecond line")]
    page = render_summary_html(assessments, errors, outcome.stems, set(), RENDERED_AT)
    assert page == render_summary_html(assessments, errors, outcome.stems, set(), RENDERED_AT)
    html5lib.HTMLParser(strict=True).parse(page)
    assert "wavelengths look like µm &lt;not nm&gt;" in page and "second line" not in page  # escaped, first line
    assert "2024-06-01 12:00 UTC" in page


def test_cli_writes_summary_html(tmp_path):
    # project contract (issue "a batch page for the browser"): `hazard batch … --html` writes summary.html
    out = tmp_path / "out"
    run = subprocess.run(
        [sys.executable, "-m", "hazard.cli", "batch", str(LINEUP), "--output", str(out), "--html"],
        capture_output=True,
        text=True,
    )
    assert run.returncode == 0, run.stderr
    assert (out / HTML_NAME).is_file() and len(list(out.glob("CL-*.json"))) == 11


def _chromium() -> str | None:
    for name in (os.environ.get("HAZARD_CHROMIUM"), "chromium", "chromium-browser", "google-chrome"):
        if name and (path := shutil.which(name)):
            return path
    return None


def test_sorting_and_filtering_work_in_a_browser(batch, tmp_path):
    sync_api = pytest.importorskip(
        "playwright.sync_api", reason="playwright is not installed (pip install -e '.[test]' brings it)"
    )
    browser_path = _chromium()
    if browser_path is None:
        pytest.skip("no Chromium on this machine: install Debian's chromium (apt-get install chromium) to run it")
    outcome, page_path = batch
    ranked = [a.id for a in rank_assessments([outcome.assessments[i] for i in outcome.ids])]
    with sync_api.sync_playwright() as p:
        browser = p.chromium.launch(executable_path=browser_path, args=["--no-sandbox"])
        page = browser.new_page(viewport={"width": 1300, "height": 1600})
        page.goto(page_path.as_uri())

        def ids() -> list[str]:
            return page.eval_on_selector_all("#ranked tbody tr:not([hidden])", "rows => rows.map(r => r.dataset.id)")

        assert ids() == ranked and page.inner_text("#f-count") == "11 of 11 products shown"
        # sort by product, with the keyboard: focus the heading's button and press Enter
        page.focus("th >> text=Product")
        page.keyboard.press("Enter")
        assert ids() == sorted(ranked, key=str.lower)
        assert page.get_attribute("th:has(button:text('Product'))", "aria-sort") == "ascending"
        page.keyboard.press("Enter")
        assert ids() == sorted(ranked, key=str.lower, reverse=True)
        # sort by group: highest group last when ascending (the groups' order, IEC 62471:2006 6.1)
        page.click("th >> text=Group")
        order = [outcome.assessments[i].classification_group for i in ids()]
        assert order == sorted(order, key=["Exempt", "RG1", "RG2", "RG3"].index)
        # filter: without RG3, then only the product whose vendor claim is contradicted (examples/README.md: the
        # spotlight's datasheet claims Exempt)
        page.uncheck("input[name=group][value=RG3]")
        assert set(ids()) == set(ranked) - RG3 and page.inner_text("#f-count") == "7 of 11 products shown"
        page.check("input[name=flag][value=contradicted]")
        assert ids() == ["CL-SPOT-65"]
        page.uncheck("input[name=flag][value=contradicted]")
        page.check("input[name=group][value=RG3]")
        page.select_option("#f-basis", "what-if")
        assert ids() == []  # examples/lineup: no record asks for a what-if distance
        page.select_option("#f-basis", "")
        page.fill("#f-text", "germ")
        assert ids() == ["CL-GERM-254"]
        page.fill("#f-text", "")
        # the contributions chart, drawn on request for the chosen hazard: one row per product with a value
        assert page.is_hidden("#spectra-chart")
        page.select_option("#spectra-hazard", "E_S")
        page.click("#spectra-show")
        assert page.get_attribute("#spectra-show", "aria-expanded") == "true"
        with_e_s = [i for i in ids() if "E_S" in outcome.assessments[i].contributions]
        labels = page.eval_on_selector_all("#spectra-chart svg > text", "t => t.map(x => x.textContent)")
        assert [label for label in labels if label.startswith("CL-")] == with_e_s
        assert page.eval_on_selector_all("#spectra-chart svg rect", "r => r.length") > len(with_e_s)
        shot = Path(os.environ.get("HAZARD_SCREENSHOTS", tmp_path)) / "summary-html.png"
        page.screenshot(path=str(shot), full_page=True)
        assert shot.stat().st_size > 10_000
        page.emulate_media(media="print")
        assert page.is_hidden(".filters")  # printed: the table alone
        browser.close()
