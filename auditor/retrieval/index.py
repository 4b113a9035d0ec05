"""Passage retrieval over the store: the BM25 index of active passages, kept beside the database.

The index folder `<database>.bm25/` holds the arrays of `bm25.SparseIndex` and `index.json` with the
scoring parameters, the tokenizer fingerprint and a fingerprint of the corpus. `load_or_build`
memory-maps it when all three still match and rebuilds it (from the stored token ids, without
re-tokenizing) when any changed.

Headings as a field: a passage is indexed with the terms of its heading path and its document's
title added HEADING_WEIGHT times to its own (docs/judgement.md). This is BM25F (Robertson, Zaragoza &
Taylor, "Simple BM25 extension to multiple weighted fields", CIKM 2004) with one length
normalisation shared by the fields: the field-weighted term frequency Σ_f w_f·tf_f is saturated
once, so a passage deep in the "git-stash" page still matches "stash" as strongly as its title does,
while a passage that merely mentions the word once stays behind. Heading terms already are terms of
the store (headings are blocks of the document), so no term is added to the vocabulary.
"""

from __future__ import annotations

import hashlib
import json
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from auditor.config import RetrievalConfig
from auditor.errors import StoreError
from auditor.retrieval.bm25 import CorpusStats, Params, SparseIndex, count_terms
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import SEARCHED_STATUSES, Store, chunked, marks

_ACTIVE = f"FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.status IN {SEARCHED_STATUSES}"

# Weight of the heading-path-and-title field against the passage body (body weight 1). Chosen on
# the FAQ and git reference corpora of bench/transfer.py (answering page among the evidence); the
# Debian Reference guide was kept out of that choice (figures in bench/README.md).
HEADING_WEIGHT = 2

NO_TERMS = "the question has no searchable words (it is empty or only stopwords)"
NO_PASSAGES = "the knowledge base has no active passages; ingest documents first"
ALL_MISSING = "none of the question's terms occurs in the knowledge base"


@dataclass(frozen=True)
class Hit:
    """A retrieved passage: its score and each question term's contribution to it."""

    passage_id: int
    score: float
    term_scores: dict[str, float]


@dataclass
class SearchResult:
    """What a question retrieves, with what the judge needs to normalise support."""

    terms: list[str]  # the question's distinct terms, in question order (a repeat adds nothing)
    idf: dict[str, float]  # every term; one the corpus never uses gets the highest IDF
    missing_terms: list[str]  # terms the corpus never uses
    max_score: float  # Σ idf_t · (k1 + 1) (+ δ for BM25+): the most any passage could score
    hits: list[Hit] = field(default_factory=list)  # best first
    message: str | None = None  # why there are no hits, when there is a plain reason


def index_folder(store: Store) -> Path:
    """Where the index of `store` lives: beside the database file."""
    return Path(str(store.path) + ".bm25")


def corpus_fingerprint(store: Store) -> str:
    """Changes whenever the searchable corpus may have changed: the active documents with their
    content hashes (a changed file gets new passages), the ids of their passages and the
    tokenizer. Cheap: aggregates over p.id and p.document_id only, which SQLite reads from the
    covering index passages_document instead of scanning the passage texts."""
    digest = hashlib.sha256()
    row = store.db.execute(
        "SELECT count(*), coalesce(sum(p.id), 0), coalesce(min(p.id), 0), coalesce(max(p.id), 0), "
        f"coalesce(sum(p.id % 7919 * p.document_id), 0) {_ACTIVE}"
    ).fetchone()
    digest.update(repr(tuple(row)).encode())
    for doc_id, sha in store.db.execute(
        f"SELECT id, sha256 FROM documents WHERE status IN {SEARCHED_STATUSES} ORDER BY id"
    ):
        digest.update(f"{doc_id}:{sha};".encode())
    digest.update((store.get_meta("tokenizer") or "").encode())
    return digest.hexdigest()[:24]


def _params(retrieval: RetrievalConfig) -> Params:
    return Params(variant=retrieval.variant, k1=float(retrieval.k1), b=float(retrieval.b), delta=float(retrieval.delta))


