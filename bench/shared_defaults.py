"""How the shipped support defaults fare on several corpora: precision and recall of the gap verdict.

One knowledge base's tuning must not be every team's default, so the shipped threshold
(config.SupportConfig) and the judge's signal weights are measured on three corpora at once:

* demo      — the Fernhollow help centre (fixtures/demo): its 43 questions (gap = expected verdict
              gap) and its 37 labelled paraphrases (labels.csv);
* scifact   — the SciFact hold-out (../shared/data/scifact): claims whose cited abstracts were hidden
              are the gaps; ten seeded splits pooled;
* python    — the Python 3.11 manual from Debian's python3.11-doc package (tutorial, library, howto,
              faq, reference, using, glossary), with 67 questions we wrote and labelled
              (bench/data/python_manual_questions.csv): direct questions, paraphrases, and questions
              about features that manual lacks (later versions, third-party packages).

The gap verdict fires when no retrieved passage reaches the threshold, i.e. when the question's best
passage support is below it. Printed per corpus: ROC AUC, precision / recall / F1 at the shipped
threshold, the corpus' own best-F1 threshold, and a sweep of F1 across thresholds.

    python -m bench.shared_defaults [--seeds 10] [--no-python]

The Python manual is fetched once with `apt-get download python3.11-doc` into
~/.cache/corpus-auditor/ (outside the repository) and ingested there with our own ingest.
"""

from __future__ import annotations

import argparse
import csv
import shutil
import statistics
import subprocess
import tempfile
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent

CACHE = Path.home() / ".cache" / "corpus-auditor"
PYTHON_DOC = CACHE / "extract" / "usr" / "share" / "doc" / "python3.11" / "html"
PYTHON_QUESTIONS = REPO / "bench" / "data" / "python_manual_questions.csv"
PYTHON_PARTS = [
    "tutorial/*.html",
    "library/*.html",
    "howto/*.html",
    "faq/*.html",
    "reference/*.html",
    "using/*.html",
    "glossary.html",
]
SWEEP = [round(0.25 + 0.05 * i, 2) for i in range(9)]  # 0.25 .. 0.65


def fetch_python_manual() -> Path | None:
    """The extracted HTML manual, downloading the Debian package into the cache when needed."""
    if PYTHON_DOC.is_dir():
        return PYTHON_DOC
    CACHE.mkdir(parents=True, exist_ok=True)
    try:
        subprocess.run(["apt-get", "download", "python3.11-doc"], cwd=CACHE, check=True, capture_output=True)
        deb = sorted(CACHE.glob("python3.11-doc_*.deb"))[-1]
        subprocess.run(["dpkg-deb", "-x", str(deb), str(CACHE / "extract")], check=True, capture_output=True)
    except (OSError, subprocess.CalledProcessError, IndexError) as exc:
        print(f"python manual: cannot fetch python3.11-doc ({exc}); skipped")
        return None
    return PYTHON_DOC if PYTHON_DOC.is_dir() else None


def ingested_store(config_text: str, folder: Path):
    """Write a config into `folder`, ingest its corpus (incrementally) and return (store, config)."""
    from auditor.config import load_config
    from auditor.ingest.pipeline import ingest_corpus
    from auditor.store import Store

    folder.mkdir(parents=True, exist_ok=True)
    (folder / "audit.toml").write_text(config_text, encoding="utf-8")
    config = load_config(folder / "audit.toml", env={})
    store = Store(config.database)
    ingest_corpus(store, config, jobs=2)
    return store, config


def supports_of(store, config, questions: list[str]) -> list[float]:
    from auditor.judgement.audit import question_support
    from auditor.retrieval.index import PassageIndex

    index = PassageIndex.load_or_build(store, config.retrieval)
    return question_support(store, index, questions, config.retrieval.top_k)


# --- the corpora ----------------------------------------------------------------------------------


def demo_corpus(tmp: Path) -> dict:
    target = tmp / "demo"
    shutil.copytree(REPO / "fixtures" / "demo", target)
    text = (target / "audit.toml").read_text(encoding="utf-8")
    text = text.replace("../../reports/demo/auditor.db", "work/auditor.db").replace("../../reports/demo", "work/report")
    store, config = ingested_store(text, target)
    with open(target / "questions.csv", newline="", encoding="utf-8") as f:
        questions = list(csv.DictReader(f))
    with open(target / "expected.csv", newline="", encoding="utf-8") as f:
        expected = {row["id"]: row["verdict"] for row in csv.DictReader(f)}
    with open(target / "labels.csv", newline="", encoding="utf-8") as f:
        labels = list(csv.DictReader(f))
    texts = [q["question"] for q in questions] + [l["question"] for l in labels]
    gaps = [expected[q["id"]] == "gap" for q in questions] + [l["answerable"].strip().lower() == "no" for l in labels]
    supports = supports_of(store, config, texts)
    store.close()
    return {
        "name": "demo",
        "supports": supports,
        "gaps": gaps,
        "detail": f"{len(questions)} questions + {len(labels)} labelled paraphrases",
    }


