"""Redaction of e-mail addresses, card and phone numbers, checked against published examples."""

from __future__ import annotations

from collections import Counter

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.questions.redact import luhn_valid, redact

# --- Luhn (ISO/IEC 7812-1 annex B) ----------------------------------------------------------------

# Test card numbers the card networks and payment processors publish for test systems (from memory;
# widely reproduced in processor documentation). All pass the Luhn check.
PUBLISHED_TEST_CARDS = [
    "4111111111111111",  # Visa
    "4012888888881881",  # Visa
    "4222222222222",  # Visa, 13 digits
    "5555555555554444",  # Mastercard
    "5105105105105100",  # Mastercard
    "378282246310005",  # American Express, 15 digits
    "371449635398431",  # American Express
    "6011111111111117",  # Discover
    "30569309025904",  # Diners Club, 14 digits
    "3530111333300000",  # JCB
]


@pytest.mark.parametrize("number", PUBLISHED_TEST_CARDS)
def test_published_test_cards_pass_luhn(number):
    assert luhn_valid(number)


def test_luhn_worked_example_and_single_digit_errors():
    # "79927398713" is the worked example of the Luhn formula in the literature on ISO/IEC 7812
    # (from memory): check digit 3; the Luhn sum of the other digits is 67.
    assert luhn_valid("79927398713")
    # Luhn catches every single-digit error: changing any one digit of a valid number breaks it.
    for number in PUBLISHED_TEST_CARDS:
        for i in range(len(number)):
            for d in "0123456789":
                if d != number[i]:
                    assert not luhn_valid(number[:i] + d + number[i + 1 :]), (number, i, d)
    assert not luhn_valid("") and not luhn_valid("7") and not luhn_valid("4111-1111")


@given(st.text(alphabet="0123456789", min_size=12, max_size=18))
@settings(max_examples=300)
def test_luhn_check_digit_is_unique(payload):
    # Exactly one of the ten possible check digits completes any payload (ISO/IEC 7812-1 annex B).
    assert sum(luhn_valid(payload + d) for d in "0123456789") == 1


# --- cards in text --------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, expected",
    [
        ("my card 4111 1111 1111 1111 was charged twice", "my card [card] was charged twice"),
        ("card 4111-1111-1111-1111.", "card [card]."),
        ("amex 3782 822463 10005 refund", "amex [card] refund"),  # Amex 4-6-5 grouping
        ("pay with 5555555555554444?", "pay with [card]?"),
        ("in 2024 4111 1111 1111 1111 was declined", "in 2024 [card] was declined"),
        ("visa 4222222222222 expired", "visa [card] expired"),
    ],
)
def test_cards_are_redacted(text, expected):
    out, found = redact(text)
    assert out == expected
    assert found == Counter(card=1)


@pytest.mark.parametrize(
    "text",
    [
        "reference 4111111111111112",  # Luhn fails: not a card (and 16 digits: no phone either)
        "ticket 1234 5678 9012 3456 closed",  # 16 digits failing Luhn
        "invoice 12345678901234567890",  # 20 digits: longer than any card number
    ],
)
def test_non_luhn_digit_runs_are_not_cards(text):
    out, found = redact(text)
    assert found["card"] == 0 and "[card]" not in out


# --- e-mail addresses -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    "address",
    [
        # RFC 5322 Appendix A.1 examples
        "jdoe@one.test",
        "mary@x.test",
        "jdoe@node.example",
        "pete@silly.example",
        # RFC 3696 §3 examples (with the verified erratum 246 quoting) — unusual but valid local parts
        "customer/department=shipping@example.com",
        "$A12345@example.com",
        "!def!xyz%abc@example.com",
        "_somename@example.com",
        '"Abc@def"@example.com',
        '"Fred Bloggs"@example.com',
        # dot-atom with plus addressing and subdomains; an RFC 5322 §3.4.1 domain literal
        "first.last+note@mail.example.org",
        "jdoe@[192.0.2.1]",
        # SMTPUTF8 (RFC 6531) addresses: UTF-8 in local part and domain (forms from the UASG examples,
        # from memory)
        "用户@例子.广告",
        "अजय@डाटा.भारत",
        "квіточка@пошта.укр",
        "Dörte@Sörensen.example.com",
    ],
)
def test_email_forms_are_redacted(address):
    out, found = redact(f"please reset {address}, thanks")
    assert out == "please reset [email], thanks"
    assert found == Counter(email=1)


