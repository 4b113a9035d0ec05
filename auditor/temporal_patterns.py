"""Candidate patterns for temporal expressions (DESIGN.md §3.2), compiled once.

One alternation finds every candidate span; the alternatives come longest-first because Python's
`re` takes the first alternative that matches at a position, not the longest. Month names are
case-sensitive on purpose: "may" and "march" in lower case are a verb, not a month, and a capital
"May" counts only when a day or a year follows it ("May I ..." never matches). Bare years are
found here but kept only next to a cue (see `year_in_context`).
"""

from __future__ import annotations

import re

MONTH_NUMBERS = {}
for _i, _name in enumerate(("January February March April May June July August September October "
                            "November December").split(), start=1):
    MONTH_NUMBERS[_name.lower()] = _i
    MONTH_NUMBERS[_name[:3].lower()] = _i
MONTH_NUMBERS["sept"] = 9


def _month_alternatives() -> str:
    names = []
    for name in sorted(MONTH_NUMBERS, key=len, reverse=True):
        names += [name.capitalize(), name.upper()]
    # an abbreviation may carry a dot ("Mar."); a full name never does, but "May." ends sentences
    return r"(?:%s)\b\.?" % "|".join(names)


MONTH = _month_alternatives()
_WEEKDAYS = ("Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday|"
             "Mon|Tues|Tue|Wed|Thurs|Thur|Thu|Fri|Sat|Sun")
WEEKDAY = rf"(?:{_WEEKDAYS}|{_WEEKDAYS.upper()})\b\.?"
DAY = r"(?:[0-3]?\d)(?:st|nd|rd|th)?(?![\d:])"  # "9:30" is a time, not a day
YEAR_CORE = r"(?:1[89]\d{2}|2[01]\d{2})"
YEAR = YEAR_CORE + r"(?!\d)"
DASH = r"\s*(?:-|–|—)\s*"
TO = r"\s*(?:-|–|—|\bto\b|\bthrough\b|\bthru\b|\buntil\b|\btill\b)\s*"
NUMBER_WORDS = {"a": 1, "an": 1, "one": 1, "two": 2, "three": 3, "four": 4, "five": 5, "six": 6,
                "seven": 7, "eight": 8, "nine": 9, "ten": 10, "eleven": 11, "twelve": 12,
                "fifteen": 15, "eighteen": 18, "twenty": 20, "thirty": 30, "forty-five": 45,
                "sixty": 60, "ninety": 90}
COUNT = r"(?:\d{1,3}|" + "|".join(sorted(NUMBER_WORDS, key=len, reverse=True)) + r")"
ORDINALS = {"first": 1, "1st": 1, "second": 2, "2nd": 2, "third": 3, "3rd": 3, "fourth": 4,
            "4th": 4, "last": 4, "final": 4}
SEASONS = {"spring": "SP", "summer": "SU", "fall": "FA", "autumn": "FA", "winter": "WI"}
FY = r"(?:FY|F\.Y\.|[Ff]iscal(?:\s+[Yy]ear)?)\s*'?(?:\d{4}|\d{2})(?!\d)"
_UNIT = r"(?:day|week|month|quarter|year|fortnight)s?"
_REL_UNIT = (r"(?:week|month|quarter|year|fiscal\s+year|spring|summer|fall|autumn|winter|"
             r"monday|tuesday|wednesday|thursday|friday|saturday|sunday)")

