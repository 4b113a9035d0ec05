"""Query-log import (docs/question-sets.md): search or chat logs -> a weighted question set.

A query log is a CSV or JSON Lines file with a text column and, optionally, a count and a
timestamp column (the names below, case-insensitive; or named by the caller); plain text is read as
one query a line. Each record goes through, in this order:

1. **normalization** (`normalize`): Unicode NFKC — so fullwidth digits and "＠" become ASCII —,
   invisible format characters dropped, whitespace collapsed;
2. **redaction** (`redact.redact`) of personal data — e-mail, IBAN, national identity, card and
   phone numbers, dates of birth, account numbers, IP and street addresses, names (the kinds of
   `redact.KINDS`, each on unless the config's `[redaction]` table turns it off) — in the query and
   in the carried owner/topic cells, before any grouping, so that no later step, summary or stored
   row ever holds the original. With `strict`, a record that still holds eight or more digits in a
   row is dropped whole (counted, never kept). The merge key is then the *set* of casefolded words
   (placeholders count as words) minus filler words (`FILLER`), so case, punctuation, word order
   and "please" do not separate two queries;
3. **exact merging** of records with the same key, then **near-duplicate merging** of keys whose
   token sets have a Jaccard similarity ≥ `similarity` (|A∩B| / |A∪B|). Keys are visited by
   falling count and each joins the first existing group whose *leader* (its most frequent key) is
   similar enough — leader clustering, so similarity never chains A~B~C into one group. Candidates
   come from a prefix filter (Chaudhuri, Ganti & Kaushik, ICDE 2006; Bayardo et al., WWW 2007):
   two sets with Jaccard ≥ t share a token among the first |X| − ⌈t·|X|⌉ + 1 tokens of each, in
   one global order (rarest first), so only those are compared;
4. **counts → weights**: a group's weight is the sum of its records' counts (1 per record without a
   count column); its wording is its most frequent redacted variant (first seen on a tie).

Questions come out heaviest first (first seen on a tie), with ids q-001, q-002, ... in that order.
Columns other than text, count, timestamp, owner and topic are dropped (listed in the summary, never
stored): logs carry session and user columns that must not travel further.
"""

from __future__ import annotations

import math
import re
import unicodedata
from collections import Counter
from dataclasses import dataclass, field
from datetime import UTC, datetime
from pathlib import Path

from auditor.config import RedactionConfig
from auditor.errors import InputError
from auditor.models import Question
from auditor.questions.files import (
    COUNT_COLUMNS,
    TEXT_COLUMNS,
    TIMESTAMP_COLUMNS,
    generated_id,
    header_line,
    read_records,
    read_text,
    sniff_format,
)
from auditor.questions.redact import KINDS, PLACEHOLDERS, RedactionOptions, has_long_digit_run
from auditor.questions.redact import redact as redact_text
from auditor.store import Store

CARRIED_COLUMNS = ("owner", "topic")
# The summary line lists the three kinds it always listed first, then the others in detection order.
SUMMARY_ORDER = ("email", "phone", "card", *(k for k in KINDS if k not in ("email", "phone", "card")))

# Words that change nothing about what is asked; common practice, no single source.
FILLER = frozenset("please pls plz hi hello hey thanks thank thx um uh er hmm just kindly quick question help".split())
_WORD = re.compile(r"\[(?:" + "|".join(KINDS) + r")\]|\w+")
_PLACEHOLDER_TOKENS = frozenset(PLACEHOLDERS.values())
# Soft hyphen, zero-width spaces and joiners, direction marks, word joiner, BOM: invisible in a
# query, but they would split words and separate otherwise identical queries.
_INVISIBLE = re.compile("[\u00ad\u200b-\u200f\u202a-\u202e\u2060-\u2064\ufeff]")


