"""Calibration of the support threshold from labelled questions."""

import csv
import json
import shutil
from datetime import date
from pathlib import Path

import pytest
from click.testing import CliRunner
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.stats import mannwhitneyu

from auditor.cli import cli
from auditor.config import Config, SupportConfig
from auditor.errors import InputError
from auditor.judgement.audit import run_audit
from auditor.judgement.calibrate import (
    calibrate,
    candidate_thresholds,
    choose_threshold,
    format_calibration,
    gap_metrics,
    load_labels,
    roc_auc,
)
from auditor.models import Question
from tests.test_audit import small_kb

AS_OF = date(2026, 12, 1)

LABELS = """id,question,answerable,expected_document
a1,Can I pay my water bill by phone?,yes,billing/payments.md
a2,How much is the late fee on an unpaid bill?,yes,billing/payments.md
a3,How often do meter readers read the water meter?,yes,field/meters.md
a4,Who answers questions about moving house?,yes,care/contact.md
u1,Can I set up autopay by direct debit?,no,
u2,Do you offer rebates for solar panels?,no,
u3,What is the sewer connection charge for new subdivisions?,no,
u4,Is fluoride added to the drinking water?,no,
"""


# --- measures ---------------------------------------------------------------------------------------


@settings(max_examples=80, deadline=None)
@given(
    pos=st.lists(st.sampled_from([0.0, 0.1, 0.2, 0.5, 0.7, 1.0]), min_size=1, max_size=15),
    neg=st.lists(st.sampled_from([0.0, 0.1, 0.3, 0.5, 0.9]), min_size=1, max_size=15),
)
def test_roc_auc_is_the_mann_whitney_statistic(pos, neg):
    # AUC = U / (n1·n0) (Hanley & McNeil 1982); scipy's mannwhitneyu is the reference, ties included.
    assert roc_auc(pos, neg) == pytest.approx(mannwhitneyu(pos, neg).statistic / (len(pos) * len(neg)))


def test_roc_auc_extremes():
    assert roc_auc([0.9, 0.8], [0.1, 0.2]) == 1.0
    assert roc_auc([0.1], [0.9]) == 0.0
    assert roc_auc([0.5], [0.5]) == 0.5
    with pytest.raises(ValueError):
        roc_auc([], [1.0])


def test_gap_metrics_by_hand():
    supports = [0.1, 0.2, 0.3, 0.6, 0.7, 0.8]
    unanswerable = [True, True, False, True, False, False]
    m = gap_metrics(supports, unanswerable, 0.35)  # gaps: 0.1, 0.2, 0.3 → tp 2, fp 1, fn 1
    assert (m["tp"], m["fp"], m["fn"], m["gaps"]) == (2, 1, 1, 3)
    assert m["precision"] == pytest.approx(2 / 3) and m["recall"] == pytest.approx(2 / 3)
    assert m["f1"] == pytest.approx(2 / 3)
    none = gap_metrics(supports, unanswerable, 0.0)
    assert none["gaps"] == 0 and none["recall"] == 0.0 and none["f1"] == 0.0


def test_choose_threshold_max_f1_and_target_precision():
    supports = [0.1, 0.2, 0.3, 0.6, 0.7, 0.8]
    unanswerable = [True, True, False, True, False, False]
    assert candidate_thresholds(supports)[1:4] == pytest.approx([0.15, 0.25, 0.45])
    best, choice = choose_threshold(supports, unanswerable)
    # Thresholds 0.65 (tp 3, fp 1: F1 0.857) beats 0.25 (tp 2: F1 0.8) and 0.45 (F1 0.667).
    assert best["threshold"] == pytest.approx(0.65) and best["f1"] == pytest.approx(6 / 7)
    assert choice == "max F1"
    strict, choice = choose_threshold(supports, unanswerable, target_precision=1.0)
    assert strict["threshold"] == pytest.approx(0.25) and strict["recall"] == pytest.approx(2 / 3)
    assert choice.startswith("highest recall")
    impossible, choice = choose_threshold([0.1, 0.9], [False, True], target_precision=0.9)
    assert "no threshold reaches" in choice


