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
verdict         covered | stale | gap
reasons         stale reasons, ``;``-separated (too_old, expired, overtaken)
flags           ``;``-separated (stale_competitor, weak, file_dated, ...)
support         best support in [0, 1]
missing_terms   question terms the corpus never uses, ``;``-separated
action          write | refresh | retire, empty for covered
best_document   document of the best evidence
best_section    heading path of the best evidence
best_as_of      as-of date of the best evidence (ISO 8601), empty when undated
==============  ==============================================================================

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
from pathlib import Path

UNASSIGNED = "unassigned"
# The keys of results.json format 1 (docs/results-json.md), which come first in that file.
FORMAT1_KEYS = ("format", "run", "summary", "questions", "ingest_errors")
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
)
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


# --- owners ---------------------------------------------------------------------------------------


def best_evidence(question: dict) -> dict | None:
    """The first supporting evidence item in rank order, else the first item, else None."""
    evidence = question.get("evidence") or []
    for item in evidence:
        if item.get("supporting"):
            return item
    return evidence[0] if evidence else None


def _named(owner) -> str | None:
    name = str(owner or "").strip()
    return name if name and name != UNASSIGNED else None


def question_owner(question: dict) -> str:
    """Owner of a question by the rule in this module's docstring (blank counts as none)."""
    return _named(question.get("owner")) or _named((best_evidence(question) or {}).get("owner")) or UNASSIGNED


def slugify(name: str) -> str:
    """Lowercase ASCII letters, digits and hyphens, e.g. "Field Operations" -> "field-operations"."""
    ascii_name = unicodedata.normalize("NFKD", name).encode("ascii", "ignore").decode("ascii")
    slug = re.sub(r"[^a-z0-9]+", "-", ascii_name.lower()).strip("-")
    return slug[:60].strip("-") or "owner"


def owner_slugs(owners) -> dict[str, str]:
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


def document_owner(document: dict) -> str:
    return _named(document.get("owner")) or UNASSIGNED


def all_owners(run: dict) -> list[str]:
    """Every owner with a question or a document in the run, sorted."""
    names = {question_owner(q) for q in run.get("questions") or []}
    names |= {document_owner(d) for d in run.get("documents") or []}
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


def _finite(value):
    """JSON has no NaN/Infinity; write null instead of producing an unreadable file."""
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if isinstance(value, dict):
        return {k: _finite(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_finite(v) for v in value]
    return value


def results_json(run: dict) -> str:
    """The run object as-is, format-1 keys first, pretty-printed (UTF-8, not ASCII-escaped)."""
    ordered = {k: run[k] for k in FORMAT1_KEYS if k in run}
    ordered.update((k, v) for k, v in run.items() if k not in ordered)
    try:
        text = json.dumps(ordered, indent=2, ensure_ascii=False, allow_nan=False)
    except ValueError:  # a NaN or infinity somewhere: write null there rather than invalid JSON
        text = json.dumps(_finite(ordered), indent=2, ensure_ascii=False, allow_nan=False)
    return text + "\n"


def _cell(value) -> str:
    if value is None:
        return ""
    text = str(value)
    return "'" + text if text.startswith(_FORMULA_START) else text


def _number(value) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value)) if abs(value) < 1e15 else repr(value)
    return repr(value) if isinstance(value, float) else str(value)


def csv_row(question: dict) -> list[str]:
    best = best_evidence(question) or {}
    return [
        _cell(question.get("id")),
        _cell(question.get("question")),
        _cell(question_owner(question)),
        _cell(question.get("topic")),
        _number(question.get("weight", 1.0)),
        _cell(question.get("verdict")),
        _cell(";".join(question.get("reasons") or [])),
        _cell(";".join(question.get("flags") or [])),
        _number(question.get("support")),
        _cell(";".join(question.get("missing_terms") or [])),
        _cell(question.get("action")),
        _cell(best.get("document")),
        _cell(best.get("section")),
        _cell(best.get("as_of")),
    ]


def questions_csv(questions: list[dict]) -> str:
    """CSV text (RFC 4180, CRLF line ends) of `questions`, ordered by weight then input order."""
    order = sorted(range(len(questions)), key=lambda i: (-float(questions[i].get("weight") or 0.0), i))
    buf = io.StringIO(newline="")
    writer = csv.writer(buf, lineterminator="\r\n")
    writer.writerow(CSV_COLUMNS)
    for i in order:
        writer.writerow(csv_row(questions[i]))
    return buf.getvalue()


def gap_questions(run: dict) -> list[dict]:
    return [q for q in run.get("questions") or [] if q.get("verdict") in ("gap", "stale")]


def owner_questions(run: dict, owner: str) -> list[dict]:
    return [q for q in run.get("questions") or [] if question_owner(q) == owner]


def write_exports(run: dict, out_dir: Path, slugs: dict[str, str]) -> list[Path]:
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
