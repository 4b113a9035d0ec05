"""End to end on the demo knowledge base: the audit is held to fixtures/demo/expected.csv.

The expected verdicts were written with the documents (fixtures/demo/README.md says which passage
decides each); they are the demo's specification, not a recording of the tool's output.
"""

import csv
import json

import pytest
from click.testing import CliRunner
from conftest import DEMO

from auditor.cli import cli
from auditor.config import load_config
from auditor.scan import scan
from auditor.store import Store

# results.json format 1, docs/results-json.md: the keys every consumer may rely on.
RUN_KEYS = {"id", "as_of", "horizon_days", "started", "corpus"}
SUMMARY_KEYS = {"questions", "covered", "stale", "gap", "weight", "fallback_exposure", "stale_exposure"}
QUESTION_KEYS = {
    "id",
    "question",
    "owner",
    "topic",
    "weight",
    "verdict",
    "reasons",
    "support",
    "missing_terms",
    "evidence",
}
EVIDENCE_KEYS = {
    "document",
    "page",
    "section",
    "passage",
    "score",
    "support",
    "supporting",
    "as_of",
    "as_of_source",
    "expires",
    "fresh",
    "reasons",
    "text",
}


def expected():
    with open(DEMO / "expected.csv", newline="", encoding="utf-8") as f:
        return {row["id"]: row for row in csv.DictReader(f)}


def comparable(run):
    """The parts of a run that must not change between identical scans."""
    return [
        (
            q["id"],
            q["verdict"],
            q["reasons"],
            round(q["support"], 9),
            [(e["document"], e["passage"] is not None, round(e["score"], 9)) for e in q["evidence"]],
        )
        for q in run["questions"]
    ], run["summary"]


@pytest.fixture(scope="module")
def demo_scans(tmp_path_factory):
    import shutil

    target = tmp_path_factory.mktemp("e2e") / "demo"
    shutil.copytree(DEMO, target)
    text = (target / "audit.toml").read_text(encoding="utf-8")
    text = text.replace("../../reports/demo/auditor.db", "work/auditor.db").replace("../../reports/demo", "work/report")
    (target / "audit.toml").write_text(text, encoding="utf-8")
    config = load_config(target / "audit.toml", env={})
    first = scan(config, jobs=2)
    second = scan(config, jobs=2)
    return config, first, second


def test_demo_verdicts_match_expected(demo_scans):
    _, first, _ = demo_scans
    want = expected()
    got = {q["id"]: q for q in first.run["questions"]}
    assert set(got) == set(want)
    mismatches = []
    for qid, row in want.items():
        reasons = sorted(r for r in row["reasons"].split(";") if r)
        if got[qid]["verdict"] != row["verdict"] or sorted(got[qid]["reasons"]) != reasons:
            mismatches.append(
                f"{qid}: expected {row['verdict']} {reasons}, got {got[qid]['verdict']} "
                f"{got[qid]['reasons']} (support {got[qid]['support']:.2f})"
            )
    assert not mismatches, "\n".join(mismatches)


def test_every_verdict_and_stale_reason_occurs(demo_scans):
    _, first, _ = demo_scans
    verdicts = {q["verdict"] for q in first.run["questions"]}
    reasons = {r for q in first.run["questions"] if q["verdict"] == "stale" for r in q["reasons"]}
    assert verdicts == {"covered", "stale", "gap"}
    assert {"too_old", "expired", "overtaken"} <= reasons


def test_results_json_follows_format_1(demo_scans):
    _, first, _ = demo_scans
    data = json.loads((first.out_dir / "results.json").read_text(encoding="utf-8"))
    assert data["format"] == 1
    assert RUN_KEYS <= set(data["run"]) and {"documents", "passages", "failed"} <= set(data["run"]["corpus"])
    assert SUMMARY_KEYS <= set(data["summary"])
    assert data["summary"]["questions"] == len(data["questions"]) == len(expected())
    assert (
        data["summary"]["covered"] + data["summary"]["stale"] + data["summary"]["gap"] == data["summary"]["questions"]
    )
    for q in data["questions"]:
        assert QUESTION_KEYS <= set(q)
        for e in q["evidence"]:
            assert EVIDENCE_KEYS <= set(e)
    # Questions keep the order of the question set.
    with open(DEMO / "questions.csv", newline="", encoding="utf-8") as f:
        assert [q["id"] for q in data["questions"]] == [row["id"] for row in csv.DictReader(f)]
    # The demo ships one broken PDF: it is reported, and the run still finished.
    assert data["ingest_errors"] and all({"document", "error"} <= set(e) for e in data["ingest_errors"])
    gap_weight = sum(q["weight"] for q in data["questions"] if q["verdict"] == "gap")
    assert data["summary"]["fallback_exposure"] == pytest.approx(gap_weight / data["summary"]["weight"])
    for name in ("index.html", "gaps.csv"):
        assert (first.out_dir / name).is_file()
    assert list((first.out_dir / "owners").glob("*.csv"))


def test_second_scan_reparses_nothing_and_gives_identical_results(demo_scans):
    config, first, second = demo_scans
    assert second.ingest_line.startswith("0 new, 0 changed, ")
    with Store(config.database) as store:
        documents = store.query("SELECT count(*) AS n FROM documents WHERE status = 'active'")[0]["n"]
    assert f"{documents} unchanged" in second.ingest_line
    assert comparable(first.run) == comparable(second.run)
    assert second.run["run"]["id"] == first.run["run"]["id"] + 1


def test_cli_scan_prints_summary_and_report_path(demo_copy):
    result = CliRunner().invoke(cli, ["scan", "-c", str(demo_copy / "audit.toml"), "--jobs", "1"])
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert any(line.startswith("ingest: ") for line in lines)
    assert any(" questions: " in line and " covered, " in line and " gap" in line for line in lines)
    assert any("weighted fallback exposure" in line for line in lines)
    report = [line for line in lines if line.startswith("report: ")]
    assert report and report[0].endswith("index.html")


def test_question_set_is_kept_in_the_store(demo_scans):
    config, first, _ = demo_scans
    with Store(config.database) as store:
        rows = store.query("SELECT qid FROM questions WHERE set_name = 'questions.csv' ORDER BY position")
    assert [r["qid"] for r in rows] == [q["id"] for q in first.run["questions"]]


def test_audit_of_a_query_log_reports_merges_and_redactions(demo_scans, tmp_path):
    config, _, _ = demo_scans
    result = CliRunner().invoke(
        cli,
        [
            "audit",
            "-c",
            str(config.source),
            "--questions",
            str(DEMO / "querylog.csv"),
            "--out",
            str(tmp_path / "log-report"),
        ],
    )
    assert result.exit_code in (0, 3), result.output
    summary = [line for line in result.stderr.splitlines() if line.startswith("querylog.csv: ")]
    assert summary and "merged" in summary[0] and "redacted" in summary[0]
    data = json.loads((tmp_path / "log-report" / "results.json").read_text(encoding="utf-8"))
    # Weights are traffic counts: they add up to the log's total count (merging keeps every hit).
    with open(DEMO / "querylog.csv", newline="", encoding="utf-8") as f:
        total = sum(int(row["count"]) for row in csv.DictReader(f) if row["text"].strip())
    assert data["summary"]["weight"] == pytest.approx(total)
    assert "@example" not in json.dumps(data)
