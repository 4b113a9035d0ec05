"""Builders of real test documents: PDFs made with fpdf2 (and pypdf for Info dates, encryption),
HTML pages, and a corpus folder writer. Shared by tests/test_ingest_*.py and tests/test_segment.py."""

from __future__ import annotations

import io
from pathlib import Path

from auditor.config import Config, CorpusConfig


def make_pdf(
    pages: list[str],
    *,
    sections: list[tuple[int, str, int]] | None = None,
    info: dict[str, str] | None = None,
    xmp: str | None = None,
    title: str | None = None,
    outline: bool = True,
) -> bytes:
    """A text PDF with one page per entry of `pages`.

    `sections`: (page number from 1, title, outline level from 0) — the title is written as a line
    at the top of that page and added to the outline (fpdf2 `start_section`).
    With `outline=False` the titles are only set in bold, 16 pt for level 0 and 13 pt below, as
    headings look in a PDF without bookmarks.
    `info`: Info dictionary entries set through pypdf, e.g. {"/ModDate": "D:20240301120000Z"}.
    `xmp`: an XMP packet (RDF/XML) embedded with fpdf2's set_xmp_metadata.
    """
    from fpdf import FPDF

    pdf = FPDF()
    pdf.set_font("Helvetica", size=11)
    if title:
        pdf.set_title(title)
    if xmp:
        pdf.set_xmp_metadata(xmp)
    by_page: dict[int, list[tuple[str, int]]] = {}
    for page, name, level in sections or []:
        by_page.setdefault(page, []).append((name, level))
    for number, text in enumerate(pages, 1):
        pdf.add_page()
        for name, level in by_page.get(number, []):
            if outline:
                pdf.start_section(name, level=level)
            else:
                pdf.set_font("Helvetica", "B", 16 if level == 0 else 13)
            pdf.multi_cell(0, 6, name, new_x="LMARGIN", new_y="NEXT")
            pdf.set_font("Helvetica", size=11)
            pdf.ln(4)
        pdf.multi_cell(0, 6, text, new_x="LMARGIN", new_y="NEXT")
    data = bytes(pdf.output())
    if info:
        from pypdf import PdfReader, PdfWriter

        writer = PdfWriter(clone_from=PdfReader(io.BytesIO(data)))
        writer.add_metadata(info)
        out = io.BytesIO()
        writer.write(out)
        data = out.getvalue()
    return data


def encrypt_pdf(data: bytes, user_password: str, owner_password: str = "owner-secret") -> bytes:
    """`data` encrypted with pypdf (AES-128)."""
    from pypdf import PdfReader, PdfWriter

    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(data)))
    writer.encrypt(user_password=user_password, owner_password=owner_password, algorithm="AES-128")
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def image_only_pdf() -> bytes:
    """A PDF whose only page holds a drawing and no text (what a scan looks like to a parser)."""
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.rect(20, 20, 100, 60, style="F")
    return bytes(pdf.output())


def xmp_packet(modify: str | None = None, create: str | None = None) -> str:
    """An XMP packet with xmp:ModifyDate / xmp:CreateDate (XMP Specification Part 1, §8.4)."""
    props = ""
    if modify:
        props += f"<xmp:ModifyDate>{modify}</xmp:ModifyDate>"
    if create:
        props += f"<xmp:CreateDate>{create}</xmp:CreateDate>"
    return (
        '<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">'
        f'<rdf:Description rdf:about="" xmlns:xmp="http://ns.adobe.com/xap/1.0/">{props}</rdf:Description>'
        "</rdf:RDF></x:xmpmeta>"
    )


def html_page(body: str, head: str = "", title: str = "Test page") -> str:
    return (
        f'<!DOCTYPE html><html><head><meta charset="utf-8"><title>{title}</title>{head}</head>'
        f"<body>{body}</body></html>"
    )


def words(n: int, seed: str = "water") -> str:
    """`n` distinct-ish words ending in a full stop every 12 words (sentences for the segmenter)."""
    out = []
    for i in range(n):
        out.append(f"{seed}{i}")
        if i % 12 == 11:
            out[-1] += "."
    return " ".join(out) + ("." if not out[-1].endswith(".") else "")


def write_tree(root: Path, files: dict[str, bytes | str]) -> Path:
    """Write `files` (relative path -> content) under `root`."""
    for rel, content in files.items():
        path = root / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        if isinstance(content, str):
            path.write_text(content, encoding="utf-8")
        else:
            path.write_bytes(content)
    return root


def config_for(root: Path, **corpus) -> Config:
    """A Config whose corpus is `root`, with CorpusConfig fields overridden by `corpus`."""
    owners = corpus.pop("owners", ())
    corpus.setdefault("jobs", 2)
    return Config(database=root.parent / "audit.db", corpus=CorpusConfig(paths=(root,), **corpus), owners=owners)


def misbehave(task: str, settings) -> str:
    """A worker target for pool tests: hangs, kills its process, raises, or answers."""
    import os
    import time

    if task == "hang":
        time.sleep(3600)
    if task == "crash":
        os._exit(3)
    if task == "raise":
        raise ValueError("bad input")
    return task.upper()


def replicate_pages(data: bytes, times: int) -> bytes:
    """`data` (a PDF) with its pages repeated `times` times, via pypdf (fast, unlike re-rendering)."""
    from pypdf import PdfReader, PdfWriter

    reader = PdfReader(io.BytesIO(data))
    writer = PdfWriter()
    for _ in range(times):
        for page in reader.pages:
            writer.add_page(page)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()
