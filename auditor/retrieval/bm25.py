"""BM25: pure scoring functions, a variant registry and a sparse index with exact top-k.

Work splits the way a distributed engine would run it (docs/architecture.md):

    count_terms   (map)     token-id arrays -> per-passage term frequencies (`TermCounts`)
    CorpusStats   (reduce)  N, total length and document frequencies; `merge` adds shards
    build_index   (map)     term frequencies + corpus-wide stats -> `SparseIndex` of one shard
    SparseIndex.top_k       exact top-k of one shard; shards' hits merge by score

The index is term-major (CSC over passages): per term, the sorted passage ordinals holding it, the
precomputed float32 weight idf·tf-part, and the raw term frequency. Ranking uses the float32 weights;
the scores handed out are recomputed in float64 from the term frequencies, so they equal the
reference libraries' to rounding while the index stays small (docs/judgement.md).

The project's interface puts the pure scoring functions and the sparse index in this one module; it
is longer than most for that reason, in four sections that do not reach into each other.

Past 400 lines because the scoring functions, their registry and the index that applies them must
agree to rounding, and the reference tests (tests/test_bm25_references.py) hold them together here.
"""

from __future__ import annotations

import json
import math
import os
import shutil
import tempfile
from collections.abc import Callable, Iterable
from dataclasses import asdict, dataclass
from pathlib import Path

import numpy as np
import scipy.sparse

from auditor.errors import ConfigError

FORMAT = 1  # of the saved index folder
OKAPI_EPSILON = 0.25  # rank-bm25's BM25Okapi default (rank_bm25.py, BM25Okapi.__init__)


# --- IDF: vectorised over the document frequencies `df` of every term of the corpus ---------------


def idf_lucene(n_docs: int, df: np.ndarray) -> np.ndarray:
    """Lucene's non-negative IDF, ln(1 + (N − n + 0.5)/(n + 0.5)) (Lucene BM25Similarity.idf;
    Kamphuis et al., ECIR 2020, "Which BM25 do you mean?", table 1)."""
    df = np.asarray(df, dtype=np.float64)
    return np.log1p((n_docs - df + 0.5) / (df + 0.5))


def idf_robertson(n_docs: int, df: np.ndarray) -> np.ndarray:
    """Robertson–Spärck Jones IDF, ln((N − n + 0.5)/(n + 0.5)); negative for n > N/2
    (Robertson & Zaragoza 2009, "The Probabilistic Relevance Framework", eq. 3.3)."""
    df = np.asarray(df, dtype=np.float64)
    return np.log((n_docs - df + 0.5) / (df + 0.5))


def idf_okapi(n_docs: int, df: np.ndarray, epsilon: float = OKAPI_EPSILON) -> np.ndarray:
    """Robertson IDF with rank-bm25's floor: a negative IDF becomes ε × the mean IDF of all
    terms of the corpus (rank_bm25 0.2.2, BM25Okapi._calc_idf). Terms with df = 0 are not part
    of the corpus and do not enter the mean."""
    df = np.asarray(df, dtype=np.float64)
    idf = idf_robertson(n_docs, df)
    present = df > 0
    if present.any():
        floor = epsilon * float(idf[present].mean())
        idf = np.where(present & (idf < 0), floor, idf)
    return idf


def idf_bm25l(n_docs: int, df: np.ndarray) -> np.ndarray:
    """BM25L's IDF, ln((N + 1)/(n + 0.5)) (Lv & Zhai, CIKM 2011, "When documents are very long,
    BM25 fails!"; as in rank-bm25 BM25L and bm25s `_score_idf_bm25l`)."""
    df = np.asarray(df, dtype=np.float64)
    return np.log((n_docs + 1) / (df + 0.5))


def idf_bm25plus(n_docs: int, df: np.ndarray) -> np.ndarray:
    """BM25+'s IDF, ln((N + 1)/n) (Lv & Zhai, CIKM 2011, "Lower-bounding term frequency
    normalization"; as in rank-bm25 BM25Plus and bm25s `_score_idf_bm25plus`)."""
    df = np.asarray(df, dtype=np.float64)
    with np.errstate(divide="ignore"):
        return np.where(df > 0, np.log((n_docs + 1) / np.maximum(df, 1e-300)), 0.0)


