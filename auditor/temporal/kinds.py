"""Candidate patterns for the TIMEX3 kinds read against the document date (docs/dates.md).

Weekdays, bare months and quarters without a year, present and future references ("now",
"currently", "the future"), durations ("three days", "a decade", "16-hour"), vague spans ("recent
weeks", "the next few months"), schedules (TIMEX3 SET: "every Tuesday", "daily", "annually in
April"), clock times and parts of the day. They join the alternation of `patterns` after its own
forms (`extract` builds the two), so a fuller date ("Friday, March 5, 2024", "May 5", "Q3 2024")
always wins at the same position.

Year inference (docs/dates.md): a weekday is the one on or before the reference date when the
tense points back, on or after it when it points ahead, else the nearest; a bare month and a
quarter or half without a year take the reference year unless that lies on the wrong side of the
reference date for the tense (or for a cue: "until/through/starting December" point forward,
"since December" back), when the adjacent year is taken; a quarter that ended in the three months
before the reference date stays the one meant even ahead. The tense is that of the tense word
nearest the expression, else of its sentence (`extract`, `roles.nearest_tense`). A bare month in a sentence with
neither tense nor cue is a recurring month (`XXXX-06`: "Water use peaks in June"), with no place on
the calendar; a quarter without tense is the latest one begun by the reference date.

An expression with no place on the calendar (a duration not anchored to a date, a schedule, a
vague span, a clock time with no day) has `placed` False: `extract` gives it the reference date
as its interval and the role `other`.

Past 400 lines because each TIMEX3 kind's patterns and its reading sit together, one section a kind.
"""

from __future__ import annotations

import calendar
import re
from collections.abc import Callable
from datetime import date, timedelta
from typing import Any

from auditor.temporal.patterns import (
    COUNT,
    MONTH_NUMBERS,
    NUMBER_WORDS,
    ORDINALS,
    SEASONS,
    Atom,
    add_months,
    month_end,
    month_span,
)

_WEEKDAY_FULL = tuple(calendar.day_name)  # Monday .. Sunday
_WEEKDAY_RE = "|".join(_WEEKDAY_FULL)
# a month written out, or abbreviated with its dot ("Sept.", "Dec."): a bare "Sun" or "Mar" is too often no date
_FULL_MONTHS = "(?:" + "|".join(calendar.month_name[1:]) + r")\b|(?:Jan|Feb|Apr|Aug|Sept|Oct|Nov|Dec)\."
PART_OF_DAY = {"morning": "MO", "afternoon": "AF", "evening": "EV", "night": "NI", "overnight": "NI"}
# units of a duration, with the TIMEX3 designator; T marks the time part (PT3H)
UNITS = {
    "second": ("T", "S", 0),
    "minute": ("T", "M", 0),
    "hour": ("T", "H", 0),
    "day": ("", "D", 1),
    "week": ("", "W", 7),
    "month": ("", "M", 30),
    "quarter": ("", "Q", 91),
    "year": ("", "Y", 365),
    "decade": ("", "DE", 3652),
    "century": ("", "CE", 36524),
}
_UNIT_WORD = r"(?:second|minute|hour|day|week|month|quarter|year|decade|centur(?:y|ies))"
_BIG_NUMBER = r"\d{1,3}(?:,\d{3})+|\d+(?:\.\d+)?"
_TENS = "twenty|thirty|forty|fifty|sixty|seventy|eighty|ninety"
_COUNT_WORDS = (
    r"(?:(?:"
    + _TENS
    + r")[\s-](?:one|two|three|four|five|six|seven|eight|nine)|"
    + "|".join(sorted((w for w in NUMBER_WORDS if w not in ("a", "an")), key=len, reverse=True))
    + r"|thirteen|fourteen|sixteen|seventeen|nineteen|fifty|seventy|eighty|hundred|"
    + _TENS
    + ")"
)
_VAGUE = r"(?:a\s+few|few|several|many|some)"
NUMBERS = dict(
    NUMBER_WORDS,
    thirteen=13,
    fourteen=14,
    sixteen=16,
    seventeen=17,
    nineteen=19,
    fifty=50,
    seventy=70,
    eighty=80,
    hundred=100,
    forty=40,
)
_TENS_VALUE = {
    "twenty": 20,
    "thirty": 30,
    "forty": 40,
    "fifty": 50,
    "sixty": 60,
    "seventy": 70,
    "eighty": 80,
    "ninety": 90,
}
_CLOCK_SUFFIX = r"(?:[ap]\.m\.?|[ap]m\b|[AP]\.M\.?|[AP]M\b)"

