"""Conflicting answers (docs/judgement.md): two fresh supporting passages that give different values
of the asked-for type for the same question.

When one page says the reconnection fee is $45 and another says $60, the question is supported twice
and answered wrongly once; the owner must reconcile them. The flag is `conflicting_values`, and the
question carries both values with where they stand.

Values are compared only for the types that have one right value: an amount (money, a percentage,
a plain figure), a date (a calendar date or range, read by auditor.temporal.extract), a duration (a
number of time units, compared in days) and a phone number (its digits). Each supporting passage
contributes the values of that type in its best sentence window (the window its support came from);
two passages conflict when their value sets are disjoint, since a passage that repeats the other's
value alongside a second one (a fee and a late fee) gives no clear disagreement.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass

from auditor.judgement.answer_types import expected_answer_type
from auditor.temporal.extract import extract

COMPARED = ("amount", "date", "duration", "phone")

_PHONE_QUESTION = re.compile(r"\b(phone|telephone|hotline|number\s+(to|do\s+i|should\s+i)\s+call|call\s+line)\b", re.I)
_PHONE = re.compile(r"(?<![\w.])(\+?\(?\d[\d ().-]{5,}\d)(?!\w|\.\d)")
# A figure starts only where a run of digits starts (the lookbehinds), so a long run of digits is
# scanned once, not once per position (tests/test_regex_budget.py).
_MONEY = re.compile(
    r"(?P<cur>[$€£¥])\s?(?P<num>\d{1,3}(?:,\d{3})+(?:\.\d+)?|\d+(?:\.\d+)?)"
    r"|(?<![\d.,])(?P<num2>\d{1,3}(?:,\d{3})+(?:\.\d+)?|\d+(?:\.\d+)?)\s?"
    r"(?P<unit>%|percent\b|per\s+cent\b|dollars?\b|euros?\b)",
    re.I,
)
_NUMBER_WORDS = {
    "one": 1,
    "two": 2,
    "three": 3,
    "four": 4,
    "five": 5,
    "six": 6,
    "seven": 7,
    "eight": 8,
    "nine": 9,
    "ten": 10,
    "twelve": 12,
    "fourteen": 14,
    "fifteen": 15,
    "twenty": 20,
    "thirty": 30,
    "a": 1,
    "an": 1,
}
_DAYS = {"minute": 1 / 1440, "hour": 1 / 24, "day": 1, "business day": 1.4, "working day": 1.4, "week": 7}
_DAYS |= {"month": 30, "year": 365}
_DURATION = re.compile(
    r"\b(?P<n>\d+(?:\.\d+)?|" + "|".join(_NUMBER_WORDS) + r")\s+(?P<unit>business\s+day|working\s+day|minute|hour"
    r"|day|week|month|year)s?\b",
    re.I,
)


@dataclass(frozen=True)
class Value:
    """One value of the asked-for type, normalized, with the text it was read from."""

    key: str  # what is compared
    surface: str  # as written


@dataclass(frozen=True)
class Conflict:
    """Two passages that disagree: (passage id, document, value) each."""

    value_type: str
    first: tuple[int, str, Value]
    second: tuple[int, str, Value]

    def as_json(self) -> dict:
        return {
            "type": self.value_type,
            "values": [
                {"value": value.surface, "normalized": value.key, "document": document, "passage": passage}
                for passage, document, value in (self.first, self.second)
            ],
        }


def compared_type(question: str) -> str | None:
    """The value type the question asks for, when it is one that has one right value."""
    if _PHONE_QUESTION.search(question):
        return "phone"
    asked = expected_answer_type(question)
    return asked if asked in COMPARED else None


def _number(text: str) -> float:
    return float(text.replace(",", ""))


def values_in(text: str, value_type: str) -> list[Value]:
    """The values of `value_type` in `text`, in text order, each once."""
    found: list[Value] = []
    if value_type == "phone":
        for m in _PHONE.finditer(text):
            digits = re.sub(r"\D", "", m.group(1))
            if 7 <= len(digits) <= 15:
                found.append(Value(digits, m.group(1).strip()))
    elif value_type == "amount":
        for m in _MONEY.finditer(text):
            if m.group("cur"):
                found.append(Value(f"{m.group('cur')}{_number(m.group('num')):.2f}", m.group(0).strip()))
            else:
                unit = m.group("unit").lower()
                unit = "%" if unit.startswith(("%", "per")) else unit.rstrip("s")
                found.append(Value(f"{_number(m.group('num2')):g}{unit}", m.group(0).strip()))
    elif value_type == "duration":
        for m in _DURATION.finditer(text):
            n = m.group("n").lower()
            count = _NUMBER_WORDS[n] if n in _NUMBER_WORDS else float(n)
            unit = re.sub(r"\s+", " ", m.group("unit").lower())
            found.append(Value(f"{count * _DAYS[unit]:g}d", m.group(0).strip()))
    elif value_type == "date":
        for e in extract(text):
            found.append(Value(f"{e.start.isoformat()}/{e.end.isoformat()}", e.expression))
    else:
        raise ValueError(f"values of type {value_type!r} are not compared; expected one of {', '.join(COMPARED)}")
    return list({v.key: v for v in reversed(found)}.values())[::-1]


def find_conflict(question: str, supporting: Sequence[tuple[int, str, str]]) -> Conflict | None:
    """The first pair of supporting passages whose values of the asked-for type are disjoint.

    `supporting` holds (passage id, document path, best-window text) of the fresh supporting
    passages, best first. None when the question asks for no compared type or nothing disagrees.
    """
    value_type = compared_type(question)
    if value_type is None:
        return None
    read = [(pid, doc, values_in(window, value_type)) for pid, doc, window in supporting]
    read = [r for r in read if r[2]]
    for i, (pid_a, doc_a, values_a) in enumerate(read):
        for pid_b, doc_b, values_b in read[i + 1 :]:
            if not {v.key for v in values_a} & {v.key for v in values_b}:
                return Conflict(value_type, (pid_a, doc_a, values_a[0]), (pid_b, doc_b, values_b[0]))
    return None
