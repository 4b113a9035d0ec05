"""Redaction of personal data in query-log text: e-mail addresses, phone numbers, card numbers.

Pure functions, run on every query before it is normalized, merged or stored. Each find is replaced
by a placeholder (`PLACEHOLDERS`) and counted, so the import summary can say what was removed
without keeping any of it.

* E-mail: an RFC 5322 addr-spec — a dot-atom or quoted-string local part, "@", a domain of dotted
  labels (at least one dot) or a domain literal in brackets — with the UTF-8 letters that RFC 6531
  (SMTPUTF8) allows on both sides. Dotless domains ("me@home") are left: in search queries they are
  far more often not addresses.
* Card: 13–19 digits, optionally grouped by single spaces or hyphens, whose Luhn check digit
  (ISO/IEC 7812-1, annex B) is right. A digit run that fails the check is not a card.
* Phone: digit groups in the layouts of ITU-T E.123 / E.164 — "+" or "00" and a country code with
  at most 15 digits in all (E.164's limit), or national forms with separators such as
  "(415) 555-0100", "020 7946 0958", "01 23 45 67 89" (7–15 digits), or a bare run of 10–15 digits.
  Not phones: dates (2025-03-14, 14.03.2025), year lists and ranges (2019-2024), time ranges
  (8.00-17.00), IPv4 addresses, dot-grouped thousands (1.234.567), amounts and quantities next to
  a currency or unit word, and short numbers ("2025", "Q3", "ext 12"). Bare runs of 7–9 digits
  are left too (order and meter numbers); a 9-digit mobile written without "+" or separators is
  the price of that.
"""

from __future__ import annotations

import re
from collections import Counter

PLACEHOLDERS = {"email": "[email]", "phone": "[phone]", "card": "[card]"}

# RFC 5322 §3.2.3 atext, plus RFC 6531 §3.3's UTF8-non-ascii: any non-ASCII character, here less
# whitespace and the punctuation blocks (general, CJK, fullwidth) so that "addr@x.org。" ends at "g".
_NON_ASCII = r"[^\x00-\x7f\s\u2000-\u206f\u3000-\u303f\uff00-\uff0f\uff1a-\uff20]"
_ATEXT = rf"(?:[A-Za-z0-9!#$%&'*+/=?^_`{{|}}~-]|{_NON_ASCII})"
_LOCAL = rf'(?:{_ATEXT}+(?:\.{_ATEXT}+)*|"(?:[^"\\\r\n]|\\.)+")'
_LABEL_CHAR = rf"(?:[A-Za-z0-9]|{_NON_ASCII})"
_LABEL = rf"{_LABEL_CHAR}(?:(?:{_LABEL_CHAR}|-)*{_LABEL_CHAR})?"
_DOMAIN = rf"(?:{_LABEL}(?:\.{_LABEL})+|\[[^\]\s]+\])"
EMAIL = re.compile(rf"(?<![\w.!#$%&'*+/=?^`{{|}}~-]){_LOCAL}@{_DOMAIN}")

# Digit groups joined by a space, a hyphen or a dot (with optional spaces around the last two), a
# group possibly in parentheses (area codes), optionally led by "+" or "00". Every phone and card
# candidate is such a run; classification happens in Python, where the rules are readable.
_GROUP = r"(?:\(\d{1,5}\)|\d+)"
_SEP = r"(?:[ \u00a0]|[ ]?[.\-\u2013\u2012][ ]?)"
DIGIT_RUN = re.compile(rf"(?<![\w.,/:+\-])(?:\+[ ]?)?{_GROUP}(?:{_SEP}{_GROUP})*(?![\w]|[.,/:]\d)")
_GROUP_DIGITS = re.compile(r"\d+")
_ANY_DIGIT = re.compile(r"\d")

# A date at the start of a run: year-month-day, or day/month first with a 2- or 4-digit year, one
# separator used twice (never a space: "01 23 45 67 89" is a French phone number, not a date).
_DATE = re.compile(r"^(?:(\d{4})([.\-])(\d{1,2})\2(\d{1,2})|(\d{1,2})([.\-])(\d{1,2})\6(?:\d{4}|\d{2}))(?![.\-]?\d)")
_YEAR = re.compile(r"^(?:1[89]|20|21)\d\d$")
_CURRENCY_BEFORE = re.compile(r"(?:[$€£¥₹]|\b(?:USD|EUR|GBP|CHF|CAD|AUD|JPY|SEK|NOK|DKK|kr|Rs))\s?$")
# An amount or a quantity: a currency or measurement unit right after the digits (units only: a
# phone number is often followed by a noun, "020 7946 0958 account"). The list is common practice,
# no single source.
_CURRENCY_AFTER = re.compile(
    r"^\s?(?:[$€£¥₹%]|(?:USD|EUR|GBP|CHF|CAD|AUD|JPY|SEK|NOK|DKK|kr|dollars?|euros?|pounds?|cents?"
    r"|gallons?|gal|litres?|liters?|m3|m³|kwh|kg|km|miles?|ft|feet)\b)",
    re.IGNORECASE,
)
# "8.00-17.00", "9:30 – 10:45": opening hours, not a number to call.
_TIME_RANGE = re.compile(r"^\d{1,2}[.:]\d{2}\s?[-\u2013\u2012]\s?\d{1,2}[.:]\d{2}$")
# "1.234.567": dots as thousands separators (groups of exactly three after the first).
_DOT_THOUSANDS = re.compile(r"^\d{1,3}(?:\.\d{3})+$")