ALTERNATIVES = [
    # "annually in April", "each year in April": a month that recurs
    (
        "setmonth",
        rf"(?i:\b(?:annually|yearly|every\s+year|each\s+year)\s+(?:in|during)\s+)(?P<smo>{_FULL_MONTHS})",
    ),
    # "the 15th of each month"
    ("setmday", r"(?i:\b(?:the\s+)?(?P<smd>[0-3]?\d)(?:st|nd|rd|th)\s+(?:day\s+)?of\s+(?:each|every)\s+month\b)"),
    # "every Tuesday night", "each July", "every 90 days", "every other week", "each spring"
    (
        "setevery",
        rf"(?i:\b(?:every|each)\s+(?:other\s+)?(?:(?P<sen>{COUNT}|{_COUNT_WORDS})\s+)?)"
        rf"(?:(?P<sewd>{_WEEKDAY_RE})(?:\s+(?P<sepd>morning|afternoon|evening|night))?\b"
        rf"|(?P<semo>{_FULL_MONTHS})|(?i:(?P<seu>second|minute|hour|day|night|week|weekend|month|"
        rf"quarter|year|season|spring|summer|fall|autumn|winter)s?\b))",
    ),
    # "twice a month", "once a week", "three times a year"
    ("settimes", rf"(?i:\b(?:once|twice|(?:{COUNT}|{_COUNT_WORDS})\s+times)\s+(?:a|an|per)\s+(?P<stu>{_UNIT_WORD})\b)"),
    # "daily", "monthly" ...: only where no noun follows ("billed monthly", not "the monthly charge")
    (
        "setadverb",
        r"(?i:\b(?P<sadv>daily|weekly|biweekly|monthly|quarterly|annually|yearly|hourly|nightly)\b)"
        r"(?=\s*(?:$|[^\w\s]|(?:at|on|in|and|or|by|from|to|for|until|through|during|throughout|except|"
        r"between|with|via|if|when|unless|so|but|as|since|before|after)\b))",
    ),
    # "on Mondays", "Saturdays"
    ("setweekdays", rf"(?P<swds>(?:{_WEEKDAY_RE})s)\b"),
    # "now", "currently", "the future" (TIMEX3 PRESENT_REF, FUTURE_REF)
    (
        "present",
        r"(?i:\b(?P<pr>currently|presently|at\s+present|nowadays|now|these\s+days|at\s+the\s+moment|the\s+future)\b)",
    ),
    # "this morning", "last night", "tonight"
    (
        "partofday",
        r"(?i:\b(?:(?P<pdd>this|last|tomorrow|yesterday)\s+(?P<pdp>morning|afternoon|evening|night)|(?P<tonight>tonight))\b)",
    ),
    # clock times: "10:35 a.m.", "6 p.m", "noon", "midnight" (not "High Noon", a title)
    (
        "clock",
        rf"(?<![\w:.$])(?:(?P<ch>[01]?\d)(?::(?P<cm>[0-5]\d))?\s*(?P<cap>{_CLOCK_SUFFIX})|(?i:(?<!high\s)(?P<cn>noon|midnight|midday)\b))",
    ),
    # "recent weeks", "the next few months", "the coming years", "the past few days"
    (
        "vague",
        rf"(?i:\b(?:the\s+)?(?:(?:recent|past|last|next|coming|following)\s+)(?:{_VAGUE}\s+)?)"
        r"(?P<vu>(?i:day|week|month|year|decade)s)\b",
    ),
    # "a year earlier", "a year ago" is patterns' "ago"
    (
        "earlier",
        rf"(?i:\b(?:(?P<en>a|an|one|{COUNT})\s+)?(?P<eu>year|month|week|day)s?(?:\s+|-)(?P<ed>earlier|later|ago)\b)",
    ),
    # "three days", "a decade", "16-hour", "2,555 days", "several weeks", "twenty four hours"
    (
        "duration",
        rf"(?<![\w,.$-])(?P<dn>{_BIG_NUMBER}|{_COUNT_WORDS}|(?i:a|an|one)|(?i:{_VAGUE}))(?:\s+|-)"
        rf"(?P<du>(?i:{_UNIT_WORD}s?))\b(?!-old|\s+(?:ago|old)\b)",
    ),
    # "third-quarter", "the fourth quarter", "the first half" (no year: read against the reference date)
    (
        "yqhalf",
        r"(?i:\b(?:the\s+)?(?:(?:latest|last|current|year-ago|year-earlier|fiscal)\s+)?"
        r"(?P<yqo>first|second|third|fourth|1st|2nd|3rd|4th)[\s-]+(?:fiscal[\s-]+)?(?P<yqu>quarter|half)\b)"
        r"(?!\s+of\b|-?(?:s|ly)\b)",
    ),
    # "this weekend", "the weekend"
    ("weekend", r"(?i:\b(?P<wed>this|next|last|the|over\s+the)\s+weekend\b)"),
    # "the latest quarter", "the year-ago quarter"
    ("yqlatest", r"(?i:\bthe\s+(?P<yql>latest|most\s+recent|year-ago|year-earlier)\s+quarter\b)"),
    # "Friday", "on Tuesday": a weekday without a date
    ("weekday", rf"(?P<wkd>{_WEEKDAY_RE})(?!s\b)(?:'s)?\b(?:\s+(?P<wkp>morning|afternoon|evening|night)\b)?"),
    # "in December", "early March": a month without a year (the left cue is checked in parse)
    ("baremonth", rf"(?P<bm>{_FULL_MONTHS})"),
]
NAMES = frozenset(name for name, _ in ALTERNATIVES)
DIGIT_FIRST = frozenset({"setmday", "settimes", "clock", "duration", "earlier"})
WORD_FIRST = NAMES
# units that begin a kind before a hyphen ("year-earlier levels", "the year-ago period")
HYPHEN_STARTERS = frozenset(("year", "month", "week", "day"))
# words (in any case) where one of these kinds can begin (extract._starts); "third-quarter" begins
# with "third", a starter of `patterns`
STARTER_WORDS = frozenset(
    (
        *"every each annually yearly once twice daily weekly biweekly monthly quarterly hourly nightly "
        "currently presently at nowadays now these tonight tomorrow noon midnight midday recent few several "
        "many some over".split(),
        *(f"{day.lower()}s" for day in _WEEKDAY_FULL),
        *(day.lower() for day in _WEEKDAY_FULL),
        *_TENS.split("|"),
        *(w for w in NUMBERS if w.isalpha()),
    )
)

