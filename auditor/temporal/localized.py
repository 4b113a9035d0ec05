"""Temporal expressions in languages other than English (docs/languages.md).

The patterns are built from a language's `DateLocale` (auditor/temporal/locales.py: CLDR names and
orders through Babel, our cue words from auditor/temporal/languages/<code>.toml), so a new language
needs a data file and no code here. Conventions follow auditor/temporal/extract.py and docs/dates.md:
every expression is an interval [start, end] with a granularity; quarters and halves are calendar
ones; seasons are meteorological; early/mid/late (Anfang/Mitte/Ende, a principios/mediados/finales
de) narrow to the first, middle and last third; relative and yearless expressions need a reference
date and are dropped without one.

Roles, decided per expression in its sentence, first rule that applies:
1. the nearest cue phrase of the language file (`[cues]`) that ends at most two words before the
   expression (after any earlier expression of the sentence): as_of, effective, expires, planned;
2. `planned` when the sentence speaks of the future (`future_words`), the expression points
   forward ("in zwei Wochen", "el próximo mes"), or it starts after the reference date in a
   sentence with no past tense (`past_words`);
3. `event` otherwise.

Past 400 lines because one reader serves every language with a date-words file: the words are
data (temporal/languages/*.toml), the grammar of dates is here.
"""

from __future__ import annotations

import bisect
import calendar
import re
from dataclasses import dataclass
from datetime import date, timedelta
from typing import Any

from auditor.models import TemporalExpression
from auditor.temporal.locales import DateLocale

_WINDOW = 60  # characters of the sentence before an expression searched for a cue
_THIRDS = {"early": 0, "mid": 1, "late": 2}


@dataclass
class _Atom:
    start: int
    end: int
    first: date
    last: date
    granularity: str
    future: bool = False  # points forward from the reference date


def _alternation(words) -> str:
    """A regex alternation of `words`, longest first, spaces matching any whitespace."""
    return "|".join(re.escape(w).replace(r"\ ", r"\s+") for w in sorted(set(words), key=len, reverse=True) if w)


def _cached(build):
    """Cache a pattern builder per locale (a DateLocale holds dicts, so it is not hashable)."""
    cache: dict[str, re.Pattern] = {}

    def get(loc: DateLocale) -> re.Pattern:
        if loc.code not in cache:
            cache[loc.code] = build(loc)
        return cache[loc.code]

    return get


