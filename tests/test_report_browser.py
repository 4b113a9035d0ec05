"""The report in a real browser: Debian's headless Chromium driven by Playwright's Python package.

Skipped cleanly when Chromium or Playwright is missing. Screenshots go to test-artifacts/
(git-ignored); timings are bench/report_browser.py's.
"""

from __future__ import annotations

import json
import shutil
from collections import Counter
from pathlib import Path

import pytest

from auditor.report import write_report
from auditor.report.html import SERVER_ROWS, VERDICT_GLYPHS, verdict_sentence
from tests import report_samples as samples

CHROMIUM = shutil.which("chromium") or ("/usr/bin/chromium" if Path("/usr/bin/chromium").exists() else None)
sync_api = pytest.importorskip("playwright.sync_api")
pytestmark = [pytest.mark.browser, pytest.mark.skipif(CHROMIUM is None, reason="headless Chromium is not installed")]
ARTIFACTS = Path(__file__).resolve().parents[1] / "test-artifacts"
ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]
# Rows of the question table (evidence rows added under an opened row are not questions).
VISIBLE_ROWS = "#questions > tbody > tr[id]:not([hidden])"


def shown_text(locator) -> str:
    """Rendered text of an element, scrolled into view first: rows off screen are not laid out
    (content-visibility: auto), and innerText of content that is not laid out is empty."""
    locator.scroll_into_view_if_needed()
    return locator.inner_text()


@pytest.fixture(scope="module")
def browser():
    with sync_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


class Page:
    """A page that records console messages, page errors and any request leaving the file."""

    def __init__(self, browser, url):
        self.messages, self.errors, self.requests = [], [], []
        self.page = browser.new_page(viewport={"width": 1280, "height": 900})
        self.page.on("console", lambda m: self.messages.append((m.type, m.text)))
        self.page.on("pageerror", lambda e: self.errors.append(str(e)))
        self.page.on("request", lambda r: self.requests.append(r.url))
        self.page.goto(url)
        self.page.wait_for_selector("html[data-ready]", state="attached")

    def console_errors(self):
        return [t for kind, t in self.messages if kind == "error"] + self.errors


@pytest.fixture(scope="module")
def sample(tmp_path_factory, browser):
    out = tmp_path_factory.mktemp("browser")
    index = write_report(samples.sample_run(), out)
    results = json.loads((out / "results.json").read_text(encoding="utf-8"))
    page = Page(browser, index.as_uri())
    yield page, results
    page.page.close()


def test_page_opens_without_console_errors_or_requests(sample):
    page, _ = sample
    assert page.console_errors() == []
    assert [u for u in page.requests if not u.startswith("file:")] == []
    assert page.page.is_visible("#filters")


def test_filter_by_verdict_shows_the_right_rows(sample):
    page, results = sample
    p = page.page
    counts = Counter(q["verdict"] for q in results["questions"])
    for verdict in ("gap", "stale", "supported"):
        p.select_option("#f-verdict", verdict)
        rows = p.locator(VISIBLE_ROWS)
        assert rows.count() == counts[verdict]
        # Each badge: its glyph and its word (WCAG 2.1 §1.4.1, colour is not the only cue).
        assert set(rows.locator(".v").all_text_contents()) == {f"{VERDICT_GLYPHS[verdict]} {verdict}"}
        assert p.inner_text("#shown") == f"{counts[verdict]} of {len(results['questions'])} questions shown"
    p.select_option("#f-verdict", "")
    assert p.locator(VISIBLE_ROWS).count() == len(results["questions"])


def test_owner_topic_and_text_filters_combine(sample):
    page, results = sample
    p = page.page
    p.select_option("#f-owner", label="Billing")
    billing = [q for q in results["questions"] if q["owner"] == "Billing"]
    assert p.locator(VISIBLE_ROWS).count() == len(billing)
    p.fill("#f-text", "phone")
    assert p.locator(f"{VISIBLE_ROWS} .qid").all_text_contents() == ["q-001", "q-013"]
    p.select_option("#f-verdict", "gap")
    assert p.locator(VISIBLE_ROWS).count() == 0
    p.select_option("#f-verdict", "")
    p.select_option("#f-owner", "")
    p.fill("#f-text", "")
    p.select_option("#f-topic", label="rebates")
    assert p.locator(f"{VISIBLE_ROWS} .qid").all_text_contents() == ["q-003"]
    p.select_option("#f-topic", "-1")  # questions without a topic
    assert p.locator(f"{VISIBLE_ROWS} .qid").all_text_contents() == ["q-010", "q-012"]
    p.select_option("#f-topic", "")


