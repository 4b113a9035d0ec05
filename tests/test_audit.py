"""The audit stage on small stores built through the schema: verdicts, the run object, storage."""

import json
from datetime import date

import pytest

from auditor.config import Config, FreshnessConfig, HorizonRule, SupportConfig, load_config
from auditor.history import runs
from auditor.history.runs import load_run
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.audit import current_thresholds, run_audit
from auditor.models import Question
from auditor.report import write_report
from auditor.results import Horizon, IngestError, Run, Thresholds
from auditor.retrieval.index import PassageIndex
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import Store, dumps
from auditor.temporal import extract as temporal
from tests.ingest_helpers import make_pdf

AS_OF = date(2026, 12, 1)


def add_document(
    store,
    path,
    passages,
    *,
    doc_date="2026-11-01",
    source="front_matter:updated",
    owner="Billing",
    status="active",
    expires=None,
):
    """Insert one document and its passages as ingest would (token ids, dated statements)."""
    tokenizer = Tokenizer()
    with store.transaction():
        vocabulary = Vocabulary(store)
        doc_id = store.db.execute(
            "INSERT INTO documents (path, source_root, kind, sha256, size, mtime, title, owner, doc_date, "
            "doc_date_source, expires, status, first_seen, last_seen, ingested_at) "
            "VALUES (?, '/kb', 'markdown', ?, 1, '2020-01-01T00:00:00', ?, ?, ?, ?, ?, ?, 'x', 'x', 'x')",
            [path, f"sha-{path}", path.title(), owner, doc_date, source, expires, status],
        ).lastrowid
        for ordinal, (heading, text) in enumerate(passages):
            tokens = tokenizer.tokenize(text)
            pid = store.db.execute(
                "INSERT INTO passages (document_id, ordinal, text, heading_path, page, char_start, char_end, "
                "token_ids, token_count) VALUES (?, ?, ?, ?, NULL, 0, ?, ?, ?)",
                [doc_id, ordinal, text, json.dumps(heading), len(text), vocabulary.ids(tokens).tobytes(), len(tokens)],
            ).lastrowid
            reference = date.fromisoformat(doc_date) if doc_date else None
            for s in temporal.extract(text, reference):
                store.db.execute(
                    "INSERT INTO statements (passage_id, expression, sentence, start, end, granularity, role, "
                    "char_start, char_end) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
                    [
                        pid,
                        s.expression,
                        s.text,
                        s.start.isoformat(),
                        s.end.isoformat(),
                        s.granularity,
                        s.role,
                        s.char_start,
                        s.char_end,
                    ],
                )
    return doc_id


def small_kb(store):
    add_document(
        store,
        "billing/payments.md",
        [
            (
                ["Payments", "By phone"],
                "You can pay your water bill by phone. Call the payment line and have your "
                "account number ready. Card payments by phone are free.",
            ),
            (["Payments", "Late fees"], "A late fee of $12 applies when the bill is unpaid after the due date."),
        ],
    )
    add_document(
        store,
        "field/meters.md",
        [
            (
                ["Meters"],
                "As of March 2021, meter readers visit each property every two months to read the water "
                "meter. Readings appear on your next bill.",
            ),
        ],
        doc_date="2021-03-15",
        owner="Field Operations",
    )
    add_document(
        store,
        "care/contact.md",
        [
            (["Contact"], "Customer Care answers questions about service, moving house and account changes."),
        ],
        owner="Customer Care",
    )
    with store.transaction():
        store.db.execute(
            "INSERT INTO ingest_errors VALUES ('quality/scan.pdf', '/kb', 'encrypted', "
            "'encrypted PDF, no password given', 'x')"
        )


QUESTIONS = [
    Question("q1", "Can I pay my water bill by phone?", weight=10),
    Question("q2", "How often is my water meter read?", topic="meters", weight=5),
    Question("q3", "Can I set up autopay for my direct debit?", weight=25),
]


@pytest.fixture
def kb(store):
    small_kb(store)
    return store


