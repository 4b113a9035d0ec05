"""Temporal expressions -> normalized intervals with roles (DESIGN.md §3.2).

Candidates come from our own compiled patterns (`temporal_patterns`), never from scanning a passage
with dateparser: that is slow and reads "We", "May I" or "sun" as dates. Absolute forms are
normalized from the pattern's groups by the code below (the standard library's calendar is the
authority there); the relative spans that need calendar arithmetic ("two weeks ago", "in 3 months",
"yesterday") go to dateparser, one short span at a time, cached, anchored to the reference date.

Every expression is an interval [start, end] with a granularity; conventions:
* quarters and halves are calendar ones unless written with a fiscal year (Q1 FY2025);
* a fiscal year is named by the calendar year in which it ends when it does not start in January
  (common practice, e.g. the US federal FY2024 = 2023-10-01..2024-09-30); "FY 2024-25" starts in 2024;
* seasons are meteorological (spring = Mar–May in the north, Sep–Nov in the south) and a season
  named by a year begins in that year ("winter 2024" = 2024-12-01..2025-02-28 in the north);
* early/mid/late narrow an interval to its first, middle and last third (a year: Jan–Apr, May–Aug,
  Sep–Dec; a month: days 1–10, 11–20, 21–end) and keep its granularity, as TIMEX3's `mod` attribute
  keeps the value's; "start/beginning of" a year is January and "end of" a year is December;
* a date without a year takes the reference date's year (or its range partner's); relative and
  yearless expressions are dropped when no reference date is given, since they cannot be anchored.
"""

from __future__ import annotations

import bisect
import calendar
import functools
import re
from dataclasses import dataclass
from datetime import date, datetime, timedelta

from .models import TemporalExpression
from .temporal_patterns import (CANDIDATES, MODIFIER_BEFORE, MODIFIERS, MONTH_NUMBERS, NUMBER_WORDS,
                                ORDINALS, IDENTIFIER_BEFORE, RANGE_JOIN, RANGE_OPEN, SEASONS, year_in_context)
from .temporal_roles import role_for

__all__ = ["extract", "timex3"]

# --- sentences -------------------------------------------------------------------------------------

_ABBREVIATIONS = {"jan", "feb", "mar", "apr", "jun", "jul", "aug", "sep", "sept", "oct", "nov", "dec",
                  "mon", "tue", "tues", "wed", "thu", "thur", "thurs", "fri", "sat", "sun", "e.g", "i.e",
                  "etc", "no", "st", "dr", "mr", "mrs", "ms", "approx", "vs", "inc", "ltd", "co", "a.m",
                  "p.m", "u.s", "fig", "ext", "dept", "est", "f.y", "c", "ca", "al", "pp", "p"}
_BOUNDARY = re.compile(r"[.!?]+[\"'”’)\]]*\s+(?=[\"'“‘(\[]?[A-Z0-9•*-])|\n[ \t]*\n\s*|\n(?=[ \t]*(?:[-*•]|\d+[.)])\s)")
_WORD_BEFORE = re.compile(r"([A-Za-z][A-Za-z.]*)\.$")


def _sentences(text: str) -> list[tuple[int, int]]:
    """(start, end) offsets of the sentences of `text`; a full stop after an abbreviation or an
    initial ("Mar. 5", "J. Rivera") does not end a sentence."""
    spans, start = [], 0
    for m in _BOUNDARY.finditer(text):
        mark = m.start()
        if text[mark] == ".":
            word = _WORD_BEFORE.search(text, max(0, mark - 12), mark + 1)
            if word and (word.group(1).lower() in _ABBREVIATIONS or len(word.group(1)) == 1):
                continue
        spans.append((start, m.end()))
        start = m.end()
    if start < len(text):
        spans.append((start, len(text)))
    return spans


# --- calendar helpers ------------------------------------------------------------------------------

def _month_end(year: int, month: int) -> date:
    return date(year, month, calendar.monthrange(year, month)[1])


