"""Question sets (docs/question-sets.md): CSV, JSON Lines or plain text -> `models.Question` list.

Format, by extension first and content second:

* ``.csv`` / ``.tsv`` -> CSV (delimiter ``,``; ``;`` or tab when the header uses that instead);
  ``.jsonl`` / ``.ndjson`` / ``.json`` -> JSON Lines; ``.txt`` / ``.text`` -> plain text.
* Any other extension: the first non-blank line decides — ``{`` starts JSON Lines, a header with a
  ``question`` (or query-log text) column is CSV, anything else is plain text.

A CSV or JSON Lines file is a **query log**, handed to `querylog.import_query_log`, when its
columns (keys) include a query-log text column (``query``, ``text``, ``search``, ``utterance``)
or a count or timestamp column (see `querylog.TEXT_COLUMNS`, `COUNT_COLUMNS`,
`TIMESTAMP_COLUMNS`). So ``question,count`` is a query log, ``question,weight`` a question set.
Plain text is always a question set.

Question-set rules (each breach is an InputError naming the file and the line):

* columns: ``question`` (required), ``id``, ``owner``, ``topic``, ``weight``, ``horizon_days``
  (case and surrounding spaces ignored). Any **other column is kept** (``notes``, ``url``,
  ``channel``: teams keep such columns) and carried to gaps.csv, the owner files and the report's
  row details; `read_question_file` says once which columns it keeps. A column whose name looks
  like a misspelt known one (``qestion``, ``wieght``: `difflib` similarity at least
  ``MISSPELT_RATIO``) is an error naming the column it probably means, since a typo would
  otherwise silently give every question weight 1. (Query logs differ: their extra columns —
  session, user — are dropped and listed in the import summary, never stored.)
* ``weight``: a finite number > 0, default 1; ``horizon_days``: a whole number > 0.
* a missing id becomes ``q-NNN``, NNN being the question's position in the file (1-based,
  zero-padded to at least 3 digits), so ids stay stable while the order stays; a generated id
  that collides with a given one is a duplicate-id error like any other.
* plain text: one question a line; blank lines and lines starting with ``#`` are skipped.
* encodings: UTF-8 (with or without BOM) or UTF-16 with a BOM; anything else is refused with the
  line of the first undecodable byte, rather than guessed.
* no questions at all (empty file, header only) is an error.

Curated question sets are not redacted (their authors chose the wording); query logs are.
"""

from __future__ import annotations

import difflib
import json
import logging
import math
from collections.abc import Callable
from pathlib import Path

from auditor.errors import InputError
from auditor.models import Question
from auditor.questions.files import generated_id, header_line, is_query_log, read_records, read_text, sniff_format
from auditor.questions.querylog import import_parsed_log

log = logging.getLogger(__name__)

QUESTION_COLUMNS = ("id", "question", "owner", "topic", "weight", "horizon_days")
# How alike (difflib.SequenceMatcher ratio) a column name must be to a known one to count as its
# misspelling: "qestion" ~ "question" 0.93, "wieght" ~ "weight" 0.83, "owners" ~ "owner" 0.91, while
# "notes", "url", "channel", "source" stay below 0.6 against every known column. Common practice
# for "did you mean", no published threshold; chosen on these examples.
MISSPELT_RATIO = 0.8


# --- reading --------------------------------------------------------------------------------------


def _weight(path: Path, line: int, value) -> float:
    if value == "" or value is None:
        return 1.0
    try:
        if isinstance(value, bool):
            raise ValueError
        weight = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{str(path)!r}: line {line}: weight {value!r} is not a number") from None
    if not math.isfinite(weight) or weight <= 0:
        raise InputError(f"{str(path)!r}: line {line}: weight must be a finite number above 0, got {value!r}")
    return weight


def _horizon(path: Path, line: int, value) -> int | None:
    if value == "" or value is None:
        return None
    try:
        if isinstance(value, bool) or (isinstance(value, float) and not value.is_integer()):
            raise ValueError
        days = int(value)
    except (TypeError, ValueError):
        raise InputError(f"{str(path)!r}: line {line}: horizon_days {value!r} is not a whole number") from None
    if days <= 0:
        raise InputError(f"{str(path)!r}: line {line}: horizon_days must be above 0, got {value!r}")
    return days


def _text_field(path: Path, line: int, name: str, value) -> str | None:
    if isinstance(value, str) and not value or value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (str, int)):
        raise InputError(f"{str(path)!r}: line {line}: {name} must be text, got {value!r}")
    return " ".join(str(value).split())


def build_questions(path: Path, rows: list[tuple[int, dict]]) -> list[Question]:
    """Validated questions from (line, fields) rows, ids filled in; InputError on the first breach."""
    if not rows:
        raise InputError(f"{str(path)!r}: no questions found (empty file?)")
    total = len(rows)
    given: dict[str, int] = {}
    for line, fields in rows:
        qid = _text_field(path, line, "id", fields.get("id"))
        if qid is not None:
            if qid in given:
                raise InputError(f"{str(path)!r}: line {line}: duplicate id {qid!r} (first on line {given[qid]})")
            given[qid] = line
    questions: list[Question] = []
    used: dict[str, int] = {}
    for position, (line, fields) in enumerate(rows, 1):
        text = _text_field(path, line, "question", fields.get("question"))
        if not text:
            raise InputError(f"{str(path)!r}: line {line}: empty question")
        qid = _text_field(path, line, "id", fields.get("id")) or generated_id(position, total)
        if qid in used:
            raise InputError(f"{str(path)!r}: line {line}: duplicate id {qid!r} (first on line {used[qid]})")
        used[qid] = line
        questions.append(
            Question(
                id=qid,
                question=text,
                owner=_text_field(path, line, "owner", fields.get("owner")),
                topic=_text_field(path, line, "topic", fields.get("topic")),
                weight=_weight(path, line, fields.get("weight")),
                horizon_days=_horizon(path, line, fields.get("horizon_days")),
                extra=tuple(
                    (name, _extra_value(value)) for name, value in fields.items() if name not in QUESTION_COLUMNS
                ),
            )
        )
    return questions