def test_email_in_angle_brackets_and_several_in_one_query():
    out, found = redact("John Doe <jdoe@machine.example> and Mary Smith <mary@example.net>")
    assert out == "John Doe <[email]> and Mary Smith <[email]>"
    assert found == Counter(email=2)


@pytest.mark.parametrize(
    "text",
    [
        "follow @fernhollow for outages",  # a handle, no local part
        "is me@home ok",  # dotless domain: left (module docstring)
        "price is 5@10 each",
        "version v1.2@beta",
    ],
)
def test_not_email(text):
    assert redact(text) == (text, Counter())


# --- phone numbers --------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "number",
    [
        # ITU-T E.123 §2 notation examples (from memory): international "+22 607 123 4567", national
        # "(0607) 123 4567"
        "+22 607 123 4567",
        "(0607) 123 4567",
        # E.164 in its canonical form: "+", country code, up to 15 digits in all
        "+14155550123",
        "+442079460958",
        "+999123456789012",
        # Numbers set aside for fiction (from memory): NANP 555-0100..0199, Ofcom 020 7946 0xxx, 07700 900xxx
        "(415) 555-0123",
        "415-555-0123",
        "415.555.0123",
        "1-415-555-0123",
        "+1 (415) 555-0123",
        "020 7946 0958",
        "+44 20 7946 0958",
        "0044 20 7946 0958",
        "07700 900123",
        "555-0123",
        # European groupings
        "+33 1 23 45 67 89",
        "01 23 45 67 89",
        "06-12-34-56-78",
        "+49 30 1234567",
        # a bare national number
        "4155550123",
    ],
)
def test_phone_formats_are_redacted(number):
    out, found = redact(f"call me on {number} tonight")
    assert out == "call me on [phone] tonight"
    assert found == Counter(phone=1)
    # A noun after the number is no unit: still a phone.
    assert redact(f"set {number} account") == ("set [phone] account", Counter(phone=1))


def test_phone_is_at_most_e164_long():
    # E.164: at most 15 digits including the country code. A longer run is a number followed by
    # other digits: the leading groups that fit are the phone.
    assert redact("call +1234 5678 9012 3456 now") == ("call [phone] 3456 now", Counter(phone=1))
    assert redact("+44 20 7946 0958 2025 2026") == ("[phone] 2025 2026", Counter(phone=1))
    assert redact("(415) 555-0123 4567 8901 23") == ("[phone] 8901 23", Counter(phone=1))  # longest first


@pytest.mark.parametrize(
    "text",
    [
        "rates for 2025",
        "Q3 2025 outages",
        "FY2024 budget",
        "bills from 2019-2024",
        "2023 2024 2025 rates",
        "due 2025-03-14",
        "due 14.03.2025",
        "due 03-14-2025",
        "updated 2025-03-14 10:30",
        "due 03/14/2025",
        "fee of $1,234.56",
        "fee $1 234 567",
        "1 234 567 EUR fund",
        "€ 12.345.678 budget",
        "5 000 000 dollars",
        "ext 1234",
        "zip 94103",
        "order 12345678",
        "server 192.168.100.200",
        "python 3.11.2",
        "room 101",
        "12.5% rise",
        "meter 123456",
        "between 9 and 17",
        "call at 10:30",
        "open 8.00 - 17.00 weekdays",
        "10.30-11.45 closed",
        "1.234.567 residents",
        "1 200 000 gallons a day",
    ],
)
def test_dates_amounts_and_short_numbers_are_not_phones(text):
    assert redact(text) == (text, Counter())


