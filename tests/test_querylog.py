"""Query-log import: normalization, near-duplicate merging, counts -> weights, redaction before storing."""

from __future__ import annotations

import csv
import json
import logging
import random
import re
import sqlite3
from collections import Counter
from datetime import date
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.spatial.distance import jaccard as scipy_jaccard_distance

from auditor.config import Config, CorpusConfig, RedactionConfig, ReportConfig, load_config
from auditor.errors import ConfigError, InputError
from auditor.questions.querylog import (
    SUMMARY_ORDER,
    _prefix,
    import_query_log,
    jaccard,
    stored_redaction_counts,
    tokens,
)
from auditor.questions.redact import KINDS, PLACEHOLDERS, luhn_valid
from auditor.questions.sets import load_questions, store_questions, stored_questions
from auditor.scan import audit_and_report, load_question_files, scan, store_question_sets
from auditor.store import SCHEMA, SCHEMA_VERSION, Store
from bench import redaction as bench

# The redaction bench's value sources: libphonenumber's example numbers, stdnum's docstring
# examples, the IBAN registry's examples, published test cards, RFC 5737 / RFC 3849 addresses.

# Invented questions to a fictional water utility (demo data, fixtures/demo/README.md); each has 6+ distinct
# words, so one extra word keeps Jaccard ≥ 6/7 ≈ 0.857 with its base, while different bases share
# far less. "{pii}" marks where a generated line plants personal data.
BASES = [
    "how can I pay my water bill online",
    "when is the next meter reading in my street",
    "who do I call to report a burst main",
    "where can I see the current water quality report",
    "how long does a boil water advisory usually last",
    "what are the residential water rates this year",
    "can I get a rebate for a low flow toilet",
    "how do I start service at a new address",
    "how do I stop service when I move out",
    "why is my tap water brown this morning",
    "is there a late fee if my payment is delayed",
    "how much does a new service connection cost",
    "what should I do about a leak under the sidewalk",
    "when will the main replacement on oak avenue finish",
    "can I set up automatic payments from my bank account",
    "how do I read the dial on my water meter",
    "what is the hardness of our drinking water supply",
    "are there watering restrictions during the summer drought",
    "how do I apply for the senior discount programme",
    "who owns the pipe between the meter and my house",
    "my email~is~{pii} and I cannot log in to my account",
    "please change the contact number on my account to~{pii}",
    "my card~{pii} was charged twice for the same bill",
    "send the final bill for my old flat to~{pii} today",
    "call me back on~{pii} about the pressure drop",
    # "~" glues a cue to its value, so shuffled words and inserted filler never separate them.
    "please pay the refund into IBAN~{pii} this week",
    "why do you need my national~id~number~{pii} for the hardship fund",
    "my date~of~birth~is~{pii} for the senior discount",
    "where is my order~number~{pii} it never arrived",
    "the portal blocks~{pii} since monday when I log in",
    "is there a water leak outside~{pii} this morning",
    "hi my~name~is~{pii} and my water looks brown",
]
PII_KIND = {
    20: "email",
    21: "phone",
    22: "card",
    23: "email",
    24: "phone",
    25: "iban",
    26: "national_id",
    27: "birth_date",
    28: "account",
    29: "ip",
    30: "address",
    31: "name",
}
EXTRA_WORDS = ["now", "asap", "again", "quickly", "tonight"]  # not filler: make near-duplicates
FILLERS = ["please", "hi", "thanks", "hello", "just"]
NAMES = ["ann.lee", "bo_stone", "carla+bills", "dev.o'neil", "eve-marsh", "fen.k", "gil", "hana.ito"]


def _card(rng: random.Random) -> str:
    payload = "4" + "".join(rng.choice("0123456789") for _ in range(14))
    digits = next(payload + d for d in "0123456789" if luhn_valid(payload + d))
    style = rng.randrange(3)
    if style == 0:
        return digits
    sep = " " if style == 1 else "-"
    return sep.join(digits[i : i + 4] for i in range(0, 16, 4))