_ALTERNATIVES = [
    # ISO 8601 week date (2009-W01-1, 2009W011) and week (2024-W05)
    ("isoweek", rf"(?<![\d-])(?P<wy>\d{{4}})-?W(?P<ww>\d{{2}})(?:-?(?P<wd>[1-7]))?(?!\d)"),
    # ISO 8601 calendar date, optionally with a time; the separator must repeat
    ("isodate", rf"(?<![\d./-])(?P<iy>{YEAR_CORE})(?P<isep>[-/])(?P<im>\d{{2}})(?P=isep)(?P<id>\d{{2}})"
                r"(?:T\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?(?![\d])"),
    # ISO 8601 ordinal date (2024-060)
    ("isoordinal", rf"(?<![\d./-])(?P<oy>{YEAR_CORE})-(?P<od>\d{{3}})(?![\d]|[./-]\d)"),
    # "Q3 2024", "Q1 FY2025", "Q2 of 2024"; "2024-Q3", "2024 Q3"
    ("quarter", rf"\bQ(?P<qn>[1-4])\s*(?:of\s+)?(?:(?P<qfy>{FY})|(?P<qy>{YEAR}))"
                rf"|(?<!\d)(?P<qy2>{YEAR_CORE})[-\s]Q(?P<qn2>[1-4])\b"
                rf"|(?i:(?:the\s+)?(?P<qo>first|second|third|fourth|1st|2nd|3rd|4th|last|final)\s+"
                rf"(?:fiscal\s+)?quarter\s+(?:of\s+)?(?:the\s+)?)(?:(?P<qfy3>{FY})|(?P<qy3>{YEAR}))"),
    ("half", rf"\bH(?P<hn>[12])\s*(?:of\s+)?(?:(?P<hfy>{FY})|(?P<hy>{YEAR}))"
             rf"|(?<!\d)(?P<hy2>{YEAR_CORE})-H(?P<hn2>[12])\b"
             rf"|(?i:(?:the\s+)?(?P<ho>first|second|1st|2nd)\s+half\s+(?:of\s+)?(?:the\s+)?)"
             rf"(?:(?P<hfy3>{FY})|(?P<hy3>{YEAR}))"),
    # "FY2024", "FY 2024-25", "fiscal year 2024", "fiscal 2025"
    ("fiscalrange", rf"(?<!\d)(?P<fa>{YEAR_CORE})\s*(?:-|–|/)\s*(?P<fb>\d{{4}}|\d{{2}})(?!\d)(?=\s+(?i:fiscal\s+year)\b)"),
    ("fiscal", rf"(?:\bFY|\bF\.Y\.|\b[Ff]iscal(?:\s+[Yy]ear)?)\s*'?(?P<fy>\d{{4}}|\d{{2}})(?!\d)"
               rf"(?:\s*(?:-|–|/)\s*(?P<fy2>\d{{4}}|\d{{2}})(?!\d))?"),
    ("season", rf"(?i:\b(?P<sn>spring|summer|fall|autumn|winter)(?:\s+of)?\s+)(?P<sy>{YEAR_CORE})(?!\d)"
               rf"(?:\s*(?:-|–|/)\s*(?P<sy2>\d{{4}}|\d{{2}})(?!\d))?"),
    ("decade", r"(?i:\b(?:the\s+))?(?P<dc>(?:1[89]|20)\d0)'?s\b|(?<![\w'])'(?P<dc2>\d0)s\b"),
    # "March 1–15, 2025" (a day range inside one month)
    ("mdrange", rf"(?:{WEEKDAY},?\s+)?(?P<rm>{MONTH})\s+(?P<rd1>{DAY}){DASH}(?P<rd2>{DAY}),?\s+(?P<ry>{YEAR})"),
    ("dmrange", rf"(?<!\d)(?P<rd3>{DAY}){DASH}(?P<rd4>{DAY})\s+(?P<rm2>{MONTH}),?\s+(?P<ry2>{YEAR})"),
    # "March–May 2025"
    ("mmrange", rf"(?P<mm1>{MONTH}){TO}(?P<mm2>{MONTH}),?\s+(?:of\s+)?(?P<mmy>{YEAR})"),
    # "Tuesday, March 5th, 2024", "Mar. 5 2024", "March 5" (year from context)
    ("mdy", rf"(?:{WEEKDAY},?\s+)?(?P<m1>{MONTH})\s+(?:the\s+)?(?P<d1>{DAY})(?:,?\s+(?P<y1>{YEAR}))?"),
    # "5 March 2024", "the 5th of March, 2024", "Tue 5 Mar 2024"
    ("dmy", rf"(?:{WEEKDAY},?\s+)?(?<!\d)(?i:the\s+)?(?P<d2>{DAY})\s+(?:of\s+)?(?P<m2>{MONTH})(?:,?\s+(?P<y2>{YEAR}))?"),
    ("monthyear", rf"(?P<m3>{MONTH}),?\s+(?:of\s+)?(?P<y3>{YEAR})"),
    # numeric dates: 03/04/2025, 3.4.2025, 03-04-2025, 3/4/25 (two-digit years only with "/")
    ("numeric", r"(?<![\d./:-])(?P<n1>\d{1,2})(?P<nsep>[/.-])(?P<n2>\d{1,2})(?P=nsep)"
                r"(?P<n3>\d{4}|(?<=/)\d{2})(?![\d]|[./-]\d)"),
    # "2024–2025", "2024-25", "2024/25"
    ("yearrange", rf"(?<![\d.,:/$€£#-])(?P<yr1>{YEAR_CORE})\s*(?:-|–|—|/)\s*(?P<yr2>\d{{4}}|\d{{2}})(?![\d%]|[.,]\d)"),
    # "two weeks ago", "3 days ago", "a month ago"
    ("ago", rf"(?i:\b(?P<agn>{COUNT})\s+(?P<agu>{_UNIT})\s+ago\b)"),
    # "in two weeks", "in 30 days" (not "within": a duration, not a date)
    ("inrel", rf"(?i:\bin\s+(?P<inn>{COUNT})\s+(?P<inu>{_UNIT})(?!\s+(?:ago|of|to|in|per|or|and)\b)\b)"),
    # "the past 12 months", "the next two weeks"
    ("rolling", rf"(?i:\b(?:the\s+)?(?P<rod>past|last|previous|next|coming|following)\s+(?P<ron>{COUNT})\s+"
                rf"(?P<rou>(?:day|week|month|year)s)\b)"),
    # "last month", "next quarter", "this fiscal year", "next Monday"
    ("relative", rf"(?i:\b(?P<rdir>last|this|next|past|coming|previous|current|following)\s+(?P<runit>{_REL_UNIT})\b)"),
    ("deictic", r"(?i:\b(?P<dx>yesterday|today|tomorrow)\b)"),
    # a bare year: kept only next to a cue (year_in_context)
    ("year", rf"(?<![\w.,:/$€£#+])(?<!\d-)(?P<by>{YEAR_CORE})(?![\w%]|[.,:/-]\d|\s*(?:%|percent\b))"),
]

