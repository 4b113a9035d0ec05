"""Question-level support over retrieved passages (docs/judgement.md): what `calibrate`, the corpus
probe and the benches measure, with the same functions the audit judges with.

`assess_questions` retrieves the top k passages of each question (optionally with some documents
hidden, for the hold-out protocols), scores each with `support.passage_support`, and returns one
`Assessment` per question: its best support, the documents of its evidence, and the judged passages.

`fact_check` is what the audit adds to a judged question beyond its verdict: the missing constraint
of its best passage, whether a supported question needs a look, and a conflict between the values its
fresh supporting passages give (docs/judgement.md).
"""

from __future__ import annotations

import json
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field

from auditor.judgement.answer_types import without_cue
from auditor.judgement.conflicts import Conflict, find_conflict
from auditor.judgement.constraints import MissingConstraint, WeakBand, constraint_terms, missing_constraint, weak_band
from auditor.judgement.support import PassageSupport, passage_support
from auditor.retrieval.index import PassageIndex, SearchResult
from auditor.store import Store

# Extra hits fetched when documents are hidden, so that k remain after the hidden ones are dropped.
HIDDEN_ROOM = 20
# Evidence passages one document may hold: a long page (a user manual, a configuration reference)
# otherwise fills the evidence with itself and hides the page that answers (bench/transfer.py).
PER_DOCUMENT = 1  # 0 = no cap


@dataclass(frozen=True)
class Assessment:
    """The judged evidence of one question."""

    support: float  # best passage support
    documents: tuple[str, ...]  # document path of each evidence passage, best-ranked first
    passages: tuple[PassageSupport, ...] = field(default=())
    texts: tuple[str, ...] = field(default=())  # text of each evidence passage
    missing: MissingConstraint = MissingConstraint()  # what the best passage lacks of the constraint

    def is_gap(self, threshold: float) -> bool:
        return self.support < threshold


def load_passages(store: Store, ids: list[int]) -> dict[int, dict]:
    """id -> {text, path, heading_path, title} of the given passages."""
    out: dict[int, dict] = {}
    for i in range(0, len(ids), 500):
        chunk = ids[i : i + 500]
        for row in store.query(
            "SELECT p.id, p.text, p.heading_path, d.path, d.title FROM passages p JOIN documents d ON "
            f"d.id = p.document_id WHERE p.id IN ({','.join('?' * len(chunk))})",
            chunk,
        ):
            row["heading_path"] = json.loads(row["heading_path"] or "[]")
            out[row["id"]] = row
    return out


def constraint_terms_of(text: str, idf, index: PassageIndex) -> list[str]:
    """The constraint terms of a question with no evidence at all: every one is missing."""
    return constraint_terms(index.tokenizer.tokenize(without_cue(text)), idf)


def diversified(hits: list, documents: list[str], k: int, per_document: int) -> list:
    """The first k hits, at most `per_document` from one document (0: no cap)."""
    if not per_document:
        return hits[:k]
    taken: dict[str, int] = {}
    out = []
    for hit, document in zip(hits, documents):
        if taken.get(document, 0) < per_document:
            taken[document] = taken.get(document, 0) + 1
            out.append(hit)
            if len(out) == k:
                break
    return out


def diversify(results: list[SearchResult], path_of: Mapping[int, str], k: int, per_document: int = -1) -> None:
    """Cut each result's hits to k, at most `per_document` (default PER_DOCUMENT) from one document;
    the audit searches 4k so that k remain (hits whose passage is unknown are dropped)."""
    cap = PER_DOCUMENT if per_document < 0 else per_document
    for result in results:
        hits = [h for h in result.hits if h.passage_id in path_of]
        result.hits = diversified(hits, [path_of[h.passage_id] for h in hits], k, cap)


def assess_questions(
    store: Store, index: PassageIndex, texts: list[str], k: int, *, hidden: list[set[str]] | None = None
) -> list[Assessment]:
    """One Assessment per question text.

    `hidden` gives, per question, document paths whose passages are left out (the top k of the
    rest are judged; IDF stays that of the whole corpus).
    """
    room = (0 if hidden is None else HIDDEN_ROOM) + (3 * k if PER_DOCUMENT else 0)
    found = index.search_many(texts, k + room)
    passages = load_passages(store, sorted({h.passage_id for r in found for h in r.hits}))
    out = []
    for i, (text, result) in enumerate(zip(texts, found)):
        drop = hidden[i] if hidden is not None else set()
        hits = [h for h in result.hits if h.passage_id in passages and passages[h.passage_id]["path"] not in drop]
        hits = diversified(hits, [passages[h.passage_id]["path"] for h in hits], k, PER_DOCUMENT)
        judged = tuple(
            passage_support(
                text,
                passages[h.passage_id]["text"],
                score=h.score,
                max_score=result.max_score,
                idf=result.idf,
                tokenize=index.tokenizer.tokenize,
            )
            for h in hits
        )
        texts_ = tuple(passages[h.passage_id]["text"] for h in hits)
        missing = MissingConstraint(tuple(constraint_terms_of(text, result.idf, index)))
        if judged:
            top = max(range(len(judged)), key=lambda j: judged[j].support)
            missing = missing_constraint(text, texts_[top], idf=result.idf, tokenize=index.tokenizer.tokenize)
        out.append(
            Assessment(
                max((p.support for p in judged), default=0.0),
                tuple(passages[h.passage_id]["path"] for h in hits),
                judged,
                texts_,
                missing,
            )
        )
    return out


@dataclass(frozen=True)
class EvidencePassage:
    """One judged evidence passage, as `fact_check` needs it."""

    passage_id: int
    document: str
    text: str
    window: tuple[int, int]  # character span of its best sentence window
    support: float
    fresh: bool


@dataclass(frozen=True)
class FactCheck:
    missing: MissingConstraint
    look: WeakBand
    conflict: Conflict | None

    def as_json(self) -> dict:
        """The keys a question gains in results.json (added keys; format 1 consumers ignore them)."""
        return {
            "missing_constraint": self.missing.as_json(),
            "needs_look": self.look.needs_look,
            "look_reasons": list(self.look.reasons),
            "conflict": self.conflict.as_json() if self.conflict else None,
        }


CONFLICT_FLAG = "conflicting_values"


def fact_check(
    question: str,
    evidence: Sequence[EvidencePassage],
    *,
    verdict: str,
    support: float,
    threshold: float,
    weak_margin: float,
    idf: Mapping[str, float],
    tokenize: Callable[[str], list[str]],
) -> FactCheck:
    """Missing constraint (best passage), weak band (supported questions only) and conflict (fresh
    supporting passages, best first) of one judged question."""
    if evidence:
        best = max(evidence, key=lambda e: e.support)
        missing = missing_constraint(question, best.text, idf=idf, tokenize=tokenize)
    else:
        missing = MissingConstraint(tuple(constraint_terms(tokenize(without_cue(question)), idf)))
    look = weak_band(support, threshold, missing, weak_margin) if verdict == "supported" else WeakBand(False)
    fresh = sorted((e for e in evidence if e.fresh and e.support >= threshold), key=lambda e: -e.support)
    conflict = find_conflict(question, [(e.passage_id, e.document, e.text[e.window[0] : e.window[1]]) for e in fresh])
    return FactCheck(missing, look, conflict)
