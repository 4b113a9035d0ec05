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

Past 400 lines because reading candidates into intervals (ranges, anchors, year inference by tense)
is one pass over a sentence that shares its state.
"""

from __future__ import annotations

import bisect
import dataclasses
import re
from collections.abc import Iterator
from datetime import date, timedelta

from auditor.models import TemporalExpression
from auditor.temporal import kinds
from auditor.temporal.locales import locale_for
from auditor.temporal.localized import extract_localized
from auditor.temporal.patterns import (
    ALTERNATIVES,
    DIGIT_FIRST,
    MODIFIER_BEFORE,
    MODIFIERS,
    MONTH_NUMBERS,
    RANGE_JOIN,
    RANGE_OPEN,
    STARTER_PHRASES,
    STARTER_WORDS,
    STARTER_WORDS_ANY_CASE,
    WORD_FIRST,
    Atom,
    month_end,
    narrow,
    parse_candidate,
)
from auditor.temporal.roles import nearest_tense, role_for, tense
from auditor.temporal.timex import interval_value

__all__ = ["extract", "timex3"]

_DIGITS = frozenset("0123456789'")

# The candidate forms of `patterns` first, then the TIMEX3 kinds of `kinds`: at one position the
# first alternative that matches wins, so a fuller date beats a weekday or a bare month. Split by
# what a candidate starts with, so that a position tries only the forms that can begin there.
_ALL = ALTERNATIVES + kinds.ALTERNATIVES
DIGIT_CANDIDATES = re.compile("|".join(f"(?P<{n}>{b})" for n, b in _ALL if n in DIGIT_FIRST or n in kinds.DIGIT_FIRST))
WORD_CANDIDATES = re.compile("|".join(f"(?P<{n}>{b})" for n, b in _ALL if n in WORD_FIRST or n in kinds.WORD_FIRST))
# Where a candidate can begin: at a word start (never inside a word), a digit or an apostrophe
# ("'24"), a code (Q3, H1, FY), a starter word, or a small word before what can follow it there
# ("the next", "in 3"), a unit before a hyphen ("year-earlier"). Trying the alternation only there, not at every character, is what makes
# the scan cheap; the words are looked up in sets, not tried as a regex alternation, which costs
# a try of every word at every word start.
_WORD_START = re.compile(r"(?<!\w)(?:'|\w+)")
_CODES = ("Q1", "Q2", "Q3", "Q4", "H1", "H2", "FY", "F.Y.")
_ANY_CASE = STARTER_WORDS_ANY_CASE | kinds.STARTER_WORDS
_PHRASE = re.compile(rf"(?i:{STARTER_PHRASES})")
_PHRASE_FIRST = frozenset(("the", "in"))  # the others begin with a digit or a starter word


def _starts(text: str) -> Iterator[int]:
    """Offsets in `text` where a candidate can begin, in text order."""
    for m in _WORD_START.finditer(text):
        word, at = m.group(), m.start()
        if (
            word == "'"
            or word[0].isdecimal()
            or word in STARTER_WORDS
            or (word[0] in "QHF" and text.startswith(_CODES, at))
            or (lower := word.lower()) in _ANY_CASE
            or (lower in _PHRASE_FIRST and _PHRASE.match(text, at))
            or (lower in kinds.HYPHEN_STARTERS and text.startswith("-", m.end()))
        ):
            yield at


# a part of the day after a day ("Friday morning", "yesterday evening") makes it a TIMEX3 TIME
_PART_AFTER = re.compile(r"\s+(?P<part>morning|afternoon|evening|night)\b", re.I)
# text between a duration and the date it is counted from ("90 days from 1 March 2026")
_ANCHOR_AFTER = re.compile(
    r"(?i:\s+(?P<how>from|after|following|starting(?:\s+(?:on|from))?|beginning(?:\s+on)?|of|before)\s+(?:the\s+)?)"
)
# text between a date and a duration that runs from it ("from March 1 for 90 days")
_ANCHOR_BEFORE = re.compile(r"(?i:,?\s+for\s+(?:the\s+next\s+)?)")
_CLOCK_GAP = re.compile(r"(?i:,?\s+(?:on\s+|at\s+|by\s+|from\s+|between\s+)?)")
_SENTENCE_GAP = re.compile(r"[.!?;\n]")
_CLOCK_TO_CLOCK = re.compile(r"(?i:\s*(?:-|–|to|and|until|till)\s*)")
# news past tense that the role lexicon does not need ("said" opens most reported sentences)
_REPORTED = re.compile(
    r"(?i:\b(?:said|told|rose|fell|grew|came|went|gave|made|saw|took|began|won|lost|paid|sold|bought|left|met)\b"
    r"|(?<!\bis )(?<!\bare )(?<!\bbe )(?<!\bbeen )(?<!\bget )(?<!\bgets )\b[a-z]{2,}[^e\s]ed\b)"
)  # a verb in -ed not after is/are/be ("reached", not "is closed"); not "need", "speed", "seed"
_GRANULARITY_OF_UNIT = {"second": "day", "minute": "day", "hour": "day", "century": "decade"}

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
            if word and (
                word.group(1).lower() in _ABBREVIATIONS
                or len(word.group(1)) == 1
                or (word.group(1).lower() in MONTH_NUMBERS and text[m.end() : m.end() + 1].isdigit())
            ):
                continue  # "Mar. 5", "J. Rivera", "MARCH. 03": the date goes on
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
            and prev.placed
            and atom.placed
            and atom.start - prev.end <= 30
            and RANGE_JOIN.fullmatch(joiner)
            and not _PARAGRAPH_BREAK.search(text, prev.end, atom.start)
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
    elif b.first is None and a.last is not None:
        year = a.last.year
        if (b.month, b.day) < (a.last.month, a.last.day):
            year += 1
        b = Atom(b.start, b.end, b.granularity, date(year, b.month, b.day), date(year, b.month, b.day))
    if a.first is None or b.last is None or a.first > b.last:
        return None
    order = ("day", "week", "month", "season", "quarter", "half", "year", "decade")
    granularity = min(a.granularity, b.granularity, key=order.index)
    return Atom(a.start, b.end, granularity, a.first, b.last, bounded=True)


def _modify(text: str, atom: Atom, reference: date | None) -> Atom:
    """Apply an early/mid/late or start/end-of modifier written just before the atom."""
    if atom.granularity in ("day",) or atom.first is None or atom.last is None or atom.timex_type != "DATE":
        return atom
    m = MODIFIER_BEFORE.search(text, max(0, atom.start - 30), atom.start)
    if not m or _PARAGRAPH_BREAK.search(text, m.start(), atom.start):
        return atom  # a modifier in the paragraph before is not this one's
    word = m.group("mod").lower().split()
    word = word[1] if word[0] == "the" else word[0]
    modifier = MODIFIERS[word]
    if word in ("earlier", "later") and atom.relative and reference and atom.first <= reference <= atom.last:
        first, last = (atom.first, reference) if word == "earlier" else (reference, atom.last)
    else:
        first, last = narrow(atom.first, atom.last, atom.granularity, modifier)
    return dataclasses.replace(
        atom,
        start=m.start(),
        first=first,
        last=last,
        future=atom.future or word == "later",
        past=atom.past and word != "later",
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
    sentences = _sentences(text)
    starts = [s for s, _ in sentences]
    normalized: dict[int, str] = {}  # once per sentence: re-joining it per expression is quadratic

    def sentence_at(position: int) -> tuple[int, str]:
        index = max(0, bisect.bisect_right(starts, position) - 1)
        sentence = normalized.get(index)
        if sentence is None:
            s_start, s_end = sentences[index] if sentences else (0, len(text))
            sentence = normalized[index] = " ".join(text[s_start:s_end].split())
        return index, sentence

    tenses: dict[int, tuple[bool, bool]] = {}  # once per sentence, like `normalized`

    def tense_at(position: int) -> tuple[bool, bool]:
        """(future, past) at `position`, for reading yearless dates (kinds.py): by the nearest
        tense word in its sentence, else by the sentence."""
        index, sentence = sentence_at(position)
        s_start, s_end = sentences[index] if sentences else (0, len(text))
        local = nearest_tense(text[max(s_start, position - 80) : position], text[position : min(s_end, position + 80)])
        if local is not None:
            return local
        cues = tenses.get(index)
        if cues is None:
            future, past = tense(sentence)
            cues = tenses[index] = (future, past or _REPORTED.search(sentence) is not None)
        return cues

    ctx = {
        "text": text,
        "reference": reference_date,
        "fys": fiscal_year_start,
        "day_first": day_first,
        "hemisphere": hemisphere,
        "previous_end": None,
        "tense": tense_at,
    }
    atoms: list[Atom] = []
    scanned_to = 0
    for at in _starts(text):
        if at < scanned_to:
            continue
        pattern = DIGIT_CANDIDATES if text[at] in _DIGITS else WORD_CANDIDATES
        m = pattern.match(text, at)
        if m is not None and (cut := _PARAGRAPH_BREAK.search(text, at, m.end())):
            m = pattern.match(text, at, cut.start())  # an expression never spans a paragraph break
        if m is None:
            continue
        scanned_to = m.end()
        try:
            if m.lastgroup in kinds.NAMES:
                atom = kinds.parse_kind(m, ctx)
            else:
                atom = parse_candidate(m, ctx)
        except (ValueError, KeyError, OverflowError):  # 2024-02-30, week 54 ...: not a date
            atom = None
        if atom is None:
            continue
        if atom.placed and atom.first is not None and atom.last is not None:
            if atom.value is None and atom.timex_type == "DATE":
                atom.value = interval_value(atom.first, atom.last, atom.granularity, hemisphere)
            if atom.granularity == "day" and atom.first == atom.last and atom.timex_type == "DATE":
                part = _PART_AFTER.match(text, atom.end)
                if part and not _PARAGRAPH_BREAK.search(text, atom.end, part.end()):
                    code = kinds.PART_OF_DAY[part.group("part").lower()]
                    atom = dataclasses.replace(atom, end=part.end(), timex_type="TIME", value=f"{atom.first}T{code}")
                    scanned_to = atom.end
        atoms.append(_modify(text, atom, reference_date))
        ctx["previous_end"] = atom.end
    atoms = _merge_ranges(text, _join_neighbours(text, atoms), reference_date)
    if reference_date is not None:
        for atom in atoms:
            if atom.first is None and atom.placed:  # a month-day with no year anywhere: by the tense
                _give_year(text, atom, reference_date, tense_at(atom.start))
    atoms = _join_clock_and_day(text, [a for a in atoms if a.first is not None or not a.placed])
    _anchor(text, atoms)
    _back_from_quarter(atoms)
    found: list[TemporalExpression] = []
    previous_in_sentence: dict[int, int] = {}
    for atom in atoms:
        if not atom.placed:  # no place on the calendar: the reference date stands in
            if reference_date is None:
                continue
            atom.first = atom.last = reference_date
        assert atom.first is not None and atom.last is not None
        index, sentence = sentence_at(atom.start)
        s_start, s_end = sentences[index]
        left_from = max(s_start, previous_in_sentence.get(index, s_start))
        if atom.present:
            role = "as_of"  # "currently", "now": the statement holds on the document date
        elif not atom.placed or atom.timex_type == "SET" or atom.clock is not None:
            role = "other"  # a clock time adds nothing to the role of the day it falls on
        else:
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
                atom.timex_type,
                atom.value,
            )
        )
    return found


_POSSESSIVE = re.compile(r"(?:'s|’s)?\s+")


_MONTH_VALUE = re.compile(r"(?:\d{4}|XXXX)-\d\d")
_CLOCK_THEN_DAY = re.compile(r"\s*(?:[A-Z]{2,4}\b)?,?\s*")


def _join_neighbours(text: str, atoms: list[Atom]) -> list[Atom]:
    """One expression of two written together: "this year's third quarter" and "the 1988 third
    quarter" (a quarter of that year), "June last year" (a month of that year)."""
    out: list[Atom] = []
    for atom in atoms:
        prev = out[-1] if out else None
        if prev is not None and _PARAGRAPH_BREAK.search(text, prev.end, atom.start):
            prev = None  # nothing joins across a paragraph break
        if (prev is not None and prev.timex_type == "DATE" and _MONTH_VALUE.fullmatch(prev.value or "")) and (
            atom.granularity == "year"
            and atom.relative
            and atom.first is not None
            and text[prev.end : atom.start].isspace()
        ):
            assert prev is not None
            month = int((prev.value or "XXXX-00")[5:7])
            if month:
                first, last = date(atom.first.year, month, 1), month_end(atom.first.year, month)
                out[-1] = dataclasses.replace(atom, start=prev.start, first=first, last=last, granularity="month")
                out[-1].value = interval_value(first, last, "month")
                continue
        if (
            prev is not None
            and prev.granularity == "year"
            and prev.first is not None
            and atom.granularity in ("quarter", "half")
            and atom.relative
            and atom.first is not None
            and _POSSESSIVE.fullmatch(text, prev.end, atom.start)
        ):
            first = atom.first.replace(year=prev.first.year)
            last = atom.last.replace(year=prev.first.year) if atom.last else first
            out[-1] = dataclasses.replace(atom, start=prev.start, first=first, last=last, value=None, past=False)
            out[-1].value = interval_value(first, last, atom.granularity)
            continue
        out.append(atom)
    return out