CANDIDATES = re.compile("|".join(f"(?P<{name}>{body})" for name, body in _ALTERNATIVES))

# "early 2023", "mid-2022", "the end of this year", "late March 2024"
MODIFIER_BEFORE = re.compile(
    r"(?i:\b(?P<mod>early|mid|middle|late|earlier|later|"
    r"(?:the\s+)?(?:beginning|start|middle|end|close)\s+of(?:\s+the)?)[-\s]+)$")
MODIFIERS = {"early": "early", "earlier": "early", "beginning": "start", "start": "start",
             "mid": "mid", "middle": "mid", "late": "late", "later": "late", "end": "end", "close": "end"}
# text allowed between two expressions that form one range
RANGE_JOIN = re.compile(r"(?i:\s*(?:-|–|—|to|through|thru|until|till|and|to\s+and\s+including)\s*)")
RANGE_OPEN = re.compile(r"(?i:\b(?:from|between)\s+(?:the\s+)?)$")

# Bare years: accepted after a preposition or time word, or before a noun that a year qualifies.
_YEAR_LEFT = re.compile(
    r"(?i:\b(?:in|since|for|during|from|between|until|till|through|thru|by|before|after|of|year|years|"
    r"calendar\s+year|school\s+year|tax\s+year|as\s+of|as\s+at|effective|updated|reviewed|revised|"
    r"copyright|circa|c\.|est\.|established|founded|built|report|edition|budget|rates|schedule|"
    r"season|campaign|programme|program|around|throughout|starting|beginning|ending|ends|end|expires?|"
    r"until\s+the\s+end\s+of|early|mid|late|spring|summer|fall|autumn|winter)\s*(?:-\s*)?"
    r"|[©]\s*|\(c\)\s*|\([A-Z][A-Za-z.&' -]{1,60},\s*)$")  # the last: a citation "(Rivera, 2019)"