@dataclass
class QueryLogSummary:
    """What an import did: counts only, so it can be printed or stored without leaking anything."""

    path: str
    text_column: str | None = None
    count_column: str | None = None
    timestamp_column: str | None = None
    ignored_columns: list[str] = field(default_factory=list)
    records: int = 0  # log lines (records) read
    total_count: int = 0  # Σ counts of the kept records = Σ weights of the questions
    empty: int = 0  # records with no query text left (blank, or only placeholders / filler)
    distinct: int = 0  # distinct merge keys after normalization
    merged_exact: int = 0  # records folded into an identical key
    merged_near: int = 0  # keys folded into a similar group
    questions: int = 0
    similarity: float = 0.85
    redacted: Counter = field(default_factory=Counter)  # finds by kind (redact.KINDS)
    redacted_records: int = 0
    dropped_strict: int = 0  # records dropped by `strict`: eight or more digits left in a row
    first_seen: str | None = None  # ISO timestamps, when a timestamp column parses
    last_seen: str | None = None
    largest_merges: list[dict] = field(default_factory=list)  # {"question","variants","count"}

    def line(self) -> str:
        kinds = ", ".join(f"{self.redacted[k]} {k}" for k in SUMMARY_ORDER if self.redacted[k])
        dropped = f"; {self.dropped_strict} dropped by strict" if self.dropped_strict else ""
        return (
            f"{self.records} log lines -> {self.questions} questions "
            f"({self.merged_exact} exact and {self.merged_near} near duplicates merged, "
            f"{self.empty} empty); redacted {kinds or 'nothing'}{dropped}"
        )


def normalize(text: str) -> str:
    """NFKC (fullwidth digits and "＠" become ASCII, so redaction sees them), invisible format
    characters removed, whitespace collapsed."""
    return " ".join(_INVISIBLE.sub("", unicodedata.normalize("NFKC", text)).split())


def tokens(text: str) -> frozenset[str]:
    """The merge key of a (redacted) query: casefolded words and placeholders, minus filler."""
    return frozenset(t for t in _WORD.findall(text.casefold()) if t not in FILLER)


def jaccard(a: frozenset, b: frozenset) -> float:
    """|A∩B| / |A∪B| (Jaccard 1901); 1.0 for two empty sets."""
    if not a and not b:
        return 1.0
    inter = len(a & b)
    return inter / (len(a) + len(b) - inter)


def _pick(
    columns: list[str], wanted: str | None, names: tuple[str, ...], what: str, path: Path, line: int
) -> str | None:
    if wanted is not None:
        key = wanted.strip().casefold()
        if key not in columns:
            raise InputError(f"{str(path)!r}: line {line}: no {what} column {wanted!r} (found: {', '.join(columns)})")
        return key
    return next((n for n in names if n in columns), None)


def _count(path: Path, line: int, value) -> int:
    if value == "" or value is None:
        return 1
    try:
        if isinstance(value, bool):
            raise ValueError
        number = float(value)
        if not math.isfinite(number) or not number.is_integer():
            raise ValueError
    except (TypeError, ValueError):
        raise InputError(f"{str(path)!r}: line {line}: count {value!r} is not a whole number") from None
    if number < 1:
        raise InputError(f"{str(path)!r}: line {line}: count must be 1 or more, got {value!r}")
    return int(number)


def _timestamp(value) -> datetime | None:
    if value == "" or value is None:
        return None
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        try:
            return datetime.fromtimestamp(float(value), UTC)
        except (OverflowError, OSError, ValueError):
            return None
    try:
        return datetime.fromisoformat(str(value).replace("Z", "+00:00"))
    except ValueError:
        return None  # unparseable stamps only leave the period open; the query still counts