def luhn_valid(digits: str) -> bool:
    """True when the last digit is the Luhn check digit of the others (ISO/IEC 7812-1 annex B).

    From the right, every second digit is doubled (9 subtracted when above 9); the sum of all
    digits must be a multiple of 10.
    """
    if not digits.isdecimal() or len(digits) < 2:
        return False
    total = 0
    for i, ch in enumerate(reversed(digits)):
        d = int(ch)  # any decimal digit: "\d" in the patterns matches every script's digits
        if i % 2:
            d = d * 2 - 9 if d > 4 else d * 2
        total += d
    return total % 10 == 0


def _card_span(run: str, groups: list[re.Match]) -> tuple[int, int] | None:
    """(start, end) within `run` of a Luhn-valid 13–19-digit window of whole groups, or None.

    Windows, not only the whole run, so "2024 4111 1111 1111 1111" still finds the card after a
    year. Card groups are joined by space or hyphen only (never dots: those are dates or versions).
    """
    n = len(groups)
    for i in range(n):
        digits = ""
        for j in range(i, n):
            if j > i and run[groups[j - 1].end() : groups[j].start()].strip(" -\u00a0"):
                break
            if (
                run[groups[j].start() - 1 : groups[j].start()] == "("
                or run[groups[j].end() : groups[j].end() + 1] == ")"
            ):
                break
            digits += groups[j].group()
            if len(digits) > 19:
                break
            if len(digits) >= 13 and luhn_valid(digits):
                return groups[i].start(), groups[j].end()
    return None


def _is_date(run: str) -> bool:
    match = _DATE.match(run)
    if not match:
        return False
    if match.group(1):
        return 1 <= int(match.group(3)) <= 12 and 1 <= int(match.group(4)) <= 31
    a, b = int(match.group(5)), int(match.group(7))
    return 1 <= min(a, b) <= 12 and 1 <= max(a, b) <= 31


def _is_phone(run: str, groups: list[re.Match], before: str, after: str) -> bool:
    digits = "".join(g.group() for g in groups)
    values = [g.group() for g in groups]
    international = run.startswith("+") or (run.startswith("00") and len(groups) > 1)
    if international:
        count = len(digits) - (0 if run.startswith("+") else 2)
        return 8 <= count <= 15
    if _CURRENCY_BEFORE.search(before) or _CURRENCY_AFTER.search(after):
        return False
    if len(groups) == 1:
        # A bare run: 10–15 digits is a national or international number without separators;
        # shorter runs are order numbers, postcodes, years.
        return 10 <= len(digits) <= 15
    if not 7 <= len(digits) <= 15:
        return False
    if _is_date(run):
        return False
    if all(_YEAR.match(v) for v in values):
        return False  # "2019-2024", "2023 2024 2025"
    if len(values) == 4 and "." in run and all(int(v) <= 255 for v in values):
        return False  # IPv4 address
    if _TIME_RANGE.match(run) or _DOT_THOUSANDS.match(run):
        return False
    return True


def _phone_end(run: str, groups: list[re.Match], before: str, after: str) -> int | None:
    """End (within `run`) of the phone number the run holds, or None.

    A run longer than E.164's 15 digits may be a number followed by more digits ("+1 415 555 0100
    2025"): its leading groups are tried, longest first.
    """
    if _is_phone(run, groups, before, after):
        return len(run)
    longest = total = 0  # the longest head of at most 15 digits, found in one pass
    for g in groups:
        total += len(g.group())
        if total > 15:
            break
        longest += 1
    if longest == len(groups):
        return None
    for n in range(min(longest, len(groups) - 1), 1, -1):
        head = groups[:n]
        cut = head[-1].end() + (1 if run[head[-1].end() : head[-1].end() + 1] == ")" else 0)
        if _is_phone(run[:cut], head, before, run[cut : cut + 16]):
            return cut
    return None


def redact(text: str) -> tuple[str, Counter]:
    """`text` with e-mail addresses, card numbers and phone numbers replaced by placeholders.

    Returns the redacted text and a Counter of finds by kind ("email", "card", "phone").
    E-mail goes first (a local part may hold digits), then digit runs: a run (or a window of its
    groups) that passes the Luhn check is a card, else the phone rules decide.
    """
    found: Counter = Counter()

    def email(match: re.Match) -> str:
        found["email"] += 1
        return PLACEHOLDERS["email"]

    text = EMAIL.sub(email, text)
    if not _ANY_DIGIT.search(text):
        return text, found
    return _redact_digits(text, found), found


def _redact_digits(text: str, found: Counter) -> str:
    out: list[str] = []
    pos = scan = 0  # pos: copied up to here; scan: searched up to here
    while (match := DIGIT_RUN.search(text, scan)) is not None:
        run = match.group()
        start, end = match.span()
        scan = end
        groups = list(_GROUP_DIGITS.finditer(run))
        total = sum(len(g.group()) for g in groups)
        if total < 7:
            continue
        # International notation ("+" or "00" and a country code) is a phone, never a card: a
        # 15-digit "0044 20 7946 0958" passes the Luhn check one time in ten by chance.
        international = run.startswith("+") or (run.startswith("00") and len(groups) > 1 and total <= 17)
        card = _card_span(run, groups) if total >= 13 and not international else None
        if card is not None:
            out.append(text[pos:start])
            out.append(_redact_digits(run[: card[0]], found))  # "020 7946 0958 4111 ..." holds both
            out.append(PLACEHOLDERS["card"])
            found["card"] += 1
            pos = scan = start + card[1]  # the rest of the run is searched again
            continue
        stop = _phone_end(run, groups, text[max(0, start - 6) : start], text[end : end + 16])
        if stop is not None:
            out.append(text[pos:start])
            out.append(PLACEHOLDERS["phone"])
            found["phone"] += 1
            pos = scan = start + stop
    out.append(text[pos:])
    return "".join(out)
