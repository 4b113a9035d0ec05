"""Behaviour of temporal.extract beyond the case table: offsets, sentences, options, anchoring."""

from __future__ import annotations

from datetime import date, timedelta
from unittest import mock

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.models import GRANULARITIES, ROLES
from auditor.temporal import patterns as temporal_patterns
from auditor.temporal.extract import extract

REF = date(2024, 11, 1)

PASSAGE = (
    "Billing › Rates\n\nAs of Mar. 1, 2024, the base charge is $18.40. New rates take effect on "
    "July 1, 2025!\n- Applications close on Jan. 31, 2025.\n- The 2023 schedule is archived."
)


def test_offsets_index_the_text_and_order_is_text_order():
    found = extract(PASSAGE, REF)
    assert [e.expression for e in found] == ["Mar. 1, 2024", "July 1, 2025", "Jan. 31, 2025", "2023"]
    for e in found:
        assert PASSAGE[e.char_start : e.char_end] == e.expression
    assert [e.char_start for e in found] == sorted(e.char_start for e in found)


def test_sentence_of_each_expression():
    found = extract(PASSAGE, REF)
    # "Mar." does not end a sentence; list items are sentences of their own
    assert found[0].text == "As of Mar. 1, 2024, the base charge is $18.40."
    assert found[1].text == "New rates take effect on July 1, 2025!"
    assert found[2].text == "- Applications close on Jan. 31, 2025."
    assert found[3].text == "- The 2023 schedule is archived."
    assert [e.role for e in found] == ["as_of", "effective", "expires", "period"]


def test_as_json_fields_of_the_dates_command():
    (e,) = extract("Updated 2024-10-02.", REF)
    assert e.as_json() == {
        "text": "Updated 2024-10-02.",
        "expression": "2024-10-02",
        "start": "2024-10-02",
        "end": "2024-10-02",
        "granularity": "day",
        "role": "as_of",
        "type": "DATE",
        "value": "2024-10-02",
        "offsets": {"begin": 8, "end": 18},
    }


def test_relative_and_yearless_need_a_reference_date():
    text = "We posted the notice last month. The office reopens on January 6. Rates rose in March 2024."
    assert [e.expression for e in extract(text)] == ["March 2024"]
    anchored = extract(text, REF)
    assert [(e.expression, e.start, e.end) for e in anchored] == [
        ("last month", date(2024, 10, 1), date(2024, 10, 31)),
        ("January 6", date(2024, 1, 6), date(2024, 1, 6)),
        ("March 2024", date(2024, 3, 1), date(2024, 3, 31)),
    ]


def test_relative_expressions_follow_the_reference_date():
    text = "Meters were read two weeks ago and will be read again next quarter."
    first = extract(text, date(2024, 11, 1))
    later = extract(text, date(2025, 5, 20))
    assert [(e.start, e.end) for e in first] == [
        (date(2024, 10, 14), date(2024, 10, 20)),
        (date(2025, 1, 1), date(2025, 3, 31)),
    ]
    # 2025-05-20 − 14 days = 2025-05-06, a Tuesday: its ISO week runs Mon 5 May .. Sun 11 May
    assert [(e.start, e.end) for e in later] == [
        (date(2025, 5, 5), date(2025, 5, 11)),
        (date(2025, 7, 1), date(2025, 9, 30)),
    ]
    assert [e.role for e in first] == ["event", "planned"]


def test_day_first_option():
    text = "Notice dated 04/03/2025."
    assert extract(text, REF)[0].start == date(2025, 4, 3)
    assert extract(text, REF, day_first=True)[0].start == date(2025, 3, 4)
    # a part above 12 decides the order whatever the option says
    assert extract("Dated 13/03/2025.", REF)[0].start == date(2025, 3, 13)
    assert extract("Dated 03/13/2025.", REF, day_first=True)[0].start == date(2025, 3, 13)