def _phone(rng: random.Random) -> str:
    # Numbers set aside for fiction (from memory): NANP 555-01xx, Ofcom 020 7946 0xxx (written with
    # +44: the default phone region is US, where "020 ..." is no national number).
    n = rng.randrange(100)
    return rng.choice(
        [
            f"(415) 555-01{n:02d}",
            f"415-555-01{n:02d}",
            f"+1 415 555 01{n:02d}",
            f"+14155550{100 + n}",
            f"+44 20 7946 0{n:03d}",
        ]
    )


def _email(rng: random.Random, i: int) -> str:
    return f"{rng.choice(NAMES)}{i}@{rng.choice(['example.org', 'mail.example.com', '例子.广告'])}"


POOLS = {"phone": bench._example_phones("US"), "national_id": bench.example_national_ids()}


def _planted(kind: str, rng: random.Random, i: int) -> str:
    if kind == "email":
        return _email(rng, i)
    if kind == "phone":
        return _phone(rng) if rng.random() < 0.5 else rng.choice(POOLS["phone"])[0]
    if kind == "card":
        return _card(rng)
    return bench._value(kind, rng, i, POOLS)[0]


def generate_log(path, lines: int, seed: int):
    """Write a CSV query log; return what was planted (counts per base, personal strings, ...)."""
    rng = random.Random(seed)
    planted_count = Counter()  # base index -> Σ counts
    planted_kinds = Counter()  # personal data finds by kind
    personal: list[str] = []
    near_keys: set[tuple[int, str]] = set()
    empty = 0
    rows = []
    for i in range(lines):
        if rng.random() < 0.01:  # a line that is nothing but personal data: dropped as empty
            value = _email(rng, i)
            personal.append(value)
            planted_kinds["email"] += 1
            rows.append({"query": value, "count": "", "timestamp": "", "session": value})
            empty += 1
            continue
        b = min(int(rng.paretovariate(1.2)) - 1, len(BASES) - 1) if rng.random() < 0.5 else rng.randrange(len(BASES))
        words = BASES[b].split()
        roll = rng.random()
        if roll < 0.15:
            words = [w.upper() if rng.random() < 0.3 else w.capitalize() for w in words]
        elif roll < 0.30:
            rng.shuffle(words)
        elif roll < 0.42:
            words.insert(rng.randrange(len(words) + 1), rng.choice(FILLERS))
        elif roll < 0.52:
            extra = rng.choice(EXTRA_WORDS)
            words.insert(rng.randrange(len(words) + 1), extra)
            near_keys.add((b, extra))
        text = " ".join(words)
        if rng.random() < 0.1:
            text = text.replace(" ", ", ", 1)
        if b in PII_KIND:
            kind = PII_KIND[b]
            value = _planted(kind, rng, i)
            personal.append(value)
            planted_kinds[kind] += 1
            text = text.replace("{PII}", "{pii}").replace("{Pii}", "{pii}").replace("{pii}", value)
        text = text.replace("~", " ")
        text += rng.choice(["", "?", "?", "!", ".", " ?", "??"])
        count = rng.choice(["", "", "1", "2", "3", "7"])
        planted_count[b] += int(count or 1)
        # The session column holds a personal string too: ignored columns must never be stored.
        session = personal[-1] if b in PII_KIND else f"s{rng.randrange(10**6)}"
        rows.append(
            {
                "query": text,
                "count": count,
                "timestamp": f"2026-11-{1 + i % 30:02d}T{i % 24:02d}:00:00Z",
                "session": session,
            }
        )
    with open(path, "w", newline="", encoding="utf-8") as fh:
        writer = csv.DictWriter(fh, fieldnames=["query", "count", "timestamp", "session"])
        writer.writeheader()
        writer.writerows(rows)
    return {
        "count": planted_count,
        "kinds": planted_kinds,
        "personal": personal,
        "near_keys": near_keys,
        "empty": empty,
    }


