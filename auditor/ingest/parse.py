"""The work of one file, done in a worker process: read, detect, parse, segment, tokenize, date.

Workers send plain data back; only the main process (auditor/ingest/pipeline.py) writes to SQLite.
"""

from __future__ import annotations

import os
import time
from dataclasses import dataclass
from pathlib import Path

from auditor.ingest.dates import file_time_date
from auditor.ingest.failures import IngestFailure
from auditor.ingest.html import parse_html
from auditor.ingest.languages import document_language
from auditor.ingest.markdown import parse_markdown
from auditor.ingest.pdf import parse_pdf
from auditor.ingest.segment import segment
from auditor.ingest.text import parse_text
from auditor.ingest.walk import detect_kind, read_file, sha256
from auditor.language import DEFAULT_CANDIDATES
from auditor.models import MetaDate
from auditor.retrieval.tokenize import Tokenizer
from auditor.temporal import extract as temporal

PARSERS = {"pdf": parse_pdf, "html": parse_html, "markdown": parse_markdown, "text": parse_text}


@dataclass
class Settings:
    language: str
    stopwords: str
    day_first: bool
    fiscal_year_start: int
    hemisphere: str
    detect: tuple[str, ...] = DEFAULT_CANDIDATES  # the languages a document's language is chosen among


_TOKENIZERS: dict = {}


def warm_up(settings: Settings) -> None:
    """Import the parsers and run each costly first call once, so that a worker's start-up does
    not count against the per-file timeout."""
    try:
        key = (settings.language, settings.stopwords, settings.detect)
        _TOKENIZERS.setdefault(key, Tokenizer(*key)).tokenize(
            "Warm up the stemmer and the language detector on a text long enough for the document mode, "
            "which loads the small models only."
        )
        temporal.extract(
            "Updated 1 March 2024, effective next month.",
            reference_date=None,
            day_first=settings.day_first,
            fiscal_year_start=settings.fiscal_year_start,
            hemisphere=settings.hemisphere,
        )
    except Exception:  # the same error will be reported for each file, with its name
        pass


def choose_doc_date(dates: list[MetaDate]) -> MetaDate | None:
    """The document date: a modified/reviewed date first, then published, then created, each in
    the parser's most-specific-first order."""
    for kinds in (("modified", "reviewed"), ("published",), ("created",)):
        for d in dates:
            if d.kind in kinds:
                return d
    return None


def parse_file(task: dict, settings: Settings) -> dict:
    """Read, detect, parse, segment, tokenize and date one file. Spawn-safe (top level).

    Returns {"ok": True, ...document fields, "passages": [...]} or {"ok": False, "kind", "message"}.
    """
    cpu = time.process_time()
    result = _parse_file(task, settings)
    result["cpu"] = (os.getpid(), time.process_time() - cpu)  # for the bench: work per worker
    return result


def _parse_file(task: dict, settings: Settings) -> dict:
    file = task["file"]
    try:
        data = read_file(Path(file), task["doc_path"])
        kind = detect_kind(data, task["kind"], file)
        parsed = PARSERS[kind](data, file)
    except IngestFailure as exc:
        return {"ok": False, "kind": exc.kind, "message": str(exc)}
    except RecursionError:
        return {"ok": False, "kind": "parse_error", "message": f"{file!r}: nested too deeply to parse"}
    except MemoryError:
        return {"ok": False, "kind": "parse_error", "message": f"{file!r}: out of memory while parsing"}
    dates = list(parsed.dates)
    if task.get("sitemap"):
        dates.append(task["sitemap"])
    chosen = choose_doc_date(dates)
    if chosen is not None:
        doc_date, doc_date_source = chosen.value, chosen.source
    else:
        doc_date, doc_date_source = file_time_date(task["mtime"]), "file:mtime"
    expires = next((d.value for d in dates if d.kind == "expires"), None)
    key = (settings.language, settings.stopwords, settings.detect)
    tokenizer = _TOKENIZERS.get(key) or _TOKENIZERS.setdefault(key, Tokenizer(*key))
    language, language_source = document_language(task.get("language"), parsed.language, parsed.blocks, settings.detect)
    passages = []
    for p in segment(parsed.blocks):
        statements = temporal.extract(
            p.text,
            reference_date=doc_date,
            day_first=settings.day_first,
            fiscal_year_start=settings.fiscal_year_start,
            hemisphere=settings.hemisphere,
            language=language,
        )
        passages.append((p, tokenizer.tokenize(p.text, language), statements))
    return {
        "ok": True,
        "kind": kind,
        "sha256": sha256(data),
        "size": len(data),
        "title": parsed.title,
        "owner": parsed.owner,
        "tags": list(parsed.tags),
        "language": language,
        "language_source": language_source,
        "dates": dates,
        "doc_date": doc_date,
        "doc_date_source": doc_date_source,
        "expires": expires,
        "passages": passages,
    }
