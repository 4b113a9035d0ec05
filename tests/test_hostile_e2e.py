"""Hostile text from ingest to the rendered page: documents and questions carrying markup, template
syntax and script URLs must show literally in the report and never run.

The payloads are the classic HTML-injection shapes (OWASP XSS filter evasion cheat sheet, from memory):
a raw <script>, a closing </script> that would end an inline data block, an attribute break-out into
an <img onerror>, Jinja-style {{ }} and a javascript: link.
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest
from bs4 import BeautifulSoup
from click.testing import CliRunner

from auditor.cli import cli

SCRIPT = "<script>window.__pwned = 1</script>"
CLOSER = "</script><script>window.__pwned = 2</script>"
BREAKOUT = '"><img src=x onerror="window.__pwned = 3">'
TEMPLATE = "{{ 7*7 }} {% raw %}"
LINK = "javascript:window.__pwned=4"
PAYLOADS = [SCRIPT, CLOSER, BREAKOUT, TEMPLATE, LINK]


def make_corpus(root: Path) -> Path:
    kb = root / "kb"
    kb.mkdir(parents=True)
    (kb / "hostile.md").write_text(
        "---\ntitle: Meter pit covers " + BREAKOUT.replace('"', "'") + "\nupdated: 2026-10-01\n---\n"
        "# Meter pit covers\n\nThe meter pit cover lifts with a pit key. " + SCRIPT + " " + CLOSER + "\n\n"
        "Report a cracked meter pit cover to the field crew. " + TEMPLATE + " [details](" + LINK + ")\n",
        encoding="utf-8",
    )
    (kb / "hostile.html").write_text(
        "<html><head><title>Hydrant flushing</title></head><body><main><h1>Hydrant flushing</h1>"
        "<p>Hydrant flushing runs every autumn. &lt;script&gt;window.__pwned = 5&lt;/script&gt; "
        "&quot;&gt;&lt;img src=x onerror=&quot;window.__pwned = 6&quot;&gt;</p>"
        f'<p><a href="{LINK}">flushing map</a> {{{{ config }}}}</p></main></body></html>',
        encoding="utf-8",
    )
    questions = root / "questions.csv"
    rows = [
        "id,question,owner,topic,weight",
        f'h1,"How do I open the meter pit cover? {SCRIPT}",Field Ops,meters,5',
        f'h2,"When is hydrant flushing? {BREAKOUT.replace(chr(34), chr(34) * 2)}",Field Ops,hydrants,3',
        f'h3,"Do you sell {TEMPLATE} gift cards {LINK}",{CLOSER.replace(chr(34), "")},misc,1',
    ]
    questions.write_text("\n".join(rows) + "\n", encoding="utf-8")
    config = root / "audit.toml"
    config.write_text(
        'database = "work/a.db"\nas_of = 2026-12-01\nquestions = ["questions.csv"]\n'
        '[corpus]\npaths = ["kb"]\n[report]\nout = "work/report"\ntitle = "Hostile ' + SCRIPT.replace('"', "") + '"\n',
        encoding="utf-8",
    )
    return config


@pytest.fixture(scope="module")
def hostile_report(tmp_path_factory):
    root = tmp_path_factory.mktemp("hostile")
    config = make_corpus(root)
    result = CliRunner().invoke(cli, ["scan", "-c", str(config), "--jobs", "1"])
    assert result.exit_code == 0, result.output
    return root / "work" / "report"


def test_questions_and_passages_keep_the_payloads(hostile_report):
    results = json.loads((hostile_report / "results.json").read_text(encoding="utf-8"))
    texts = [q["question"] for q in results["questions"]]
    assert SCRIPT in texts[0] and TEMPLATE in texts[2] and LINK in texts[2]
    passages = {p["id"]: p["text"] for p in results["passages"]}  # format 2: each passage once, by id
    evidence = " ".join(passages[e["passage"]] for q in results["questions"] for e in q["evidence"])
    assert "window.__pwned = 1" in evidence or "window.__pwned = 5" in evidence


def test_page_structure_has_no_injected_elements(hostile_report):
    soup = BeautifulSoup((hostile_report / "index.html").read_text(encoding="utf-8"), "html.parser")
    assert not soup.find_all("img", onerror=True)
    assert not [a for a in soup.find_all("a", href=True) if a["href"].strip().lower().startswith("javascript:")]
    for script in soup.find_all("script"):
        assert "__pwned" not in script.get_text() or script.get("type") == "application/json"
    # The data block stays one JSON document: a "</script>" inside it must not have ended it early.
    for block in soup.find_all("script", type="application/json"):
        json.loads(block.get_text())
    text = soup.get_text(" ")
    assert "{{ 7*7 }}" in text  # shown as written, never evaluated as a template


CHROMIUM = shutil.which("chromium") or ("/usr/bin/chromium" if Path("/usr/bin/chromium").exists() else None)


@pytest.mark.browser
@pytest.mark.skipif(CHROMIUM is None, reason="headless Chromium is not installed")
def test_browser_runs_no_injected_script_and_shows_text_literally(hostile_report):
    sync_api = pytest.importorskip("playwright.sync_api")
    args = [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
    ]
    with sync_api.sync_playwright() as p:
        browser = p.chromium.launch(executable_path=CHROMIUM, args=args)
        page = browser.new_page()
        dialogs = []
        page.on("dialog", lambda d: (dialogs.append(d.message), d.dismiss()))
        page.goto((hostile_report / "index.html").as_uri())
        page.wait_for_load_state("load")
        for summary in page.query_selector_all("summary"):
            summary.click()  # expand everything, so evidence text is rendered too
        pwned = page.evaluate("() => window.__pwned === undefined ? null : window.__pwned")
        body = page.inner_text("body")
        browser.close()
    assert pwned is None and not dialogs
    assert SCRIPT in body and "{{ 7*7 }}" in body and LINK in body
