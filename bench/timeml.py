"""TIMEX3 extraction scored on TimeML documents as the TempEval-3 task defined it.

Reads the TBAQ-cleaned training release of TempEval-3 (TimeBank 1.2 and AQUAINT, 256 news
documents) straight from its archive in `../shared/data/timeml/` (never copied into the project),
runs `auditor.temporal.extract.extract` on each document's `<TEXT>` with the document's creation
time (the `CREATION_TIME` TIMEX3) as the reference date, and compares the expressions found with
the gold TIMEX3 annotations.

Measures (UzZaman et al., "SemEval-2013 Task 1: TempEval-3: Evaluating Time Expressions, Events,
and Temporal Relations", 2013, section 4.1):
* strict match: a system expression and a gold TIMEX3 with the same extent (here: the same
  character offsets); relaxed match: their extents overlap. Precision = matched system expressions
  / system expressions, recall = matched gold / gold, F1 their harmonic mean. Each gold TIMEX3 is
  matched to at most one system expression (greedily, in text order).
* value (and type) accuracy: the share of relaxed matches whose TIMEX3 `value` (`type`) is the
  gold one; value F1: precision and recall counting only relaxed matches with the right value.
Figures are printed overall and per TIMEX3 type (recall by the gold type, precision by the
system's type).

The documents are split in two by a hash of the document name (a fixed rule, not chosen by
looking at the documents): `dev` (about three quarters) is what the extractor was developed on;
`held-out` is scored but its errors are never printed, so that it stays out of sample. The
`--errors` listing shows development documents only.

    python -m bench.timeml [--data ../shared/data/timeml/tbaq-cleaned.tar.gz] [--errors 40]
"""

from __future__ import annotations

import argparse
import collections
import hashlib
import html
import re
import sys
import tarfile
from dataclasses import dataclass
from datetime import date
from pathlib import Path

from auditor.temporal.extract import extract, timex3

DEFAULT_DATA = Path(__file__).resolve().parent.parent.parent / "shared" / "data" / "timeml" / "tbaq-cleaned.tar.gz"
TYPES = ("DATE", "TIME", "DURATION", "SET")


@dataclass(frozen=True)
class Timex:
    begin: int
    end: int
    text: str
    type: str
    value: str | None


@dataclass
class Document:
    name: str
    dct: date
    text: str
    gold: list[Timex]


_TAG = re.compile(r"<(/?)([A-Za-z0-9_]+)([^>]*)>")
_ATTR = re.compile(r'(\w+)="([^"]*)"')


def parse_tml(name: str, xml: str) -> Document:
    """The plain text of `<TEXT>` with the offsets of its TIMEX3 elements, and the creation date."""
    dct_match = re.search(r"<DCT>\s*<TIMEX3([^>]*)>", xml)
    if dct_match is None:
        raise ValueError(f"{name}: no DCT")
    dct = date.fromisoformat(dict(_ATTR.findall(dct_match.group(1)))["value"][:10])
    body = xml[xml.index("<TEXT>") + len("<TEXT>") : xml.index("</TEXT>")]
    pieces: list[str] = []
    length = 0
    gold: list[Timex] = []
    open_timex: tuple[int, dict] | None = None
    at = 0
    for tag in _TAG.finditer(body):
        chunk = html.unescape(body[at : tag.start()])
        pieces.append(chunk)
        length += len(chunk)
        at = tag.end()
        if tag.group(2) != "TIMEX3":
            continue
        if tag.group(1):
            assert open_timex is not None
            begin, attrs = open_timex
            text = "".join(pieces)[begin:length]
            gold.append(Timex(begin, length, text, attrs.get("type", ""), attrs.get("value")))
            open_timex = None
        else:
            open_timex = (length, dict(_ATTR.findall(tag.group(3))))
    pieces.append(html.unescape(body[at:]))
    return Document(name, dct, "".join(pieces), gold)


def load(path: Path) -> list[Document]:
    documents = []
    with tarfile.open(path) as archive:
        for member in sorted(archive.getmembers(), key=lambda m: m.name):
            if member.isfile() and member.name.endswith(".tml"):
                raw = archive.extractfile(member)
                assert raw is not None
                documents.append(parse_tml(Path(member.name).name, raw.read().decode("utf-8")))
    return documents


def is_held_out(name: str) -> bool:
    """A quarter of the documents, by a hash of the name: the out-of-sample part."""
    return hashlib.sha256(name.encode()).digest()[0] % 4 == 0


def system_timexes(document: Document) -> list[Timex]:
    found = []
    for e in extract(document.text, document.dct):
        kind = getattr(e, "timex_type", "DATE")
        value = getattr(e, "value", None) if hasattr(e, "value") else timex3(e)
        found.append(Timex(e.char_start, e.char_end, e.expression, kind, value))
    return found


@dataclass
class Tally:
    gold: int = 0
    system: int = 0
    strict_gold: int = 0
    strict_system: int = 0
    relaxed_gold: int = 0
    relaxed_system: int = 0
    value_right: int = 0
    type_right: int = 0
    value_right_system: int = 0

    def add(self, other: Tally) -> None:
        for key, value in vars(other).items():
            setattr(self, key, getattr(self, key) + value)


