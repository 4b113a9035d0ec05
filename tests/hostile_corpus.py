"""A generator of hostile corpora: broken PDFs, HTML bombs, a sparse 1 GB file and file names that
break naive code — mixed with good files whose content is known.

Beyond the ingest issue's list (truncated or encrypted PDF, zero-byte file, binary junk, invalid
UTF-8, 100,000-deep HTML, a file over the size limit, a symlink loop, an unreadable file, all in
tests/test_ingest_hostile.py), this one builds:

* PDFs written byte by byte (ISO 32000-1 §7.5: header, objects, cross-reference table or stream,
  trailer): a cross-reference table whose offsets are all wrong, a page tree that contains itself,
  an object stream (§7.5.7) that the cross-reference stream says holds itself, a page tree nested
  5,000 levels deep, and a flat page tree of 20,000 pages;
* HTML bombs: a 20 MB attribute value, 2,000,000 character references, an XHTML file with an
  entity-expansion ("billion laughs") internal DTD subset;
* a 1 GB sparse file (os.truncate: no disk is used) that must be refused by size without being read;
* file names with a newline, NFC and NFD spellings of the same name, a right-to-left override,
  emoji, control characters, bytes that are not UTF-8, and names of exactly 255 bytes (NAME_MAX).

`build(root)` writes it all and returns a `HostileCorpus` saying which files are good (must be
ingested, with which words) and which are hostile (must be ingested or recorded with a reason).
"""

from __future__ import annotations

import os
import struct
from dataclasses import dataclass, field
from pathlib import Path

# --- PDF, byte by byte ------------------------------------------------------------------------------


def _stream(data: bytes, extra: bytes = b"") -> bytes:
    return b"<< /Length %d %s>>\nstream\n" % (len(data), extra) + data + b"\nendstream"


FONT = b"<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>"
TEXT = b"BT /F1 12 Tf 72 712 Td (%s) Tj ET"