# a bare month counts only after one of these (so "The March for Clean Water" and "May I" do not)
_MONTH_LEFT = re.compile(
    r"(?i:\b(?:in|since|until|till|by|from|through|thru|during|of|early|mid|late|before|after|to|and|or|"
    r"between|around|throughout|starting|beginning|effective|last|this|next|end\s+of|beginning\s+of|"
    r"middle\s+of|start\s+of)[\s-]+)$"
)
_FORWARD_CUE = re.compile(
    r"(?i:\b(?:until|till|through|thru|by|starting|beginning|effective|before)[\s-]+(?:(?:early|mid|late)[\s-]+)?$)"
)
_BACKWARD_CUE = re.compile(r"(?i:\b(?:since|after|as\s+of)[\s-]+(?:(?:early|mid|late)[\s-]+)?$)")
_WEEKDAY_RANGE_AFTER = re.compile(rf"\s*(?:-|–|—|\bto\b|\bthrough\b|\bthru\b|\band\b|\bor\b|,)\s*(?:{_WEEKDAY_RE})\b")
_WEEKDAY_RANGE_BEFORE = re.compile(
    rf"\b(?:{_WEEKDAY_RE})s?\s*(?:-|–|—|\bto\b|\bthrough\b|\bthru\b|\band\b|\bor\b|,)\s*$"
)
# A number starts where a run of digits starts (the lookbehind), so a long run is read once, not
# once from each of its digits; a sum of money is "$" and digits ("$500", "$5m").
_PER_UNIT_LEFT = re.compile(
    r"(?i:(?:(?<![\d,.])\d[\d,.]*|\$[\d,.]+[A-Za-z]*|\b(?:one|two|three|four|five|six|seven|eight|nine|ten))"
    r"\s+(?:[A-Za-z]+\s+)?$)"
)
_SENTENCE_START = re.compile(r"(?:^|[.!?:;\n])\s*[\"'“(]?$")


