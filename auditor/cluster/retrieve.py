"""BM25 on the cluster: corpus statistics reduced once, questions scored shard by shard, top-k merged.

The plan of auditor/retrieval/bm25.py, run by Dask:

    export     the client writes the active passages' token ids (from the store, in passage id
               order) as Parquet shards into the shared folder, at least one per worker thread
    map        each worker counts its shard's terms (`count_terms`) and its `CorpusStats`
    reduce     the statistics merge pairwise on the workers into one `CorpusStats`, fetched once
    map        each worker builds its shard's `SparseIndex` with the corpus-wide statistics
    score      each question batch goes to every shard; each returns its exact top k
    merge      the client keeps the k best of the shards' hits, ties by passage id

Scores are exact float64 from the same term frequencies, document lengths and corpus-wide IDF as
the local index, and both break ties by passage id, so the merged top k equals the local one.
`ShardedIndex` stands in for `SparseIndex` inside `PassageIndex` (auditor/retrieval/index.py), so the
search result a question gets (terms, IDF, missing terms, maximum score) is computed by the same code.

Shards are files, so a worker that dies takes nothing with it: Dask recomputes its shards' counts and
index from the files on another worker.
"""

from __future__ import annotations

import itertools
import math
from pathlib import Path

import numpy as np
import pyarrow as pa
import pyarrow.parquet as pq
from dask.distributed import Future

from auditor.cluster.backend import Cluster
from auditor.config import RetrievalConfig
from auditor.errors import StoreError
from auditor.retrieval.bm25 import CorpusStats, Params, SparseIndex, TermCounts, count_terms
from auditor.retrieval.index import HEADING_WEIGHT, PassageIndex, corpus_fingerprint, indexed_tokens
from auditor.retrieval.tokenize import Tokenizer
from auditor.store import SEARCHED_STATUSES, Store

MAX_SHARD_PASSAGES = 200_000  # one shard's index stays near 100 MB (bench/README.md)
QUERY_BATCH = 2000  # questions per scoring task

_ACTIVE = f"FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.status IN {SEARCHED_STATUSES}"


# --- on a worker --------------------------------------------------------------------------------


def shard_counts(path: str) -> TermCounts:
    """Term counts of one exported shard."""
    tokens = pq.read_table(path, columns=["tokens"]).column("tokens").combine_chunks()
    offsets = tokens.offsets.to_numpy()
    ids = tokens.values.to_numpy()
    return count_terms(ids[offsets[i] : offsets[i + 1]] for i in range(len(offsets) - 1))


def merge_stats(a: CorpusStats, b: CorpusStats) -> CorpusStats:
    return a.merge(b)


def shard_index(counts: TermCounts, params: Params, stats: CorpusStats) -> SparseIndex:
    """One shard's index over its ordinals 0..n−1, weighted with the corpus-wide statistics."""
    return SparseIndex.build(counts, params, stats)


def shard_top_k(index: SparseIndex, queries: list[list[int | None]], k: int, offset: int) -> list[tuple]:
    """Exact top k of the shard for each query, ordinals shifted to the corpus-wide ones."""
    return [(ordinals + offset, scores, parts) for ordinals, scores, parts in index.top_k_many(queries, k)]


# --- on the client ------------------------------------------------------------------------------


class ShardedIndex:
    """What `PassageIndex` asks of a `SparseIndex`, with the postings held by the workers.

    The corpus-wide arrays (df, IDF) come from an index of no passages built with the reduced
    statistics, so they are computed by the same code as the local index's.
    """

    def __init__(self, cluster: Cluster, stats: CorpusStats, params: Params, shards: list[Future], offsets, keys, meta):
        self.cluster = cluster
        self.shards = shards
        self.offsets = offsets
        self.keys = keys  # passage id of each corpus-wide ordinal
        empty = TermCounts(
            np.zeros(1, np.int64), np.zeros(0, np.int32), np.zeros(0, np.uint16), np.zeros(0, np.int32), 0
        )
        self.corpus = SparseIndex.build(empty, params, stats, meta=meta)
        self.params, self.meta = params, self.corpus.meta
        self.n_docs = stats.n_docs
        self.n_terms = self.corpus.n_terms
        self.df: np.ndarray = self.corpus.df
        self._hits: dict[tuple[tuple[int, ...], int], tuple] = {}

    def term_idf(self, term_ids) -> list[float]:
        return self.corpus.term_idf(term_ids)

    def present(self, term_ids) -> list[int]:
        """The term ids the corpus holds, as `SparseIndex` scores them (distinct, in order)."""
        return self.corpus._present(term_ids).tolist()

    def prefetch(self, queries: list[list[int]], k: int) -> None:
        """Score every query on every shard in batches and keep the merged top k of each."""
        wanted = list(dict.fromkeys(tuple(q) for q in queries if q and (tuple(q), k) not in self._hits))
        client = self.cluster.client
        for start in range(0, len(wanted), QUERY_BATCH):
            batch = [list(q) for q in wanted[start : start + QUERY_BATCH]]
            shipped = client.scatter(batch, broadcast=True) if len(self.shards) > 1 else batch
            futures = [
                client.submit(shard_top_k, shard, shipped, k, offset, pure=False)
                for shard, offset in zip(self.shards, self.offsets)
            ]
            found = [self.cluster.result(f, f"scoring questions on shard {i}") for i, f in enumerate(futures)]
            for j, query in enumerate(wanted[start : start + QUERY_BATCH]):
                self._hits[(query, k)] = merge_top_k([per_shard[j] for per_shard in found], k)

    def top_k(self, term_ids, k: int):
        key = (tuple(self.present(term_ids)), k)
        if key not in self._hits:
            self.prefetch([list(key[0])], k)
        return self._hits[key]