def test_invalid_calendar_dates_are_not_dates():
    assert extract("Bills dated 2025-02-29, 31/04/2025 or April 31, 2025 do not exist.", REF) == []


def test_fiscal_year_start_option():
    text = "FY2025 budget"
    assert (extract(text, REF)[0].start, extract(text, REF)[0].end) == (date(2025, 1, 1), date(2025, 12, 31))
    october = extract(text, REF, fiscal_year_start=10)[0]
    assert (october.start, october.end) == (date(2024, 10, 1), date(2025, 9, 30))
    q2 = extract("Q2 FY2025 results", REF, fiscal_year_start=10)[0]
    assert (q2.start, q2.end, q2.granularity) == (date(2025, 1, 1), date(2025, 3, 31), "quarter")
    this_fy = extract("Budgets close at the end of this fiscal year.", REF, fiscal_year_start=7)[0]
    # 2024-11-01 lies in FY2025 = 2024-07-01..2025-06-30; its end is June 2025
    assert (this_fy.start, this_fy.end) == (date(2025, 6, 1), date(2025, 6, 30))


def test_hemisphere_option():
    north = extract("Winter 2025 outages", REF)[0]
    south = extract("Winter 2025 outages", REF, hemisphere="south")[0]
    assert (north.start, north.end) == (date(2025, 12, 1), date(2026, 2, 28))
    assert (south.start, south.end) == (date(2025, 6, 1), date(2025, 8, 31))
    with pytest.raises(ValueError, match="hemisphere"):
        extract("Winter 2025", REF, hemisphere="east")


@pytest.mark.parametrize("month", [0, 13, "7"])
def test_fiscal_year_start_must_be_a_month(month):
    with pytest.raises(ValueError, match="fiscal_year_start must be a month number 1-12"):
        extract("FY2025 budget", REF, fiscal_year_start=month)


def test_this_winter_in_january_is_the_winter_under_way():
    (e,) = extract("Frozen pipes are common this winter.", date(2025, 1, 15))
    assert (e.start, e.end) == (date(2024, 12, 1), date(2025, 2, 28))


def test_year_passes_across_a_range():
    (e,) = extract("Offices are closed from December 24 to January 2, 2025.", REF)
    assert (e.start, e.end, e.granularity) == (date(2024, 12, 24), date(2025, 1, 2), "day")
    (e,) = extract("Readings run from 28 November 2024 to 3 December.", REF)
    assert (e.start, e.end) == (date(2024, 11, 28), date(2024, 12, 3))


def test_and_joins_a_range_only_after_between():
    assert len(extract("Applications open on January 6, 2025 and close on February 14, 2025.", REF)) == 2
    (e,) = extract("Crews work between March 3, 2025 and March 7, 2025.", REF)
    assert (e.start, e.end) == (date(2025, 3, 3), date(2025, 3, 7))


def test_dateparser_sees_only_spans():
    calls = []
    real = temporal_patterns.dateparser_span.__wrapped__

    def spy(span, reference):
        calls.append(span)
        return real(span, reference)

    temporal_patterns.dateparser_span.cache_clear()
    with mock.patch.object(temporal_patterns, "dateparser_span", spy):
        text = "We may call you. The sun is out. Your meter was read 3 days ago; a crew comes in two weeks."
        found = extract(text, REF)
    assert calls == ["3 days ago", "in 2 weeks"]
    assert [(e.expression, e.start) for e in found] == [
        ("3 days ago", date(2024, 10, 29)),
        ("in two weeks", date(2024, 11, 11)),
    ]


def test_dateparser_span_cache_is_keyed_by_reference():
    temporal_patterns.dateparser_span.cache_clear()
    assert temporal_patterns.dateparser_span("3 days ago", date(2024, 3, 1)) == date(2024, 2, 27)  # leap year
    assert temporal_patterns.dateparser_span("3 days ago", date(2023, 3, 1)) == date(2023, 2, 26)
    assert temporal_patterns.dateparser_span("3 days ago", date(2024, 3, 1)) == date(2024, 2, 27)
    assert temporal_patterns.dateparser_span.cache_info().hits == 1