def _number(word: str) -> int | None:
    word = word.lower().replace(",", "")
    if re.fullmatch(r"\d+", word):
        return int(word)
    if re.fullmatch(r"\d+\.\d+", word):
        return None
    parts = re.split(r"[\s-]+", word)
    if len(parts) == 2 and parts[0] in _TENS_VALUE and parts[1] in NUMBERS:
        return _TENS_VALUE[parts[0]] + NUMBERS[parts[1]]
    return NUMBERS.get(word)


def duration_value(count: int | None, unit: str) -> str:
    """The TIMEX3 value of `count` units ("P3D", "PT16H", "PXW" when the count is vague)."""
    time_part, designator, _ = UNITS[unit]
    amount = "X" if count is None else str(count)
    if unit == "decade" and count is not None:
        return f"P{count * 10}Y"
    if unit == "century" and count is not None:
        return f"P{count * 100}Y"
    return f"P{time_part}{amount}{designator}"


def _unit(word: str) -> str:
    word = word.lower()
    if word.startswith("centur"):
        return "century"
    return word[:-1] if word.endswith("s") else word


def shift(day: date, count: int, unit: str, sign: int = 1) -> date:
    """`day` moved by `count` units: days and weeks by timedelta, months and years by the calendar
    (day of month kept, capped at the month's end)."""
    if unit in ("second", "minute", "hour"):
        return day
    if unit in ("day", "week"):
        return day + sign * timedelta(days=count * (7 if unit == "week" else 1))
    months = {"month": 1, "quarter": 3, "year": 12, "decade": 120, "century": 1200}[unit]
    return add_months(day, sign * count * months)


def _placeholder(s: int, e: int, kind: str, value: str) -> Atom:
    return Atom(s, e, "day", timex_type=kind, value=value, placed=False)


def _year_for(first_month: int, last_month: int, ref: date, way: int) -> int:
    """The year of a yearless span of months: the reference year unless the span lies on the wrong
    side of the reference date for `way` (+1 ahead, -1 back, 0 either)."""
    year = ref.year
    if way < 0 and first_month > ref.month:
        year -= 1
    elif way > 0 and last_month < ref.month:
        year += 1
    return year


def direction(left: str, tense: tuple[bool, bool]) -> int:
    """+1 when the text before an expression or its sentence's tense points ahead of the reference
    date, -1 when back, 0 when neither does."""
    if _FORWARD_CUE.search(left[-40:]):
        return 1
    if _BACKWARD_CUE.search(left[-40:]):
        return -1
    future, past = tense
    if future:  # "will be published in December": the future auxiliary outweighs the participle
        return 1
    return -1 if past else 0


def _getter(m: re.Match) -> Callable[[str], Any]:
    """A named group of `m` (KeyError for a name its pattern lacks); `groupdict` would build a dict
    of every group of the alternation for each candidate, the dearest step of the scan."""
    index = m.re.groupindex
    return lambda name: m.group(index[name])


