"""Answer-type cues: what kind of answer a question asks for, and whether a text holds one.

A "when" question is not answered by a passage that never names a date, however many of the
question's words it shares. These cues are deliberately cheap (a few regular expressions over the
question and over one sentence window), so they can run on every retrieved passage of a large
corpus. The question-word → answer-type mapping follows the coarse classes of Li & Roth, "Learning
Question Classifiers" (COLING 2002): NUM:date, NUM:money/count, NUM:period, HUM, LOC. The cue
lists below are common practice, written from memory, not taken from that paper.
"""

from __future__ import annotations

import re

ANSWER_TYPES = ("date", "amount", "duration", "name", "place")

# Question patterns, tried in order: "how long" must win over "how", "what time" over "what".
_QUESTION_CUES: list[tuple[str, re.Pattern]] = [
    (
        "duration",
        re.compile(
            r"\bhow\s+(long|soon|often|quickly|fast)\b|\bfor\s+how\s+many\s+(days|weeks|months|years|hours)\b", re.I
        ),
    ),
    (
        "amount",
        re.compile(
            r"\bhow\s+(much|many)\b|\bwhat\s+(is|are)\s+the\s+(cost|price|fee|fees|rate|rates|charge|charges|amount)\b"
            r"|\bwhat\s+(does|do|will|would)\b[^?]*\bcost\b",
            re.I,
        ),
    ),
    (
        "date",
        re.compile(
            r"^\s*when\b|\b(by|until|since)\s+when\b|\bwhat\s+(date|day|time|year|month|hours)\b"
            r"|\bwhich\s+(date|day|year|month)\b",
            re.I,
        ),
    ),
    (
        "name",
        re.compile(
            r"^\s*(who|whom|whose)\b|\bwho\s+(is|are|do|does|should|can|to)\b|\bwhich\s+(team|department|office|agency|company|person)\b",
            re.I,
        ),
    ),
    (
        "place",
        re.compile(r"^\s*where\b|\bwhere\s+(is|are|do|does|can|should|to)\b|\bwhat\s+(address|location)\b", re.I),
    ),
]

_MONTH = (
    r"jan(uary)?|feb(ruary)?|mar(ch)?|apr(il)?|may|june?|july?|aug(ust)?|sep(t|tember)?|oct(ober)?"
    r"|nov(ember)?|dec(ember)?"
)
_WEEKDAY = r"monday|tuesday|wednesday|thursday|friday|saturday|sunday|weekdays?|weekends?"
_AMOUNT_WORD = (
    r"one|two|three|four|five|six|seven|eight|nine|ten|eleven|twelve|fifteen|twenty|thirty"
    r"|forty|fifty|sixty|hundred|thousand|million|half|dozen"
)
_NUMBER_WORD = _AMOUNT_WORD + r"|a|an|several|few"  # "a week", "several days"
_UNIT = r"(seconds?|minutes?|hours?|days?|nights?|weeks?|months?|years?|decades?|business\s+days?|working\s+days?)"

_TEXT_CUES: dict[str, re.Pattern] = {
    # Dates and times of day: months, weekdays, years, numeric dates, clock times, seasons, quarters.
    "date": re.compile(
        rf"\b({_MONTH})\b|\b({_WEEKDAY})\b|\b(1[6-9]|20)\d\d\b|\b\d{{1,4}}[/.-]\d{{1,2}}[/.-]\d{{1,4}}\b"
        r"|\b\d{1,2}(:\d\d)?\s*([ap]\.?m\.?)\b|\bnoon\b|\bmidnight\b|\b(spring|summer|autumn|fall|winter)\b"
        r"|\bq[1-4]\b|\b(today|tomorrow|yesterday|annually|daily|weekly|monthly|each\s+year|every\s+year)\b",
        re.I,
    ),
    # Amounts: any figure, currency, percentages, number words, "free".
    "amount": re.compile(rf"\d|[$€£¥]|\b(percent|per\s+cent|free|no\s+charge|{_AMOUNT_WORD})\b", re.I),
    # Durations: a number (figure or word) followed by a time unit, or frequency words.
    "duration": re.compile(
        rf"\b(\d+([.,]\d+)?|{_NUMBER_WORD})(\s*(-|to|or)\s*(\d+|{_NUMBER_WORD}))?\s+{_UNIT}\b"
        r"|\b(daily|weekly|monthly|yearly|annually|hourly|overnight|immediately|same\s+day|within|every|once|twice)\b",
        re.I,
    ),
    # Names: role nouns (capitalised words are checked by _has_proper_noun).
    "name": re.compile(
        r"\b(team|department|office|staff|agent|agents|technician|technicians|crew|manager|officer|authority"
        r"|contractor|plumber|representative|desk|centre|center|service|services|support|owner|landlord|tenant)\b",
        re.I,
    ),
    # Places: street addresses, place nouns, online locations (and capitalised words, see below).
    "place": re.compile(
        r"\b\d+\s+\w+\s+(street|st|road|rd|avenue|ave|lane|way|drive)\b"
        r"|\b(office|building|street|road|avenue|site|station|plant|branch|counter|lobby|location|address"
        r"|online|website|web\s+site|portal|page|app|url|www\.|https?://|floor|room|near|inside|outside"
        r"|basement|garage|yard|meter\s+box|curb|kerb)\b",
        re.I,
    ),
}


def expected_answer_type(question: str) -> str | None:
    """The answer type a question asks for (one of ANSWER_TYPES), or None for other questions."""
    for answer_type, cue in _QUESTION_CUES:
        if cue.search(question):
            return answer_type
    return None


def without_cue(question: str) -> str:
    """The question with the words that ask for its answer type blanked ("how much", "what date"):
    they name the type, not the fact, so they are no constraint of their own."""
    for _, cue in _QUESTION_CUES:
        match = cue.search(question)
        if match:
            return question[: match.start()] + " " + question[match.end() :]
    return question


def has_answer_type(text: str, answer_type: str | None) -> bool:
    """True when `text` holds something of `answer_type` (always True when no type is asked for)."""
    if answer_type is None:
        return True
    if answer_type not in _TEXT_CUES:
        raise ValueError(f"unknown answer type {answer_type!r}; expected one of {', '.join(ANSWER_TYPES)}")
    if _TEXT_CUES[answer_type].search(text):
        return True
    return answer_type in ("name", "place") and _has_proper_noun(text)


_CAPITALISED = re.compile(r"\b[A-Z][A-Za-z]+\b")
_SENTENCE_END = re.compile(r"(^|[.!?:;]\s*|\n\s*|[-*•]\s+)$")


def _has_proper_noun(text: str) -> bool:
    """A capitalised word that does not merely start a sentence or a list item ("Call Customer Care")."""
    for match in _CAPITALISED.finditer(text):
        if match.group() in ("I", "A"):
            continue
        if not _SENTENCE_END.search(text[max(0, match.start() - 3) : match.start()]):
            return True
    return False
