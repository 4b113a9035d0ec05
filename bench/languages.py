"""Knowledge bases in other languages: language detection, gap finding and date recall.

Three parts, each run with `--part` (default all):

* detectors — lingua-language-detector against py3langid on short texts: the question sets of
  bench/data/debian_*_questions.csv (German, Spanish) and bench/data/python_manual_questions.csv
  (English), and headings (h2/h3) of the Debian documentation pages below, 2–12 words each.
  Printed: accuracy per language and per detector, and microseconds per text.
* kb — German and Spanish knowledge bases built from Debian documentation packages that ship
  translations (debian-reference-de/-es, maint-guide-de/-es, debian-faq-de), fetched with
  `apt-get download` into a cache outside the repository and unpacked with `dpkg-deb -x`.
  Remove-the-page protocol: the pages named by the questions marked `answerable = no` are left
  out of the corpus, so their questions are true gaps; the index pages (tables of contents) are
  left out too. Questions were written before any tuning (bench/data/debian_de_questions.csv,
  debian_es_questions.csv). With no language configured (the shipped defaults) and, with
  `--language`, with `retrieval.language` set, it prints gap precision / recall at the shipped
  support threshold and the ROC AUC of the support score.
* dates — date recall and precision on WikiWarsDE (Strötgen & Gertz 2011, TIMEX2 inline
  annotations, CC BY-SA 3.0), read from `--wikiwars DIR` (the folder holding `keyinline/`),
  never from the repository.

    python -m bench.languages [--part detectors|kb|dates] [--cache DIR] [--wikiwars DIR]
                              [--language german] [--questions]
"""

from __future__ import annotations

import argparse
import csv
import os
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
import warnings
from pathlib import Path

from bs4 import XMLParsedAsHTMLWarning

from auditor.config import load_config
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.audit import question_support
from auditor.judgement.calibrate import gap_metrics, roc_auc
from auditor.retrieval.index import PassageIndex
from auditor.store import Store

REPO = Path(__file__).resolve().parent.parent
warnings.filterwarnings("ignore", category=XMLParsedAsHTMLWarning)  # the Debian pages are XHTML
CACHE = Path(os.environ.get("AUDITOR_BENCH_CACHE", Path.home() / ".cache" / "corpus-auditor-lang"))
PACKAGES = ["debian-reference-de", "debian-reference-es", "maint-guide-de", "maint-guide-es", "debian-faq-de"]
DATA = REPO / "bench" / "data"
# Where each question-file path prefix lives inside the unpacked packages.
SOURCES = {
    "debian-reference/": "usr/share/debian-reference/",
    "FAQ/de/": "usr/share/doc/debian/FAQ/de/",
    "maint-guide-de/html/": "usr/share/doc/maint-guide-de/html/",
    "maint-guide-es/html/": "usr/share/doc/maint-guide-es/html/",
}
KB_PAGES = {
    "german": ["debian-reference/*.de.html", "FAQ/de/*.de.html", "maint-guide-de/html/*.de.html"],
    "spanish": ["debian-reference/*.es.html", "maint-guide-es/html/*.es.html"],
}
SKIPPED = {"index.de.html", "index.es.html", "faqinfo.de.html"}  # tables of contents, about-this-FAQ
QUESTIONS = {"german": DATA / "debian_de_questions.csv", "spanish": DATA / "debian_es_questions.csv"}


def fetch(cache: Path) -> Path | None:
    """The unpacked packages, downloading them into `cache` when needed."""
    root = cache / "extract"
    if (root / "usr" / "share" / "debian-reference").is_dir():
        return root
    cache.mkdir(parents=True, exist_ok=True)
    try:
        subprocess.run(["apt-get", "download", *PACKAGES], cwd=cache, check=True, capture_output=True)
        for deb in sorted(cache.glob("*.deb")):
            subprocess.run(["dpkg-deb", "-x", str(deb), str(root)], check=True, capture_output=True)
    except (OSError, subprocess.CalledProcessError) as exc:
        print(f"kb: cannot fetch the Debian documentation packages ({exc}); skipped")
        return None
    return root


def read_questions(path: Path) -> list[dict]:
    with open(path, newline="", encoding="utf-8") as f:
        return list(csv.DictReader(f))


# --- kb -------------------------------------------------------------------------------------------


def build_kb(root: Path, language: str, target: Path, removed: set[str]) -> int:
    """Copy the kept pages of `language` into `target`, named as the question files name them."""
    count = 0
    for pattern in KB_PAGES[language]:
        prefix, glob = pattern.rsplit("/", 1)
        prefix += "/"
        for file in sorted((root / SOURCES[prefix]).glob(glob)):
            rel = prefix + file.name
            if file.name in SKIPPED or rel in removed:
                continue
            (target / rel).parent.mkdir(parents=True, exist_ok=True)
            shutil.copy2(file, target / rel)
            count += 1
    return count


