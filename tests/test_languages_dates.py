"""Dates in German and Spanish knowledge-base sentences: the span, its interval, its role and what
it does to a passage's freshness (docs/languages.md, docs/dates.md).

Sources: month names, the day-month-year order and the "de" joiner are CLDR's (through Babel,
checked against Babel directly below); the calendar arithmetic is the standard library's. The
sentences are the kinds the language work was asked to read ("Stand: 1. März 2026", "ab dem 1.
Januar 2027", "seit Oktober 2025", "im dritten Quartal 2025", "vor zwei Wochen", "3 de marzo de
2026", "válida hasta el 31 de diciembre de 2024", "tercer trimestre de 2025", "hace dos
semanas"); their expected values are worked out by hand from the calendar.
"""

from __future__ import annotations

from datetime import date

import pytest
from babel.dates import get_date_format, get_month_names

from auditor.errors import ConfigError
from auditor.judgement.freshness import passage_freshness
from auditor.temporal import locales
from auditor.temporal.extract import extract
from auditor.temporal.localized import extract_localized
from tests.cpu_budget import cpu_seconds

REFERENCE = date(2026, 3, 15)  # a Sunday

GERMAN = [
    ("Stand: 1. März 2026", "1. März 2026", date(2026, 3, 1), date(2026, 3, 1), "day", "as_of"),
    (
        "Der neue Grundpreis gilt ab dem 1. Januar 2027.",
        "1. Januar 2027",
        date(2027, 1, 1),
        date(2027, 1, 1),
        "day",
        "effective",
    ),
    (
        "Seit Oktober 2025 ist das Kundenportal umgestellt.",
        "Oktober 2025",
        date(2025, 10, 1),
        date(2025, 10, 31),
        "month",
        "effective",
    ),
    (
        "Die Zählerumstellung erfolgte im dritten Quartal 2025.",
        "dritten Quartal 2025",
        date(2025, 7, 1),
        date(2025, 9, 30),
        "quarter",
        "event",
    ),
    # ISO weeks: 14 days before Sunday 15 March is Sunday 1 March, in the week of Monday 23 February.
    (
        "Wir haben die Tarife vor zwei Wochen angepasst.",
        "vor zwei Wochen",
        date(2026, 2, 23),
        date(2026, 3, 1),
        "week",
        "event",
    ),
    ("Das Angebot ist gültig bis 31.12.2024.", "31.12.2024", date(2024, 12, 31), date(2024, 12, 31), "day", "expires"),
    (
        "Die Ablesung am 15.07.2025 ergab keinen Fehler.",
        "15.07.2025",
        date(2025, 7, 15),
        date(2025, 7, 15),
        "day",
        "event",
    ),
    (
        "Die Wartung ist für den 2026-04-10 geplant.",
        "2026-04-10",
        date(2026, 4, 10),
        date(2026, 4, 10),
        "day",
        "planned",
    ),
    (
        "Die Preise werden im zweiten Halbjahr 2026 steigen.",
        "zweiten Halbjahr 2026",
        date(2026, 7, 1),
        date(2026, 12, 31),
        "half",
        "planned",
    ),
    (
        "Anfang 2025 stellten wir auf Monatsrechnungen um.",
        "Anfang 2025",
        date(2025, 1, 1),
        date(2025, 4, 30),
        "year",
        "event",
    ),
]

