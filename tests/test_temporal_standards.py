"""External checks of the temporal normalizer, each against a source outside the project."""

from __future__ import annotations

import calendar
from datetime import date, datetime, timedelta

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.temporal.extract import extract, timex3

REF = date(2024, 11, 1)
dates = st.dates(min_value=date(1900, 1, 1), max_value=date(2099, 12, 31))


def only(text, **options):
    found = extract(text, REF, **options)
    assert len(found) == 1, found
    return found[0]


# --- ISO 8601 week and ordinal dates -----------------------------------------------------------------
# Source: ISO 8601-1:2019 §5.2.2 (ordinal date) and §5.2.3 (week date); week 1 of a year is the week
# that holds its first Thursday. Worked examples from ISO 8601:2004 §4.1.3.2 and §4.1.4.2 (from memory):
# 1985-04-12 is ordinal 1985-102 and week date 1985-W15-5; the year boundary cases below are the
# well-known ones (2008-12-29 is 2009-W01-1; 2010-01-03 is 2009-W53-7).


@pytest.mark.parametrize(
    "written, expected",
    [
        ("2009-W01-1", date(2008, 12, 29)),
        ("2009-W53-7", date(2010, 1, 3)),
        ("1985-W15-5", date(1985, 4, 12)),
        ("1985W155", date(1985, 4, 12)),
        ("2020-W53-5", date(2021, 1, 1)),
    ],
)
def test_iso_week_dates(written, expected):
    e = only(f"Notice {written}.")
    assert (e.start, e.end, e.granularity) == (expected, expected, "day")


def test_iso_week_is_monday_to_sunday():
    e = only("Maintenance window 2009-W01.")
    assert (e.start, e.end, e.granularity) == (date(2008, 12, 29), date(2009, 1, 4), "week")
    assert timex3(e) == "2009-W01"


def test_week_53_only_in_long_years():
    # 2020 has 53 ISO weeks, 2021 has 52 (stdlib: date(2021, 12, 28).isocalendar()[1] == 52)
    assert only("Week 2020-W53.").start == date(2020, 12, 28)
    assert extract("Week 2021-W53.", REF) == []


@pytest.mark.parametrize(
    "written, expected",
    [
        ("1985-102", date(1985, 4, 12)),
        ("2024-060", date(2024, 2, 29)),
        ("2023-060", date(2023, 3, 1)),
        ("2024-366", date(2024, 12, 31)),
    ],
)
def test_iso_ordinal_dates(written, expected):
    assert only(f"Logged on {written}.").start == expected


def test_ordinal_day_366_exists_only_in_leap_years():
    assert extract("Logged on 2023-366.", REF) == []


@settings(max_examples=300, deadline=None)
@given(dates)
def test_week_and_ordinal_dates_match_the_standard_library(day):
    # reference: datetime.date.isocalendar() and timetuple().tm_yday implement ISO 8601
    year, week, weekday = day.isocalendar()
    assert only(f"Notice {year:04d}-W{week:02d}-{weekday}.").start == day
    assert only(f"Notice {day.year:04d}-{day.timetuple().tm_yday:03d}.").start == day


# --- leap years, with the standard library's calendar as reference ---------------------------------


@settings(max_examples=200, deadline=None)
@given(st.integers(min_value=1900, max_value=2099))
def test_february_has_the_right_length(year):
    e = only(f"Readings for February {year} are below.")
    assert e.end == date(year, 2, 29 if calendar.isleap(year) else 28)
    assert (e.end - e.start).days + 1 == calendar.monthrange(year, 2)[1]
    leap_day = extract(f"Bills dated February 29, {year} are listed.", REF)
    assert bool(leap_day) == calendar.isleap(year)


@settings(max_examples=300, deadline=None)
@given(dates)
def test_written_forms_round_trip_through_datetime(day):
    month = calendar.month_name[day.month]
    abbr = calendar.month_abbr[day.month]
    for text in (
        f"Updated {day.isoformat()}.",
        f"Effective {month} {day.day}, {day.year}.",
        f"Effective {day.day} {month} {day.year}.",
        f"Closed on {abbr}. {day.day}, {day.year}.",
        f"Dated {day.month:02d}/{day.day:02d}/{day.year}.",
    ):
        e = only(text)
        assert (e.start, e.end, e.granularity) == (day, day, "day"), text
    e = only(f"Dated {day.day:02d}/{day.month:02d}/{day.year}.", day_first=True)
    assert e.start == day


