"""The audit stage: run a question set through retrieval, judge support and freshness, store the run.

`run_audit` builds the run object (results.json format 1, docs/results-json.md, with the extensions listed
in docs/results-json.md) and stores it as one `runs` row plus one `results` row per question,
all in one transaction, so a failed audit leaves nothing half-written.

A question's `support` is the support its verdict rests on: the best fresh supporting passage's
for a covered question, else the best passage's. Each evidence item carries its own support, the
signals it came from (`signals`), and whether the asked-for answer type was found.
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
from collections import defaultdict
from datetime import UTC, date, datetime
from pathlib import Path

from auditor.config import Config, SupportConfig
from auditor.ingest.owners import owner_from_config
from auditor.judgement.support import Judged, judge, passage_support
from auditor.models import Freshness, Question, TemporalExpression
from auditor.store import SEARCHED_STATUSES, Store, dumps

FORMAT = 1


def current_thresholds(store: Store, config: Config) -> dict:
    """The support thresholds an audit uses: the newest calibration, else the config's values.

    `source` says which: "calibration", "config" (set in the config file) or "default".
    """
    row = store.db.execute("SELECT thresholds FROM calibrations ORDER BY id DESC LIMIT 1").fetchone()
    if row:
        stored = json.loads(row[0])
        return {
            "support": float(stored["support"]),
            "weak_margin": float(stored.get("weak_margin", config.support.weak_margin)),
            "source": "calibration",
        }
    source = "default" if config.support == SupportConfig() else "config"
    return {"support": config.support.threshold, "weak_margin": config.support.weak_margin, "source": source}


def run_audit(
    store: Store,
    config: Config,
    questions: list[Question],
    *,
    as_of: date,
    horizon_days: int | None = None,
    out: Path | None = None,
) -> dict:
    """Audit `questions` against the active passages in `store` at audit date `as_of`.

    `horizon_days` replaces the configured default horizon (path and topic rules and per-question
    overrides still apply). Returns the run object; with `out`, also writes the report there.
    """
    from auditor.retrieval.index import PassageIndex

    _use_freshness()
    started = _now()
    fresh_config = config.freshness
    if horizon_days is not None:
        fresh_config = dataclasses.replace(fresh_config, horizon_days=horizon_days)
    thresholds = current_thresholds(store, config)
    index = PassageIndex.load_or_build(store, config.retrieval)
    tokenizer = index.tokenizer  # the index's own, so that question and passage terms match
    found = index.search_many([q.question for q in questions], config.retrieval.top_k) if questions else []

    hit_ids = sorted({h.passage_id for result in found for h in result.hits})
    passages = _load_passages(store, hit_ids)
    statements = _load_statements(store, hit_ids)
    freshness_cache: dict[tuple[int, int], Freshness] = {}

    def passage_fresh(pid: int, horizon: int) -> Freshness:
        key = (pid, horizon)
        if key not in freshness_cache:
            freshness_cache[key] = _freshness(passages[pid], statements.get(pid, []), as_of, horizon)
        return freshness_cache[key]

    results = []
    for question, result in zip(questions, found):
        results.append(
            _judge_question(question, result, passages, statements, passage_fresh, fresh_config, thresholds, tokenizer)
        )

    corpus, documents = _corpus_and_documents(store, config, fresh_config, as_of)
    summary = _summary(results)
    errors = [
        {"document": r["path"], "error": r["error"]}
        for r in store.query("SELECT path, error FROM ingest_errors ORDER BY path")
    ]
    briefs = _briefs(results)
    run = {
        "format": FORMAT,
        "run": {
            "id": None,
            "as_of": as_of.isoformat(),
            "horizon_days": fresh_config.horizon_days,
            "started": started,
            "finished": None,
            "title": config.report.title,
            # The report highlights matched words with the same tokenizer settings.
            "tokenizer": {"language": config.retrieval.language, "stopwords": config.retrieval.stopwords},
            "corpus": corpus,
            "thresholds": thresholds,
            "config_fingerprint": _config_fingerprint(config, fresh_config),
            "corpus_fingerprint": _corpus_fingerprint(store),
        },
        "summary": summary,
        "questions": results,
        "ingest_errors": errors,
        "documents": documents,
        "briefs": briefs,
        "history": _history(store),
        "diff": None,
        "gate": None,
    }
    _store_run(store, run)
    if out is not None:
        from auditor.report import write_report

        write_report(run, Path(out))
    return run


freshness_rules = None


def _use_freshness():
    # Imported on first audit, so that calibrate and the benches (support only) need no freshness rules.
    global freshness_rules
    if freshness_rules is None:
        from auditor.judgement import freshness

        freshness_rules = freshness


# --- judging one question -------------------------------------------------------------------------


def _judge_question(question, result, passages, statements, passage_fresh, fresh_config, thresholds, tokenizer) -> dict:
    idf = dict(result.idf)
    evidence, judged = [], []
    for rank, hit in enumerate(result.hits, start=1):
        passage = passages.get(hit.passage_id)
        if passage is None:  # the index is newer than the store read; cannot happen in one process
            continue
        horizon = freshness_rules.horizon_for(
            fresh_config, path=passage["path"], topic=question.topic, override=question.horizon_days
        )
        fresh = passage_fresh(hit.passage_id, horizon)
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
        evidence.append(
            {
                "rank": rank,
                "document": passage["path"],
                "page": passage["page"],
                "section": " › ".join(passage["heading_path"]),
                "passage": hit.passage_id,
                "owner": passage["owner"],
                "score": round(float(hit.score), 4),
                "support": scored.support,
                "signals": {k: round(v, 4) for k, v in scored.signals.items()},
                "answer_type": scored.answer_type,
                "answer_type_found": scored.answer_type_found,
                "supporting": False,
                "as_of": _iso(fresh.as_of),
                "as_of_source": fresh.as_of_source,
                "expires": _iso(fresh.expires),
                "fresh": fresh.fresh,
                "reasons": list(fresh.reasons),
                "terms": {t: round(float(s), 4) for t, s in sorted(hit.term_scores.items()) if s},
                "statements": [_statement_json(s) for s in statements.get(hit.passage_id, [])],
                "text": passage["text"],
            }
        )
    verdict = judge(judged, threshold=thresholds["support"], weak_margin=thresholds["weak_margin"])
    for item, supporting in zip(evidence, verdict.supporting):
        item["supporting"] = supporting
    horizon = freshness_rules.horizon_for(fresh_config, topic=question.topic, override=question.horizon_days)
    return {
        "id": question.id,
        "question": question.question,
        "owner": question.owner or _nearest_owner(evidence),
        "topic": question.topic,
        "weight": float(question.weight),
        "verdict": verdict.verdict,
        "reasons": verdict.reasons,
        "flags": verdict.flags,
        "action": verdict.action,
        "support": round(verdict.support, 4),
        "horizon_days": horizon,
        "missing_terms": list(result.missing_terms),
        "terms": list(result.terms),
        "evidence": evidence,
    }


def question_support(
    store: Store, index, texts: list[str], k: int, *, hidden: list[set[str]] | None = None
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


def _nearest_owner(evidence: list[dict]) -> str:
    """Owner of the best-supported evidence document: who should write or fix the answer."""
    if not evidence:
        return "unassigned"
    return max(evidence, key=lambda e: (e["support"], -e["rank"]))["owner"] or "unassigned"


def _freshness(passage: dict, statements: list[TemporalExpression], as_of: date, horizon: int) -> Freshness:
    return freshness_rules.passage_freshness(
        statements,
        audit_date=as_of,
        horizon_days=horizon,
        doc_date=_date(passage["doc_date"]) or _date(passage["mtime"]),
        doc_date_source=passage["doc_date_source"] or ("file:mtime" if passage["mtime"] else None),
        doc_expires=_date(passage["expires"]),
    )


def _statement_json(s: TemporalExpression) -> dict:
    return {
        "expression": s.expression,
        "start": s.start.isoformat(),
        "end": s.end.isoformat(),
        "granularity": s.granularity,
        "role": s.role,
        "text": s.text,
    }


# --- store reads ----------------------------------------------------------------------------------

_PASSAGE_SQL = """
SELECT p.id, p.text, p.heading_path, p.page, d.path, d.owner, d.doc_date, d.doc_date_source,
       d.expires, d.mtime
