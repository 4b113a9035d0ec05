"""The BM25 module on its own: formulas, registry, parameters, exact top-k, save/load, edge cases."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.errors import ConfigError
from auditor.retrieval.bm25 import (
    VARIANTS,
    CorpusStats,
    Params,
    SparseIndex,
    count_terms,
    get_variant,
    idf_bm25l,
    idf_bm25plus,
    idf_lucene,
    idf_okapi,
    idf_robertson,
    tf_bm25l,
    tf_bm25plus,
    tf_classic,
)


def test_idf_formulas_worked_values():
    # N = 10 passages, a term in 2 of them; values computed by hand from the formulas in the
    # docstrings (Kamphuis et al. ECIR 2020 table 1; Lv & Zhai 2011).
    df = np.array([2.0])
    assert idf_lucene(10, df)[0] == pytest.approx(math.log(1 + 8.5 / 2.5))
    assert idf_robertson(10, df)[0] == pytest.approx(math.log(8.5 / 2.5))
    assert idf_bm25l(10, df)[0] == pytest.approx(math.log(11 / 2.5))
    assert idf_bm25plus(10, df)[0] == pytest.approx(math.log(11 / 2))
    # Lucene's IDF never goes negative, even for a term in every passage: ln(1 + 0.5/10.5).
    assert idf_lucene(10, np.array([10.0]))[0] == pytest.approx(math.log(1 + 0.5 / 10.5))


def test_okapi_floor_is_epsilon_times_mean_idf():
    # rank-bm25 BM25Okapi._calc_idf: mean over all corpus terms of the raw Robertson IDF, and a
    # negative IDF becomes 0.25 × that mean; df = 0 entries are not corpus terms.
    df = np.array([1.0, 9.0, 0.0, 2.0])
    raw = idf_robertson(10, df[[0, 1, 3]])
    floored = idf_okapi(10, df)
    assert raw[1] < 0
    assert floored[1] == pytest.approx(0.25 * raw.mean())
    assert floored[0] == pytest.approx(raw[0]) and floored[3] == pytest.approx(raw[2])


def test_tf_parts_worked_values():
    # tf = 3 in a passage of average length: norm = 1, so the classic part is 3·2.2/(3 + 1.2).
    assert tf_classic(3, 100, 100.0, 1.2, 0.75) == pytest.approx(3 * 2.2 / 4.2)
    assert tf_bm25plus(3, 100, 100.0, 1.2, 0.75, 1.0) == pytest.approx(3 * 2.2 / 4.2 + 1.0)
    # BM25L at a passage twice the average with b = 0.5: c = 3/1.5 = 2.
    assert tf_bm25l(3, 200, 100.0, 1.2, 0.5, 0.5) == pytest.approx(2.2 * 2.5 / (1.2 + 2.5))
    # b = 0 ignores length entirely.
    assert tf_classic(1, 5, 100.0, 1.2, 0.0) == tf_classic(1, 500, 100.0, 1.2, 0.0)


def test_registry_and_parameter_errors():
    assert list(VARIANTS) == ["lucene", "okapi", "bm25plus", "bm25l"]
    assert Params().variant == "lucene"
    with pytest.raises(
        ConfigError, match=r"unknown BM25 variant 'bm25x'; choose one of lucene, okapi, bm25plus, bm25l"
    ):
        get_variant("bm25x")
    with pytest.raises(ConfigError, match="retrieval.k1"):
        Params(k1=-1)
    with pytest.raises(ConfigError, match="retrieval.b"):
        Params(b=-0.1)
    with pytest.raises(ConfigError, match="retrieval.delta"):
        Params(delta=float("nan"))


def build(docs, params=Params()):  # noqa: B008 - Params is frozen
    return SparseIndex.build(count_terms([np.array(d, dtype=np.int32) for d in docs], chunk=7), params)


def brute_top(index, terms, k):
    exact = index.scores(terms)
    order = np.lexsort((np.arange(index.n_docs), -exact))[:k]
    return list(order[exact[order] > 0]), exact


corpora = st.lists(st.lists(st.integers(0, 30), max_size=25), min_size=1, max_size=60)


@settings(max_examples=150, deadline=None)
@given(
    docs=corpora,
    query=st.lists(st.integers(0, 35), min_size=1, max_size=8, unique=True),
    k=st.integers(1, 12),
    variant=st.sampled_from(list(VARIANTS)),
)
def test_top_k_equals_brute_force(docs, query, k, variant):
    # The pruned float32 search must return exactly what ranking every exact score returns.
    index = build(docs, Params(variant))
    got, scores, parts = index.top_k(query, k)
    expected, exact = brute_top(index, query, k)
    assert list(got) == expected
    np.testing.assert_array_equal(scores, exact[got])
    np.testing.assert_allclose(parts.sum(axis=0), scores, rtol=1e-12)


def test_candidates_on_a_skewed_corpus():
    # One rare term and three common ones (dense rows): the lower bound of the k-th score keeps
    # few candidates for exact rescoring, and the result must agree with brute force.
    rng = np.random.default_rng(3)
    docs = [list(rng.integers(0, 20, size=40)) + ([500] if i % 97 == 0 else []) for i in range(3000)]
    index = build(docs)
    scratch = np.zeros(index.n_docs, np.float32)
    query = np.array([500, 1, 2, 3], dtype=np.int64)
    candidates = index._candidates(query, 5, scratch)
    assert index.dense.shape[0] >= 3 and (index.dense_row[[1, 2, 3]] >= 0).all()
    assert len(candidates) < 100  # only passages near the top are rescored
    assert not scratch.any()  # scratch left clean for the next question
    got, _, _ = index.top_k(list(query), 5)
    assert list(got) == brute_top(index, list(query), 5)[0]


def test_save_and_load_memory_mapped(tmp_path):
    docs = [[1, 2, 2, 3], [3, 4], [], [5, 1, 1, 1]]
    index = build(docs, Params("bm25l", 1.1, 0.6, 0.4))
    index.save(tmp_path / "idx")
    loaded = SparseIndex.load(tmp_path / "idx")
    assert loaded.params == Params("bm25l", 1.1, 0.6, 0.4)
    assert isinstance(loaded.indices, np.memmap)
    for query in ([1], [2, 3], [1, 4, 9]):
        np.testing.assert_array_equal(loaded.scores(query), index.scores(query))
    assert SparseIndex.read_info(tmp_path / "nowhere") is None
    index.save(tmp_path / "idx")  # replacing an existing index works
    assert not list(tmp_path.glob("idx.*"))  # no temporary folders left behind


def test_empty_corpus_and_empty_passages():
    empty = SparseIndex.build(count_terms([]), Params())
    assert empty.n_docs == 0
    assert empty.top_k([1, 2], 5)[0].size == 0
    assert empty.term_idf([1]) == [empty.missing_idf]
    # Passages without tokens count in N (as rank-bm25 counts them) but are never hits.
    index = build([[], [], [7]])
    assert index.n_docs == 3 and index.avgdl == pytest.approx(1 / 3)
    assert list(index.top_k([7], 5)[0]) == [2]
    assert index.top_k([], 5)[0].size == 0


def test_missing_idf_exceeds_every_corpus_idf():
    for variant in VARIANTS:
        index = build([[1], [1, 2], [3, 3, 1]], Params(variant))
        assert index.missing_idf > max(index.term_idf([1, 2, 3]))
        assert index.term_idf([None, 99]) == [index.missing_idf] * 2


def test_corpus_stats_merge():
    a = count_terms([np.array([1, 2]), np.array([2])])
    b = count_terms([np.array([5, 5, 2])])
    merged = CorpusStats.of(a).merge(CorpusStats.of(b))
    assert merged.n_docs == 3 and merged.total_len == 6
    assert merged.df.tolist() == [0, 1, 3, 0, 0, 1]


def test_shard_scores_equal_the_whole_corpus_index():
    # A shard built with the corpus-wide statistics scores its passages as the index of the whole
    # corpus does, also for a question term that occurs only in the other shard (its contribution
    # is 0: BM25 sums over the terms a passage holds, Robertson & Zaragoza 2009, eq. 3.15).
    docs = [[1, 2, 2], [2, 3], [4, 1], [3, 3, 5]]
    whole = count_terms([np.array(d) for d in docs])
    first, second = count_terms([np.array(d) for d in docs[:2]]), count_terms([np.array(d) for d in docs[2:]])
    stats = CorpusStats.of(first).merge(CorpusStats.of(second))
    index = SparseIndex.build(whole, Params())
    shard = SparseIndex.build(second, Params(), stats)
    assert (
        shard.contributions([1, 5], np.array([0, 1])).tolist() == index.contributions([1, 5], np.array([2, 3])).tolist()
    )
    ordinals, scores, parts = shard.top_k([1, 2], 2)  # term 2 is only in the first shard
    assert ordinals.tolist() == [0] and parts[1].tolist() == [0.0]
    assert scores.tolist() == index.scores([1, 2])[[2]].tolist()


def test_count_terms_counts_and_tf_dtype():
    counts = count_terms([np.array([4, 4, 1]), np.array([], dtype=np.int32), np.array([2] * 70000)], chunk=2)
    assert counts.indptr.tolist() == [0, 2, 2, 3]
    assert counts.terms.tolist() == [1, 4, 2]
    assert counts.tf.tolist() == [1, 2, 70000] and counts.tf.dtype == np.int32
    assert counts.doc_len.tolist() == [3, 0, 70000]
    assert count_terms([np.array([3, 3])]).tf.dtype == np.uint16


@pytest.mark.parametrize("variant", list(VARIANTS))
def test_top_k_equals_brute_force_on_a_zipf_corpus(variant):
    # Larger than the property test: dense rows, long posting lists, k from 1 to 20, questions of
    # up to 40 terms (float32 slack grows with the number of terms).
    rng = np.random.default_rng(5)
    docs = [list((rng.zipf(1.2, size=int(rng.integers(5, 80))) - 1) % 2000) for _ in range(4000)]
    index = build(docs, Params(variant))
    assert index.dense.shape[0] > 0
    for _ in range(60):
        query = list(np.unique(rng.integers(0, 2100, size=int(rng.integers(1, 40)))))
        k = int(rng.integers(1, 21))
        got, scores, _ = index.top_k(query, k)
        expected, exact = brute_top(index, query, k)
        assert list(got) == expected
