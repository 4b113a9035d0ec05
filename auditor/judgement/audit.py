"""The audit stage: run a question set through retrieval, judge support and freshness, store the run.

`run_audit` builds the run (`auditor.results.Run`, written out as results.json, docs/results-json.md)
and stores it through `history.runs.save_run`: one `runs` row plus one `results` row per question, in
one transaction, so a failed audit leaves nothing half-written.

A question's `support` is the support its verdict rests on: the best fresh supporting passage's
for a supported question, else the best passage's. Each evidence item carries its own support, the
signals it came from (`signals`), whether the asked-for answer type was found and the horizon it
was judged with; its passage is built once per run (`SourcePassage`, results.json `passages`) and
shared by every item that cites it. Each question gets its explanation (judgement/explain.py).

Past 400 lines because the stage's store reads (passages, statements, the document inventory)
and its judging loop stay together, so that a cluster runs `judge_questions` on its workers unchanged.
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
from collections import defaultdict
from collections.abc import Callable
from datetime import date
from typing import Protocol

from auditor.clock import utc_now
from auditor.config import Config, FreshnessConfig, RetrievalConfig, SupportConfig
from auditor.history.runs import history, save_run
from auditor.ingest.owners import owner_from_config
from auditor.judgement import freshness
from auditor.judgement.briefs import content_briefs
from auditor.judgement.explain import deciding_evidence, explain
from auditor.judgement.support import Judged, judge, ordered_flags, passage_support
from auditor.judgement.thresholds import resolve_thresholds
from auditor.judgement.verdicts import CONFLICT_FLAG, EvidencePassage, diversify, fact_check
from auditor.models import Freshness, Question, TemporalExpression
from auditor.progress import Progress
from auditor.results import (
    Corpus,
    DocumentEntry,
    Evidence,
    IngestError,
    LanguageSummary,
    QuestionResult,
    Run,
    RunInfo,
    SourcePassage,
    Statement,
    Summary,
    Thresholds,
    TokenizerSettings,
)
from auditor.retrieval.index import PassageIndex, SearchResult
from auditor.retrieval.tokenize import Tokenizer
from auditor.store import SEARCHED, SEARCHED_STATUSES, Store, chunked, dumps, marks


def current_thresholds(store: Store, config: Config) -> Thresholds:
    """The support thresholds an audit uses: the newest calibration, else the config's values.

    `source` says which: "calibration", "config" (set in the config file) or "default".
    """
    row = store.db.execute("SELECT thresholds FROM calibrations ORDER BY id DESC LIMIT 1").fetchone()
    if row:
        stored = json.loads(row[0])
        return Thresholds(
            support=float(stored["support"]),
            weak_margin=float(stored.get("weak_margin", config.support.weak_margin)),
            source="calibration",
        )
    source = "default" if config.support == SupportConfig() else "config"
    return Thresholds(support=config.support.threshold, weak_margin=config.support.weak_margin, source=source)


def run_audit(
    store: Store,
    config: Config,
    questions: list[Question],
    *,
    as_of: date,
    horizon_days: int | None = None,
    backend: Backend | None = None,
    progress: bool = False,
) -> Run:
    """Audit `questions` against the searched passages in `store` at audit date `as_of`; store the run.

    `horizon_days` replaces the configured default horizon (path and topic rules and per-question
    overrides still apply). `progress` draws a bar on stderr while the questions are judged
    (auditor/progress.py). Returns the stored run, with its id and its history; the diff and the
    gate are the caller's (`scan.audit_and_report`). With `backend` (auditor/cluster/session.py),
    retrieval and judging run on a cluster; the answers are the same.
    """
    started = utc_now()
    fresh_config = config.freshness
    if horizon_days is not None:
        fresh_config = dataclasses.replace(fresh_config, horizon_days=horizon_days)
    if backend is not None:
        index = backend.passage_index(store, config.retrieval)
    else:
        index = PassageIndex.load_or_build(store, config.retrieval)
    thresholds = Thresholds(**resolve_thresholds(store, config, index))
    tokenizer = index.tokenizer  # the index's own, so that question and passage terms match
    k = config.retrieval.top_k
    # 4k searched, k kept with one passage per document (judgement/verdicts.py, docs/judgement.md).
    found = index.search_many([q.question for q in questions], 4 * k) if questions else []
    passages = _load_passages(store, sorted({h.passage_id for result in found for h in result.hits}))
    diversify(found, {pid: p["path"] for pid, p in passages.items()}, k)
    hit_ids = sorted({h.passage_id for result in found for h in result.hits})
    statements = _load_statements(store, hit_ids)
    judge_all = backend.judge(judge_questions) if backend is not None else judge_questions
    results = judge_all(
        questions,
        found,
        passages,
        statements,
        tokenizer=tokenizer,
        as_of=as_of,
        fresh_config=fresh_config,
        thresholds=thresholds,
        progress=progress and backend is None,  # workers have no terminal
    )
    corpus, documents = _corpus_and_documents(store, config, fresh_config, as_of)
    run = Run(
        info=RunInfo(
            id=None,
            as_of=as_of.isoformat(),
            horizon_days=fresh_config.horizon_days,
            started=started,
            finished=None,
            title=config.report.title,
            # The report highlights matched words with the same tokenizer settings.
            tokenizer=TokenizerSettings(language=config.retrieval.language, stopwords=config.retrieval.stopwords),
            corpus=corpus,
            thresholds=thresholds,
            config_fingerprint=_config_fingerprint(config, fresh_config),
            corpus_fingerprint=_corpus_fingerprint(store),
        ),
        summary=Summary.of(results),
        languages=LanguageSummary.by_language(results),
        questions=results,
        ingest_errors=[
            IngestError(document=r["path"], error=r["error"])
            for r in store.query("SELECT path, error FROM ingest_errors ORDER BY path")
        ],
        documents=documents,
        briefs=content_briefs(results),
        redacted=_redacted(store),
    )
    run_id = save_run(store, run)
    run.history = history(store, run_id)
    return run


# --- judging -------------------------------------------------------------------------------------


def judge_questions(
    questions: list[Question],
    found: list[SearchResult],
    passages: dict[int, dict],
    statements: dict[int, list[TemporalExpression]],
    *,
    tokenizer: Tokenizer,
    as_of: date,
    fresh_config: FreshnessConfig,
    thresholds: Thresholds,
    progress: bool = False,
) -> list[QuestionResult]:
    """Each question's result from its search result and the retrieved passages and statements.

    Pure work over plain data, so a cluster can run it on its workers (auditor/cluster/judge.py).
    `progress` draws a bar on stderr (auditor/progress.py).
    """
    freshness_cache: dict[tuple[int, int], Freshness] = {}

    def passage_fresh(pid: int, horizon: int) -> Freshness:
        key = (pid, horizon)
        if key not in freshness_cache:
            freshness_cache[key] = _freshness(passages[pid], statements.get(pid, []), as_of, horizon)
        return freshness_cache[key]

    sources: dict[int, SourcePassage] = {}  # each passage once, shared by the evidence that cites it

    def passage_source(pid: int, fresh: Freshness) -> SourcePassage:
        if pid not in sources:
            passage = passages[pid]
            sources[pid] = SourcePassage(
                id=pid,
                document=passage["path"],
                page=passage["page"],
                section=" › ".join(passage["heading_path"]),
                owner=passage["owner"],
                as_of=_iso(fresh.as_of),
                as_of_source=fresh.as_of_source,
                expires=_iso(fresh.expires),
                statements=[Statement.of(s) for s in statements.get(pid, [])],
                text=passage["text"],
            )
        return sources[pid]

    bar = Progress("audit", len(questions), enabled=progress)
    results = []
    for question, result in zip(questions, found):
        results.append(
            _judge_question(
                question, result, passages, passage_fresh, passage_source, fresh_config, thresholds, tokenizer
            )
        )
        bar.step()
    bar.done()
    for q in results:
        q.explanation = explain(q, audit_date=as_of.isoformat(), threshold=thresholds.support)
    return results


class Backend(Protocol):
    """Where retrieval and judging run when not in this process (auditor/cluster/session.py)."""

    def passage_index(self, store: Store, retrieval: RetrievalConfig) -> PassageIndex: ...

    def judge(self, judge: Callable[..., list[QuestionResult]]) -> Callable[..., list[QuestionResult]]: ...


def _judge_question(
    question: Question,
    result: SearchResult,
    passages: dict[int, dict],
    passage_fresh: Callable[[int, int], Freshness],
    passage_source: Callable[[int, Freshness], SourcePassage],
    fresh_config: FreshnessConfig,
    thresholds: Thresholds,
    tokenizer: Tokenizer,
) -> QuestionResult:
    idf = dict(result.idf)
    evidence, judged, facts = [], [], []
    for rank, hit in enumerate(result.hits, start=1):
        passage = passages.get(hit.passage_id)
        if passage is None:  # the index is newer than the store read; cannot happen in one process
            continue
        horizon = freshness.horizon_choice(
            fresh_config, path=passage["path"], topic=question.topic, override=question.horizon_days
        )
        fresh = passage_fresh(hit.passage_id, horizon.days)
        scored = passage_support(
            question.question,
            passage["text"],
            score=hit.score,
            max_score=result.max_score,
            idf=idf,
            tokenize=tokenizer.tokenize,
        )
        judged.append(
            Judged(scored.support, fresh.fresh, tuple(fresh.reasons), fresh.as_of_source, scored.answer_type_found)
        )
        facts.append(
            EvidencePassage(
                hit.passage_id, passage["path"], passage["text"], scored.window, scored.support, fresh.fresh
            )
        )
        evidence.append(
            Evidence(
                rank=rank,
                passage=hit.passage_id,
                score=round(float(hit.score), 4),
                support=scored.support,
                signals={k: round(v, 4) for k, v in scored.signals.items()},
                answer_type=scored.answer_type,
                answer_type_found=scored.answer_type_found,
                supporting=False,
                horizon=horizon,
                fresh=fresh.fresh,
                reasons=list(fresh.reasons),
                terms={t: round(float(s), 4) for t, s in sorted(hit.term_scores.items()) if s},
                source=passage_source(hit.passage_id, fresh),
            )
        )
    verdict = judge(judged, threshold=thresholds.support, weak_margin=thresholds.weak_margin)
    for item, supporting in zip(evidence, verdict.supporting):
        item.supporting = supporting
    check = fact_check(
        question.question,
        facts,
        verdict=verdict.verdict,
        support=verdict.support,
        threshold=thresholds.support,
        weak_margin=thresholds.weak_margin,
        idf=idf,
        tokenize=tokenizer.tokenize,
    )
    qr = QuestionResult(
        id=question.id,
        question=question.question,
        owner=question.owner or _nearest_owner(evidence),
        topic=question.topic,
        weight=float(question.weight),
        extra=dict(question.extra),
        verdict=verdict.verdict,
        reasons=verdict.reasons,
        flags=ordered_flags(verdict.flags + ([CONFLICT_FLAG] if check.conflict else [])),
        action=verdict.action,
        support=round(verdict.support, 4),
        horizon=freshness.horizon_choice(fresh_config, topic=question.topic, override=question.horizon_days),
        missing_terms=list(result.missing_terms),
        terms=list(result.terms),
        language=tokenizer.language_of(question.question),
        evidence=evidence,
        **check.as_json(),
    )
    deciding = deciding_evidence(qr)
    if deciding is not None:  # the horizon of the passage the verdict rests on
        qr.horizon = deciding.horizon
    return qr


def question_support(
    store: Store, index: PassageIndex, texts: list[str], k: int, *, hidden: list[set[str]] | None = None
) -> list[float]:
    """Best passage support of each question text (what `calibrate` and the benches measure).

    `hidden` gives, per question, document paths whose passages are left out (the top k of the
    rest are judged; IDF stays that of the whole corpus).
    """
    extra = 0 if hidden is None else 20  # room for hits from hidden documents
    found = index.search_many(texts, k + extra)
    passages = _load_passages(store, sorted({h.passage_id for r in found for h in r.hits}))
    out = []
    for i, (text, result) in enumerate(zip(texts, found)):
        drop = hidden[i] if hidden is not None else set()
        hits = [h for h in result.hits if h.passage_id in passages and passages[h.passage_id]["path"] not in drop][:k]
        best = 0.0
        for hit in hits:
            scored = passage_support(
                text,
                passages[hit.passage_id]["text"],
                score=hit.score,
                max_score=result.max_score,
                idf=result.idf,
                tokenize=index.tokenizer.tokenize,
            )
            best = max(best, scored.support)
        out.append(best)
    return out


def _nearest_owner(evidence: list[Evidence]) -> str:
    """Owner of the best-supported evidence document: who should write or fix the answer."""
    if not evidence:
        return "unassigned"
    return max(evidence, key=lambda e: (e.support, -e.rank)).owner or "unassigned"


def _freshness(passage: dict, statements: list[TemporalExpression], as_of: date, horizon: int) -> Freshness:
    return freshness.passage_freshness(
        statements,
        audit_date=as_of,
        horizon_days=horizon,
        doc_date=_date(passage["doc_date"]) or _date(passage["mtime"]),
        doc_date_source=passage["doc_date_source"] or ("file:mtime" if passage["mtime"] else None),
        doc_expires=_date(passage["expires"]),
    )


# --- store reads ----------------------------------------------------------------------------------

_PASSAGE_SQL = """
SELECT p.id, p.text, p.heading_path, p.page, d.path, d.owner, d.doc_date, d.doc_date_source,
       d.expires, d.mtime