def _add_months(day: date, months: int) -> date:
    index = day.year * 12 + day.month - 1 + months
    year, month = divmod(index, 12)
    return date(year, month + 1, min(day.day, calendar.monthrange(year, month + 1)[1]))


def _months(year: int, first: int, count: int) -> tuple[date, date]:
    """`count` months from month `first` of `year` (which may run past December)."""
    start = date(year, 1, 1)
    start = _add_months(start, first - 1)
    return start, _add_months(start, count) - timedelta(days=1)


def _iso_week(year: int, week: int) -> date:
    """Monday of ISO 8601 week `week` of `year` (week 1 holds the year's first Thursday)."""
    return date.fromisocalendar(year, week, 1)


def _full_year(text: str) -> int:
    digits = re.sub(r"\D", "", text)
    value = int(digits)
    return value + 2000 if len(digits) == 2 else value


def _fiscal_year(label: int, fys: int, explicit_start: int | None = None) -> tuple[date, date]:
    if explicit_start is not None:
        begin = explicit_start
    else:
        begin = label if fys == 1 else label - 1
    return _months(begin, fys, 12)


def _season(name: str, year: int, hemisphere: str) -> tuple[date, date]:
    code = SEASONS[name.lower()]
    first = {"SP": 3, "SU": 6, "FA": 9, "WI": 12}[code]
    if hemisphere == "south":
        first = (first + 6 - 1) % 12 + 1
    return _months(year, first, 3)


