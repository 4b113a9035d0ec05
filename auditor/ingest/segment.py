"""Blocks -> passages of about 100–250 words (docs/ingestion.md); a passage is shorter only where
its section is.

Rules, in order:
* a heading starts a new passage (parsers emit a heading as a block whose text is the last
  element of its heading path) once the current one holds MIN_WORDS words: sections shorter than
  that join the next, and the passage's heading path is what their paths share;
* a page change starts a new passage (a passage has one page);
* blocks are joined until the next one would push the passage past MAX_WORDS;
* a block longer than MAX_WORDS is cut at sentence ends (at word boundaries when one sentence
  alone is too long) into pieces of about TARGET_WORDS.

Char offsets are into the document text = the block texts joined by "\\n\\n", so
`document_text(blocks)[p.char_start:p.char_end] == p.text` for every passage.
"""

from __future__ import annotations

import re

from auditor.models import Block, Passage

MIN_WORDS = 100
TARGET_WORDS = 200
MAX_WORDS = 250
SEPARATOR = "\n\n"

_WORD = re.compile(r"\S+")
_SENTENCE_END = re.compile(r"(?<=[.!?])[\"')\]]*\s+")


def document_text(blocks: list[Block]) -> str:
    """The text passage offsets point into."""
    return SEPARATOR.join(b.text for b in blocks)


def is_heading(block: Block) -> bool:
    return bool(block.heading_path) and block.text == block.heading_path[-1]


def _words(text: str) -> int:
    return len(_WORD.findall(text))


def _pieces(text: str, first_budget: int = TARGET_WORDS) -> list[tuple[int, int]]:
    """(start, end) spans of `text` cut at sentence ends: the first of at most `first_budget`
    words (room left after a heading), the others of at most TARGET_WORDS; a sentence longer
    than that is cut at word boundaries."""
    first_budget = max(1, min(first_budget, TARGET_WORDS))
    cuts = [0] + [m.end() for m in _SENTENCE_END.finditer(text)] + [len(text)]
    units: list[tuple[int, int, int]] = []  # (start, end, words)
    for a, b in zip(cuts, cuts[1:]):
        words = list(_WORD.finditer(text, a, b))
        if not words:
            continue
        size = first_budget if not units else TARGET_WORDS
        while len(words) > size:  # one enormous "sentence"
            units.append((words[0].start(), words[size - 1].end(), size))
            words = words[size:]
            size = TARGET_WORDS
        units.append((words[0].start(), words[-1].end() if b == len(text) else b, len(words)))
    spans: list[tuple[int, int]] = []
    start: int | None = None
    end = count = 0  # end is set with start
    for a, b, n in units:
        limit = first_budget if not spans else TARGET_WORDS
        if start is not None and count + n > limit:
            spans.append((start, end))
            start, count = None, 0
        if start is None:
            start = a
        end, count = b, count + n
    if start is not None:
        spans.append((start, end))
    # Trim whitespace at both ends so text == document slice exactly.
    out = []
    for a, b in spans:
        chunk = text[a:b]
        lead = len(chunk) - len(chunk.lstrip())
        trail = len(chunk) - len(chunk.rstrip())
        if b - trail > a + lead:
            out.append((a + lead, b - trail))
    return out


def _common_prefix(paths: list[tuple[str, ...]]) -> tuple[str, ...]:
    prefix = paths[0]
    for path in paths[1:]:
        n = 0
        while n < min(len(prefix), len(path)) and prefix[n] == path[n]:
            n += 1
        prefix = prefix[:n]
    return prefix


def segment(blocks: list[Block]) -> list[Passage]:
    """Cut `blocks` (one document's, in reading order) into passages."""
    passages: list[Passage] = []
    current: list[tuple[Block, int, int]] = []  # (block, start, end) in document text
    words = 0
    content = False  # the current passage holds more than headings
    text = document_text(blocks)
    heading_only: list[bool] = []

    def flush() -> None:
        nonlocal words, content
        if current:
            first = current[0][0]
            # The section of a passage is what its content blocks share: a passage may open with a
            # chapter heading and its first sub-heading, or hold two short sibling sections.
            paths = [b.heading_path for b, _, _ in current if not is_heading(b)] or [current[-1][0].heading_path]
            start, end = current[0][1], current[-1][2]
            passages.append(Passage(len(passages), text[start:end], _common_prefix(paths), first.page, start, end))
            heading_only.append(not content)
        current.clear()
        words, content = 0, False

    offset = 0
    for block in blocks:
        start, end = offset, offset + len(block.text)
        offset = end + len(SEPARATOR)
        n = _words(block.text)
        heading = is_heading(block)
        # A heading cuts once the passage has MIN_WORDS of its own; shorter sections join the
        # next one, so that a run of two-line sections does not become a run of tiny passages.
        if current and (content and heading and words >= MIN_WORDS or block.page != current[0][0].page):
            flush()
        room = MAX_WORDS - (words if current and not content else 0)  # after a heading
        if not heading and n > room:
            spans = _pieces(block.text, room)
            for i, (a, b) in enumerate(spans):
                piece = Block(block.text[a:b], block.heading_path, block.page)
                pn = _words(piece.text)
                if current and content and words + pn > MAX_WORDS:
                    flush()
                current.append((piece, start + a, start + b))
                words += pn
                content = True
                if i < len(spans) - 1:
                    flush()
            continue
        if current and content and words + n > MAX_WORDS:
            flush()
        current.append((block, start, end))
        words += n
        content = content or not heading
    flush()
    # A trailing run of headings alone carries no content; keep it only if it is all there is.
    if len(passages) > 1 and heading_only[-1]:
        passages.pop()
    return passages
