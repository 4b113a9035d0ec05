"""PDF (pypdf): text per page, section headings from the outline, Info and XMP dates.

* Encrypted files are tried with the empty password (many "protected" PDFs only restrict
  printing); otherwise they are recorded as encrypted.
* A file whose pages carry no text is recorded as needs_ocr (a scan without a text layer).
* A file without the %%EOF marker at its end is recorded as truncated rather than indexed in part.
* Headings: the outline (bookmarks) gives (title, page, level). Where the title is found in the
  page text, the page is split there so text before it stays under the previous heading.
"""

from __future__ import annotations

import io
import logging
import re

from ..models import Block, MetaDate, ParsedDocument
from .dates import parse_pdf_date
from .walk import IngestFailure

logging.getLogger("pypdf").setLevel(logging.ERROR)  # its warnings would flood the progress bar

_PARAGRAPH_BREAK = re.compile(r"\n[ \t]*\n+")
_HYPHEN_BREAK = re.compile(r"(\w)-\n(\w)")
_SENTENCE_END = re.compile(r"[.!?:;)\]]$")


def parse_pdf(data: bytes, path: str) -> ParsedDocument:
    """A PDF file -> ParsedDocument with one or more blocks per page (page numbers from 1)."""
    from pypdf import PdfReader
    from pypdf.errors import FileNotDecryptedError, PdfReadError

    if b"%%EOF" not in data[-2048:]:
        raise IngestFailure("parse_error", path, "truncated or damaged PDF (no %%EOF marker at the end)")
    try:
        reader = PdfReader(io.BytesIO(data), strict=False)
        if reader.is_encrypted:
            try:
                ok = reader.decrypt("")
            except (NotImplementedError, DependencyMissing) as exc:
                raise IngestFailure("encrypted", path, f"encrypted PDF; cannot decrypt ({exc})") from None
            if not ok:
                raise IngestFailure("encrypted", path, "encrypted PDF, no password given (the empty password does not open it)")
        pages = [_page_text(page) for page in reader.pages]
        outline = _outline(reader)
        dates = _dates(reader)
        title = _title(reader)
    except IngestFailure:
        raise
    except FileNotDecryptedError:
        raise IngestFailure("encrypted", path, "encrypted PDF, no password given") from None
    except (PdfReadError, ValueError, KeyError, TypeError, AttributeError, IndexError, OSError,
            RecursionError, AssertionError, ZeroDivisionError) as exc:
        raise IngestFailure("parse_error", path, f"damaged PDF ({type(exc).__name__}: {_one_line(exc)})") from None
    if not pages:
        raise IngestFailure("empty", path, "PDF has no pages")
    if not any(p.strip() for p in pages):
        raise IngestFailure("needs_ocr", path, f"PDF has no text layer on any of its {len(pages)} pages (scanned?); needs OCR")
    blocks = _blocks(pages, outline)
    return ParsedDocument(blocks=blocks, title=title or next((t for t, _, _ in outline), None), dates=dates)


try:  # pypdf >= 3.x raises this when AES needs the cryptography package
    from pypdf.errors import DependencyError as DependencyMissing
except ImportError:  # pragma: no cover
    class DependencyMissing(Exception):
        pass


def _one_line(exc: Exception) -> str:
    return " ".join(str(exc).split())[:160]


def _page_text(page) -> str:
    text = page.extract_text() or ""
    text = text.replace("\r\n", "\n").replace("\r", "\n").replace("\x00", "")
    return _HYPHEN_BREAK.sub(r"\1\2", text)


def _outline(reader) -> list[tuple[str, int, int]]:
    """Flattened outline: (title, page index, level from 1), in document order."""
    out: list[tuple[str, int, int]] = []
    try:
        items = reader.outline
    except Exception:  # a broken outline must not cost the text
        return out
    stack = [(items, 1)]
    # Depth-first over nested lists: a list right after an item holds that item's children.
    pending: list = []
    while stack:
        node, level = stack.pop()
        for entry in reversed(node):
            pending.append((entry, level))
        while pending:
            entry, lvl = pending.pop()
            if isinstance(entry, list):
                for child in reversed(entry):
                    pending.append((child, lvl + 1))
                continue
            try:
                page = reader.get_destination_page_number(entry)
                title = " ".join(str(entry.title).split())
            except Exception:
                continue
            if title and page is not None and page >= 0:
                out.append((title, page, lvl))
    return out


