"""results.json, gaps.csv and owners/<slug>.csv written by the report."""

from __future__ import annotations

import csv
import dataclasses
import json

import pytest

from auditor.report import write_report
from auditor.report.exports import (
    CSV_COLUMNS,
    all_owners,
    owner_slugs,
    question_owner,
    results_json,
    slugify,
)
from auditor.results import DocumentEntry, Run
from tests import report_samples as samples


@pytest.fixture(scope="module")
def out(tmp_path_factory):
    path = tmp_path_factory.mktemp("exports")
    write_report(samples.sample_run(), path)
    return path


def read_csv(path):
    # RFC 4180 (https://www.rfc-editor.org/rfc/rfc4180): CRLF line ends, quoted fields may hold
    # line breaks; the csv module reads it back.
    with open(path, newline="", encoding="utf-8") as fh:
        return list(csv.reader(fh))


def without_explanations(data: dict) -> dict:
    # The report writes each question's explanation (auditor/judgement/explain.py); the sample has none.
    return {**data, "questions": [{**q, "explanation": ""} for q in data["questions"]]}


def test_results_json_is_the_run_with_format2_keys_first(out):
    raw = (out / "results.json").read_text(encoding="utf-8")
    data = samples.sample_json()
    written = json.loads(raw)
    assert all(q["explanation"] for q in written["questions"])
    text = json.dumps(without_explanations(written), ensure_ascii=False)
    assert json.loads(text) == data
    # Key order too, at every level: the sample is written in the order of docs/results-json.md.
    assert json.dumps(json.loads(text)) == json.dumps(data)
    keys = list(json.loads(text))
    assert keys == [
        "format",
        "run",
        "summary",
        "languages",
        "questions",
        "passages",
        "ingest_errors",
        "documents",
        "to_write",
        "history",
        "diff",
        "limits",
        "redacted",
    ]
    # UTF-8, characters as written, not \\u escapes; a line per question and per passage.
    lines = raw.splitlines()
    assert lines[0] == "{" and lines[1] == '  "format": 2,' and lines[-1] == "}" and raw.endswith("}\n")
    assert any("›" in line for line in lines) and "\\u203a" not in raw
    starts = [i for i, line in enumerate(lines) if line.startswith('  "')]
    assert [lines[i].split('"')[1] for i in starts] == keys  # a line per top-level key
    at = lines.index('  "questions": [')
    assert [json.loads(line.rstrip(",")) for line in lines[at + 1 : at + 14]] == written["questions"]
    # And it reads back as the same run.
    assert Run.from_json(json.loads(text)) == samples.sample_run()
    # Each passage once: 11 distinct passages behind the sample's evidence items.
    assert [p["id"] for p in data["passages"]] == sorted(
        {e["passage"] for q in data["questions"] for e in q["evidence"]}
    )
    assert sum(len(q["evidence"]) for q in data["questions"]) > len(data["passages"]) == 11


def test_a_format1_run_reads_as_format2():
    # The sample as format 1 held it: passages inline, the names of before ("covered", "briefs", "gate").
    old = samples.sample_json_format1()
    old["summary"]["covered"] = old["summary"].pop("supported")
    for q in old["questions"]:
        q["verdict"] = {"supported": "covered"}.get(q["verdict"], q["verdict"])
    assert "passed" in old["gate"] and "text" in old["questions"][0]["evidence"][0]
    expected = samples.sample_json()
    for q in expected["questions"]:  # format 1 kept a question's horizon days, not where they came from
        q["horizon"] = {"days": q["horizon"]["days"], "source": "unrecorded", "rule": None}
        for e in q["evidence"]:
            e["horizon"] = None
    assert Run.from_json(old).to_json() == expected


def test_results_json_key_order_follows_format2_even_when_its_input_does_not():
    data = samples.sample_json()
    shuffled = {k: data[k] for k in reversed(list(data))}
    shuffled["run"] = {k: data["run"][k] for k in reversed(list(data["run"]))}
    assert json.dumps(json.loads(results_json(Run.from_json(shuffled)))) == json.dumps(data)


def test_results_json_of_an_unknown_format_is_refused():
    data = samples.sample_json()
    data["format"] = 3
    with pytest.raises(ValueError, match=r"results format 3 is not one this auditor reads \(it reads \[1, 2\]\)"):
        Run.from_json(data)


def test_results_json_writes_null_for_nan():
    run = samples.sample_run()
    run.questions[0].support = float("nan")
    assert json.loads(results_json(run))["questions"][0]["support"] is None