def merge_top_k(hits: list[tuple[np.ndarray, np.ndarray, np.ndarray]], k: int):
    """The k best of the shards' top-k lists: by score, ties by ordinal (as `SparseIndex.top_k`)."""
    ordinals = np.concatenate([h[0] for h in hits])
    scores = np.concatenate([h[1] for h in hits])
    parts = np.concatenate([h[2] for h in hits], axis=1)
    order = np.lexsort((ordinals, -scores))[:k]
    return ordinals[order], scores[order], parts[:, order]


class ClusterPassageIndex(PassageIndex):
    """`PassageIndex` over a `ShardedIndex`: all questions are scored on the shards in one go first."""

    index: ShardedIndex  # type: ignore[assignment]

    def search_many(self, texts, k=None):
        k = self.retrieval.top_k if k is None else k
        term_lists = [list(dict.fromkeys(self.tokenizer.tokenize(text or ""))) for text in texts]
        self.vocabulary.lookup(sorted({t for terms in term_lists for t in terms}))
        self.index.prefetch([self.index.present(self.vocabulary.lookup(terms)) for terms in term_lists], k)
        return super().search_many(texts, k)


def build(cluster: Cluster, store: Store, retrieval: RetrievalConfig) -> ClusterPassageIndex:
    """Export the active passages, reduce the corpus statistics and build the shards' indexes."""
    params = Params(
        variant=retrieval.variant, k1=float(retrieval.k1), b=float(retrieval.b), delta=float(retrieval.delta)
    )
    tokenizer = Tokenizer(retrieval.language, retrieval.stopwords)
    stored = store.get_meta("tokenizer")
    if stored and stored != tokenizer.fingerprint():
        raise StoreError(
            f"{str(store.path)!r}: passages were tokenized as {stored!r} but retrieval settings "
            f"give {tokenizer.fingerprint()!r}; run ingest again or restore retrieval.language/stopwords"
        )
    paths, offsets, keys = export_shards(store, cluster.work / "index", cluster.threads, tokenizer)
    client = cluster.client
    counts = [client.submit(shard_counts, str(p), pure=False) for p in paths]
    stats = [client.submit(CorpusStats.of, c, pure=False) for c in counts]
    while len(stats) > 1:  # pairwise, on the workers
        pairs = [client.submit(merge_stats, a, b, pure=False) for a, b in zip(stats[::2], stats[1::2])]
        stats = pairs + ([stats[-1]] if len(stats) % 2 else [])
    if stats:
        total = cluster.result(stats[0], "reducing the corpus statistics")
    else:
        total = CorpusStats(0, 0, np.zeros(0, np.int64))
    shards = [client.submit(shard_index, c, params, stats[0], pure=False) for c in counts]
    cluster.wait_all(shards, "building the shards' indexes")
    del counts, stats  # the counts are released on the workers once every index is built
    meta = {"corpus": corpus_fingerprint(store), "tokenizer": tokenizer.fingerprint(), "heading_weight": HEADING_WEIGHT}
    index = ShardedIndex(cluster, total, params, shards, offsets, keys, meta)
    return ClusterPassageIndex(store, retrieval, index, tokenizer)  # type: ignore[arg-type]


def export_shards(
    store: Store, folder: Path, threads: int, tokenizer: Tokenizer
) -> tuple[list[Path], list[int], np.ndarray]:
    """The term ids the local index builds from (auditor/retrieval/index.py `indexed_tokens`: body and
    heading field) as Parquet shards, passage id order: paths, first ordinals, passage ids."""
    folder.mkdir(parents=True, exist_ok=True)
    n = store.db.execute(f"SELECT count(*) {_ACTIVE}").fetchone()[0]
    if n == 0:
        return [], [], np.zeros(0, np.int64)
    shards = max(threads, math.ceil(n / MAX_SHARD_PASSAGES))
    size = math.ceil(n / shards)
    keys = np.empty(n, np.int64)
    paths: list[Path] = []
    offsets: list[int] = []
    rows = indexed_tokens(store, tokenizer=tokenizer, heading_weight=HEADING_WEIGHT)
    done = 0
    while done < n:
        chunk = list(itertools.islice(rows, size))
        if not chunk:
            break
        keys[done : done + len(chunk)] = [passage_id for passage_id, _ in chunk]
        lengths = np.fromiter((len(tokens) for _, tokens in chunk), np.int64, len(chunk))
        values = np.concatenate([tokens for _, tokens in chunk]).astype(np.int32)
        tokens = pa.ListArray.from_arrays(pa.array(np.concatenate(([0], np.cumsum(lengths))).astype(np.int32)), values)
        path = folder / f"{len(paths):06d}.parquet"
        pq.write_table(pa.table({"tokens": tokens}), path)
        paths.append(path)
        offsets.append(done)
        done += len(chunk)
    return paths, offsets, keys[:done]
