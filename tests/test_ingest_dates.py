"""Metadata date syntaxes, checked against the examples of the standards that define them."""

from __future__ import annotations

import email.utils
from datetime import date

import pytest

from auditor.ingest.dates import (
    file_time_date,
    parse_http_date,
    parse_meta_value,
    parse_pdf_date,
    parse_time_element,
    parse_w3c_datetime,
)


# ISO 32000-1:2008 §7.9.4 "Dates": (D:YYYYMMDDHHmmSSOHH'mm); the example given there is
# "D:199812231952-08'00" (23 December 1998, 19:52, U.S. Pacific Standard Time). Every field after
# the year is optional; O is "+", "-" or "Z". PDF 1.x (and many writers still) end with an
# apostrophe after the minutes: HH'mm'.
@pytest.mark.parametrize(
    "value, expected",
    [
        ("D:199812231952-08'00", date(1998, 12, 23)),  # the §7.9.4 example
        ("D:199812231952-08'00'", date(1998, 12, 23)),  # older trailing apostrophe
        ("D:20240301120000Z", date(2024, 3, 1)),
        ("D:20240301120000Z00'00'", date(2024, 3, 1)),  # "Z" followed by 00'00', as PDF 1.x writers do
        ("D:20240301120000Zjunk", None),
        ("D:20240301120000+05'30", date(2024, 3, 1)),
        ("D:2024", date(2024, 1, 1)),  # partial: year only
        ("D:202403", date(2024, 3, 1)),  # year and month
        ("D:20240315", date(2024, 3, 15)),
        ("20240315103000", date(2024, 3, 15)),  # the "D:" prefix is optional (§7.9.4: "should")
        ("D:20241345", None),  # month 13
        ("yesterday", None),
    ],
)
def test_pdf_dates_iso_32000_7_9_4(value, expected):
    assert parse_pdf_date(value) == expected


# W3C Datetime (https://www.w3.org/TR/NOTE-datetime): the six levels of its examples, used by
# sitemaps.org <lastmod>, Dublin Core W3CDTF and schema.org Date/DateTime.
@pytest.mark.parametrize(
    "value, expected",
    [
        ("1997", date(1997, 1, 1)),
        ("1997-07", date(1997, 7, 1)),
        ("1997-07-16", date(1997, 7, 16)),
        ("1997-07-16T19:20+01:00", date(1997, 7, 16)),
        ("1997-07-16T19:20:30+01:00", date(1997, 7, 16)),
        ("1997-07-16T19:20:30.45+01:00", date(1997, 7, 16)),
        ("2004-12-23T18:00:15+00:00", date(2004, 12, 23)),  # sitemaps.org protocol example <lastmod>
        ("2005-01-01", date(2005, 1, 1)),  # sitemaps.org protocol example <lastmod>
        ("1994-11-05T13:15:30Z", date(1994, 11, 5)),  # W3C Datetime "Z" example
        ("16/07/1997", None),
        ("1997-02-30", None),
    ],
)
def test_w3c_datetime(value, expected):
    assert parse_w3c_datetime(value) == expected


# RFC 9110 §5.6.7: the three forms, with its own examples ("Sun, 06 Nov 1994 08:49:37 GMT" etc.).
# The standard library's email.utils is the reference parser.
@pytest.mark.parametrize(
    "value",
    [
        "Sun, 06 Nov 1994 08:49:37 GMT",  # IMF-fixdate
        "Sunday, 06-Nov-94 08:49:37 GMT",  # obsolete RFC 850 format
        "Sun Nov  6 08:49:37 1994",  # ANSI C asctime() format
    ],
)
def test_http_dates_rfc_9110_against_email_utils(value):
    reference = email.utils.parsedate_to_datetime(value).date()
    assert reference == date(1994, 11, 6)
    assert parse_http_date(value) == reference


@pytest.mark.parametrize("value", ["Sun, 06 Nov 1994", "1994-11-06", "", "Sun, 06 Foo 1994 08:49:37 GMT"])
def test_http_dates_refuse_other_syntaxes(value):
    assert parse_http_date(value) is None


# WHATWG HTML Living Standard §4.5.14 "The time element": the examples of valid datetime values.
@pytest.mark.parametrize(
    "value, expected",
    [
        ("2011-11", date(2011, 11, 1)),  # valid month string
        ("2011-11-18", date(2011, 11, 18)),  # valid date string
        ("2011-11-18T14:54", date(2011, 11, 18)),  # valid local date and time string
        ("2011-11-18T14:54:39", date(2011, 11, 18)),
        ("2011-11-18T14:54:39.929", date(2011, 11, 18)),
        ("2011-11-18 14:54:39.929", date(2011, 11, 18)),  # space separator allowed
        ("2011-11-18T14:54:39.929Z", date(2011, 11, 18)),  # valid global date and time string
        ("2011-11-18T14:54:39.929-0400", date(2011, 11, 18)),
        ("2011-11-18T14:54:39.929-04:00", date(2011, 11, 18)),
        ("2011-W47", date(2011, 11, 21)),  # valid week string: Monday of ISO week 47
        ("2011", date(2011, 1, 1)),  # valid year (non-negative integer)
        ("11-18", None),  # yearless date: no year, no date
        ("14:54", None),  # time only
        ("+0000", None),  # time-zone offset only
        ("PT4H18M3S", None),  # duration
    ],
)
def test_time_element_values_whatwg(value, expected):
    assert parse_time_element(value) == expected


def test_front_matter_values():
    # YAML 1.1 timestamps arrive as date/datetime; strings go through the syntaxes above, then
    # dateparser for hand-written dates.
    assert parse_meta_value(date(2024, 3, 1)) == date(2024, 3, 1)
    assert parse_meta_value("2024-03-01T10:00:00Z") == date(2024, 3, 1)
    assert parse_meta_value("March 3, 2024") == date(2024, 3, 3)
    assert parse_meta_value("3 Mar 2024") == date(2024, 3, 3)
    assert parse_meta_value("soon") is None
    assert parse_meta_value(True) is None
    assert parse_meta_value(20240301) is None


def test_file_time_is_the_utc_date():
    assert file_time_date(0) == date(1970, 1, 1)
    assert file_time_date(1709251199) == date(2024, 2, 29)  # 2024-02-29T23:59:59Z
