"""Candidate patterns for temporal expressions (docs/dates.md), and their reading into intervals.

One alternation holds every candidate form; the alternatives come longest-first because Python's
`re` takes the first alternative that matches at a position, not the longest, and it is tried only
where a candidate can start (`extract._starts`). Month names match capitalized, in capitals, or in lower
case except "may", "march" and "mar", which in lower case are verbs; a month counts only when a day
or a year follows it ("May I ..." never matches). Bare years are kept only next to a cue (`year_in_context`).

`parse_candidate` reads a match's named groups into an `Atom` (an interval with a granularity);
it lives beside the patterns because it depends on their group names, which is why this module
is longer than most. Calendar arithmetic is the standard library's; dateparser reads only the
relative spans ("2 weeks ago", "in 3 months", "yesterday"), one span at a time, cached.

Past 400 lines because every candidate form is one alternation here, so no form can shadow another
unseen.
"""

from __future__ import annotations

import calendar
import functools
import re
from dataclasses import dataclass
from datetime import date, datetime, timedelta
from typing import Any

MONTH_NUMBERS = {}
for _i, _name in enumerate(
    ("January February March April May June July August September October November December").split(), start=1
):
    MONTH_NUMBERS[_name.lower()] = _i
    MONTH_NUMBERS[_name[:3].lower()] = _i
MONTH_NUMBERS["sept"] = 9


# Lower case too, except "may", "march" and "mar", which are verbs far more often than months.
MONTH_NAMES = "|".join(
    variant
    for name in sorted(MONTH_NUMBERS, key=len, reverse=True)
    for variant in (name.capitalize(), name.upper()) + (() if name in ("may", "march", "mar") else (name,))
)
# an abbreviation may carry a dot ("Mar."); a full name never does, but "May." ends sentences
MONTH = rf"(?:{MONTH_NAMES})\b\.?"
_WEEKDAYS = "Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday|Mon|Tues|Tue|Wed|Thurs|Thur|Thu|Fri|Sat|Sun"
WEEKDAY_NAMES = f"{_WEEKDAYS}|{_WEEKDAYS.upper()}"
_FULL_MONTHS = "|".join(n.capitalize() for n in MONTH_NUMBERS if len(n) > 4 or n in ("may", "june", "july"))
WEEKDAY = rf"(?:{WEEKDAY_NAMES})\b\.?"
DAY = r"(?:[0-3]?\d)(?:st|nd|rd|th)?(?![\d:])"  # "9:30" is a time, not a day
YEAR_CORE = r"(?:1[89]\d{2}|2[01]\d{2})"
YEAR = YEAR_CORE + r"(?!\d)"
DASH = r"\s*(?:-|–|—)\s*"
TO = r"\s*(?:-|–|—|\bto\b|\bthrough\b|\bthru\b|\buntil\b|\btill\b)\s*"
NUMBER_WORDS = {
    "a": 1,
    "an": 1,
    "one": 1,
    "two": 2,
    "three": 3,
    "four": 4,
    "five": 5,
    "six": 6,
    "seven": 7,
    "eight": 8,
    "nine": 9,
    "ten": 10,
    "eleven": 11,
    "twelve": 12,
    "fifteen": 15,
    "eighteen": 18,
    "twenty": 20,
    "thirty": 30,
    "forty-five": 45,
    "sixty": 60,
    "ninety": 90,
}
COUNT = r"(?:\d{1,3}|" + "|".join(sorted(NUMBER_WORDS, key=len, reverse=True)) + r")"
ORDINALS = {
    "first": 1,
    "1st": 1,
    "second": 2,
    "2nd": 2,
    "third": 3,
    "3rd": 3,
    "fourth": 4,
    "4th": 4,
    "last": 4,
    "final": 4,
}
SEASONS = {"spring": "SP", "summer": "SU", "fall": "FA", "autumn": "FA", "winter": "WI"}
FY = r"(?:FY|F\.Y\.|[Ff]iscal(?:\s+[Yy]ear)?)\s*'?(?:\d{4}|\d{2})(?!\d)"
_UNIT = r"(?:day|week|month|quarter|year|fortnight)s?"
_REL_UNIT = (
    r"(?:week|month|quarter|year|fiscal\s+year|spring|summer|fall|autumn|winter|"
    r"monday|tuesday|wednesday|thursday|friday|saturday|sunday)"
)

