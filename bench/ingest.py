"""Ingest bench: real third-party documentation that Debian ships, ingested with --jobs 1 and
--jobs 2, side by side with the bare reference parsers (bs4+lxml get_text, pypdf extract_text).

    python -m bench.ingest [--cache DIR] [--limit N] [--sets html,pdf]

The packages are fetched with `apt-get download` into a cache outside the repository (default
~/.cache/corpus-auditor-bench, or $AUDITOR_BENCH_CACHE) and unpacked with `dpkg-deb -x`:
* python3.11-doc — the Python 3.11 manual, ~530 HTML pages (Sphinx output);
* texlive-fonts-recommended-doc — 11 PDF manuals of TeX Live font packages.

Prints files/s, MB/s, passages, errors by kind and peak memory (resident set of the ingest
process plus its workers, sampled every 0.1 s) for each run, the jobs-1/jobs-2 speed-up, and how
our per-file cost compares with the bare parser. Timings on a shared machine are noisy: run it a
couple of times and quote the spread.
"""

from __future__ import annotations

import argparse
import collections
import os
import resource
import subprocess
import tempfile
import threading
import time
from pathlib import Path

PACKAGES = {
    "html": ("python3.11-doc", "usr/share/doc/python3.11/html", ("**/*.html",)),
    "pdf": ("texlive-fonts-recommended-doc", "usr/share/doc/texlive-doc", ("**/*.pdf",)),
}


def fetch(package: str, cache: Path) -> Path:
    """The unpacked package folder, downloading and unpacking it on first use."""
    target = cache / "extract" / package
    if target.is_dir() and any(target.iterdir()):
        return target
    cache.mkdir(parents=True, exist_ok=True)
    debs = sorted(cache.glob(f"{package}_*.deb"))
    if not debs:
        subprocess.run(["apt-get", "download", package], cwd=cache, check=True)
        debs = sorted(cache.glob(f"{package}_*.deb"))
    target.mkdir(parents=True, exist_ok=True)
    subprocess.run(["dpkg-deb", "-x", str(debs[-1]), str(target)], check=True)
    return target


class PeakMemory:
    """Peak resident memory of this process and its children, sampled in a thread (every 0.1 s:
    listing the children costs CPU that the run itself would miss)."""

    def __init__(self, interval: float = 0.1):
        import psutil

        self.process = psutil.Process()
        self.interval, self.peak, self._stop = interval, 0, threading.Event()
        self._thread = threading.Thread(target=self._run, daemon=True)

    def _run(self) -> None:
        import psutil

        while not self._stop.is_set():
            total = 0
            try:
                for p in [self.process, *self.process.children(recursive=True)]:
                    try:
                        total += p.memory_info().rss
                    except psutil.Error:
                        pass
            except psutil.Error:
                pass
            self.peak = max(self.peak, total)
            time.sleep(self.interval)

    def __enter__(self):
        self._thread.start()
        return self

    def __exit__(self, *exc):
        self._stop.set()
        self._thread.join()


def _burn(n: int) -> float:
    x = 0
    for i in range(n):
        x += i * i
    return float(x % 7)


def parallel_capacity(n: int = 6_000_000) -> float:
    """How many cores this session gets right now: the same CPU loop in one process, then in two
    at once (spawned like the ingest workers); 2.0 on two free cores. With Linux autogroup
    scheduling, other busy sessions hold this one to its share however many processes it runs."""
    import multiprocessing as mp

    ctx = mp.get_context("spawn")
    with ctx.Pool(2) as pool:
        pool.map(_burn, [1000, 1000])  # start-up outside the timing
        started = time.perf_counter()
        pool.map(_burn, [n], chunksize=1)
        one = time.perf_counter() - started
        started = time.perf_counter()
        pool.map(_burn, [n, n], chunksize=1)
        two = time.perf_counter() - started
    return 2 * one / two


def files_of(folder: Path, include: tuple[str, ...], limit: int | None) -> list[Path]:
    files = sorted(p for pattern in include for p in folder.glob(pattern) if p.is_file())
    return files[:limit] if limit else files


def reference_parse(kind: str, files: list[Path]) -> float:
    """Seconds for the bare reference parser to extract text from every file (one process)."""
    started = time.perf_counter()
    if kind == "html":
        from bs4 import BeautifulSoup

        for f in files:
            BeautifulSoup(f.read_bytes(), "lxml").get_text(" ")
    else:
        from pypdf import PdfReader

        for f in files:
            try:
                for page in PdfReader(str(f)).pages:
                    page.extract_text()
            except Exception:
                pass
    return time.perf_counter() - started