def kb_figures(root: Path, language: str, configured: str | None, show: bool) -> dict:
    rows = read_questions(QUESTIONS[language])
    removed = {r["expected_document"] for r in rows if r["answerable"] == "no"}
    with tempfile.TemporaryDirectory() as tmp:
        kb = Path(tmp) / "kb"
        pages = build_kb(root, language, kb, removed)
        retrieval = f'[retrieval]\nlanguage = "{configured}"\n' if configured else ""
        (Path(tmp) / "audit.toml").write_text(
            f'database = "auditor.db"\nas_of = 2026-12-01\n[corpus]\npaths = ["kb"]\n{retrieval}', encoding="utf-8"
        )
        config = load_config(Path(tmp) / "audit.toml", env={})
        store = Store(config.database)
        started = time.perf_counter()
        ingest_corpus(store, config, jobs=2)
        took = time.perf_counter() - started
        index = PassageIndex.load_or_build(store, config.retrieval, save=False)
        supports = question_support(store, index, [r["question"] for r in rows], config.retrieval.top_k)
        passages = store.query("SELECT count(*) AS n FROM passages")[0]["n"]
        store.close()
    gaps = [r["answerable"] == "no" for r in rows]
    threshold = config.support.threshold
    metrics = gap_metrics(supports, gaps, threshold)
    auc = roc_auc([-s for s, g in zip(supports, gaps) if g], [-s for s, g in zip(supports, gaps) if not g])
    print(
        f"{language:8s} {configured or '(none)':10s} {len(rows):4d} {sum(gaps):4d} {auc:6.3f} "
        f"{metrics['precision']:6.3f} {metrics['recall']:6.3f} {metrics['f1']:6.3f}   "
        f"{pages} pages, {passages} passages, ingest {took:.0f} s"
    )
    if show:
        for row, s in sorted(zip(rows, supports), key=lambda x: x[1]):
            verdict = "gap" if s < threshold else "   "
            print(f"    {s:.3f} {verdict} {row['answerable']:3s} {row['id']} {row['question']}")
    return {"auc": auc, **metrics}


def part_kb(args) -> None:
    root = fetch(args.cache)
    if root is None:
        return
    print("kb: remove-the-page protocol on Debian documentation translations; threshold = shipped default")
    print(f"{'language':8s} {'configured':10s} {'n':>4} {'gaps':>4} {'AUC':>6} {'prec':>6} {'recall':>6} {'F1':>6}")
    for language in ("german", "spanish"):
        kb_figures(root, language, None, args.questions)
        if args.language:
            kb_figures(root, language, language, args.questions)


# --- detectors ------------------------------------------------------------------------------------


def short_texts(root: Path | None) -> list[tuple[str, str]]:
    """(language, text): the question sets, and headings of the Debian pages when they are there."""
    texts = [("german", r["question"]) for r in read_questions(QUESTIONS["german"])]
    texts += [("spanish", r["question"]) for r in read_questions(QUESTIONS["spanish"])]
    texts += [("english", r["question"]) for r in read_questions(DATA / "python_manual_questions.csv")]
    if root is None:
        return texts
    from bs4 import BeautifulSoup

    pages = {
        "german": "usr/share/doc/maint-guide-de/html/*.html",
        "spanish": "usr/share/doc/maint-guide-es/html/*.html",
    }
    for language, glob in pages.items():
        for file in sorted(root.glob(glob)):
            soup = BeautifulSoup(file.read_text(encoding="utf-8"), "lxml")
            for h in soup.find_all(["h2", "h3"]):
                text = re.sub(r"^[\dA-Z.]+\s+", "", h.get_text(" ", strip=True))  # drop "7.4." numbering
                if 2 <= len(text.split()) <= 12:
                    texts.append((language, text))
    return texts


def part_detectors(args) -> None:
    import py3langid
    from lingua import Language, LanguageDetectorBuilder

    from auditor import language as ours

    root = fetch(args.cache) if not args.offline else None
    texts = short_texts(root)
    codes = {"en": "english", "de": "german", "es": "spanish"}
    py3langid.set_languages(list(codes))  # the same three candidates for both
    three = [Language.ENGLISH, Language.GERMAN, Language.SPANISH]
    lingua_high = LanguageDetectorBuilder.from_languages(*three).build()
    lingua_low = LanguageDetectorBuilder.from_languages(*three).with_low_accuracy_mode().build()
    detectors = {
        "lingua (all n-grams)": lambda t: (lingua_high.detect_language_of(t) or Language.ENGLISH).name.lower(),
        "lingua (low accuracy)": lambda t: (lingua_low.detect_language_of(t) or Language.ENGLISH).name.lower(),
        "py3langid": lambda t: codes[py3langid.classify(t)[0]],
        "auditor.language.detect": lambda t: ours.detect_or(t, ours.DEFAULT_CANDIDATES, "english"),
    }
    print(f"detectors: {len(texts)} short texts (questions and headings), 3 candidate languages")
    print(
        f"{'detector':26s} "
        + " ".join(f"{lang:>8s}" for lang in ("english", "german", "spanish"))
        + "      all  µs/text"
    )
    for name, detect in detectors.items():
        detect(texts[0][1])  # load its models outside the timing
        started = time.perf_counter()
        right: dict[str, list[bool]] = {}
        wrong = []
        for language, text in texts:
            found = detect(text)
            right.setdefault(language, []).append(found == language)
            if found != language:
                wrong.append(f"{language}->{found}: {text}")
        took = (time.perf_counter() - started) / len(texts) * 1e6
        shares = " ".join(f"{statistics.mean(right[lang]):8.3f}" for lang in ("english", "german", "spanish"))
        total = statistics.mean([x for v in right.values() for x in v])
        print(f"{name:26s} {shares} {total:8.3f} {took:8.0f}")
        if args.questions:
            for line in wrong:
                print(f"    {line}")