_ALTERNATIVES = [
    # ISO 8601 week date (2009-W01-1, 2009W011) and week (2024-W05)
    ("isoweek", r"(?<![\d-])(?P<wy>\d{4})-?W(?P<ww>\d{2})(?:-?(?P<wd>[1-7]))?(?!\d)"),
    # ISO 8601 calendar date, optionally with a time; the separator must repeat
    (
        "isodate",
        rf"(?<![\d./-])(?P<iy>{YEAR_CORE})(?P<isep>[-/])(?P<im>\d{{2}})(?P=isep)(?P<id>\d{{2}})"
        r"(?:T\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?(?![\d])",
    ),
    # ISO 8601 ordinal date (2024-060)
    ("isoordinal", rf"(?<![\d./-])(?P<oy>{YEAR_CORE})-(?P<od>\d{{3}})(?![\d]|[./-]\d)"),
    # "Q3 2024", "Q1 FY2025", "Q2 of 2024"; "2024-Q3", "2024 Q3"
    (
        "quarter",
        rf"\bQ(?P<qn>[1-4])\s*(?:of\s+)?(?:(?P<qfy>{FY})|(?P<qy>{YEAR}))"
        rf"|(?<!\d)(?P<qy2>{YEAR_CORE})[-\s]Q(?P<qn2>[1-4])\b"
        rf"|(?i:(?:the\s+)?(?P<qo>first|second|third|fourth|1st|2nd|3rd|4th|last|final)\s+"
        rf"(?:fiscal\s+)?quarter\s+(?:of\s+)?(?:the\s+)?)(?:(?P<qfy3>{FY})|(?P<qy3>{YEAR}))",
    ),
    (
        "half",
        rf"\bH(?P<hn>[12])\s*(?:of\s+)?(?:(?P<hfy>{FY})|(?P<hy>{YEAR}))"
        rf"|(?<!\d)(?P<hy2>{YEAR_CORE})-H(?P<hn2>[12])\b"
        rf"|(?i:(?:the\s+)?(?P<ho>first|second|1st|2nd)\s+half\s+(?:of\s+)?(?:the\s+)?)"
        rf"(?:(?P<hfy3>{FY})|(?P<hy3>{YEAR}))",
    ),
    # "FY2024", "FY 2024-25", "fiscal year 2024", "fiscal 2025"
    (
        "fiscalrange",
        rf"(?<!\d)(?P<fa>{YEAR_CORE})\s*(?:-|–|/)\s*(?P<fb>\d{{4}}|\d{{2}})(?!\d)(?=\s+(?i:fiscal\s+year)\b)",
    ),
    (
        "fiscal",
        r"(?:\bFY|\bF\.Y\.|\b[Ff]iscal(?:\s+[Yy]ear)?)\s*'?(?P<fy>\d{4}|\d{2})(?!\d)"
        r"(?:\s*(?:-|–|/)\s*(?P<fy2>\d{4}|\d{2})(?!\d))?",
    ),
    (
        "season",
        rf"(?i:\b(?P<sn>spring|summer|fall|autumn|winter)(?:\s+of)?\s+)(?P<sy>{YEAR_CORE})(?!\d)"
        rf"(?:\s*(?:-|–|/)\s*(?P<sy2>\d{{4}}|\d{{2}})(?!\d))?",
    ),
    ("decade", r"(?i:\b(?:the\s+))?(?P<dc>(?:1[89]|20)\d0)'?s\b|(?<![\w'])'(?P<dc2>\d0)s\b"),
    # "March 1–15, 2025", "8 to 10 November 2024" (a day range inside one month)
    ("mdrange", rf"(?:{WEEKDAY},?\s+)?(?P<rm>{MONTH})\s+(?P<rd1>{DAY}){TO}(?P<rd2>{DAY}),?\s+(?P<ry>{YEAR})"),
    ("dmrange", rf"(?<!\d)(?P<rd3>{DAY}){TO}(?P<rd4>{DAY})\s+(?P<rm2>{MONTH}),?\s+(?P<ry2>{YEAR})"),
    # "March–May 2025"
    ("mmrange", rf"(?P<mm1>{MONTH}){TO}(?P<mm2>{MONTH}),?\s+(?:of\s+)?(?P<mmy>{YEAR})"),
    # "Tuesday, March 5th, 2024", "Mar. 5 2024", "March 5" (year from context)
    ("mdy", rf"(?:{WEEKDAY},?\s+)?(?P<m1>{MONTH})\s+(?:the\s+)?(?P<d1>{DAY})(?:,?\s+(?P<y1>{YEAR}))?"),
    # "5 March 2024", "the 5th of March, 2024", "Tue 5 Mar 2024"
    (
        "dmy",
        rf"(?:{WEEKDAY},?\s+)?(?<!\d)(?i:the\s+)?(?P<d2>{DAY})\s+(?:of\s+)?(?P<m2>{MONTH})(?:,?\s+(?P<y2>{YEAR}))?",
    ),
    ("monthyear", rf"(?P<m3>{MONTH}),?\s+(?:of\s+)?(?P<y3>{YEAR})"),
    # numeric dates: 03/04/2025, 3.4.2025, 03-04-2025, 3/4/25 (two-digit years only with "/")
    (
        "numeric",
        r"(?<![\d./:-])(?P<n1>\d{1,2})(?P<nsep>[/.-])(?P<n2>\d{1,2})(?P=nsep)"
        r"(?P<n3>\d{4}|(?<=/)\d{2})(?![\d]|[./-]\d)",
    ),
    # "2024–2025", "2024-25", "2024/25"
    ("yearrange", rf"(?<![\d.,:/$€£#-])(?P<yr1>{YEAR_CORE})\s*(?:-|–|—|/)\s*(?P<yr2>\d{{4}}|\d{{2}})(?![\d%]|[.,]\d)"),
    # "two weeks ago", "3 days ago", "a month ago"
    ("ago", rf"(?i:\b(?P<agn>{COUNT})\s+(?P<agu>{_UNIT})\s+ago\b)"),
    # "in two weeks", "in 30 days" (not "within": a duration, not a date)
    ("inrel", rf"(?i:\bin\s+(?P<inn>{COUNT})\s+(?P<inu>{_UNIT})(?!\s+(?:ago|of|to|in|per)\b)\b)"),
    # "the past 12 months", "the next two weeks"
    (
        "rolling",
        rf"(?i:\b(?:the\s+)?(?P<rod>past|last|previous|next|coming|following)\s+(?P<ron>{COUNT})\s+"
        rf"(?P<rou>(?:day|week|month|year)s)\b)",
    ),
    # "next July", "last March": a capital month name only ("this may take a day" is no date)
    ("monthrel", rf"(?i:\b(?P<mdir>last|this|next|coming|previous|following)\s+)(?P<mrel>{_FULL_MONTHS})\b"),
    # "last month", "next quarter", "this fiscal year", "next Monday"
    ("relative", rf"(?i:\b(?P<rdir>last|this|next|past|coming|previous|current|following)\s+(?P<runit>{_REL_UNIT})\b)"),
    ("deictic", r"(?i:\b(?P<dx>yesterday|today|tomorrow)\b)"),
    # a bare year: kept only next to a cue (year_in_context)
    ("year", rf"(?<![\w.,:/$€£#+])(?<!\d-)(?P<by>{YEAR_CORE})(?![\w%]|[.,:/-]\d|\s*(?:%|percent\b))"),
]

