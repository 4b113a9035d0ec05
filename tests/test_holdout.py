"""SciFact hold-out (open dataset, ../shared/data/scifact/README.md): the support score must separate
claims whose cited abstracts were hidden from claims whose evidence is present.

Skipped when the dataset is absent. One seeded split of the README's protocol through our own store,
retrieval and judge (bench/holdout.py prints the figures over ten splits).
"""

import statistics
from pathlib import Path

import pytest

from auditor.judgement import support as judge
from auditor.retrieval.tokenize import Tokenizer
from bench import holdout

REPO = Path(__file__).resolve().parent.parent
SCIFACT = REPO.parent / "shared" / "data" / "scifact" / "scifact.zip"
pytestmark = pytest.mark.skipif(
    not SCIFACT.is_file(), reason=f"SciFact not found at {SCIFACT} (../shared/data/scifact/ beside the checkout)"
)


@pytest.fixture(scope="module")
def scifact(tmp_path_factory):
    bench = holdout
    docs, claims = bench.load_scifact(SCIFACT)
    store = bench.build_store(Path(tmp_path_factory.mktemp("scifact")) / "scifact.db", docs, Tokenizer())
    yield bench, store, docs, claims
    store.close()


def test_dataset_matches_the_readme(scifact):
    bench, _, docs, claims = scifact
    # Counted in the README: 5,183 abstracts and 300 validation claims whose cited documents are all
    # in the corpus.
    assert len(docs) == 5183 and len(claims) == 300
    assert all(d in docs for _, cited in claims.values() for d in cited)
    hidden, labels = bench.holdout_split(claims, 0)
    assert sum(labels.values()) == 150  # the hidden half
    assert all(not set(claims[c][1]) & hidden for c, y in labels.items() if y == 0)


def test_support_separates_hidden_evidence_claims(scifact):
    bench, store, docs, claims = scifact
    rows = [bench.evaluate(store, docs, claims, seed=seed, k=5) for seed in range(4)]
    # Reference points: plain lexical scores 0.63-0.66; a dense sentence-embedding model
    # (all-MiniLM-L6-v2, run by bench/dense_baseline.py) 0.674 on five of these splits; the support
    # score 0.725. Four seeded splits of the README's protocol (the bench prints ten: mean 0.725, sd 0.03).
    for row in rows:
        assert 0.60 <= row["top1_bm25_raw"] <= 0.73  # the raw score: the lexical range in bench/README.md
        assert row["combined"] >= 0.69
        assert row["combined"] - row["top1_bm25_raw"] >= 0.03
        for name in judge.SIGNAL_WEIGHTS:  # every signal is informative on its own
            assert row[f"only {name}"] > 0.65, name
    assert statistics.mean(r["combined"] for r in rows) >= 0.72
    assert all(r["positives"] == 150 and r["negatives"] > 100 for r in rows)
