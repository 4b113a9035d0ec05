"""Do the verdicts transfer? The gap verdict on real documentation it was never tuned on.

Three corpora from Debian documentation packages, each of a different style, with questions we wrote
and labelled before running anything on them (bench/data/, see bench/README.md for the dates):

* faq    — `debian-faq`: the Debian FAQ, 20 HTML chapters of short question-and-answer sections
           (an end-user help set); bench/data/debian_faq_questions.csv
* gitref — `git-doc`: git's reference pages, one HTML page per command or concept, plus guides
           (a reference manual); bench/data/git_reference_questions.csv
* guide  — `debian-reference-en`: the Debian Reference, 14 long HTML chapters (a guide);
           bench/data/debian_reference_questions.csv

Each corpus is ingested with the project's own pipeline (`ingest_corpus`) into a store under the
work folder, searched with `PassageIndex`, and every question is judged with the audit's own
functions (`auditor.judgement.verdicts.assess`). Printed per corpus: gap precision and recall against
the labels, ROC AUC of support for "gap", and how often the answering page (expected_document) is
among the evidence of an answerable question. On gitref also the remove-the-answering-page protocol:
for a seeded half of the answerable questions the pages that answer them are hidden (the rest of the
corpus stays), those questions are the gaps, the other half the answerable ones.

Leave-one-corpus-out: the threshold used for a corpus is the one chosen on the other two (pooled:
the highest recall at precision >= 0.9, else the best F1), so every figure printed as "left out" is
out of sample. "shipped" rows use the configured default threshold as it is; "probe" rows use the
label-free corpus probe (auditor.judgement.probe), which needs no labels at all.

    python -m bench.transfer DATA [--work DIR] [--corpora faq,gitref,guide] [--seeds 5]

DATA holds one folder per corpus (faq/, gitref/, guide/) with the unpacked HTML; it can also be given
as $AUDITOR_EVAL_DATA. How to make it, with the commands, is in bench/README.md. Without it the bench
says so and exits 0.
"""

from __future__ import annotations

import argparse
import csv
import os
import time
import warnings
from dataclasses import dataclass
from pathlib import Path

from auditor.config import Config, load_config
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement import verdicts
from auditor.judgement.calibrate import choose_threshold, gap_metrics, roc_auc
from auditor.judgement.conflicts import Conflict, compared_type, find_conflict
from auditor.judgement.probe import SCALE, ProbeOutcome, ProbeSettings, place_threshold, run_probe
from auditor.judgement.verdicts import Assessment, assess_questions
from auditor.retrieval import index as retrieval_index
from auditor.retrieval.index import PassageIndex
from auditor.store import Store

REPO = Path(__file__).resolve().parent.parent

DATA = REPO / "bench" / "data"

# The Debian FAQ is XHTML; the HTML parser reads it correctly, so the parser's advice is noise here.
warnings.filterwarnings("ignore", message=".*looks like you're using an HTML parser.*")


@dataclass(frozen=True)
class Corpus:
    name: str
    style: str
    questions: Path
    include: tuple[str, ...] = ("**/*.html",)


CORPORA = {
    "faq": Corpus("faq", "end-user help (Debian FAQ)", DATA / "debian_faq_questions.csv"),
    "gitref": Corpus("gitref", "reference manual (git-doc pages)", DATA / "git_reference_questions.csv"),
    "guide": Corpus("guide", "guide (Debian Reference)", DATA / "debian_reference_questions.csv"),
}
TOP_K: int | None = None  # evidence depth, when the command line replaces the config's
SCALE_GRID = tuple(round(0.4 + 0.025 * i, 3) for i in range(13))  # 0.40 .. 0.70
TARGET_PRECISION = 0.9
VALUE_QUESTIONS = DATA / "value_questions.csv"


def read_questions(path: Path) -> list[dict]:
    with open(path, newline="", encoding="utf-8") as f:
        rows = list(csv.DictReader(f))
    for row in rows:
        row["gap"] = row["answerable"].strip().lower() == "no"
        row["expected"] = {d.strip() for d in (row.get("expected_document") or "").split(";") if d.strip()}
    return rows


def open_corpus(corpus: Corpus, data: Path, work: Path) -> tuple[Store, Config]:
    """Ingest (incrementally) the corpus folder into a store under `work`; returns (store, config)."""
    folder = work / corpus.name
    folder.mkdir(parents=True, exist_ok=True)
    include = ", ".join(f'"{g}"' for g in corpus.include)
    (folder / "audit.toml").write_text(
        f'database = "auditor.db"\n[corpus]\npaths = ["{(data / corpus.name).resolve()}"]\ninclude = [{include}]\n',
        encoding="utf-8",
    )
    config = load_config(folder / "audit.toml", env={})
    store = Store(config.database)
    ingest_corpus(store, config, jobs=2)
    return store, config


def page_of(path: str) -> str:
    """The file name of a stored document path (labels name pages by file name)."""
    return path.rsplit("/", 1)[-1]