# --- dates ----------------------------------------------------------------------------------------

_TAG = re.compile(r"<TIMEX2([^>]*)>|</TIMEX2>")
_VAL = re.compile(r'val="([^"]*)"')


def read_timex2(path: Path) -> tuple[str, list[tuple[int, int, str]], str]:
    """(TEXT of the document, gold spans (start, end, val) in it, creation date) from an inline
    TIMEX2 file (ACE TERN format); nested tags keep the outer and the inner span."""
    raw = path.read_text(encoding="utf-8")
    dct = re.search(r"<DATETIME>.*?(\d{4}-\d{2}-\d{2})", raw, re.S)
    body = raw[raw.index("<TEXT>") + len("<TEXT>") : raw.index("</TEXT>")]
    out, spans, stack, pos = [], [], [], 0
    for m in _TAG.finditer(body):
        out.append(body[pos : m.start()])
        pos = m.end()
        offset = sum(len(x) for x in out)
        if m.group(0).startswith("</"):
            start, val = stack.pop()
            spans.append((start, offset, val))
        else:
            v = _VAL.search(m.group(1) or "")
            stack.append((offset, v.group(1) if v else ""))
    out.append(body[pos:])
    return "".join(out), spans, dct.group(1) if dct else ""


def part_dates(args) -> None:
    folder = args.wikiwars
    if folder is None or not (folder / "keyinline").is_dir():
        print("dates: give --wikiwars DIR (the WikiWarsDE folder holding keyinline/); skipped")
        return
    files = sorted((folder / "keyinline").glob("*.xml"))
    print("dates: WikiWarsDE (TIMEX2, lenient extent match: a span overlapping a gold span)")
    # Tuning looked at documents 01-11 only; 12-22 are held out (see bench/README.md).
    for name, part in (("all 22", files), ("01-11 (tuned on)", files[:11]), ("12-22 (held out)", files[11:])):
        _date_figures(name, part, args.questions and name == "all 22")


def _date_figures(name: str, files: list[Path], show: bool) -> None:
    from datetime import date

    from auditor.temporal.extract import extract

    gold_all = gold_dated = hit_all = hit_dated = 0
    predicted = correct = 0
    missed: list[str] = []
    false: list[str] = []
    for file in files:
        text, spans, dct = read_timex2(file)
        reference = date.fromisoformat(dct) if dct else None
        found = extract(text, reference_date=reference, language="german")
        pred = [(e.char_start, e.char_end) for e in found]
        for start, end, val in spans:
            hit = any(a < end and start < b for a, b in pred)
            gold_all += 1
            hit_all += hit
            if re.match(r"\d", val):  # a calendar value: year, month, day, decade, century
                gold_dated += 1
                hit_dated += hit
                if not hit and len(missed) < 60:
                    missed.append(f"{text[start:end]!r} ({val})")
        for a, b in pred:
            predicted += 1
            ok = any(a < end and start < b for start, end, _ in spans)
            correct += ok
            if not ok and len(false) < 40:
                false.append(repr(text[max(0, a - 25) : b + 10].replace("\n", " ")))
    print(
        f"  {name:17s} calendar-valued gold {gold_dated:5d}, recall {hit_dated / gold_dated:.3f} | "
        f"all gold {gold_all:5d}, recall {hit_all / gold_all:.3f} | ours {predicted:5d}, precision {correct / predicted:.3f}"
    )
    if show:
        print("  missed (first 60):", "; ".join(missed))
        print("  not in the gold set (first 40):", "; ".join(false))


# --- main -----------------------------------------------------------------------------------------


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--part", choices=["all", "detectors", "kb", "dates"], default="all")
    parser.add_argument("--cache", type=Path, default=CACHE, help="where the Debian packages are unpacked")
    parser.add_argument("--wikiwars", type=Path, help="WikiWarsDE folder (holding keyinline/)")
    parser.add_argument("--language", action="store_true", help="also run with retrieval.language set")
    parser.add_argument("--questions", action="store_true", help="list each question's support / each miss")
    parser.add_argument("--offline", action="store_true", help="detectors: the question sets only")
    args = parser.parse_args(argv)
    started = time.perf_counter()
    if args.part in ("all", "detectors"):
        part_detectors(args)
    if args.part in ("all", "dates"):
        part_dates(args)
    if args.part in ("all", "kb"):
        part_kb(args)
    print(f"\n{time.perf_counter() - started:.0f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