# --- labels files -----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, message",
    [
        ("question,answerable,colour\nq,yes,red\nr,no,blue\n", "unknown column(s) colour"),
        ("question\nq\n", "need the column(s) answerable"),
        ("question,answerable\nq,perhaps\n", "line 2: answerable must be yes or no, not 'perhaps'"),
        ("question,answerable\n,yes\n", "line 2: empty question"),
        ("question,answerable\nq,yes\nr,yes\n", "both answerable and unanswerable"),
        ("question,answerable\n", "no labelled questions"),
        ("question,answerable\nq,yes,extra\nr,no\n", "line 2 has more fields than the header"),
    ],
)
def test_bad_labels_files_give_one_line_errors(tmp_path, text, message):
    path = tmp_path / "labels.csv"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError) as info:
        load_labels(path)
    assert str(info.value).startswith(f"{str(path)!r}: ") and message in str(info.value)
    assert "\n" not in str(info.value)


def test_missing_labels_file(tmp_path):
    with pytest.raises(InputError, match="labels file not found"):
        load_labels(tmp_path / "nope.csv")


def test_labels_are_read_with_expected_documents(tmp_path):
    path = tmp_path / "labels.csv"
    path.write_text("Question,Answerable,Expected_Document\nq,Yes,a.md; b.md\nr,no,\n", encoding="utf-8")
    first, second = load_labels(path)
    assert first.answerable and first.expected_documents == ("a.md", "b.md") and first.id == "l1"
    assert not second.answerable and second.expected_documents == ()


# --- calibrating a store ----------------------------------------------------------------------------


@pytest.fixture
def labelled(store, tmp_path):
    small_kb(store)
    path = tmp_path / "labels.csv"
    path.write_text(LABELS, encoding="utf-8")
    return store, path


def test_calibration_is_stored_and_the_next_audit_uses_it(labelled):
    store, labels = labelled
    strict = Config(support=SupportConfig(threshold=0.95))
    questions = [Question(l.id, l.question) for l in load_labels(labels)]
    before = run_audit(store, strict, questions, as_of=AS_OF)
    assert before.summary.gap == 8  # nothing reaches 0.95

    outcome = calibrate(store, strict, labels)
    assert outcome["metrics"]["auc"] == 1.0  # the four answerable questions outscore the four others
    assert outcome["metrics"]["f1"] == 1.0 and outcome["previous"]["source"] == "config"
    threshold = outcome["thresholds"]["support"]
    answerable = [q["support"] for q in outcome["questions"] if q["answerable"]]
    unanswerable = [q["support"] for q in outcome["questions"] if not q["answerable"]]
    assert max(unanswerable) < threshold <= min(answerable)
    row = store.query("SELECT * FROM calibrations WHERE id = ?", [outcome["id"]])[0]
    assert json.loads(row["thresholds"])["support"] == threshold and row["labels"] == str(labels)

    after = run_audit(store, strict, questions, as_of=AS_OF)
    assert after.info.thresholds.source == "calibration"
    assert after.info.thresholds.support == threshold
    verdicts = {q.id: q.verdict for q in after.questions}
    assert all(verdicts[i] == "gap" for i in ("u1", "u2", "u3", "u4"))
    assert verdicts["a1"] == verdicts["a2"] == verdicts["a4"] == "supported" and verdicts["a3"] == "stale"


def test_holdout_hides_expected_documents(labelled):
    store, labels = labelled
    outcome = calibrate(store, Config(), labels, holdout=True)
    held = outcome["metrics"]["holdout"]
    assert held["questions"] == 4 and held["unknown_documents"] == []
    # Each expected document is the only one that answers its question: hidden, it leaves a gap.
    assert held["gap"] == 4 and held["gap_rate"] == 1.0
    assert "hold-out: expected documents hidden for 4 answerable questions" in format_calibration(outcome)


def test_table_marks_the_chosen_threshold(labelled):
    store, labels = labelled
    text = format_calibration(calibrate(store, Config(), labels, target_precision=0.9))
    assert "ROC AUC" in text and "<- chosen" in text
    assert "highest recall with precision >= 0.9" in text