def scifact_corpus(tmp: Path, seeds: int, k: int) -> dict | None:
    from auditor.retrieval.index import PassageIndex
    from auditor.retrieval.tokenize import Tokenizer
    from bench import holdout

    if not holdout.SCIFACT.is_file():
        print("scifact: dataset absent; skipped")
        return None
    docs, claims = holdout.load_scifact()
    store = holdout.build_store(tmp / "scifact.db", docs, Tokenizer())
    supports, gaps = [], []
    for seed in range(seeds):
        hidden, labels = holdout.holdout_split(claims, seed)
        holdout.set_hidden(store, hidden)
        index = PassageIndex.load_or_build(store, holdout.RetrievalConfig(), save=False)
        ids = sorted(labels)
        judged = holdout.claim_signals(store, index, [claims[c][0] for c in ids], k)
        supports += [max([p.support for p in items] or [0.0]) for items in judged]
        gaps += [labels[c] == 1 for c in ids]
    store.close()
    return {
        "name": "scifact",
        "supports": supports,
        "gaps": gaps,
        "detail": f"hold-out, {seeds} splits pooled, {len(gaps) // seeds} claims per split",
    }


def python_corpus() -> dict | None:
    html = fetch_python_manual()
    if html is None:
        return None
    parts = ", ".join(f'"{p}"' for p in PYTHON_PARTS)
    text = (
        f'database = "auditor.db"\nas_of = 2026-12-01\n[corpus]\npaths = ["{html}"]\ninclude = [{parts}]\n'
        f"[freshness]\nhorizon_days = 100000\n"
    )
    started = time.perf_counter()
    store, config = ingested_store(text, CACHE / "pydoc")
    took = time.perf_counter() - started
    with open(PYTHON_QUESTIONS, newline="", encoding="utf-8") as f:
        rows = list(csv.DictReader(f))
    supports = supports_of(store, config, [r["question"] for r in rows])
    passages = store.query("SELECT count(*) AS n FROM passages")[0]["n"]
    store.close()
    kinds = {}
    for r, s in zip(rows, supports):
        kinds.setdefault(r["note"] if r["answerable"] == "yes" else "not answerable", []).append(s)
    return {
        "name": "python",
        "supports": supports,
        "gaps": [r["answerable"] == "no" for r in rows],
        "detail": f"{len(rows)} questions, {passages} passages (ingest/update {took:.0f} s)",
        "groups": {k: statistics.mean(v) for k, v in kinds.items()},
        "rows": list(zip(rows, supports)),
    }


# --- report ---------------------------------------------------------------------------------------


def report(corpora: list[dict], threshold: float, show_questions: bool) -> None:
    from auditor.judgement.calibrate import choose_threshold, gap_metrics, roc_auc
    from auditor.judgement.support import ANSWER_TYPE_PENALTY, SIGNAL_WEIGHTS

    print(
        f"shared defaults: support threshold {threshold}, signal weights {SIGNAL_WEIGHTS}, "
        f"answer-type penalty {ANSWER_TYPE_PENALTY}"
    )
    print(
        f"{'corpus':8s} {'n':>5} {'gaps':>5} {'AUC':>6} {'prec':>6} {'recall':>6} {'F1':>6}   "
        f"{'own best t':>10} {'its F1':>6}  detail"
    )
    for c in corpora:
        s, g = c["supports"], c["gaps"]
        auc = roc_auc([-x for x, y in zip(s, g) if y], [-x for x, y in zip(s, g) if not y])
        m = gap_metrics(s, g, threshold)
        best, _ = choose_threshold(s, g)
        print(
            f"{c['name']:8s} {len(s):5d} {sum(g):5d} {auc:6.3f} {m['precision']:6.3f} {m['recall']:6.3f} "
            f"{m['f1']:6.3f}   {best['threshold']:10.3f} {best['f1']:6.3f}  {c['detail']}"
        )
    print("\nF1 of the gap verdict across thresholds")
    print(f"{'t':>5} " + " ".join(f"{c['name']:>8}" for c in corpora) + f" {'mean':>8} {'min':>8}")
    for t in sorted(set(SWEEP) | {threshold}):
        f1s = [gap_metrics(c["supports"], c["gaps"], t)["f1"] for c in corpora]
        mark = "  <- shipped" if t == threshold else ""
        print(f"{t:5.2f} " + " ".join(f"{f:8.3f}" for f in f1s) + f" {statistics.mean(f1s):8.3f} {min(f1s):8.3f}{mark}")
    for c in corpora:
        if c.get("groups"):
            print(
                f"\n{c['name']}: mean support by kind of question: "
                + ", ".join(f"{k} {v:.3f}" for k, v in sorted(c["groups"].items()))
            )
        if show_questions and c.get("rows"):
            for row, s in sorted(c["rows"], key=lambda x: x[1]):
                verdict = "gap" if s < threshold else "   "
                print(f"  {s:.3f} {verdict} {row['answerable']:3s} {row['id']} {row['question']}")


def main(argv=None) -> int:
    from auditor.config import SupportConfig

    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--seeds", type=int, default=10, help="SciFact hold-out splits (default 10)")
    parser.add_argument("--top-k", type=int, default=5)
    parser.add_argument("--no-python", action="store_true", help="skip the Python manual")
    parser.add_argument("--questions", action="store_true", help="list the Python manual questions by support")
    args = parser.parse_args(argv)
    started = time.perf_counter()
    with tempfile.TemporaryDirectory() as tmp:
        corpora = [demo_corpus(Path(tmp))]
        for extra in (scifact_corpus(Path(tmp), args.seeds, args.top_k), None if args.no_python else python_corpus()):
            if extra is not None:
                corpora.append(extra)
    report(corpora, SupportConfig().threshold, args.questions)
    import resource

    print(
        f"\ntime {time.perf_counter() - started:.0f} s; peak RSS "
        f"{resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f} MiB (shared 2-core machine: noisy)"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