def test_sort_by_weight_and_back(sample):
    page, results = sample
    p = page.page
    p.click("#questions th[data-sort=weight]")
    ids = p.locator("#questions > tbody > tr[id] .qid").all_text_contents()
    by_weight = [q["id"] for q in sorted(results["questions"], key=lambda q: -q["weight"])]
    assert ids == by_weight
    assert p.get_attribute("#questions th[data-sort=weight]", "aria-sort") == "descending"
    p.focus("#questions th[data-sort=weight]")
    p.keyboard.press("Enter")  # keyboard works too: now ascending
    assert p.locator("#questions > tbody > tr[id] .qid").all_text_contents() == by_weight[::-1]
    # By question text (not by id), within one owner's questions.
    p.select_option("#f-owner", label="Billing")
    p.click("#questions th[data-sort=question]")
    assert p.locator(f"{VISIBLE_ROWS} .qid").all_text_contents() == ["q-013", "q-001", "q-002"]
    p.select_option("#f-owner", "")


def test_expanding_a_row_shows_its_evidence(sample):
    page, results = sample
    p = page.page
    q = results["questions"][0]  # q-001, stale phone payment
    p.focus("#q0 summary")
    p.keyboard.press("Enter")  # keyboard-operable expander
    evidence = p.locator("#q0 + tr.ev-row")
    evidence.wait_for()
    items = evidence.locator("article.ev")
    assert items.count() == len(q["evidence"])
    first = items.nth(0)
    passages = {x["id"]: x for x in results["passages"]}  # results.json format 2: each passage once
    assert shown_text(first.locator("blockquote.passage")) == passages[q["evidence"][0]["passage"]]["text"]
    assert first.locator("mark").all_text_contents() == ["pay", "bill", "phone", "phone"]
    assert first.locator("table").nth(0).locator("tbody .chip").all_text_contents() == ["phone", "pay", "bill"]
    assert first.locator("table.st tbody tr").count() == 1
    assert "As of February 2023" in shown_text(first.locator("table.st"))
    why = shown_text(first.locator(".fw"))
    assert "1372 days before the audit date" in why and "beyond the 365-day horizon" in why
    assert p.is_visible("#q0 .why .act")
    # Closing hides the evidence; a filter that hides the row hides its evidence too.
    # (The toggle event is queued as a task, so wait for the state rather than read it at once.)
    p.click("#q0 summary")
    evidence.wait_for(state="hidden", timeout=2000)
    p.click("#q0 summary")
    evidence.wait_for(state="visible", timeout=2000)
    p.select_option("#f-verdict", "gap")
    assert evidence.is_hidden()  # the change handler runs synchronously
    p.select_option("#f-verdict", "")
    assert evidence.is_visible()


def test_hostile_strings_show_literally_and_never_run(sample):
    page, results = sample
    p = page.page
    for i in (10, 11):  # q-011 and q-012 carry the hostile strings
        p.click(f"#q{i} summary")
    p.locator("#q10 + tr.ev-row").wait_for(timeout=2000)
    assert p.evaluate("typeof window.__pwned") == "undefined"
    assert p.locator("img").count() == 0
    assert p.locator("a[href^='javascript:' i]").count() == 0
    assert p.locator("script").count() == 2
    summary = shown_text(p.locator("#q10 summary"))
    assert samples.HOSTILE_SCRIPT in summary and samples.HOSTILE_IMG in summary
    q12 = shown_text(p.locator("#q11 summary"))
    for s in (samples.HOSTILE_CLOSE, samples.HOSTILE_LINK, samples.HOSTILE_TEMPLATE):
        assert s in q12
    passage = shown_text(p.locator("#q10 + tr.ev-row blockquote.passage"))
    passages = {x["id"]: x for x in results["passages"]}
    assert passage == " ".join(passages[results["questions"][10]["evidence"][0]["passage"]]["text"].split())
    assert samples.HOSTILE_OWNER in shown_text(p.locator("#q10 td:nth-child(2)"))
    assert p.evaluate("typeof window.__pwned") == "undefined"
    assert page.console_errors() == []  # a script blocked by the CSP would have logged an error


def test_a_brief_link_opens_its_question_even_when_filtered_out(sample):
    page, _ = sample
    p = page.page
    p.select_option("#f-verdict", "supported")  # q-002 (a gap) is not listed
    assert p.locator("#q1").count() == 0
    p.click(".brief a[href='#q1']")
    assert p.locator("#q1").count() == 1
    assert p.get_attribute("#q1 details", "open") is not None
    p.locator("#q1 + tr.ev-row").wait_for(timeout=2000)
    assert p.input_value("#f-verdict") == ""
    assert p.evaluate("document.activeElement.closest('tr').id") == "q1"