def _base_of(question: str) -> int:
    key = tokens(question)
    best = [
        b
        for b in range(len(BASES))
        if jaccard(key, tokens(BASES[b].replace("~", " ").replace("{pii}", "[" + PII_KIND.get(b, "") + "]"))) >= 0.85
    ]
    assert len(best) == 1, (question, best)
    return best[0]


def _forms(needle: str) -> list[str]:
    """What to look for: the value as planted, and for numbers of 8 digits or more the bare digit
    string too."""
    digits = "".join(ch for ch in needle if ch.isdigit())
    return [needle, digits] if "@" not in needle and len(digits) >= 8 else [needle]


def _scan_files(paths: list[Path], needles: list[str], texts: tuple[str, ...] = ()) -> list[str]:
    """The planted values (in any of their forms) found in the files' bytes or in `texts`.

    A substring search first (fast), then a word-boundary check: a first name alone may be part of
    a longer word ("Ann" in "Annual")."""
    chunks = list(texts)
    for p in paths:
        data = p.read_bytes()
        # SQLite stores TEXT as UTF-8 here (PRAGMA encoding default); read UTF-16 too, to be sure.
        chunks += [data.decode("utf-8", "replace"), data.decode("utf-16-le", "replace")]
    haystack = "\n".join(chunks)
    found = []
    for needle in dict.fromkeys(needles):
        for form in _forms(needle):
            if form in haystack and re.search(rf"(?<!\w){re.escape(form)}(?!\w)", haystack):
                found.append(form)
    return found


def _scan(db_path, needles: list[str]) -> list[str]:
    files = [db_path.with_name(db_path.name + s) for s in ("", "-wal", "-journal")]
    return _scan_files([p for p in files if p.exists()], needles)


def _tiny_corpus(folder: Path) -> Path:
    # Two invented help pages (demo scenario, fixtures/demo/README.md).
    kb = folder / "kb"
    kb.mkdir()
    (kb / "pay.md").write_text(
        "---\ntitle: Paying your bill\nupdated: 2026-10-01\n---\n# Paying your bill\n\n"
        "You can pay your water bill online, by phone or at the office. Refunds go to your bank account.\n",
        encoding="utf-8",
    )
    (kb / "leaks.md").write_text(
        "---\ntitle: Leaks\nupdated: 2026-09-15\n---\n# Report a leak\n\n"
        "Report a burst main or a leak in the street to the field crew line at any hour.\n",
        encoding="utf-8",
    )
    return kb


def _scan_everything(tmp_path: Path, log: Path, redaction: RedactionConfig, capsys, caplog) -> tuple[list[Path], str]:
    """`auditor scan`'s library function with the query log as the question file: the files it
    leaves (database, WAL, journal, report folder) and what it printed or logged."""
    work = tmp_path / f"scan-{len(list(tmp_path.glob('scan-*')))}"
    work.mkdir()
    config = Config(
        database=work / "audit.db",
        questions=(log,),
        corpus=CorpusConfig(paths=(_tiny_corpus(work),), jobs=1),
        report=ReportConfig(out=work / "report"),
        redaction=redaction,
    )
    with caplog.at_level(logging.DEBUG):
        outcome = scan(config, as_of=date(2026, 12, 1))
    output = capsys.readouterr()
    printed = "\n".join([output.out, output.err, caplog.text, *outcome.question_lines])
    files = [p for p in (work / "report").rglob("*") if p.is_file()]
    files += [work / n for n in ("audit.db", "audit.db-wal", "audit.db-journal") if (work / n).exists()]
    assert len(files) > 4 and any(p.name == "results.json" for p in files)
    return files, printed