# --- TimeML TIMEX3 --------------------------------------------------------------------------------------
# Source: TimeML Annotation Guidelines 1.2.1 (Saurí et al., 2006), TIMEX3 `value` (from memory): a year
# part followed by Q1–Q4 for quarters, H1/H2 for halves, SP/SU/FA/WI for seasons, Www for ISO weeks,
# and a decade written with its first three digits ("199" for the 1990s). A quarter is three calendar
# months and a half six, as in ISO 8601-2:2019's sub-year groupings (codes 33–36 for quarters).


@pytest.mark.parametrize(
    "text, value, start, end, granularity",
    [
        ("Results for the third quarter of 1999.", "1999-Q3", date(1999, 7, 1), date(1999, 9, 30), "quarter"),
        ("Results for Q1 2024.", "2024-Q1", date(2024, 1, 1), date(2024, 3, 31), "quarter"),
        ("Results for 2024-Q4.", "2024-Q4", date(2024, 10, 1), date(2024, 12, 31), "quarter"),
        ("Targets for H1 2025.", "2025-H1", date(2025, 1, 1), date(2025, 6, 30), "half"),
        ("Targets for the second half of 2025.", "2025-H2", date(2025, 7, 1), date(2025, 12, 31), "half"),
        ("Works in spring 2025.", "2025-SP", date(2025, 3, 1), date(2025, 5, 31), "season"),
        ("Works in the summer of 1964.", "1964-SU", date(1964, 6, 1), date(1964, 8, 31), "season"),
        ("Works in fall 2023.", "2023-FA", date(2023, 9, 1), date(2023, 11, 30), "season"),
        ("Works in winter 2023.", "2023-WI", date(2023, 12, 1), date(2024, 2, 29), "season"),
        ("Pipes laid in the 1990s.", "199", date(1990, 1, 1), date(1999, 12, 31), "decade"),
        ("Rates for March 2024.", "2024-03", date(2024, 3, 1), date(2024, 3, 31), "month"),
        ("During 2023 we grew.", "2023", date(2023, 1, 1), date(2023, 12, 31), "year"),
    ],
)
def test_timex3_values_and_intervals(text, value, start, end, granularity):
    e = only(text)
    assert (e.start, e.end, e.granularity) == (start, end, granularity)
    assert timex3(e) == value


def test_timex3_seasons_in_the_south():
    e = only("Works in spring 2025.", hemisphere="south")
    assert (e.start, e.end) == (date(2025, 9, 1), date(2025, 11, 30))
    assert timex3(e, hemisphere="south") == "2025-SP"


def test_timex3_of_fiscal_quarters_is_the_calendar_one_or_none():
    # a July fiscal year's Q1 is calendar Q3; a February one's quarters are not calendar quarters
    assert timex3(only("Q1 FY2025 results", fiscal_year_start=7)) == "2024-Q3"
    assert timex3(only("Q1 FY2025 results", fiscal_year_start=2)) is None
    assert timex3(only("Rates apply from July 1, 2024 through June 30, 2025.")) is None


# --- dateparser as reference for plain absolute forms ----------------------------------------------
# dateparser (PyPI, the reference date parser) parses each span on its own; our normalizer must
# agree with it on the forms both understand.

dateparser = pytest.importorskip("dateparser")
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


def test_agrees_with_dateparser_on_relative_spans():
    base = datetime(2024, 2, 29)
    for span in ["3 days ago", "two weeks ago", "a month ago", "1 year ago", "yesterday", "tomorrow"]:
        reference = dateparser.parse(span, languages=["en"], settings={"RELATIVE_BASE": base}).date()
        e = extract(f"Noted {span}.", base.date())[0]
        assert e.start <= reference <= e.end, span
    # a day-granularity one lands exactly
    assert extract("Noted 3 days ago.", base.date())[0].start == base.date() - timedelta(days=3)