def parse_kind(m: re.Match, ctx: dict) -> Atom | None:
    """Turn a match of one of ALTERNATIVES into an atom, or None when it is not one after all."""
    kind = m.lastgroup or ""
    g = _getter(m)
    s, e = m.start(kind), m.end(kind)
    text, ref = ctx["text"], ctx["reference"]
    if ref is None:  # every kind here is read against the reference date
        return None
    left = text[max(0, s - 60) : s]
    if kind == "setmonth":
        return _placeholder(s, e, "SET", f"XXXX-{MONTH_NUMBERS[g('smo').rstrip('.').lower()]:02d}")
    if kind == "setmday":
        day = int(g("smd"))
        return _placeholder(s, e, "SET", f"XXXX-XX-{day:02d}") if 1 <= day <= 31 else None
    if kind == "setevery":
        if g("sewd"):
            number = _WEEKDAY_FULL.index(g("sewd").capitalize()) + 1
            part = PART_OF_DAY.get((g("sepd") or "").lower(), "")
            return _placeholder(s, e, "SET", f"XXXX-WXX-{number}" + (f"T{part}" if part else ""))
        if g("semo"):
            return _placeholder(s, e, "SET", f"XXXX-{MONTH_NUMBERS[g('semo').rstrip('.').lower()]:02d}")
        unit = g("seu").lower()
        if unit in SEASONS or unit == "season":
            return _placeholder(s, e, "SET", f"XXXX-{SEASONS.get(unit, 'XX')}")
        count = _number(g("sen")) if g("sen") else 1
        if count is None:
            return None
        if unit == "night":
            return _placeholder(s, e, "SET", "XXXX-XX-XXTNI")
        if unit == "weekend":
            return _placeholder(s, e, "SET", "XXXX-WXX-WE")
        return _placeholder(s, e, "SET", duration_value(count, unit))
    if kind == "settimes":
        return _placeholder(s, e, "SET", duration_value(1, _unit(g("stu"))))
    if kind == "setadverb":
        word = g("sadv").lower()
        value = {
            "daily": "P1D",
            "nightly": "XXXX-XX-XXTNI",
            "weekly": "P1W",
            "biweekly": "P2W",
            "monthly": "P1M",
            "quarterly": "P1Q",
            "annually": "P1Y",
            "yearly": "P1Y",
            "hourly": "PT1H",
        }[word]
        return _placeholder(s, e, "SET", value)
    if kind == "setweekdays":
        number = _WEEKDAY_FULL.index(g("swds")[:-1].capitalize()) + 1
        return _placeholder(s, e, "SET", f"XXXX-WXX-{number}")
    if kind == "present":
        word = " ".join(g("pr").lower().split())
        if word == "now":
            if _SENTENCE_START.search(left):
                return None  # "Now, open the menu", "Now the alliance ...": a discourse word
            if re.search(r"(?i:\bfrom\s+$)", left):  # "from now on"
                return None
        value = "FUTURE_REF" if word == "the future" else "PRESENT_REF"
        if value == "PRESENT_REF":
            return Atom(s, e, "day", ref, ref, relative=True, timex_type="DATE", value=value, present=True)
        return _placeholder(s, e, "DATE", value)
    if kind == "partofday":
        if g("tonight"):
            day, part = ref, "NI"
        else:
            day = ref + timedelta(days={"this": 0, "last": -1, "tomorrow": 1, "yesterday": -1}[g("pdd").lower()])
            part = PART_OF_DAY[g("pdp").lower()]
        return Atom(s, e, "day", day, day, relative=True, timex_type="TIME", value=f"{day}T{part}")
    if kind == "clock":
        if g("cn"):
            word = g("cn").lower()
            hour, minute = (24, 0) if word == "midnight" else (12, 0)
        else:
            hour, minute = int(g("ch")), int(g("cm") or 0)
            if not 1 <= hour <= 12:
                return None
            pm = g("cap").lower().startswith("p")
            hour = (hour % 12) + (12 if pm else 0)
        atom = _placeholder(s, e, "TIME", f"{ref}T{hour:02d}:{minute:02d}")
        atom.clock = f"T{hour:02d}:{minute:02d}"
        return atom
    if kind == "vague":
        return _placeholder(s, e, "DURATION", duration_value(None, _unit(g("vu"))))
    if kind == "duration":
        unit = _unit(g("du"))
        word = g("dn").lower()
        vague = re.fullmatch(_VAGUE, word) is not None
        count = None if vague else _number(word) if word not in ("a", "an", "one") else 1
        if count is None and not vague:
            return None
        if word in ("a", "an") and (_PER_UNIT_LEFT.search(left) or unit == "second"):
            return None  # "300 calls a day", "$500 million a year" (rates), "a second time"
        if not g("du").islower():
            return None  # "60 Minutes": a title
        if (word == "one" and unit == "day") or (unit == "quarter" and "-" in m.group(kind)):
            return None  # "one day he ..." (some day), "three-quarters" (a fraction)
        if vague and not g("du").lower().endswith("s"):
            return None
        atom = _placeholder(s, e, "DURATION", duration_value(count, unit))
        atom.length = (count, unit) if count is not None else None
        return atom
    if kind == "weekend":
        which = " ".join(g("wed").lower().split())
        if which in ("the", "over the"):
            which = "last" if ctx["tense"](s) == (False, True) else "this"
        saturday = ref + timedelta(days=(5 - ref.weekday()) % 7)
        if ref.weekday() == 6:  # on a Sunday, this weekend is the one under way
            saturday = ref - timedelta(days=1)
        saturday += timedelta(days={"this": 0, "next": 7, "last": -7}[which])
        if which == "over the":
            s += 5
        return Atom(s, e, "day", saturday, saturday + timedelta(days=1), relative=True, future=saturday > ref)
    if kind in ("yqhalf", "yqlatest"):
        return _yearless_quarter(m, s, e, ref, ctx, left)
    if kind == "earlier":
        written = (g("en") or "a").lower()
        count = _number(written) if written not in ("a", "an", "one") else 1
        if count is None or (g("en") is None and "-" not in m.group(kind)):
            return None  # "year-earlier" needs its hyphen; "years before" alone is no date
        unit = g("eu").lower()
        sign = 1 if g("ed").lower() == "later" else -1
        point = shift(ref, count, unit, sign)
        if unit == "year":
            atom = Atom(s, e, "year", date(point.year, 1, 1), date(point.year, 12, 31), relative=True, past=sign < 0)
            atom.years_back = -sign * count
            return atom
        if unit == "month":
            return Atom(
                s, e, "month", date(point.year, point.month, 1), month_end(point.year, point.month), relative=True
            )
        return Atom(s, e, "day", point, point, relative=True, past=sign < 0)
    if kind == "weekday":
        if _WEEKDAY_RANGE_AFTER.match(text, m.end("wkd")) or _WEEKDAY_RANGE_BEFORE.search(left):
            return None  # "Monday–Friday", "Monday to Friday": opening hours, not a date
        weekday = _WEEKDAY_FULL.index(g("wkd"))
        way = direction(left, ctx["tense"](s))
        back = (ref.weekday() - weekday) % 7
        ahead = (weekday - ref.weekday()) % 7
        if way < 0:
            point = ref - timedelta(days=back)
        elif way > 0:
            point = ref + timedelta(days=ahead)
        else:
            point = ref - timedelta(days=back) if back <= ahead else ref + timedelta(days=ahead)
        if g("wkp"):
            return Atom(
                s,
                e,
                "day",
                point,
                point,
                relative=True,
                timex_type="TIME",
                value=f"{point}T{PART_OF_DAY[g('wkp').lower()]}",
            )
        return Atom(s, e, "day", point, point, relative=True, past=point < ref, future=point > ref)
    if kind == "baremonth":
        word = g("bm")
        if not _MONTH_LEFT.search(left):
            return None
        month = MONTH_NUMBERS[word.rstrip(".").lower()]
        way = direction(left, ctx["tense"](s))
        if way == 0 and not re.search(r"(?i:\b(?:last|this|next)\s+$)", left):
            return _placeholder(s, e, "DATE", f"XXXX-{month:02d}")  # "peaks in June": every June
        year = _year_for(month, month, ref, way)
        first, last = date(year, month, 1), month_end(year, month)
        return Atom(s, e, "month", first, last, relative=True, past=last < ref, future=first > ref)
    return None


