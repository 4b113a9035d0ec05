"""PassageIndex over a real SQLite store: build, save beside the database, reuse, rebuild, search.

Stores are filled the way ingest fills them (documents, passages with little-endian int32 token_ids
of terms.id, terms) using the project's Tokenizer and Vocabulary. The passage texts are invented
(Fernhollow Water Cooperative, fixtures/demo/README.md); expected scores come from rank-bm25 (the BM25 oracle)
run on the same tokens.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
import rank_bm25

from auditor.config import RetrievalConfig
from auditor.errors import ConfigError, StoreError
from auditor.retrieval.bm25 import Params
from auditor.retrieval.index import (
    ALL_MISSING,
    HEADING_WEIGHT,
    NO_PASSAGES,
    NO_TERMS,
    PassageIndex,
    build_index,
    corpus_fingerprint,
    describe_hits,
    index_folder,
)
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import Store

DOCS = {
    "billing/payment-options.md": [
        (["Paying", "By phone"], "You can pay your water bill by phone, any day, with a debit card."),
        (["Paying", "By mail"], "Mail a cheque with the payment stub to the cooperative office."),
    ],
    "billing/late-fees.md": [
        (["Billing", "Late fees"], "A late fee applies when a bill is unpaid 21 days after the due date."),
    ],
    "field/leaks.md": [
        (["Field Operations", "Leaks"], "Report a leak in the street or a water main break by phone at once."),
        (["Field Operations", "Meters"], "Meter readers visit every second month; leave the meter lid clear."),
    ],
    "quality/report-2019.md": [
        (["Water Quality"], "The 2019 water quality report lists lead and copper sampling results."),
    ],
}


def add_document(
    store: Store, path: str, passages, tokenizer: Tokenizer, status: str = "active", sha: str | None = None
) -> int:
    """Insert one document and its passages per the schema in auditor/store.py."""
    vocabulary = Vocabulary(store)
    with store.transaction():
        doc_id = store.db.execute(
            "INSERT INTO documents(path, source_root, kind, sha256, size, mtime, status, first_seen, "
            "last_seen, ingested_at) VALUES (?, '/kb', 'markdown', ?, 1, '2026-01-01T00:00:00', ?, "
            "'2026-01-01', '2026-01-01', '2026-01-01')",
            [path, sha or f"sha-{path}", status],
        ).lastrowid
        for ordinal, (heading, text) in enumerate(passages):
            ids = vocabulary.ids(tokenizer.tokenize(text))
            store.db.execute(
                "INSERT INTO passages(document_id, ordinal, text, heading_path, page, char_start, char_end, "
                "token_ids, token_count) VALUES (?, ?, ?, ?, NULL, 0, ?, ?, ?)",
                [doc_id, ordinal, text, json.dumps(heading), len(text), ids.astype("<i4").tobytes(), len(ids)],
            )
    return doc_id


def make_store(tmp_path, docs=DOCS, name="kb.db") -> Store:
    store = Store(tmp_path / name)
    tokenizer = Tokenizer()
    for path, passages in docs.items():
        add_document(store, path, passages, tokenizer)
    return store


def all_passages(store):
    return store.query(
        "SELECT p.id, p.text FROM passages p JOIN documents d ON d.id = p.document_id "
        "WHERE d.status = 'active' ORDER BY p.id"
    )


def indexed_tokens(store, tokenizer, heading_weight=HEADING_WEIGHT):
    """Each active passage's tokens as the index counts them: the body, then the heading path and
    the document title repeated `heading_weight` times (the BM25F field, auditor/retrieval/index.py).
    Heading words that no passage of the store contains are left out, as the index documents."""
    rows = store.query(
        "SELECT p.id, p.text, p.heading_path, d.title FROM passages p JOIN documents d ON d.id = p.document_id "
        "ORDER BY p.id"
    )
    known = {t for r in rows for t in tokenizer.tokenize(r["text"])}
    rows = [r for r in rows if r["id"] in {a["id"] for a in all_passages(store)}]
    out = []
    for r in rows:
        field = tokenizer.tokenize(f"{r['title'] or ''}\n{' '.join(json.loads(r['heading_path']))}")
        out.append(tokenizer.tokenize(r["text"]) + [t for t in field if t in known] * heading_weight)
    return rows, out


def test_scores_equal_rank_bm25_on_a_store(tmp_path):
    # Oracle: rank-bm25 0.2.2 BM25Okapi over the same tokens, k1/b as configured here. BM25F with one
    # shared length normalisation (Robertson, Zaragoza & Taylor, CIKM 2004) is BM25 over the body
    # tokens plus each heading token counted w times, so the oracle gets exactly those tokens.
    store = make_store(tmp_path)
    config = RetrievalConfig(variant="okapi", k1=1.5, b=0.75)
    index = PassageIndex.load_or_build(store, config)
    tokenizer = Tokenizer()
    rows, tokens = indexed_tokens(store, tokenizer)
    oracle = rank_bm25.BM25Okapi(tokens, k1=1.5, b=0.75)
    result = index.search("How do I pay my water bill by phone?", k=3)
    expected = oracle.get_scores(result.terms)
    by_id = {r["id"]: expected[i] for i, r in enumerate(rows)}
    assert result.terms == ["pay", "water", "bill", "phone"]
    assert len(result.hits) == 3
    assert result.hits[0].passage_id == rows[0]["id"]  # the payment-by-phone passage
    for hit in result.hits:
        assert hit.score == pytest.approx(by_id[hit.passage_id], rel=1e-9)
        assert sum(hit.term_scores.values()) == pytest.approx(hit.score, rel=1e-12)
    ranked = sorted(by_id, key=lambda pid: (-by_id[pid], pid))[:3]
    assert [h.passage_id for h in result.hits] == ranked


def test_heading_field_lifts_the_passage_under_its_heading(tmp_path):
    # A passage deep in a section that never repeats the section's word: "reconnection" is only in
    # the heading. Body-only BM25 cannot find it; the heading field can (and it outranks a passage
    # that mentions the word once in passing, whose heading is about something else).
    docs = {
        "billing/reconnection.md": [(["Billing", "Reconnection"], "Pay the overdue balance and a fee of $45.")],
        "field/visits.md": [(["Field visits"], "A crew visit for reconnection or a meter check takes a day.")],
        "billing/payments.md": [(["Billing", "Payments"], "Pay online, by phone or at the cooperative office.")],
        "quality/report.md": [(["Water quality"], "The yearly report lists the sampling results.")],
        "quality/lead.md": [(["Water quality", "Lead"], "Lead pipes are replaced free of charge.")],
        "care/contact.md": [(["Customer care"], "Write to the office or call during opening hours.")],
    }
    store = make_store(tmp_path, docs)
    body_only = build_index(store, Params(variant="okapi", k1=1.5, b=0.75), heading_weight=0)
    fielded = build_index(store, Params(variant="okapi", k1=1.5, b=0.75), tokenizer=Tokenizer())
    vocabulary = Vocabulary(store)
    term = vocabulary.lookup(["reconnect"])
    assert term[0] is not None
    plain = body_only.scores(term)
    weighted = fielded.scores(term)
    assert plain[0] == 0.0 and plain[1] > 0.0  # body only: the answering passage is not found
    assert weighted[0] > weighted[1] > 0.0
    # Against the oracle on the same field-weighted tokens.
    rows, tokens = indexed_tokens(store, Tokenizer())
    oracle = rank_bm25.BM25Okapi(tokens, k1=1.5, b=0.75).get_scores(["reconnect"])
    assert list(weighted) == pytest.approx(list(oracle), rel=1e-9)


def test_missing_terms_get_highest_idf_and_count_in_max_score(tmp_path):
    store = make_store(tmp_path)
    index = PassageIndex.load_or_build(store, RetrievalConfig())
    result = index.search("Can I set up autopay for my water bill?")
    assert result.missing_terms == ["set", "up", "autopay"]
    assert result.idf["autopay"] > max(result.idf["water"], result.idf["bill"])
    assert result.idf["autopay"] == result.idf["set"]
    # Lucene IDF of a term in one passage of a corpus with one more passage (N = 6 + 1).
    assert result.idf["autopay"] == pytest.approx(math.log(1 + (7 - 1 + 0.5) / 1.5))
    assert result.max_score == pytest.approx(sum(result.idf.values()) * (1.2 + 1))
    assert all(set(h.term_scores) <= {"water", "bill"} for h in result.hits)
    assert 0 < result.hits[0].score < result.max_score
    nothing = index.search("autopay paperless")
    assert nothing.hits == [] and nothing.message == ALL_MISSING
    assert nothing.missing_terms == ["autopay", "paperless"] and nothing.max_score > 0


def test_index_saved_beside_database_reused_and_rebuilt_on_change(tmp_path):
    store = make_store(tmp_path)
    first = PassageIndex.load_or_build(store, RetrievalConfig())
    folder = index_folder(store)
    assert first.rebuilt and folder == tmp_path / "kb.db.bm25"
    info = json.loads((folder / "index.json").read_text())
    assert info["params"] == {"variant": "lucene", "k1": 1.2, "b": 0.75, "delta": 0.5}
    assert info["meta"]["corpus"] == corpus_fingerprint(store)

    again = PassageIndex.load_or_build(store, RetrievalConfig())
    assert not again.rebuilt
    assert type(again.index.weights).__name__ == "memmap"  # memory-mapped, not read
    question = "late fee on an unpaid bill"
    assert [(h.passage_id, h.score) for h in again.search(question).hits] == [
        (h.passage_id, h.score) for h in first.search(question).hits
    ]

    # Parameters changed: rebuilt, and the saved parameters follow.
    other = PassageIndex.load_or_build(store, RetrievalConfig(k1=0.9))
    assert other.rebuilt
    assert json.loads((folder / "index.json").read_text())["params"]["k1"] == 0.9

    # Corpus changed: a new document is found after the rebuild.
    add_document(store, "care/autopay.md", [(["Customer Care"], "Autopay takes the bill from your bank.")], Tokenizer())
    later = PassageIndex.load_or_build(store, RetrievalConfig(k1=0.9))
    assert later.rebuilt and later.passage_count == 7
    assert later.search("autopay").hits


def test_removed_documents_are_not_searched(tmp_path):
    store = make_store(tmp_path)
    before = PassageIndex.load_or_build(store, RetrievalConfig())
    assert before.search("lead copper sampling").hits
    store.db.execute("UPDATE documents SET status = 'removed' WHERE path = 'quality/report-2019.md'")
    after = PassageIndex.load_or_build(store, RetrievalConfig())
    assert after.rebuilt and after.passage_count == 5
    result = after.search("lead copper sampling")
    assert result.hits == [] and result.missing_terms == ["lead", "copper", "sampl"]


def test_describe_hits_gives_document_section_and_breakdown(tmp_path):
    store = make_store(tmp_path)
    result = PassageIndex.load_or_build(store, RetrievalConfig()).search("report a water main leak", k=2)
    described = describe_hits(store, result)
    assert described[0]["document"] == "field/leaks.md"
    assert described[0]["section"] == "Field Operations › Leaks"
    assert described[0]["page"] is None
    assert described[0]["text"].startswith("Report a leak")
    assert set(described[0]["term_scores"]) == {"report", "water", "main", "leak"}
    assert described[0]["score"] == result.hits[0].score
    json.dumps(described)  # JSON-ready for `auditor search --json`


def test_empty_corpus_empty_and_stopword_questions(tmp_path):
    store = Store(tmp_path / "empty.db")
    index = PassageIndex.load_or_build(store, RetrievalConfig())
    assert index.passage_count == 0
    result = index.search("water bill")
    assert result.hits == [] and result.message == NO_PASSAGES
    assert result.missing_terms == ["water", "bill"]

    index = PassageIndex.load_or_build(make_store(tmp_path), RetrievalConfig())
    for question in ("", "   ", "?!", "How do I do what you did?"):
        result = index.search(question)
        assert result.hits == [] and result.terms == [] and result.message == NO_TERMS
        assert result.max_score == 0.0
    assert [r.message for r in index.search_many(["", "bill"])] == [NO_TERMS, None]


def test_search_many_equals_search(tmp_path):
    index = PassageIndex.load_or_build(make_store(tmp_path), RetrievalConfig(variant="bm25l"))
    questions = ["pay by phone", "meter lid", "late fee due date", "", "autopay"]
    batch = index.search_many(questions, k=3)
    for question, result in zip(questions, batch):
        single = index.search(question, k=3)
        assert [(h.passage_id, h.score) for h in result.hits] == [(h.passage_id, h.score) for h in single.hits]


def test_unknown_variant_lists_the_registry(tmp_path):
    store = make_store(tmp_path)
    with pytest.raises(ConfigError, match="'bm26'.*lucene, okapi, bm25plus, bm25l"):
        PassageIndex.load_or_build(store, RetrievalConfig(variant="bm26"))
    with pytest.raises(ConfigError, match="retrieval.b"):
        PassageIndex.load_or_build(store, RetrievalConfig(b=1.5))


def test_tokenizer_mismatch_is_refused(tmp_path):
    store = make_store(tmp_path)
    store.set_meta("tokenizer", Tokenizer(language="none").fingerprint())
    with pytest.raises(StoreError, match=r"kb\.db'.*run ingest again"):
        PassageIndex.load_or_build(store, RetrievalConfig())


def test_damaged_token_ids_name_the_database(tmp_path):
    store = make_store(tmp_path)
    store.db.execute("UPDATE passages SET token_ids = x'010203' WHERE id = 1")
    with pytest.raises(StoreError, match=r"kb\.db'.*passage 1"):
        PassageIndex.load_or_build(store, RetrievalConfig())


def test_unwritable_index_folder_still_searches(tmp_path):
    store = make_store(tmp_path)
    index_folder(store).write_text("a file where the folder should be")
    index = PassageIndex.load_or_build(store, RetrievalConfig())
    assert index.search("meter").hits


def test_vocabulary_ids_lookup_and_a_second_writer(tmp_path):
    store = Store(tmp_path / "v.db")
    first, second = Vocabulary(store), Vocabulary(store)
    with store.transaction():
        ids = first.ids(["meter", "leak", "meter"])
    assert ids.dtype == np.dtype("<i4") and ids[0] == ids[2] != ids[1]
    with store.transaction():  # another writer that has not seen "leak" adds it again: same id
        again = second.ids(["leak", "valve"])
    assert again[0] == ids[1]
    assert first.lookup(["valve", "hydrant"]) == [again[1], None]
    assert Vocabulary(store).terms() == {int(ids[0]): "meter", int(ids[1]): "leak", int(again[1]): "valve"}
    assert len(first) == 3


def test_damaged_saved_index_is_rebuilt(tmp_path):
    store = make_store(tmp_path)
    PassageIndex.load_or_build(store, RetrievalConfig())
    (index_folder(store) / "weights.npy").write_bytes(b"not an array")
    index = PassageIndex.load_or_build(store, RetrievalConfig())
    assert index.rebuilt and index.search("meter lid").hits


def test_retokenized_store_rebuilds_the_index(tmp_path):
    # Ingest re-tokenizes every passage (new term ids, same passage ids) when the tokenizer
    # fingerprint in meta changes; the index must notice although no passage id changed.
    store = make_store(tmp_path)
    PassageIndex.load_or_build(store, RetrievalConfig())
    store.set_meta("tokenizer", Tokenizer().fingerprint())
    assert PassageIndex.load_or_build(store, RetrievalConfig()).rebuilt
    assert not PassageIndex.load_or_build(store, RetrievalConfig()).rebuilt
