"""Scale: a full scan of 1,000,000 generated passages and 10,000 questions on one machine.

    python -m bench.scale                      # 100,000 text files x 10 passages, 10,000 questions
    python -m bench.scale --passages 20000     # a quick look at the same pipeline

Stages, each timed and run the way `auditor scan` runs them: ingest (discovery, parse, segment,
tokenize, dated statements, SQLite writes), BM25 index build, audit (retrieval, judging, the run
stored), report (index.html, CSV/JSON exports). Printed: seconds per stage, passages/s, peak
memory of the main process and of the whole process tree (parser workers included; sampled with
psutil every 0.2 s, and getrusage's maxrss of the process and of its largest finished child), the
database and report sizes, and each figure against its target (issue: audit of 10,000 questions
under 60 s; whole scan under 10 minutes and 6 GB; report under 15 MB).

The corpus is generated, deterministic (seeded) and cached under ~/.cache/corpus-auditor/scale/
(outside the repository); the database is rebuilt on every run. Words are invented syllable
strings drawn from a Zipf distribution (exponent 1.1, common practice for word frequencies; no
single source), so postings lists have the skew of real text; about a third of the paragraphs
carry a dated sentence so that the temporal extractor and the freshness rules have work to do.
Questions: two thirds are built from the words of a random passage (they find support), one third
mixes in words the corpus never uses (gaps).
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import shutil
import sys
import threading
import time
from datetime import date
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parent.parent

CACHE = Path(os.environ.get("XDG_CACHE_HOME", Path.home() / ".cache")) / "corpus-auditor" / "scale"
AS_OF = date(2026, 12, 1)
MONTHS = [
    "January",
    "February",
    "March",
    "April",
    "May",
    "June",
    "July",
    "August",
    "September",
    "October",
    "November",
    "December",
]
TARGETS = {"audit_s": 60.0, "scan_s": 600.0, "peak_gb": 6.0, "report_mb": 15.0}


# --- generated data ---------------------------------------------------------------------------------


def vocabulary(rng: np.random.Generator, size: int) -> list[str]:
    """`size` distinct invented words of 2-4 syllables."""
    onsets = [
        "b",
        "c",
        "d",
        "f",
        "g",
        "h",
        "j",
        "k",
        "l",
        "m",
        "n",
        "p",
        "r",
        "s",
        "t",
        "v",
        "w",
        "z",
        "br",
        "cr",
        "dr",
        "fl",
        "gr",
        "pl",
        "pr",
        "sk",
        "sl",
        "st",
        "tr",
        "ch",
        "sh",
        "th",
    ]
    vowels = ["a", "e", "i", "o", "u", "ai", "ea", "ou", "io"]
    codas = ["", "", "", "n", "r", "l", "s", "m", "t", "nd", "rk"]
    words: dict[str, None] = {}
    while len(words) < size:
        n = int(rng.integers(2, 5))
        words[
            "".join(
                onsets[rng.integers(len(onsets))] + vowels[rng.integers(len(vowels))] + codas[rng.integers(len(codas))]
                for _ in range(n)
            )
        ] = None
    return list(words)


def dated_sentence(rng: np.random.Generator) -> str:
    year = int(rng.integers(2018, 2027))
    month = MONTHS[int(rng.integers(12))]
    day = int(rng.integers(1, 29))
    return [
        f"As of {month} {year}, this section is current.",
        f"The schedule takes effect on {day} {month} {year}.",
        f"Applications close on {month} {day}, {year}.",
        f"Updated {year}-{MONTHS.index(month) + 1:02d}-{day:02d}.",
        f"The {year} rates apply to every account.",
    ][int(rng.integers(5))]


def generate(folder: Path, files: int, per_file: int, questions: int, seed: int = 20261201) -> dict:
    """Write the corpus and the question set under `folder` (skipped when already there)."""
    marker = folder / "generated.json"
    spec = {"files": files, "per_file": per_file, "questions": questions, "seed": seed, "version": 2}
    if marker.exists() and json.loads(marker.read_text()) == spec:
        return spec
    if folder.exists():
        shutil.rmtree(folder)
    started = time.monotonic()
    rng = np.random.default_rng(seed)
    words = np.array(vocabulary(rng, 60_000))
    ranks = np.arange(1, len(words) + 1)
    weights = 1.0 / ranks**1.1
    weights /= weights.sum()
    kb = folder / "kb"
    sample_passages: list[str] = []
    for f in range(files):
        sub = kb / f"part{f // 1000:03d}"
        if f % 1000 == 0:
            sub.mkdir(parents=True, exist_ok=True)
        # 130-180 words: two paragraphs never fit one passage (250 words), so one paragraph = one passage
        lengths = rng.integers(130, 180, size=per_file)
        drawn = rng.choice(words, size=int(lengths.sum()), p=weights)
        paragraphs, at = [], 0
        for n in lengths:
            body = " ".join(drawn[at : at + n])
            at += n
            sentences = body.capitalize() + "."
            if rng.random() < 0.33:
                sentences = dated_sentence(rng) + " " + sentences
            paragraphs.append(sentences)
        (sub / f"doc{f:06d}.txt").write_text("\n\n".join(paragraphs) + "\n", encoding="utf-8")
        if len(sample_passages) < questions and rng.random() < questions / files * 2:
            sample_passages.append(paragraphs[int(rng.integers(per_file))])
    unseen = vocabulary(np.random.default_rng(seed + 1), 5_000)
    unseen = [w + "x" for w in unseen]  # never drawn for the corpus ("x" is no coda there)
    lines = ["id,question,weight"]
    for q in range(questions):
        if q % 3 != 2 and sample_passages:
            source = sample_passages[q % len(sample_passages)].rstrip(".").split()
            pick = rng.choice(len(source), size=min(6, len(source)), replace=False)
            terms = [source[i].lower().strip(".,") for i in sorted(pick)]
        else:
            terms = list(rng.choice(words[:5000], size=3)) + [unseen[int(rng.integers(len(unseen)))] for _ in range(2)]
        lines.append(f"q-{q + 1:05d},How do I {' '.join(terms)}?,{int(rng.integers(1, 50))}")
    (folder / "questions.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    marker.write_text(json.dumps(spec))
    print(
        f"generated {files:,} files x {per_file} paragraphs and {questions:,} questions "
        f"in {time.monotonic() - started:.0f} s under {folder}",
        flush=True,
    )
    return spec


# --- memory ----------------------------------------------------------------------------------------


class TreeMemory:
    """Peak resident memory of this process and of the whole process tree, sampled."""

    def __init__(self, interval: float = 0.2):
        import psutil

        self.process = psutil.Process()
        self.interval = interval
        self.peak_tree = self.peak_self = 0
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._run, daemon=True)

    def _run(self):
        import psutil

        while not self._stop.is_set():
            try:
                own = self.process.memory_info().rss
                total = own
                for child in self.process.children(recursive=True):
                    try:
                        total += child.memory_info().rss
                    except psutil.Error:
                        pass
                self.peak_self = max(self.peak_self, own)
                self.peak_tree = max(self.peak_tree, total)
            except psutil.Error:
                pass
            self._stop.wait(self.interval)

    def start(self):
        self._thread.start()
        return self

    def stop(self):
        self._stop.set()
        self._thread.join()


def maxrss_mb() -> tuple[float, float]:
    """getrusage maxrss (KiB on Linux) of this process and of its largest finished child, in MB."""
    return (
        resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024,
        resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024,
    )


def folder_mb(path: Path) -> float:
    return sum(p.stat().st_size for p in path.rglob("*") if p.is_file()) / 1e6 if path.exists() else 0.0


# --- the scan, stage by stage ----------------------------------------------------------------------


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--passages", type=int, default=1_000_000)
    parser.add_argument("--per-file", type=int, default=10, help="passages (paragraphs) per text file")
    parser.add_argument("--questions", type=int, default=10_000)
    parser.add_argument("--jobs", type=int, default=os.cpu_count() or 1)
    parser.add_argument("--cache", type=Path, default=CACHE)
    parser.add_argument(
        "--profile",
        choices=["ingest", "index", "audit", "report"],
        help="run this stage under cProfile and print its top functions",
    )
    parser.add_argument("--generate-only", action="store_true", help="write the cached corpus and stop")
    args = parser.parse_args(argv)

    files = max(1, args.passages // args.per_file)
    folder = args.cache / f"{files}x{args.per_file}-{args.questions}q"
    generate(folder, files, args.per_file, args.questions)
    if args.generate_only:
        return 0

    from auditor.config import load_config
    from auditor.ingest.pipeline import ingest_corpus
    from auditor.judgement.audit import run_audit
    from auditor.questions.sets import load_questions
    from auditor.report import write_report
    from auditor.retrieval.index import PassageIndex
    from auditor.store import Store

    work = folder / "work"
    if work.exists():
        shutil.rmtree(work)
    work.mkdir()
    (folder / "audit.toml").write_text(
        'database = "work/auditor.db"\nquestions = ["questions.csv"]\n'
        '[corpus]\npaths = ["kb"]\ninclude = ["**/*.txt"]\ntimeout_s = 300\n'
        '[report]\nout = "work/report"\ntitle = "Scale bench"\n',
        encoding="utf-8",
    )
    config = load_config(folder / "audit.toml", env={})
    memory = TreeMemory().start()
    times: dict[str, float] = {}
    peaks: dict[str, float] = {}

    def stage(name, fn):
        profiler = None
        if args.profile == name:
            import cProfile

            profiler = cProfile.Profile()
            profiler.enable()
        started = time.monotonic()
        memory.peak_tree = max(memory.peak_tree, 0)
        try:
            return fn()
        finally:
            times[name] = time.monotonic() - started
            peaks[name] = memory.peak_tree / 1e9
            if profiler:
                import pstats

                profiler.disable()
                pstats.Stats(profiler).sort_stats("cumulative").print_stats(30)
            print(f"{name:>7}: {times[name]:8.1f} s   tree peak so far {peaks[name]:.2f} GB", flush=True)

    questions = stage("load_q", lambda: load_questions(folder / "questions.csv"))
    with Store(config.database) as store:
        summary = stage("ingest", lambda: ingest_corpus(store, config, jobs=args.jobs))
        index = stage("index", lambda: PassageIndex.load_or_build(store, config.retrieval))
        passages = index.passage_count
        del index
        run = stage("audit", lambda: run_audit(store, config, questions, as_of=AS_OF))
    out = config.report.out
    stage("report", lambda: write_report(run, out))
    memory.stop()
    self_mb, child_mb = maxrss_mb()

    scan_s = sum(times.values())
    report_mb = (out / "index.html").stat().st_size / 1e6
    peak_gb = memory.peak_tree / 1e9
    s = run.summary.to_json()
    print()
    print(
        f"corpus: {files:,} files, {passages:,} passages ({summary.line()}; {summary.passages:,} written, "
        f"{summary.bytes_parsed / 1e6:,.0f} MB parsed)"
    )
    print(f"questions: {s['questions']:,}: {s['supported']:,} supported, {s['stale']:,} stale, {s['gap']:,} gap")
    print(
        f"ingest {times['ingest']:.1f} s ({passages / max(times['ingest'], 1e-9):,.0f} passages/s, "
        f"{files / max(times['ingest'], 1e-9):,.0f} files/s, jobs {args.jobs}); index {times['index']:.1f} s; "
        f"audit {times['audit']:.1f} s ({s['questions'] / max(times['audit'], 1e-9):,.0f} questions/s); "
        f"report {times['report']:.1f} s"
    )
    print(
        f"peak memory: process tree {peak_gb:.2f} GB (sampled), main process maxrss {self_mb / 1024:.2f} GB, "
        f"largest finished child maxrss {child_mb / 1024:.2f} GB"
    )
    print(
        f"sizes: database {folder_mb(work) - folder_mb(out):,.0f} MB (with index), index.html {report_mb:.1f} MB, "
        f"results.json {(out / 'results.json').stat().st_size / 1e6:.1f} MB, report folder {folder_mb(out):.1f} MB"
    )
    checks = [
        ("audit of the questions", times["audit"], TARGETS["audit_s"], "s"),
        ("whole scan", scan_s, TARGETS["scan_s"], "s"),
        ("peak memory (tree)", peak_gb, TARGETS["peak_gb"], "GB"),
        ("index.html", report_mb, TARGETS["report_mb"], "MB"),
    ]
    for what, value, target, unit in checks:
        print(
            f"  {what:<24} {value:10.1f} {unit:<2} target < {target:g} {unit}: {'ok' if value < target else 'MISSED'}"
        )
    return 0


if __name__ == "__main__":
    sys.exit(main())
