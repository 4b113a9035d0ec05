"""Reading question files: text decoding, format sniffing, CSV and JSON Lines records.

Shared by question sets (auditor/questions/sets.py) and query logs (auditor/questions/querylog.py);
which of the two a file is follows from its columns (`is_query_log`, docs/question-sets.md).
"""

from __future__ import annotations

import codecs
import csv
import io
import json
from pathlib import Path

from auditor.errors import InputError

# Column names that mark a query log (first present wins); "question" is accepted as the text
# column only once a count or timestamp column has made the file a query log.
TEXT_COLUMNS = ("query", "text", "search", "utterance", "question")
COUNT_COLUMNS = ("count", "hits", "frequency", "freq", "searches", "occurrences")
TIMESTAMP_COLUMNS = ("timestamp", "time", "ts", "datetime", "date", "created_at")
CSV_EXTENSIONS = (".csv", ".tsv")
JSONL_EXTENSIONS = (".jsonl", ".ndjson", ".json")
TEXT_EXTENSIONS = (".txt", ".text")


def read_text(path: Path) -> str:
    """The file's text: UTF-8 (BOM optional) or BOM-marked UTF-16; InputError otherwise."""
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        raise InputError(f"{str(path)!r}: file not found") from None
    except IsADirectoryError:
        raise InputError(f"{str(path)!r}: is a folder, not a question file") from None
    except OSError as exc:
        raise InputError(f"{str(path)!r}: cannot read ({exc.strerror or exc})") from None
    if data.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        encoding, body = "utf-16", data
    else:
        encoding, body = "utf-8-sig", data
    try:
        return body.decode(encoding)
    except UnicodeDecodeError as exc:
        # Line of the first bad byte, so the user can find it; UTF-16 offsets count code units.
        prefix = body[: exc.start]
        line = (prefix.decode(encoding, "replace").count("\n") if encoding == "utf-16" else prefix.count(b"\n")) + 1
        raise InputError(
            f"{str(path)!r}: line {line}: not valid {'UTF-16' if encoding == 'utf-16' else 'UTF-8'} "
            f"(byte 0x{body[exc.start]:02x}); save the file as UTF-8"
        ) from None


def _first_line(text: str) -> str:
    for line in text.splitlines():
        if line.strip():
            return line.strip()
    return ""


def _csv_delimiter(header: str) -> str:
    # The header decides: whichever of , ; tab splits it into the most fields.
    counts = {d: header.count(d) for d in (",", ";", "\t")}
    best = max(counts, key=lambda d: counts[d])
    return best if counts[best] else ","


def _norm_key(name) -> str:
    return str(name).strip().casefold()


def sniff_format(path: Path, text: str) -> str:
    """ "csv", "jsonl" or "text" for a question file, by extension, then by content."""
    suffix = path.suffix.casefold()
    if suffix in CSV_EXTENSIONS:
        return "csv"
    if suffix in JSONL_EXTENSIONS:
        return "jsonl"
    if suffix in TEXT_EXTENSIONS:
        return "text"
    first = _first_line(text)
    if first.startswith("{"):
        return "jsonl"
    fields = {_norm_key(f) for f in next(csv.reader([first], delimiter=_csv_delimiter(first)), [])}
    if "question" in fields or fields & set(TEXT_COLUMNS):
        return "csv"
    return "text"


def read_records(path: Path, text: str, fmt: str) -> tuple[list[str], list[tuple[int, dict]]]:
    """(column names, [(line number, {column: value})]) of a CSV or JSON Lines file.

    Column names are case-folded and stripped. Shared by question sets and query logs.
    """
    if fmt == "csv":
        return _read_csv(path, text)
    return _read_jsonl(path, text)


def header_line(records: list[tuple[int, dict]]) -> int:
    """Line of a CSV header (or of the first JSON Lines record), for error messages."""
    return records.header_line if isinstance(records, _Records) else (records[0][0] if records else 1)


class _Records(list):
    """Records of a CSV file, remembering the line its header stood on."""

    header_line = 1


def _read_csv(path: Path, text: str) -> tuple[list[str], list[tuple[int, dict]]]:
    delimiter = "\t" if path.suffix.casefold() == ".tsv" else _csv_delimiter(_first_line(text))
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter)
    header: list[str] | None = None
    records = _Records()
    last = 0
    try:
        for row in reader:
            start, last = last + 1, reader.line_num
            if not row or not any(cell.strip() for cell in row):
                continue
            if header is None:
                records.header_line = start
                header = [_norm_key(c) for c in row]
                while header and not header[-1]:  # spreadsheet exports add empty trailing columns
                    header.pop()
                seen = set()
                for name in header:
                    if not name:
                        raise InputError(f"{str(path)!r}: line {start}: empty column name in the header")
                    if name in seen:
                        raise InputError(f"{str(path)!r}: line {start}: column {name!r} appears twice")
                    seen.add(name)
                continue
            if len(row) > len(header) and any(c.strip() for c in row[len(header) :]):
                raise InputError(
                    f"{str(path)!r}: line {start}: {len(row)} fields but the header has {len(header)}"
                    " (quote fields that contain the delimiter)"
                )
            records.append((start, dict(zip(header, (c.strip() for c in row)))))
    except csv.Error as exc:
        raise InputError(f"{str(path)!r}: line {reader.line_num}: malformed CSV ({exc})") from None
    return header or [], records


def _read_jsonl(path: Path, text: str) -> tuple[list[str], list[tuple[int, dict]]]:
    columns: dict[str, None] = {}
    records: list[tuple[int, dict]] = []
    for number, line in enumerate(text.splitlines(), 1):
        if not line.strip():
            continue
        try:
            obj = json.loads(line)
        except json.JSONDecodeError as exc:
            raise InputError(
                f"{str(path)!r}: line {number}: not valid JSON ({exc.msg}); JSON Lines needs one object per line"
            ) from None
        if not isinstance(obj, dict):
            raise InputError(f"{str(path)!r}: line {number}: expected a JSON object, got {type(obj).__name__}")
        record = {}
        for key, value in obj.items():
            # Nested values are kept: a query log's extra keys may hold objects, and the reader of
            # a used key says when its value is of the wrong kind.
            name = _norm_key(key)
            record[name] = "" if value is None else (value.strip() if isinstance(value, str) else value)
            columns.setdefault(name)
        records.append((number, record))
    return list(columns), records


# --- question sets --------------------------------------------------------------------------------


def generated_id(position: int, total: int) -> str:
    """Stable id of the question at 1-based `position`: q-001, ... (wider past 999 questions)."""
    return f"q-{position:0{max(3, len(str(total)))}d}"


def is_query_log(columns) -> bool:
    """The documented rule: a query-log text column, or a count or timestamp column."""
    names = {_norm_key(c) for c in columns}
    return bool(names & (set(TEXT_COLUMNS) - {"question"} | set(COUNT_COLUMNS) | set(TIMESTAMP_COLUMNS)))
