"""BM25 speed and memory: ours against rank-bm25 and bm25s, side by side in one run.

Synthetic corpora (invented, reproducible): passages of 50–150 term ids (mean 100) drawn from a
Zipf law (exponent 1.0) over 100,000 terms; 1,000 questions of 5–12 distinct terms drawn from the
same law. Every engine gets the same token ids:

* ours     — auditor.retrieval.bm25 count_terms + SparseIndex.build, then top_k per question (k = 10),
             variant "lucene" (and "okapi" for the rank-bm25 comparison);
* bm25s    — bm25s.BM25(method="lucene", same k1/b), retrieve(..., n_threads=0) — one thread,
             numpy backend (numba is not installed);
* rank-bm25 — BM25Okapi.get_scores + argsort on a subset of the questions (50k only: it loops
             over every passage in Python).

Each engine runs in its own child process so that its peak resident memory (ru_maxrss) is its own;
the corpus generation is part of every child, so "base" is printed next to "peak". With --million a
1,000,000-passage index is built, saved, and then memory-mapped by a fresh process that answers the
questions: its peak RSS is the index's resident cost. The same is then done through the real path
(token ids in a SQLite store, PassageIndex.load_or_build cold, then warm), each step in its own
process, as it is at 50k.

    python -m bench.bm25                 # 50k and 500k
    python -m bench.bm25 --million       # also the 1M memory check
    python -m bench.bm25 --sizes 50000   # one size

The machine is shared: figures are noisy, run it a couple of times and read the ratios.
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parent.parent

VOCAB = 100_000
K = 10
K1, B = 1.2, 0.75


def zipf_cdf(vocab: int = VOCAB, exponent: float = 1.0) -> np.ndarray:
    weights = 1.0 / np.arange(1, vocab + 1) ** exponent
    return np.cumsum(weights) / weights.sum()


def make_corpus(n_docs: int, seed: int = 7) -> tuple[np.ndarray, np.ndarray]:
    """(flat int32 term ids, passage offsets), generated a chunk at a time to stay small."""
    rng = np.random.default_rng(seed)
    cdf = zipf_cdf()
    lengths = rng.integers(50, 151, size=n_docs)
    offsets = np.zeros(n_docs + 1, np.int64)
    np.cumsum(lengths, out=offsets[1:])
    flat = np.empty(int(offsets[-1]), np.int32)
    step = 1 << 24
    for start in range(0, len(flat), step):
        end = min(start + step, len(flat))
        flat[start:end] = np.searchsorted(cdf, rng.random(end - start))
    return flat, offsets


def make_questions(count: int, seed: int = 11) -> list[list[int]]:
    rng = np.random.default_rng(seed)
    cdf = zipf_cdf()
    out = []
    for _ in range(count):
        size = int(rng.integers(5, 13))
        terms: list[int] = []
        while len(terms) < size:  # distinct terms, drawn from the corpus law
            t = int(np.searchsorted(cdf, rng.random()))
            if t not in terms:
                terms.append(t)
        out.append(terms)
    return out


def passages(flat, offsets):
    return (flat[offsets[i] : offsets[i + 1]] for i in range(len(offsets) - 1))


class Timer:
    """Wall and CPU seconds of a block: the machine is shared, and CPU time of a one-thread engine
    is far less sensitive to other processes than wall time."""

    def __enter__(self):
        self.wall, self.cpu = time.perf_counter(), time.process_time()
        return self

    def __exit__(self, *exc):
        self.wall, self.cpu = time.perf_counter() - self.wall, time.process_time() - self.cpu


def rss_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def current_rss_mb() -> float:
    with open("/proc/self/statm") as f:
        return int(f.read().split()[1]) * os.sysconf("SC_PAGE_SIZE") / 2**20


# --- workers (one per child process) ---------------------------------------------------------------


def work_ours(n: int, questions: int, save: str | None, variants: list[str]) -> dict:
    from auditor.retrieval.bm25 import Params, SparseIndex, count_terms

    flat, offsets = make_corpus(n)
    qs = make_questions(questions)
    out = {"base_mb": current_rss_mb()}
    for variant in variants:
        with Timer() as build:
            index = SparseIndex.build(count_terms(passages(flat, offsets)), Params(variant, K1, B), consume=True)
        out[f"{variant}_build_s"], out[f"{variant}_build_wall"] = build.cpu, build.wall
        with Timer() as search:
            hits = [index.top_k(q, K)[0].tolist() for q in qs]
        out[f"{variant}_qps"], out[f"{variant}_qps_wall"] = len(qs) / search.cpu, len(qs) / search.wall
        out[f"{variant}_top"] = hits
        if save and variant == variants[0]:
            started = time.perf_counter()
            index.save(Path(save))
            out["save_s"] = time.perf_counter() - started
        out["index_mb"] = (
            sum(
                getattr(index, a).nbytes
                for a in ("indptr", "indices", "weights", "tf", "doc_len", "df", "idf", "maxw", "keys")
            )
            / 2**20
        )
        del index
    out["peak_mb"] = rss_mb()
    return out


def work_load(folder: str, questions: int) -> dict:
    from auditor.retrieval.bm25 import SparseIndex

    qs = make_questions(questions)
    base = current_rss_mb()
    with Timer() as load:
        index = SparseIndex.load(Path(folder))
    with Timer() as search:
        for q in qs:
            index.top_k(q, K)
    return {
        "load_s": load.wall,
        "qps": len(qs) / search.cpu,
        "qps_wall": len(qs) / search.wall,
        "base_mb": base,
        "peak_mb": rss_mb(),
        "n_docs": index.n_docs,
    }


def work_bm25s(n: int, questions: int) -> dict:
    import bm25s

    flat, offsets = make_corpus(n)
    qs = make_questions(questions)
    base = current_rss_mb()
    vocab = {str(i): i for i in range(VOCAB)}
    vocab[""] = VOCAB  # bm25s's empty-query token
    docs = [flat[offsets[i] : offsets[i + 1]].tolist() for i in range(n)]
    with Timer() as build:
        model = bm25s.BM25(method="lucene", k1=K1, b=B)
        model.index((docs, vocab), show_progress=False)
    del docs
    with Timer() as search:
        ids, _ = model.retrieve(qs, k=K, n_threads=0, show_progress=False, backend_selection="numpy")
    return {
        "build_s": build.cpu,
        "build_wall": build.wall,
        "qps": len(qs) / search.cpu,
        "qps_wall": len(qs) / search.wall,
        "base_mb": base,
        "peak_mb": rss_mb(),
        "top": ids.tolist(),
    }


def work_rank(n: int, questions: int) -> dict:
    import rank_bm25

    flat, offsets = make_corpus(n)
    qs = make_questions(questions)
    base = current_rss_mb()
    docs = [flat[offsets[i] : offsets[i + 1]].tolist() for i in range(n)]
    with Timer() as build:
        model = rank_bm25.BM25Okapi(docs, k1=K1, b=B)
    with Timer() as search:
        top = [np.argsort(-model.get_scores(q), kind="stable")[:K].tolist() for q in qs]
    return {
        "build_s": build.cpu,
        "build_wall": build.wall,
        "qps": len(qs) / search.cpu,
        "qps_wall": len(qs) / search.wall,
        "base_mb": base,
        "peak_mb": rss_mb(),
        "top": top,
    }


def work_store(n: int, questions: int, db: str, phase: str) -> dict:
    """The real path, one phase per process: "fill" writes token ids into a SQLite store, "cold"
    runs PassageIndex.load_or_build (reads the blobs, builds, saves beside the database), "warm"
    runs it again (memory-maps the saved index) and answers the questions with search_many."""
    from auditor.config import RetrievalConfig
    from auditor.retrieval.index import PassageIndex
    from auditor.store import Store

    config = RetrievalConfig(k1=K1, b=B, stopwords="none", language="none")
    store = Store(db)
    if phase == "fill":
        flat, offsets = make_corpus(n)
        with Timer() as fill, store.transaction():
            store.db.conn.executemany("INSERT INTO terms(id, term) VALUES (?, ?)", ((i, f"w{i}") for i in range(VOCAB)))
            store.db.execute(
                "INSERT INTO documents(id, path, source_root, kind, sha256, size, mtime, first_seen, "
                "last_seen, ingested_at) VALUES (1, 'synthetic', '.', 'text', 'x', 0, '', '', '', '')"
            )
            store.db.conn.executemany(
                "INSERT INTO passages(document_id, ordinal, text, char_start, char_end, token_ids, token_count) "
                "VALUES (1, ?, '', 0, 0, ?, ?)",
                (
                    (i, flat[offsets[i] : offsets[i + 1]].astype("<i4").tobytes(), int(offsets[i + 1] - offsets[i]))
                    for i in range(n)
                ),
            )
        return {"fill_s": fill.wall}
    base = current_rss_mb()
    with Timer() as load:
        index = PassageIndex.load_or_build(store, config)
    out = {"load_s": load.wall, "rebuilt": index.rebuilt, "base_mb": base}
    if phase == "warm":
        texts = [" ".join(f"w{t}" for t in q) for q in make_questions(questions)]
        with Timer() as search:
            index.search_many(texts, k=K)
        out.update(qps=len(texts) / search.cpu, qps_wall=len(texts) / search.wall)
    out["peak_mb"] = rss_mb()
    store.close()
    return out


def store_path(n: int, questions: int, tmp: str) -> dict:
    db = str(Path(tmp) / f"bench-{n}.db")
    fill = child("store", str(n), str(questions), db, "fill")
    cold = child("store", str(n), str(questions), db, "cold")
    warm = child("store", str(n), str(questions), db, "warm")
    return {"fill": fill, "cold": cold, "warm": warm}


def print_store(n: int, r: dict) -> None:
    cold, warm = r["cold"], r["warm"]
    print(
        f"store     {n:,} passages in SQLite (fill {r['fill']['fill_s']:.1f}s); PassageIndex.load_or_build cold "
        f"{cold['load_s']:.2f}s (read token ids, build, save; peak RSS {cold['peak_mb']:.0f} MB, "
        f"rebuilt={cold['rebuilt']}), warm {warm['load_s'] * 1000:.0f} ms (memory-mapped, rebuilt={warm['rebuilt']}); "
        f"search_many {warm['qps']:.0f} q/s [{warm['qps_wall']:.0f}] with tokenizing, peak RSS {warm['peak_mb']:.0f} MB"
    )


def child(*args: str) -> dict:
    run = subprocess.run(
        [sys.executable, "-m", "bench.bm25", "--worker", *args], capture_output=True, text=True, cwd=REPO
    )
    if run.returncode != 0:
        raise SystemExit(f"worker {args} failed:\n{run.stderr}")
    return json.loads(run.stdout.strip().splitlines()[-1])


def same_sets(a: list[list[int]], b: list[list[int]]) -> int:
    return sum(set(x) == set(y) for x, y in zip(a, b))


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--sizes", default="50000,500000")
    parser.add_argument("--questions", type=int, default=1000)
    parser.add_argument("--rank-questions", type=int, default=20, help="rank-bm25 subset (50k only)")
    parser.add_argument("--million", action="store_true", help="also the 1,000,000-passage memory check")
    parser.add_argument("--worker", nargs="+", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)

    if args.worker:
        kind, *rest = args.worker
        if kind == "ours":
            n, q, save, variants = int(rest[0]), int(rest[1]), rest[2], rest[3].split(",")
            result = work_ours(n, q, None if save == "-" else save, variants)
        elif kind == "load":
            result = work_load(rest[0], int(rest[1]))
        elif kind == "store":
            result = work_store(int(rest[0]), int(rest[1]), rest[2], rest[3])
        elif kind == "bm25s":
            result = work_bm25s(int(rest[0]), int(rest[1]))
        else:
            result = work_rank(int(rest[0]), int(rest[1]))
        print(json.dumps(result))
        return 0

    print(
        f"Zipf(1.0) over {VOCAB:,} terms, passages of 50–150 terms, {args.questions} questions of 5–12 terms, "
        f"k={K}, k1={K1}, b={B}; load average {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores"
    )
    print("queries/s and build times are CPU seconds of the (one-thread) engine; wall-clock q/s in brackets")
    for n in (int(s) for s in args.sizes.split(",") if s):
        print(f"\n== {n:,} passages")
        variants = "lucene,okapi" if n <= 50_000 else "lucene"
        ours = child("ours", str(n), str(args.questions), "-", variants)
        print(
            f"ours      build {ours['lucene_build_s']:7.2f}s  {ours['lucene_qps']:9.1f} q/s "
            f"[{ours['lucene_qps_wall']:.1f}]  index {ours['index_mb']:.0f} MB  peak RSS {ours['peak_mb']:.0f} MB "
            f"(corpus alone {ours['base_mb']:.0f} MB)"
        )
        theirs = child("bm25s", str(n), str(args.questions))
        print(
            f"bm25s     build {theirs['build_s']:7.2f}s  {theirs['qps']:9.1f} q/s [{theirs['qps_wall']:.1f}]  "
            f"peak RSS {theirs['peak_mb']:.0f} MB (corpus alone {theirs['base_mb']:.0f} MB)"
        )
        agree = same_sets(ours["lucene_top"], theirs["top"])
        print(
            f"  ours/bm25s: {ours['lucene_qps'] / theirs['qps']:.2f}x queries/s "
            f"(wall {ours['lucene_qps_wall'] / theirs['qps_wall']:.2f}x), "
            f"build {theirs['build_s'] / ours['lucene_build_s']:.1f}x faster; "
            f"top-{K} sets equal for {agree}/{args.questions} questions (bm25s ranks in float32: near-ties differ)"
        )
        if n <= 50_000:
            rank = child("rank", str(n), str(args.rank_questions))
            print(
                f"rank-bm25 build {rank['build_s']:7.2f}s  {rank['qps']:9.2f} q/s [{rank['qps_wall']:.2f}]  "
                f"peak RSS {rank['peak_mb']:.0f} MB ({args.rank_questions} questions)"
            )
            agree = same_sets(ours["okapi_top"][: args.rank_questions], rank["top"])
            print(
                f"  ours(okapi)/rank-bm25 (BM25Okapi): {ours['okapi_qps'] / rank['qps']:.0f}x queries/s "
                f"(ours okapi {ours['okapi_qps']:.1f} q/s); top-{K} sets equal for {agree}/{args.rank_questions}"
            )
            with tempfile.TemporaryDirectory() as tmp:
                print_store(n, store_path(n, args.questions, tmp))
    if args.million:
        n = 1_000_000
        print(f"\n== {n:,} passages: build, save, then memory-map in a fresh process")
        with tempfile.TemporaryDirectory(dir=REPO.parent if os.access(REPO.parent, os.W_OK) else None) as tmp:
            folder = str(Path(tmp) / "index")
            built = child("ours", str(n), str(args.questions), folder, "lucene")
            print(
                f"build {built['lucene_build_s']:.1f}s, save {built['save_s']:.1f}s, {built['lucene_qps']:.1f} q/s "
                f"[{built['lucene_qps_wall']:.1f}], "
                f"index {built['index_mb']:.0f} MB, build peak RSS {built['peak_mb']:.0f} MB "
                f"(corpus alone {built['base_mb']:.0f} MB)"
            )
            loaded = child("load", folder, str(args.questions))
            verdict = "within" if loaded["peak_mb"] <= 2048 else "OVER"
            print(
                f"loaded (mmap) in {loaded['load_s'] * 1000:.0f} ms, {loaded['qps']:.1f} q/s [{loaded['qps_wall']:.1f}] "
                f"over {loaded['n_docs']:,}; "
                f"peak RSS {loaded['peak_mb']:.0f} MB: {verdict} the 2 GB target"
            )
            print_store(n, store_path(n, args.questions, tmp))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