_YEAR_DETERMINER = re.compile(r"(?i:\b(?:the|our|this|each|your|its|a|an|their)\s+)$")
_YEAR_RIGHT = re.compile(
    r"(?i:\s*(?:-|–)?\s*(?:rates?|rate\s+schedule|tariffs?|fees?|charges?|prices?|pricing|budget|"
    r"reports?|annual|water\s+quality|consumer\s+confidence|season|schedule|programs?|programmes?|"
    r"plans?|figures|results|data|levels|survey|edition|update|review|audit|calendar|"
    r"billing|assessment|statement|summary|holiday|holidays)\b)")
# standard numbers, prices, counters, identifiers: never a year
_YEAR_BLOCK_LEFT = re.compile(
    r"(?:\b(?:ISO|IEC|EN|RFC|ANSI|NSF|ASTM|BS|DIN|IEEE|AWWA|UL|No\.?|Nr\.?|page|pages|p\.|pp\.|"
    r"[Vv]ersion|[Vv]er\.?|v|[Rr]oom|[Ss]uite|[Uu]nit|[Aa]pt\.?|[Bb]ox|[Ee]xt\.?|[Ee]xtension|[Cc]ode|"
    r"[Mm]odel|[Ee]rror|[Tt]icket|[Aa]ccount|[Oo]rder|[Ii]nvoice|[Rr]ef\.?|[Rr]eference|[Ll]ine|"
    r"[Ii]tem|[Rr]oute|[Hh]ighway|[Bb]uilding|[Ff]orm|[Ss]ection|[Pp]art|[Ss]erver|[Oo]ffice|[Ww]indows)"
    r"\s*[/:#-]?\s*|[$€£#]\s*)$")
_YEAR_BLOCK_RIGHT = re.compile(
    r"(?i:\s*(?:gallons?|gal|litres?|liters?|kwh|kw|customers?|homes?|households?|accounts?|meters?|"
    r"metres?|feet|ft|km|kilometres?|kilometers?|miles?|units?|people|residents|connections|samples?|"
    r"tests|calls|tickets|pages?|words|items|mb|gb|hours?|hrs|minutes?|mins|mg|ppm|ppb|m3|cubic|"
    r"dollars|usd|cents|users|devices|laptops|emails|requests|properties|sq|square)\b)")
_YEAR_AFTER_YEAR = re.compile(r"(?i:\s*(?:,|and|or|to|through|-|–)\s*)$")


# an identifier before digits that look like a date: "Version 2.10.2024", "build 2024-10-02"
IDENTIFIER_BEFORE = re.compile(r"(?i:\b(?:version|ver\.?|v|build|release|firmware|model|part|serial|"
                               r"ticket|order|invoice|account|ref\.?|no\.?)\s*[:#]?\s*)$")


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
    if previous_end is not None and start - previous_end < 12:
        gap = text[previous_end:start]
        if _YEAR_AFTER_YEAR.fullmatch(gap) or _YEAR_AFTER_YEAR.search(gap):
            return True
    if _YEAR_DETERMINER.search(text, left_from, start):
        following = re.match(r"\s+([A-Za-z]+)", text[end:end + 30])
        return bool(following)
    return False