def test_ten_thousand_generated_lines(tmp_path, capsys, caplog):
    log = tmp_path / "queries.csv"
    planted = generate_log(log, 10_000, seed=20261202)
    questions, summary = import_query_log(log)

    # Every kind is planted, hundreds of times each.
    assert set(planted["kinds"]) == set(KINDS) and min(planted["kinds"].values()) > 100

    # Every base comes out as exactly one question whose weight is the planted Σ counts.
    got = Counter()
    for q in questions:
        got[_base_of(q.question)] += q.weight
    assert len(questions) == len(planted["count"]) == len(BASES)
    assert got == planted["count"]
    assert [q.weight for q in questions] == sorted((q.weight for q in questions), reverse=True)
    assert [q.id for q in questions[:2]] == ["q-001", "q-002"]

    # The summary accounts for every line, every planted personal string, every merge.
    assert summary.records == 10_000
    assert summary.empty == planted["empty"]
    assert summary.total_count == sum(planted["count"].values())
    assert summary.redacted == planted["kinds"]
    assert summary.merged_near == len(planted["near_keys"])
    assert summary.merged_exact == 10_000 - planted["empty"] - summary.distinct
    assert summary.ignored_columns == ["session"]
    assert (summary.first_seen, summary.last_seen) == ("2026-11-01T00:00:00", "2026-11-30T23:00:00")
    assert f"10000 log lines -> {len(BASES)} questions" in summary.line()
    assert ", ".join(f"{planted['kinds'][k]} {k}" for k in SUMMARY_ORDER) in summary.line()
    for q in questions:
        assert "@" not in q.question and not any(ch.isdigit() for ch in q.question)

    # Store through the audit's code path, then scan the database files' bytes.
    db_path = tmp_path / "audit.db"
    store = Store(db_path)
    store_questions(store, questions, log.name)
    assert stored_questions(store, log.name) == questions
    assert _scan(db_path, planted["personal"]) == []  # while open: main file + WAL
    store.close()
    assert _scan(db_path, planted["personal"]) == []  # after the checkpoint on close

    # The whole scan, the log as its question file: nothing planted in the database, its WAL and
    # journal, the report folder, or anything printed or logged; the counts by kind are stored.
    files, printed = _scan_everything(tmp_path, log, RedactionConfig(), capsys, caplog)
    assert _scan_files(files, planted["personal"], (printed,)) == []
    with Store(next(p for p in files if p.name == "audit.db")) as kept:
        assert stored_redaction_counts(kept, log.name) == planted["kinds"]

    # The same log without redaction does leak, into the database and the report alike: the scans
    # above are able to find things.
    raw, _ = import_query_log(log, redact=False)
    leak_path = tmp_path / "leak.db"
    with Store(leak_path) as leak:
        store_questions(leak, raw, log.name)
        assert len(_scan(leak_path, planted["personal"])) > 0
    # (A 300-line log here: unredacted, every line is a question of its own.)
    small = tmp_path / "small" / "queries.csv"
    small.parent.mkdir()
    small_planted = generate_log(small, 300, seed=5)
    off = RedactionConfig(**{kind: False for kind in KINDS})
    database = next(p for p in files if p.name == "audit.db")
    config = Config(database=database, questions=(small,), redaction=off)
    with Store(database) as kept:
        audit_and_report(kept, config, load_question_files(config), as_of=date(2026, 12, 1), out_dir=tmp_path / "leak")
    report_files = [p for p in (tmp_path / "leak").rglob("*") if p.is_file()]
    assert len(_scan_files(report_files, small_planted["personal"])) > 0


def test_similarity_one_keeps_near_duplicates_apart(tmp_path):
    log = tmp_path / "queries.csv"
    planted = generate_log(log, 2_000, seed=7)
    questions, summary = import_query_log(log, similarity=1.0)
    assert summary.merged_near == 0
    assert len(questions) == len(planted["count"]) + len(planted["near_keys"])
    assert sum(q.weight for q in questions) == sum(planted["count"].values())


def test_load_questions_delegates_with_the_same_result(tmp_path):
    log = tmp_path / "queries.csv"
    generate_log(log, 500, seed=3)
    assert load_questions(log) == import_query_log(log)[0]