def test_verdicts_summary_and_run_object(kb):
    run = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF)
    by_id = {q.id: q for q in run.questions}
    assert [q.id for q in run.questions] == ["q1", "q2", "q3"]
    assert by_id["q1"].verdict == "supported" and by_id["q1"].action is None
    assert by_id["q2"].verdict == "stale" and by_id["q2"].reasons == ["too_old"]
    assert by_id["q2"].action == "refresh"
    assert by_id["q3"].verdict == "gap" and by_id["q3"].action == "write"
    assert by_id["q3"].reasons == []
    assert {"autopay", "debit"} <= set(by_id["q3"].missing_terms)
    # Weighted exposures (docs/judgement.md): gap weight 25 and stale weight 5 of 40.
    s = run.summary
    assert (s.questions, s.supported, s.stale, s.gap, s.weight) == (3, 1, 1, 1, 40.0)
    assert s.fallback_exposure == pytest.approx(25 / 40) and s.stale_exposure == pytest.approx(5 / 40)
    # The best evidence of q1 is the phone passage, with its score breakdown and owner.
    top = by_id["q1"].evidence[0]
    assert top.document == "billing/payments.md" and top.section == "Payments › By phone"
    assert top.rank == 1 and top.supporting and top.fresh and top.owner == "Billing"
    assert set(top.terms) >= {"pay", "phone", "bill"} and all(v > 0 for v in top.terms.values())
    assert sum(top.terms.values()) == pytest.approx(top.score, abs=1e-3)
    assert by_id["q1"].owner == "Billing"  # no owner in the question set: the evidence's owner
    # The meter passage carries its dated statement.
    meter = by_id["q2"].evidence[0]
    assert meter.as_of_source == "statement" and meter.as_of == "2021-03-31"
    assert meter.statements[0].expression == "March 2021" and meter.statements[0].role == "as_of"
    head = run.info
    assert head.thresholds is not None and head.thresholds.probe is not None
    # Too small a corpus for the corpus probe (docs/judgement.md): the shipped threshold stays.
    assert (head.thresholds.support, head.thresholds.weak_margin, head.thresholds.source) == (0.45, 0.05, "default")
    assert "at least 20" in head.thresholds.probe["skipped"]
    assert head.horizon_days == 365 and head.as_of == "2026-12-01" and head.id is not None and head.id >= 1
    assert (head.corpus.documents, head.corpus.passages, head.corpus.failed) == (3, 4, 1)
    assert run.ingest_errors == [IngestError(document="quality/scan.pdf", error="encrypted PDF, no password given")]
    assert run.to_json()["format"] == 2 and run.diff is None and run.gate is None


def test_statements_are_written_as_their_temporal_expression(kb):
    # The results.json statement is TemporalExpression.as_json (the `auditor dates` shape), keys in
    # the order of docs/results-json.md.
    meter = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF).questions[1].evidence[0]
    line = temporal.extract(meter.text, date(2021, 3, 15))[0].as_json()
    # results.json format 1 keeps the dates line's original keys, not its TIMEX3 type, value, offsets
    expected = {key: line[key] for key in ("expression", "start", "end", "granularity", "role", "text")}
    written = meter.statements[0].to_json()
    assert written == expected
    assert list(written) == ["expression", "start", "end", "granularity", "role", "text"]


def test_corpus_freshness_follows_cho_and_garcia_molina(kb):
    # F = (1/N) Σ F(e_i), A = (1/N) Σ A(e_i) with A = 0 when fresh (Cho & Garcia-Molina, SIGMOD 2000).
    # 3 of 4 passages are fresh; the meter passage is as of 2021-03-31, 2071 days before 2026-12-01.
    corpus = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF).info.corpus
    age = (AS_OF - date(2021, 3, 31)).days
    assert corpus.freshness == pytest.approx(0.75)
    assert corpus.mean_age_days == pytest.approx(age / 4, abs=0.1)


def test_documents_inventory_lists_failed_files(kb):
    docs = {d.path: d for d in run_audit(kb, Config(), QUESTIONS, as_of=AS_OF).documents}
    assert list(docs) == sorted(docs)
    assert docs["quality/scan.pdf"].status == "failed" and docs["quality/scan.pdf"].reasons == ["encrypted"]
    meters = docs["field/meters.md"]
    assert (meters.status, meters.passages, meters.fresh, meters.reasons) == ("active", 1, False, ["too_old"])
    assert docs["billing/payments.md"].fresh is True and docs["billing/payments.md"].passages == 2


