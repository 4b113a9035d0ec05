"""Machine-readable exports of a run: results.json, gaps.csv, owners/<slug>.csv.

Every file is written to a temporary name in its final folder and renamed into place, so a reader
(or a killed process) never sees half a file. Output depends on the run object only: rows are in a
documented order and nothing reads the clock.

Owner rule (used by every export and by the HTML pages): a question's owner is the question's own
`owner`; else the owner of its best evidence (the first *supporting* evidence item in rank order, or
the first evidence item when none supports it); else ``"unassigned"``.

Columns of gaps.csv and owners/<slug>.csv (one row per question; gaps.csv holds only the questions
whose verdict is ``gap`` or ``stale``, an owner's file holds all of that owner's questions):

==============  ==============================================================================
id              question id
question        question text
owner           owner by the rule above
topic           topic, empty when none
weight          traffic weight (1 when the question set has no counts)
verdict         supported | stale | gap
reasons         stale reasons, ``;``-separated (too_old, expired, overtaken)
flags           ``;``-separated (stale_competitor, weak, file_dated, ...)
support         best support in [0, 1]
missing_terms   question terms the corpus never uses, ``;``-separated
action          write | refresh | retire, empty for supported
best_document   document of the best evidence
best_section    heading path of the best evidence
best_as_of      as-of date of the best evidence (ISO 8601), empty when undated
horizon_days    the freshness horizon that decided (of the passage the verdict rests on)
horizon_source  where it came from: default, path_rule, topic_rule, question (unrecorded for
                runs stored in format 1)
explanation     why the question has its verdict, naming that passage and that horizon
==============  ==============================================================================

After these come the question file's own other columns (`notes`, `url`, ...), in the order they
first appear, so that a team's spreadsheet columns travel with its questions; one that has the name
of a column above is written as ``extra_<name>``.

Rows are ordered by weight (highest first), then by question-set order. Text cells that a
spreadsheet would read as a formula (starting with ``= + - @``, tab or carriage return) get a leading
apostrophe, as the OWASP "CSV Injection" guidance recommends.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
import re
import tempfile
import unicodedata
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

from auditor.results import DocumentEntry, Evidence, QuestionResult, Run

UNASSIGNED = "unassigned"
CSV_COLUMNS = (
    "id",
    "question",
    "owner",
    "topic",
    "weight",
    "verdict",
    "reasons",
    "flags",
    "support",
    "missing_terms",
    "action",
    "best_document",
    "best_section",
    "best_as_of",
    "horizon_days",
    "horizon_source",
    "explanation",
)
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


# --- owners ---------------------------------------------------------------------------------------


def best_evidence(question: QuestionResult) -> Evidence | None:
    """The first supporting evidence item in rank order, else the first item, else None."""
    for item in question.evidence:
        if item.supporting:
            return item
    return question.evidence[0] if question.evidence else None


def _named(owner: str | None) -> str | None:
    name = str(owner or "").strip()
    return name if name and name != UNASSIGNED else None


def question_owner(question: QuestionResult) -> str:
    """Owner of a question by the rule in this module's docstring (blank counts as none)."""
    best = best_evidence(question)
    return _named(question.owner) or _named(best.owner if best else None) or UNASSIGNED


def slugify(name: str) -> str:
    """Lowercase ASCII letters, digits and hyphens, e.g. "Field Operations" -> "field-operations"."""
    ascii_name = unicodedata.normalize("NFKD", name).encode("ascii", "ignore").decode("ascii")
    slug = re.sub(r"[^a-z0-9]+", "-", ascii_name.lower()).strip("-")
    return slug[:60].strip("-") or "owner"


def owner_slugs(owners: Iterable[str]) -> dict[str, str]:
    """Map each owner name to a unique slug; clashes get -2, -3 ... in sorted name order."""
    slugs: dict[str, str] = {}
    used: set[str] = set()
    for name in sorted(set(owners)):
        base = slugify(name)
        slug, n = base, 1
        while slug in used:
            n += 1
            slug = f"{base}-{n}"
        used.add(slug)
        slugs[name] = slug
    return slugs


def document_owner(document: DocumentEntry) -> str:
    return _named(document.owner) or UNASSIGNED


def all_owners(run: Run) -> list[str]:
    """Every owner with a question or a document in the run, sorted."""
    names = {question_owner(q) for q in run.questions}
    names |= {document_owner(d) for d in run.documents}
    return sorted(names)


# --- files ----------------------------------------------------------------------------------------