FROM passages p JOIN documents d ON d.id = p.document_id
"""


def _load_passages(store: Store, ids: list[int]) -> dict[int, dict]:
    out = {}
    for chunk in chunked(ids):
        for row in store.query(_PASSAGE_SQL + f" WHERE p.id IN ({marks(chunk)})", chunk):
            row["heading_path"] = json.loads(row["heading_path"] or "[]")
            out[row["id"]] = row
    return out


def _load_statements(store: Store, ids: list[int] | None) -> dict[int, list[TemporalExpression]]:
    """Dated statements per passage, in text order; every statement when `ids` is None."""
    out: dict[int, list[TemporalExpression]] = defaultdict(list)
    sql = "SELECT * FROM statements"
    batches = [None] if ids is None else list(chunked(ids))
    for chunk in batches:
        where = "" if chunk is None else f" WHERE passage_id IN ({marks(chunk)})"
        for row in store.query(sql + where + " ORDER BY passage_id, char_start", chunk or ()):
            out[row["passage_id"]].append(
                TemporalExpression(
                    row["sentence"],
                    row["expression"],
                    date.fromisoformat(row["start"]),
                    date.fromisoformat(row["end"]),
                    row["granularity"],
                    row["role"],
                    row["char_start"],
                    row["char_end"],
                    row["timex_type"],
                    row["timex_value"],
                )
            )
    return out


# --- corpus figures and the document inventory ----------------------------------------------------


def _corpus_and_documents(
    store: Store, config: Config, fresh_config: FreshnessConfig, as_of: date
) -> tuple[Corpus, list[DocumentEntry]]:
    """run.corpus (counts, F and A over searched passages) and the per-document inventory."""
    docs = store.query(
        "SELECT id, path, title, kind, owner, status, doc_date, doc_date_source, expires, "
        "mtime FROM documents ORDER BY path"
    )
    rows = store.query(
        "SELECT p.id, p.document_id FROM passages p JOIN documents d ON d.id = p.document_id "
        f"WHERE d.status IN {SEARCHED_STATUSES} ORDER BY p.id"
    )
    by_doc: dict[int, list[int]] = defaultdict(list)
    for row in rows:
        by_doc[row["document_id"]].append(row["id"])
    statements = _load_statements(store, None) if rows else {}
    items: list[Freshness] = []
    inventory = []
    for doc in docs:
        entry = DocumentEntry(
            path=doc["path"],
            title=doc["title"],
            kind=doc["kind"],
            owner=doc["owner"],
            status=doc["status"],
            doc_date=doc["doc_date"],
            doc_date_source=doc["doc_date_source"],
            expires=doc["expires"],
        )
        if doc["status"] in SEARCHED:
            horizon = freshness.horizon_for(fresh_config, path=doc["path"])
            states = [_freshness(doc, statements.get(pid, []), as_of, horizon) for pid in by_doc[doc["id"]]]
            items.extend(states)
            entry.passages = len(states)
            if states:
                # A document is as fresh as its stalest passage.
                dated = [s.as_of for s in states if s.as_of]
                entry.as_of = _iso(min(dated)) if dated else None
                entry.fresh = all(s.fresh for s in states)
                entry.reasons = sorted({r for s in states for r in s.reasons})
        inventory.append(entry)
    known = {d["path"] for d in docs}
    failed = store.query("SELECT path, kind, error FROM ingest_errors ORDER BY path")
    for row in failed:
        if row["path"] in known:
            for entry in inventory:
                if entry.path == row["path"] and entry.status != "active":
                    entry.status = "failed"
                    entry.reasons = [row["kind"]]
            continue
        # Never ingested: the owner map still says whose file it is, so its owner sees the failure.
        owner = owner_from_config(config, row["path"]) or "unassigned"
        inventory.append(DocumentEntry(path=row["path"], owner=owner, status="failed", reasons=[row["kind"]]))
    inventory.sort(key=lambda e: e.path)
    f_value, mean_age = freshness.corpus_freshness(items) if items else (1.0, 0.0)
    corpus = Corpus(
        documents=sum(1 for d in docs if d["status"] == "active"),
        passages=len(rows),
        failed=len(failed),
        freshness=round(float(f_value), 4),
        mean_age_days=round(float(mean_age), 1),
    )
    return corpus, inventory


# --- fingerprints ---------------------------------------------------------------------------------


def _config_fingerprint(config: Config, fresh_config: FreshnessConfig) -> str:
    relevant = {
        "retrieval": dataclasses.asdict(config.retrieval),
        "support": dataclasses.asdict(config.support),
        "freshness": dataclasses.asdict(fresh_config),
    }
    return hashlib.sha256(dumps(relevant).encode()).hexdigest()[:16]


def _corpus_fingerprint(store: Store) -> str:
    digest = hashlib.sha256()
    for row in store.db.execute(
        f"SELECT path, sha256 FROM documents WHERE status IN {SEARCHED_STATUSES} ORDER BY path"
    ):
        digest.update(f"{row[0]}\0{row[1]}\n".encode())
    return digest.hexdigest()[:16]


def _redacted(store: Store) -> dict[str, int]:
    """Counts by kind of what redaction took out of the query logs stored in this database."""
    rows = store.query("SELECT kind, SUM(count) AS n FROM redaction_counts GROUP BY kind ORDER BY kind")
    return {r["kind"]: int(r["n"]) for r in rows if r["n"]}


def _iso(value: date | None) -> str | None:
    return value.isoformat() if value else None


def _date(value: str | None) -> date | None:
    if not value:
        return None
    try:
        return date.fromisoformat(value[:10])
    except ValueError:
        return None