def _narrow(start: date, end: date, granularity: str, modifier: str) -> tuple[date, date]:
    """early/mid/late (thirds) and start/end of an interval, see the module docstring."""
    if granularity in ("year", "decade", "half", "quarter", "season") or (end - start).days > 62:
        months = (end.year - start.year) * 12 + end.month - start.month + 1
        if modifier in ("start", "end") and granularity == "year":
            return _months(start.year, start.month + (0 if modifier == "start" else months - 1), 1)
        third = max(1, months // 3)
        offset = {"start": 0, "early": 0, "mid": third, "late": months - third, "end": months - third}[modifier]
        return _months(start.year, start.month + offset, third)
    length = (end - start).days + 1
    third = max(1, length // 3)
    if modifier in ("start", "early"):
        return start, start + timedelta(days=third - 1)
    if modifier == "mid":
        return start + timedelta(days=third), start + timedelta(days=2 * third - 1)
    return start + timedelta(days=2 * third), end


# --- relative expressions (dateparser on the span only) --------------------------------------------

_SETTINGS = {"PREFER_DAY_OF_MONTH": "first", "PREFER_DATES_FROM": "current_period",
             "RETURN_AS_TIMEZONE_AWARE": False, "DATE_ORDER": "MDY", "STRICT_PARSING": False}


@functools.lru_cache(maxsize=4096)
def _dateparser_span(span: str, reference: date) -> date | None:
    """Parse one short relative span such as "2 weeks ago" with dateparser, deterministically."""
    import dateparser  # imported late: it takes a second and many commands never need it

    settings = dict(_SETTINGS, RELATIVE_BASE=datetime(reference.year, reference.month, reference.day))
    parsed = dateparser.parse(span, languages=["en"], settings=settings)
    return parsed.date() if parsed else None


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
        return date(point.year, point.month, 1), _month_end(point.year, point.month), "month"
    if unit == "quarter":
        first = (point.month - 1) // 3 * 3 + 1
        return (*_months(point.year, first, 3), "quarter")
    return date(point.year, 1, 1), date(point.year, 12, 31), "year"


# --- atoms: one candidate span, parsed ---------------------------------------------------------------

@dataclass
class _Atom:
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


def _month(text: str) -> int:
    return MONTH_NUMBERS[text.rstrip(".").lower()]


def _day_atom(m, a, month: int, day: int, year: str | None) -> _Atom | None:
    if year is None:
        if not 1 <= day <= 31 or day > calendar.monthrange(2024, month)[1]:
            return None
        return _Atom(m.start(a), m.end(a), "day", month=month, day=day)
    point = date(int(year), month, day)
    return _Atom(m.start(a), m.end(a), "day", point, point)


def _parse(m, ctx) -> _Atom | None:
    """Turn the candidate match `m` into an atom, or None when it is not a date after all."""
    kind = m.lastgroup
    g = m.group
    s, e = m.start(kind), m.end(kind)
    if kind in ("isodate", "numeric", "isoordinal") and IDENTIFIER_BEFORE.search(ctx["text"], max(0, s - 20), s):
        return None
    ref, fys = ctx["reference"], ctx["fys"]
    if kind == "isoweek":
        monday = _iso_week(int(g("wy")), int(g("ww")))
        if g("wd"):
            point = monday + timedelta(days=int(g("wd")) - 1)
            return _Atom(s, e, "day", point, point)
        return _Atom(s, e, "week", monday, monday + timedelta(days=6))
    if kind == "isodate":
        point = date(int(g("iy")), int(g("im")), int(g("id")))
        return _Atom(s, e, "day", point, point)
    if kind == "isoordinal":
        point = date(int(g("oy")), 1, 1) + timedelta(days=int(g("od")) - 1)
        if point.year != int(g("oy")) or int(g("od")) == 0:
            return None
        return _Atom(s, e, "day", point, point)
    if kind in ("quarter", "half"):
        size = 3 if kind == "quarter" else 6
        number = g("qn") or g("qn2") or g("hn") or g("hn2")
        number = int(number) if number else ORDINALS[(g("qo") or g("ho")).lower()]
        fiscal = g("qfy") or g("qfy3") or g("hfy") or g("hfy3")
        if fiscal:
            begin, _ = _fiscal_year(_full_year(fiscal), fys)
            first, last = _months(begin.year, begin.month + (number - 1) * size, size)
        else:
            year = int(g("qy") or g("qy2") or g("qy3") or g("hy") or g("hy2") or g("hy3"))
            first, last = _months(year, (number - 1) * size + 1, size)
        return _Atom(s, e, kind, first, last)
    if kind == "fiscalrange":
        label, raw = int(g("fa")), g("fb")
        if (int(raw) if len(raw) == 4 else label // 100 * 100 + int(raw)) != label + 1:
            return None
        return _Atom(s, e, "year", *_fiscal_year(label, fys, explicit_start=label))
    if kind == "fiscal":
        label, second = _full_year(g("fy")), g("fy2")
        if second:
            second = _full_year(second) if len(second) == 4 else label // 100 * 100 + int(second)
            if second != label + 1:
                return None
            first, last = _fiscal_year(label, fys, explicit_start=label)
        else:
            first, last = _fiscal_year(label, fys)
        return _Atom(s, e, "year", first, last)
    if kind == "season":
        year = int(g("sy"))
        if g("sy2"):
            second = _full_year(g("sy2")) if len(g("sy2")) == 4 else year // 100 * 100 + int(g("sy2"))
            if second != year + 1:
                return None
        first, last = _season(g("sn"), year, ctx["hemisphere"])
        return _Atom(s, e, "season", first, last)
    if kind == "decade":
        decade = int(g("dc")) if g("dc") else 1900 + int(g("dc2"))
        return _Atom(s, e, "decade", date(decade, 1, 1), date(decade + 9, 12, 31))
    if kind in ("mdrange", "dmrange"):
        month = _month(g("rm") or g("rm2"))
        year = int(g("ry") or g("ry2"))
        d1, d2 = (int(re.match(r"\d+", g(n)).group()) for n in (("rd1", "rd2") if g("rm") else ("rd3", "rd4")))
        if not d1 < d2:
            return None
        return _Atom(s, e, "day", date(year, month, d1), date(year, month, d2), bounded=True)
    if kind == "mmrange":
        year, m1, m2 = int(g("mmy")), _month(g("mm1")), _month(g("mm2"))
        if not m1 < m2:
            return None
        return _Atom(s, e, "month", date(year, m1, 1), _month_end(year, m2), bounded=True)
    if kind in ("mdy", "dmy"):
        month = _month(g("m1") or g("m2"))
        day = int(re.match(r"\d+", g("d1") or g("d2")).group())
        return _day_atom(m, kind, month, day, g("y1") or g("y2"))
    if kind == "monthyear":
        year, month = int(g("y3")), _month(g("m3"))
        return _Atom(s, e, "month", date(year, month, 1), _month_end(year, month))
    if kind == "numeric":
        a, b, y = int(g("n1")), int(g("n2")), _full_year(g("n3"))
        if g("nsep") == "." and len(g("n3")) != 4:
            return None
        day, month = (a, b) if ctx["day_first"] else (b, a)
        if month > 12 and day <= 12:  # the order is unambiguous when one part exceeds 12
            day, month = month, day
        point = date(y, month, day)
        return _Atom(s, e, "day", point, point)
    if kind == "yearrange":
        y1, raw = int(g("yr1")), g("yr2")
        y2 = int(raw) if len(raw) == 4 else y1 // 100 * 100 + int(raw)
        if not 0 < y2 - y1 <= 50 or (len(raw) == 2 and y2 - y1 > 1 and g(kind)[4:5] != "/"):
            return None
        return _Atom(s, e, "year", date(y1, 1, 1), date(y2, 12, 31), bounded=True)
    if kind == "year":
        if not year_in_context(ctx["text"], s, e, ctx["previous_end"]):
            return None
        year = int(g("by"))
        return _Atom(s, e, "year", date(year, 1, 1), date(year, 12, 31))
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
            point = _add_months(ref, 3 * count * (-1 if kind == "ago" else 1))
        else:
            span = f"{count} {unit_name}s ago" if kind == "ago" else f"in {count} {unit_name}s"
            point = _dateparser_span(span, ref)
            if point is None:
                return None
        first, last, granularity = _unit_interval(point, unit_name)
        return _Atom(s, e, granularity, first, last, future=kind == "inrel", past=kind == "ago", relative=True)
    if kind == "rolling":
        count, unit = _count(g("ron")), g("rou").lower().rstrip("s")
        forward = g("rod").lower() in ("next", "coming", "following")
        span = {"day": timedelta(days=count), "week": timedelta(weeks=count)}.get(unit)
        if forward:
            last = ref + span if span else _add_months(ref, count * (12 if unit == "year" else 1))
            return _Atom(s, e, unit, ref, last, future=True, relative=True)
        first = ref - span if span else _add_months(ref, -count * (12 if unit == "year" else 1))
        return _Atom(s, e, unit, first, ref, past=True, relative=True)
    if kind == "relative":
        direction, unit = g("rdir").lower(), re.sub(r"\s+", " ", g("runit").lower())
        step = {"last": -1, "past": -1, "previous": -1, "next": 1, "coming": 1, "following": 1}.get(direction, 0)
        if unit in MONTH_NUMBERS or unit in SEASONS or unit.endswith("day"):
            return _relative_named(s, e, unit, step, ref, ctx["hemisphere"])
        if unit == "fiscal year":
            label = _fiscal_label(ref, fys) + step
            first, last = _fiscal_year(label, fys)
            return _Atom(s, e, "year", first, last, future=step > 0, past=step < 0, relative=True)
        months = {"week": 0, "month": 1, "quarter": 3, "year": 12}[unit]
        point = ref + timedelta(weeks=step) if unit == "week" else _add_months(ref, months * step)
        first, last, granularity = _unit_interval(point, unit)
        return _Atom(s, e, granularity, first, last, future=step > 0, past=step < 0, relative=True)
    if kind == "deictic":
        offset = {"yesterday": -1, "today": 0, "tomorrow": 1}[g("dx").lower()]
        point = _dateparser_span(g("dx").lower(), ref) if offset else ref
        return _Atom(s, e, "day", point, point, future=offset > 0, past=offset < 0, relative=True)
    return None


def _fiscal_label(day: date, fys: int) -> int:
    """The fiscal year (named as in `_fiscal_year`) that contains `day`."""
    if fys == 1:
        return day.year
    return day.year + 1 if day.month >= fys else day.year


def _relative_named(s, e, unit, step, ref, hemisphere) -> _Atom | None:
    if unit.endswith("day"):  # next Monday, last Friday
        weekday = list(calendar.day_name).index(unit.capitalize())
        delta = (weekday - ref.weekday()) % 7
        if step > 0:
            point = ref + timedelta(days=delta or 7)
        elif step < 0:
            point = ref - timedelta(days=(ref.weekday() - weekday) % 7 or 7)
        else:
            point = ref + timedelta(days=delta)
        return _Atom(s, e, "day", point, point, future=point > ref, past=point < ref, relative=True)
    # seasons: "this summer" is the one of the reference year, "next/last" step from it
    base = ref.year
    if _season(unit, base - 1, hemisphere)[1] >= ref:  # still in the winter that began last year
        base -= 1
    first, last = _season(unit, base + step, hemisphere)
    return _Atom(s, e, "season", first, last, future=first > ref, past=last < ref, relative=True)


def _merge_ranges(text: str, atoms: list[_Atom], reference: date | None) -> list[_Atom]:
    """Join "A to B", "A–B", "between A and B" into one range, passing a year across."""
    merged: list[_Atom] = []
    for atom in atoms:
        prev = merged[-1] if merged else None
        if prev is not None and not prev.relative and not atom.relative and \
                RANGE_JOIN.fullmatch(text, prev.end, atom.start):
            joiner = text[prev.end:atom.start].strip().lower()
            opens = RANGE_OPEN.search(text, max(0, prev.start - 12), prev.start)
            if joiner != "and" or (opens and opens.group().lower().startswith("between")):
                joined = _join(prev, atom, reference)
                if joined is not None:
                    merged[-1] = joined
                    continue
        merged.append(atom)
    return merged


def _join(a: _Atom, b: _Atom, reference: date | None) -> _Atom | None:
    if a.first is None and b.first is None and reference is not None:
        point = date(reference.year, a.month, a.day)
        a = _Atom(a.start, a.end, a.granularity, point, point)
    if a.first is None and b.first is not None:
        year = b.first.year
        if (a.month, a.day) > (b.first.month, b.first.day):
            year -= 1
        a = _Atom(a.start, a.end, a.granularity, date(year, a.month, a.day), date(year, a.month, a.day))
    elif b.first is None and a.first is not None:
        year = a.last.year
        if (b.month, b.day) < (a.last.month, a.last.day):
            year += 1
        b = _Atom(b.start, b.end, b.granularity, date(year, b.month, b.day), date(year, b.month, b.day))
    if a.first is None or b.first is None or a.first > b.last:
        return None
    order = ("day", "week", "month", "season", "quarter", "half", "year", "decade")
    granularity = min(a.granularity, b.granularity, key=order.index)
    return _Atom(a.start, b.end, granularity, a.first, b.last, bounded=True)


def _modify(text: str, atom: _Atom, reference: date | None) -> _Atom:
    """Apply an early/mid/late or start/end-of modifier written just before the atom."""
    if atom.granularity in ("day",) or atom.first is None:
        return atom
    m = MODIFIER_BEFORE.search(text, max(0, atom.start - 30), atom.start)
    if not m:
        return atom
    word = m.group("mod").lower().split()
    word = word[1] if word[0] == "the" else word[0]
    modifier = MODIFIERS[word]
    if word in ("earlier", "later") and atom.relative and reference and atom.first <= reference <= atom.last:
        first, last = (atom.first, reference) if word == "earlier" else (reference, atom.last)
    else:
        first, last = _narrow(atom.first, atom.last, atom.granularity, modifier)
    return _Atom(m.start(), atom.end, atom.granularity, first, last, future=atom.future or word == "later",
                 past=atom.past and word != "later", relative=atom.relative)


def extract(text: str, reference_date: date | None = None, *, day_first: bool = False,
            fiscal_year_start: int = 1, hemisphere: str = "north") -> list[TemporalExpression]:
    """Every temporal expression in `text`, normalized, in text order.

    `reference_date` (the document date) anchors relative and yearless expressions and tells
    planned events from past ones; `day_first` reads 03/04/2025 as 3 April; `fiscal_year_start`
    is the month a fiscal year begins in; `hemisphere` ("north"/"south") places the seasons.
    Offsets (`char_start`, `char_end`) index `text`; `.text` is the sentence the expression is in.
    """
    if hemisphere not in ("north", "south"):
        raise ValueError(f"hemisphere must be 'north' or 'south', not {hemisphere!r}")
    ctx = {"text": text, "reference": reference_date, "fys": fiscal_year_start, "day_first": day_first,
           "hemisphere": hemisphere, "previous_end": None}
    atoms: list[_Atom] = []
    for m in CANDIDATES.finditer(text):
        try:
            atom = _parse(m, ctx)
        except (ValueError, KeyError, OverflowError):  # 2024-02-30, week 54 ...: not a date
            atom = None
        if atom is not None:
            atoms.append(_modify(text, atom, reference_date))
            ctx["previous_end"] = atom.end
    atoms = _merge_ranges(text, atoms, reference_date)
    sentences = _sentences(text)
    starts = [s for s, _ in sentences]
    found: list[TemporalExpression] = []
    previous_in_sentence: dict[int, int] = {}
    for atom in atoms:
        if atom.first is None:  # a month-day with no year anywhere
            if reference_date is None:
                continue
            try:
                point = date(reference_date.year, atom.month, atom.day)
            except ValueError:
                continue
            atom.first = atom.last = point
        index = max(0, bisect.bisect_right(starts, atom.start) - 1)
        s_start, s_end = sentences[index]
        left_from = max(s_start, previous_in_sentence.get(index, s_start))
        sentence = " ".join(text[s_start:s_end].split())
        role = role_for(text[left_from:atom.start], text[atom.end:s_end], sentence, start=atom.first,
                        reference_date=reference_date, granularity=atom.granularity,
                        future_relative=atom.future, past_relative=atom.past,
                        bounded=atom.bounded)
        previous_in_sentence[index] = atom.end
        found.append(TemporalExpression(sentence, text[atom.start:atom.end], atom.first, atom.last,
                                        atom.granularity, role, atom.start, atom.end))
    return found


def timex3(expression: TemporalExpression, hemisphere: str = "north") -> str | None:
    """The TimeML TIMEX3 `value` of a calendar-aligned expression ("2024-Q3", "2025-H1",
    "2025-SP", "2024-W05", "199" for the 1990s), or None when it has none (ranges, fiscal quarters
    that are not calendar quarters)."""
    start, end, g = expression.start, expression.end, expression.granularity
    if g == "day" and start == end:
        return start.isoformat()
    if g == "week" and start.weekday() == 0 and (end - start).days == 6:
        year, week, _ = start.isocalendar()
        return f"{year}-W{week:02d}"
    if g == "month" and start.day == 1 and end == _month_end(start.year, start.month):
        return f"{start:%Y-%m}"
    if g == "quarter" and start.month % 3 == 1 and end == _months(start.year, start.month, 3)[1]:
        return f"{start.year}-Q{(start.month - 1) // 3 + 1}"
    if g == "half" and start.month in (1, 7) and end == _months(start.year, start.month, 6)[1]:
        return f"{start.year}-H{1 if start.month == 1 else 2}"
    if g == "season":
        codes = {3: "SP", 6: "SU", 9: "FA", 12: "WI"}
        month = start.month if hemisphere == "north" else (start.month + 6 - 1) % 12 + 1
        if month in codes and end == _months(start.year, start.month, 3)[1]:
            return f"{start.year}-{codes[month]}"
    if g == "year" and (start.month, start.day, end.month, end.day) == (1, 1, 12, 31) and start.year == end.year:
        return str(start.year)
    if g == "decade" and start.year % 10 == 0 and end.year == start.year + 9:
        return str(start.year // 10)
    return None
