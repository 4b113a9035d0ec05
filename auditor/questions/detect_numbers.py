"""Detectors for standard numbers in free text: IBANs, national identity numbers, card and phone numbers.

Each detector takes a text and returns the (start, end) spans of what it found, sorted and
non-overlapping; `redact.redact` replaces them. Candidates are found by patterns whose repetitions
are bounded (so a search costs at most a constant per start position: linear in the text), and
each candidate is *validated* by a well-kept library before it counts:

* IBAN: two letters, two check digits and up to 30 letters or digits, optionally grouped by single
  spaces (the paper format of ISO 13616-1); `stdnum.iban` checks the country's length and layout
  from the IBAN registry and the ISO 7064 mod-97-10 check digits.
* National identity numbers: the written shapes of the numbers `stdnum` validates (US SSN
  "536-90-4399", Spanish DNI/NIE, Italian codice fiscale, Finnish HETU, Swedish personnummer,
  Danish CPR, Brazilian CPF, Canadian SIN, German IdNr, French NIR, Norwegian fødselsnummer), each
  checked by its `stdnum` module; after a cue word ("SSN", "NHS number", "BSN", "PESEL", ...) the
  number that word names may also be written as bare digits, and after a generic one ("national
  id number") any of them.
* Card: 13–19 digits, ungrouped or grouped by single spaces or hyphens, whose Luhn check digit
  (ISO/IEC 7812-1 annex B, `stdnum.luhn`) is right. Each run of digit groups is walked once, with
  windows of at most 19 digits, so the cost is linear in the run.
* Phone: `phonenumbers.PhoneNumberMatcher` (libphonenumber's matcher): a number valid by the
  library's metadata, or of a possible length and written like a phone number (`find_phones`);
  numbers written without a country code are read in the configured default region.
"""

from __future__ import annotations

import re
import unicodedata
from collections.abc import Callable

import phonenumbers
from stdnum import iban, luhn
from stdnum.br import cpf
from stdnum.ca import sin
from stdnum.de import idnr
from stdnum.dk import cpr
from stdnum.es import dni, nie
from stdnum.fi import hetu
from stdnum.fr import nir
from stdnum.gb import nhs
from stdnum.in_ import aadhaar
from stdnum.it import codicefiscale
from stdnum.nl import bsn
from stdnum.no import fodselsnummer
from stdnum.pl import pesel
from stdnum.se import personnummer
from stdnum.us import ssn

Span = tuple[int, int]

# Not inside a longer word or number: no letter, digit or joining mark right before, nor a group of
# digits and a separator; no letter or digit right after, nor a separator and more digits.
_BEFORE = r"(?<![\w+\-./,:])(?<!\d[ .\-/])"
_AFTER = r"(?!\w|[ .\-/,:]\d)"


def ascii_digits(text: str) -> str:
    """Every Unicode decimal digit (category Nd) as its ASCII digit: `\\d` matches all scripts'
    digits, the validators read ASCII only."""
    return "".join(str(unicodedata.digit(ch)) if ch.isdecimal() else ch for ch in text)


# --- IBAN -------------------------------------------------------------------------------------------

# Two letters, two digits, then up to 30 letters/digits with an optional single space before each.
_IBAN = re.compile(r"(?<![\w])[A-Za-z]{2}\d{2}(?:[ ]?[A-Za-z0-9]){10,30}")


def _iban_valid(value: str) -> bool:
    # check_country=False: the registry's length and layout and the mod-97 check digits decide;
    # stdnum's country modules would also refuse bank codes missing from its bank lists, and a
    # real IBAN of a bank it does not list must not leak.
    return iban.is_valid(value, check_country=False)


def find_ibans(text: str) -> list[Span]:
    spans: list[Span] = []
    for match in _IBAN.finditer(text):
        span = _longest_valid_prefix(match.group(), _iban_valid)
        if span is not None:
            spans.append((match.start(), match.start() + span))
    return spans