# --- normalization and merging rules --------------------------------------------------------------


def test_case_punctuation_order_and_filler_merge_exactly(tmp_path):
    log = tmp_path / "log.jsonl"
    lines = [
        "How do I pay my bill?",
        "how do i pay my bill",
        "PAY MY BILL, HOW DO I!",
        "please how do I pay my bill",
        "How  do I pay\tmy bill?",
    ]
    log.write_text("\n".join(json.dumps({"text": t, "hits": 2}) for t in lines) + "\n")
    questions, summary = import_query_log(log)
    assert [(q.question, q.weight) for q in questions] == [("How do I pay my bill?", 10.0)]
    assert (summary.merged_exact, summary.merged_near, summary.distinct) == (4, 0, 1)
    assert summary.text_column == "text" and summary.count_column == "hits"


def test_near_duplicates_merge_by_jaccard_threshold(tmp_path):
    log = tmp_path / "log.csv"
    # 6 words vs 7: Jaccard 6/7 = 0.857; vs a different last word: 5/7 = 0.714.
    log.write_text("query,count\nhow can I pay my bill,5\nhow can I pay my bill today,2\nhow can I pay my rent,1\n")
    merged, s1 = import_query_log(log, similarity=0.85)
    assert [(q.question, q.weight) for q in merged] == [("how can I pay my bill", 7.0), ("how can I pay my rent", 1.0)]
    assert s1.merged_near == 1
    assert s1.largest_merges == [{"question": "how can I pay my bill", "variants": 2, "count": 7}]
    loose, _ = import_query_log(log, similarity=0.7)
    assert [(q.question, q.weight) for q in loose] == [("how can I pay my bill", 8.0)]


def test_leader_clustering_does_not_chain(tmp_path):
    # A~B and B~C at 0.85 but A≁C: B joins A (the heavier); C, compared with leader A only, stays.
    a = "alpha beta gamma delta epsilon zeta"
    b = a + " eta"
    c = a + " eta theta"
    assert jaccard(tokens(a), tokens(b)) >= 0.85 and jaccard(tokens(b), tokens(c)) >= 0.85
    assert jaccard(tokens(a), tokens(c)) < 0.85
    log = tmp_path / "log.csv"
    log.write_text(f"query,count\n{a},5\n{b},3\n{c},1\n")
    questions, _ = import_query_log(log)
    assert [(q.question, q.weight) for q in questions] == [(a, 8.0), (c, 1.0)]


def test_owner_topic_carried_and_ids_by_weight(tmp_path):
    log = tmp_path / "log.csv"
    log.write_text(
        "search,count,owner,topic,user\n"
        "stop service,1,Customer Care,service,u1\n"
        "report a leak,4,Field Operations,leaks,u2\n"
        "Report a leak!,1,,leaks,u3\n"
    )
    questions, summary = import_query_log(log)
    assert [(q.id, q.question, q.owner, q.topic, q.weight) for q in questions] == [
        ("q-001", "report a leak", "Field Operations", "leaks", 5.0),
        ("q-002", "stop service", "Customer Care", "service", 1.0),
    ]
    assert summary.ignored_columns == ["user"]


def test_plain_text_log_and_explicit_columns(tmp_path):
    text_log = tmp_path / "log.txt"
    text_log.write_text("pay bill\nPay bill!\n\nleak\n")
    questions, summary = import_query_log(text_log)
    assert [(q.question, q.weight) for q in questions] == [("pay bill", 2.0), ("leak", 1.0)]
    assert summary.records == 3
    named = tmp_path / "named.csv"
    named.write_text("Utterance Text,N\nhello there,3\n")
    questions, _ = import_query_log(named, text_column="Utterance Text", count_column="n")
    assert [(q.question, q.weight) for q in questions] == [("hello there", 3.0)]


def test_deterministic(tmp_path):
    log = tmp_path / "queries.csv"
    generate_log(log, 1_000, seed=11)
    assert import_query_log(log) == import_query_log(log)