def test_run_and_results_are_stored(kb):
    run = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF)
    row = kb.query("SELECT * FROM runs WHERE id = ?", [run.info.id])[0]
    assert row["status"] == "done" and row["finished"] == run.info.finished and row["as_of"] == "2026-12-01"
    assert json.loads(row["summary"]) == run.summary.to_json()
    assert json.loads(row["corpus"]) == run.info.corpus.to_json()
    assert json.loads(row["thresholds"])["source"] == "default"
    assert json.loads(row["extras"])["documents"] == [d.to_json() for d in run.documents]
    results = kb.query("SELECT * FROM results WHERE run_id = ? ORDER BY position", [run.info.id])
    assert [r["qid"] for r in results] == ["q1", "q2", "q3"]
    assert [json.loads(r["result"]) for r in results] == [q.to_json() for q in run.questions]
    # A second audit records the first in its history.
    second = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF)
    assert [h.id for h in second.history] == [run.info.id]
    assert second.info.id == run.info.id + 1


def test_a_failing_audit_stores_nothing(kb, monkeypatch):
    def broken(*args, **kwargs):
        raise RuntimeError("disk full")

    monkeypatch.setattr(runs, "dumps", broken)  # fails inside the storing transaction
    with pytest.raises(RuntimeError):
        run_audit(kb, Config(), QUESTIONS, as_of=AS_OF)
    assert kb.query("SELECT count(*) AS n FROM runs")[0]["n"] == 0
    assert kb.query("SELECT count(*) AS n FROM results")[0]["n"] == 0


def test_horizon_override_rules_and_question_horizons(kb):
    # --horizon 3000 makes the 2021 meter passage fresh again.
    run = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF, horizon_days=3000)
    assert run.info.horizon_days == 3000
    assert run.questions[1].verdict == "supported" and run.questions[1].horizon == Horizon(days=3000, source="default")
    # A topic rule, and a per-question override that wins over it.
    config = Config(freshness=FreshnessConfig(365, (HorizonRule(3000, topic="meters"),)))
    assert run_audit(kb, config, QUESTIONS, as_of=AS_OF).questions[1].verdict == "supported"
    strict = [QUESTIONS[0], Question("q2", QUESTIONS[1].question, topic="meters", horizon_days=30)]
    q2 = run_audit(kb, config, strict, as_of=AS_OF).questions[1]
    assert q2.verdict == "stale" and q2.horizon == Horizon(days=30, source="question")
    topical = run_audit(kb, config, [QUESTIONS[0], Question("q2", QUESTIONS[1].question, topic="meters")], as_of=AS_OF)
    assert topical.questions[1].horizon == Horizon(days=3000, source="topic_rule", rule="meters")
    # The explanation names that horizon and where it came from.
    assert "within the 3000-day horizon (the topic rule `meters`)" in topical.questions[1].explanation
    assert "older than the 30-day horizon (the question's own horizon_days)" in q2.explanation


def test_thresholds_come_from_calibration_then_config_then_default(kb):
    assert current_thresholds(kb, Config()).source == "default"
    config = Config(support=SupportConfig(threshold=0.99))
    assert current_thresholds(kb, config) == Thresholds(support=0.99, weak_margin=0.05, source="config")
    # Nothing clears 0.99: every question becomes a gap.
    assert run_audit(kb, config, QUESTIONS, as_of=AS_OF).summary.gap == 3
    with kb.transaction():
        kb.db.execute(
            "INSERT INTO calibrations (created, labels, thresholds) VALUES ('x', 'l.csv', ?)",
            [dumps({"support": 0.05, "weak_margin": 0.01})],
        )
    run = run_audit(kb, config, QUESTIONS, as_of=AS_OF)
    assert run.info.thresholds == Thresholds(support=0.05, weak_margin=0.01, source="calibration")
    assert run.summary.gap < 3


def test_empty_question_set_and_empty_store(store):
    run = run_audit(store, Config(), [], as_of=AS_OF)
    assert run.summary.questions == 0 and run.summary.fallback_exposure == 0.0
    assert run.info.corpus.passages == 0
    gap = run_audit(store, Config(), QUESTIONS[:1], as_of=AS_OF).questions[0]
    assert gap.verdict == "gap" and gap.evidence == [] and gap.reasons == []


