"""SciFact hold-out: how well the support score separates hidden-evidence claims from the others.

Protocol (../shared/data/scifact/README.md): hide the cited abstracts of a random half of the 300
validation claims, audit all claims against the rest, and measure the ROC AUC of "gap" (evidence
hidden) against the support score; claims whose cited abstracts overlap the hidden set without being
in the hidden half are left out. The split is random, so the figure is the mean (and spread) over
several seeded splits.

Runs our code end to end: abstracts go into an audit store through the schema (one passage per
abstract: title line, then one line per abstract sentence), `retrieval.PassageIndex` retrieves,
`judge.passage_support` scores. Printed: AUC per signal (the max over the top-k passages of that
signal alone), the combined support, the combination without each signal (what it contributes), and
the plain top-1 BM25 score (0.63-0.66 when first measured). With --tune, the signal weights and the
answer-type penalty are chosen on seeded splits of the 809 *training* claims (same protocol, same
corpus) and only then measured on the validation claims, so that row is out of sample; the shipped
weights were chosen with the validation claims in view (bench/shared_defaults.py), so the
"combined" row is in-sample. The dense baseline runs for real in bench/dense_baseline.py.

    python -m bench.holdout [--seeds 10] [--top-k 5] [--tune]
"""

from __future__ import annotations

import argparse
import csv
import io
import random
import re
import statistics
import tempfile
import time
import zipfile
from pathlib import Path

from auditor.config import RetrievalConfig
from auditor.judgement import support as judge
from auditor.judgement.calibrate import roc_auc
from auditor.retrieval.index import PassageIndex
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import Store

REPO = Path(__file__).resolve().parent.parent

SCIFACT = REPO.parent / "shared" / "data" / "scifact" / "scifact.zip"
_ITEM = re.compile(r"(['\"])(.*?)\1(?=\s|\]|,)", re.S)


# --- data -----------------------------------------------------------------------------------------


def load_scifact(
    path: Path = SCIFACT, split: str = "validation"
) -> tuple[dict[int, tuple[str, list[str]]], dict[int, tuple[str, list[int]]]]:
    """(abstracts {doc_id: (title, sentences)}, claims of `split` {id: (claim, cited doc ids)})."""
    csv.field_size_limit(1 << 30)
    with zipfile.ZipFile(path) as archive:

        def rows(name):
            member = next(n for n in archive.namelist() if n.endswith(name))
            return csv.DictReader(io.TextIOWrapper(archive.open(member), encoding="utf-8"))

        docs = {
            int(r["doc_id"]): (r["title"], [m.group(2) for m in _ITEM.finditer(r["abstract"])])
            for r in rows("corpus_train.csv")
        }
        claims: dict[int, tuple[str, list[int]]] = {}
        for r in rows(f"claims_{split}.csv"):
            cited = [int(x) for x in re.findall(r"\d+", r["cited_doc_ids"])]
            claims.setdefault(int(r["id"]), (r["claim"], cited))
    return docs, claims