def _read(
    path: Path, text_column, count_column, summary: QueryLogSummary, parsed=None
) -> list[tuple[int, str, int, dict]]:
    """[(line, raw text, count, carried fields)] of the log; InputError on structural problems.

    `parsed` is (format, columns, records) when the caller has read the file already."""
    if parsed is None:
        content = read_text(path)
        fmt = sniff_format(path, content)
        if fmt == "text":  # one query a line
            rows: list[tuple[int, str, int, dict]] = [
                (n, line, 1, {}) for n, line in enumerate(content.splitlines(), 1) if line.strip()
            ]
            summary.records = len(rows)
            return rows
        columns, records = read_records(path, content, fmt)
    else:
        fmt, columns, records = parsed
    header = header_line(records)
    text_key = _pick(columns, text_column, TEXT_COLUMNS, "text", path, header)
    if text_key is None:
        raise InputError(
            f"{str(path)!r}: line {header}: no query text column; name one of "
            f"{', '.join(TEXT_COLUMNS)} (found: {', '.join(columns) or 'nothing'})"
        )
    count_key = _pick(columns, count_column, COUNT_COLUMNS, "count", path, header)
    time_key = next((n for n in TIMESTAMP_COLUMNS if n in columns and n not in (text_key, count_key)), None)
    used = {text_key, count_key, time_key, *CARRIED_COLUMNS}
    summary.text_column, summary.count_column, summary.timestamp_column = text_key, count_key, time_key
    summary.ignored_columns = [c for c in columns if c not in used]
    summary.records = len(records)
    first = last = None
    rows = []
    for line, fields in records:
        raw = fields.get(text_key)
        if isinstance(raw, (int, float)) and not isinstance(raw, bool):
            raw = str(raw)
        if raw is not None and not isinstance(raw, str):
            raise InputError(f"{str(path)!r}: line {line}: {text_key} must be text, got {raw!r}")
        count = _count(path, line, fields.get(count_key)) if count_key else 1
        if time_key:
            when = _timestamp(fields.get(time_key))
            if when is not None:
                if when.tzinfo is not None:  # compare in UTC, naive stamps taken as UTC
                    when = when.astimezone(UTC).replace(tzinfo=None)
                stamp = when.isoformat()
                first = stamp if first is None or stamp < first else first
                last = stamp if last is None or stamp > last else last
        carried = {c: fields.get(c) for c in CARRIED_COLUMNS if isinstance(fields.get(c), str) and fields.get(c)}
        rows.append((line, raw or "", count, carried))
    summary.first_seen, summary.last_seen = first, last
    return rows


def _prefix(key: tuple[str, ...], t: float) -> tuple[str, ...]:
    return key[: len(key) - math.ceil(t * len(key) - 1e-9) + 1]


def import_query_log(
    path,
    *,
    text_column: str | None = None,
    count_column: str | None = None,
    similarity: float = 0.85,
    redact: bool = True,
    redaction: RedactionConfig | None = None,
) -> tuple[list[Question], QueryLogSummary]:
    """Import a query log as a weighted question set (module docstring), with a summary.

    `similarity` is the Jaccard threshold for near duplicates (1.0 merges only identical keys).
    `redaction` (the config's `[redaction]` table) turns kinds off, sets the phone region and
    `strict`; the default redacts every kind. With `redact=False` personal data is kept — for logs
    already scrubbed upstream (`strict` still drops long digit runs).
    Raises InputError naming the file (and line) for a missing file, bad encoding, a missing text
    column, a bad count, or a log without any query.
    """
    return _import(Path(path), text_column, count_column, similarity, redact, redaction or RedactionConfig(), None)


def import_parsed_log(
    path: Path,
    fmt: str,
    columns: list[str],
    records: list[tuple[int, dict]],
    redaction: RedactionConfig | None = None,
) -> tuple[list[Question], QueryLogSummary]:
    """`import_query_log` with the defaults, over records `questions.read_records` has read."""
    return _import(Path(path), None, None, 0.85, True, redaction or RedactionConfig(), (fmt, columns, records))


def redaction_options(config: RedactionConfig) -> RedactionOptions:
    """The detectors to run and the phone region, from the config's `[redaction]` table."""
    return RedactionOptions(frozenset(k for k in KINDS if getattr(config, k)), config.phone_region)