# --- term-frequency parts, for a term present in the passage (tf ≥ 1) -----------------------------


def _norm(dl, avgdl: float, b: float):
    # Length normalisation 1 − b + b·dl/avgdl; an all-empty corpus has avgdl 0 and no postings.
    return 1.0 - b + b * (np.asarray(dl, dtype=np.float64) / avgdl if avgdl > 0 else 0.0)


def tf_classic(tf, dl, avgdl: float, k1: float, b: float, delta: float = 0.0):
    """tf·(k1 + 1) / (tf + k1·(1 − b + b·dl/avgdl)) (Robertson & Zaragoza 2009, eq. 3.15)."""
    tf = np.asarray(tf, dtype=np.float64)
    return tf * (k1 + 1) / (tf + k1 * _norm(dl, avgdl, b))


def tf_bm25l(tf, dl, avgdl: float, k1: float, b: float, delta: float):
    """BM25L: c = tf/(1 − b + b·dl/avgdl); (k1 + 1)(c + δ)/(k1 + c + δ) (Lv & Zhai 2011)."""
    c = np.asarray(tf, dtype=np.float64) / _norm(dl, avgdl, b)
    return (k1 + 1) * (c + delta) / (k1 + c + delta)


def tf_bm25plus(tf, dl, avgdl: float, k1: float, b: float, delta: float):
    """BM25+: tf·(k1 + 1)/(k1·(1 − b + b·dl/avgdl) + tf) + δ (Lv & Zhai 2011)."""
    return tf_classic(tf, dl, avgdl, k1, b) + delta


@dataclass(frozen=True)
class Variant:
    """One BM25 variant: its IDF, its term-frequency part, and the bound of that part."""

    name: str
    idf: Callable[[int, np.ndarray], np.ndarray]
    tf: Callable[..., np.ndarray]
    description: str

    def saturation(self, k1: float, delta: float) -> float:
        """Supremum of the tf part over tf and length: the most one term can give per unit IDF."""
        return k1 + 1 + (delta if self.name == "bm25plus" else 0.0)


# The one registry of valid variants; error messages list its keys, so they cannot go stale.
VARIANTS: dict[str, Variant] = {
    "lucene": Variant(
        "lucene", idf_lucene, tf_classic, "Lucene's non-negative IDF with the classic (k1 + 1) tf part (default)"
    ),
    "okapi": Variant("okapi", idf_okapi, tf_classic, "Robertson IDF with rank-bm25's ε floor for negative IDF"),
    "bm25plus": Variant("bm25plus", idf_bm25plus, tf_bm25plus, "BM25+ (lower-bounded tf, δ)"),
    "bm25l": Variant("bm25l", idf_bm25l, tf_bm25l, "BM25L (shifted tf normalisation, δ)"),
}


def get_variant(name: str) -> Variant:
    """The registered variant called `name`, else ConfigError listing the valid names."""
    try:
        return VARIANTS[name]
    except KeyError:
        raise ConfigError(
            f"retrieval.variant: unknown BM25 variant {name!r}; choose one of {', '.join(VARIANTS)}"
        ) from None


@dataclass(frozen=True)
class Params:
    """The scoring parameters an index is built with (saved beside it and checked on load)."""

    variant: str = "lucene"
    k1: float = 1.2
    b: float = 0.75
    delta: float = 0.5

    def __post_init__(self):
        get_variant(self.variant)
        for name, value in (("k1", self.k1), ("b", self.b), ("delta", self.delta)):
            if not isinstance(value, (int, float)) or not math.isfinite(value):
                raise ConfigError(f"retrieval.{name} must be a finite number, not {value!r}")
        if self.k1 < 0:
            raise ConfigError(f"retrieval.k1 must not be negative, not {self.k1!r}")
        if not 0.0 <= self.b <= 1.0:
            raise ConfigError(f"retrieval.b must lie between 0 and 1, not {self.b!r}")
        if self.delta < 0:
            raise ConfigError(f"retrieval.delta must not be negative, not {self.delta!r}")

    @property
    def scorer(self) -> Variant:
        """The registered variant these parameters name."""
        return VARIANTS[self.variant]


