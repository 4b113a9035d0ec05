"""Temporal expressions -> normalized intervals with roles (docs/dates.md).

Candidates come from our own compiled patterns (`temporal_patterns`), never from scanning a passage
with dateparser: that is slow and reads "We", "May I" or "sun" as dates. Absolute forms are
normalized from the pattern's groups by `temporal_patterns.parse_candidate` (the standard library's
calendar is the authority there); the relative spans that need calendar arithmetic ("two weeks ago",
"in 3 months", "yesterday") go to dateparser, one short span at a time, cached, anchored to the
reference date. Roles come from `temporal_roles`.

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
import re
from datetime import date

from auditor.models import TemporalExpression
from auditor.temporal.locales import locale_for
from auditor.temporal.localized import extract_localized
from auditor.temporal.patterns import (
    DIGIT_CANDIDATES,
    MODIFIER_BEFORE,
    MODIFIERS,
    RANGE_JOIN,
    RANGE_OPEN,
    STARTS,
    WORD_CANDIDATES,
    Atom,
    month_end,
    month_span,
    narrow,
    parse_candidate,
)
from auditor.temporal.roles import role_for

__all__ = ["extract", "timex3"]

_DIGITS = frozenset("0123456789'")
_PARAGRAPH_BREAK = re.compile(r"\n[ \t]*\n")

# --- sentences -------------------------------------------------------------------------------------

_ABBREVIATIONS = {
    "jan",
    "feb",
    "mar",
    "apr",
    "jun",
    "jul",
    "aug",
    "sep",
    "sept",
    "oct",
    "nov",
    "dec",
    "mon",
    "tue",
    "tues",
    "wed",
    "thu",
    "thur",
    "thurs",
    "fri",
    "sat",
    "sun",
    "e.g",
    "i.e",
    "etc",
    "no",
    "st",
    "dr",
    "mr",
    "mrs",
    "ms",
    "approx",
    "vs",
    "inc",
    "ltd",
    "co",
    "a.m",
    "p.m",
    "u.s",
    "fig",
    "ext",
    "dept",
    "est",
    "f.y",
    "c",
    "ca",
    "al",
    "pp",
    "p",
}
# Linear on any input: a run of "!!!" is tried once, at its first mark (the lookbehind), and a
# blank line ends at its second newline, so no quantifier restarts inside a run it already read.
_BOUNDARY = re.compile(
    r"(?<![.!?])[.!?]+[\"'”’)\]]*\s+(?=[\"'“‘(\[]?[A-Z0-9•*-])|\n[ \t]*\n"
    r"|\n(?=[ \t]*(?:[-*•]|\d+[.)])\s)"
)
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


def _merge_ranges(text: str, atoms: list[Atom], reference: date | None) -> list[Atom]:
    """Join "A to B", "A–B", "between A and B" into one range, passing a year across."""
    merged: list[Atom] = []
    for atom in atoms:
        prev = merged[-1] if merged else None
        joiner = text[prev.end : atom.start].strip().lower() if prev is not None else ""
        if (
            prev is not None
            and not prev.relative
            and not atom.relative
            and atom.start - prev.end <= 30
            and RANGE_JOIN.fullmatch(joiner)
        ):
            opens = RANGE_OPEN.search(text, max(0, prev.start - 12), prev.start)
            if joiner != "and" or (opens and opens.group().lower().startswith("between")):
                joined = _join(prev, atom, reference)
                if joined is not None:
                    merged[-1] = joined
                    continue
        merged.append(atom)
    return merged


def _join(a: Atom, b: Atom, reference: date | None) -> Atom | None:
    """The range from `a` to `b`, a year passed from the one that has it to the one that lacks it
    ("December 24 to January 2, 2025" starts in 2024), or None when `b` does not follow `a`."""
    if a.first is None and b.first is None and reference is not None:
        point = date(reference.year, a.month, a.day)
        a = Atom(a.start, a.end, a.granularity, point, point)
    if a.first is None and b.first is not None:
        year = b.first.year
        if (a.month, a.day) > (b.first.month, b.first.day):
            year -= 1
        a = Atom(a.start, a.end, a.granularity, date(year, a.month, a.day), date(year, a.month, a.day))
    elif b.first is None and a.first is not None:
        year = a.last.year
        if (b.month, b.day) < (a.last.month, a.last.day):
            year += 1
        b = Atom(b.start, b.end, b.granularity, date(year, b.month, b.day), date(year, b.month, b.day))
    if a.first is None or b.first is None or a.first > b.last:
        return None
    order = ("day", "week", "month", "season", "quarter", "half", "year", "decade")
    granularity = min(a.granularity, b.granularity, key=order.index)
    return Atom(a.start, b.end, granularity, a.first, b.last, bounded=True)


def _modify(text: str, atom: Atom, reference: date | None) -> Atom:
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
        first, last = narrow(atom.first, atom.last, atom.granularity, modifier)
    return Atom(
        m.start(),
        atom.end,
        atom.granularity,
        first,
        last,
        future=atom.future or word == "later",
        past=atom.past and word != "later",
        relative=atom.relative,
    )


def extract(
    text: str,
    reference_date: date | None = None,
    *,
    day_first: bool = False,
    fiscal_year_start: int = 1,
    hemisphere: str = "north",
    language: str = "english",
) -> list[TemporalExpression]:
    """Every temporal expression in `text`, normalized, in text order.

    `language` (a Snowball name) other than English with a language file in
    auditor/temporal/languages/ is read with that language's words (auditor/temporal/localized.py).

    `reference_date` (the document date) anchors relative and yearless expressions and tells
    planned events from past ones; `day_first` reads 03/04/2025 as 3 April; `fiscal_year_start`
    is the month a fiscal year begins in; `hemisphere` ("north"/"south") places the seasons.
    Offsets (`char_start`, `char_end`) index `text`; `.text` is the sentence the expression is in.
    """
    if hemisphere not in ("north", "south"):
        raise ValueError(f"hemisphere must be 'north' or 'south', not {hemisphere!r}")
    if not (isinstance(fiscal_year_start, int) and 1 <= fiscal_year_start <= 12):
        raise ValueError(f"fiscal_year_start must be a month number 1-12, not {fiscal_year_start!r}")
    if language != "english" and (words := locale_for(language)) is not None:
        return extract_localized(text, words, reference_date)
    ctx = {
        "text": text,
        "reference": reference_date,
        "fys": fiscal_year_start,
        "day_first": day_first,
        "hemisphere": hemisphere,
        "previous_end": None,
    }
    atoms: list[Atom] = []
    scanned_to = 0
    for start in STARTS.finditer(text):
        if start.start() < scanned_to:
            continue
        at = start.start()
        pattern = DIGIT_CANDIDATES if text[at] in _DIGITS else WORD_CANDIDATES
        m = pattern.match(text, at)
        if m is not None and (cut := _PARAGRAPH_BREAK.search(text, at, m.end())):
            m = pattern.match(text, at, cut.start())  # an expression never spans a paragraph break
        if m is None:
            continue
        scanned_to = m.end()
        try:
            atom = parse_candidate(m, ctx)
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
    normalized: dict[int, str] = {}  # once per sentence: re-joining it per expression is quadratic
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
        sentence = normalized.get(index)
        if sentence is None:
            sentence = normalized[index] = " ".join(text[s_start:s_end].split())
        role = role_for(
            text[left_from : atom.start],
            text[atom.end : s_end],
            sentence,
            start=atom.first,
            reference_date=reference_date,
            granularity=atom.granularity,
            future_relative=atom.future,
            past_relative=atom.past,
            bounded=atom.bounded,
            expression=text[atom.start : atom.end],
        )
        previous_in_sentence[index] = atom.end
        found.append(
            TemporalExpression(
                sentence,
                text[atom.start : atom.end],
                atom.first,
                atom.last,
                atom.granularity,
                role,
                atom.start,
                atom.end,
            )
        )
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
    if g == "month" and start.day == 1 and end == month_end(start.year, start.month):
        return f"{start:%Y-%m}"
    if g == "quarter" and start.month % 3 == 1 and end == month_span(start.year, start.month, 3)[1]:
        return f"{start.year}-Q{(start.month - 1) // 3 + 1}"
    if g == "half" and start.month in (1, 7) and end == month_span(start.year, start.month, 6)[1]:
        return f"{start.year}-H{1 if start.month == 1 else 2}"
    if g == "season":
        codes = {3: "SP", 6: "SU", 9: "FA", 12: "WI"}
        month = start.month if hemisphere == "north" else (start.month + 6 - 1) % 12 + 1
        if month in codes and end == month_span(start.year, start.month, 3)[1]:
            return f"{start.year}-{codes[month]}"
    if g == "year" and (start.month, start.day, end.month, end.day) == (1, 1, 12, 31) and start.year == end.year:
        return str(start.year)
    if g == "decade" and start.year % 10 == 0 and end.year == start.year + 9:
        return str(start.year // 10)
    return None