def test_empty_and_dateless_text():
    assert extract("", REF) == []
    assert extract("Call us to set up a payment plan.", REF) == []


def test_relative_month_names():
    found = extract("Rates rose last March and will rise again next July; this July is quiet.", REF)
    assert [(e.expression, e.start, e.end) for e in found] == [
        ("last March", date(2024, 3, 1), date(2024, 3, 31)),
        ("next July", date(2025, 7, 1), date(2025, 7, 31)),
        ("this July", date(2024, 7, 1), date(2024, 7, 31)),
    ]
    # "may" after "this" is the verb; what is left is the duration, written as TimeML annotates
    # "a few weeks" (TimeML Annotation Guidelines 1.2.1: value "PXW"; from memory)
    found = extract("This may take a few days. The next may be sooner.", REF)
    assert [(e.expression, e.timex_type, e.value) for e in found] == [("a few days", "DURATION", "PXD")]


def test_short_year_range_is_the_fiscal_year_when_one_is_configured():
    calendar_years = extract("Residential Water Rates 2025–26", REF)[0]
    assert (calendar_years.start, calendar_years.end) == (date(2025, 1, 1), date(2026, 12, 31))
    fiscal = extract("Residential Water Rates 2025–26", REF, fiscal_year_start=7)[0]
    assert (fiscal.start, fiscal.end, fiscal.granularity) == (date(2025, 7, 1), date(2026, 6, 30), "year")
    assert extract("Rates 2025–27", REF) == []  # a short form names consecutive years only


def test_metadata_style_cues():
    roles = [e.role for e in extract("last_reviewed: 2026-08-03\nLast modified on 3 May 2024.", REF)]
    assert roles == ["as_of", "as_of"]


def test_publication_year_in_parentheses_is_other():
    (e,) = extract("See AWWA Manual M36, 4th edition (2016).", REF)
    assert (e.expression, e.role) == ("2016", "other")


# Arbitrary text, with date-like pieces mixed in, never breaks the extractor and always yields
# well-formed expressions.
_PIECES = st.sampled_from(
    [
        "March",
        "May",
        "2024",
        "-",
        "–",
        "/",
        "Q3",
        "FY",
        "winter",
        "next",
        "ago",
        "two",
        "weeks",
        "the",
        "end of",
        "12",
        "31",
        "02/29/",
        ", ",
        " ",
        ".",
        "\n",
        "W53",
        "(",
        ")",
        "through",
        "from",
        "to",
        "and",
        "between",
        "early",
        "mid-",
        "'90s",
        "1990s",
    ]
)


@settings(max_examples=300, deadline=None)
@given(st.lists(st.one_of(_PIECES, st.text(max_size=6)), max_size=30), st.booleans(), st.booleans())
def test_any_text_yields_well_formed_expressions(pieces, with_reference, day_first):
    text = "".join(pieces)
    for e in extract(text, REF if with_reference else None, day_first=day_first, fiscal_year_start=4):
        assert text[e.char_start : e.char_end] == e.expression
        assert e.start <= e.end
        assert e.granularity in GRANULARITIES and e.role in ROLES
        assert e.expression.strip() and e.expression in text


def test_as_of_cue_must_govern_the_date():
    # "updated" as an adjective with its own verb before the date is no as-of statement
    assert [e.role for e in extract("Updated meters were installed in 2019.", REF)] == ["event"]
    assert [e.role for e in extract("Conservation Programs reviewed this guide in January 2024.", REF)] == ["as_of"]


