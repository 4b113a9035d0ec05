"""Plain text: encoding detection and paragraphs.

Encodings, in the order tried: a byte-order mark (UTF-8, UTF-16, UTF-32), strict UTF-8, UTF-16
without a BOM (recognised by its zero bytes), then cp1252 — the usual encoding of text exported
from Windows tools. Bytes that are none of these are refused rather than guessed at, so that a
corrupt file is reported instead of being indexed as mojibake.
"""

from __future__ import annotations

import codecs
import re

from auditor.ingest.failures import IngestFailure
from auditor.models import Block, ParsedDocument

_BOMS = [
    (codecs.BOM_UTF32_LE, "utf-32-le"),
    (codecs.BOM_UTF32_BE, "utf-32-be"),
    (codecs.BOM_UTF8, "utf-8"),
    (codecs.BOM_UTF16_LE, "utf-16-le"),
    (codecs.BOM_UTF16_BE, "utf-16-be"),
]
# C0 control characters that never occur in text (tab, LF, FF, CR and ESC-free text only).
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0e-\x1a\x1c-\x1f\x7f]")
_PARAGRAPH_BREAK = re.compile(r"\n[ \t]*\n+")


def sniff_bom(data: bytes) -> tuple[str, int] | None:
    """(encoding, BOM length) when `data` starts with a byte-order mark, else None."""
    for bom, name in _BOMS:
        if data.startswith(bom):
            return name, len(bom)
    return None


def utf16_without_bom(data: bytes) -> str | None:
    sample = data[:4096]
    if len(sample) < 4 or len(sample) % 2:
        return None
    even_zero = sample[0::2].count(0) / (len(sample) // 2)
    odd_zero = sample[1::2].count(0) / (len(sample) // 2)
    # Mostly-Latin UTF-16 text has a zero in every other byte; binary data does not follow that.
    if odd_zero > 0.4 and even_zero < 0.05:
        return "utf-16-le"
    if even_zero > 0.4 and odd_zero < 0.05:
        return "utf-16-be"
    return None


def decode_text(data: bytes, path: str, *, declared: str | None = None, kind: str = "text") -> str:
    """Bytes -> str by BOM, `declared` charset, UTF-8, BOM-less UTF-16, cp1252; else IngestFailure.

    Newlines are normalized to "\\n".
    """
    text = None
    if found := sniff_bom(data):
        bom, length = found
        try:
            text = data[length:].decode(bom)
        except UnicodeDecodeError as exc:
            raise IngestFailure(
                "parse_error", path, f"invalid {bom} text after its byte-order mark ({exc.reason} at byte {exc.start})"
            ) from None
    encodings = [declared] if declared else []
    encodings += ["utf-8"]
    for encoding in encodings if text is None else []:
        try:
            text = data.decode(encoding)
            break
        except (UnicodeDecodeError, LookupError):
            continue
    if text is None and (utf16 := utf16_without_bom(data)):
        try:
            text = data.decode(utf16)
        except UnicodeDecodeError:
            text = None
    if text is None:
        try:
            text = data.decode("cp1252")
        except UnicodeDecodeError as exc:
            raise IngestFailure(
                "parse_error",
                path,
                f"neither UTF-8, UTF-16 nor cp1252 text (byte 0x{data[exc.start]:02x} at offset {exc.start})",
            ) from None
    text = text.replace("\r\n", "\n").replace("\r", "\n")
    bad = _CONTROL.search(text[:65536])
    if bad:
        raise IngestFailure(
            f"not_a_{kind}",
            path,
            f"binary data, not {kind} (control character U+{ord(bad.group()):04X} at offset {bad.start()})",
        )
    return text


def paragraphs(text: str) -> list[str]:
    """Paragraphs separated by blank lines, inner whitespace kept, empty ones dropped."""
    return [p.strip() for p in _PARAGRAPH_BREAK.split(text) if p.strip()]


def parse_text(data: bytes, path: str) -> ParsedDocument:
    """A plain-text file -> one block per paragraph; the first short line is taken as the title."""
    text = decode_text(data, path, kind="text")
    blocks = [Block(p) for p in paragraphs(text)]
    if not blocks:
        raise IngestFailure("empty", path, "no text in the file")
    first = blocks[0].text
    title = first if "\n" not in first and len(first) <= 120 else None
    return ParsedDocument(blocks=blocks, title=title)