# --- map: term frequencies per passage -------------------------------------------------------------


@dataclass
class TermCounts:
    """Passage-major term frequencies (CSR): passage i holds terms[indptr[i]:indptr[i+1]]."""

    indptr: np.ndarray  # int64, N + 1
    terms: np.ndarray  # int32 term ids, sorted within each passage
    tf: np.ndarray  # uint16 (int32 when a count exceeds 65535)
    doc_len: np.ndarray  # int32 tokens per passage, stopwords excluded (as the references count)
    n_terms: int  # 1 + the largest term id seen (the width of the matrix)

    @property
    def n_docs(self) -> int:
        return len(self.doc_len)


def count_terms(token_arrays: Iterable[np.ndarray], chunk: int = 32768) -> TermCounts:
    """Count term frequencies of each passage's token-id array, a chunk of passages at a time."""
    indptr_parts, term_parts, tf_parts, lengths = [np.zeros(1, np.int64)], [], [], []
    buffer: list[np.ndarray] = []
    offset = 0

    def flush():
        nonlocal offset
        lens = np.fromiter((len(a) for a in buffer), dtype=np.int64, count=len(buffer))
        lengths.append(lens.astype(np.int32))
        tokens = np.concatenate(buffer).astype(np.int64) if len(buffer) else np.zeros(0, np.int64)
        if len(tokens) and tokens.min() < 0:
            raise ValueError("negative term id in token_ids")
        # One sortable key per token: (passage, term) packed into an int64.
        key = (np.repeat(np.arange(len(buffer), dtype=np.int64), lens) << 32) | tokens
        key.sort()
        starts = np.flatnonzero(np.concatenate(([True], key[1:] != key[:-1]))) if len(key) else key
        counts = np.diff(np.append(starts, len(key)))
        unique = key[starts]
        per_doc = np.bincount(unique >> 32, minlength=len(buffer)) if len(unique) else np.zeros(len(buffer), np.int64)
        indptr_parts.append(offset + np.cumsum(per_doc))
        offset += int(per_doc.sum())
        term_parts.append((unique & 0xFFFFFFFF).astype(np.int32))
        small = not len(counts) or counts.max() <= np.iinfo(np.uint16).max
        tf_parts.append(counts.astype(np.uint16 if small else np.int32))
        buffer.clear()

    for array in token_arrays:
        buffer.append(np.asarray(array))
        if len(buffer) >= chunk:
            flush()
    if buffer:
        flush()
    terms = np.concatenate(term_parts) if term_parts else np.zeros(0, np.int32)
    term_parts.clear()
    tf = np.concatenate(tf_parts) if tf_parts else np.zeros(0, np.uint16)  # int32 if any chunk needs it
    tf_parts.clear()
    doc_len = np.concatenate(lengths) if lengths else np.zeros(0, np.int32)
    return TermCounts(np.concatenate(indptr_parts), terms, tf, doc_len, int(terms.max()) + 1 if len(terms) else 0)


# --- reduce: corpus-wide statistics ---------------------------------------------------------------


@dataclass
class CorpusStats:
    """N, total token count and per-term document frequencies: all BM25 needs corpus-wide."""

    n_docs: int
    total_len: int
    df: np.ndarray  # int64 by term id

    @classmethod
    def of(cls, counts: TermCounts) -> CorpusStats:
        """The statistics of one shard's term counts."""
        return cls(
            counts.n_docs,
            int(counts.doc_len.sum()),
            np.bincount(counts.terms, minlength=counts.n_terms).astype(np.int64),
        )

    def merge(self, other: CorpusStats) -> CorpusStats:
        """Statistics of two shards together (the reduce step)."""
        width = max(len(self.df), len(other.df))
        df = np.zeros(width, np.int64)
        df[: len(self.df)] += self.df
        df[: len(other.df)] += other.df
        return CorpusStats(self.n_docs + other.n_docs, self.total_len + other.total_len, df)

    @property
    def avgdl(self) -> float:
        return self.total_len / self.n_docs if self.n_docs else 0.0