def _extra_value(value) -> str:
    """A kept column's cell as text (JSON Lines values may be numbers or lists)."""
    if value is None:
        return ""
    return value if isinstance(value, str) else json.dumps(value, ensure_ascii=False)


def likely_meant(column: str) -> str | None:
    """The known column `column` is probably a misspelling of, or None (see MISSPELT_RATIO)."""
    if column in QUESTION_COLUMNS:
        return None
    close = difflib.get_close_matches(column, QUESTION_COLUMNS, n=1, cutoff=MISSPELT_RATIO)
    return close[0] if close else None


def load_questions(path) -> list[Question]:
    """Load a question set (CSV, JSON Lines or plain text) or a query log, in file order.

    Query logs (see the module docstring for the rule) are imported with the default settings of
    `querylog.import_query_log` — redacted, near-duplicates merged, counts as weights — and its
    summary line is logged at INFO. Raises InputError naming the file (and line) on bad input.
    """
    questions, summary = read_question_file(path)
    if summary is not None:
        log.info("%s: %s", path, summary.line())
    return questions


def read_question_file(path, redaction=None, warn: Callable[[str], None] | None = None):
    """`load_questions`, also returning the query-log summary (None for a question set).

    For commands that print what a query-log import merged and redacted; `redaction` is the
    config's `[redaction]` table for a query log (default: every kind redacted). `warn` gets the one
    line that names the columns a question set keeps beyond the known ones (default: logged as a
    warning).
    """
    path = Path(path)
    text = read_text(path)
    fmt = sniff_format(path, text)
    if fmt == "text":
        rows = [
            (n, {"question": line.strip()})
            for n, line in enumerate(text.splitlines(), 1)
            if line.strip() and not line.lstrip().startswith("#")
        ]
        return build_questions(path, rows), None
    columns, records = read_records(path, text, fmt)
    if is_query_log(columns):
        return import_parsed_log(path, fmt, columns, records, redaction)
    if fmt == "csv" and "question" not in columns:
        for name in columns:
            if likely_meant(name) == "question":
                raise InputError(
                    f"{str(path)!r}: line {header_line(records)}: column {name!r} looks like a misspelling of "
                    f"'question'; rename it (known columns: {', '.join(QUESTION_COLUMNS)})"
                )
        raise InputError(
            f"{str(path)!r}: line {header_line(records)}: the header needs a 'question' column "
            f"(found: {', '.join(columns) or 'nothing'})"
        )
    # CSV: the header is checked even when no row follows; JSON Lines: each object on its line.
    checks = [(header_line(records), dict.fromkeys(columns))] if fmt == "csv" else records
    kept: dict[str, None] = {}
    for line, fields in checks:
        for name in fields:
            meant = likely_meant(name)
            if meant is not None and meant not in fields:
                raise InputError(
                    f"{str(path)!r}: line {line}: column {name!r} looks like a misspelling of {meant!r}; "
                    f"rename it (known columns: {', '.join(QUESTION_COLUMNS)})"
                )
            if name not in QUESTION_COLUMNS:
                kept.setdefault(name)
    questions = build_questions(path, records)
    if kept:
        (warn or log.warning)(
            f"{str(path)!r}: kept column{'s' if len(kept) > 1 else ''} {', '.join(map(repr, kept))} "
            f"as they are (known columns: {', '.join(QUESTION_COLUMNS)})"
        )
    return questions, None


# --- storing --------------------------------------------------------------------------------------


def store_questions(store, questions: list[Question], set_name: str) -> int:
    """Replace the stored question set `set_name` (the file's name) with `questions`, in order.

    One transaction: a failure leaves the previous set in place. Query-log questions arrive here
    already redacted (`querylog.import_query_log`), so nothing personal reaches the database.
    Returns the number of rows written.
    """
    rows = [
        (set_name, position, q.id, q.question, q.owner, q.topic, float(q.weight), q.horizon_days)
        for position, q in enumerate(questions)
    ]
    with store.transaction() as db:
        db.execute("DELETE FROM questions WHERE set_name = ?", [set_name])
        db.conn.executemany(
            "INSERT INTO questions (set_name, position, qid, question, owner, topic, weight, horizon_days) "
            "VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
            rows,
        )
    return len(rows)


def stored_questions(store, set_name: str) -> list[Question]:
    """The question set `set_name` as last stored, in order."""
    return [
        Question(
            id=r["qid"],
            question=r["question"],
            owner=r["owner"],
            topic=r["topic"],
            weight=r["weight"],
            horizon_days=r["horizon_days"],
        )
        for r in store.query("SELECT * FROM questions WHERE set_name = ? ORDER BY position", [set_name])
    ]