SPANISH = [
    ("Actualizado el 3 de marzo de 2026.", "3 de marzo de 2026", date(2026, 3, 3), date(2026, 3, 3), "day", "as_of"),
    (
        "La tarifa es válida hasta el 31 de diciembre de 2024.",
        "31 de diciembre de 2024",
        date(2024, 12, 31),
        date(2024, 12, 31),
        "day",
        "expires",
    ),
    (
        "El cambio de contadores se hizo en el tercer trimestre de 2025.",
        "tercer trimestre de 2025",
        date(2025, 7, 1),
        date(2025, 9, 30),
        "quarter",
        "event",
    ),
    (
        "Cambiamos la factura hace dos semanas.",
        "hace dos semanas",
        date(2026, 2, 23),
        date(2026, 3, 1),
        "week",
        "event",
    ),
    (
        "A partir del 1 de enero de 2027 sube la cuota fija.",
        "1 de enero de 2027",
        date(2027, 1, 1),
        date(2027, 1, 1),
        "day",
        "effective",
    ),
    (
        "Desde octubre de 2025 el portal es nuevo.",
        "octubre de 2025",
        date(2025, 10, 1),
        date(2025, 10, 31),
        "month",
        "effective",
    ),
    (
        "El próximo mes habrá un corte de agua programado.",
        "El próximo mes",
        date(2026, 4, 1),
        date(2026, 4, 30),
        "month",
        "planned",
    ),
    ("La lectura del 15/07/2025 fue correcta.", "15/07/2025", date(2025, 7, 15), date(2025, 7, 15), "day", "event"),
    ("A finales de 2019 se renovó la red.", "A finales de 2019", date(2019, 9, 1), date(2019, 12, 31), "year", "event"),
    (
        "Entre 2020 y 2022 hubo obras en la planta.",
        "2020 y 2022",
        date(2020, 1, 1),
        date(2022, 12, 31),
        "year",
        "event",
    ),
]


@pytest.mark.parametrize("language,case", [("german", c) for c in GERMAN] + [("spanish", c) for c in SPANISH])
def test_sentence_kinds(language, case):
    sentence, span, start, end, granularity, role = case
    found = extract(sentence, REFERENCE, language=language)
    assert [(e.expression, e.start, e.end, e.granularity, e.role) for e in found] == [
        (span, start, end, granularity, role)
    ]
    assert sentence[found[0].char_start : found[0].char_end] == span


def _fresh(sentence: str, language: str, audit: date, horizon: int = 365):
    return passage_freshness(
        extract(sentence, date(2024, 1, 10), language=language),
        audit_date=audit,
        horizon_days=horizon,
        doc_date=date(2024, 1, 10),
        doc_date_source="front_matter:updated",
    )


def test_freshness_effects():
    # An as-of statement dates the passage: two years later it is too old for a one-year horizon.
    stale = _fresh("Stand: 1. März 2024. Der Grundpreis beträgt 12 Euro.", "german", date(2026, 3, 15))
    assert (stale.as_of, stale.fresh, stale.reasons) == (date(2024, 3, 1), False, ("too_old",))
    # An expiry that has passed makes the passage expired.
    expired = _fresh("La oferta es válida hasta el 31 de diciembre de 2024.", "spanish", date(2025, 6, 1), 3650)
    assert (expired.expires, expired.fresh, expired.reasons) == (date(2024, 12, 31), False, ("expired",))
    # Before the expiry the same passage is fresh.
    assert _fresh("La oferta es válida hasta el 31 de diciembre de 2024.", "spanish", date(2024, 6, 1), 3650).fresh
    # An effective month that has begun dates the passage by its last day (docs/freshness.md).
    effective = _fresh("Seit Oktober 2025 gilt der neue Abschlag.", "german", date(2026, 3, 15))
    assert effective.as_of == date(2025, 10, 31) and effective.fresh


def test_counts_and_anaphora_are_not_dates():
    # "1500 Zähler" counts meters; "1968 wurden" is a year (German nouns are capitalized).
    found = extract("Wir tauschten 1500 Zähler. 1968 wurden die ersten Leitungen gelegt.", REFERENCE, language="german")
    assert [e.expression for e in found] == ["1968"]
    # "Morgen" is the morning; "morgen" is tomorrow.
    found = extract("Am Morgen ist die Hotline frei; morgen ist sie geschlossen.", REFERENCE, language="german")
    assert [(e.expression, e.start) for e in found] == [("morgen", date(2026, 3, 16))]
    # "zwei Tage später" counts from the expression before it, not from the reference date.
    found = extract(
        "Am 3. Mai 2025 fiel die Pumpe aus. Zwei Tage später lief sie wieder.", REFERENCE, language="german"
    )
    assert [e.start for e in found] == [date(2025, 5, 3), date(2025, 5, 5)]


