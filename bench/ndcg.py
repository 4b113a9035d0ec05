"""Retrieval quality on SciFact: nDCG@10 of our BM25 over a real audit store.

Protocol (../shared/data/scifact/README.md): the 5,183 abstracts (title + abstract) are the corpus,
the 300 claims of claims_validation.csv are the questions, their cited documents the relevant ones
(= the BEIR SciFact test qrels, relevance 1). Published BM25 figures: 0.665 (BEIR, Thakur et al.
2021, Anserini) and 0.687 (bm25s tables, Lucene-style, k1 = 1.5, b = 0.75).

The corpus goes through the project's own path: Tokenizer + Vocabulary into a SQLite store, then
PassageIndex.load_or_build and search_many. bm25s is run on the same tokens for comparison.

    python -m bench.ndcg
"""

from __future__ import annotations

import math
import tempfile
import time
from pathlib import Path

from auditor.config import RetrievalConfig
from auditor.retrieval.index import PassageIndex
from auditor.retrieval.tokenize import Tokenizer
from auditor.store import Store
from bench.claims_data import FOLDER, fill_store, load_scifact

REPO = Path(__file__).resolve().parent.parent


def ndcg_at_k(ranked: list, relevance: dict, k: int = 10) -> float:
    """nDCG@k (Järvelin & Kekäläinen 2002) with the gain rel/log2(rank + 1), as trec_eval's
    ndcg_cut computes it: DCG of the ranking over DCG of the ideal ranking of all judged documents."""
    dcg = sum(relevance.get(doc, 0.0) / math.log2(rank + 2) for rank, doc in enumerate(ranked[:k]))
    ideal = sorted((r for r in relevance.values() if r > 0), reverse=True)[:k]
    idcg = sum(r / math.log2(rank + 2) for rank, r in enumerate(ideal))
    return dcg / idcg if idcg > 0 else 0.0


def evaluate(corpus: dict, claims: list, retrieval: RetrievalConfig | None = None, folder: Path | None = None) -> dict:
    """Mean nDCG@10 of our retrieval over `claims`, through a store built in `folder`."""
    retrieval = retrieval or RetrievalConfig()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(folder or tmp) / "scifact.db"
        path.unlink(missing_ok=True)
        store = Store(path)
        try:
            tokenizer = Tokenizer(retrieval.language, retrieval.stopwords)
            started = time.perf_counter()
            passages = fill_store(store, corpus, tokenizer)
            filled = time.perf_counter()
            index = PassageIndex.load_or_build(store, retrieval)
            built = time.perf_counter()
            results = index.search_many([text for _, text, _ in claims], k=10)
            searched = time.perf_counter()
        finally:
            store.close()
    doc_of = {p: d for d, p in passages.items()}
    scores = [
        ndcg_at_k([doc_of[h.passage_id] for h in result.hits], {d: 1.0 for d in cited})
        for result, (_, _, cited) in zip(results, claims)
    ]
    return {
        "ndcg10": sum(scores) / len(scores),
        "store_s": filled - started,
        "index_s": built - filled,
        "search_s": searched - built,
        "claims": len(claims),
    }


def bm25s_ndcg(corpus: dict, claims: list, tokenizer: Tokenizer, k1: float, b: float) -> float:
    """The same measure for bm25s (method "lucene") on our tokens."""
    import bm25s

    doc_ids = list(corpus)
    model = bm25s.BM25(method="lucene", k1=k1, b=b)
    model.index([tokenizer.tokenize(f"{t}\n{a}") for t, a in corpus.values()], show_progress=False)
    vocab = model.vocab_dict
    total = 0.0
    for _, text, cited in claims:
        tokens = [t for t in dict.fromkeys(tokenizer.tokenize(text)) if t in vocab]
        scores = model.get_scores(tokens) if tokens else [0.0] * len(doc_ids)
        ranked = sorted(range(len(doc_ids)), key=lambda i: (-scores[i], i))[:10]
        total += ndcg_at_k([doc_ids[i] for i in ranked if scores[i] > 0], {d: 1.0 for d in cited})
    return total / len(claims)


def main() -> int:
    data = load_scifact()
    if data is None:
        print(f"SciFact not found at {FOLDER / 'scifact.zip'}; nothing to measure")
        return 0
    corpus, claims = data
    print(f"SciFact: {len(corpus)} abstracts, {len(claims)} claims, {sum(len(c) for _, _, c in claims)} relevant pairs")
    for label, config in (
        ("ours, defaults (lucene k1=1.2 b=0.75)", RetrievalConfig()),
        ("ours, lucene k1=1.5 b=0.75", RetrievalConfig(k1=1.5)),
        ("ours, okapi k1=1.5 b=0.75", RetrievalConfig(variant="okapi", k1=1.5)),
        ("ours, bm25plus k1=1.2 delta=0.5", RetrievalConfig(variant="bm25plus")),
        ("ours, bm25l k1=1.2 delta=0.5", RetrievalConfig(variant="bm25l")),
        ("ours, lucene stopword list", RetrievalConfig(stopwords="lucene")),
    ):
        r = evaluate(corpus, claims, config)
        print(
            f"  nDCG@10 {r['ndcg10']:.4f}  {label}  (store {r['store_s']:.1f}s, index {r['index_s']:.2f}s, "
            f"300 searches {r['search_s']:.3f}s)"
        )
    print(
        f"  nDCG@10 {bm25s_ndcg(corpus, claims, Tokenizer(), 1.5, 0.75):.4f}  bm25s lucene k1=1.5 b=0.75, same tokens"
    )
    print("  published: 0.665 BEIR (Anserini BM25), 0.687 bm25s tables")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