def pdf_file(objects: dict[int, bytes], root: int, *, xref: str = "table") -> bytes:
    """A PDF of `objects` (number -> body), with a classic cross-reference table ("table"), one with
    every offset wrong ("broken"), or none at all ("none")."""
    out = bytearray(b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n")
    offsets = {}
    for number in sorted(objects):
        offsets[number] = len(out)
        out += b"%d 0 obj\n" % number + objects[number] + b"\nendobj\n"
    start = len(out)
    size = max(objects) + 1
    if xref != "none":
        out += b"xref\n0 %d\n0000000000 65535 f \n" % size
        for number in range(1, size):
            offset = offsets.get(number, 0)
            if xref == "broken":
                offset = offset * 7 + 13  # points into the middle of other objects or past the end
            out += b"%010d 00000 n \n" % offset
    out += b"trailer\n<< /Size %d /Root %d 0 R >>\nstartxref\n%d\n%%%%EOF\n" % (size, root, start)
    return bytes(out)


def _text_page_objects(first: int, parent: int, words: str) -> dict[int, bytes]:
    """A page (number `first`), its content stream and its font."""
    return {
        first: b"<< /Type /Page /Parent %d 0 R /MediaBox [0 0 612 792] /Contents %d 0 R "
        b"/Resources << /Font << /F1 %d 0 R >> >> >>" % (parent, first + 1, first + 2),
        first + 1: _stream(TEXT % words.encode("latin-1")),
        first + 2: FONT,
    }


def pdf_broken_xref(words: str) -> bytes:
    """A good one-page PDF whose cross-reference table has every offset wrong (readers rebuild it
    by scanning for "N 0 obj", ISO 32000-1 §7.5.4 gives the table; repair is reader practice)."""
    objects = {1: b"<< /Type /Catalog /Pages 2 0 R >>", 2: b"<< /Type /Pages /Kids [3 0 R] /Count 1 >>"}
    objects.update(_text_page_objects(3, 2, words))
    return pdf_file(objects, 1, xref="broken")


def pdf_page_tree_cycle() -> bytes:
    """The page tree root lists itself among its kids."""
    objects = {1: b"<< /Type /Catalog /Pages 2 0 R >>", 2: b"<< /Type /Pages /Kids [2 0 R 3 0 R] /Count 2 >>"}
    objects.update(_text_page_objects(3, 2, "A page inside a cycle"))
    return pdf_file(objects, 1)


def pdf_self_referencing_object_stream() -> bytes:
    """A cross-reference stream (§7.5.8) saying that object 4 — the object stream (§7.5.7) — is
    stored inside object stream 4, and that the catalog is in it too."""
    header = b"1 0 4 0 "
    inner = header + b"<< /Type /Catalog /Pages 2 0 R >>"
    objects = {
        2: b"<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
        3: b"<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] >>",
        4: _stream(inner, b"/Type /ObjStm /N 2 /First %d " % len(header)),
    }
    out = bytearray(b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n")
    offsets = {}
    for number in sorted(objects):
        offsets[number] = len(out)
        out += b"%d 0 obj\n" % number + objects[number] + b"\nendobj\n"
    xref_at = len(out)
    rows = [(0, 0, 255), (2, 4, 0), (1, offsets[2], 0), (1, offsets[3], 0), (2, 4, 1), (1, xref_at, 0)]
    table = b"".join(struct.pack(">BIB", *row) for row in rows)
    out += b"5 0 obj\n" + _stream(table, b"/Type /XRef /Size 6 /W [1 4 1] /Root 1 0 R ") + b"\nendobj\n"
    out += b"startxref\n%d\n%%%%EOF\n" % xref_at
    return bytes(out)


def pdf_deep_page_tree(depth: int = 5000) -> bytes:
    """Page-tree nodes nested `depth` levels deep above one page."""
    objects = {1: b"<< /Type /Catalog /Pages 2 0 R >>"}
    for i in range(depth):
        parent = b"/Parent %d 0 R " % (1 + i) if i else b""
        objects[2 + i] = b"<< /Type /Pages %s/Kids [%d 0 R] /Count 1 >>" % (parent, 3 + i)
    objects.update(_text_page_objects(2 + depth, 1 + depth, "The deepest page"))
    return pdf_file(objects, 1)


def pdf_wide_page_tree(pages: int = 20_000) -> bytes:
    """One page-tree node with `pages` kids sharing one content stream without text."""
    content = 3
    objects = {
        1: b"<< /Type /Catalog /Pages 2 0 R >>",
        2: b"<< /Type /Pages /Kids [%s] /Count %d >>" % (b" ".join(b"%d 0 R" % (4 + i) for i in range(pages)), pages),
        content: _stream(b"0 0 m 10 10 l S"),
    }
    for i in range(pages):
        objects[4 + i] = b"<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents %d 0 R >>" % content
    return pdf_file(objects, 1)


# --- HTML bombs -------------------------------------------------------------------------------------


def html_giant_attribute(words: str, mb: int = 20) -> bytes:
    return (
        b'<html><body><main><p data-x="'
        + b"A" * (mb * 1_000_000)
        + b'">'
        + words.encode()
        + b"</p></main></body></html>"
    )


def html_entity_flood(count: int = 2_000_000) -> bytes:
    return b"<html><body><main><p>Entities: " + b"&amp;&#233;&#x1F4A7;" * (count // 3) + b"</p></main></body></html>"


def xhtml_billion_laughs() -> bytes:
    """The classic entity-expansion bomb in an internal DTD subset (10^9 "lol"s if expanded)."""
    entities = ['<!ENTITY lol0 "lol">'] + [f'<!ENTITY lol{i} "{f"&lol{i - 1};" * 10}">' for i in range(1, 10)]
    return (
        '<?xml version="1.0"?>\n<!DOCTYPE html [\n' + "\n".join(entities) + "\n]>\n"
        '<html xmlns="http://www.w3.org/1999/xhtml"><body><main><p>&lol9;</p>'
        "<p>Laughs aside, report leaks on the hotline.</p></main></body></html>"
    ).encode()


UNDECODABLE = b"latin1-\xe9t\xe9.md"  # "été" in Latin-1: not UTF-8


def storable(path: str) -> str:
    """A relative path as a store can hold it: undecodable bytes escaped ("latin1-\\xe9t\\xe9.md")."""
    return os.fsencode(path).decode("utf-8", "backslashreplace")


# --- the corpus -------------------------------------------------------------------------------------


@dataclass
class HostileCorpus:
    root: Path
    good: dict[str, str] = field(default_factory=dict)  # path relative to root -> a word it must yield
    hostile: list[str] = field(default_factory=list)  # relative paths, ingested or recorded
    expected_kinds: dict[str, set[str]] = field(default_factory=dict)  # path -> acceptable error kinds

    def all_files(self) -> set[str]:
        return set(self.good) | set(self.hostile)


def _write(root: Path, name: str | bytes, data: bytes) -> str:
    path = os.path.join(os.fsencode(root), name if isinstance(name, bytes) else os.fsencode(name))
    with open(path, "wb") as handle:
        handle.write(data)
    return os.fsdecode(os.path.relpath(path, os.fsencode(root)))


def build(root: Path, *, undecodable_names: bool = True) -> HostileCorpus:
    """Write the hostile corpus under `root` (created) and say what each file is.

    `undecodable_names=False` leaves out the file whose name is not UTF-8 (see its own test)."""
    root.mkdir(parents=True, exist_ok=True)
    corpus = HostileCorpus(root)

    def good(name, data: bytes, word: str) -> None:
        corpus.good[_write(root, name, data)] = word

    def hostile(name, data: bytes, kinds: set[str] | None = None) -> None:
        rel = _write(root, name, data)
        corpus.hostile.append(rel)
        if kinds:
            corpus.expected_kinds[rel] = kinds

    md = "# {0}\n\nThe {0} page says: report a leak on the hotline, day or night.\n"
    good("good.md", md.format("Leaks").encode(), "hotlin")  # Snowball stems "hotline" to "hotlin"
    good("good.txt", b"Meter reading\n\nMeters are read every two months by the field crew.\n", "meter")
    good(
        "good.html",
        b"<html><body><main><h1>Outages</h1><p>The outage map shows planned shutoffs.</p></main></body></html>",
        "outag",
    )

    # PDFs
    good("broken-xref.pdf", pdf_broken_xref("Backflow testers renew their certificate yearly"), "backflow")
    hostile("page-tree-cycle.pdf", pdf_page_tree_cycle(), {"parse_error"})
    hostile("objstm-self.pdf", pdf_self_referencing_object_stream(), {"parse_error", "empty"})
    hostile("deep-page-tree.pdf", pdf_deep_page_tree(), {"parse_error"})
    hostile("wide-page-tree.pdf", pdf_wide_page_tree(), {"needs_ocr"})

    # HTML bombs: the text around the bomb is still a page
    good("giant-attribute.html", html_giant_attribute("Hydrant flushing turns the water brown"), "hydrant")
    hostile("entities.html", html_entity_flood())
    hostile("laughs.xhtml", xhtml_billion_laughs())

    # A sparse 1 GB file: over any size limit, refused unread
    sparse = root / "sparse-1gb.txt"
    with open(sparse, "wb") as handle:
        handle.truncate(1 << 30)
    corpus.hostile.append("sparse-1gb.txt")
    corpus.expected_kinds["sparse-1gb.txt"] = {"too_large"}

    # File names
    body = md.format("Odd names").encode()
    good("rates\n2025.md", md.format("Rates").encode(), "rate")
    good("caf\u00e9-hours.md", md.format("Cafe hours NFC").encode(), "nfc")  # NFC: é is one code point
    good("cafe\u0301-hours.md", md.format("Cafe hours NFD").encode(), "nfd")  # NFD: e + combining acute
    good("\u202edm.stnemyap.md", md.format("Payments RTL").encode(), "rtl")
    good("\U0001f4a7 leak-\U0001f6b0.md", md.format("Leak emoji").encode(), "emoji")
    good("tab\there\x01\x1b.md", md.format("Control characters").encode(), "control")
    good("n" * 252 + ".md", md.format("Long name").encode(), "long")  # 255 bytes, NAME_MAX
    good("\u00e9" * 126 + ".md", md.format("Long accented name").encode(), "accent")  # 126 x 2 + 3 = 255 bytes
    if undecodable_names:
        good(UNDECODABLE, body, "odd")  # not UTF-8: Python sees surrogate escapes
    return corpus