@_cached
def _compiled(loc: DateLocale) -> re.Pattern:
    month = _alternation(loc.months)
    dm = rf"\s+{re.escape(loc.day_month_joiner)}\s+" if loc.day_month_joiner else r"\s*"
    my = rf"(?:\s+{re.escape(loc.month_year_joiner)})?\s+" if loc.month_year_joiner else r",?\s+"
    day_suffix = r"(?:\.|\.?º|\.?ª|\.?er|°)?" if not loc.day_suffix else r"\.?"
    dm_joined = rf"(?:{dm}|\s+{re.escape(loc.day_month_joiner)}\s+)" if loc.day_month_joiner else dm
    sep = f"[{re.escape(loc.separators)}]"
    mod = _alternation(loc.modifiers)

    def mod_prefix(name: str) -> str:
        return rf"(?:(?P<{name}>{mod})\s+(?:(?:des|del|de)\s+)?)?" if mod else ""

    number = _alternation(list(loc.numbers) + [])
    count = rf"(?P<n>\d{{1,3}}|{number})" if number else r"(?P<n>\d{1,3})"
    unit = _alternation(loc.units)
    ago_before = _alternation(loc.ago_before)
    ago_after = _alternation(loc.ago_after)
    ahead = _alternation(loc.ahead_before)
    ordinal = _alternation(loc.ordinals)
    quarter = _alternation(loc.quarter_words)
    half = _alternation(loc.half_words)
    season = _alternation(loc.seasons)
    century = _alternation(loc.century_words)
    deictic = _alternation(loc.today + loc.yesterday + loc.tomorrow)
    nxt, last = _alternation(loc.next_words), _alternation(loc.last_words)
    article = r"(?:(?:im|am|in\s+der|in\s+den|el|la|los|las|en\s+el|en\s+la)\s+)?"
    the_year = r"(?:\s+(?:des\s+jahres|del\s+año|de))?"
    parts = [
        r"(?P<iso>(?P<iy>\d{4})-(?P<im>\d{1,2})-(?P<id>\d{1,2}))",
        rf"(?P<num>(?P<n1>\d{{1,2}}){sep}(?P<n2>\d{{1,2}}){sep}(?P<n3>\d{{4}}|\d{{2}}))(?![\d{re.escape(loc.separators)}]\d)",
        rf"(?P<dmy>(?P<d>\d{{1,2}}){day_suffix}{dm_joined}(?P<m>{month})\.?(?:{my}(?P<y>\d{{4}}))?)",
        rf"(?P<my>{mod_prefix('mod')}(?P<m2>{month})\.?{my}(?P<y2>\d{{4}}))",
    ]
    month_full = _alternation([name for name, _ in loc.full_months])
    before_month = _alternation(loc.month_before)
    if before_month:
        # A month without a year after a preposition ("im Mai", "Anfang März", "en mayo"): the
        # reference date's year, as auditor/temporal/extract.py does for a yearless day.
        parts.append(rf"(?P<mo>(?:{before_month})\s+(?P<m3>{month_full}))(?!\s*\d|{my}\d)")
        if season:
            parts.append(rf"(?P<so>(?:{before_month})\s+(?P<sw2>{season}))(?!\s*\d|\s+de\s+\d)")
    # "Mai/Juni 1940", "August und Oktober 1914", "de mayo a junio de 2020": two months, one year.
    parts.insert(
        2,
        rf"(?P<mm>(?P<m4>{month_full})\s*(?:/|–|-|und|bis|y|a)\s*(?P<m5>{month_full}){my}(?P<y4>\d{{4}}))",
    )
    parts.insert(
        2,
        rf"(?P<dr>(?P<d0>\d{{1,2}}){day_suffix}\s*(?:–|-|/|bis(?:\s+zum)?|und|al|y)\s*(?P<d1>\d{{1,2}}){day_suffix}"
        rf"{dm_joined}(?P<mr>{month})\.?(?:{my}(?P<yr>\d{{4}}))?)",
    )
    if quarter:
        q_num = rf"(?P<qn>{ordinal}|[1-4]\.(?:er|º|°)?|[1-4]\.?)" if ordinal else r"(?P<qn>[1-4]\.?)"
        parts.append(rf"(?P<q>(?:{q_num}\s+(?P<qw>{quarter})|[qQ](?P<qd>[1-4])){the_year}[\s/]+(?P<qy>\d{{4}}))")
    if half:
        h_num = rf"(?P<hn>{ordinal}|[12]\.(?:er|º|°)?|[12]\.?)" if ordinal else r"(?P<hn>[12]\.?)"
        parts.append(rf"(?P<h>{h_num}\s+(?:{half}){the_year}\s+(?P<hy>\d{{4}}))")
    if season:
        parts.append(rf"(?P<s>{mod_prefix('smod')}(?P<sw>{season})\s+(?:de\s+)?(?P<sy>\d{{4}}))")
    if century:
        parts.append(rf"(?P<c>(?P<cn>\d{{1,2}})\.\s*(?:{century})|(?:{century})\s+(?P<cr>[IVXL]+|\d{{1,2}})\b)")
    decade = _alternation(loc.decade_suffixes)
    if decade:
        parts.append(rf"(?P<dec>(?P<dn>\d{{2}}|1\d{{3}}|20\d{{2}})(?:{decade})(?:\s*jahren?)?)")
    parts.append(r"(?P<dec2>(?:década\s+de\s+|años\s+)(?P<dn2>1\d{3}|20\d{2}|[2-9]0)\b)")
    if ago_before and unit:
        parts.append(rf"(?P<ago>(?:{ago_before})\s+{count}\s+(?P<u>{unit}))")
    if ago_after and unit:
        parts.append(rf"(?P<ago2>{count.replace('<n>', '<n2a>')}\s+(?P<u2>{unit})\s+(?:{ago_after}))")
    if ahead and unit:
        parts.append(rf"(?P<ahead>(?:{ahead})\s+{count.replace('<n>', '<n3a>')}\s+(?P<u3>{unit}))")
    if unit and (nxt or last):
        parts.append(
            rf"(?P<rel>{article}(?:(?P<rw>{nxt}|{last})\s+(?P<u4>{unit})|(?P<u5>{unit})\s+(?P<rw2>{nxt}|{last})))"
        )
    later, same, following = _alternation(loc.later_after), _alternation(loc.same), _alternation(loc.following)
    if later and unit:
        parts.append(rf"(?P<later>{count.replace('<n>', '<n4>')}\s+(?P<u6>{unit})\s+(?:{later}))")
    if same and unit:
        parts.append(rf"(?P<same>{article}(?:{same})\s+(?P<u7>{unit}))")
    if following and unit:
        parts.append(rf"(?P<foll>{article}(?:(?:{following})\s+(?P<u8>{unit})|(?P<u9>{unit})\s+(?:{following})))")
    if deictic:
        parts.append(rf"(?P<deictic>{deictic})")
    parts.append(rf"(?P<year>{mod_prefix('ymod')}(?P<yy>1\d{{3}}|20\d{{2}}))(?![.,]\d)")
    return re.compile(rf"(?<![\w.])(?:{'|'.join(parts)})(?![\w])", re.IGNORECASE)