def _join_clock_and_day(text: str, atoms: list[Atom]) -> list[Atom]:
    """A clock time written just before its day is one TIME with it: "9 a.m. EST Tuesday", "noon
    Saturday", "5 p.m. EST, Nov. 6" (after the yearless days have their year)."""
    out: list[Atom] = []
    for atom in atoms:
        prev = out[-1] if out else None
        if (
            prev is not None
            and prev.clock is not None
            and atom.placed
            and atom.first is not None
            and atom.first == atom.last
            and atom.timex_type == "DATE"
            and _CLOCK_THEN_DAY.fullmatch(text, prev.end, atom.start)
        ):
            out[-1] = dataclasses.replace(atom, start=prev.start, timex_type="TIME", value=f"{atom.first}{prev.clock}")
            continue
        out.append(atom)
    return out


def _back_from_quarter(atoms: list[Atom]) -> None:
    """ "... in the third quarter, up from $2 a share a year earlier": the same quarter a year
    before (in reports a year-ago figure compares the period just named)."""
    quarter = None
    for atom in atoms:
        if atom.granularity == "quarter" and atom.placed and atom.first is not None and not atom.years_back:
            quarter = atom
        elif atom.years_back and quarter is not None and atom.start - quarter.end < 400:
            assert quarter.first is not None and quarter.last is not None
            years = atom.years_back
            atom.first = quarter.first.replace(year=quarter.first.year - years)
            atom.last = month_end(quarter.last.year - years, quarter.last.month)
            atom.granularity = "quarter"
            atom.value = interval_value(atom.first, atom.last, "quarter")


