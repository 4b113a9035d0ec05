"""The page on a wide screen (1400 px) and a phone (390 px) in headless Chromium: nothing wider than
the screen, tables scroll inside their card, filters and row details work from the keyboard.

Screenshots go to test-artifacts/ (git-ignored) for a person to look at.
"""

from __future__ import annotations

import pytest

from auditor.report import write_report
from tests import report_samples as samples
from tests.test_report_browser import ARGS, ARTIFACTS, CHROMIUM, VISIBLE_ROWS, shown_text

sync_api = pytest.importorskip("playwright.sync_api")
pytestmark = [pytest.mark.browser, pytest.mark.skipif(CHROMIUM is None, reason="headless Chromium is not installed")]

# Elements reaching past the right edge of the screen, leaving out those inside a box that scrolls
# sideways (a table in its card) and the visually hidden labels for screen readers.
OVERFLOWING = """() => {
  const width = document.documentElement.clientWidth, out = [];
  for (const e of document.querySelectorAll("body *")) {
    const r = e.getBoundingClientRect();
    if (!r.width || r.right <= width + 1 || e.closest(".sr")) continue;
    let a = e.parentElement, scrolled = false;
    while (a) { const o = getComputedStyle(a).overflowX; if (o === "auto" || o === "scroll") { scrolled = true; break; } a = a.parentElement; }
    if (!scrolled) out.push(e.tagName + (e.id ? "#" + e.id : "") + "." + e.className + " " + Math.round(r.right));
  }
  return out;
}"""


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    out = tmp_path_factory.mktemp("screens")
    return write_report(samples.sample_run(), out)


@pytest.fixture(scope="module")
def browser():
    with sync_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


@pytest.mark.parametrize("width", [1400, 390])
def test_nothing_overflows_and_tables_scroll_in_their_card(browser, report, width):
    page = browser.new_page(viewport={"width": width, "height": 900})
    page.goto(report.as_uri())
    page.wait_for_selector("html[data-ready]", state="attached")
    page.click("#q0 summary")  # with a question's evidence open
    page.locator("#q0 + tr.ev-row").wait_for()
    assert page.evaluate("document.documentElement.scrollWidth") <= width
    assert page.evaluate(OVERFLOWING) == []
    # Wide tables scroll inside their card instead of widening the page, words kept whole.
    for box in page.locator(".scroll").all():
        assert box.evaluate("e => getComputedStyle(e).overflowX") == "auto"
        assert box.evaluate("e => e.getBoundingClientRect().right") <= width
    headers = page.locator("#inv-oldest th").all_inner_texts()
    assert all("\n" not in h for h in headers), headers  # no header broken inside a word
    ARTIFACTS.mkdir(exist_ok=True)
    page.screenshot(path=str(ARTIFACTS / f"report-{width}.png"), full_page=True)
    page.close()


def test_filters_and_row_details_work_by_keyboard_on_a_phone(browser, report):
    page = browser.new_page(viewport={"width": 390, "height": 844})
    page.goto(report.as_uri())
    page.wait_for_selector("html[data-ready]", state="attached")
    # Tab reaches the verdict filter; the arrow keys choose "gap" (all, supported, stale, gap).
    for _ in range(60):
        page.keyboard.press("Tab")
        if page.evaluate("document.activeElement.id") == "f-verdict":
            break
    assert page.evaluate("document.activeElement.id") == "f-verdict"
    order = page.locator("#f-verdict option").all_inner_texts()
    for _ in range(order.index("gap")):
        page.keyboard.press("ArrowDown")
    assert page.input_value("#f-verdict") == "gap"
    rows = page.locator(VISIBLE_ROWS)
    assert rows.count() == 3 and all("gap" in shown_text(r.locator(".v")) for r in rows.all())
    # On to the first listed question; Enter opens its details and evidence, inside the screen.
    for _ in range(80):
        page.keyboard.press("Tab")
        if page.evaluate("document.activeElement.tagName") == "SUMMARY":
            break
    assert page.evaluate("document.activeElement.tagName") == "SUMMARY"
    page.keyboard.press("Enter")
    row = page.evaluate("document.activeElement.closest('tr').id")
    evidence = page.locator(f"#{row} + tr.ev-row")
    evidence.wait_for()
    assert "No passage supports this question" in shown_text(page.locator(f"#{row} .why"))
    assert evidence.evaluate("e => e.getBoundingClientRect().right") <= 390
    assert page.evaluate(OVERFLOWING) == []
    page.keyboard.press("Enter")
    evidence.wait_for(state="hidden")
    page.close()