FROM passages p JOIN documents d ON d.id = p.document_id
"""


def _load_passages(store: Store, ids: list[int]) -> dict[int, dict]:
    out = {}
    for chunk in _chunks(ids):
        marks = ",".join("?" * len(chunk))
        for row in store.query(_PASSAGE_SQL + f" WHERE p.id IN ({marks})", chunk):
            row["heading_path"] = json.loads(row["heading_path"] or "[]")
            out[row["id"]] = row
    return out


def _load_statements(store: Store, ids: list[int] | None) -> dict[int, list[TemporalExpression]]:
    """Dated statements per passage, in text order; every statement when `ids` is None."""
    out: dict[int, list[TemporalExpression]] = defaultdict(list)
    sql = "SELECT * FROM statements"
    batches = [None] if ids is None else list(_chunks(ids))
    for chunk in batches:
        where = "" if chunk is None else f" WHERE passage_id IN ({','.join('?' * len(chunk))})"
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
                )
            )
    return out


def _chunks(ids: list[int], size: int = 500):
    for i in range(0, len(ids), size):
        yield ids[i : i + size]


# --- corpus figures and the document inventory ----------------------------------------------------


def _corpus_and_documents(store: Store, config, fresh_config, as_of: date) -> tuple[dict, list[dict]]:
    """run.corpus (counts, F and A over active passages) and the per-document inventory."""
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
        entry = {
            "path": doc["path"],
            "title": doc["title"],
            "kind": doc["kind"],
            "owner": doc["owner"],
            "status": doc["status"],
            "doc_date": doc["doc_date"],
            "doc_date_source": doc["doc_date_source"],
            "expires": doc["expires"],
            "passages": 0,
            "as_of": None,
            "fresh": None,
            "reasons": [],
        }
        if doc["status"] in ("active", "failed"):  # store.SEARCHED_STATUSES
            horizon = freshness_rules.horizon_for(fresh_config, path=doc["path"])
            states = [_freshness(doc, statements.get(pid, []), as_of, horizon) for pid in by_doc[doc["id"]]]
            items.extend(states)
            entry["passages"] = len(states)
            if states:
                # A document is as fresh as its stalest passage.
                dated = [s.as_of for s in states if s.as_of]
                entry["as_of"] = _iso(min(dated)) if dated else None
                entry["fresh"] = all(s.fresh for s in states)
                entry["reasons"] = sorted({r for s in states for r in s.reasons})
        inventory.append(entry)
    known = {d["path"] for d in docs}
    failed = store.query("SELECT path, kind, error FROM ingest_errors ORDER BY path")
    for row in failed:
        if row["path"] in known:
            for entry in inventory:
                if entry["path"] == row["path"] and entry["status"] != "active":
                    entry["status"] = "failed"
                    entry["reasons"] = [row["kind"]]
            continue
        # Never ingested: the owner map still says whose file it is, so its owner sees the failure.
        owner = owner_from_config(config, row["path"]) or "unassigned"
        inventory.append(
            {
                "path": row["path"],
                "title": None,
                "kind": None,
                "owner": owner,
                "status": "failed",
                "doc_date": None,
                "doc_date_source": None,
                "expires": None,
                "passages": 0,
                "as_of": None,
                "fresh": None,
                "reasons": [row["kind"]],
            }
        )
    inventory.sort(key=lambda e: e["path"])
    f_value, mean_age = freshness_rules.corpus_freshness(items) if items else (1.0, 0.0)
    corpus = {
        "documents": sum(1 for d in docs if d["status"] == "active"),
        "passages": len(rows),
        "failed": len(failed),
        "freshness": round(float(f_value), 4),
        "mean_age_days": round(float(mean_age), 1),
    }
    return corpus, inventory


def _summary(results: list[dict]) -> dict:
    counts = {v: sum(1 for r in results if r["verdict"] == v) for v in ("covered", "stale", "gap")}
    weight = sum(r["weight"] for r in results)
    share = lambda v: sum(r["weight"] for r in results if r["verdict"] == v) / weight if weight > 0 else 0.0
    return {
        "questions": len(results),
        **counts,
        "weight": weight,
        "fallback_exposure": share("gap"),
        "stale_exposure": share("stale"),
    }


def _briefs(results: list[dict]) -> list[dict]:
    try:
        from auditor.judgement.briefs import content_briefs
    except ImportError:
        return []
    return content_briefs(results)


def _history(store: Store) -> list[dict]:
    rows = store.query("SELECT id, as_of, summary FROM runs WHERE status = 'done' ORDER BY id")
    return [{"id": r["id"], "as_of": r["as_of"], "summary": json.loads(r["summary"])} for r in rows]


# --- fingerprints and storing ---------------------------------------------------------------------


def _config_fingerprint(config: Config, fresh_config) -> str:
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


def _store_run(store: Store, run: dict) -> None:
    """One transaction: the run row ('running'), its results, then 'done' with the summary."""
    head = run["run"]
    with store.transaction():
        cursor = store.db.execute(
            "INSERT INTO runs (started, status, as_of, horizon_days, config_fingerprint, corpus_fingerprint, "
            "thresholds) VALUES (?, 'running', ?, ?, ?, ?, ?)",
            [
                head["started"],
                head["as_of"],
                head["horizon_days"],
                head["config_fingerprint"],
                head["corpus_fingerprint"],
                dumps(head["thresholds"]),
            ],
        )
        head["id"] = cursor.lastrowid
        store.db.conn.executemany(
            "INSERT INTO results (run_id, position, qid, verdict, weight, result) VALUES (?, ?, ?, ?, ?, ?)",
            [(head["id"], i, q["id"], q["verdict"], q["weight"], dumps(q)) for i, q in enumerate(run["questions"])],
        )
        head["finished"] = _now()
        store.db.execute(
            "UPDATE runs SET status = 'done', finished = ?, corpus = ?, summary = ?, ingest_errors = ?, "
            "extras = ? WHERE id = ?",
            [
                head["finished"],
                dumps(head["corpus"]),
                dumps(run["summary"]),
                dumps(run["ingest_errors"]),
                dumps(
                    {
                        "documents": run["documents"],
                        "briefs": run["briefs"],
                        "title": head.get("title"),
                        "tokenizer": head.get("tokenizer"),
                    }
                ),
                head["id"],
            ],
        )


def _now() -> str:
    return datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ")


def _iso(value: date | None) -> str | None:
    return value.isoformat() if value else None


def _date(value: str | None) -> date | None:
    if not value:
        return None
    try:
        return date.fromisoformat(value[:10])
    except ValueError:
        return None
