"""Property-based tests of the temporal extractor: any text gives well-formed expressions (or none),
never an exception, in bounded time.

The invariants are the contract of `temporal.extract` (docs/dates.md; `models.TemporalExpression`):
offsets index the scanned text and cut out exactly the expression as written, intervals are ordered,
granularity and role come from the registries in `models`, expressions come in text order.
"""

from __future__ import annotations

import re
from datetime import date

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from auditor.errors import AuditorError
from auditor.models import GRANULARITIES, ROLES, TIMEX_TYPES, TemporalExpression
from auditor.temporal.extract import extract
from tests.cpu_budget import cpu_seconds, run_in_budget

# Tokens that steer the generator into the extractor's patterns: month and weekday names in several
# cases, numbers that look like days, years, ISO and numeric dates, quarters, fiscal years, seasons,
# relative words, range words and the role cues (docs/dates.md lists these forms).
TOKENS = [
    "January",
    "MARCH",
    "march",
    "May",
    "may",
    "Sept.",
    "Dec",
    "Monday",
    "Tue.",
    "1",
    "5th",
    "31",
    "29",
    "0",
    "00",
    "2024",
    "1999",
    "2100",
    "24",
    "'24",
    "2024-02-29",
    "2023-02-29",
    "2024-13-01",
    "2024-W53-7",
    "2024-366",
    "03/04/2025",
    "31.12.2024",
    "3/4/25",
    "Q3",
    "Q5",
    "H1",
    "FY2025",
    "FY 2024-25",
    "fiscal year",
    "spring",
    "Winter",
    "the 1990s",
    "'90s",
    "mid-",
    "early",
    "late",
    "end of",
    "last",
    "next",
    "this",
    "two",
    "weeks",
    "months",
    "ago",
    "in",
    "yesterday",
    "tomorrow",
    "Friday",
    "Mondays",
    "every",
    "daily",
    "now",
    "currently",
    "three",
    "days",
    "hours",
    "10:35",
    "a.m.",
    "p.m.",
    "noon",
    "morning",
    "quarter",
    "third-quarter",
    "recent",
    "a year earlier",
    "annually in April",
    "from",
    "to",
    "until",
    "through",
    "between",
    "and",
    "-",
    "–",
    "/",
    ".",
    ",",
    ";",
    "(",
    ")",
    "©",
    "as of",
    "effective",
    "expires",
    "will",
    "was",
    "scheduled",
    "rates",
    "report",
    "Version",
    "v",
    "page",
    "$",
    "%",
    "\n",
    "\n\n",
    " ",
    "  ",
    "\t",
    "é",
    "٣",
    "２０２４",
]
texts = st.one_of(
    st.lists(st.sampled_from(TOKENS), max_size=40).map(" ".join),
    st.lists(st.sampled_from(TOKENS), max_size=40).map("".join),
    st.text(max_size=200),
)
options = st.fixed_dictionaries(
    {
        "reference_date": st.one_of(st.none(), st.dates(min_value=date(1900, 1, 1), max_value=date(2100, 12, 31))),
        "day_first": st.booleans(),
        "fiscal_year_start": st.integers(1, 12),
        "hemisphere": st.sampled_from(["north", "south"]),
    }
)


PARAGRAPH_BREAK = re.compile(r"\n[ \t]*\n")


def check(text: str, found) -> None:
    previous = -1
    for e in found:
        assert 0 <= e.char_start < e.char_end <= len(text)
        assert text[e.char_start : e.char_end] == e.expression
        assert e.start <= e.end
        assert e.granularity in GRANULARITIES
        assert e.role in ROLES
        assert e.char_start >= previous
        previous = e.char_start
        assert e.timex_type in TIMEX_TYPES
        # The sentence is whitespace-normalized text around the expression (docs/dates.md), and no
        # expression spans a paragraph break (test_an_expression_never_spans_a_paragraph_break)
        assert not PARAGRAPH_BREAK.search(e.expression)
        assert " ".join(e.expression.split()) in e.text


@settings(max_examples=400, deadline=None, derandomize=True, suppress_health_check=[HealthCheck.too_slow])
@given(texts, options)
def test_any_text_gives_well_formed_expressions(text, kwargs):
    try:
        found = extract(text, **kwargs)
    except AuditorError:
        return
    check(text, found)


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.lists(st.sampled_from(TOKENS), min_size=200, max_size=600).map(" ".join), options)
def test_long_token_soup_is_well_formed_and_fast(text, kwargs):
    check(text, extract(text, **kwargs))


SIZE = 100_000  # the project's adversarial input size (DEVELOPERS.md)
# A generous bound: linear work over 100 KB with thousands of expressions takes well under a second
# here; the quadratic cases below take 5-10 s.
BUDGET_S = 3.0


def repeat(unit: str, size: int = SIZE) -> str:
    return (unit * (size // len(unit) + 1))[:size]


@pytest.mark.parametrize(
    "unit",
    [
        "In 2024 we met. ",
        "Rates changed on 5 March 2024. ",
        "Q3 2024 ended. ",
        ".",
        " ",
        "1-",
        "1/1/",
        "2024",
        "March ",
        "early ",
        "(((",
        "\n\n",
        "the end of the ",
        "99999999 ",
    ],
)
def test_adversarial_100_kb_inputs_finish_in_time(unit):
    text = repeat(unit)
    found, seconds = run_in_budget(lambda: extract(text, date(2025, 1, 1)), BUDGET_S)  # in a child process
    assert seconds < BUDGET_S
    check(text, found[:50])


@pytest.mark.parametrize("unit", ["March 5 ", "In 2024 we "])
def test_one_sentence_of_100_kb_with_thousands_of_dates_finishes_in_time(unit):
    # A passage is at most 250 words, but a "word" has no length limit: text without spaces or
    # sentence ends (a table flattened by a PDF extractor, a CSV pasted into a page) stays one
    # sentence. 100 KB of it holds about 10,000 expressions.
    text = repeat(unit)
    assert cpu_seconds(lambda: extract(text, date(2025, 1, 1)), BUDGET_S) < BUDGET_S


@pytest.mark.parametrize(
    "text",
    [
        "Meter readings are taken in January\n\n2024 rates apply from April.",
        "Closed on March 5\n\n2025 was a good year.",
    ],
)
def test_an_expression_never_spans_a_paragraph_break(text):
    # A paragraph break ends a sentence (temporal._sentences); an expression lies inside one sentence.
    for e in extract(text, date(2025, 1, 1)):
        assert not PARAGRAPH_BREAK.search(e.expression), e


def test_check_rejects_an_expression_across_a_paragraph_break():
    # the invariant is checked for every expression again (an exemption used to skip the sentence
    # check for expressions spanning a paragraph break, after that bug was fixed)
    text = "Closed on March 5\n\n2025 was a good year."
    spanning = TemporalExpression(
        "Closed on March 5", text[10:22], date(2025, 3, 5), date(2025, 3, 5), "day", "event", 10, 22
    )
    with pytest.raises(AssertionError):
        check(text, [spanning])