def test_screenshot(sample):
    page, _ = sample
    p = page.page
    p.reload()  # the table as it opens, then the first question expanded
    p.wait_for_selector("html[data-ready]", state="attached")
    p.click("#q0 summary")
    p.locator("#q0 + tr.ev-row").wait_for(timeout=2000)
    p.evaluate("window.scrollTo(0, 0)")  # the sticky table header then sits on the table
    ARTIFACTS.mkdir(exist_ok=True)
    path = ARTIFACTS / "report.png"
    p.screenshot(path=str(path), full_page=True)
    assert path.stat().st_size > 50_000
    p.emulate_media(media="print")
    assert p.is_hidden("#filters")
    p.screenshot(path=str(ARTIFACTS / "report-print.png"), full_page=True)
    p.emulate_media(media="screen")


def test_page_works_without_javascript(tmp_path, browser):
    index = write_report(samples.sample_run(), tmp_path)
    context = browser.new_context(java_script_enabled=False)
    p = context.new_page()
    p.goto(index.as_uri())
    assert p.locator("#questions > tbody > tr").count() == len(samples.sample_run().questions)
    assert p.is_hidden("#filters")
    p.click("#q1 summary")
    assert "No passage supports this question" in shown_text(p.locator("#q1 .why"))
    context.close()


def test_a_bare_format1_run_works_in_the_browser(tmp_path, browser):
    page = Page(browser, write_report(samples.bare_run(), tmp_path).as_uri())
    p = page.page
    p.click("#q0 summary")
    evidence = p.locator("#q0 + tr.ev-row")
    evidence.wait_for(timeout=2000)
    assert "no question term in this passage" in shown_text(evidence.locator("table.bd"))
    assert "no dated statements" in shown_text(evidence.locator("table.st"))
    assert "61 days before the audit date" in shown_text(evidence.locator(".fw"))
    p.click("#q1 summary")
    assert "No passage was retrieved" in shown_text(p.locator("#q1 + tr.ev-row"))
    assert page.console_errors() == []
    p.close()


@pytest.mark.slow
def test_large_run_opens_and_filters(tmp_path_factory, browser):
    """10,000 questions: page size, the first rows listed, filters, rows built by the script.

    How fast it opens and filters is measured by bench/report_browser.py, not here.
    """
    out = tmp_path_factory.mktemp("large")
    run = samples.large_run(10_000)
    index = write_report(run, out)
    size = index.stat().st_size
    p = browser.new_page(viewport={"width": 1280, "height": 900})
    errors = []
    p.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    p.on("pageerror", lambda e: errors.append(str(e)))
    p.goto(index.as_uri())
    p.wait_for_selector("html[data-ready]", state="attached")
    assert p.inner_text("#shown") == "10000 of 10000 questions shown (the first 500 listed)"
    assert p.locator(VISIBLE_ROWS).count() == 500

    gaps = [i for i, q in enumerate(run.questions) if q.verdict == "gap"]
    p.select_option("#f-verdict", "gap")
    assert p.inner_text("#shown").startswith(f"{len(gaps)} of 10000 questions shown")
    assert p.locator(VISIBLE_ROWS).count() == min(500, len(gaps))
    leak = [i for i in gaps if "leak" in run.questions[i].question.lower()]
    p.fill("#f-text", "leak")
    ids = p.locator(f"{VISIBLE_ROWS} .qid").all_text_contents()
    assert ids == [run.questions[i].id for i in leak][:500]
    if p.is_visible("#show-all"):
        p.click("#show-all")
    assert p.locator(VISIBLE_ROWS).count() == len(leak)
    # A row past the server-written ones is built by the script, with its explanation and evidence.
    late = next(i for i in leak if i >= SERVER_ROWS)
    p.click(f"#q{late} summary")
    p.locator(f"#q{late} + tr.ev-row").wait_for()
    assert p.locator(f"#q{late} + tr.ev-row article.ev").count() == 3
    q = run.questions[late]
    assert shown_text(p.locator(f"#q{late} .why p").first) == verdict_sentence(q, run.info)
    # A row built by the script has the same badge: glyph, then word.
    badge = p.locator(f"#q{late} td:nth-child(5) .v")
    assert shown_text(badge) == f"{VERDICT_GLYPHS[q.verdict]} {q.verdict}"
    assert badge.locator(".glyph").get_attribute("aria-hidden") == "true"
    assert shown_text(p.locator(f"#q{late} .why .act")).startswith("Write:")
    assert p.locator(f"#q{late} .why .chip.miss").all_text_contents() == q.missing_terms
    ARTIFACTS.mkdir(exist_ok=True)
    p.screenshot(path=str(ARTIFACTS / "report-large.png"))
    assert errors == []
    assert size < 15_000_000  # the report's size target for 10,000 questions (bench/README.md, scale.py)
    p.close()