def write_atomic(path: Path, data: str | bytes) -> None:
    """Write `data` to a temporary file beside `path`, flush it to disk, then rename it into place."""
    path.parent.mkdir(parents=True, exist_ok=True)
    raw = data.encode("utf-8") if isinstance(data, str) else data
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        os.chmod(tmp, 0o666 & ~_umask())  # mkstemp makes 0600; a report is meant to be shared
        with os.fdopen(fd, "wb") as fh:
            fh.write(raw)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def _finite(value: Any) -> Any:
    """JSON has no NaN/Infinity; write null instead of producing an unreadable file."""
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if isinstance(value, dict):
        return {k: _finite(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_finite(v) for v in value]
    return value


def results_json(run: Run) -> str:
    """results.json: the run's JSON (`Run.to_json`), UTF-8, not ASCII-escaped, laid out as
    docs/results-json.md says: a line per top-level key, and in each top-level list a line per item
    (a question, a passage, ...), each item compact. Indenting inside items would make a large run's
    file about 70 % bigger for no reader's gain; a line per question still diffs and greps well."""
    ordered = run.to_json()
    try:
        return _layout(ordered)
    except ValueError:  # a NaN or infinity somewhere: write null there rather than invalid JSON
        return _layout(_finite(ordered))


def _compact(value: Any) -> str:
    return json.dumps(value, ensure_ascii=False, allow_nan=False, separators=(",", ":"))


def _layout(data: dict) -> str:
    parts = []
    for key, value in data.items():
        if isinstance(value, list) and value:
            items = ",\n".join("    " + _compact(item) for item in value)
            parts.append(f"  {_compact(key)}: [\n{items}\n  ]")
        else:
            parts.append(f"  {_compact(key)}: {_compact(value)}")
    return "{\n" + ",\n".join(parts) + "\n}\n"


def _cell(value: object) -> str:
    if value is None:
        return ""
    text = str(value)
    return "'" + text if text.startswith(_FORMULA_START) else text


def _number(value: float | None) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value)) if abs(value) < 1e15 else repr(value)
    return repr(value) if isinstance(value, float) else str(value)


def extra_columns(questions: list[QuestionResult]) -> list[str]:
    """The question files' own columns of `questions`, in first-seen order."""
    return list(dict.fromkeys(k for q in questions for k in q.extra))


def csv_row(question: QuestionResult, extra: Sequence[str] = ()) -> list[str]:
    best = best_evidence(question)
    horizon = question.horizon
    return [
        _cell(question.id),
        _cell(question.question),
        _cell(question_owner(question)),
        _cell(question.topic),
        _number(question.weight),
        _cell(question.verdict),
        _cell(";".join(question.reasons)),
        _cell(";".join(question.flags)),
        _number(question.support),
        _cell(";".join(question.missing_terms)),
        _cell(question.action),
        _cell(best.document if best else None),
        _cell(best.section if best else None),
        _cell(best.as_of if best else None),
        _number(horizon.days if horizon else None),
        _cell(horizon.source if horizon else None),
        _cell(question.explanation),
        *(_cell(question.extra.get(name)) for name in extra),
    ]


def questions_csv(questions: list[QuestionResult]) -> str:
    """CSV text (RFC 4180, CRLF line ends) of `questions`, ordered by weight then input order."""
    order = sorted(range(len(questions)), key=lambda i: (-float(questions[i].weight or 0.0), i))
    extra = extra_columns(questions)
    buf = io.StringIO(newline="")
    writer = csv.writer(buf, lineterminator="\r\n")
    writer.writerow([*CSV_COLUMNS, *(f"extra_{c}" if c in CSV_COLUMNS else c for c in extra)])
    for i in order:
        writer.writerow(csv_row(questions[i], extra))
    return buf.getvalue()


def gap_questions(run: Run) -> list[QuestionResult]:
    return [q for q in run.questions if q.verdict in ("gap", "stale")]


def owner_questions(run: Run, owner: str) -> list[QuestionResult]:
    return [q for q in run.questions if question_owner(q) == owner]


def write_exports(run: Run, out_dir: Path, slugs: dict[str, str]) -> list[Path]:
    """Write results.json, gaps.csv and owners/<slug>.csv; return the paths written."""
    written = []
    path = out_dir / "results.json"
    write_atomic(path, results_json(run))
    written.append(path)
    path = out_dir / "gaps.csv"
    write_atomic(path, questions_csv(gap_questions(run)))
    written.append(path)
    for owner, slug in sorted(slugs.items(), key=lambda kv: kv[1]):
        path = out_dir / "owners" / f"{slug}.csv"
        write_atomic(path, questions_csv(owner_questions(run, owner)))
        written.append(path)
    return written