# --- bad logs -------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "content, kwargs, message",
    [
        ("query,count\nfine,2\nbad,two\n", {}, r"line 3: count 'two' is not a whole number"),
        ("query,count\nfine,2.5\n", {}, r"line 2: count '2.5' is not a whole number"),
        ("query,count\nzero,0\n", {}, r"line 2: count must be 1 or more"),
        ("session,timestamp\ns1,2026-01-01\n", {}, r"line 1: no query text column"),
        ("query,count\nx,1\n", {"text_column": "utterance"}, r"line 1: no text column 'utterance'"),
        ("query,count\nx,1\n", {"count_column": "hits"}, r"line 1: no count column 'hits'"),
        ("query,count\n", {}, r"no queries found"),
        ("query\nann@example.org\n+44 20 7946 0958\n", {}, r"no queries found"),
        ("query\nx\n", {"similarity": 0.0}, r"similarity must be in \(0, 1\]"),
    ],
)
def test_bad_logs(tmp_path, content, kwargs, message):
    path = tmp_path / "log.csv"
    path.write_text(content)
    with pytest.raises(InputError, match=message) as info:
        import_query_log(path, **kwargs)
    assert str(info.value).startswith(repr(str(path)) + ": ") and "\n" not in str(info.value)


def test_bad_jsonl_log_names_the_line(tmp_path):
    path = tmp_path / "log.jsonl"
    path.write_text('{"query": "a", "count": 1}\n{"query": ["a"], "count": 1}\n')
    with pytest.raises(InputError, match=r"line 2: query must be text, got \['a'\]"):
        import_query_log(path)
    path.write_text('{"query": "a", "count": {"n": 2}}\n')
    with pytest.raises(InputError, match=r"line 1: count \{'n': 2\} is not a whole number"):
        import_query_log(path)
    with pytest.raises(InputError, match=r"file not found"):
        import_query_log(tmp_path / "missing.jsonl")


# --- the similarity measure and its prefix filter -------------------------------------------------


@given(st.sets(st.integers(0, 30), max_size=12), st.sets(st.integers(0, 30), max_size=12))
def test_jaccard_matches_scipy(a, b):
    # scipy's Jaccard–Needham dissimilarity on boolean vectors is 1 − |A∩B|/|A∪B|.
    if not a and not b:
        return  # scipy defines 0/0 differently; ours is 1.0 by convention
    u = np.zeros(31, bool)
    v = np.zeros(31, bool)
    u[list(a)] = True
    v[list(b)] = True
    A = frozenset(map(str, a))
    B = frozenset(map(str, b))
    assert jaccard(A, B) == pytest.approx(1.0 - scipy_jaccard_distance(u, v))


@given(
    st.lists(st.sets(st.sampled_from("abcdefghij"), min_size=1, max_size=8), min_size=2, max_size=30),
    st.sampled_from([0.5, 0.6, 0.7, 0.8, 0.85, 0.9, 1.0]),
)
@settings(max_examples=200)
def test_prefix_filter_never_misses_a_similar_pair(sets, t):
    # Prefix-filter lemma (Chaudhuri et al. 2006): J(A,B) ≥ t ⇒ the t-prefixes (in one global
    # order) intersect. Brute force over every pair is the oracle.
    df = Counter(x for s in sets for x in s)
    order = [tuple(sorted(s, key=lambda x: (df[x], x))) for s in sets]
    for i in range(len(sets)):
        for j in range(i + 1, len(sets)):
            if jaccard(frozenset(sets[i]), frozenset(sets[j])) >= t:
                assert set(_prefix(order[i], t)) & set(_prefix(order[j], t))


