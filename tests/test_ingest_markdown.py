"""Markdown: YAML front matter fields and heading paths (CommonMark ATX and setext headings)."""

from __future__ import annotations

from datetime import date

import pytest

from auditor.ingest.failures import IngestFailure
from auditor.ingest.markdown import parse_markdown

DOC = """---
title: Start, stop or move service
owner: Customer Care
updated: 2026-10-05
last_reviewed: 2026-11-01
date: 2019-02-01
expires: 2027-06-30
tags: [service, moving]
---
Intro paragraph before any heading.

Moving home
===========

Tell us two weeks ahead. See [the form](https://example.org/form) and ![a map](map.png).

Stopping service
----------------

### Final bill

```
# not a heading: inside a code fence
```

## Transfer #

Transfer to the new tenant.

[ref]: https://example.org/hidden
"""


def test_front_matter_fields():
    doc = parse_markdown(DOC.encode(), "start.md")
    assert doc.title == "Start, stop or move service"
    assert doc.owner == "Customer Care"
    assert doc.tags == ("service", "moving")
    # docs/ingestion.md order: updated, last_reviewed, date (published); expires last.
    assert [(d.value, d.kind, d.source) for d in doc.dates] == [
        (date(2026, 10, 5), "modified", "front_matter:updated"),
        (date(2026, 11, 1), "reviewed", "front_matter:last_reviewed"),
        (date(2019, 2, 1), "published", "front_matter:date"),
        (date(2027, 6, 30), "expires", "front_matter:expires"),
    ]


def test_headings_give_section_paths():
    doc = parse_markdown(DOC.encode(), "start.md")
    paths = {b.text: b.heading_path for b in doc.blocks}
    assert paths["Intro paragraph before any heading."] == ()
    assert paths["Tell us two weeks ahead. See the form and a map."] == ("Moving home",)
    assert paths["Final bill"] == ("Moving home", "Stopping service", "Final bill")
    assert paths["# not a heading: inside a code fence\n```"] == ("Moving home", "Stopping service", "Final bill")
    # "## Transfer #": the closing sequence is not part of the heading (CommonMark §4.2).
    assert paths["Transfer to the new tenant."] == ("Moving home", "Transfer")
    assert not any("example.org" in b.text for b in doc.blocks)


def test_title_falls_back_to_first_h1_and_tags_may_be_a_string():
    doc = parse_markdown(b"---\ntags: billing, fees\n---\n# Late fees\n\nFive percent.\n", "f.md")
    assert doc.title == "Late fees" and doc.tags == ("billing", "fees") and doc.owner is None and doc.dates == []


def test_hand_written_front_matter_date():
    doc = parse_markdown(b"---\nupdated: March 3, 2024\n---\nText.\n", "f.md")
    assert [(d.value, d.source) for d in doc.dates] == [(date(2024, 3, 3), "front_matter:updated")]


@pytest.mark.parametrize(
    "content, kind, words",
    [
        (b"---\ntitle: [unclosed\n---\nText\n", "parse_error", "front matter is not valid YAML"),
        (b"---\n- a list\n---\nText\n", "parse_error", "not a mapping"),
        (b"---\nupdated: next tuesday-ish\n---\nText\n", "parse_error", "is not a date"),
        (b"---\ntitle: Only front matter\n---\n", "empty", "no text"),
        (b"# Heading only\n", "empty", "no text"),
    ],
)
def test_bad_markdown_is_refused_with_the_file_named(content, kind, words):
    with pytest.raises(IngestFailure) as failure:
        parse_markdown(content, "/kb/bad.md")
    assert failure.value.kind == kind
    assert str(failure.value).startswith("'/kb/bad.md': ") and words in str(failure.value)


def test_an_impossible_front_matter_date_is_refused():
    # PyYAML builds a date while loading "2024-13-01" and raises ValueError (found by the parser fuzz).
    with pytest.raises(IngestFailure) as failure:
        parse_markdown(b"---\nupdated: 2024-13-01\n---\n# Rates\n\nText.\n", "/kb/rates.md")
    assert failure.value.kind == "parse_error" and "front matter" in str(failure.value)


def test_comments_and_stray_brackets():
    doc = parse_markdown(
        b"# A\n\nKept <!-- hidden --> text [not a link [x](http://e.org) end.\n\nTail <!-- never closed\n\nlost\n",
        "c.md",
    )
    assert [b.text for b in doc.blocks] == ["A", "Kept  text [not a link x end.", "Tail"]