def _month_end(year: int, month: int) -> date:
    return date(year, month, calendar.monthrange(year, month)[1])


def _span(year: int, month: int, months: int) -> tuple[date, date]:
    last_month = month + months - 1
    end_year, end_month = year + (last_month - 1) // 12, (last_month - 1) % 12 + 1
    return date(year, month, 1), _month_end(end_year, end_month)


def _narrow(first: date, last: date, modifier: str | None) -> tuple[date, date]:
    """Early/mid/late as auditor/temporal/extract.py reads them: a third of the months of a
    year or season (a year: Jan-Apr, May-Aug, Sep-Dec), days 1-10, 11-20, 21-end of a month."""
    if not modifier:
        return first, last
    third = _THIRDS[modifier]
    if first.year == last.year and first.month == last.month:
        days = ((1, 10), (11, 20), (21, last.day))[third]
        return first.replace(day=days[0]), first.replace(day=days[1])
    months = (last.year - first.year) * 12 + last.month - first.month + 1
    size = max(1, months // 3)
    start = first.year * 12 + first.month - 1 + size * third
    count = months - 2 * size if third == 2 else size
    return _span(start // 12, start % 12 + 1, count)


def _roman(text: str) -> int:
    values = {"I": 1, "V": 5, "X": 10, "L": 50}
    total = 0
    for i, ch in enumerate(text):
        v = values[ch]
        total += -v if i + 1 < len(text) and values[text[i + 1]] > v else v
    return total


def _shift(reference: date, unit: str, n: int) -> tuple[date, date]:
    """The calendar day/week/month/year `n` units from `reference` (negative: back)."""
    if unit == "day":
        point = reference + timedelta(days=n)
        return point, point
    if unit == "week":
        point = reference + timedelta(weeks=n)
        monday = point - timedelta(days=point.weekday())
        return monday, monday + timedelta(days=6)
    if unit == "month":
        index = reference.year * 12 + reference.month - 1 + n
        return _span(index // 12, index % 12 + 1, 1)
    return date(reference.year + n, 1, 1), date(reference.year + n, 12, 31)


def _first(g: dict[str, Any], *names: str) -> str:
    """The first of the named groups that took part in the match."""
    return next(g[name] for name in names if g.get(name))


def _count(raw: str, loc: DateLocale) -> int:
    return int(raw) if raw.isdigit() else loc.numbers[raw.casefold()]


def _atom(m: re.Match, loc: DateLocale, reference: date | None, day_first: bool, anchor: date | None) -> _Atom | None:
    """The interval of one match; `anchor` is the start of the expression before it in the text,
    which "zwei Tage später" / "am selben Tag" count from (the reference date when there is none)."""
    g: dict[str, Any] = m.groupdict()  # a group that did not take part is None
    s, e = m.start(), m.end()
    text = m.group(0)
    if g["iso"]:
        point = date(int(g["iy"]), int(g["im"]), int(g["id"]))
        return _Atom(s, e, point, point, "day")
    if g["num"]:
        a, b, y = int(g["n1"]), int(g["n2"]), int(g["n3"])
        year = y if y >= 100 else 2000 + y
        day, month = (a, b) if loc.order.startswith("D") or day_first else (b, a)
        point = date(year, month, day)
        return _Atom(s, e, point, point, "day")
    if g["dr"]:
        if g["yr"] is None and reference is None:
            return None
        year = int(g["yr"]) if g["yr"] else reference.year  # type: ignore[union-attr]
        month = loc.months[g["mr"].casefold()]
        return _Atom(s, e, date(year, month, int(g["d0"])), date(year, month, int(g["d1"])), "day")
    if g.get("mm"):
        year = int(g["y4"])
        first, last = (
            _span(year, loc.months[g["m4"].casefold()], 1)[0],
            _span(year, loc.months[g["m5"].casefold()], 1)[1],
        )
        return _Atom(s, e, first, last, "month") if first <= last else None
    if g.get("so"):
        if reference is None:
            return None
        first, last = _span(reference.year, loc.seasons[g["sw2"].casefold()], 3)
        return _Atom(m.start("sw2"), e, first, last, "season")
    if g.get("mo"):
        if reference is None:
            return None
        first, last = _span(reference.year, loc.months[g["m3"].casefold()], 1)
        return _Atom(m.start("m3"), e, first, last, "month")  # the preposition is not part of it
    if g["dmy"]:
        month_word = g["m"].casefold()
        if g["y"] is None and reference is None:
            return None
        year = int(g["y"]) if g["y"] else reference.year  # type: ignore[union-attr]
        point = date(year, loc.months[month_word], int(g["d"]))
        return _Atom(s, e, point, point, "day")
    if g["my"]:
        first, last = _span(int(g["y2"]), loc.months[g["m2"].casefold()], 1)
        first, last = _narrow(first, last, loc.modifiers.get(" ".join((g["mod"] or "").casefold().split())))
        return _Atom(s, e, first, last, "month")
    if g.get("q"):
        n = int(g["qd"]) if g.get("qd") else loc.ordinals.get(g["qn"].casefold()) or int(g["qn"][0])
        first, last = _span(int(g["qy"]), 3 * n - 2, 3)
        return _Atom(s, e, first, last, "quarter")
    if g.get("h"):
        n = loc.ordinals.get(g["hn"].casefold()) or int(g["hn"][0])
        if n not in (1, 2):
            return None
        first, last = _span(int(g["hy"]), 6 * n - 5, 6)
        return _Atom(s, e, first, last, "half")
    if g.get("s"):
        start_month = loc.seasons[g["sw"].casefold()]
        first, last = _span(int(g["sy"]), start_month, 3)
        first, last = _narrow(first, last, loc.modifiers.get(" ".join((g["smod"] or "").casefold().split())))
        return _Atom(s, e, first, last, "season")
    if g.get("c"):
        n = int(g["cn"]) if g.get("cn") else (_roman(g["cr"].upper()) if not g["cr"].isdigit() else int(g["cr"]))
        if not 1 <= n <= 21:
            return None
        return _Atom(s, e, date((n - 1) * 100 + 1, 1, 1), date(n * 100, 12, 31), "decade")
    if g.get("dec") or g.get("dec2"):
        n = int(_first(g, "dn", "dn2"))
        year = n if n >= 1000 else 1900 + n
        if year % 10:
            return None
        return _Atom(s, e, date(year, 1, 1), date(year + 9, 12, 31), "decade")
    if g.get("year"):
        year = int(g["yy"])
        first, last = _narrow(
            date(year, 1, 1), date(year, 12, 31), loc.modifiers.get(" ".join((g["ymod"] or "").casefold().split()))
        )
        return _Atom(s, e, first, last, "year")
    anchor = anchor or reference
    if anchor is not None and (g.get("later") or g.get("same") or g.get("foll")):
        unit = loc.units[_first(g, "u6", "u7", "u8", "u9").casefold()]
        n = 0 if g.get("same") else 1 if g.get("foll") else _count(_first(g, "n4"), loc)
        first, last = _shift(anchor, unit, n)
        return _Atom(s, e, first, last, unit)
    if reference is None:
        return None  # relative expressions below need an anchor
    if g.get("ago") or g.get("ago2") or g.get("ahead"):
        n = _count(_first(g, "n", "n2a", "n3a"), loc)
        unit = loc.units[_first(g, "u", "u2", "u3").casefold()]
        sign = 1 if g.get("ahead") else -1
        first, last = _shift(reference, unit, sign * n)
        return _Atom(s, e, first, last, unit, future=sign > 0)
    if g.get("rel"):
        word = _first(g, "rw", "rw2").casefold()
        unit = loc.units[_first(g, "u4", "u5").casefold()]
        sign = 1 if " ".join(word.split()) in loc.next_words else -1
        first, last = _shift(reference, unit, sign)
        return _Atom(s, e, first, last, unit, future=sign > 0)
    if g.get("deictic"):
        word = text.casefold()
        if loc.language == "german" and word in loc.tomorrow and text[0].isupper():
            return None  # "Morgen" is the morning; only lower-case "morgen" is tomorrow
        n = 0 if word in loc.today else (-1 if word in loc.yesterday else 1)
        point = reference + timedelta(days=n)
        return _Atom(s, e, point, point, "day", future=n > 0)
    return None


def _bare_year_ok(text: str, m: re.Match, loc: DateLocale) -> bool:
    """A bare 4-digit number is a year after a year word ("im", "seit", "en", "desde" ...), a
    modifier, or before punctuation; in a language whose nouns are capitalized (German), also
    before any word that is not a noun: "1939 begann" is a year, "1500 Soldaten" a count."""
    if m.group("ymod"):
        return True
    before = re.search(r"([\w.:]+)\W*$", text[max(0, m.start() - 30) : m.start()])
    if before and before.group(1).casefold().rstrip(".:") in loc.year_before:
        return True
    after = text[m.end() : m.end() + 2]
    if not after or after[0] in ".,;:)–-/\n" or text[max(0, m.start() - 1) : m.start()] in ("(", "–", "-", "/"):
        return True
    following = re.match(r"\s+(\w+)", text[m.end() : m.end() + 40])
    return loc.capitalized_nouns and following is not None and following.group(1)[0].islower()


# A full stop after a 1-2 digit number is an ordinal ("1. März"), after a single letter an initial.
# A run of marks is tried once, at its first mark (the lookbehind), so "...." stays linear.
_SENTENCE_END = re.compile(
    r"(?<![.!?])(?<!\b\d)(?<!\b\d\d)(?<!\b[A-Za-zÄÖÜäöü])[.!?]+[\"')\]»”]*\s+(?=[\"'(\[«“¿¡]?[A-ZÄÖÜÁÉÍÓÚÑ0-9])|\n[ \t]*\n"
)


def _sentences(text: str) -> list[tuple[int, int]]:
    spans, start = [], 0
    for m in _SENTENCE_END.finditer(text):
        spans.append((start, m.end()))
        start = m.end()
    if start < len(text):
        spans.append((start, len(text)))
    return spans


@_cached
def _cue_patterns(loc: DateLocale) -> re.Pattern:
    cues = sorted(
        ((role, phrase) for role, phrases in loc.cues.items() for phrase in phrases), key=lambda c: -len(c[1])
    )
    alternation = "|".join(f"(?P<{role}_{i}>{_alternation([phrase])})" for i, (role, phrase) in enumerate(cues))
    return re.compile(rf"(?<!\w)(?:{alternation})(?!\w)(?=\W*(?:\w+\W+){{0,2}}$)", re.IGNORECASE)


def _tense(loc: DateLocale, sentence: str) -> tuple[bool, bool]:
    """(speaks of the future, speaks of the past) for a whitespace-normalized sentence."""
    words = f" {sentence.casefold()} "
    return any(f" {w} " in words for w in loc.future_words), any(f" {w} " in words for w in loc.past_words)


def _role(loc: DateLocale, left: str, tense: tuple[bool, bool], atom: _Atom, reference: date | None) -> str:
    found = None
    for m in _cue_patterns(loc).finditer(left):
        found = next(name for name, value in m.groupdict().items() if value is not None).rsplit("_", 1)[0]
    if found:
        return found
    future, past = tense
    if atom.future or (future and not past):
        return "planned"
    if reference is not None and atom.first > reference and not past:
        return "planned"
    return "event"


def _merge(text: str, atoms: list[_Atom], loc: DateLocale) -> list[_Atom]:
    """Join "1914–1918", "von 1939 bis 1945", "entre 2020 y 2022" into one range."""
    merged: list[_Atom] = []
    for atom in atoms:
        prev = merged[-1] if merged else None
        if prev is not None and atom.start - prev.end <= 20:
            joiner = " ".join(text[prev.end : atom.start].split()).casefold()
            opener = re.search(r"(\w+)\s*$", text[max(0, prev.start - 15) : prev.start])
            opened = bool(opener) and opener.group(1).casefold() in loc.range_openers  # type: ignore[union-attr]
            if joiner in loc.range_joiners and prev.first <= atom.last and (joiner not in ("und", "y") or opened):
                order = ("day", "week", "month", "season", "quarter", "half", "year", "decade")
                granularity = min(prev.granularity, atom.granularity, key=order.index)
                merged[-1] = _Atom(prev.start, atom.end, prev.first, atom.last, granularity)
                continue
        merged.append(atom)
    return merged


def extract_localized(
    text: str, loc: DateLocale, reference_date: date | None = None, *, day_first: bool = True
) -> list[TemporalExpression]:
    """Every temporal expression of `text` in the language of `loc`, normalized, in text order."""
    atoms: list[_Atom] = []
    for m in _compiled(loc).finditer(text):
        if m.group("year") and not _bare_year_ok(text, m, loc):
            continue
        try:
            atom = _atom(m, loc, reference_date, day_first, atoms[-1].first if atoms else None)
        except (ValueError, KeyError, OverflowError):  # 31.02.2024, an unknown word: not a date
            atom = None
        if atom is not None:
            atoms.append(atom)
    atoms = _merge(text, atoms, loc)
    sentences = _sentences(text)
    starts = [a for a, _ in sentences]
    found: list[TemporalExpression] = []
    previous_end: dict[int, int] = {}
    normalized: dict[int, tuple[str, tuple[bool, bool]]] = {}  # once per sentence: per atom is quadratic
    for atom in atoms:
        index = max(0, bisect.bisect_right(starts, atom.start) - 1)
        s_start, s_end = sentences[index]
        left = text[max(s_start, previous_end.get(index, s_start), atom.start - _WINDOW) : atom.start]
        if index not in normalized:
            sentence = " ".join(text[s_start:s_end].split())
            normalized[index] = sentence, _tense(loc, sentence)
        sentence, tense = normalized[index]
        role = _role(loc, left, tense, atom, reference_date)
        previous_end[index] = atom.end
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
