"""Our normalizer against dateparser (PyPI, the reference date parser) on the absolute forms both
understand. These checks alone need dateparser: the module skips by itself when it is missing, and
the ISO 8601, calendar and TIMEX3 checks of tests/test_temporal_standards.py still run."""

from __future__ import annotations

import calendar
from datetime import date, datetime

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.temporal.extract import extract

dates = st.dates(min_value=date(1900, 1, 1), max_value=date(2099, 12, 31))


def only(text, **options):
    found = extract(text, date(2024, 11, 1), **options)
    assert len(found) == 1, found
    return found[0]


# --- dateparser as reference for plain absolute forms ----------------------------------------------
# dateparser (PyPI, the reference date parser) parses each span on its own; our normalizer must
# agree with it on the forms both understand.

dateparser = pytest.importorskip("dateparser", reason="dateparser is the reference of these checks only")
FORMS = [
    "{month} {day}, {year}",
    "{day} {month} {year}",
    "{abbr} {day} {year}",
    "{weekday}, {month} {day}, {year}",
    "{month} {year}",
    "{iso}",
    "{m:02d}/{day:02d}/{year}",
    "the {day}{suffix} of {month} {year}",
]


def _suffix(day):
    return "th" if 11 <= day <= 13 else {1: "st", 2: "nd", 3: "rd"}.get(day % 10, "th")


@settings(max_examples=150, deadline=None)
@given(dates, st.sampled_from(FORMS))
def test_agrees_with_dateparser_on_absolute_forms(day, form):
    span = form.format(
        month=calendar.month_name[day.month],
        abbr=calendar.month_abbr[day.month],
        weekday=calendar.day_name[day.weekday()],
        day=day.day,
        year=day.year,
        m=day.month,
        iso=day.isoformat(),
        suffix=_suffix(day.day),
    )
    reference = dateparser.parse(
        span,
        languages=["en"],
        settings={
            "DATE_ORDER": "MDY",
            "PREFER_DAY_OF_MONTH": "first",
            "RELATIVE_BASE": datetime(2024, 11, 1),
            "REQUIRE_PARTS": ["month", "year"],
        },
    )
    assert reference is not None, span
    e = only(f"Dated {span}.")
    assert e.start == reference.date(), span
    if "{day}" not in form and "{iso}" not in form and "{m:02d}" not in form:  # month-year: the whole month
        assert e.end == reference.date().replace(day=calendar.monthrange(day.year, day.month)[1])
