"""Detectors for personal data that only its context gives away: names after a self-identification
cue, street addresses, account / customer / order numbers after their cue word, dates of birth.

No library validates these, so each detector looks for the words people write around them. The cue
lists are common practice in chat and support logs (no single source); they are English only.
Repetitions in the patterns are bounded (or, like the whitespace after a cue, cannot share
characters with what follows), so a search costs at most a constant per start position.

* name: "my name is Ann Lee", "this is Ann Lee", "I'm Ann Lee and ..." — up to three words; after
  "this is" and "I'm" they must be capitalized (lower-case words there are what is asked about:
  "this is urgent", "I'm moving and"), and "I'm" needs "and", "," or "here" after the name.
* address: a house number, one to four words and a street word ("12 Oak Avenue", "4b Mill Lane").
* account: a cue word (account, customer, order, invoice, reference, policy, ...) with an optional
  "number"/"no."/"#"/"id", then a token holding at least five digits ("order 12345678",
  "customer no. FH-0042917"). Shorter numbers and four-digit years stay ("invoice 2025").
* birth_date: "date of birth", "DOB", "born (on)", "birthday" and a date written with digits or a
  month name ("12/03/1985", "1985-03-12", "12 March 1985", "March 12, 1985").
"""

from __future__ import annotations

import re

Span = tuple[int, int]

_WORD = r"[^\W\d_](?:[^\W\d_]|['’\-](?=[^\W\d_])){0,30}"

# --- names ------------------------------------------------------------------------------------------

_NAME_CUE = re.compile(r"\b(?:(my\s+name\s+is|my\s+name's|name\s*:)|(this\s+is)|(i'm|i’m|i\s+am))\s+", re.IGNORECASE)
_NAME_WORD = re.compile(_WORD)
# Capitalized words that follow "this is" / "I'm" without being names (sentence words, the
# utility's own vocabulary). Common practice, no single source.
_NOT_NAMES = frozenset(
    """a an the it my our your his her their this that not no so very really still just about regarding re
    urgent important ridiculous unacceptable fine ok okay sure new here there what why how when where who
    and or but from with for in on at of to is am are was be been i we you he she they me
    customer resident tenant owner landlord manager calling writing asking trying looking having getting""".split()
)
_NAME_END = re.compile(r"\s*(?:,|\band\b|\bhere\b)", re.IGNORECASE)


def find_names(text: str) -> list[Span]:
    spans: list[Span] = []
    for cue in _NAME_CUE.finditer(text):
        strict = cue.group(1) is None  # "this is", "I'm": capitalized words only
        pos = cue.end()
        words: list[re.Match] = []
        while len(words) < 3:
            word = _NAME_WORD.match(text, pos)
            if word is None or word.group().casefold() in _NOT_NAMES:
                break
            if (strict or words) and not word.group()[0].isupper():
                break
            if strict and word.group().endswith(("'s", "’s")):
                break  # "this is Fernhollow's new plan": a possessive, not who is writing
            words.append(word)
            gap = re.match(r"[ ]+", text[word.end() : word.end() + 4])
            if gap is None:
                break
            pos = word.end() + len(gap.group())
        if not words:
            continue
        if cue.group(3) is not None and not _NAME_END.match(text, words[-1].end()):
            continue  # "I'm Ann and ...", "I'm Ann, ..." — not "I'm Home Depot's customer"
        spans.append((words[0].start(), words[-1].end()))
    return spans


# --- street addresses -------------------------------------------------------------------------------

# Street words (full and the usual abbreviations of UK and US addresses; common practice). "Dr" is
# left out: "at 12 with Dr Lee" is more common in a query than an abbreviated Drive.
_STREET = (
    r"street|st|road|rd|avenue|ave|lane|ln|drive|way|court|ct|place|pl|boulevard|blvd|terrace|close|crescent"
    r"|parkway|pkwy|highway|hwy|square|sq|mews|grove|gardens|circle|cir|trail|parade|row"
)
_ADDRESS = re.compile(
    rf"(?<![\w.,/\-])\d{{1,5}}[A-Za-z]?(?:[-/]\d{{1,4}})?,?(?:\s{{1,3}}{_WORD}){{1,4}}?\s{{1,3}}(?:{_STREET})\b\.?",
    re.IGNORECASE,
)


def find_addresses(text: str) -> list[Span]:
    return [m.span() for m in _ADDRESS.finditer(text)]


# --- account, customer and order numbers ------------------------------------------------------------

_ACCOUNT = re.compile(
    r"\b(?:account|acct|a/c|customer|client|member(?:ship)?|subscriber|order|invoice|reference|ref|policy"
    r"|contract|booking|reservation)"
    r"(?:\s{1,3}(?:number|num|no\.?|nr\.?|#|id|code))?\s{0,3}(?:is|was|:|=|#|-)?\s{0,3}#?"
    r"([A-Za-z0-9](?:[A-Za-z0-9]|[-/](?=[A-Za-z0-9])){3,29})(?![\w\-/])",
    re.IGNORECASE,
)


def find_accounts(text: str) -> list[Span]:
    return [m.span(1) for m in _ACCOUNT.finditer(text) if sum(ch.isdigit() for ch in m.group(1)) >= 5]


# --- dates of birth ---------------------------------------------------------------------------------

_MONTH = (
    r"(?:jan(?:uary)?|feb(?:ruary)?|mar(?:ch)?|apr(?:il)?|may|june?|july?|aug(?:ust)?|sep(?:t(?:ember)?)?"
    r"|oct(?:ober)?|nov(?:ember)?|dec(?:ember)?)\.?"
)
_BIRTH_DATE = re.compile(
    r"\b(?:date\s+of\s+birth|birth\s?date|birthday|d\.?o\.?b\.?|born(?:\s+on)?)"
    r"\s{0,3}(?:is|was|:|=|-)?\s{0,3}(?:on\s+|the\s+)?"
    r"(\d{4}[./\-]\d{1,2}[./\-]\d{1,2}|\d{1,2}[./\-]\d{1,2}[./\-](?:\d{4}|\d{2})"
    rf"|\d{{1,2}}(?:st|nd|rd|th)?\s{{1,2}}(?:of\s+)?{_MONTH},?\s{{1,2}}\d{{4}}"
    rf"|{_MONTH}\s{{1,2}}\d{{1,2}}(?:st|nd|rd|th)?,?\s{{1,2}}\d{{4}})(?!\w)",
    re.IGNORECASE,
)


def find_birth_dates(text: str) -> list[Span]:
    return [m.span(1) for m in _BIRTH_DATE.finditer(text)]