class PassageIndex:
    """BM25 search over the active passages of a store."""

    def __init__(
        self, store: Store, retrieval: RetrievalConfig, index: SparseIndex, tokenizer: Tokenizer | None = None
    ):
        self.store = store
        self.retrieval = retrieval
        self.index = index
        self.tokenizer = tokenizer or Tokenizer(retrieval.language, retrieval.stopwords, retrieval.detect)
        self.vocabulary = Vocabulary(store)
        self.fingerprint = index.meta.get("corpus", "")
        self.rebuilt = False  # set by load_or_build when the saved index could not be used

    @property
    def passage_count(self) -> int:
        return self.index.n_docs

    # -- building ----------------------------------------------------------------------------------
    @classmethod
    def load_or_build(cls, store: Store, retrieval: RetrievalConfig, *, save: bool = True) -> PassageIndex:
        """The saved index when its parameters and corpus still match, else a fresh build (saved
        beside the database when `save`; a folder that cannot be written is not an error)."""
        params = _params(retrieval)
        tokenizer = Tokenizer(retrieval.language, retrieval.stopwords, retrieval.detect)
        stored = store.get_meta("tokenizer")
        if stored and stored != tokenizer.fingerprint():
            raise StoreError(
                f"{str(store.path)!r}: passages were tokenized as {stored!r} but retrieval settings "
                f"give {tokenizer.fingerprint()!r}; run ingest again or restore retrieval.language/stopwords"
            )
        fingerprint = corpus_fingerprint(store)
        folder = index_folder(store)
        info = SparseIndex.read_info(folder)
        if (
            info
            and info.get("params") == params.__dict__
            and info.get("meta", {}).get("corpus") == fingerprint
            and info["meta"].get("tokenizer") == tokenizer.fingerprint()
            and info["meta"].get("heading_weight") == HEADING_WEIGHT
        ):
            try:
                return cls(store, retrieval, SparseIndex.load(folder), tokenizer)
            except (OSError, ValueError, KeyError):
                pass  # a damaged index is rebuilt below
        meta = {"corpus": fingerprint, "tokenizer": tokenizer.fingerprint(), "heading_weight": HEADING_WEIGHT}
        index = build_index(store, params, meta=meta, tokenizer=tokenizer, heading_weight=HEADING_WEIGHT)
        if save:
            try:
                index.save(folder)
            except OSError:
                pass  # read-only location: search still works from memory
        built = cls(store, retrieval, index, tokenizer)
        built.rebuilt = True
        return built

    # -- searching ---------------------------------------------------------------------------------
    def search(self, text: str, k: int | None = None) -> SearchResult:
        """Top-k active passages for one question."""
        return self.search_many([text], k)[0]

    def search_many(self, texts: list[str], k: int | None = None) -> list[SearchResult]:
        """Top-k active passages for each question, in order."""
        k = self.retrieval.top_k if k is None else k
        saturation = self.index.params.scorer.saturation(self.index.params.k1, self.index.params.delta)
        term_lists = [list(dict.fromkeys(self.tokenizer.tokenize(text or ""))) for text in texts]
        self.vocabulary.lookup(sorted({t for terms in term_lists for t in terms}))  # one batch of lookups
        results = []
        for terms in term_lists:
            ids = self.vocabulary.lookup(terms)
            idf_values = self.index.term_idf(ids)
            present = [
                t for t, i in zip(terms, ids) if i is not None and i < self.index.n_terms and self.index.df[i] > 0
            ]
            missing = [t for t in terms if t not in present]
            result = SearchResult(
                terms=terms,
                idf=dict(zip(terms, idf_values)),
                missing_terms=missing,
                max_score=float(sum(idf_values) * saturation),
            )
            if not terms:
                result.message = NO_TERMS
            elif self.passage_count == 0:
                result.message = NO_PASSAGES
            elif not present:
                result.message = ALL_MISSING
            else:
                present_ids = [i for t, i in zip(terms, ids) if t in present]
                ordinals, scores, parts = self.index.top_k(present_ids, k)
                keys = self.index.keys
                for column, (ordinal, score) in enumerate(zip(ordinals, scores)):
                    breakdown = {
                        t: float(parts[row, column]) for row, t in enumerate(present) if parts[row, column] != 0
                    }
                    result.hits.append(Hit(int(keys[ordinal]), float(score), breakdown))
            results.append(result)
        return results