ALTERNATIVES = _ALTERNATIVES
# Every candidate form of this module in one alternation (extract.py joins these forms with those
# of kinds.py and splits them by what a candidate starts with, keeping this order).
CANDIDATES = re.compile("|".join(f"(?P<{name}>{body})" for name, body in _ALTERNATIVES))
DIGIT_FIRST = frozenset(
    {"isoweek", "isodate", "isoordinal", "quarter", "half", "fiscalrange", "decade", "dmrange", "dmy", "numeric"}
    | {"yearrange", "ago", "year"}
)
WORD_FIRST = frozenset(
    {"quarter", "half", "fiscal", "season", "decade", "mdrange", "mmrange", "mdy", "dmy", "monthyear", "ago"}
    | {"inrel", "rolling", "monthrel", "relative", "deictic"}
)
assert DIGIT_FIRST | WORD_FIRST == {n for n, _ in _ALTERNATIVES}

# Words where a candidate can begin (extract._starts): trying the alternation only at these word
# starts, instead of at every character, is what makes the scan cheap. Month and weekday names as
# written (their case matters, see above); the other words in any case.
STARTER_WORDS = frozenset(("Fiscal", "fiscal", *MONTH_NAMES.split("|"), *WEEKDAY_NAMES.split("|")))
STARTER_WORDS_ANY_CASE = frozenset(
    "first second third fourth last final spring summer fall autumn winter this next past previous coming "
    "current following yesterday today tomorrow".split()
)
# frequent small words start a candidate only before what can follow them there
STARTER_PHRASES = (
    r"the\s+(?:first|second|third|fourth|1st|2nd|3rd|4th|last|final|past|previous|next|coming|"
    r"following|latest|most|year-|future|recent|\d|')|in\s+(?:the\s+past\b|" + COUNT + r"\s)|"
    rf"(?:{COUNT})\s+{_UNIT}\s+ago\b|an?\s+(?:few\s+)?(?:second|minute|hour|day|week|month|quarter|year|decade|century)"
)

