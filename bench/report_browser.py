"""The report of a 10,000-question run in headless Chromium: time to open it and to filter it.

    python -m bench.report_browser [--questions 10000] [--repeat 3]

The run is the generated one of tests/report_samples.py (`large_run`: each question with three
evidence passages). Side by side, in the same browser: our index.html, and as the reference a bare
static HTML table of the same questions (id, question, owner, verdict, support and the evidence
text in a closed <details>), no script and no style, which is about the least a browser can be
given for that many rows. For each page it prints the page size, the renderer main thread's CPU
time to open it (Chrome DevTools Protocol Performance.getMetrics "ThreadTime", which load from
other work on a shared machine inflates less than wall time; the navigation's DOMContentLoaded
wall time beside it), the JavaScript heap after opening (JSHeapUsedSize) and, for our page, the
CPU and wall time of a verdict filter and of a text filter (each followed by the layout it
causes). The target is that the page opens and filters within a second.

Needs Chromium (Debian's `chromium` package) and Playwright's Python package, as the browser
tests do.
"""

from __future__ import annotations

import argparse
import html
import shutil
import statistics
import sys
import tempfile
from pathlib import Path

from auditor.report import write_report
from tests import report_samples as samples

TARGET_MS = 1000
ARGS = ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-sync"]
FILTER_VERDICT = """() => {
    const s = document.getElementById('f-verdict');
    const t0 = performance.now();
    s.value = 'gap';
    s.dispatchEvent(new Event('change'));
    document.body.getBoundingClientRect();
    return performance.now() - t0;
}"""
FILTER_TEXT = """() => {
    const s = document.getElementById('f-text');
    const t0 = performance.now();
    s.value = 'leak';
    s.dispatchEvent(new Event('input'));
    document.body.getBoundingClientRect();
    return performance.now() - t0;
}"""


def bare_table(run: dict) -> str:
    """The reference page: every question as a plain table row, evidence in a closed <details>."""
    rows = []
    for q in run["questions"]:
        evidence = "".join(f"<p>{html.escape(e['text'])}</p>" for e in q["evidence"])
        rows.append(
            f"<tr><td>{html.escape(q['id'])}</td><td><details><summary>{html.escape(q['question'])}</summary>"
            f"{evidence}</details></td><td>{html.escape(q['owner'] or '')}</td><td>{q['verdict']}</td>"
            f"<td>{q['support']:.2f}</td></tr>"
        )
    return (
        "<!doctype html><html><head><meta charset='utf-8'><title>questions</title></head><body><table>"
        "<thead><tr><th>id</th><th>question</th><th>owner</th><th>verdict</th><th>support</th></tr></thead>"
        f"<tbody>{''.join(rows)}</tbody></table></body></html>"
    )


def metrics(cdp) -> dict:
    return {m["name"]: m["value"] for m in cdp.send("Performance.getMetrics")["metrics"]}


def measure(browser, url: str, ours: bool) -> dict:
    context = browser.new_context(viewport={"width": 1280, "height": 900})  # a fresh renderer each time
    page = context.new_page()
    cdp = context.new_cdp_session(page)
    cdp.send("Performance.enable", {"timeDomain": "threadTicks"})
    start = metrics(cdp)["ThreadTime"]
    page.goto(url)
    if ours:
        page.wait_for_selector("html[data-ready]", state="attached")
    opened = metrics(cdp)
    row = {
        "open_cpu_ms": (opened["ThreadTime"] - start) * 1000,
        "open_wall_ms": page.evaluate("() => performance.getEntriesByType('navigation')[0].domContentLoadedEventEnd"),
        "heap_mb": opened["JSHeapUsedSize"] / 2**20,
    }
    if ours:
        for name, script in (("verdict", FILTER_VERDICT), ("text", FILTER_TEXT)):
            before = metrics(cdp)["ThreadTime"]
            wall = page.evaluate(script)
            row[f"filter_{name}_cpu_ms"] = (metrics(cdp)["ThreadTime"] - before) * 1000
            row[f"filter_{name}_wall_ms"] = wall
    context.close()
    return row


def span(values: list[float]) -> str:
    return f"{min(values):.0f}-{max(values):.0f}" if len(values) > 1 else f"{values[0]:.0f}"


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--questions", type=int, default=10_000)
    parser.add_argument("--repeat", type=int, default=3, help="fresh page loads per page (default 3)")
    args = parser.parse_args()
    chromium = shutil.which("chromium")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        print("Playwright's Python package is not installed; nothing to measure")
        return 0
    if chromium is None:
        print("chromium is not installed; nothing to measure")
        return 0

    run = samples.large_run(args.questions)
    with tempfile.TemporaryDirectory() as tmp:
        index = write_report(run, Path(tmp) / "report")
        bare = Path(tmp) / "bare.html"
        bare.write_text(bare_table(run), encoding="utf-8")
        sizes = {"ours": index.stat().st_size, "bare table": bare.stat().st_size}
        with sync_playwright() as p:
            browser = p.chromium.launch(executable_path=chromium, args=ARGS)
            rows: dict[str, list[dict]] = {"ours": [], "bare table": []}
            for _ in range(args.repeat):  # alternate, so that load from other work falls on both alike
                rows["ours"].append(measure(browser, index.as_uri(), ours=True))
                rows["bare table"].append(measure(browser, bare.as_uri(), ours=False))
            browser.close()

    print(f"{args.questions} questions, {args.repeat} loads of each page (ranges over the loads)")
    for name, measured in rows.items():
        figures = {key: [r[key] for r in measured] for key in measured[0]}
        text = ", ".join(f"{key} {span(values)}" for key, values in figures.items() if key != "heap_mb")
        heap = max(figures["heap_mb"])
        print(f"{name:>10}: {sizes[name] / 1e6:.1f} MB page, {text}, JS heap {heap:.0f} MiB")
    ours = statistics.median(r["open_cpu_ms"] for r in rows["ours"])
    reference = statistics.median(r["open_cpu_ms"] for r in rows["bare table"])
    print(f"open CPU, median: ours {ours:.0f} ms, bare table {reference:.0f} ms, ratio {ours / reference:.2f}")
    worst = max(max(r["open_cpu_ms"], r["filter_verdict_cpu_ms"], r["filter_text_cpu_ms"]) for r in rows["ours"])
    verdict = "within" if worst < TARGET_MS else "over"
    print(f"target: open and filter within {TARGET_MS} ms of CPU: worst {worst:.0f} ms, {verdict} the target")
    return 0


if __name__ == "__main__":
    sys.exit(main())