_NEAR_DAYS = 45


def _give_year(text: str, atom: Atom, reference: date, sentence_tense: tuple[bool, bool]) -> None:
    """The year of a month-day written without one: the reference year, unless the sentence's
    tense (or a cue) puts the date on the other side of the reference date (kinds.direction)."""
    way = kinds.direction(text[max(0, atom.start - 40) : atom.start], sentence_tense)
    year = reference.year
    gap = (atom.month - reference.month) * 31 + atom.day - reference.day  # days, near enough
    if way < 0 and gap > _NEAR_DAYS:
        year -= 1
    elif way > 0 and gap < -_NEAR_DAYS:
        year += 1
    try:
        atom.first = atom.last = date(year, atom.month, atom.day)
    except ValueError:  # February 29 in a common year
        return
    atom.value = atom.first.isoformat()


def _anchor(text: str, atoms: list[Atom]) -> None:
    """Give a duration counted from a date its interval ("90 days from 1 March 2026" ends on
    date(2026, 3, 1) + timedelta(days=90); "two weeks before June 1" ends on June 1), and a clock
    time written beside a day that day ("8 a.m. on Monday")."""
    for i, atom in enumerate(atoms):
        following = atoms[i + 1] if i + 1 < len(atoms) else None
        preceding = atoms[i - 1] if i > 0 else None
        if atom.length is not None and not atom.placed:
            count, unit = atom.length
            granularity = _GRANULARITY_OF_UNIT.get(unit, unit)
            gap = _ANCHOR_AFTER.fullmatch(text, atom.end, following.start) if following else None
            if following is not None and gap and following.placed and following.first is not None:
                if gap.group("how").lower() == "before":
                    atom.last, atom.first = following.first, kinds.shift(following.first, count, unit, -1)
                else:
                    atom.first, atom.last = following.first, kinds.shift(following.first, count, unit)
                atom.placed, atom.granularity = True, granularity
            elif (
                preceding is not None
                and preceding.placed
                and preceding.timex_type == "DATE"
                and preceding.first is not None
                and _ANCHOR_BEFORE.fullmatch(text, preceding.end, atom.start)
            ):
                atom.first, atom.last = preceding.first, kinds.shift(preceding.first, count, unit)
                atom.placed, atom.granularity = True, granularity
        elif atom.clock is not None:
            _place_clock(text, atom, preceding, following)