def _longest_valid_prefix(candidate: str, valid: Callable[[str], bool]) -> int | None:
    """Length of the longest prefix of `candidate` that ends at a word boundary and is valid.

    The candidate is at most a few dozen characters, so trying its ends is a constant cost."""
    for end in range(len(candidate), 0, -1):
        if candidate[end - 1] == " " or (end < len(candidate) and candidate[end] != " "):
            continue
        if valid(ascii_digits(candidate[:end])):
            return end
    return None


# --- national identity numbers ----------------------------------------------------------------------


def _shape(pattern: str) -> re.Pattern:
    return re.compile(f"{_BEFORE}(?:{pattern}){_AFTER}")


# (written shape, validators): a candidate counts when one validator accepts it. Shapes that other
# numbers share (an NHS number is written like a US phone number) are left to the cue-word rule.
NATIONAL_SHAPES: list[tuple[re.Pattern, tuple[Callable[[str], bool], ...]]] = [
    (_shape(r"\d{3}-\d{2}-\d{4}|\d{3} \d{2} \d{4}"), (ssn.is_valid,)),  # US SSN
    (_shape(r"\d{8}-?[A-Za-z]"), (dni.is_valid,)),  # Spanish DNI
    (_shape(r"[XYZxyz]-?\d{7}-?[A-Za-z]"), (nie.is_valid,)),  # Spanish NIE
    (_shape(r"[A-Za-z]{6}\d{2}[A-Za-z]\d{2}[A-Za-z]\d{3}[A-Za-z]"), (codicefiscale.is_valid,)),
    (_shape(r"\d{6}[-+Aa]\d{3}[0-9A-Ya-y]"), (hetu.is_valid,)),  # Finnish HETU
    (_shape(r"(?:\d{2})?\d{6}[-+]\d{4}"), (personnummer.is_valid, cpr.is_valid)),  # SE, DK
    (_shape(r"\d{3}\.\d{3}\.\d{3}-\d{2}"), (cpf.is_valid,)),  # Brazilian CPF
    # Canadian SIN: hyphenated only without a cue ("091 234 567" is also how a phone number is written)
    (_shape(r"\d{3}-\d{3}-\d{3}"), (sin.is_valid,)),
    (_shape(r"\d{2} \d{3} \d{3} \d{3}"), (idnr.is_valid,)),  # German IdNr
    (_shape(r"[12] \d{2} \d{2} (?:\d{2}|2[ABab]) \d{3} \d{3} \d{2}"), (nir.is_valid,)),  # French NIR
    (_shape(r"\d{6} \d{5}"), (fodselsnummer.is_valid,)),  # Norwegian fødselsnummer
]
# Numbers people name before writing them, each cue with the validators of the numbers it names.
# Common practice, no single source: the words in use for the numbers above.
_NATIONAL_CUES: list[tuple[str, tuple[Callable[[str], bool], ...]]] = [
    (r"ssn|social\s+security(?:\s+(?:number|no\.?|#))?", (ssn.is_valid,)),
    (r"sin|social\s+insurance(?:\s+(?:number|no\.?))?", (sin.is_valid,)),
    (r"nhs\s+(?:number|no\.?)", (nhs.is_valid,)),
    (r"bsn|burgerservicenummer", (bsn.is_valid,)),
    (r"pesel", (pesel.is_valid,)),
    (r"idnr|steuer-?id|steuer-identifikationsnummer", (idnr.is_valid,)),
    (r"personnummer", (personnummer.is_valid,)),
    (r"cpr(?:-nummer)?", (cpr.is_valid,)),
    (r"hetu|henkilötunnus", (hetu.is_valid,)),
    (r"nir|numéro\s+de\s+sécurité\s+sociale", (nir.is_valid,)),
    (r"aadhaar", (aadhaar.is_valid,)),
    (r"cpf", (cpf.is_valid,)),
    (r"dni|nie|nif", (dni.is_valid, nie.is_valid)),
    (r"codice\s+fiscale", (codicefiscale.is_valid,)),
    (r"fødselsnummer|fodselsnummer", (fodselsnummer.is_valid,)),
]
_GENERIC_CUE = r"national\s+(?:insurance|identity|id)(?:\s+(?:number|no\.?))?|(?:personal\s+)?id(?:entity)?\s+(?:number|no\.?|code)"
_NATIONAL_CUE = re.compile(
    r"\b(?:" + "|".join(f"({cue})" for cue, _ in _NATIONAL_CUES) + f"|({_GENERIC_CUE}))"
    r"\s*(?:is|was|:|=|-|#)?\s*",
    re.IGNORECASE,
)
# After the cue: up to seven groups of letters and digits joined by single spaces, dots or hyphens.
_NATIONAL_VALUE = re.compile(r"[A-Za-z]{0,2}\d[\dA-Za-z]{0,15}(?:[ .\-]\d[\dA-Za-z]{0,15}){0,6}")
_ANY_NATIONAL: tuple[Callable[[str], bool], ...] = tuple(check for _, checks in _NATIONAL_CUES for check in checks)