def _yearless_quarter(m, s, e, ref, ctx, left) -> Atom | None:
    g = _getter(m)
    latest = g("yql")
    qualifier = m.group(m.lastgroup).lower()
    if latest or "year-ago" in qualifier or "year-earlier" in qualifier:
        # the last quarter completed by the reference date; a year-ago one is a year before it
        index = (ref.year * 12 + ref.month - 1) // 3 - 1
        if "year" in qualifier:
            index -= 4
        year, quarter = divmod(index, 4)
        first, last = month_span(year, quarter * 3 + 1, 3)
        return Atom(s, e, "quarter", first, last, relative=True, past=True)
    number = ORDINALS[g("yqo").lower()]
    size = 3 if g("yqu").lower() == "quarter" else 6
    if size == 6 and number > 2:
        return None
    first_month = (number - 1) * size + 1
    way = direction(left, ctx["tense"](s))
    year = ref.year
    if way > 0 and first_month + size - 1 < ref.month - 3:
        year += 1
    elif way <= 0 and first_month > ref.month:
        year -= 1  # no tense: the latest such quarter begun by the reference date
    first, last = month_span(year, first_month, size)
    return Atom(
        s, e, "quarter" if size == 3 else "half", first, last, relative=True, past=last < ref, future=first > ref
    )