def _place_clock(text: str, atom: Atom, preceding: Atom | None, following: Atom | None) -> None:
    """A clock time takes the day written next to it ("Monday at 8 a.m.", "8 a.m. on Monday"), or
    the day of the clock time it runs from ("10 p.m. to 2 a.m." ends on the next day)."""
    if atom.clock is None:
        return
    if preceding is not None and preceding.clock is not None and preceding.placed and preceding.first is not None:
        if _CLOCK_TO_CLOCK.fullmatch(text, preceding.end, atom.start):
            day = preceding.first
            if atom.clock < preceding.clock:
                day += timedelta(days=1)
            atom.first = atom.last = day
            atom.value, atom.placed = f"{day}{atom.clock}", True
            return
    for beside, (a, b) in (
        (preceding, (preceding.end if preceding else 0, atom.start)),
        (following, (atom.end, following.start if following else 0)),
    ):
        if (
            beside is None
            or beside.clock is not None
            or not beside.placed
            or beside.first is None
            or beside.first != beside.last
        ):
            continue
        if _CLOCK_GAP.fullmatch(text, a, b):
            atom.first = atom.last = beside.first
            atom.value, atom.placed = f"{beside.first}{atom.clock}", True
            return
    # else the day named earlier in the same sentence ("Next Monday the lobby reopens at 8 a.m.")
    named = preceding
    if (
        named is not None
        and named.placed
        and named.first is not None
        and named.first == named.last
        and named.clock is None
    ):
        if atom.start - named.end < 60 and not _SENTENCE_GAP.search(text, named.end, atom.start):
            atom.first = atom.last = named.first
            atom.value, atom.placed = f"{named.first}{atom.clock}", True


def timex3(expression: TemporalExpression, hemisphere: str = "north") -> str | None:
    """The TimeML TIMEX3 `value` of a calendar-aligned expression ("2024-Q3", "2025-H1",
    "2025-SP", "2024-W05", "199" for the 1990s), or None when it has none (ranges, fiscal quarters
    that are not calendar quarters)."""
    return interval_value(expression.start, expression.end, expression.granularity, hemisphere)
