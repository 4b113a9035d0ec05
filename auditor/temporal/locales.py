"""Date words per language (docs/languages.md): one data file per language, no code.

What a language's dates look like comes from two places:

* CLDR, the Unicode Common Locale Data Repository, through Babel: month names (wide and
  abbreviated, format and stand-alone forms), the order of day, month and year in a
  numeric date and its separator (the locale's short date pattern, e.g. de "dd.MM.yy", es
  "d/M/yy"), the words that join day, month and year in a written date (the long pattern: de
  "d. MMMM y", es "d 'de' MMMM 'de' y") and the quarter names ("3. Quartal", "3.er trimestre");
* auditor/temporal/languages/<code>.toml, written and tested by us: the cue words that give a
  date its role (as of, effective, expires, planned), the words of relative expressions ("vor
  zwei Wochen", "hace dos semanas"), number and ordinal words, seasons, modifiers ("Anfang",
  "a finales de") and the prepositions after which a bare year is a year.

Adding a language is adding its TOML file (the keys of de.toml, with `locale` naming the CLDR
locale and `language` the Snowball name); `locale_for` finds it by either name.
"""

from __future__ import annotations

import functools
import re
import tomllib
from dataclasses import dataclass
from pathlib import Path

from babel import Locale as CldrLocale
from babel.dates import get_date_format, get_month_names, get_quarter_names

from auditor.errors import ConfigError

FOLDER = Path(__file__).with_name("languages")
ROLE_CUES = ("as_of", "effective", "expires", "planned")


@dataclass(frozen=True)
class DateLocale:
    """Everything the localized extractor needs for one language (auditor/temporal/localized.py)."""

    language: str  # Snowball name, e.g. "german"
    code: str  # CLDR locale, e.g. "de"
    months: dict[str, int]  # casefolded name or abbreviation (without its dot) -> 1..12
    full_months: tuple[tuple[str, int], ...]  # the wide names only: safe without a day or year
    month_before: tuple[str, ...]  # words after which a month name alone is a month ("im Mai")
    capitalized_nouns: bool  # German: a capitalized word after a number is the thing counted
    order: str  # "DMY", "MDY" or "YMD": the numeric date order of the locale's short pattern
    separators: str  # characters that separate the parts of a numeric date
    day_suffix: str  # what follows the day in a written date: "." in German, "" in Spanish
    day_month_joiner: str  # "de" in Spanish, "" in German
    month_year_joiner: str
    quarter_words: tuple[str, ...]  # "quartal", "trimestre"
    half_words: tuple[str, ...]
    ordinals: dict[str, int]  # casefolded ordinal word -> 1..4
    numbers: dict[str, int]  # casefolded number word -> value
    units: dict[str, str]  # casefolded unit word -> day | week | month | year
    ago_before: tuple[str, ...]  # "vor", "hace"
    ago_after: tuple[str, ...]
    ahead_before: tuple[str, ...]  # "in", "dentro de"
    today: tuple[str, ...]
    yesterday: tuple[str, ...]
    tomorrow: tuple[str, ...]
    next_words: tuple[str, ...]
    later_after: tuple[str, ...]  # "zwei Tage später": counted from the expression before
    same: tuple[str, ...]  # "am selben Tag"
    following: tuple[str, ...]  # "am folgenden Tag", "al día siguiente"
    last_words: tuple[str, ...]
    seasons: dict[str, int]  # casefolded season word -> first month (northern hemisphere)
    modifiers: dict[str, str]  # casefolded phrase -> early | mid | late
    year_before: tuple[str, ...]  # words after which a bare 4-digit number is a year
    century_words: tuple[str, ...]
    decade_suffixes: tuple[str, ...]
    cues: dict[str, tuple[str, ...]]  # role -> phrases, casefolded
    future_words: tuple[str, ...]
    past_words: tuple[str, ...]
    range_joiners: tuple[str, ...]
    range_openers: tuple[str, ...]


def _words(raw: dict, key: str, source: Path) -> tuple[str, ...]:
    value = raw.get(key, [])
    if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
        raise ConfigError(f"{str(source)!r}: {key} must be a list of strings")
    return tuple(v.casefold() for v in value)


def _mapping(raw: dict, key: str, source: Path) -> dict:
    value = raw.get(key, {})
    if not isinstance(value, dict):
        raise ConfigError(f"{str(source)!r}: {key} must be a table")
    return {str(k).casefold(): v for k, v in value.items()}


def _order(pattern: str) -> tuple[str, str]:
    """("DMY", separators) from a CLDR short date pattern such as "dd.MM.yy" or "M/d/yy"."""
    order = "".join(dict.fromkeys(c.upper() for c in pattern if c in "dMy"))
    seps = "".join(dict.fromkeys(c for c in pattern if c in "./-"))
    return order, seps or "/"