# "early 2023", "mid-2022", "the end of this year", "late March 2024"
MODIFIER_BEFORE = re.compile(
    r"(?i:\b(?P<mod>early|mid|middle|late|earlier|later|"
    r"(?:the\s+)?(?:beginning|start|middle|end|close)\s+of(?:\s+the)?)[-\s]+)$"
)
MODIFIERS = {
    "early": "early",
    "earlier": "early",
    "beginning": "start",
    "start": "start",
    "mid": "mid",
    "middle": "mid",
    "late": "late",
    "later": "late",
    "end": "end",
    "close": "end",
}
# text allowed between two expressions that form one range
RANGE_JOIN = re.compile(r"(?i:-|–|—|to|through|thru|until|till|and|to\s+and\s+including)")  # stripped gap
RANGE_OPEN = re.compile(r"(?i:\b(?:from|between)\s+(?:the\s+)?)$")

# Bare years: accepted after a preposition or time word, or before a noun that a year qualifies.
_YEAR_LEFT = re.compile(
    r"(?i:\b(?:in|since|for|during|from|between|until|till|through|thru|by|before|after|of|year|years|"
    r"calendar\s+year|school\s+year|tax\s+year|as\s+of|as\s+at|effective|updated|reviewed|revised|"
    r"copyright|circa|c\.|est\.|established|founded|built|report|edition|budget|rates|schedule|"
    r"season|campaign|programme|program|around|throughout|starting|beginning|ending|ends|end|expires?|"
    r"until\s+the\s+end\s+of|early|mid|late|spring|summer|fall|autumn|winter)\s*(?:-\s*)?"
    r"|[©]\s*|\(c\)\s*|\([A-Z][A-Za-z.&' -]{1,60},\s*)$"
)  # the last: a citation "(Rivera, 2019)"
_YEAR_DETERMINER = re.compile(r"(?i:\b(?:the|our|this|each|your|its|a|an|their)\s+)$")
_YEAR_RIGHT = re.compile(
    r"(?i:\s*(?:[-–]\s*)?(?:rates?|rate\s+schedule|tariffs?|fees?|charges?|prices?|pricing|budget|"
    r"reports?|annual|water\s+quality|consumer\s+confidence|season|schedule|programs?|programmes?|"
    r"plans?|figures|results|data|levels|survey|edition|update|review|audit|calendar|"
    r"billing|assessment|statement|summary|holiday|holidays)\b)"
)
# standard numbers, prices, counters, identifiers: never a year
_YEAR_BLOCK_LEFT = re.compile(
    r"(?:\b(?:ISO|IEC|EN|RFC|ANSI|NSF|ASTM|BS|DIN|IEEE|AWWA|UL|No\.?|Nr\.?|page|pages|p\.|pp\.|"
    r"[Vv]ersion|[Vv]er\.?|v|[Rr]oom|[Ss]uite|[Uu]nit|[Aa]pt\.?|[Bb]ox|[Ee]xt\.?|[Ee]xtension|[Cc]ode|"
    r"[Mm]odel|[Ee]rror|[Tt]icket|[Aa]ccount|[Oo]rder|[Ii]nvoice|[Rr]ef\.?|[Rr]eference|[Ll]ine|"
    r"[Ii]tem|[Rr]oute|[Hh]ighway|[Bb]uilding|[Ff]orm|[Ss]ection|[Pp]art|[Ss]erver|[Oo]ffice|[Ww]indows)"
    r"\s*[/:#-]?\s*|[$€£#]\s*|\b(?:[Aa]\s+)?[Tt]otal\s+of\s+|\b[Oo]ut\s+of\s+)$"
)
_YEAR_BLOCK_RIGHT = re.compile(
    r"(?i:\s*(?:gallons?|gal|litres?|liters?|kwh|kw|customers?|homes?|households?|accounts?|meters?|"
    r"metres?|feet|ft|km|kilometres?|kilometers?|miles?|units?|people|residents|connections|samples?|"
    r"tests|calls|tickets|pages?|words|items|mb|gb|hours?|hrs|minutes?|mins|mg|ppm|ppb|m3|cubic|"
    r"dollars|usd|cents|users|devices|laptops|emails|requests|properties|sq|square|men|women|children|"
    r"patients|participants|subjects|adults|staff|employees|students|cases|members|respondents)\b)"
)
_YEAR_AFTER_YEAR = re.compile(r"(?i:\s*(?:,|and|or|to|through|-|–)\s*)$")

# an identifier before digits that look like a date: "Version 2.10.2024", "build 2024-10-02"
IDENTIFIER_BEFORE = re.compile(
    r"(?i:\b(?:version|ver\.?|v|build|release|firmware|model|part|serial|"
    r"ticket|order|invoice|account|ref\.?|no\.?)\s*[:#]?\s*)$"
)