def test_cli_calibrate_prints_the_table_and_bad_labels_fail_in_one_line(labelled, tmp_path, monkeypatch):
    store, labels = labelled
    monkeypatch.chdir(tmp_path)
    ok = CliRunner().invoke(cli, ["calibrate", "--labels", str(labels), "--db", str(store.path)])
    assert ok.exit_code == 0, ok.output
    assert "<- chosen" in ok.output and "stored support threshold" in ok.output
    bad = tmp_path / "bad.csv"
    bad.write_text("question,answerable,colour\nq,yes,red\n", encoding="utf-8")
    failed = CliRunner().invoke(cli, ["calibrate", "--labels", str(bad), "--db", str(store.path)])
    assert failed.exit_code == 1
    assert "unknown column(s) colour" in failed.output and len(failed.output.strip().splitlines()) == 1


# --- the demo's labelled set ------------------------------------------------------------------------

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


@pytest.fixture(scope="module")
def demo_store(tmp_path_factory):
    """The demo knowledge base ingested by the real ingest into a fresh database."""
    from auditor.config import load_config
    from auditor.ingest.pipeline import ingest_corpus
    from auditor.store import Store

    target = tmp_path_factory.mktemp("calibrate") / "demo"
    shutil.copytree(DEMO, target)
    text = (target / "audit.toml").read_text(encoding="utf-8")
    (target / "audit.toml").write_text(
        text.replace("../../reports/demo/auditor.db", "work/auditor.db").replace("../../reports/demo", "work/report"),
        encoding="utf-8",
    )
    config = load_config(target / "audit.toml", env={})
    with Store(config.database) as store:
        ingest_corpus(store, config, jobs=1)
        yield store, config, target


def test_demo_calibration_restores_the_expected_verdicts(demo_store):
    from auditor.questions.sets import load_questions

    store, config, target = demo_store
    with store.transaction():
        store.db.execute("DELETE FROM calibrations")
    with open(target / "expected.csv", newline="", encoding="utf-8") as f:
        expected = {row["id"]: row["verdict"] for row in csv.DictReader(f)}
    questions = load_questions(target / "questions.csv")
    # A threshold far too strict for this knowledge base: supported questions turn into gaps.
    strict = config.replace(support=SupportConfig(threshold=0.8, weak_margin=0.05))
    before = run_audit(store, strict, questions, as_of=AS_OF)
    wrong = [q.id for q in before.questions if (q.verdict == "gap") != (expected[q.id] == "gap")]
    assert len(wrong) >= 10

    outcome = calibrate(store, strict, target / "labels.csv", holdout=True)
    m = outcome["metrics"]
    assert m["questions"] == 37 and m["unanswerable"] == 10 and m["auc"] > 0.95
    assert m["f1"] >= 0.85
    # Hiding each answer's document leaves most of those questions without support.
    assert m["holdout"]["questions"] == 27 and m["holdout"]["gap_rate"] >= 0.6

    after = run_audit(store, strict, questions, as_of=AS_OF)
    assert after.info.thresholds.source == "calibration"
    assert after.info.thresholds.support == outcome["thresholds"]["support"] < 0.8
    # Calibration tunes the gap verdict: every question is a gap exactly when the demo expects one.
    # (Supported vs stale is not its business: a lower threshold can let a fresh but loosely related
    # passage count as support, as q32's boil-water advisory does at 0.32.)
    assert [q.id for q in after.questions if (q.verdict == "gap") != (expected[q.id] == "gap")] == []

    # A precision target never raises the threshold (here max F1 already has precision 1.0, so it
    # stays): every question whose support clears it is no longer a gap, the others stay gaps.
    precise = calibrate(store, strict, target / "labels.csv", target_precision=1.0)
    low = precise["thresholds"]["support"]
    assert low <= outcome["thresholds"]["support"] and precise["metrics"]["precision"] == 1.0
    third = run_audit(store, strict, questions, as_of=AS_OF)
    for q in third.questions:
        assert (q.verdict == "gap") == (q.support < low), q.id
    assert third.summary.gap <= after.summary.gap