def _any_valid(validators: tuple[Callable[[str], bool], ...]) -> Callable[[str], bool]:
    return lambda value: any(check(value) for check in validators)


def find_national_ids(text: str) -> list[Span]:
    spans: list[Span] = []
    for pattern, validators in NATIONAL_SHAPES:
        for match in pattern.finditer(text):
            if any(check(ascii_digits(match.group())) for check in validators):
                spans.append(match.span())
    for cue in _NATIONAL_CUE.finditer(text):
        value = _NATIONAL_VALUE.match(text, cue.end())
        if value is None or _WORD_CHAR.match(text, value.end()):
            continue
        family = cue.lastindex or 0  # the numbered group of the cue that matched
        checks = _NATIONAL_CUES[family - 1][1] if family <= len(_NATIONAL_CUES) else _ANY_NATIONAL
        end = _longest_valid_prefix(value.group(), _any_valid(checks))
        if end is not None:
            spans.append((value.start(), value.start() + end))
    return non_overlapping(spans)


_WORD_CHAR = re.compile(r"\w")


def non_overlapping(spans: list[Span]) -> list[Span]:
    """The spans sorted by start, the first (longest on a tie) kept where two overlap."""
    kept: list[Span] = []
    for start, end in sorted(spans, key=lambda s: (s[0], -s[1])):
        if kept and start < kept[-1][1]:
            continue
        kept.append((start, end))
    return kept


# --- card numbers -----------------------------------------------------------------------------------

_DIGITS = re.compile(r"\d+")
_CARD_JOINS = frozenset(" -\u00a0")
# Window lengths tried from each group, most common first: 16 (Visa, Mastercard, Discover, JCB),
# 15 (American Express), then the other lengths ISO/IEC 7812 allows.
_CARD_LENGTHS = (16, 15, 19, 14, 13, 17, 18)


def luhn_valid(digits: str) -> bool:
    """True when the last digit is the Luhn check digit of the others (ISO/IEC 7812-1 annex B)."""
    plain = ascii_digits(digits)
    return len(plain) >= 2 and plain.isdigit() and luhn.is_valid(plain)


def find_cards(text: str) -> list[Span]:
    """Luhn-valid windows of whole digit groups, in one pass over each run of groups.

    A run is a sequence of digit groups joined by one space, hyphen or no-break space, not inside a
    word or a decimal number. From each group, the windows of the card lengths are looked up in
    constant time (prefix sums of the Luhn weights screen them; `stdnum.luhn` confirms a hit); a
    card found moves the walk past it, a miss moves it one group on."""
    spans: list[Span] = []
    for run in _runs(text):
        digits = ascii_digits("".join(m.group() for m in run))
        offsets = [0]
        for m in run:
            offsets.append(offsets[-1] + len(m.group()))
        last_group = {end: j for j, end in enumerate(offsets[1:])}  # digit offset -> group ending there
        even, odd = _luhn_prefix_sums(digits)
        i = 0
        while i < len(run):
            j = _card_from(digits, offsets[i], last_group, even, odd)
            if j is None:
                i += 1
                continue
            spans.append((run[i].start(), run[j].end()))
            i = j + 1
    return spans


