"""A database stored before results.json format 2 still lists, reports and diffs.

tests/data/format1.sql (a text dump; `tests.conftest.format1_database` rebuilds it) is a database made with the auditor of commit b0664e2 (results.json format 1, verdict
`covered`), from five Fernhollow billing pages of fixtures/demo/kb and eight of the demo's billing
questions, `[retrieval] top_k = 3` to keep it small:

1. `auditor scan --as-of 2026-06-01` without billing/payment-options.html (run 1);
2. the page added and billing/landlord-accounts.html removed, `auditor scan --as-of 2026-12-01` (run 2).

What that version printed, and what is checked below: run 1 "8 questions: 6 covered, 0 stale, 2 gap";
run 2 "8 questions: 4 covered, 2 stale, 2 gap", "weighted fallback exposure 7.5%, stale exposure 9.2%";
`auditor diff` "2 new gaps (weight 27), 2 newly stale (weight 33), 2 resolved gaps (weight 129);
fallback exposure 0.36 -> 0.08" with q14, q15 covered -> gap, q33, q34 covered -> stale (too_old)
and q03, q04 gap -> covered.
"""

from __future__ import annotations

import csv
import json

import pytest
from click.testing import CliRunner

from auditor.cli import cli
from auditor.history.runs import list_runs, load_run
from auditor.store import Store
from tests.conftest import format1_database


@pytest.fixture
def old_db(tmp_path):
    return format1_database(tmp_path / "auditor.db")


def test_the_fixture_is_format1_as_stored(old_db):
    with Store(old_db) as store:
        rows = store.query("SELECT verdict, result FROM results WHERE run_id = 2 ORDER BY position")
    assert [r["verdict"] for r in rows].count("covered") == 4
    first = json.loads(rows[0]["result"])
    assert "horizon_days" in first and "text" in first["evidence"][0]  # the passage inside each item


def test_format1_runs_list_and_load_with_the_new_names(old_db):
    with Store(old_db) as store:
        runs = list_runs(store)
        run = load_run(store)
    assert [(r.id, r.summary.supported, r.summary.stale, r.summary.gap) for r in runs] == [(1, 6, 0, 2), (2, 4, 2, 2)]
    assert {q.verdict for q in run.questions} == {"supported", "stale", "gap"}
    # Weights of fixtures/demo/questions.csv: gaps q14 18 + q15 9, stale q33 26 + q34 7, of 359 in all.
    assert run.summary.weight == 359
    assert run.summary.fallback_exposure == pytest.approx(27 / 359)
    assert run.summary.stale_exposure == pytest.approx(33 / 359)
    # Each passage once, gathered from the evidence items that held it.
    assert len(run.passages) == len({e.passage for q in run.questions for e in q.evidence})
    assert all(q.horizon is None or q.horizon.source == "unrecorded" for q in run.questions)


def test_format1_database_diffs(old_db):
    result = CliRunner().invoke(cli, ["diff", "--db", str(old_db)])
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert lines[0] == (
        "run 2 (2026-12-01) against run 1 (2026-06-01): 2 new gaps (weight 27), 2 newly stale (weight 33), "
        "2 resolved gaps (weight 129); fallback exposure 0.36 -> 0.08"
    )
    changes = {line.split()[0]: line for line in lines if line.startswith("  ")}
    assert "supported -> gap" in changes["q14"] and "supported -> gap" in changes["q15"]
    assert "supported -> stale (too_old)" in changes["q33"] and "supported -> stale (too_old)" in changes["q34"]
    assert "gap -> supported" in changes["q03"] and "gap -> supported" in changes["q04"]


def test_format1_database_reports_in_format2(old_db, tmp_path):
    out = tmp_path / "report"
    result = CliRunner().invoke(cli, ["report", "--db", str(old_db), "--out", str(out)])
    assert result.exit_code == 0, result.output
    data = json.loads((out / "results.json").read_text(encoding="utf-8"))
    assert data["format"] == 2
    assert (data["summary"]["supported"], data["summary"]["stale"], data["summary"]["gap"]) == (4, 2, 2)
    assert "covered" not in json.dumps(data["summary"]) and data["diff"]["counts"]["new_gaps"] == 2
    assert all("text" not in e for q in data["questions"] for e in q["evidence"])
    texts = {p["id"]: p["text"] for p in data["passages"]}
    assert all(e["passage"] in texts for q in data["questions"] for e in q["evidence"])
    # Every question gets its explanation, written now from the stored result.
    assert all(q["explanation"] for q in data["questions"])
    with open(out / "gaps.csv", newline="", encoding="utf-8") as f:
        gaps = {r["id"]: r for r in csv.DictReader(f)}
    assert sorted(gaps) == ["q14", "q15", "q33", "q34"]
    assert gaps["q33"]["verdict"] == "stale" and gaps["q33"]["horizon_source"] == "unrecorded"
    page = (out / "index.html").read_text(encoding="utf-8")
    assert "covered" not in page.lower()
    # The first run too.
    again = CliRunner().invoke(cli, ["report", "--db", str(old_db), "--run", "1", "--out", str(tmp_path / "r1")])
    assert again.exit_code == 0, again.output
    first = json.loads((tmp_path / "r1" / "results.json").read_text(encoding="utf-8"))
    assert (first["summary"]["supported"], first["summary"]["gap"]) == (6, 2) and first["diff"] is None
