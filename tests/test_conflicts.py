"""Conflicting answers (auditor/judgement/conflicts.py): two fresh supporting passages that give
different values of the asked-for type. The passages are demo-style Fernhollow help-centre text
(invented, like fixtures/demo)."""

from __future__ import annotations

import json
from datetime import date

import pytest

from auditor.config import Config, SupportConfig
from auditor.judgement.audit import run_audit
from auditor.judgement.conflicts import compared_type, find_conflict, values_in
from auditor.models import Question
from auditor.report import write_report
from auditor.report.html import verdict_sentence
from auditor.store import Store

try:
    from tests.test_audit import add_document
except ImportError:  # tests/ run as top-level modules (pytest's default rootdir-less import mode)
    from test_audit import add_document


@pytest.mark.parametrize(
    ("question", "expected"),
    [
        ("How much is the reconnection fee?", "amount"),
        ("When does the office close for the holidays?", "date"),
        ("How long does a refund take?", "duration"),
        ("What is the phone number to report a leak?", "phone"),
        ("Who reads the water meters?", None),  # names are not compared: two can both be right
        ("Can I pay my bill online?", None),
    ],
)
def test_which_questions_have_one_right_value(question, expected):
    assert compared_type(question) == expected


def test_values_are_normalized_before_they_are_compared():
    # Amounts: currency and figure, thousands separators dropped (common practice, no source).
    assert [v.key for v in values_in("A fee of $45 applies; the deposit is $1,200.50.", "amount")] == [
        "$45.00",
        "$1200.50",
    ]
    assert [v.key for v in values_in("Seniors get 15 percent off, students 15%.", "amount")] == ["15%"]
    # Phone numbers: digits only, 7 to 15 of them (ITU-T E.164 allows at most 15 digits).
    assert [v.key for v in values_in("Call (541) 555-0199 or 555 0142.", "phone")] == ["5415550199", "5550142"]
    assert values_in("Meter 12345 reads 4 m3.", "phone") == []  # too short to be a number to call
    # Durations in days: "two weeks" is 14 days.
    assert [v.key for v in values_in("Refunds take two weeks, repairs 3 days.", "duration")] == ["14d", "3d"]
    # Dates as ISO 8601 start/end pairs, read by the project's temporal extractor.
    assert [v.key for v in values_in("The office is closed on 24 December 2026.", "date")] == ["2026-12-24/2026-12-24"]


def test_two_pages_with_different_fees_conflict():
    conflict = find_conflict(
        "How much is the reconnection fee?",
        [
            (11, "billing/fees.md", "After a shut-off, the reconnection fee is $45."),
            (12, "customer-care/moving.md", "Reconnection costs $60 and is billed with your next bill."),
        ],
    )
    assert conflict is not None and conflict.value_type == "amount"
    shown = conflict.as_json()
    assert [v["value"] for v in shown["values"]] == ["$45", "$60"]
    assert [v["document"] for v in shown["values"]] == ["billing/fees.md", "customer-care/moving.md"]


def test_different_phone_numbers_conflict_and_the_same_number_written_twice_does_not():
    question = "What is the phone number to report a leak?"
    same = [(1, "field-ops/leaks.md", "Call 555-0142 at once."), (2, "customer-care/contact.md", "Ring 555 0142.")]
    assert find_conflict(question, same) is None
    other = [(1, "field-ops/leaks.md", "Call 555-0142 at once."), (2, "quality/alerts.md", "Call 555-0188.")]
    conflict = find_conflict(question, other)
    assert conflict is not None and [v["normalized"] for v in conflict.as_json()["values"]] == ["5550142", "5550188"]


def test_shared_values_passages_without_values_and_other_question_types_do_not_conflict():
    question = "How much is the late fee?"
    # One page gives the late fee and a second amount; the other repeats the late fee: they agree.
    agreeing = [(1, "a.md", "The late fee is $10, and a returned cheque costs $25."), (2, "b.md", "A $10 late fee.")]
    assert find_conflict(question, agreeing) is None
    assert find_conflict(question, [(1, "a.md", "The late fee is $10."), (2, "b.md", "Late fees apply.")]) is None
    assert find_conflict("Who reads the meters?", [(1, "a.md", "Crew A."), (2, "b.md", "Crew B.")]) is None
    assert find_conflict(question, []) is None


def test_durations_in_other_units_that_agree_do_not_conflict():
    question = "How long does a refund take?"
    passages = [(1, "a.md", "Refunds take one week."), (2, "b.md", "Allow 7 days for a refund.")]
    assert find_conflict(question, passages) is None
    passages = [(1, "a.md", "Refunds take one week."), (2, "b.md", "Allow 10 days for a refund.")]
    assert find_conflict(question, passages) is not None


def test_unknown_type_is_refused():
    with pytest.raises(ValueError, match="not compared"):
        values_in("text", "colour")


def test_audit_flags_conflicting_fees_in_results_and_report(tmp_path):
    # Two fresh demo-style pages (invented Fernhollow text) that give the reconnection fee twice.
    with Store(tmp_path / "kb.db") as store:
        add_document(store, "billing/fees.md", [(["Fees", "Reconnection"], "The reconnection fee is $45.")])
        add_document(
            store, "customer-care/moving.md", [(["Moving", "Reconnection"], "The reconnection fee is $60 now.")]
        )
        add_document(store, "care/contact.md", [(["Contact"], "Customer Care answers questions about service.")])
        config = Config(support=SupportConfig(threshold=0.3))
        run = run_audit(store, config, [Question("q1", "How much is the reconnection fee?")], as_of=date(2026, 12, 1))
    q = run.questions[0]
    assert q.verdict == "supported" and "conflicting_values" in q.flags
    assert q.conflict is not None and q.conflict["type"] == "amount"
    assert sorted(v["value"] for v in q.conflict["values"]) == ["$45", "$60"]
    sentence = verdict_sentence(q, run.info)
    assert "$45" in sentence and "$60" in sentence and "reconcile" in sentence
    index = write_report(run, tmp_path / "report")
    written = json.loads((index.parent / "results.json").read_text(encoding="utf-8"))
    assert written["questions"][0]["conflict"] == q.conflict
    assert run.info.thresholds is not None and run.info.thresholds.source == "config"