def run_ingest(folder: Path, files: list[Path], include, jobs: int) -> dict:
    from auditor.config import Config, CorpusConfig
    from auditor.ingest.pipeline import ingest_corpus
    from auditor.store import Store

    with tempfile.TemporaryDirectory() as work:
        corpus = Path(work) / "corpus"
        corpus.mkdir()
        # Links into the unpacked package keep the run to the chosen files.
        for f in files:
            link = corpus / f.relative_to(folder)
            link.parent.mkdir(parents=True, exist_ok=True)
            os.link(f, link) if _same_device(f, work) else link.write_bytes(f.read_bytes())
        config = Config(corpus=CorpusConfig(paths=(corpus,), include=include, timeout_s=300))
        with Store(Path(work) / "bench.db") as store, PeakMemory() as memory:
            before_self, before_children = (
                resource.getrusage(resource.RUSAGE_SELF),
                resource.getrusage(resource.RUSAGE_CHILDREN),
            )
            started = time.perf_counter()
            summary = ingest_corpus(store, config, jobs=jobs)
            seconds = time.perf_counter() - started
            after_self, after_children = (
                resource.getrusage(resource.RUSAGE_SELF),
                resource.getrusage(resource.RUSAGE_CHILDREN),
            )
            rerun = time.perf_counter()
            again = ingest_corpus(store, config, jobs=jobs)
            rerun = time.perf_counter() - rerun
    kinds = collections.Counter(f["kind"] for f in summary.failures)
    cpu_main = (after_self.ru_utime + after_self.ru_stime) - (before_self.ru_utime + before_self.ru_stime)
    cpu_workers = (after_children.ru_utime + after_children.ru_stime) - (
        before_children.ru_utime + before_children.ru_stime
    )
    per_worker = sorted(summary.cpu_by_worker.values(), reverse=True)
    return {
        "seconds": seconds,
        "summary": summary,
        "peak": memory.peak,
        "errors": dict(kinds),
        "file_cpu": sum(per_worker),
        "busiest": per_worker[0] if per_worker else 0.0,
        "rerun": rerun,
        "rerun_parsed": again.parsed,
        "cpu_main": cpu_main,
        "cpu_workers": cpu_workers,
    }


def _same_device(a: Path, b: str) -> bool:
    return os.stat(a).st_dev == os.stat(b).st_dev


def main() -> None:
    import logging

    logging.getLogger("pypdf").setLevel(logging.ERROR)  # as the ingest workers do
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument(
        "--cache",
        type=Path,
        default=Path(os.environ.get("AUDITOR_BENCH_CACHE", Path.home() / ".cache" / "corpus-auditor-bench")),
    )
    parser.add_argument("--limit", type=int, default=None, help="at most N files per set")
    parser.add_argument("--sets", default="html,pdf")
    args = parser.parse_args()

    for name in args.sets.split(","):
        package, sub, include = PACKAGES[name]
        folder = fetch(package, args.cache) / sub
        files = files_of(folder, include, args.limit)
        megabytes = sum(f.stat().st_size for f in files) / 1e6
        print(
            f"\n== {name}: {package} — {len(files)} files, {megabytes:.1f} MB "
            f"(load average before: {os.getloadavg()[0]:.2f} on {os.cpu_count()} cores)"
        )
        reference = reference_parse(name, files)
        print(
            f"reference ({'bs4+lxml get_text' if name == 'html' else 'pypdf extract_text'}, 1 process): "
            f"{reference:.2f} s, {len(files) / reference:.1f} files/s, {megabytes / reference:.2f} MB/s"
        )
        runs = {}
        for jobs in (1, 2):
            r = runs[jobs] = run_ingest(folder, files, include, jobs)
            s = r["summary"]
            print(
                f"ingest --jobs {jobs}: {r['seconds']:.2f} s, {len(files) / r['seconds']:.1f} files/s, "
                f"{megabytes / r['seconds']:.2f} MB/s, {s.passages} passages, {s.line()}, "
                f"errors by kind {r['errors'] or '{}'}, peak memory {r['peak'] / 1e6:.0f} MB "
                f"(main + workers); CPU main {r['cpu_main']:.1f} s + workers {r['cpu_workers']:.1f} s; "
                f"unchanged re-run {r['rerun']:.2f} s, parsed {r['rerun_parsed']}"
            )
        print(
            f"load average after: {os.getloadavg()[0]:.2f}; cores this session gets now (two CPU loops "
            f"vs one): {parallel_capacity():.2f} of {os.cpu_count()} (other sessions share them: figures are noisy)"
        )
        print(
            f"speed-up jobs 2 / jobs 1 (wall clock): {runs[1]['seconds'] / runs[2]['seconds']:.2f}x "
            f"(target >= 1.6x on 2 cores)"
        )
        # With other sessions busy, Linux autogroup scheduling gives this session one share of
        # the CPU however many processes it runs, so the wall-clock ratio understates what two
        # free cores give. The per-file CPU times say how evenly the work was split: one job
        # does all of it, two jobs finish when the busier worker does.
        print(
            f"work split (CPU s on files): jobs 1 {runs[1]['file_cpu']:.1f} s in one worker; jobs 2 "
            f"{runs[2]['file_cpu']:.1f} s, busier worker {runs[2]['busiest']:.1f} s -> "
            f"{runs[1]['file_cpu'] / max(runs[2]['busiest'], 1e-9):.2f}x on two free cores (estimate)"
        )
        print(
            f"ingest --jobs 1 / reference parser time: {runs[1]['seconds'] / reference:.2f}x "
            f"(ours also segments, tokenizes, dates statements and writes SQLite)"
        )


if __name__ == "__main__":
    main()