def test_normalization_before_redaction(tmp_path):
    log = tmp_path / "log.csv"
    # Fullwidth digits and "＠" (NFKC folds them to ASCII, Unicode UAX #15), a zero-width space and
    # a soft hyphen inside words, personal data in the owner cell.
    log.write_text(
        "query,count,owner\n"
        "card ４１１１ １１１１ １１１１ １１１１ charged,1,ann＠example.org\n"
        "card [card] char\u00adged,2,\n"
        "lea\u200bk on my street,1,\n",
        encoding="utf-8",
    )
    questions, summary = import_query_log(log)
    assert [(q.question, q.weight, q.owner) for q in questions] == [
        ("card [card] charged", 3.0, "[email]"),
        ("leak on my street", 1.0, None),
    ]
    assert summary.redacted == Counter(card=1, email=1)
    assert summary.redacted_records == 1


def test_nested_values_in_dropped_keys_are_fine(tmp_path):
    path = tmp_path / "chat.jsonl"
    path.write_text(
        '{"utterance": "Leak on Oak Avenue", "ts": 1764547200, "context": {"user": "ann@example.org"}}\n'
        '{"utterance": "leak on oak avenue!", "ts": 1764633600, "context": ["x"]}\n'
    )
    questions, summary = import_query_log(path)
    assert [(q.question, q.weight) for q in questions] == [("Leak on Oak Avenue", 2.0)]
    assert summary.ignored_columns == ["context"]
    # Unix times 1764547200 and 1764633600 are 2025-12-01 and 2025-12-02, 00:00 UTC.
    assert (summary.first_seen, summary.last_seen) == ("2025-12-01T00:00:00", "2025-12-02T00:00:00")


# --- the seven-line log, counts by kind, strict, the [redaction] table ----------------------------

# The log a new user tried (IBAN of the SWIFT registry example, stdnum's example SSN, RFC 5737
# address; the rest invented): every line's personal data becomes its placeholder, the questions
# stay readable.
SEVEN_LINE_LOG = [
    "IBAN DE89 3704 0044 0532 0130 00 refund please",
    "my SSN is 536-90-4399, why was I charged twice?",
    "Hi, my name is Maria Lopez and my water pressure is low",
    "is there a leak at 42 Birch Lane",
    "where is my order number 88214573",
    "date of birth 14/07/1961 for the senior discount",
    "I cannot log in from 203.0.113.42",
]


def _write_log(path: Path, lines: list[str]) -> Path:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        writer = csv.writer(fh)
        writer.writerow(["query", "count"])
        writer.writerows([line, 1] for line in lines)
    return path


def test_the_seven_line_log(tmp_path):
    questions, summary = import_query_log(_write_log(tmp_path / "log.csv", SEVEN_LINE_LOG))
    assert sorted(q.question for q in questions) == sorted(
        [
            "IBAN [iban] refund please",
            "my SSN is [national_id], why was I charged twice?",
            "Hi, my name is [name] and my water pressure is low",
            "is there a leak at [address]",
            "where is my order number [account]",
            "date of birth [birth_date] for the senior discount",
            "I cannot log in from [ip]",
        ]
    )
    assert summary.redacted == Counter(iban=1, national_id=1, name=1, address=1, account=1, birth_date=1, ip=1)
    assert summary.line() == (
        "7 log lines -> 7 questions (0 exact and 0 near duplicates merged, 0 empty); "
        "redacted 1 iban, 1 national_id, 1 birth_date, 1 account, 1 ip, 1 address, 1 name"
    )


def test_placeholders_are_words_of_the_merge_key():
    assert tokens("pay to [iban] from [national_id]") == frozenset({"pay", "to", "[iban]", "from", "[national_id]"})
    assert set(PLACEHOLDERS.values()) <= {t for k in KINDS for t in tokens(f"x {PLACEHOLDERS[k]}")}


def test_strict_drops_lines_that_still_hold_long_digit_runs(tmp_path):
    log = _write_log(
        tmp_path / "log.csv",
        ["ticket 20261203117 still open", "how do I pay my bill", "my card 4111 1111 1111 1111 failed"],
    )
    questions, summary = import_query_log(log, redaction=RedactionConfig(strict=True))
    assert sorted(q.question for q in questions) == ["how do I pay my bill", "my card [card] failed"]
    assert summary.dropped_strict == 1
    assert summary.line().endswith("redacted 1 card; 1 dropped by strict")
    kept, loose = import_query_log(log)
    assert loose.dropped_strict == 0 and any("20261203117" in q.question for q in kept)