def figures(assessed: list[Assessment], rows: list[dict], threshold: float) -> dict:
    """Gap precision / recall at `threshold`, AUC, and the answering page among the evidence."""
    supports = [a.support for a in assessed]
    gaps = [r["gap"] for r in rows]
    verdict_gap = [a.is_gap(threshold) for a in assessed]
    tp = sum(1 for v, g in zip(verdict_gap, gaps) if v and g)
    fp = sum(1 for v, g in zip(verdict_gap, gaps) if v and not g)
    fn = sum(1 for v, g in zip(verdict_gap, gaps) if not v and g)
    answerable = [(a, r) for a, r in zip(assessed, rows) if not r["gap"] and r["expected"]]
    found = sum(1 for a, r in answerable if {page_of(d) for d in a.documents} & r["expected"])
    return {
        "threshold": threshold,
        "precision": tp / (tp + fp) if tp + fp else 1.0,
        "recall": tp / (tp + fn) if tp + fn else 0.0,
        "auc": roc_auc([-s for s, g in zip(supports, gaps) if g], [-s for s, g in zip(supports, gaps) if not g]),
        "page": found / len(answerable) if answerable else float("nan"),
        "n": len(rows),
        "gaps": sum(gaps),
    }


def pick_threshold(pooled: list[tuple[Assessment, bool]]) -> float:
    """The threshold chosen on other corpora: highest recall at precision >= TARGET_PRECISION."""
    supports = [a.support for a, _ in pooled]
    chosen, _ = choose_threshold(supports, [g for _, g in pooled], target_precision=TARGET_PRECISION)
    return float(chosen["threshold"])


def remove_protocol(
    store: Store, index: PassageIndex, config: Config, rows: list[dict]
) -> list[tuple[Assessment, bool]]:
    """Each answerable question once with its answering pages hidden (a gap) and once as it is."""
    by_page: dict[str, set[str]] = {}
    for r in store.query("SELECT path FROM documents WHERE status = 'active'"):
        by_page.setdefault(page_of(r["path"]), set()).add(r["path"])
    answerable = [r for r in rows if not r["gap"] and r["expected"]]
    texts = [r["question"] for r in answerable]
    hidden = [{p for d in r["expected"] for p in by_page.get(d, ())} for r in answerable]
    k = TOP_K or config.retrieval.top_k
    gone = assess_questions(store, index, texts, k, hidden=hidden)
    present = assess_questions(store, index, texts, k)
    row = lambda text, gap: {"question": text, "gap": gap, "expected": set()}  # noqa: E731
    return [(a, row(t, True)) for a, t in zip(gone, texts)] + [(a, row(t, False)) for a, t in zip(present, texts)]


def fmt(row: dict) -> str:
    return (
        f"{row['threshold']:9.3f} {row['precision']:9.3f} {row['recall']:6.3f} {row['auc']:6.3f} {row['page']:6.3f}"
        f"  ({row['n']} questions, {row['gaps']} gaps)"
    )


@dataclass
class Measured:
    """What one corpus gives: its labelled questions judged, the removal protocol, the probe."""

    labelled: list[tuple[Assessment, dict]]
    removal: list[tuple[Assessment, dict]]
    probe: ProbeOutcome
    values: list[tuple[Assessment, dict]]  # bench/data/value_questions.csv: questions asking for a value


def measure(corpus: Corpus, data: Path, work: Path) -> Measured:
    started = time.perf_counter()
    store, config = open_corpus(corpus, data, work)
    try:
        rows = read_questions(corpus.questions)
        index = PassageIndex.load_or_build(store, config.retrieval)
        k = TOP_K or config.retrieval.top_k
        labelled = list(zip(assess_questions(store, index, [r["question"] for r in rows], k), rows))
        removal = remove_protocol(store, index, config, rows)
        probe = run_probe(store, index, k, ProbeSettings())
        with open(VALUE_QUESTIONS, newline="", encoding="utf-8") as f:
            asking = [r for r in csv.DictReader(f) if r["corpus"] == corpus.name]
        values = list(zip(assess_questions(store, index, [r["question"] for r in asking], k), asking))
        passages = store.db.execute("SELECT count(*) FROM passages").fetchone()[0]
    finally:
        store.close()
    print(
        f"{corpus.name}: {corpus.style}, {passages} passages, {time.perf_counter() - started:.1f} s; probe: "
        f"{probe.summary()}"
    )
    return Measured(labelled, removal, probe, values)


def probe_rule(measured: dict[str, Measured], names: list[str]) -> float:
    """The probe scale chosen on the corpora in `names`: the grid value with the highest mean gap
    recall while every one of them keeps precision >= TARGET_PRECISION, else the best mean F1."""
    scored = []
    for value in SCALE_GRID:
        rows = []
        for n in names:
            m = measured[n]
            t = place_threshold(m.probe.visible, value)
            rows.append(gap_metrics([a.support for a, _ in m.labelled], [r["gap"] for _, r in m.labelled], t))
        reaching = all(r["precision"] >= TARGET_PRECISION for r in rows)
        key = "recall" if reaching else "f1"
        scored.append(((reaching, sum(r[key] for r in rows) / len(rows)), value))
    return max(scored)[1]