def _paragraphs(text: str) -> list[str]:
    """Blank lines end paragraphs; so does a short line ending a sentence (text extraction
    rarely keeps blank lines)."""
    out = []
    for chunk in _PARAGRAPH_BREAK.split(text):
        lines = [line.strip() for line in chunk.split("\n") if line.strip()]
        if not lines:
            continue
        width = max(len(line) for line in lines)
        current: list[str] = []
        for line in lines:
            current.append(line)
            if _SENTENCE_END.search(line) and len(line) < 0.7 * width:
                out.append(" ".join(current))
                current = []
        if current:
            out.append(" ".join(current))
    return out


def _blocks(pages: list[str], outline: list[tuple[str, int, int]]) -> list[Block]:
    blocks: list[Block] = []
    headings: list[tuple[int, str]] = []
    by_page: dict[int, list[tuple[str, int]]] = {}
    for title, page, level in outline:
        by_page.setdefault(page, []).append((title, level))

    def enter(title: str, level: int) -> None:
        while headings and headings[-1][0] >= level:
            headings.pop()
        headings.append((level, title))

    for index, text in enumerate(pages):
        pieces: list[tuple[str | None, int, str]] = []  # (heading title, level, text after it)
        rest = text
        for title, level in by_page.get(index, []):
            at = _find_heading(rest, title)
            if at is None:
                pieces.append((title, level, ""))
                continue
            pieces.append((None, 0, rest[:at]))
            pieces.append((title, level, ""))
            rest = rest[at + len(title):] if rest[at:at + len(title)] == title else rest[at:].split("\n", 1)[-1]
        pieces.append((None, 0, rest))
        for title, level, chunk in pieces:
            if title is not None:
                enter(title, level)
                blocks.append(Block(title, tuple(h for _, h in headings), index + 1))
            for para in _paragraphs(chunk):
                blocks.append(Block(para, tuple(h for _, h in headings), index + 1))
    return blocks


def _find_heading(text: str, title: str) -> int | None:
    """Offset of `title` at the start of a line of `text` (whitespace-insensitive), or None."""
    words = title.split()
    if not words:
        return None
    pattern = re.compile(r"(?m)^[ \t]*" + r"\s+".join(re.escape(w) for w in words))
    m = pattern.search(text)
    return m.start() if m else None


def _dates(reader) -> list[MetaDate]:
    found: list[MetaDate] = []
    xmp = None
    try:
        xmp = reader.xmp_metadata
    except Exception:
        xmp = None
    info = {}
    try:
        info = reader.metadata or {}
    except Exception:
        info = {}

    def xmp_date(attr: str):
        try:
            value = getattr(xmp, attr) if xmp is not None else None
        except Exception:
            return None
        return value.date() if value is not None else None

    def info_date(key: str):
        try:
            raw = info.get(key)
        except Exception:
            return None
        return parse_pdf_date(str(raw)) if raw is not None else None

    for value, kind, source in [
        (xmp_date("xmp_modify_date"), "modified", "pdf:xmp:ModifyDate"),
        (info_date("/ModDate"), "modified", "pdf:info:ModDate"),
        (xmp_date("xmp_create_date"), "created", "pdf:xmp:CreateDate"),
        (info_date("/CreationDate"), "created", "pdf:info:CreationDate"),
    ]:
        if value is not None:
            found.append(MetaDate(value, kind, source))
    return found


def _title(reader) -> str | None:
    try:
        title = (reader.metadata or {}).get("/Title")
    except Exception:
        title = None
    title = " ".join(str(title).split()) if title else ""
    return title or None