def test_kinds_turned_off_are_kept(tmp_path):
    log = _write_log(tmp_path / "log.csv", ["my name is Maria and my email is ann@example.org"])
    questions, summary = import_query_log(log, redaction=RedactionConfig(name=False))
    assert [q.question for q in questions] == ["my name is Maria and my email is [email]"]
    assert summary.redacted == Counter(email=1)


def test_the_phone_region_reads_national_numbers(tmp_path):
    log = _write_log(tmp_path / "log.csv", ["call me on 020 7946 0958 about the leak"])
    assert import_query_log(log)[0][0].question == "call me on 020 7946 0958 about the leak"
    questions, _ = import_query_log(log, redaction=RedactionConfig(phone_region="GB"))
    assert questions[0].question == "call me on [phone] about the leak"


def test_redaction_table_in_the_config(tmp_path):
    path = tmp_path / "audit.toml"
    path.write_text('[redaction]\nname = false\nphone_region = "GB"\nstrict = true\ncolour = 1\n', encoding="utf-8")
    warnings = []
    config = load_config(path, env={}, warn=warnings.append)
    assert config.redaction == RedactionConfig(name=False, phone_region="GB", strict=True)
    assert warnings == [f"{str(path)!r}: unknown key 'redaction.colour' ignored"]
    assert load_config(None, env={}).redaction == RedactionConfig()
    for bad, message in [
        ('phone_region = "XX"', "redaction.phone_region must be a region code"),
        ("email = 3", "redaction.email must be true or false"),
    ]:
        path.write_text(f"[redaction]\n{bad}\n", encoding="utf-8")
        with pytest.raises(ConfigError, match=message) as info:
            load_config(path, env={})
        assert str(info.value).startswith(repr(str(path)) + ": ")


def test_counts_by_kind_are_stored_never_the_values(tmp_path):
    log = _write_log(tmp_path / "log.csv", [*SEVEN_LINE_LOG, "ticket 20261203117"])
    config = Config(database=tmp_path / "audit.db", questions=(log,), redaction=RedactionConfig(strict=True))
    sets = load_question_files(config)
    with Store(config.database) as store:
        store_question_sets(store, sets)
        assert stored_redaction_counts(store, "log.csv") == Counter(
            iban=1, national_id=1, name=1, address=1, account=1, birth_date=1, ip=1, dropped_strict=1
        )
        assert not any("20261203117" in q["question"] for q in store.query("SELECT question FROM questions"))


def test_a_version_1_database_gains_the_counts_table(tmp_path):
    # A database written before the counts were stored: schema version 1, no redaction_counts.
    path = tmp_path / "old.db"
    with sqlite3.connect(path) as db:
        # (and without the statements' TIMEX3 columns of version 3)
        old = re.sub(r"-- What each query-log import redacted.*?\);\n", "", SCHEMA, flags=re.S)
        old = re.sub(r"\n\s*timex_\w+[^\n]*", "", old).replace(
            "char_end    INTEGER NOT NULL,\n);", "char_end    INTEGER NOT NULL\n);"
        )
        old = re.sub(r"    language(?:_source)? +TEXT,[^\n]*\n", "", old)  # added in version 4
        db.executescript(old)
        assert "redaction_counts" not in {r[0] for r in db.execute("SELECT name FROM sqlite_master")}
        db.execute("INSERT INTO meta (key, value) VALUES ('schema_version', '1')")
    with Store(path) as store:
        assert store.query("SELECT value FROM meta WHERE key = 'schema_version'") == [{"value": str(SCHEMA_VERSION)}]
        assert stored_redaction_counts(store, "log.csv") == Counter()
