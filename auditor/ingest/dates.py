"""Metadata date syntaxes of the open standards documents carry their dates in.

Each parser takes the string as written and returns a `datetime.date` (the calendar date as written,
in the writer's own time zone offset: a page "modified 2024-03-01T23:30-05:00" was modified on
1 March where it was written) or None when the string is not in that syntax. Partial dates give the
first day of the period they name (a year-only date is taken as 1 January: older, so conservative
for freshness).
"""

from __future__ import annotations

import re
from datetime import UTC, date, datetime

# ISO 32000-1 §7.9.4: (D:YYYYMMDDHHmmSSOHH'mm), every part after the year optional; O is +, - or Z.
# PDF 1.x writers often add a trailing apostrophe (HH'mm'), which the older spec showed, and write
# the offset after "Z" too ("Z00'00'"); accept both.
_PDF_DATE = re.compile(
    r"^\s*(?:D:)?(?P<Y>\d{4})(?P<M>\d{2})?(?P<D>\d{2})?(?P<h>\d{2})?(?P<m>\d{2})?(?P<s>\d{2})?"
    r"(?P<tz>[Zz+\-](?:\d{2}'?(?:\d{2}'?)?)?)?\s*$"
)


def parse_pdf_date(value: str | bytes | None) -> date | None:
    """A PDF date string (ISO 32000-1 §7.9.4) -> date, or None.

    `D:199812231952-08'00` -> 1998-12-23; `D:2001` -> 2001-01-01; `D:20240101Z` -> 2024-01-01.
    """
    if value is None:
        return None
    if isinstance(value, bytes):
        value = value.decode("latin-1", "replace")
    m = _PDF_DATE.match(str(value))
    if not m:
        return None
    return _calendar_date(m)


def _calendar_date(m: re.Match) -> date | None:
    """The date of a match with groups Y, M, D (M and D may be absent: the first of the period)."""
    try:
        return date(int(m["Y"]), int(m["M"] or 1), int(m["D"] or 1))
    except ValueError:  # 2024-02-30, month 13: not a date
        return None


# W3C Datetime (https://www.w3.org/TR/NOTE-datetime), the profile of ISO 8601 that sitemaps.org
# <lastmod>, Dublin Core (W3CDTF) and schema.org Date/DateTime use: YYYY, YYYY-MM, YYYY-MM-DD,
# YYYY-MM-DDThh:mmTZD, YYYY-MM-DDThh:mm:ss(.s)TZD. A space instead of "T" is tolerated (schema.org
# examples and HTML's local date-and-time strings allow it).
_W3C = re.compile(
    r"^\s*(?P<Y>\d{4})(?:-(?P<M>\d{2})(?:-(?P<D>\d{2})"
    r"(?:[Tt ](?P<h>\d{2}):(?P<m>\d{2})(?::(?P<s>\d{2})(?:[.,]\d+)?)?"
    r"(?P<tz>[Zz]|[+\-]\d{2}:?\d{2})?)?)?)?\s*$"
)


def parse_w3c_datetime(value: str | None) -> date | None:
    """A W3C Datetime / ISO 8601 string -> date, or None ("1997-07-16T19:20+01:00" -> 1997-07-16)."""
    if not value:
        return None
    m = _W3C.match(str(value))
    if not m:
        return None
    return _calendar_date(m)


_MONTHS = {
    m: i for i, m in enumerate(["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"], 1)
}
# RFC 9110 §5.6.7: IMF-fixdate "Sun, 06 Nov 1994 08:49:37 GMT", and the obsolete forms a recipient
# must still accept: rfc850-date "Sunday, 06-Nov-94 08:49:37 GMT" and asctime "Sun Nov  6 08:49:37 1994".
_IMF = re.compile(r"^\s*[A-Za-z]{3},\s+(\d{2})\s+([A-Za-z]{3})\s+(\d{4})\s+\d{2}:\d{2}:\d{2}\s+GMT\s*$")
_RFC850 = re.compile(r"^\s*[A-Za-z]+,\s+(\d{2})-([A-Za-z]{3})-(\d{2})\s+\d{2}:\d{2}:\d{2}\s+GMT\s*$")
_ASCTIME = re.compile(r"^\s*[A-Za-z]{3}\s+([A-Za-z]{3})\s+(\d{1,2})\s+\d{2}:\d{2}:\d{2}\s+(\d{4})\s*$")