def test_card_and_phone_in_one_digit_run():
    assert redact("020 7946 0958 4111 1111 1111 1111") == ("[phone] [card]", Counter(phone=1, card=1))
    assert redact("4111 1111 1111 1111 020 7946 0958") == ("[card] [phone]", Counter(phone=1, card=1))


def test_mixed_query_counts_each_kind():
    text = (
        "I'm ann.lee@example.org, phone +44 20 7946 0958 or 020 7946 0123, "
        "card 4111 1111 1111 1111 billed 2025-03-14 for $45.20"
    )
    out, found = redact(text)
    assert out == "I'm [email], phone [phone] or [phone], card [card] billed 2025-03-14 for $45.20"
    assert found == Counter(email=1, phone=2, card=1)


@given(st.text(alphabet=st.characters(blacklist_categories=("Nd",)), max_size=80))
@settings(max_examples=300)
def test_text_without_digits_or_at_sign_is_untouched(text):
    text = text.replace("@", "")
    assert redact(text) == (text, Counter())


# --- generated personal data never survives -------------------------------------------------------

WORDS = st.sampled_from(["my", "bill", "is", "due", "2025", "Q3", "on", "call", "account", "FY2024", "ok"])


def _luhn_complete(payload: str) -> str:
    return next(payload + d for d in "0123456789" if luhn_valid(payload + d))


@given(
    st.text(alphabet="0123456789", min_size=12, max_size=18).filter(lambda p: p[0] not in "0"),
    st.sampled_from(["", " ", "-"]),
    st.lists(WORDS, max_size=4),
    st.lists(WORDS, max_size=4),
)
@settings(max_examples=300)
def test_any_card_number_is_redacted(payload, sep, before, after):
    digits = _luhn_complete(payload)
    card = sep.join(digits[i : i + 4] for i in range(0, len(digits), 4))
    out, found = redact(" ".join([*before, card, *after]))
    assert digits not in out.replace(" ", "").replace("-", "") and found["card"] == 1


@given(
    st.sampled_from(["1", "44", "49", "33", "353", "61", "81", "998"]),
    st.text(alphabet="0123456789", min_size=7, max_size=11).filter(lambda n: n[0] != "0"),
    st.sampled_from([" ", "-", "", "."]),
    st.lists(WORDS, max_size=3),
    st.lists(WORDS, max_size=3),
)
@settings(max_examples=300)
def test_any_e164_number_is_redacted(country, national, sep, before, after):
    # E.164: country code of 1–3 digits, at most 15 digits in all, written after "+" (E.123 §2).
    if len(country + national) > 15:
        return
    groups = [national[i : i + 3] for i in range(0, len(national), 3)]
    number = f"+{country} " + sep.join(groups)
    out, found = redact(" ".join([*before, number, *after]))
    assert found == Counter(phone=1) and national not in "".join(ch for ch in out if ch.isdigit())


@given(
    st.text(alphabet="abcdefghijklmnopqrstuvwxyz0123456789!#$%&'*+/=?^_`{|}~-", min_size=1, max_size=20),
    st.lists(st.text(alphabet="abcdefghijklmnopqrstuvwxyz0123456789", min_size=1, max_size=10), min_size=2, max_size=4),
    st.lists(WORDS, max_size=3),
    st.lists(WORDS, max_size=3),
)
@settings(max_examples=300)
def test_any_dot_atom_address_is_redacted(local, labels, before, after):
    address = f"{local}@{'.'.join(labels)}"
    out, found = redact(" ".join([*before, address, *after]))
    assert found["email"] == 1 and address not in out and "@" not in out


def test_digits_of_other_scripts_are_checked_too():
    # Python's \d matches every Unicode decimal digit (Nd); the Luhn check reads them by value.
    arabic_indic = "".join(chr(0x0660 + int(d)) for d in "4111111111111111")
    assert luhn_valid(arabic_indic)
    assert redact(f"card {arabic_indic}") == ("card [card]", Counter(card=1))
