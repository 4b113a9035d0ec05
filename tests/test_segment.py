"""Segmentation: passages of ~100–250 words cut at headings, paragraph ends and pages, with exact
char offsets into the document text."""

from __future__ import annotations

import re

from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.ingest.segment import MAX_WORDS, document_text, segment
from auditor.models import Block
from tests.ingest_helpers import words


def n_words(text: str) -> int:
    return len(re.findall(r"\S+", text))


def test_headings_start_passages_and_keep_their_path():
    blocks = [
        Block("Billing", ("Billing",)),
        Block("Late fees", ("Billing", "Late fees")),
        Block(words(120), ("Billing", "Late fees")),
        Block("Paying", ("Billing", "Paying")),
        Block(words(30, "pay"), ("Billing", "Paying")),
    ]
    passages = segment(blocks)
    assert [p.heading_path for p in passages] == [("Billing", "Late fees"), ("Billing", "Paying")]
    assert passages[0].text.startswith("Billing\n\nLate fees\n\n")
    assert passages[1].text.startswith("Paying\n\n")


def test_short_sections_join_the_next_under_their_shared_path():
    blocks = [
        Block("Report", ("Report",)),
        Block("Sources", ("Report", "Sources")),
        Block(words(40), ("Report", "Sources")),
        Block("Lead", ("Report", "Lead")),
        Block(words(50, "lead"), ("Report", "Lead")),
        Block("Hardness", ("Report", "Hardness")),
        Block(words(30, "hard"), ("Report", "Hardness")),
    ]
    passages = segment(blocks)
    # 40 + 50 words: below MIN_WORDS when "Hardness" comes, so all three sections share a passage.
    assert len(passages) == 1 and passages[0].heading_path == ("Report",)
    assert "Lead\n\nlead0" in passages[0].text and "Hardness\n\nhard0" in passages[0].text


def test_long_sections_are_cut_at_paragraph_ends_within_the_limit():
    blocks = [Block(words(90, f"p{i}x"), ("Guide",)) for i in range(6)]  # 540 words
    passages = segment(blocks)
    assert all(n_words(p.text) <= MAX_WORDS for p in passages)
    assert all(n_words(p.text) >= 100 for p in passages[:-1])
    # Every cut is at a paragraph end: no block is split.
    text = document_text(blocks)
    for p in passages:
        assert p.char_start == 0 or text[p.char_start - 2 : p.char_start] == "\n\n"


def test_one_huge_paragraph_is_cut_at_sentence_ends():
    block = Block(words(700), ())
    passages = segment([block])
    assert len(passages) >= 3
    assert all(n_words(p.text) <= MAX_WORDS for p in passages)
    assert all(p.text.endswith(".") for p in passages)


def test_pages_are_not_mixed():
    blocks = [Block(words(20), (), 1), Block(words(20, "b"), (), 2)]
    assert [p.page for p in segment(blocks)] == [1, 2]


@settings(max_examples=300, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 400), st.integers(0, 3), st.booleans()), min_size=1, max_size=12))
def test_offsets_always_slice_the_document_text(spec):
    blocks = []
    for i, (n, page, heading) in enumerate(spec):
        if heading:
            blocks.append(Block(f"Heading {i}", (f"Heading {i}",), page))
        else:
            blocks.append(Block(words(max(n, 1), f"w{i}x"), (), page))
    text = document_text(blocks)
    passages = segment(blocks)
    assert [p.ordinal for p in passages] == list(range(len(passages)))
    for p in passages:
        assert text[p.char_start : p.char_end] == p.text
        assert n_words(p.text) <= MAX_WORDS + 0
    # Nothing but separators and trailing headings is left out.
    covered = " ".join(text[p.char_start : p.char_end] for p in passages)
    assert n_words(covered) >= sum(n_words(b.text) for b in blocks if not b.heading_path)


def test_a_heading_counts_against_the_word_limit():
    # Found by the property test above: heading (2 words) + a 249-word paragraph.
    blocks = [Block("Heading 0", ("Heading 0",)), Block(words(249), ("Heading 0",))]
    passages = segment(blocks)
    assert all(n_words(p.text) <= MAX_WORDS for p in passages)
    assert passages[0].text.startswith("Heading 0\n\n") and len(passages) == 2