def test_run_follows_the_format_and_reloads_equal(kb, tmp_path):
    # results.json format 2 (docs/results-json.md): every key of every part, in the documented order.
    run = run_audit(kb, Config(), QUESTIONS, as_of=AS_OF)
    write_report(run, tmp_path / "report")
    written = json.loads((tmp_path / "report" / "results.json").read_text(encoding="utf-8"))
    assert list(written) == [
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
    assert list(written["run"]) == [
        "id",
        "as_of",
        "horizon_days",
        "started",
        "finished",
        "title",
        "tokenizer",
        "corpus",
        "thresholds",
        "config_fingerprint",
        "corpus_fingerprint",
    ]
    assert list(written["run"]["corpus"]) == ["documents", "passages", "failed", "freshness", "mean_age_days"]
    for q in written["questions"]:
        assert list(q) == [
            "id",
            "question",
            "owner",
            "topic",
            "weight",
            "extra",
            "verdict",
            "reasons",
            "flags",
            "action",
            "support",
            "horizon",
            "explanation",
            "missing_terms",
            "terms",
            "language",
            "evidence",
            "missing_constraint",
            "needs_look",
            "look_reasons",
            "conflict",
        ]
        for e in q["evidence"]:
            assert list(e) == [
                "rank",
                "passage",
                "score",
                "support",
                "signals",
                "answer_type",
                "answer_type_found",
                "supporting",
                "horizon",
                "fresh",
                "reasons",
                "terms",
            ]
            assert list(e["horizon"]) == ["days", "source", "rule"]
    cited = {e["passage"] for q in written["questions"] for e in q["evidence"]}
    assert [p["id"] for p in written["passages"]] == sorted(cited)  # each passage once, by id
    for p in written["passages"]:
        assert list(p) == [
            "id",
            "document",
            "page",
            "section",
            "owner",
            "as_of",
            "as_of_source",
            "expires",
            "statements",
            "text",
        ]
    for d in written["documents"]:
        assert list(d) == [
            "path",
            "title",
            "kind",
            "owner",
            "status",
            "doc_date",
            "doc_date_source",
            "expires",
            "passages",
            "as_of",
            "fresh",
            "reasons",
        ]
    assert [q["verdict"] for q in written["questions"]] == ["supported", "stale", "gap"]
    # The gap question becomes a passage to write (judgement/briefs.py) naming it.
    assert any("q3" in b.questions for b in run.briefs)
    # What runs.load_run rebuilds from the store is the run we returned, and results.json reads back as it.
    loaded = load_run(kb, run.info.id)
    assert loaded == run
    assert Run.from_json(written) == run


def test_a_file_that_breaks_stays_searchable_and_its_owner_sees_the_failure(tmp_path):
    # Real files through the real ingest: a PDF that later arrives truncated keeps its last good
    # passages in the search (the assistant's own index still has them), and a broken file that was
    # never ingested is still attributed through the owner map.
    kb = tmp_path / "kb" / "quality"
    kb.mkdir(parents=True)
    good = make_pdf(["Hydrant flushing notice. Crews flush the hydrants on Birchwood Lane every autumn."])
    (kb / "flushing.pdf").write_bytes(good)
    (kb / "scan.pdf").write_bytes(good[:300])
    (tmp_path / "audit.toml").write_text(
        '[corpus]\npaths = ["kb"]\n[owners]\n"quality/**" = "Water Quality"\n', encoding="utf-8"
    )
    config = load_config(tmp_path / "audit.toml", env={})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config, jobs=1)
        (kb / "flushing.pdf").write_bytes(good[: len(good) // 3])
        summary = ingest_corpus(store, config, jobs=1)
        assert summary.failed == 2
        status = {r["path"]: r["status"] for r in store.query("SELECT path, status FROM documents")}
        assert status == {"quality/flushing.pdf": "failed"}
        hits = PassageIndex.load_or_build(store, config.retrieval).search("hydrant flushing Birchwood", 3).hits
        assert hits
        run = run_audit(
            store, config, [Question("q1", "When are the hydrants on Birchwood Lane flushed?")], as_of=date(2026, 12, 1)
        )
    assert run.questions[0].evidence[0].document == "quality/flushing.pdf"
    inventory = {d.path: d for d in run.documents}
    assert inventory["quality/scan.pdf"].owner == "Water Quality"
    assert inventory["quality/scan.pdf"].status == inventory["quality/flushing.pdf"].status == "failed"
