"""End to end on the bilingual demo (fixtures/bilingual): no language configured, documents and
questions in English and German. The expected verdicts (fixtures/bilingual/expected.csv) were
written with the pages; the date roles are those docs/languages.md gives for these cue words."""

from __future__ import annotations

import csv
import shutil

import pytest

from auditor.config import load_config
from auditor.report import write_report
from auditor.scan import scan
from auditor.store import Store
from tests.conftest import REPO

BILINGUAL = REPO / "fixtures" / "bilingual"


@pytest.fixture(scope="module")
def bilingual(tmp_path_factory):
    target = tmp_path_factory.mktemp("bilingual") / "demo"
    shutil.copytree(BILINGUAL, target)
    text = (target / "audit.toml").read_text(encoding="utf-8")
    text = text.replace("../../reports/bilingual/auditor.db", "work/auditor.db").replace(
        "../../reports/bilingual", "work/report"
    )
    (target / "audit.toml").write_text(text, encoding="utf-8")
    config = load_config(target / "audit.toml", env={})
    outcome = scan(config, jobs=1)
    with Store(config.database) as store:
        documents = {r["path"]: (r["language"], r["language_source"]) for r in store.query("SELECT * FROM documents")}
        statements = store.query(
            "SELECT d.path, s.expression, s.role, s.start FROM statements s JOIN passages p ON p.id = s.passage_id "
            "JOIN documents d ON d.id = p.document_id ORDER BY d.path, s.char_start"
        )
    return outcome.run, documents, statements


def test_languages_of_the_pages(bilingual):
    _, documents, _ = bilingual
    assert documents == {
        "en/paying-your-bill.md": ("english", "detected"),
        "en/leak-reports.md": ("english", "detected"),
        "de/zahlungsarten.md": ("german", "detected"),
        "de/zaehlerstand.md": ("german", "document"),
        "de/wintertarif.html": ("german", "document"),
        "de/tarife-2027.md": ("german", "detected"),
    }


def test_german_dates_and_roles(bilingual):
    _, _, statements = bilingual
    found = {(s["path"], s["expression"], s["role"], s["start"]) for s in statements}
    assert ("de/zahlungsarten.md", "1. März 2026", "as_of", "2026-03-01") in found
    assert ("de/zaehlerstand.md", "Oktober 2026", "effective", "2026-10-01") in found
    assert ("de/wintertarif.html", "31.12.2024", "expires", "2024-12-31") in found
    assert ("de/tarife-2027.md", "1. Januar 2027", "effective", "2027-01-01") in found


def test_verdicts_match_expected(bilingual):
    run, _, _ = bilingual
    with open(BILINGUAL / "expected.csv", newline="", encoding="utf-8") as f:
        expected = {row["id"]: row["verdict"] for row in csv.DictReader(f)}
    got = {q.id: q.verdict for q in run.questions}
    assert got == expected
    stale = next(q for q in run.questions if q.id == "g03")
    assert "expired" in stale.reasons


def test_figures_per_language_in_the_run_and_the_report(bilingual):
    run, _, _ = bilingual
    figures = {s.language: (s.questions, s.supported, s.stale, s.gap) for s in run.languages}
    # fixtures/bilingual/expected.csv: e01-e03 English (2 supported, 1 gap), g01-g05 German.
    assert figures == {"english": (3, 2, 0, 1), "german": (5, 3, 1, 1)}
    assert {q.id: q.language for q in run.questions}["g03"] == "german"


def test_report_shows_the_languages(bilingual, tmp_path):
    run, _, _ = bilingual
    write_report(run, tmp_path / "report")
    page = (tmp_path / "report" / "index.html").read_text(encoding="utf-8")
    table = page[page.index('id="languages"') : page.index("</table>", page.index('id="languages"'))]
    assert '<td>English</td><td class="n">3</td>' in table and '<td>German</td><td class="n">5</td>' in table
