"""PDF parsing with real PDFs generated here by fpdf2 (text, pages, outline, XMP) and pypdf
(Info dates, encryption)."""

from __future__ import annotations

from datetime import date

import pytest

from auditor.ingest.failures import IngestFailure
from auditor.ingest.pdf import parse_pdf
from auditor.ingest.walk import detect_kind
from tests.ingest_helpers import encrypt_pdf, image_only_pdf, make_pdf, xmp_packet

RATES = "Residential rates apply to homes. The base charge is 12 dollars a month."
COMMERCIAL = "Commercial rates apply to businesses and are billed monthly."
FEES = "A late fee applies after thirty days."


def test_text_per_page_with_outline_headings():
    data = make_pdf(
        [RATES, COMMERCIAL, FEES],
        title="Rate schedule",
        sections=[(1, "Rates", 0), (1, "Residential", 1), (2, "Commercial", 1), (3, "Fees", 0)],
    )
    doc = parse_pdf(data, "rates.pdf")
    assert doc.title == "Rate schedule"
    content = [
        (b.text, b.heading_path, b.page)
        for b in doc.blocks
        if b.text not in ("Rates", "Residential", "Commercial", "Fees")
    ]
    assert content == [
        (RATES, ("Rates", "Residential"), 1),
        (COMMERCIAL, ("Rates", "Commercial"), 2),
        (FEES, ("Fees",), 3),
    ]
    headings = [
        (b.text, b.heading_path, b.page) for b in doc.blocks if b.text in ("Rates", "Residential", "Commercial", "Fees")
    ]
    assert headings == [
        ("Rates", ("Rates",), 1),
        ("Residential", ("Rates", "Residential"), 1),
        ("Commercial", ("Rates", "Commercial"), 2),
        ("Fees", ("Fees",), 3),
    ]


def test_headings_from_fonts_when_there_is_no_outline():
    body = "Residential rates apply to homes. " * 8  # several lines of 11 pt body text
    data = make_pdf(
        [body, COMMERCIAL + " " + FEES],
        outline=False,
        sections=[(1, "Rate schedule", 0), (1, "Residential", 1), (2, "Commercial", 1)],
    )
    doc = parse_pdf(data, "rates.pdf")
    assert [(b.text, b.heading_path, b.page) for b in doc.blocks] == [
        ("Rate schedule", ("Rate schedule",), 1),
        ("Residential", ("Rate schedule", "Residential"), 1),
        (body.strip(), ("Rate schedule", "Residential"), 1),
        ("Commercial", ("Rate schedule", "Commercial"), 2),
        (COMMERCIAL + " " + FEES, ("Rate schedule", "Commercial"), 2),
    ]


def test_pages_without_outline():
    doc = parse_pdf(make_pdf(["First page text.", "Second page text."]), "plain.pdf")
    assert [(b.text, b.heading_path, b.page) for b in doc.blocks] == [
        ("First page text.", (), 1),
        ("Second page text.", (), 2),
    ]


def test_info_dates_iso_32000():
    # Info dictionary ModDate/CreationDate in the ISO 32000-1 §7.9.4 syntax, set with pypdf.
    data = make_pdf(["Text."], info={"/ModDate": "D:199812231952-08'00'", "/CreationDate": "D:1997"})
    doc = parse_pdf(data, "info.pdf")
    assert [(d.value, d.kind, d.source) for d in doc.dates] == [
        (date(1998, 12, 23), "modified", "pdf:info:ModDate"),
        (date(1997, 1, 1), "created", "pdf:info:CreationDate"),
    ]


def test_xmp_dates_come_first():
    # XMP Specification Part 1 §8.4: xmp:ModifyDate and xmp:CreateDate are ISO 8601 dates.
    data = make_pdf(
        ["Text."],
        xmp=xmp_packet(modify="2024-02-03T10:00:00Z", create="2023-01-15T08:00:00+01:00"),
        info={"/ModDate": "D:20240101000000Z", "/CreationDate": "D:20230101000000Z"},
    )
    doc = parse_pdf(data, "xmp.pdf")
    assert [(d.value, d.source) for d in doc.dates] == [
        (date(2024, 2, 3), "pdf:xmp:ModifyDate"),
        (date(2024, 1, 1), "pdf:info:ModDate"),
        (date(2023, 1, 15), "pdf:xmp:CreateDate"),
        (date(2023, 1, 1), "pdf:info:CreationDate"),
    ]


def test_encrypted_with_the_empty_user_password_opens():
    data = encrypt_pdf(make_pdf([RATES]), user_password="")
    doc = parse_pdf(data, "open.pdf")
    assert doc.blocks[0].text == RATES


def test_encrypted_with_a_password_is_recorded():
    data = encrypt_pdf(make_pdf([RATES]), user_password="s3cret")
    with pytest.raises(IngestFailure) as failure:
        parse_pdf(data, "/kb/locked.pdf")
    assert failure.value.kind == "encrypted"
    assert (
        str(failure.value) == "'/kb/locked.pdf': encrypted PDF, no password given (the empty password does not open it)"
    )


def test_no_text_layer_needs_ocr():
    with pytest.raises(IngestFailure) as failure:
        parse_pdf(image_only_pdf(), "/kb/scan.pdf")
    assert failure.value.kind == "needs_ocr" and "no text layer" in str(failure.value)


def test_truncated_pdf():
    data = make_pdf([RATES, COMMERCIAL])
    with pytest.raises(IngestFailure) as failure:
        parse_pdf(data[: len(data) // 2], "/kb/cut.pdf")
    assert failure.value.kind == "parse_error" and "truncated" in str(failure.value)


def test_damaged_body_is_a_parse_error():
    data = make_pdf([RATES])
    damaged = data[:9] + b"\x00garbage" * 200 + b"\n%%EOF\n"
    with pytest.raises(IngestFailure) as failure:
        parse_pdf(damaged, "/kb/damaged.pdf")
    assert failure.value.kind == "parse_error"
    assert str(failure.value).startswith("'/kb/damaged.pdf': damaged PDF (PdfReadError: ")


def test_type_comes_from_magic_bytes():
    pdf = make_pdf([RATES])
    assert detect_kind(pdf, "text", "really-a-pdf.txt") == "pdf"
    with pytest.raises(IngestFailure) as failure:
        detect_kind(b"<html><body>not a pdf</body></html>", "pdf", "/kb/fake.pdf")
    assert failure.value.kind == "not_a_pdf"
    with pytest.raises(IngestFailure) as png:
        detect_kind(b"\x89PNG\r\n\x1a\n" + b"\x00" * 50, "html", "/kb/image.html")
    assert png.value.kind == "not_a_html" and "PNG" in str(png.value)


def test_an_unknown_stream_filter_is_a_parse_error():
    # "/FlateDecode" -> "/\x00lateDecode": pypdf raises NotImplementedError (found by the parser fuzz).
    data = make_pdf([RATES])
    at = data.index(b"/FlateDecode") + 1
    with pytest.raises(IngestFailure) as failure:
        parse_pdf(data[:at] + b"\x00" + data[at + 1 :], "/kb/filter.pdf")
    assert failure.value.kind == "parse_error" and "damaged PDF (NotImplementedError" in str(failure.value)