def test_gaps_csv_lists_gap_and_stale_questions_by_weight(out):
    rows = read_csv(out / "gaps.csv")
    assert tuple(rows[0]) == CSV_COLUMNS
    body = [dict(zip(rows[0], r)) for r in rows[1:]]
    run = samples.sample_run()
    expected = sorted((q for q in run.questions if q.verdict in ("gap", "stale")), key=lambda q: -q.weight)
    assert [r["id"] for r in body] == [q.id for q in expected]
    first = body[0]  # q-002, the autopay gap, weight 140
    assert first == {
        "id": "q-002",
        "question": "How do I set up autopay?",
        "owner": "Billing",
        "topic": "payments",
        "weight": "140",
        "verdict": "gap",
        "reasons": "",
        "flags": "",
        "support": "0.22",
        "missing_terms": "autopay",
        "action": "write",
        "best_document": "billing/payment-options.md",
        "best_section": "Paying › Options",
        "best_as_of": "2026-03-31",
        # The sample's questions are judged with the run's default horizon.
        "horizon_days": "365",
        "horizon_source": "default",
        "explanation": (
            "No passage supports this question (best support 0.22, threshold 0.35); "
            "the assistant would fall back to an outside source or answer without grounding."
        ),
    }
    rebate = next(r for r in body if r["id"] == "q-003")
    assert rebate["reasons"] == "too_old;expired" and rebate["action"] == "retire"
    assert rebate["owner"] == "Conservation Programs"
    assert rebate["best_document"] == "conservation/toilet-rebate.html"


def test_csv_cells_that_a_spreadsheet_would_run_are_defused(tmp_path):
    # OWASP "CSV Injection": cells starting with = + - @ (or tab / CR) are prefixed with '.
    run = samples.sample_run()
    run.questions[1].question = '=HYPERLINK("http://example.invalid","x")'
    run.questions[1].topic = "@SUM(A1)"
    write_report(run, tmp_path)
    rows = read_csv(tmp_path / "gaps.csv")
    row = dict(zip(rows[0], next(r for r in rows if r[0] == "q-002")))
    assert row["question"] == '\'=HYPERLINK("http://example.invalid","x")'
    assert row["topic"] == "'@SUM(A1)"


def test_hostile_text_round_trips_through_csv(out):
    rows = read_csv(out / "gaps.csv")
    q12 = dict(zip(rows[0], next(r for r in rows if r[0] == "q-012")))
    assert q12["question"] == samples.sample_run().questions[11].question
    assert q12["missing_terms"] == "<script>;javascript:"


def test_owner_files_hold_only_that_owners_questions(out):
    run = samples.sample_run()
    slugs = owner_slugs(all_owners(run))
    seen = []
    for owner, slug in slugs.items():
        rows = read_csv(out / "owners" / f"{slug}.csv")
        assert tuple(rows[0]) == CSV_COLUMNS
        assert all(r[2] == owner for r in rows[1:])
        seen += [r[0] for r in rows[1:]]
    assert sorted(seen) == sorted(q.id for q in run.questions)  # each question exactly once
    unassigned = [r[0] for r in read_csv(out / "owners" / "unassigned.csv")[1:]]
    assert unassigned == ["q-010", "q-012"]  # no owner and no evidence: weight 25, then 1
    conservation = [r[0] for r in read_csv(out / "owners" / "conservation-programs.csv")[1:]]
    assert conservation == ["q-003"]  # owner from its best evidence


def test_owner_with_documents_only_gets_files(tmp_path):
    run = samples.sample_run()
    run.documents.append(
        DocumentEntry(path="eng/pumps.md", owner="Engineering", as_of="2020-01-01", fresh=False, reasons=["too_old"])
    )
    write_report(run, tmp_path)
    assert read_csv(tmp_path / "owners" / "engineering.csv") == [list(CSV_COLUMNS)]
    assert (tmp_path / "owners" / "engineering.html").exists()


@pytest.mark.parametrize(
    "name, slug",
    [
        ("Billing", "billing"),
        ("Field Operations", "field-operations"),
        ("Énergie & Eau — Nord", "energie-eau-nord"),
        ("../../etc/passwd", "etc-passwd"),
        ("", "owner"),
        ("水道", "owner"),
    ],
)
def test_slugify(name, slug):
    assert slugify(name) == slug


def test_owner_slugs_never_collide():
    assert owner_slugs(["Billing", "billing", "BILLING!"]) == {
        "BILLING!": "billing",
        "Billing": "billing-2",
        "billing": "billing-3",
    }


def test_question_owner_rule():
    q = samples.bare_run().questions[0]
    a, b = (
        dataclasses.replace(
            q.evidence[0], source=dataclasses.replace(q.evidence[0].source, owner=name), supporting=False
        )
        for name in ("A", "B")
    )
    b.supporting = True
    q.owner, q.evidence = None, [a, b]
    assert question_owner(q) == "B"  # the best *supporting* evidence
    b.supporting = False
    assert question_owner(q) == "A"  # else the top evidence item
    assert question_owner(dataclasses.replace(q, owner="C")) == "C"
    assert question_owner(dataclasses.replace(q, evidence=[])) == "unassigned"
    assert question_owner(dataclasses.replace(q, owner="  ")) == "A"  # blank is no owner


def test_owner_files_of_a_former_owner_are_removed(tmp_path):
    run = samples.sample_run()
    write_report(run, tmp_path)
    (tmp_path / "owners" / "notes.txt").write_text("kept")  # not an owner file
    for q in run.questions:
        if q.owner == "Customer Care":
            q.owner = "Billing"
    run.documents = [d for d in run.documents if d.owner != "Customer Care"]
    for p in run.passages:
        if p.owner == "Customer Care":
            p.owner = "Billing"
    write_report(run, tmp_path)
    names = sorted(p.name for p in (tmp_path / "owners").iterdir())
    assert "customer-care.csv" not in names and "customer-care.html" not in names
    assert "notes.txt" in names and "billing.csv" in names