def _joiners(pattern: str) -> tuple[str, str, str]:
    """(day suffix, day-month joiner, month-year joiner) from a CLDR long date pattern."""
    day = re.search(r"d+(\.?)", pattern)
    day_suffix = day.group(1) if day else ""
    between = re.search(r"d+\.?\s*((?:'[^']*'\s*)*)M", pattern)
    after = re.search(r"M+\s*((?:'[^']*'\s*)*)y", pattern)

    def literal(m):
        return " ".join(p.strip("'") for p in re.findall(r"'[^']*'", m.group(1))) if m else ""

    return day_suffix, literal(between), literal(after)


def load(source: Path) -> DateLocale:
    """Read one language file and fill in its CLDR data."""
    try:
        raw = tomllib.loads(source.read_text(encoding="utf-8"))
    except (OSError, tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise ConfigError(f"{str(source)!r}: cannot read the date words ({exc})") from exc
    code, language = raw.get("locale"), raw.get("language")
    if not isinstance(code, str) or not isinstance(language, str):
        raise ConfigError(f"{str(source)!r}: needs `locale` (a CLDR locale) and `language` (a Snowball name)")
    try:
        cldr = CldrLocale.parse(code)
    except (ValueError, LookupError) as exc:
        raise ConfigError(f"{str(source)!r}: unknown CLDR locale {code!r}") from exc
    months: dict[str, int] = {}
    for width in ("wide", "abbreviated"):
        for context in ("format", "stand-alone"):
            for number, name in get_month_names(width, context, cldr).items():
                months[name.casefold().rstrip(".")] = number
    full = tuple((name.casefold(), number) for number, name in get_month_names("wide", "format", cldr).items())
    for name, number in _mapping(raw, "extra_months", source).items():
        months[name] = int(number)
    order, separators = _order(get_date_format("short", cldr).pattern)
    day_suffix, day_month, month_year = _joiners(get_date_format("long", cldr).pattern)
    # The quarter noun is the word of CLDR's wide quarter name that is not the number ("3. Quartal").
    quarter_nouns = {w.casefold() for q in get_quarter_names("wide", "format", cldr).values() for w in q.split()}
    quarter_words = tuple(sorted({w for w in quarter_nouns if w.isalpha()} | set(_words(raw, "quarter_words", source))))
    cues = {role: _words(raw.get("cues", {}), role, source) for role in ROLE_CUES}
    return DateLocale(
        language=language,
        code=code,
        months=months,
        full_months=full,
        month_before=_words(raw, "month_before", source),
        capitalized_nouns=bool(raw.get("capitalized_nouns", False)),
        order=order,
        separators=separators,
        day_suffix=day_suffix,
        day_month_joiner=day_month.casefold(),
        month_year_joiner=month_year.casefold(),
        quarter_words=quarter_words,
        half_words=_words(raw, "half_words", source),
        ordinals={k: int(v) for k, v in _mapping(raw, "ordinals", source).items()},
        numbers={k: int(v) for k, v in _mapping(raw, "numbers", source).items()},
        units={k: str(v) for k, v in _mapping(raw, "units", source).items()},
        ago_before=_words(raw, "ago_before", source),
        ago_after=_words(raw, "ago_after", source),
        ahead_before=_words(raw, "ahead_before", source),
        today=_words(raw, "today", source),
        yesterday=_words(raw, "yesterday", source),
        tomorrow=_words(raw, "tomorrow", source),
        next_words=_words(raw, "next", source),
        later_after=_words(raw, "later_after", source),
        same=_words(raw, "same", source),
        following=_words(raw, "following", source),
        last_words=_words(raw, "last", source),
        seasons={k: int(v) for k, v in _mapping(raw, "seasons", source).items()},
        modifiers={k: str(v) for k, v in _mapping(raw, "modifiers", source).items()},
        year_before=_words(raw, "year_before", source),
        century_words=_words(raw, "century_words", source),
        decade_suffixes=_words(raw, "decade_suffixes", source),
        cues=cues,
        future_words=_words(raw, "future_words", source),
        past_words=_words(raw, "past_words", source),
        range_joiners=_words(raw, "range_joiners", source),
        range_openers=_words(raw, "range_openers", source),
    )


@functools.cache
def available() -> dict[str, Path]:
    """Language files by Snowball name and by CLDR locale."""
    found: dict[str, Path] = {}
    for file in sorted(FOLDER.glob("*.toml")):
        raw = tomllib.loads(file.read_text(encoding="utf-8"))
        for key in ("language", "locale"):
            if isinstance(raw.get(key), str):
                found[raw[key]] = file
    return found


@functools.cache
def locale_for(language: str) -> DateLocale | None:
    """The date words of `language` (Snowball name or CLDR locale), or None when none ship."""
    file = available().get(language)
    return load(file) if file else None