def build_index(
    store: Store,
    params: Params,
    meta: dict | None = None,
    *,
    tokenizer: Tokenizer | None = None,
    heading_weight: int = HEADING_WEIGHT,
) -> SparseIndex:
    """Index the active passages of `store` from their stored token ids (passage id order), each with
    its heading path and document title as a field of weight `heading_weight` (0: body only)."""
    passage_ids: list[int] = []

    def token_arrays():
        for passage_id, tokens in indexed_tokens(store, tokenizer=tokenizer, heading_weight=heading_weight):
            passage_ids.append(passage_id)
            yield tokens

    counts = count_terms(token_arrays())
    return SparseIndex.build(
        counts, params, CorpusStats.of(counts), meta=meta, keys=np.array(passage_ids, dtype=np.int64), consume=True
    )


def indexed_tokens(
    store: Store, *, tokenizer: Tokenizer | None, heading_weight: int = HEADING_WEIGHT
) -> Iterator[tuple[int, np.ndarray]]:
    """(passage id, the term ids it is indexed with) for every active passage, in passage id order:
    its stored token ids plus its heading path and title field (the sharded index reads these too,
    auditor/cluster/retrieve.py)."""
    vocabulary = Vocabulary(store)
    fields: dict[str, np.ndarray] = {}  # heading path + title -> its term ids, repeated by the weight

    def field_ids(heading_path: str | None, title: str | None) -> np.ndarray:
        key = f"{heading_path or ''}\0{title or ''}"
        if key not in fields:
            if tokenizer is None or heading_weight <= 0:
                fields[key] = np.zeros(0, dtype="<i4")
            else:
                try:
                    heading = " ".join(str(h) for h in json.loads(heading_path or "[]"))
                except ValueError:
                    heading = ""
                terms = tokenizer.tokenize(f"{title or ''}\n{heading}")
                ids = [i for i in vocabulary.lookup(terms) if i is not None]
                fields[key] = np.array(ids * heading_weight, dtype="<i4")
        return fields[key]

    for passage_id, blob, heading_path, title in store.db.execute(
        f"SELECT p.id, p.token_ids, p.heading_path, d.title {_ACTIVE} ORDER BY p.id"
    ):
        if len(blob) % 4:
            raise StoreError(
                f"{str(store.path)!r}: passage {passage_id} has a damaged token_ids "
                "array (length not a multiple of 4); run ingest again"
            )
        body = np.frombuffer(blob, dtype="<i4")
        extra = field_ids(heading_path, title)
        yield passage_id, (np.concatenate([body, extra]) if len(extra) else body)


def describe_hits(store: Store, result: SearchResult) -> list[dict]:
    """The hits of `result` with where they stand, for `auditor search` (text or JSON)."""
    ids = [hit.passage_id for hit in result.hits]
    rows: dict[int, dict] = {}
    for chunk in chunked(ids):
        for stored in store.query(
            "SELECT p.id, p.text, p.heading_path, p.page, d.path FROM passages p "
            f"JOIN documents d ON d.id = p.document_id WHERE p.id IN ({marks(chunk)})",
            chunk,
        ):
            rows[stored["id"]] = stored
    out = []
    for hit in result.hits:
        row = rows.get(hit.passage_id)
        if row is None:
            continue  # removed since the index was loaded
        try:
            heading = json.loads(row["heading_path"] or "[]")
        except ValueError:
            heading = []
        out.append(
            {
                "passage_id": hit.passage_id,
                "document": row["path"],
                "section": " › ".join(str(h) for h in heading),
                "page": row["page"],
                "score": hit.score,
                "term_scores": dict(hit.term_scores),
                "text": row["text"],
            }
        )
    return out