def test_weak_cues_in_context():
    roles = lambda text: [e.role for e in extract(text, REF)]  # noqa: E731
    # a participle before the cue does not make the sentence past tense
    assert roles("New accounts opened from 1 July 2024 pay a deposit.") == ["effective"]
    # "after" with a refusal is a deadline
    assert roles("Applications received after 30 April 2025 cannot be considered.") == ["expires"]
    # a reference point in a future sentence is no planned event
    assert roles("Laptops bought before 2020 will be replaced next spring.") == ["event", "planned"]
    # present perfect with "since" is a lasting state
    assert roles("Single sign-on has been required since last year.") == ["effective"]


def test_counts_of_people_are_not_years():
    assert extract("A total of 1968 men and 1737 women took part.", REF) == []
    assert extract("We surveyed 2010 customers in 2011.", REF)[0].expression == "2011"


def test_parenthesized_rolling_period_is_not_a_citation():
    (e,) = extract("Tests were counted (past 5 years) for each account.", REF)
    assert (e.expression, e.role) == ("past 5 years", "event")
    (e,) = extract("Data from the first visit (1987-1989) are used.", REF)
    assert e.role != "other"


def test_two_digit_years_pivot_like_posix_strptime():
    # POSIX strptime %y: 69–99 are 1969–1999, 00–68 are 2000–2068
    assert extract("Bills dated 3/4/99 were archived.", REF)[0].start == date(1999, 3, 4)
    assert extract("Bills dated 3/4/25 are due.", REF)[0].start == date(2025, 3, 4)
    assert extract("The FY99 audit", REF)[0].start == date(1999, 1, 1)


def test_lower_case_month_names_except_the_verbs():
    assert [e.start for e in extract("updated january 5, 2024 and june 2024.", REF)] == [
        date(2024, 1, 5),
        date(2024, 6, 1),
    ]
    # no month among the verbs and nouns; the frequency is a SET, as TimeML annotates "twice a
    # week" (TimeML Annotation Guidelines 1.2.1: value "P1W", freq "2X"; from memory)
    found = extract("Crews may 5 times a day march 12 blocks and mar 2 walls.", REF)
    assert [(e.expression, e.timex_type, e.value) for e in found] == [("5 times a day", "SET", "P1D")]


def test_weekdays_read_by_the_nearest_tense_word():
    # docs/dates.md, year-inference rule 2: the tense word nearest each weekday decides; expected
    # days by Python's date arithmetic from the reference date, a Wednesday
    reference = date(2026, 11, 18)
    assert reference.weekday() == 2
    found = extract("He said on Monday that the plant will reopen on Friday.", reference)
    assert [(e.expression, e.start) for e in found] == [
        ("Monday", reference - timedelta(days=2)),
        ("Friday", reference + timedelta(days=2)),
    ]


def test_yearless_day_near_the_reference_date_keeps_its_year():
    # docs/dates.md, year-inference rule 4: within 45 days of the reference date the reference
    # year stands whatever the tense; further ahead in a past-tense sentence it is the year before
    reference = date(1989, 11, 2)
    (near,) = extract("The offer had been set to expire Nov. 6.", reference)
    assert near.start == reference + timedelta(days=4)
    (far,) = extract("The plant closed on Dec. 20.", reference)
    assert far.start == date(reference.year - 1, 12, 20)
    assert (date(reference.year, 12, 20) - reference).days > 45


def test_clock_time_before_a_yearless_day_is_one_time():
    # TIMEX3 TIME value: the day and the time of day in ISO 8601's extended form YYYY-MM-DDThh:mm;
    # the day is the reference year's, 7 days ahead by date arithmetic (docs/dates.md, rule 4)
    reference = date(1989, 11, 2)
    (e,) = extract("The offer expires at 5 p.m. EST, Nov. 9.", reference)
    day = reference + timedelta(days=7)
    assert (e.expression, e.timex_type, e.value) == ("5 p.m. EST, Nov. 9", "TIME", f"{day.isoformat()}T17:00")
    assert (e.start, e.role) == (day, "expires")