# --- map: the index of one shard ------------------------------------------------------------------

_ARRAYS = ("indptr", "indices", "weights", "tf", "doc_len", "df", "idf", "maxw", "keys", "dense", "dense_row")

# Terms in at least this share of the passages also get a dense weight row: adding a dense row is a
# sequential pass, several times cheaper than scattering as many postings, and looking a passage up
# in it is one read instead of a binary search. Capped so the rows stay a small part of the index.
DENSE_SHARE = 0.25
DENSE_MAX_TERMS = 64


class SparseIndex:
    """Term-major BM25 index over passage ordinals 0..n_docs−1 (one shard) with exact top-k."""

    # The arrays of `_ARRAYS`, set by name in __init__ (and saved and loaded by name).
    indptr: np.ndarray
    indices: np.ndarray
    weights: np.ndarray
    tf: np.ndarray
    doc_len: np.ndarray
    df: np.ndarray
    idf: np.ndarray
    maxw: np.ndarray
    keys: np.ndarray
    dense: np.ndarray
    dense_row: np.ndarray

    def __init__(
        self,
        params: Params,
        n_docs: int,
        avgdl: float,
        arrays: dict[str, np.ndarray],
        missing_idf: float,
        meta: dict | None = None,
    ):
        self.params = params
        self.n_docs = n_docs
        self.avgdl = avgdl
        self.missing_idf = missing_idf
        self.meta = dict(meta or {})
        for name in _ARRAYS:
            setattr(self, name, arrays[name])
        self.n_terms = len(self.df)
        self._scratch: np.ndarray | None = None
        self._marks: np.ndarray | None = None

    # -- build / save / load -----------------------------------------------------------------------
    @classmethod
    def build(
        cls,
        counts: TermCounts,
        params: Params,
        stats: CorpusStats | None = None,
        meta: dict | None = None,
        keys: np.ndarray | None = None,
        consume: bool = False,
    ) -> SparseIndex:
        """Weights for one shard; `stats` are the corpus-wide ones (default: this shard's).
        `keys` are the caller's ids of the passages (default: their ordinals). With `consume`,
        the passage-major arrays of `counts` are released once turned term-major (saves a third
        of the peak memory on large corpora)."""
        stats = stats or CorpusStats.of(counts)
        scorer = params.scorer
        width = max(counts.n_terms, len(stats.df))
        df = np.zeros(width, np.int64)
        df[: len(stats.df)] = stats.df
        present = df > 0
        idf = np.zeros(width, np.float64)
        if present.any():
            idf = np.where(present, scorer.idf(stats.n_docs, df), 0.0)
        csc = scipy.sparse.csr_matrix(
            (counts.tf, counts.terms, counts.indptr), shape=(counts.n_docs, width), copy=False
        ).tocsc()
        if consume:
            # Freed for memory: a consumed TermCounts is not used again.
            counts.terms = counts.tf = None  # type: ignore[assignment]
        csc.sort_indices()
        indptr = csc.indptr.astype(np.int64)
        indices = csc.indices.astype(np.int32, copy=False)
        tf = csc.data
        del csc
        weights = np.empty(len(tf), np.float32)
        avgdl = stats.avgdl
        # Column blocks of ~4M postings keep the float64 temporaries small.
        step = 1 << 22
        column = 0
        while column < width:
            end = int(np.searchsorted(indptr, indptr[column] + step, side="right"))
            end = min(max(end - 1, column + 1), width)
            lo, hi = indptr[column], indptr[end]
            if hi > lo:
                cols = np.repeat(np.arange(column, end), np.diff(indptr[column : end + 1]))
                weights[lo:hi] = idf[cols] * scorer.tf(
                    tf[lo:hi], counts.doc_len[indices[lo:hi]], avgdl, params.k1, params.b, params.delta
                )
            column = end
        maxw = np.zeros(width, np.float32)
        nonempty = np.flatnonzero(np.diff(indptr) > 0)
        if len(nonempty):
            maxw[nonempty] = np.maximum.reduceat(weights, indptr[nonempty])
        local_df = np.diff(indptr)
        common = np.flatnonzero(local_df >= max(DENSE_SHARE * counts.n_docs, 1))
        common = common[np.argsort(-local_df[common], kind="stable")][:DENSE_MAX_TERMS]
        dense = np.zeros((len(common), counts.n_docs), np.float32)
        dense_row = np.full(width, -1, np.int32)
        for row, t in enumerate(common):
            dense[row, indices[indptr[t] : indptr[t + 1]]] = weights[indptr[t] : indptr[t + 1]]
            dense_row[t] = row
        missing = float(scorer.idf(stats.n_docs + 1, np.array([1.0]))[0])
        missing = max(missing, float(idf.max(initial=0.0)), 0.0)
        meta = dict(meta or {})
        arrays = dict(
            indptr=indptr,
            indices=indices,
            weights=weights,
            tf=tf,
            doc_len=counts.doc_len.astype(np.int32),
            df=df,
            idf=idf,
            maxw=maxw,
            keys=np.arange(counts.n_docs, dtype=np.int64) if keys is None else np.asarray(keys, dtype=np.int64),
            dense=dense,
            dense_row=dense_row,
        )
        meta["corpus_docs"] = stats.n_docs
        return cls(params, counts.n_docs, avgdl, arrays, missing, meta)

    def save(self, folder: Path) -> None:
        """Write the index to `folder` (replaced atomically: written beside it, then renamed)."""
        folder = Path(folder)
        folder.parent.mkdir(parents=True, exist_ok=True)
        work = Path(tempfile.mkdtemp(prefix=folder.name + ".", suffix=".tmp", dir=folder.parent))
        try:
            for name in _ARRAYS:
                np.save(work / f"{name}.npy", np.ascontiguousarray(getattr(self, name)))
            info = {
                "format": FORMAT,
                "params": asdict(self.params),
                "n_docs": self.n_docs,
                "avgdl": self.avgdl,
                "missing_idf": self.missing_idf,
                "meta": self.meta,
            }
            (work / "index.json").write_text(json.dumps(info, indent=1, sort_keys=True))
            old = None
            if folder.exists():
                old = folder.with_name(f"{folder.name}.old.{os.getpid()}")
                os.replace(folder, old)
            os.replace(work, folder)
            if old is not None:
                shutil.rmtree(old, ignore_errors=True)
        except BaseException:
            shutil.rmtree(work, ignore_errors=True)
            raise

    @staticmethod
    def read_info(folder: Path) -> dict | None:
        """The saved parameters and metadata, or None when there is no readable index."""
        try:
            info = json.loads((Path(folder) / "index.json").read_text())
        except (OSError, ValueError):
            return None
        return info if isinstance(info, dict) and info.get("format") == FORMAT else None

    @classmethod
    def load(cls, folder: Path, mmap: bool = True) -> SparseIndex:
        """Open a saved index; the big arrays are memory-mapped, not read."""
        folder = Path(folder)
        info = cls.read_info(folder)
        if info is None:
            raise FileNotFoundError(f"{str(folder)!r}: no BM25 index of format {FORMAT}")
        arrays = {name: np.load(folder / f"{name}.npy", mmap_mode="r" if mmap else None) for name in _ARRAYS}
        return cls(
            Params(**info["params"]), info["n_docs"], info["avgdl"], arrays, info["missing_idf"], info.get("meta")
        )

    # -- scoring -----------------------------------------------------------------------------------
    def term_idf(self, term_ids: Iterable[int | None]) -> list[float]:
        """IDF of each term; a term absent from the corpus (None or df = 0) gets `missing_idf`."""
        out = []
        for t in term_ids:
            present = t is not None and 0 <= t < self.n_terms and self.df[t] > 0
            out.append(float(self.idf[t]) if present else self.missing_idf)
        return out

    def _present(self, term_ids: Iterable[int | None]) -> np.ndarray:
        seen, out = set(), []
        for t in term_ids:
            if t is not None and 0 <= t < self.n_terms and self.df[t] > 0 and t not in seen:
                seen.add(t)
                out.append(t)
        return np.array(out, dtype=np.int64)

    def contributions(self, term_ids: list[int], docs: np.ndarray) -> np.ndarray:
        """Exact float64 contribution of each term (rows) to each passage ordinal (columns)."""
        docs = np.asarray(docs, dtype=np.int64)
        out = np.zeros((len(term_ids), len(docs)), np.float64)
        rows = [r for r, t in enumerate(term_ids) if t is not None and 0 <= t < self.n_terms and self.df[t] > 0]
        if not rows or not len(docs):
            return out
        terms = np.array([term_ids[r] for r in rows], dtype=np.int64)
        lo, hi = self.indptr[terms], self.indptr[terms + 1]
        # One binary search per term, then every gather and the formula at once over terms × docs.
        # Needles of the haystack's dtype: otherwise numpy converts the whole posting list per call.
        needles = docs.astype(self.indices.dtype)
        pos = np.stack([np.searchsorted(self.indices[a:b], needles) for a, b in zip(lo.tolist(), hi.tolist())])
        pos += lo[:, None]
        np.minimum(pos, (hi - 1)[:, None], out=pos)
        # A term of the corpus may have no postings in this shard (hi == lo): pos then points into
        # the previous term's list, which must not count.
        found = (self.indices[pos] == docs[None, :]) & (hi > lo)[:, None]
        p = self.params
        part = self.idf[terms][:, None] * p.scorer.tf(
            self.tf[pos], self.doc_len[docs][None, :], self.avgdl, p.k1, p.b, p.delta
        )
        out[rows] = np.where(found, part, 0.0)
        return out

    def scores(self, term_ids: list[int | None]) -> np.ndarray:
        """Exact float64 score of every passage (for checks against reference libraries)."""
        out = np.zeros(self.n_docs, np.float64)
        p = self.params
        for t in self._present(term_ids):
            lo, hi = int(self.indptr[t]), int(self.indptr[t + 1])
            docs = self.indices[lo:hi]
            out[docs] += self.idf[t] * p.scorer.tf(self.tf[lo:hi], self.doc_len[docs], self.avgdl, p.k1, p.b, p.delta)
        return out

    def top_k(self, term_ids: list[int | None], k: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Exact top-k passages for one question's term ids: (ordinals, scores, contributions).

        Best first, ties broken by ordinal; passages scoring 0 are no hits. `contributions` has one
        row per distinct present term (in order of `term_ids`) and one column per hit.
        """
        terms = self._present(term_ids)
        if k <= 0 or not len(terms) or self.n_docs == 0:
            return np.zeros(0, np.int64), np.zeros(0), np.zeros((len(terms), 0))
        if self._scratch is None:
            self._scratch = np.zeros(self.n_docs, np.float32)
        candidates = self._candidates(terms, k, self._scratch)
        parts = self.contributions(list(terms), candidates)
        exact = parts.sum(axis=0)
        order = np.lexsort((candidates, -exact))[:k]
        order = order[exact[order] > 0]
        return candidates[order], exact[order], parts[:, order]

    def _candidates(self, terms: np.ndarray, k: int, scratch: np.ndarray) -> np.ndarray:
        """Ordinals sure to hold the top k (plus near-ties) by float32 accumulation: postings
        scattered into `scratch`, dense rows added for the commonest terms. Then the k-th best score
        is bounded from below by the k-th best of a subset (the rarest terms' passages, which the
        best passages tend to hold, and a strided sample): only passages reaching that bound are
        kept, so no pass sorts or partitions the whole array."""
        indptr, indices, weights = self.indptr, self.indices, self.weights
        rows = self.dense_row[terms]
        sparse = terms[rows < 0]
        sparse = sparse[np.argsort(indptr[sparse + 1] - indptr[sparse], kind="stable")]
        touched: list[np.ndarray] = []
        for t in sparse.tolist():
            lo, hi = int(indptr[t]), int(indptr[t + 1])
            postings = indices[lo:hi]
            np.add.at(scratch, postings, weights[lo:hi])  # faster than fancy += in numpy 2
            touched.append(postings)
        for row in rows[rows >= 0].tolist():
            scratch += self.dense[row]
        n_touched = sum(len(p) for p in touched)
        # Relative float32 error of a sum of n positive weights stays below n·2^-23 (rounding of each
        # weight and each addition); the margin keeps every passage that exact scores could rank in.
        slack = 1 - (1e-5 + len(terms) * 2.4e-7)
        if len(sparse) < len(terms) or n_touched > self.n_docs // 16:
            held, values = _sample(scratch, touched)
            theta = _kth_distinct(held, values, scratch, k, len(touched) + 1)
            seen = np.flatnonzero(scratch >= theta * slack) if theta > 0 else np.flatnonzero(scratch)
            values = scratch[seen]
            scratch.fill(0)
        else:
            held = np.concatenate(touched)
            values = scratch[held]
            theta = _kth_distinct(held, values, scratch, k, len(touched))
            seen = self._distinct(held[values >= theta * slack] if theta > 0 else held)
            values = scratch[seen]
            scratch[held] = 0
        return _near_top(seen, values, k, slack)

    def _distinct(self, docs: np.ndarray) -> np.ndarray:
        """Sorted distinct ordinals of `docs`: a flag array for large inputs (np.unique sorts or
        hashes, far slower than one pass over N/8 bytes), np.unique for small ones."""
        if len(docs) < 4096:
            return np.unique(docs)
        if self._marks is None:
            self._marks = np.zeros(self.n_docs, bool)
        self._marks[docs] = True
        out = np.flatnonzero(self._marks).astype(self.indices.dtype)
        self._marks[out] = False
        return out

    def top_k_many(self, queries: list[list[int | None]], k: int):
        """`top_k` for many questions (one scratch array serves them all)."""
        return [self.top_k(q, k) for q in queries]


def _sample(scratch: np.ndarray, touched: list[np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
    """Ordinals and scores of a subset: the rarest terms' postings (up to N/4 of them, rarest
    first) and every 64th passage. Each passage occurs at most len(touched) + 1 times."""
    budget, lists = len(scratch) // 4, []
    for postings in touched:
        if len(postings) > budget:
            break
        lists.append(postings)
        budget -= len(postings)
    held = np.concatenate([*lists, np.arange(0, len(scratch), 64, dtype=np.int32)])
    return held, scratch[held]


def _kth_distinct(held: np.ndarray, values: np.ndarray, scratch: np.ndarray, k: int, lists: int) -> float:
    """The k-th largest partial score among distinct passages of `held` (which repeats a passage
    at most `lists` times), without sorting or hashing all of `held`; 0 when fewer than k."""
    wanted = k * lists
    if len(held) > wanted:
        top = held[np.argpartition(values, len(values) - wanted)[len(values) - wanted :]]
    else:
        top = held
    distinct = scratch[np.unique(top)]
    if len(distinct) < k:
        return 0.0
    return float(np.partition(distinct, len(distinct) - k)[len(distinct) - k])


def _near_top(docs: np.ndarray, values: np.ndarray, k: int, slack: float) -> np.ndarray:
    """Docs whose float32 score reaches the k-th best within float32 rounding (`slack`), so that
    exact rescoring in float64 decides the order and near-ties at the cut."""
    if len(docs) > k:
        theta = np.partition(values, len(values) - k)[len(values) - k]
        keep = values >= theta * slack if theta > 0 else values > 0
        docs = docs[keep]
        values = values[keep]
    return docs[values > 0] if len(docs) else docs