def test_no_reference_date_drops_relative_expressions():
    found = extract("Hace dos semanas cambió. Desde el 3 de marzo de 2026 rige.", None, language="spanish")
    assert [e.expression for e in found] == ["3 de marzo de 2026"]


def test_impossible_dates_are_not_dates():
    assert extract("Am 31.02.2024 und am 30. Februar 2024", REFERENCE, language="german") == []


def test_locale_data_comes_from_cldr():
    # Babel's CLDR data is the reference: every wide month name maps to its number.
    for language, code in (("german", "de"), ("spanish", "es")):
        words = locales.locale_for(language)
        assert words is not None and words.code == code
        for number, name in get_month_names("wide", locale=code).items():
            assert words.months[name.casefold()] == number
    german, spanish = locales.locale_for("german"), locales.locale_for("es")
    assert german.order == "DMY" and "." in german.separators  # CLDR de short: dd.MM.yy
    assert get_date_format("short", locale="de").pattern == "dd.MM.yy"
    assert spanish.day_month_joiner == "de" and spanish.month_year_joiner == "de"  # d 'de' MMMM 'de' y
    assert "quartal" in german.quarter_words and "trimestre" in spanish.quarter_words


def test_english_is_untouched_and_unknown_languages_fall_back():
    english = extract("Updated 1 March 2026.", REFERENCE)
    assert [(e.expression, e.role) for e in english] == [("1 March 2026", "as_of")]
    # No date file for Finnish: the English extractor reads it (ISO dates still work).
    assert [e.expression for e in extract("Päivitetty 2026-03-01.", REFERENCE, language="finnish")] == ["2026-03-01"]


def test_a_broken_language_file_is_a_clear_error(tmp_path):
    bad = tmp_path / "xx.toml"
    bad.write_text('locale = "zz-nowhere"\nlanguage = "nowhere"\n', encoding="utf-8")
    with pytest.raises(ConfigError, match=r"xx\.toml'.*unknown CLDR locale"):
        locales.load(bad)
    bad.write_text("locale = ", encoding="utf-8")
    with pytest.raises(ConfigError, match=r"xx\.toml'.*cannot read"):
        locales.load(bad)


def test_adding_a_language_is_one_file(tmp_path):
    # A French file with only the required keys: CLDR supplies month names and the date order.
    french = tmp_path / "fr.toml"
    french.write_text('locale = "fr"\nlanguage = "french"\n[cues]\nas_of = ["mis à jour le"]\n', encoding="utf-8")
    words = locales.load(french)
    found = extract_localized("Mis à jour le 3 mars 2026.", words, REFERENCE)
    assert [(e.expression, e.start, e.role) for e in found] == [("3 mars 2026", date(2026, 3, 3), "as_of")]


@pytest.mark.parametrize("language", ["german", "spanish"])
@pytest.mark.parametrize(
    "unit",
    [
        "Stand: 1. März 2026. ",
        "el 3 de marzo de 2026 ",
        "vor zwei Wochen hace dos semanas ",
        "1.1.",
        "27./28. ",
        "de de de ",
        "...",
        "!!!",
        "2024 ",
        "Anfang Mitte Ende a finales de ",
        "im Mai im ",
        "\n\n",
        "99999999 ",
    ],
)
def test_adversarial_100_kb_inputs_finish_in_time(language, unit):
    # Common practice for backtracking regex engines (see tests/test_regex_budget.py): repeated
    # units of the patterns' own words must stay linear. CPU time, so a busy machine is no flake.
    text = (unit * (100_000 // len(unit) + 1))[:100_000]
    found = []
    seconds = cpu_seconds(lambda: found.extend(extract(text, REFERENCE, language=language)), 5.0)
    assert seconds < 5.0
    for e in found[:50]:
        assert e.start <= e.end and text[e.char_start : e.char_end] == e.expression