def parse_http_date(value: str | None) -> date | None:
    """An HTTP date (RFC 9110 §5.6.7: IMF-fixdate, rfc850-date, asctime-date) -> date, or None."""
    if not value:
        return None
    try:
        if m := _IMF.match(value):
            return date(int(m[3]), _MONTHS[m[2].title()], int(m[1]))
        if m := _RFC850.match(value):
            # RFC 9110: a two-digit year more than 50 years in the future is in the past century.
            year = 2000 + int(m[3])
            if year > datetime.now().year + 50:
                year -= 100
            return date(year, _MONTHS[m[2].title()], int(m[1]))
        if m := _ASCTIME.match(value):
            return date(int(m[3]), _MONTHS[m[1].title()], int(m[2]))
    except (KeyError, ValueError):
        return None
    return None


# WHATWG HTML §4.5.14 (the time element): a datetime value is a month, date, yearless date, time,
# local or global date and time, time zone, week, year or duration string. Only those that name a
# calendar day, month, week or year give a date here.
_WEEK = re.compile(r"^\s*(\d{4,})-W(\d{2})\s*$")
_YEAR = re.compile(r"^\s*(\d{4,})\s*$")


def parse_time_element(value: str | None) -> date | None:
    """A `<time datetime>` value (WHATWG HTML) -> date, or None.

    "2011-11-18" -> that day; "2011-11" -> 1 Nov 2011; "2011-W47" -> Monday of ISO week 47;
    "2011" -> 1 Jan 2011; "2011-11-18T14:54:39.929-06:00" -> 2011-11-18; times of day, yearless
    dates and durations -> None.
    """
    if not value:
        return None
    if m := _WEEK.match(value):
        try:
            return date.fromisocalendar(int(m[1]), int(m[2]), 1)
        except ValueError:
            return None
    if _YEAR.match(value):
        year = int(value)
        return date(year, 1, 1) if 1 <= year <= 9999 else None
    return parse_w3c_datetime(value)


def parse_meta_value(value) -> date | None:
    """A date as found in front matter or JSON-LD: a YAML date/datetime, or a string in any of the
    syntaxes above (W3C/ISO 8601 first, then HTTP dates, then `dateparser` on the short string)."""
    if value is None or isinstance(value, bool):
        return None
    if isinstance(value, datetime):
        return value.date()
    if isinstance(value, date):
        return value
    if not isinstance(value, str):
        return None
    text = value.strip()
    if not text or len(text) > 64:
        return None
    found = parse_w3c_datetime(text) or parse_http_date(text)
    if found is None and text.startswith("D:"):
        found = parse_pdf_date(text)
    if found:
        return found
    # Hand-written front matter ("March 3, 2024", "3 Mar 2024"): dateparser on the value only,
    # never on running text (docs/dates.md).
    import dateparser  # slow import, only needed for the unusual cases

    parsed = dateparser.parse(
        text,
        languages=["en"],
        settings={
            "STRICT_PARSING": True,
            "REQUIRE_PARTS": ["year", "month", "day"],
            "RETURN_AS_TIMEZONE_AWARE": False,
            "PREFER_DAY_OF_MONTH": "first",
        },
    )
    return parsed.date() if parsed else None


def file_time_date(mtime: float) -> date:
    """The UTC calendar date of a file modification time (seconds since the epoch); UTC so that
    the same file gives the same date wherever the audit runs."""
    return datetime.fromtimestamp(mtime, UTC).date()


__all__ = [
    "parse_pdf_date",
    "parse_w3c_datetime",
    "parse_http_date",
    "parse_time_element",
    "parse_meta_value",
    "file_time_date",
]
