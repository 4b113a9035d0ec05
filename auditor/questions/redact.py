"""Redaction of personal data in query-log text (docs/question-sets.md, "Personal data in query logs").

Pure functions, run on every query before it is normalized, merged or stored. Each find is replaced
by its kind's placeholder (`PLACEHOLDERS`: "[email]", "[iban]", "[phone]", ...) and counted, so the
import summary and the database can say what was removed without keeping any of it.

The detectors live in three modules, one per family: `detect_net` (e-mail, IP addresses),
`detect_numbers` (IBAN, national identity, card and phone numbers, validated by `python-stdnum`
and `phonenumbers`) and `detect_cues` (names, street addresses, account numbers and dates of
birth, found by the words around them). They run in the order of `KINDS`, each on the text the
previous ones left, so a number is claimed by the most specific kind first: an IBAN's digit groups
never reach the phone matcher, a card number after "order" is a card.

Every detector is linear in the text (bounded repetitions only; a digit run's groups are walked
once), and so is `redact`: tests/test_redact.py runs each on 100 KB adversarial lines in a CPU
budget.
"""

from __future__ import annotations

import re
from collections import Counter
from collections.abc import Callable, Iterable
from dataclasses import dataclass

from auditor.questions import detect_cues, detect_net, detect_numbers

KINDS = (
    "email",
    "iban",
    "national_id",
    "card",
    "birth_date",
    "account",
    "ip",
    "phone",
    "address",
    "name",
)
PLACEHOLDERS = {kind: f"[{kind}]" for kind in KINDS}
DEFAULT_REGION = "US"

_ANY_DIGIT = re.compile(r"\d")
# A run of eight or more digits: what `strict` refuses to keep (docs/question-sets.md).
LONG_DIGIT_RUN = re.compile(r"\d{8}")


@dataclass(frozen=True)
class RedactionOptions:
    """Which kinds to redact, and the region national phone numbers are read in (ISO 3166-1 alpha-2)."""

    kinds: frozenset[str] = frozenset(KINDS)
    region: str = DEFAULT_REGION

    @classmethod
    def only(cls, kinds: Iterable[str], region: str = DEFAULT_REGION) -> RedactionOptions:
        return cls(frozenset(kinds), region)


DEFAULT_OPTIONS = RedactionOptions()

# kind -> (detector, needs a digit): a detector for numbers is skipped on a text without digits.
_DETECTORS: dict[str, tuple[Callable[[str, str], list[tuple[int, int]]], bool]] = {
    "email": (lambda text, region: detect_net.find_emails(text), False),
    "iban": (lambda text, region: detect_numbers.find_ibans(text), True),
    "national_id": (lambda text, region: detect_numbers.find_national_ids(text), True),
    "card": (lambda text, region: detect_numbers.find_cards(text), True),
    "birth_date": (lambda text, region: detect_cues.find_birth_dates(text), True),
    "account": (lambda text, region: detect_cues.find_accounts(text), True),
    "ip": (lambda text, region: detect_net.find_ips(text), True),
    "phone": (detect_numbers.find_phones, True),
    "address": (lambda text, region: detect_cues.find_addresses(text), True),
    "name": (lambda text, region: detect_cues.find_names(text), False),
}
assert set(_DETECTORS) == set(KINDS)


def redact(text: str, options: RedactionOptions = DEFAULT_OPTIONS) -> tuple[str, Counter]:
    """`text` with every enabled kind of personal data replaced by its placeholder.

    Returns the redacted text and a Counter of finds by kind.
    """
    found: Counter = Counter()
    for kind in KINDS:
        if kind not in options.kinds:
            continue
        detector, numeric = _DETECTORS[kind]
        if numeric and not _ANY_DIGIT.search(text):
            continue
        spans = detect_numbers.non_overlapping(detector(text, options.region))
        if spans:
            found[kind] += len(spans)
            text = _replace(text, spans, PLACEHOLDERS[kind])
    return text, found


def _replace(text: str, spans: list[tuple[int, int]], placeholder: str) -> str:
    out: list[str] = []
    pos = 0
    for start, end in spans:
        out.append(text[pos:start])
        out.append(placeholder)
        pos = end
    out.append(text[pos:])
    return "".join(out)


def has_long_digit_run(text: str) -> bool:
    """True when `text` still holds eight or more digits in a row (the `strict` rule)."""
    return LONG_DIGIT_RUN.search(text) is not None


# The Luhn check is part of the card detector; re-exported for the tests and the bench.
luhn_valid = detect_numbers.luhn_valid
