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
from typing import Any

from pypdf.errors import DependencyError as DependencyMissing  # AES without the cryptography package

from auditor.ingest.dates import parse_pdf_date
from auditor.ingest.failures import IngestFailure
from auditor.models import Block, MetaDate, ParsedDocument

logging.getLogger("pypdf").setLevel(logging.ERROR)  # its warnings would flood the progress bar

_HYPHEN_BREAK = re.compile(r"(\w)-\n(\w)")
_SENTENCE_END = re.compile(r"[.!?:;)\]]$")


def parse_pdf(data: bytes, path: str) -> ParsedDocument:
    """A PDF file -> ParsedDocument with one or more blocks per page (page numbers from 1)."""
    from pypdf import PdfReader
    from pypdf.errors import FileNotDecryptedError, PdfReadError, PyPdfError

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
                raise IngestFailure(
                    "encrypted", path, "encrypted PDF, no password given (the empty password does not open it)"
                )
        runs: list[list[tuple[str, float, bool]]] = []
        pages = [_page_text(page, runs) for page in reader.pages]
        outline = _outline(reader)
        dates = _dates(reader)
        title = _title(reader)
    except IngestFailure:
        raise
    except FileNotDecryptedError:
        raise IngestFailure("encrypted", path, "encrypted PDF, no password given") from None
    except (
        PdfReadError,
        PyPdfError,
        ValueError,
        KeyError,
        TypeError,
        AttributeError,
        IndexError,
        OSError,
        RecursionError,
        AssertionError,
        ZeroDivisionError,
        NotImplementedError,
        LookupError,
        ArithmeticError,
        UnicodeError,
        MemoryError,
    ) as exc:
        # A damaged or hostile file can make pypdf raise nearly anything (an unknown /Filter is
        # NotImplementedError, a deep page tree LimitReachedError): it is the file's failure.
        raise IngestFailure("parse_error", path, f"damaged PDF ({type(exc).__name__}: {_one_line(exc)})") from None
    if not pages:
        raise IngestFailure("empty", path, "PDF has no pages")
    if not any(p.strip() for p in pages):
        raise IngestFailure(
            "needs_ocr", path, f"PDF has no text layer on any of its {len(pages)} pages (scanned?); needs OCR"
        )
    if outline:
        blocks = _blocks(pages, _outline_headings(outline))
    else:
        blocks = _blocks(pages, _font_headings(runs), prefix=False)
    return ParsedDocument(blocks=blocks, title=title or next((t for t, _, _ in outline), None), dates=dates)


def _one_line(exc: Exception) -> str:
    return " ".join(str(exc).split())[:160]


def _page_text(page, runs: list) -> str:
    """The page's text; appends the page's text runs as (text, effective font size, bold), runs
    on one line in one font merged (TeX writes a line as many small runs)."""
    page_runs: list[list] = []  # [text, size, bold, line key]

    def visit(text, cm, tm, font, size):
        if not text or not text.strip():
            return
        try:
            scale = abs(float(tm[3]) * float(cm[3])) or 1.0
            name = str((font or {}).get("/BaseFont", ""))
            line = (round(float(tm[5]), 1), round(float(cm[5]), 1))
        except Exception:
            scale, name, line = 1.0, "", None
        size, bold = round(float(size or 0) * scale, 1), "Bold" in name or "Black" in name
        last = page_runs[-1] if page_runs else None
        if last and last[1] == size and last[2] == bold and last[3] == line and line is not None:
            last[0] += text
        else:
            page_runs.append([text, size, bold, line])

    text = page.extract_text(visitor_text=visit) or ""
    runs.append([(" ".join(t.split()), size, bold) for t, size, bold, _ in page_runs])
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


def _outline_headings(outline: list[tuple[str, int, int]]) -> dict[int, list[tuple[str, int]]]:
    by_page: dict[int, list[tuple[str, int]]] = {}
    for title, page, level in outline:
        by_page.setdefault(page, []).append((title, level))
    return by_page