def _runs(text: str) -> list[list[re.Match]]:
    runs: list[list[re.Match]] = []
    current: list[re.Match] = []
    for match in _DIGITS.finditer(text):
        if current and text[current[-1].end() : match.start()] in _CARD_JOINS:
            current.append(match)
            continue
        if current:
            runs.append(current)
        current = [match]
    if current:
        runs.append(current)
    return [_trim(text, run) for run in runs if sum(len(m.group()) for m in run) >= 13]


# A group glued to a word, a decimal point or a sign before it, or to what follows: not a card's.
_GLUED_BEFORE = re.compile(r"[\w.,+/:]")
_GLUED_AFTER = re.compile(r"\w|[.,/:]\d")


def _trim(text: str, run: list[re.Match]) -> list[re.Match]:
    """The run less a first group glued to what is before it and a last group glued to what
    follows ("v2.4111 ...", "...1111.5")."""
    if run and run[0].start() > 0 and _GLUED_BEFORE.match(text, run[0].start() - 1):
        run = run[1:]
    if run and _GLUED_AFTER.match(text[run[-1].end() : run[-1].end() + 2]):
        run = run[:-1]
    return run


def _luhn_prefix_sums(digits: str) -> tuple[list[int], list[int]]:
    """Prefix sums of the Luhn contributions of each digit, doubled at even (`even`) or at odd
    (`odd`) positions: the Luhn sum of any window is then a difference of two entries."""
    even, odd = [0], [0]
    for p, ch in enumerate(digits):
        d = int(ch)
        doubled = d * 2 - 9 if d > 4 else d * 2
        even.append(even[-1] + (doubled if p % 2 == 0 else d))
        odd.append(odd[-1] + (d if p % 2 == 0 else doubled))
    return even, odd


def _card_from(digits: str, start: int, last_group: dict[int, int], even: list[int], odd: list[int]) -> int | None:
    """Index of the last group of a Luhn-valid card window starting at digit `start`, or None."""
    for length in _CARD_LENGTHS:
        end = start + length
        j = last_group.get(end)
        if j is None:
            continue
        # Luhn doubles every second digit from the right: those at the parity of end - 2.
        sums = even if (end - 2) % 2 == 0 else odd
        if (sums[end] - sums[start]) % 10 == 0 and luhn.is_valid(digits[start:end]):
            return j
    return None


# --- phone numbers ----------------------------------------------------------------------------------


def find_phones(text: str, region: str) -> list[Span]:
    """Phone numbers by libphonenumber: valid numbers by its metadata (national forms read in
    `region`), and numbers of a possible length for their region that are written like a phone
    number — with a hyphen or an area code in brackets, no dot ("555-0134", "(555) 555-0187": local
    numbers and the ranges reserved for fiction are possible but not valid).

    One pass of the matcher at leniency POSSIBLE, each match then checked for validity. The matcher
    gives up after `max_tries` candidates (65,535 by default); the limit is lifted to the text's
    length so a long line full of digit groups cannot hide a number at its end."""
    matcher = phonenumbers.PhoneNumberMatcher(text, region, _POSSIBLE, max(65_535, len(text)))
    return [
        (m.start, m.end)
        for m in matcher
        if phonenumbers.is_valid_number(m.number) or (_PHONE_LAYOUT.search(m.raw_string) and "." not in m.raw_string)
    ]


_POSSIBLE = phonenumbers.Leniency.POSSIBLE
_PHONE_LAYOUT = re.compile(r"\d-\d|\(\d{1,5}\)")