def _import(path: Path, text_column, count_column, similarity, redact, redaction: RedactionConfig, parsed):
    options = redaction_options(redaction)
    if not 0.0 < similarity <= 1.0:
        raise InputError(f"{str(path)!r}: similarity must be in (0, 1], got {similarity!r}")
    summary = QueryLogSummary(path=str(path), similarity=similarity)
    rows = _read(path, text_column, count_column, summary, parsed)

    # Exact merge: key -> [count, first order, Counter(variant wording), Counter(owner), Counter(topic),
    # {variant: first order}]
    groups: dict[frozenset, list] = {}
    for order, (_line, raw, count, carried) in enumerate(rows):
        text = normalize(raw)
        if redact:
            text, found = redact_text(text, options)
            for name in CARRIED_COLUMNS:  # owner and topic cells are free text too
                if name in carried:
                    carried[name], more = redact_text(normalize(carried[name]), options)
                    found.update(more)
            if found:
                summary.redacted.update(found)
                summary.redacted_records += 1
        if redaction.strict and (has_long_digit_run(text) or any(map(has_long_digit_run, carried.values()))):
            summary.dropped_strict += 1
            continue
        key = tokens(text)
        if not key - _PLACEHOLDER_TOKENS:
            summary.empty += 1
            continue
        entry = groups.get(key)
        if entry is None:
            entry = groups[key] = [0, order, Counter(), Counter(), Counter(), {}]
        else:
            summary.merged_exact += 1
        entry[0] += count
        entry[2][text] += count
        entry[5].setdefault(text, order)
        for name, slot in (("owner", 3), ("topic", 4)):
            if name in carried:
                entry[slot][carried[name]] += count
        summary.total_count += count
    if not groups:
        raise InputError(f"{str(path)!r}: no queries found (empty log, or nothing left after redaction)")
    summary.distinct = len(groups)

    # Near-duplicate merge: leader clustering over keys by falling count, prefix-filtered.
    df = Counter(t for key in groups for t in key)
    keys = sorted(groups, key=lambda k: (-groups[k][0], groups[k][1]))
    clusters: list[list[frozenset]] = []
    leaders: list[frozenset] = []
    index: dict[str, list[int]] = {}
    for key in keys:
        ordered = tuple(sorted(key, key=lambda t: (df[t], t)))
        home = None
        if similarity < 1.0:
            seen: set[int] = set()
            for tok in _prefix(ordered, similarity):
                for c in index.get(tok, ()):
                    if c not in seen:
                        seen.add(c)
                        if jaccard(key, leaders[c]) >= similarity and (home is None or c < home):
                            home = c
        if home is None:
            home = len(clusters)
            clusters.append([key])
            leaders.append(key)
            for tok in _prefix(ordered, similarity):
                index.setdefault(tok, []).append(home)
        else:
            clusters[home].append(key)
            summary.merged_near += 1

    merged = []
    for members in clusters:
        count = sum(groups[k][0] for k in members)
        first = min(groups[k][1] for k in members)
        variants: Counter = Counter()
        owners: Counter = Counter()
        topics: Counter = Counter()
        firsts: dict[str, int] = {}
        for k in members:
            variants.update(groups[k][2])
            owners.update(groups[k][3])
            topics.update(groups[k][4])
            for v, seen_at in groups[k][5].items():
                firsts[v] = min(firsts.get(v, seen_at), seen_at)
        wording = min(variants, key=lambda v: (-variants[v], firsts[v], v))
        merged.append((count, first, wording, _top(owners), _top(topics), len(variants)))
    merged.sort(key=lambda m: (-m[0], m[1]))

    questions = [
        Question(id=generated_id(i, len(merged)), question=wording, owner=owner, topic=topic, weight=float(count))
        for i, (count, _first, wording, owner, topic, _n) in enumerate(merged, 1)
    ]
    summary.questions = len(questions)
    summary.largest_merges = [
        {"question": m[2], "variants": m[5], "count": m[0]}
        for m in sorted(merged, key=lambda m: (-m[5], -m[0], m[1]))[:10]
        if m[5] > 1
    ]
    return questions, summary


def _top(counter: Counter) -> str | None:
    return min(counter, key=lambda v: (-counter[v], v)) if counter else None


def store_redaction_counts(store: Store, set_name: str, summary: QueryLogSummary) -> None:
    """Keep what the import of `set_name` redacted, by kind — counts only, never a value — and the
    records `strict` dropped (kind "dropped_strict"), replacing the set's previous counts."""
    rows = [(set_name, kind, summary.redacted[kind]) for kind in KINDS if summary.redacted[kind]]
    if summary.dropped_strict:
        rows.append((set_name, "dropped_strict", summary.dropped_strict))
    with store.transaction() as db:
        db.execute("DELETE FROM redaction_counts WHERE set_name = ?", [set_name])
        db.conn.executemany("INSERT INTO redaction_counts (set_name, kind, count) VALUES (?, ?, ?)", rows)


def stored_redaction_counts(store: Store, set_name: str) -> Counter:
    """The counts `store_redaction_counts` kept for `set_name`."""
    rows = store.query("SELECT kind, count FROM redaction_counts WHERE set_name = ?", [set_name])
    return Counter({r["kind"]: r["count"] for r in rows})