def year_in_context(text: str, start: int, end: int, previous_end: int | None) -> bool:
    """Whether the bare year at text[start:end] stands as a date.

    `previous_end` is where the previous accepted expression ended, so that "2019 and 2021" or
    "from 2019 to 2021" keeps its second year.
    """
    left_from = max(0, start - 40)
    if _YEAR_BLOCK_LEFT.search(text, left_from, start) or _YEAR_BLOCK_RIGHT.match(text, end):
        return False
    if _YEAR_LEFT.search(text, left_from, start) or _YEAR_RIGHT.match(text, end):
        return True
    if text[start - 1 : start] == "(" and text[end : end + 1] == ")":  # "(2016)": a publication year
        return True
    if previous_end is not None and start - previous_end < 12:
        gap = text[previous_end:start]
        if _YEAR_AFTER_YEAR.search(gap):
            return True
    if _YEAR_DETERMINER.search(text, left_from, start):
        following = re.match(r"\s+([A-Za-z]+)", text[end : end + 30])
        return bool(following)
    return False


# --- calendar helpers ------------------------------------------------------------------------------


def month_end(year: int, month: int) -> date:
    return date(year, month, calendar.monthrange(year, month)[1])


def add_months(day: date, months: int) -> date:
    index = day.year * 12 + day.month - 1 + months
    year, month = divmod(index, 12)
    return date(year, month + 1, min(day.day, calendar.monthrange(year, month + 1)[1]))


def month_span(year: int, first: int, count: int) -> tuple[date, date]:
    """`count` months from month `first` of `year` (which may run past December)."""
    start = date(year, 1, 1)
    start = add_months(start, first - 1)
    return start, add_months(start, count) - timedelta(days=1)


def _iso_week(year: int, week: int) -> date:
    """Monday of ISO 8601 week `week` of `year` (week 1 holds the year's first Thursday)."""
    return date.fromisocalendar(year, week, 1)


def _full_year(text: str) -> int:
    """A written year in full; two digits pivot as POSIX strptime's %y does (69–99 -> 19xx, else 20xx)."""
    digits = re.sub(r"\D", "", text)
    value = int(digits)
    if len(digits) == 2:
        return value + (1900 if value >= 69 else 2000)
    return value


def _fiscal_year(label: int, fys: int, explicit_start: int | None = None) -> tuple[date, date]:
    if explicit_start is not None:
        begin = explicit_start
    else:
        begin = label if fys == 1 else label - 1
    return month_span(begin, fys, 12)


def _season(name: str, year: int, hemisphere: str) -> tuple[date, date]:
    code = SEASONS[name.lower()]
    first = {"SP": 3, "SU": 6, "FA": 9, "WI": 12}[code]
    if hemisphere == "south":
        first = (first + 6 - 1) % 12 + 1
    return month_span(year, first, 3)