def holdout_split(claims: dict[int, tuple[str, list[int]]], seed: int) -> tuple[set[int], dict[int, int]]:
    """(hidden doc ids, {claim id: 1 when its evidence is hidden, 0 when all of it is present})."""
    ids = sorted(claims)
    hidden_claims = set(random.Random(seed).sample(ids, len(ids) // 2))
    hidden = {d for c in hidden_claims for d in claims[c][1]}
    labels = {}
    for c in ids:
        if c in hidden_claims:
            labels[c] = 1
        elif not set(claims[c][1]) & hidden:
            labels[c] = 0
    return hidden, labels


def build_store(path: Path, docs: dict[int, tuple[str, list[str]]], tokenizer: Tokenizer) -> Store:
    """An audit store holding one active document and one passage per abstract."""
    store = Store(path)
    with store.transaction():
        vocabulary = Vocabulary(store)
        store.set_meta("tokenizer", tokenizer.fingerprint())
        for doc_id, (title, sentences) in docs.items():
            text = title + "\n" + "\n".join(sentences)
            tokens = tokenizer.tokenize(text)
            row = store.db.execute(
                "INSERT INTO documents (path, source_root, kind, sha256, size, mtime, title, status, first_seen, "
                "last_seen, ingested_at) VALUES (?, 'scifact', 'text', ?, ?, '2020-01-01', ?, 'active', 'x', 'x', 'x')",
                [f"scifact/{doc_id}", str(doc_id), len(text), title],
            ).lastrowid
            store.db.execute(
                "INSERT INTO passages (document_id, ordinal, text, heading_path, char_start, char_end, token_ids, "
                "token_count) VALUES (?, 0, ?, '[]', 0, ?, ?, ?)",
                [row, text, len(text), vocabulary.ids(tokens).tobytes(), len(tokens)],
            )
    return store


def set_hidden(store: Store, hidden: set[int]) -> None:
    """Hide the given abstracts (status 'removed': kept, not searched)."""
    with store.transaction():
        store.db.execute("UPDATE documents SET status = 'active'")
        store.db.conn.executemany(
            "UPDATE documents SET status = 'removed' WHERE path = ?", [(f"scifact/{d}",) for d in hidden]
        )


# --- measuring ------------------------------------------------------------------------------------


def claim_signals(store: Store, index: PassageIndex, texts: list[str], k: int) -> list[list[judge.PassageSupport]]:
    """The judged top-k passages of each claim."""
    found = index.search_many(texts, k)
    ids = sorted({h.passage_id for r in found for h in r.hits})
    passages = {}
    for i in range(0, len(ids), 500):
        chunk = ids[i : i + 500]
        for pid, text in store.db.execute(
            f"SELECT id, text FROM passages WHERE id IN ({','.join('?' * len(chunk))})", chunk
        ):
            passages[pid] = text
    out = []
    for text, result in zip(texts, found):
        out.append(
            [
                judge.passage_support(
                    text,
                    passages[h.passage_id],
                    score=h.score,
                    max_score=result.max_score,
                    idf=result.idf,
                    tokenize=index.tokenizer.tokenize,
                )
                for h in result.hits
            ]
        )
    return out


def scores_for(judged: list[list[judge.PassageSupport]], weights: dict[str, float] | None, penalty: bool = True):
    """Question support (max over passages) from the signals, with other weights when given."""
    out = []
    for items in judged:
        best = 0.0
        for p in items:
            value = judge.combine(p.signals, weights) if weights is not None else p.support
            if weights is not None and penalty and not p.answer_type_found:
                value *= judge.ANSWER_TYPE_PENALTY
            best = max(best, value)
        out.append(best)
    return out


def auc_of(scores: list[float], labels: list[int]) -> float:
    """ROC AUC of the gap label against *low* support."""
    return roc_auc([-s for s, y in zip(scores, labels) if y], [-s for s, y in zip(scores, labels) if not y])


def evaluate(store: Store, docs, claims, seed: int, k: int, retrieval: RetrievalConfig | None = None) -> dict:
    """AUCs of one seeded split: per signal, combined, and each leave-one-out combination."""
    hidden, labels = holdout_split(claims, seed)
    set_hidden(store, hidden)
    index = PassageIndex.load_or_build(store, retrieval or RetrievalConfig(), save=False)
    ids = sorted(labels)
    judged = claim_signals(store, index, [claims[c][0] for c in ids], k)
    y = [labels[c] for c in ids]
    top1 = [r.hits[0].score if r.hits else 0.0 for r in index.search_many([claims[c][0] for c in ids], 1)]
    row = {
        "positives": sum(y),
        "negatives": len(y) - sum(y),
        "combined": auc_of(scores_for(judged, None), y),
        "top1_bm25_raw": auc_of(top1, y),
    }
    for name in judge.SIGNAL_WEIGHTS:
        row[f"only {name}"] = auc_of(scores_for(judged, {name: 1.0}, penalty=False), y)
        rest = {n: w for n, w in judge.SIGNAL_WEIGHTS.items() if n != name}
        row[f"without {name}"] = auc_of(scores_for(judged, rest), y)
    row["without answer types"] = auc_of(scores_for(judged, dict(judge.SIGNAL_WEIGHTS), penalty=False), y)
    return row


def split_signals(store: Store, claims, seed: int, k: int) -> tuple[list[list[judge.PassageSupport]], list[int]]:
    """The judged top-k passages and the gap labels of one seeded split."""
    hidden, labels = holdout_split(claims, seed)
    set_hidden(store, hidden)
    index = PassageIndex.load_or_build(store, RetrievalConfig(), save=False)
    ids = sorted(labels)
    return claim_signals(store, index, [claims[c][0] for c in ids], k), [labels[c] for c in ids]


def weight_grid(step: float = 0.1) -> list[dict[str, float]]:
    """Every convex combination of the signals on a grid of `step` (286 for four signals at 0.1)."""
    names = list(judge.SIGNAL_WEIGHTS)
    n = round(1 / step)
    out = []

    def fill(prefix: list[int], left: int) -> None:
        if len(prefix) == len(names) - 1:
            out.append({name: round(v * step, 4) for name, v in zip(names, prefix + [left]) if v})
            return
        for v in range(left + 1):
            fill(prefix + [v], left - v)

    fill([], n)
    return out


def tune_on_train(store: Store, docs, seeds: int, k: int) -> tuple[dict[str, float], float, float]:
    """(weights, answer-type penalty, mean train AUC): the grid point with the best mean AUC over
    seeded splits of the training claims."""
    _, train = load_scifact(split="train")
    train = {c: v for c, v in train.items() if v[1] and all(d in docs for d in v[1])}
    splits = [split_signals(store, train, seed, k) for seed in range(seeds)]
    best = (-1.0, {}, 1.0)
    for penalty in PENALTY_GRID:
        for weights in weight_grid():
            aucs = [auc_of(_scores(judged, weights, penalty), y) for judged, y in splits]
            mean = statistics.mean(aucs)
            if mean > best[0]:
                best = (mean, weights, penalty)
    return best[1], best[2], best[0]


PENALTY_GRID = (0.8, 0.9, 1.0)


def _scores(judged, weights: dict[str, float], penalty: float) -> list[float]:
    return [
        max((judge.combine(p.signals, weights) * (1.0 if p.answer_type_found else penalty) for p in items), default=0.0)
        for items in judged
    ]


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--seeds", type=int, default=10)
    parser.add_argument("--top-k", type=int, default=5)
    parser.add_argument(
        "--tune", action="store_true", help="choose weights and penalty on the training claims, report on validation"
    )
    args = parser.parse_args(argv)
    if not SCIFACT.is_file():
        print(f"SciFact not found at {SCIFACT}; nothing to measure")
        return 0
    import resource

    started = time.perf_counter()
    docs, claims = load_scifact()
    tokenizer = Tokenizer()
    with tempfile.TemporaryDirectory() as tmp:
        store = build_store(Path(tmp) / "scifact.db", docs, tokenizer)
        built = time.perf_counter()
        tuned = tune_on_train(store, docs, args.seeds, args.top_k) if args.tune else None
        rows = [evaluate(store, docs, claims, seed, args.top_k) for seed in range(args.seeds)]
        if tuned is not None:
            weights, penalty, train_auc = tuned
            for seed, row in enumerate(rows):
                judged, y = split_signals(store, claims, seed, args.top_k)
                row["tuned on train claims"] = auc_of(_scores(judged, weights, penalty), y)
        store.close()
    finished = time.perf_counter()
    print(
        f"SciFact hold-out: {len(docs)} abstracts, {len(claims)} claims, {args.seeds} seeded splits, "
        f"top-{args.top_k}; per split {rows[0]['positives']} hidden-evidence claims vs {rows[0]['negatives']} others (seed 0)"
    )
    print(f"weights {judge.SIGNAL_WEIGHTS}, answer-type penalty {judge.ANSWER_TYPE_PENALTY}")
    print(f"{'ROC AUC of gap vs low support':34s} {'mean':>6} {'sd':>6} {'min':>6} {'max':>6}")
    for key in [k for k in rows[0] if k not in ("positives", "negatives")]:
        values = [r[key] for r in rows]
        sd = statistics.stdev(values) if len(values) > 1 else 0.0
        print(f"{key:34s} {statistics.mean(values):6.3f} {sd:6.3f} {min(values):6.3f} {max(values):6.3f}")
    if tuned is not None:
        print(
            f"tuned on {args.seeds} splits of the training claims: weights {tuned[0]}, penalty {tuned[1]}, "
            f"train AUC {tuned[2]:.3f}; the row 'tuned on train claims' is its validation AUC"
        )
    print("dense baseline: python bench/dense_baseline.py (all-MiniLM-L6-v2, same splits); target >= 0.75")
    print(
        f"time: store {built - started:.1f} s, {args.seeds} splits {finished - built:.1f} s; "
        f"peak RSS {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f} MiB"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
