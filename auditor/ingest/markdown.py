"""Markdown: YAML front matter (title, owner, updated, last_reviewed, date, expires, tags) and
blocks under their heading path (ATX `#` and setext headings, CommonMark §4.2–4.3).

Headings are emitted as blocks of their own (text = the heading, heading_path ending with it), so
that passages start with their heading and char offsets cover the whole document text. Link and
image syntax is reduced to its visible text: URLs are not words a user asks with.
"""

from __future__ import annotations

import re

import yaml

from auditor.ingest.dates import parse_meta_value
from auditor.ingest.failures import IngestFailure
from auditor.ingest.text import decode_text
from auditor.language import from_tag
from auditor.models import Block, MetaDate, ParsedDocument

_FRONT_MATTER = re.compile(r"\A---[ \t]*\n(.*?\n)?(?:---|\.\.\.)[ \t]*(?:\n|\Z)", re.S)
_ATX = re.compile(r"^ {0,3}(#{1,6})(?:[ \t]+(.*?))?(?:[ \t]+#+)?[ \t]*$")
_SETEXT = re.compile(r"^ {0,3}(=+|-+)[ \t]*$")
_FENCE = re.compile(r"^ {0,3}(`{3,}|~{3,})")
# Bracket contents exclude the opening bracket too, so that a run of "[" without "]" is scanned
# once, not once per "[" (linear, not quadratic, on hostile input).
_IMAGE = re.compile(r"!\[([^\[\]]*)\]\([^()]*\)")
_LINK = re.compile(r"\[([^\[\]]+)\]\([^()]*\)")
_REF_LINK = re.compile(r"\[([^\[\]]+)\]\[[^\[\]]*\]")
_LINK_DEF = re.compile(r"^ {0,3}\[[^\[\]\n]+\]:[ \t]*\S+.*$", re.M)
_AUTOLINK = re.compile(r"<(https?://[^<>\s]+)>")


def _strip_comments(text: str) -> str:
    """Drop HTML comments; an unclosed one runs to the end (found with str.find: linear)."""
    out, at = [], 0
    while (start := text.find("<!--", at)) != -1:
        out.append(text[at:start])
        end = text.find("-->", start + 4)
        if end == -1:
            return "".join(out)
        at = end + 3
    out.append(text[at:])
    return "".join(out)


# front matter key -> (MetaDate kind, order of specificity: docs/ingestion.md lists updated,
# last_reviewed, date)
DATE_KEYS = [
    ("updated", "modified"),
    ("last_reviewed", "reviewed"),
    ("modified", "modified"),
    ("reviewed", "reviewed"),
    ("date", "published"),
    ("expires", "expires"),
]


def front_matter(text: str, path: str) -> tuple[dict, str]:
    """(front matter mapping, body). Invalid YAML is a parse_error: silently dropping it would
    lose the document's owner and dates."""
    m = _FRONT_MATTER.match(text)
    if not m:
        return {}, text
    try:
        data = yaml.safe_load(m.group(1) or "") or {}
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        where = f" at line {mark.line + 2}" if mark else ""
        raise IngestFailure("parse_error", path, f"front matter is not valid YAML{where}") from None
    except (ValueError, OverflowError, TypeError, RecursionError) as exc:
        # PyYAML builds dates and numbers while loading: "updated: 2024-13-01" raises ValueError.
        raise IngestFailure("parse_error", path, f"front matter has a value that is not one ({exc})") from None
    if not isinstance(data, dict):
        raise IngestFailure("parse_error", path, "front matter is not a mapping of keys to values")
    # Keep offsets simple: the body replaces front matter by as many newlines (line numbers hold).
    return data, "\n" * m.group(0).count("\n") + text[m.end() :]


def _inline(text: str) -> str:
    text = _IMAGE.sub(r"\1", text)
    text = _LINK.sub(r"\1", text)
    text = _REF_LINK.sub(r"\1", text)
    return _AUTOLINK.sub(r"\1", text)


def parse_markdown(data: bytes, path: str) -> ParsedDocument:
    """A Markdown file -> ParsedDocument (front matter dates, owner, tags, title)."""
    text = decode_text(data, path, kind="markdown")
    meta, body = front_matter(text, path)
    body = _LINK_DEF.sub("", _strip_comments(body))
    blocks: list[Block] = []
    headings: list[tuple[int, str]] = []
    paragraph: list[str] = []
    fence: str | None = None
    first_h1 = None

    def path_now() -> tuple[str, ...]:
        return tuple(h for _, h in headings)

    def flush() -> None:
        if paragraph:
            joined = "\n".join(paragraph).strip()
            if joined:
                blocks.append(Block(_inline(joined), path_now()))
            paragraph.clear()

    def heading(level: int, title: str) -> None:
        nonlocal first_h1
        title = _inline(title.strip())
        if not title:
            return
        while headings and headings[-1][0] >= level:
            headings.pop()
        headings.append((level, title))
        blocks.append(Block(title, path_now()))
        if level == 1 and first_h1 is None:
            first_h1 = title

    for line in body.split("\n"):
        if fence is not None:
            paragraph.append(line)
            if line.strip().startswith(fence):
                fence = None
                flush()
            continue
        if m := _FENCE.match(line):
            flush()
            fence = m.group(1)[0] * 3
            continue  # the fence line itself carries no words
        if m := _ATX.match(line):
            flush()
            heading(len(m.group(1)), m.group(2) or "")
            continue
        if (
            paragraph
            and _SETEXT.match(line)
            and len(paragraph) >= 1
            and not paragraph[-1].lstrip().startswith(("-", "*", ">"))
        ):
            title = "\n".join(paragraph)
            paragraph.clear()
            heading(1 if line.strip()[0] == "=" else 2, title.replace("\n", " "))
            continue
        if not line.strip():
            flush()
            continue
        if re.match(r"^ {0,3}([-*_])( *\1){2,} *$", line):  # thematic break
            flush()
            continue
        paragraph.append(line)
    flush()
    blocks = [b for b in blocks if b.text.strip()]
    if not any(b.heading_path == () or b.text != b.heading_path[-1] for b in blocks):
        raise IngestFailure("empty", path, "no text besides headings and front matter")

    dates = []
    for key, kind in DATE_KEYS:
        if key in meta:
            value = parse_meta_value(meta[key])
            if value is None:
                raise IngestFailure("parse_error", path, f"front matter {key}: {meta[key]!r} is not a date")
            dates.append(MetaDate(value, kind, f"front_matter:{key}"))
    tags = meta.get("tags") or ()
    if isinstance(tags, str):
        tags = [t.strip() for t in tags.split(",")]
    owner = meta.get("owner")
    stated = meta.get("lang", meta.get("language"))
    doc_title = meta.get("title") or first_h1
    return ParsedDocument(
        blocks=blocks,
        title=str(doc_title).strip() if doc_title else None,
        dates=dates,
        owner=str(owner).strip() if owner not in (None, "") else None,
        tags=tuple(str(t) for t in tags if str(t).strip()) if isinstance(tags, (list, tuple)) else (),
        language=from_tag(stated) if isinstance(stated, str) else None,
    )
