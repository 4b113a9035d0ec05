"""Plain text: each supported encoding, paragraphs, and refusal of what is not text."""

from __future__ import annotations

import codecs

import pytest

from auditor.ingest.failures import IngestFailure
from auditor.ingest.text import decode_text, parse_text

SAMPLE = "Water rates\n\nCafé prices rose — 5 € per m³.\nSecond line.\n\n\nLast paragraph."


@pytest.mark.parametrize(
    "data",
    [
        SAMPLE.encode("utf-8"),
        codecs.BOM_UTF8 + SAMPLE.encode("utf-8"),
        codecs.BOM_UTF16_LE + SAMPLE.encode("utf-16-le"),
        codecs.BOM_UTF16_BE + SAMPLE.encode("utf-16-be"),
        SAMPLE.encode("utf-16-le"),  # no BOM: recognised by its zero bytes
        SAMPLE.encode("utf-16-be"),
        codecs.BOM_UTF32_LE + SAMPLE.encode("utf-32-le"),
        SAMPLE.replace("\n", "\r\n").encode("utf-8"),  # Windows newlines
    ],
    ids=["utf8", "utf8-bom", "utf16le-bom", "utf16be-bom", "utf16le", "utf16be", "utf32le-bom", "crlf"],
)
def test_encodings_give_the_same_paragraphs(data):
    doc = parse_text(data, "rates.txt")
    assert [b.text for b in doc.blocks] == [
        "Water rates",
        "Café prices rose — 5 € per m³.\nSecond line.",
        "Last paragraph.",
    ]
    assert doc.title == "Water rates"


def test_cp1252_fallback():
    text = "Caf\xe9 \u2013 \u201cquoted\u201d \u20ac5"
    data = text.encode("cp1252")
    with pytest.raises(UnicodeDecodeError):
        data.decode("utf-8")
    assert decode_text(data, "legacy.txt") == text


def test_invalid_utf8_that_is_not_cp1252_either_is_refused():
    # 0x81 is undefined in cp1252, and "\xc3\x28" is an invalid UTF-8 sequence.
    with pytest.raises(IngestFailure) as failure:
        parse_text(b"Rates \xc3\x28 and \x81 more", "/kb/broken.txt")
    assert failure.value.kind == "parse_error"
    assert str(failure.value) == "'/kb/broken.txt': neither UTF-8, UTF-16 nor cp1252 text (byte 0x81 at offset 13)"


def test_control_characters_mean_binary():
    with pytest.raises(IngestFailure) as failure:
        parse_text(b"abc\x00\x01\x02def", "/kb/bin.txt")
    assert failure.value.kind == "not_a_text"


def test_whitespace_only_is_empty():
    with pytest.raises(IngestFailure) as failure:
        parse_text(b" \n\n \t\n", "/kb/blank.txt")
    assert failure.value.kind == "empty"