def _f1(p: float, r: float) -> float:
    return 2 * p * r / (p + r) if p + r else 0.0


def _ratio(a: int, b: int) -> float:
    return a / b if b else 0.0


def match(gold: list[Timex], system: list[Timex]) -> list[tuple[Timex, Timex]]:
    """Relaxed one-to-one pairs: each gold TIMEX3 takes the first unused overlapping system one,
    preferring an identical extent."""
    used: set[int] = set()
    pairs = []
    for g in gold:
        candidates = [i for i, s in enumerate(system) if i not in used and s.begin < g.end and g.begin < s.end]
        if not candidates:
            continue
        exact = [i for i in candidates if (system[i].begin, system[i].end) == (g.begin, g.end)]
        chosen = (exact or candidates)[0]
        used.add(chosen)
        pairs.append((g, system[chosen]))
    return pairs


def score(documents: list[Document]) -> tuple[dict[str, Tally], list[str]]:
    """Tallies overall ("ALL") and per type; error lines (misses, extras, wrong values)."""
    tallies = {key: Tally() for key in ("ALL", *TYPES)}
    errors: list[str] = []
    for document in documents:
        system = system_timexes(document)
        pairs = match(document.gold, system)
        matched_system = {id(s) for _, s in pairs}
        matched_gold = {id(g) for g, _ in pairs}
        for g in document.gold:
            for key in ("ALL", g.type):
                tallies[key].gold += 1
            if id(g) not in matched_gold:
                errors.append(f"{document.name} {document.dct} missed {g.type} {g.value} {g.text!r}")
        for s in system:
            for key in ("ALL", s.type):
                if key in tallies:
                    tallies[key].system += 1
            if id(s) not in matched_system:
                errors.append(f"{document.name} {document.dct} extra {s.type} {s.value} {s.text!r}")
        for g, s in pairs:
            strict = (g.begin, g.end) == (s.begin, s.end)
            right = s.value == g.value
            for key in ("ALL", g.type):
                tallies[key].relaxed_gold += 1
                tallies[key].strict_gold += strict
                tallies[key].value_right += right
                tallies[key].type_right += s.type == g.type
            for key in {"ALL", s.type} & set(tallies):
                tallies[key].relaxed_system += 1
                tallies[key].strict_system += strict
                tallies[key].value_right_system += right
            if not right or not strict:
                errors.append(
                    f"{document.name} {document.dct} {'value' if not right else 'extent'}: "
                    f"gold {g.type} {g.value} {g.text!r}, ours {s.type} {s.value} {s.text!r}"
                )
    return tallies, errors


def figures(t: Tally) -> dict[str, float]:
    sp, sr = _ratio(t.strict_system, t.system), _ratio(t.strict_gold, t.gold)
    rp, rr = _ratio(t.relaxed_system, t.system), _ratio(t.relaxed_gold, t.gold)
    vp, vr = _ratio(t.value_right_system, t.system), _ratio(t.value_right, t.gold)
    return {
        "strict P": sp,
        "strict R": sr,
        "strict F1": _f1(sp, sr),
        "relaxed P": rp,
        "relaxed R": rr,
        "relaxed F1": _f1(rp, rr),
        "type acc": _ratio(t.type_right, t.relaxed_gold),
        "value acc": _ratio(t.value_right, t.relaxed_gold),
        "value F1": _f1(vp, vr),
    }


def print_table(label: str, tallies: dict[str, Tally]) -> None:
    columns = list(figures(Tally()))
    print(f"\n{label}")
    print(f"{'':9}{'gold':>6}{'found':>6}" + "".join(f"{c:>11}" for c in columns))
    for key, tally in tallies.items():
        row = figures(tally)
        print(f"{key:9}{tally.gold:>6}{tally.system:>6}" + "".join(f"{100 * row[c]:>11.1f}" for c in columns))


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--data", type=Path, default=DEFAULT_DATA, help="tbaq-cleaned.tar.gz")
    parser.add_argument("--errors", type=int, default=0, help="print this many development-set errors")
    args = parser.parse_args()
    if not args.data.exists():
        print(f"{str(args.data)!r}: TimeML data not found (see ../shared/data/timeml/README.md)", file=sys.stderr)
        return 2
    documents = load(args.data)
    dev = [d for d in documents if not is_held_out(d.name)]
    held = [d for d in documents if is_held_out(d.name)]
    dev_tallies, errors = score(dev)
    held_tallies, _ = score(held)
    every = {key: Tally() for key in dev_tallies}
    for key in every:
        every[key].add(dev_tallies[key])
        every[key].add(held_tallies[key])
    print_table(f"all training documents ({len(documents)})", every)
    print_table(f"dev: development part ({len(dev)} documents, in sample)", dev_tallies)
    print_table(f"held-out: not looked at while developing ({len(held)} documents)", held_tallies)
    if args.errors:
        print(f"\ndevelopment errors (first {args.errors} of {len(errors)}, most frequent kinds first):")
        kinds = collections.Counter(e.split(" ", 2)[2].split(":")[0].split(" ")[0] for e in errors)
        print("  " + ", ".join(f"{k} {n}" for k, n in kinds.most_common()))
        for line in errors[: args.errors]:
            print("  " + line)
    return 0


if __name__ == "__main__":
    sys.exit(main())