def table(measured: dict[str, Measured], names: list[str], which: str) -> None:
    shipped = Config().support.threshold
    print(f"{'corpus':8s} {'rule':14s} {'threshold':>9s} {'precision':>9s} {'recall':>6s} {'AUC':>6s} {'page':>6s}")
    for name in names:
        m = measured[name]
        items = m.labelled if which == "labels" else m.removal
        assessed, rows = [a for a, _ in items], [r for _, r in items]
        others = [n for n in names if n != name]
        print(f"{name:8s} {'shipped':14s} {fmt(figures(assessed, rows, shipped))}")
        if others:
            pooled = [(a, r["gap"]) for n in others for a, r in measured[n].labelled]
            print(f"{name:8s} {'labels, LOCO':14s} {fmt(figures(assessed, rows, pick_threshold(pooled)))}")
            value = probe_rule(measured, others)
            t = place_threshold(m.probe.visible, value)
            print(f"{name:8s} {f'probe {value:g}, LOCO':14s} {fmt(figures(assessed, rows, t))}")
        t = place_threshold(m.probe.visible, SCALE)
        print(f"{name:8s} {'probe default':14s} {fmt(figures(assessed, rows, t))}")
        own = pick_threshold([(a, r["gap"]) for a, r in items])
        print(f"{name:8s} {'own (in-sample)':14s} {fmt(figures(assessed, rows, own))}")


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("data", nargs="?", default=os.environ.get("AUDITOR_EVAL_DATA"))
    parser.add_argument("--work", default=None, help="where the stores go (default DATA/../work)")
    parser.add_argument("--corpora", default=",".join(CORPORA))
    parser.add_argument("--top-k", type=int, default=None, help="evidence depth (default: the config's)")
    parser.add_argument("--per-document", type=int, default=None, help="replace verdicts.PER_DOCUMENT")
    parser.add_argument("--heading-weight", type=int, default=None, help="replace index.HEADING_WEIGHT")
    args = parser.parse_args(argv)
    if not args.data or not Path(args.data).is_dir():
        print("evaluation corpora not found (give DATA or $AUDITOR_EVAL_DATA; see bench/README.md); nothing measured")
        return 0
    global TOP_K
    TOP_K = args.top_k
    if args.per_document is not None:
        verdicts.PER_DOCUMENT = args.per_document
    if args.heading_weight is not None:
        retrieval_index.HEADING_WEIGHT = args.heading_weight
    data = Path(args.data)
    work = Path(args.work) if args.work else data.parent / "work"
    names = [n for n in args.corpora.split(",") if n]
    missing = [n for n in names if not (data / n).is_dir()]
    if missing:
        print(f"{str(data)!r}: no folder for {', '.join(missing)}; those corpora are skipped")
        names = [n for n in names if n not in missing]
    print(
        f"heading weight {retrieval_index.HEADING_WEIGHT}, one passage per document: {verdicts.PER_DOCUMENT}, "
        f"probe scale default {SCALE}"
    )
    measured = {name: measure(CORPORA[name], data, work) for name in names}
    print("\nlabelled questions:")
    table(measured, names, "labels")
    print("\nremove-the-answering-page (each answerable question with its pages hidden, and as it is):")
    table(measured, names, "removal")
    print("\nconflicting values among the supporting passages (at the probe threshold), for checking by hand:")
    for name in names:
        m = measured[name]
        threshold = place_threshold(m.probe.visible, SCALE)
        asked = sum(1 for _, r in m.labelled if compared_type(r["question"]))
        flagged = [(r, c) for a, r in m.labelled if (c := conflict_of(a, r["question"], threshold))]
        flagged += [(r, c) for a, r in m.values if (c := conflict_of(a, r["question"], threshold))]
        asked += len(m.values)
        print(
            f"{name}: {asked} questions ask for a value ({len(m.values)} of them from value_questions.csv); {len(flagged)} flagged"
        )
        for r, c in flagged:
            first, second = c.as_json()["values"]
            print(
                f"  {r['id']} {r['question']!r}: {first['value']!r} ({page_of(first['document'])}) vs "
                f"{second['value']!r} ({page_of(second['document'])})"
            )
    return 0


def conflict_of(assessed: Assessment, question: str, threshold: float) -> Conflict | None:
    """The conflict among the supporting passages of one assessed question (best window each)."""
    supporting = [
        (i, document, text[p.window[0] : p.window[1]])
        for i, (p, document, text) in enumerate(zip(assessed.passages, assessed.documents, assessed.texts))
        if p.support >= threshold
    ]
    supporting.sort(key=lambda item: -assessed.passages[item[0]].support)
    return find_conflict(question, supporting)


if __name__ == "__main__":
    raise SystemExit(main())