def _font_headings(runs: list[list[tuple[str, float, bool]]]) -> dict[int, list[tuple[str, int]]]:
    """Headings of a PDF without an outline, from the text layer's fonts: short runs set larger
    than the body text (the size carrying most characters), or in bold at body size when the body
    is not bold. Larger sizes are higher levels."""
    chars: dict[float, int] = {}
    bold_chars = total = 0
    for page in runs:
        for text, size, bold in page:
            chars[size] = chars.get(size, 0) + len(text)
            total += len(text)
            bold_chars += len(text) if bold else 0
    if not chars:
        return {}
    body = max(chars, key=lambda size: chars[size])
    bold_headings = bold_chars < 0.3 * total

    def is_heading(text: str, size: float, bold: bool) -> bool:
        if len(text.split()) > 15 or text.endswith((".", ",", ";")) or sum(c.isalpha() for c in text) < 3:
            return False
        return size >= body * 1.15 or (bold_headings and bold and size >= body * 0.95)

    sizes = sorted(
        {size for page in runs for text, size, bold in page if is_heading(text, size, bold) and size >= body * 1.15},
        reverse=True,
    )
    level_of = {size: i + 1 for i, size in enumerate(sizes)}
    out: dict[int, list[tuple[str, int]]] = {}
    for index, page in enumerate(runs):
        for text, size, bold in page:
            if is_heading(text, size, bold):
                out.setdefault(index, []).append((text, level_of.get(size, len(sizes) + 1)))
    return out


def _after(line: str, title: str) -> str:
    """What follows `title` on `line` (an outline title may open a line of body text)."""
    need = len("".join(title.split()))
    for i, ch in enumerate(line):
        if need == 0:
            return line[i:].strip()
        if not ch.isspace():
            need -= 1
    return ""


def _same_line(line: str, title: str, prefix: bool) -> bool:
    # Compared without spaces: text extraction and the font runs space words differently.
    a, b = "".join(line.split()), "".join(title.split())
    return a.startswith(b) if prefix else a == b


def _blocks(pages: list[str], headings: dict[int, list[tuple[str, int]]], *, prefix: bool = True) -> list[Block]:
    """Blocks per page: paragraphs end at blank lines and at a short line ending a sentence (text
    extraction rarely keeps blank lines); a line that starts with an expected heading of the page
    becomes a heading block, and headings not found in the text apply from the page top."""
    blocks: list[Block] = []
    stack: list[tuple[int, str]] = []

    def enter(title: str, level: int) -> None:
        while stack and stack[-1][0] >= level:
            stack.pop()
        stack.append((level, title))

    for index, text in enumerate(pages):
        lines = text.split("\n")
        expected = headings.get(index, [])
        at: dict[int, tuple[str, int]] = {}
        position = 0
        for title, level in expected:
            found = next(
                (i for i in range(position, len(lines)) if i not in at and _same_line(lines[i], title, prefix)), None
            )
            if found is None:
                if not prefix:  # a font heading not found as a line: not a heading after all
                    continue
                enter(title, level)
                blocks.append(Block(title, tuple(h for _, h in stack), index + 1))
            else:
                at[found] = (title, level)
                position = found + 1
        width = max((len(line.strip()) for line in lines), default=0)
        paragraph: list[str] = []

        def flush() -> None:
            # Called inside the loop over pages: `paragraph` and `index` are the current page's.
            if paragraph:  # noqa: B023
                blocks.append(Block(" ".join(paragraph), tuple(h for _, h in stack), index + 1))  # noqa: B023
                paragraph.clear()  # noqa: B023

        for i, raw in enumerate(lines):
            line = raw.strip()
            if i in at:
                flush()
                title, level = at[i]
                enter(title, level)
                blocks.append(Block(title, tuple(h for _, h in stack), index + 1))
                line = _after(line, title)
            if not line:
                flush()
                continue
            paragraph.append(line)
            if _SENTENCE_END.search(line) and len(line) < 0.7 * width:
                flush()
        flush()
    return blocks


def _dates(reader) -> list[MetaDate]:
    found: list[MetaDate] = []
    xmp = None
    try:
        xmp = reader.xmp_metadata
    except Exception:
        xmp = None
    info: Any = {}
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