def narrow(start: date, end: date, granularity: str, modifier: str) -> tuple[date, date]:
    """early/mid/late (thirds) and start/end of an interval, see the module docstring."""
    if granularity in ("year", "decade", "half", "quarter", "season") or (end - start).days > 62:
        months = (end.year - start.year) * 12 + end.month - start.month + 1
        if modifier in ("start", "end") and granularity == "year":
            return month_span(start.year, start.month + (0 if modifier == "start" else months - 1), 1)
        third = max(1, months // 3)
        offset = {"start": 0, "early": 0, "mid": third, "late": months - third, "end": months - third}[modifier]
        return month_span(start.year, start.month + offset, third)
    length = (end - start).days + 1
    third = max(1, length // 3)
    if modifier in ("start", "early"):
        return start, start + timedelta(days=third - 1)
    if modifier == "mid":
        return start + timedelta(days=third), start + timedelta(days=2 * third - 1)
    return start + timedelta(days=2 * third), end


# --- relative expressions (dateparser on the span only) --------------------------------------------

_SETTINGS = {
    "PREFER_DAY_OF_MONTH": "first",
    "PREFER_DATES_FROM": "current_period",
    "RETURN_AS_TIMEZONE_AWARE": False,
    "DATE_ORDER": "MDY",
    "STRICT_PARSING": False,
}


@functools.lru_cache(maxsize=4096)
def dateparser_span(span: str, reference: date) -> date | None:
    """Parse one short relative span such as "2 weeks ago" with dateparser, deterministically."""
    import dateparser  # imported on first use: most passages have no relative span

    settings = dict(_SETTINGS, RELATIVE_BASE=datetime(reference.year, reference.month, reference.day))
    parsed = dateparser.parse(span, languages=["en"], settings=settings)
    return parsed.date() if parsed else None


_FIXED_BASE = date(2000, 1, 1)


def _relative_point(span: str, unit: str, reference: date) -> date | None:
    """dateparser's reading of a relative span at `reference`. Days and weeks are a fixed number of
    days whatever the base, so such a span is parsed once (at a fixed base) and its offset reused;
    months and years depend on the base (month lengths), so those are parsed per reference date."""
    if unit in ("day", "week"):
        point = dateparser_span(span, _FIXED_BASE)
        return None if point is None else reference + (point - _FIXED_BASE)
    return dateparser_span(span, reference)


def _count(word: str) -> int:
    word = word.lower()
    return int(word) if word.isdigit() else NUMBER_WORDS[word]


def _unit_interval(point: date, unit: str) -> tuple[date, date, str]:
    unit = unit.lower().rstrip("s")
    if unit in ("day",):
        return point, point, "day"
    if unit in ("week", "fortnight"):
        monday = point - timedelta(days=point.weekday())
        return monday, monday + timedelta(days=6), "week"
    if unit == "month":
        return date(point.year, point.month, 1), month_end(point.year, point.month), "month"
    if unit == "quarter":
        first = (point.month - 1) // 3 * 3 + 1
        return (*month_span(point.year, first, 3), "quarter")
    return date(point.year, 1, 1), date(point.year, 12, 31), "year"


# --- atoms: one candidate span, parsed ---------------------------------------------------------------


@dataclass
class Atom:
    """One candidate span read into an interval (offsets into the scanned text)."""

    start: int
    end: int
    granularity: str
    first: date | None = None  # None while a month-day still lacks its year
    last: date | None = None
    month: int = 0
    day: int = 0
    future: bool = False  # a relative expression pointing forward ("next month")
    past: bool = False  # one pointing back ("two weeks ago", "last year"): never planned
    relative: bool = False
    bounded: bool = False  # a range with both ends written ("from A to B")
    timex_type: str = "DATE"  # TIMEX3 type: DATE, TIME, DURATION or SET
    value: str | None = None  # TIMEX3 value when the interval does not give it (P3D, PRESENT_REF)
    placed: bool = True  # False: no place on the calendar (auditor/temporal/kinds.py)
    present: bool = False  # a present reference ("now", "currently")
    clock: str | None = None  # the time of a clock time ("T15:00"), for a day it may join
    length: tuple[int, str] | None = None  # a duration's count and unit, for an anchor to give it an end
    years_back: int = 0  # "a year earlier": a quarter named just before it moves back this many years


def _leading_int(text: str) -> int:
    """The number a day is written with ("5th" -> 5)."""
    digits = _LEADING_DIGITS.match(text)
    if digits is None:
        raise ValueError(f"no day number in {text!r}")  # not a date after all
    return int(digits.group())


_LEADING_DIGITS = re.compile(r"\d+")


def _month(text: str) -> int:
    return MONTH_NUMBERS[text.rstrip(".").lower()]


def _day_atom(m, a, month: int, day: int, year: str | None) -> Atom | None:
    if year is None:
        if not 1 <= day <= 31 or day > calendar.monthrange(2024, month)[1]:
            return None
        return Atom(m.start(a), m.end(a), "day", month=month, day=day)
    point = date(int(year), month, day)
    return Atom(m.start(a), m.end(a), "day", point, point)


def parse_candidate(m, ctx) -> Atom | None:
    """Turn the candidate match `m` into an atom, or None when it is not a date after all."""
    kind = m.lastgroup
    index = m.re.groupindex  # the digit- and word-first alternations hold different groups

    def g(name: str) -> Any:  # like `m.group`; not `groupdict`, which builds a dict of every group
        return m.group(name) if name in index else None

    s, e = m.start(kind), m.end(kind)
    if kind in ("isodate", "numeric", "isoordinal") and IDENTIFIER_BEFORE.search(ctx["text"], max(0, s - 20), s):
        return None
    ref, fys = ctx["reference"], ctx["fys"]
    if kind == "isoweek":
        monday = _iso_week(int(g("wy")), int(g("ww")))
        if g("wd"):
            point = monday + timedelta(days=int(g("wd")) - 1)
            return Atom(s, e, "day", point, point)
        return Atom(s, e, "week", monday, monday + timedelta(days=6))
    if kind == "isodate":
        point = date(int(g("iy")), int(g("im")), int(g("id")))
        return Atom(s, e, "day", point, point)
    if kind == "isoordinal":
        point = date(int(g("oy")), 1, 1) + timedelta(days=int(g("od")) - 1)
        if point.year != int(g("oy")) or int(g("od")) == 0:
            return None
        return Atom(s, e, "day", point, point)
    if kind in ("quarter", "half"):
        size = 3 if kind == "quarter" else 6
        number = g("qn") or g("qn2") or g("hn") or g("hn2")
        number = int(number) if number else ORDINALS[(g("qo") or g("ho")).lower()]
        fiscal = g("qfy") or g("qfy3") or g("hfy") or g("hfy3")
        if fiscal:
            begin, _ = _fiscal_year(_full_year(fiscal), fys)
            first, last = month_span(begin.year, begin.month + (number - 1) * size, size)
        else:
            year = int(g("qy") or g("qy2") or g("qy3") or g("hy") or g("hy2") or g("hy3"))
            first, last = month_span(year, (number - 1) * size + 1, size)
        return Atom(s, e, kind, first, last)
    if kind == "fiscalrange":
        label, raw = int(g("fa")), g("fb")
        if (int(raw) if len(raw) == 4 else label // 100 * 100 + int(raw)) != label + 1:
            return None
        return Atom(s, e, "year", *_fiscal_year(label, fys, explicit_start=label))
    if kind == "fiscal":
        label, second = _full_year(g("fy")), g("fy2")
        if second:
            second = _full_year(second) if len(second) == 4 else label // 100 * 100 + int(second)
            if second != label + 1:
                return None
            first, last = _fiscal_year(label, fys, explicit_start=label)
        else:
            first, last = _fiscal_year(label, fys)
        return Atom(s, e, "year", first, last)
    if kind == "season":
        year = int(g("sy"))
        if g("sy2"):
            second = _full_year(g("sy2")) if len(g("sy2")) == 4 else year // 100 * 100 + int(g("sy2"))
            if second != year + 1:
                return None
        first, last = _season(g("sn"), year, ctx["hemisphere"])
        return Atom(s, e, "season", first, last)
    if kind == "decade":
        decade = int(g("dc")) if g("dc") else 1900 + int(g("dc2"))
        return Atom(s, e, "decade", date(decade, 1, 1), date(decade + 9, 12, 31))
    if kind in ("mdrange", "dmrange"):
        month = _month(g("rm") or g("rm2"))
        year = int(g("ry") or g("ry2"))
        d1, d2 = (_leading_int(g(n)) for n in (("rd1", "rd2") if g("rm") else ("rd3", "rd4")))
        if not d1 < d2:
            return None
        return Atom(s, e, "day", date(year, month, d1), date(year, month, d2), bounded=True)
    if kind == "mmrange":
        year, m1, m2 = int(g("mmy")), _month(g("mm1")), _month(g("mm2"))
        if not m1 < m2:
            return None
        return Atom(s, e, "month", date(year, m1, 1), month_end(year, m2), bounded=True)
    if kind in ("mdy", "dmy"):
        month = _month(g("m1") or g("m2"))
        day = _leading_int(g("d1") or g("d2"))
        return _day_atom(m, kind, month, day, g("y1") or g("y2"))
    if kind == "monthyear":
        year, month = int(g("y3")), _month(g("m3"))
        return Atom(s, e, "month", date(year, month, 1), month_end(year, month))
    if kind == "numeric":
        a, b, y = int(g("n1")), int(g("n2")), _full_year(g("n3"))
        if g("nsep") == "." and len(g("n3")) != 4:
            return None
        day, month = (a, b) if ctx["day_first"] else (b, a)
        if month > 12 and day <= 12:  # the order is unambiguous when one part exceeds 12
            day, month = month, day
        point = date(y, month, day)
        return Atom(s, e, "day", point, point)
    if kind == "yearrange":
        y1, raw = int(g("yr1")), g("yr2")
        y2 = int(raw) if len(raw) == 4 else y1 // 100 * 100 + int(raw)
        if not 0 < y2 - y1 <= 50 or (len(raw) == 2 and y2 != y1 + 1):
            return None
        if len(raw) == 2 and fys != 1:
            # "2025–26" with a fiscal year configured is that fiscal year (rates, budgets, seasons)
            return Atom(s, e, "year", *_fiscal_year(y1, fys, explicit_start=y1))
        return Atom(s, e, "year", date(y1, 1, 1), date(y2, 12, 31), bounded=True)
    if kind == "year":
        if not year_in_context(ctx["text"], s, e, ctx["previous_end"]):
            return None
        year = int(g("by"))
        return Atom(s, e, "year", date(year, 1, 1), date(year, 12, 31))
    # relative expressions need the reference date
    if ref is None:
        return None
    if kind in ("ago", "inrel"):
        n, unit = (g("agn"), g("agu")) if kind == "ago" else (g("inn"), g("inu"))
        count = _count(n)
        unit_name = unit.lower().rstrip("s")
        if unit_name == "fortnight":
            count, unit_name = count * 2, "week"
        if unit_name == "quarter":  # dateparser has no quarters
            shifted: date | None = add_months(ref, 3 * count * (-1 if kind == "ago" else 1))
        else:
            span = f"{count} {unit_name}s ago" if kind == "ago" else f"in {count} {unit_name}s"
            shifted = _relative_point(span, unit_name, ref)
        if shifted is None:
            return None
        first, last, granularity = _unit_interval(shifted, unit_name)
        atom = Atom(s, e, granularity, first, last, future=kind == "inrel", past=kind == "ago", relative=True)
        if kind == "ago" and unit_name == "year":
            atom.years_back = count
        return atom
    if kind == "rolling":
        count, unit = _count(g("ron")), g("rou").lower().rstrip("s")
        forward = g("rod").lower() in ("next", "coming", "following")
        value = f"P{count}{unit[0].upper()}"  # TIMEX3 duration: P12M, P2W, P3Y
        length = {"day": timedelta(days=count), "week": timedelta(weeks=count)}.get(unit)
        if forward:
            last = ref + length if length else add_months(ref, count * (12 if unit == "year" else 1))
            return Atom(s, e, unit, ref, last, future=True, relative=True, timex_type="DURATION", value=value)
        first = ref - length if length else add_months(ref, -count * (12 if unit == "year" else 1))
        return Atom(s, e, unit, first, ref, past=True, relative=True, timex_type="DURATION", value=value)
    if kind == "monthrel":
        month, direction = MONTH_NUMBERS[g("mrel").lower()], g("mdir").lower()
        if direction in ("next", "coming", "following"):
            year = ref.year if month > ref.month else ref.year + 1
        elif direction in ("last", "previous"):
            year = ref.year if month < ref.month else ref.year - 1
        else:
            year = ref.year
        first, last = date(year, month, 1), month_end(year, month)
        return Atom(s, e, "month", first, last, future=first > ref, past=last < ref, relative=True)
    if kind == "relative":
        direction, unit = g("rdir").lower(), re.sub(r"\s+", " ", g("runit").lower())
        step = {"last": -1, "past": -1, "previous": -1, "next": 1, "coming": 1, "following": 1}.get(direction, 0)
        if unit in MONTH_NUMBERS or unit in SEASONS or unit.endswith("day"):
            return _relative_named(s, e, unit, step, ref, ctx["hemisphere"])
        if unit == "fiscal year":
            label = _fiscal_label(ref, fys) + step
            first, last = _fiscal_year(label, fys)
            return Atom(s, e, "year", first, last, future=step > 0, past=step < 0, relative=True)
        months = {"week": 0, "month": 1, "quarter": 3, "year": 12}[unit]
        point = ref + timedelta(weeks=step) if unit == "week" else add_months(ref, months * step)
        first, last, granularity = _unit_interval(point, unit)
        return Atom(s, e, granularity, first, last, future=step > 0, past=step < 0, relative=True)
    if kind == "deictic":
        offset = {"yesterday": -1, "today": 0, "tomorrow": 1}[g("dx").lower()]
        when = _relative_point(g("dx").lower(), "day", ref) if offset else ref
        if when is None:
            return None
        return Atom(s, e, "day", when, when, future=offset > 0, past=offset < 0, relative=True)
    return None


def _fiscal_label(day: date, fys: int) -> int:
    """The fiscal year (named as in `_fiscal_year`) that contains `day`."""
    if fys == 1:
        return day.year
    return day.year + 1 if day.month >= fys else day.year


def _relative_named(s, e, unit, step, ref, hemisphere) -> Atom | None:
    if unit.endswith("day"):  # next Monday, last Friday
        weekday = list(calendar.day_name).index(unit.capitalize())
        delta = (weekday - ref.weekday()) % 7
        if step > 0:
            point = ref + timedelta(days=delta or 7)
        elif step < 0:
            point = ref - timedelta(days=(ref.weekday() - weekday) % 7 or 7)
        else:
            point = ref + timedelta(days=delta)
        return Atom(s, e, "day", point, point, future=point > ref, past=point < ref, relative=True)
    # seasons: "this summer" is the one of the reference year, "next/last" step from it
    base = ref.year
    if _season(unit, base - 1, hemisphere)[1] >= ref:  # still in the winter that began last year
        base -= 1
    first, last = _season(unit, base + step, hemisphere)
    return Atom(s, e, "season", first, last, future=first > ref, past=last < ref, relative=True)
