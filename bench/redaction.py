"""Redaction quality per kind on a generated query log, and import speed.

    python -m bench.redaction [--lines 10000] [--seed 20261203] [--speed-lines 100000] [--region US]

1. Quality: `generate(lines, seed)` writes questions to the invented Fernhollow Water Cooperative
   (demo scenario, fixtures/demo/README.md) with personal data planted in known places, plus lines
   that hold no personal data but the usual traps (dates, amounts, years, versions, opening hours,
   "this is urgent", "I'm moving and"). The planted values come from outside this project wherever
   a source exists:
   * phone: `phonenumbers.example_number_for_type` (libphonenumber's own example numbers) of every
     region, fixed-line, mobile and toll-free, in E.164 and international format, and in national
     format for the default region;
   * national_id: the example numbers in the docstrings of the `stdnum` modules redaction uses
     (`stdnum.us.ssn`, `stdnum.es.dni`, ...), kept where that module validates them;
   * iban: example IBANs of the SWIFT IBAN registry (ISO 13616; from memory, each one validated by
     `stdnum.iban` here and in tests/test_redact.py);
   * card: the test card numbers the card networks publish for test systems (from memory, each
     Luhn-checked by `stdnum.luhn`);
   * ip: the documentation ranges, RFC 5737 (IPv4) and RFC 3849 (IPv6);
   * email: RFC 2606 reserved domains; names, street addresses, account numbers and dates of birth
     are invented (no standard lists them).
   Each line's redaction is compared with what was planted: a planted value counts as found for its
   kind when it is gone from the output and the line's count for that kind covers it; every other
   find of a kind is a false positive. Recall and precision per kind are printed.
2. Speed: `import_query_log` over `--speed-lines` generated lines, lines per second (CPU time).

First run, 2026-12-03, on the commit that added this script (the detectors were written against the
kinds' standards and tests/test_redact.py, before this set was generated; the figures after it are
in-sample, since the set's traps were then used to check the phone layout rule): see bench/README.md.
"""

from __future__ import annotations

import argparse
import csv
import importlib
import random
import re
import tempfile
import time
from collections import Counter
from pathlib import Path

import phonenumbers
from phonenumbers import PhoneNumberFormat, PhoneNumberType
from stdnum import iban, luhn

from auditor.questions.querylog import import_query_log
from auditor.questions.redact import KINDS, RedactionOptions, redact

# Example IBANs of the SWIFT IBAN registry, one per country (from memory; stdnum.iban validates
# each, so a misremembered one fails tests/test_redact.py::test_published_example_ibans).
EXAMPLE_IBANS = [
    "DE89370400440532013000",
    "GB29NWBK60161331926819",
    "FR1420041010050500013M02606",
    "NL91ABNA0417164300",
    "BE68539007547034",
    "ES9121000418450200051332",
    "IT60X0542811101000000123456",
    "CH9300762011623852957",
    "AT611904300234573201",
    "DK5000400440116243",
    "FI2112345600000785",
    "NO9386011117947",
    "SE4550000000058398257466",
    "PL61109010140000071219812874",
    "IE29AIBK93115212345678",
    "PT50000201231234567890154",
]
# Test card numbers published by the card networks and processors (from memory; Luhn-valid).
TEST_CARDS = [
    "4111111111111111",
    "4012888888881881",
    "4222222222222",
    "5555555555554444",
    "5105105105105100",
    "378282246310005",
    "371449635398431",
    "6011111111111117",
    "30569309025904",
    "3530111333300000",
]
# stdnum modules whose docstring examples are planted, with the cue words people write before them.
NATIONAL_MODULES = {
    "us.ssn": ["SSN", "social security number"],
    "es.dni": ["DNI"],
    "es.nie": ["NIE"],
    "fi.hetu": ["HETU"],
    "se.personnummer": ["personnummer"],
    "dk.cpr": ["CPR"],
    "br.cpf": ["CPF"],
    "ca.sin": ["SIN"],
    "de.idnr": ["Steuer-ID", "IdNr"],
    "fr.nir": ["NIR"],
    "no.fodselsnummer": ["fødselsnummer"],
    "nl.bsn": ["BSN"],
    "pl.pesel": ["PESEL"],
    "gb.nhs": ["NHS number"],
    "in_.aadhaar": ["Aadhaar"],
}
_DOCTEST_CALL = re.compile(r">>> (?:validate|compact|is_valid|format)\('([^']+)'\)")

FIRST = ["Maria", "Tom", "Ann", "Jordan", "Sam", "Priya", "Lukas", "Aiko", "Omar", "Elena", "Chidi", "Ines"]
LAST = ["Lopez", "Baker", "Lee", "Pike", "Okafor", "Nair", "Brandt", "Sato", "Haddad", "Petrova", "Eze", "Moreau"]
STREETS = ["Oak", "Birch", "Alder", "Mill", "Fern Hollow", "Quarry", "Heron", "Willow", "Station", "Kingfisher"]
STREET_TYPES = ["Street", "Road", "Avenue", "Lane", "Drive", "Way", "Court", "Close", "St", "Rd", "Ave"]
MONTHS = ["January", "March", "April", "June", "July", "September", "October", "December", "Feb", "Aug", "Nov"]
DOMAINS = ["example.org", "example.com", "mail.example.net", "例子.广告"]

TEMPLATES = {
    "email": ["my email is {v} and I cannot log in", "send the final bill to {v} please", "contact {v} about the leak"],
    "iban": ["IBAN {v} refund please", "please pay the refund to {v}", "my bank account {v} was debited twice"],
    "national_id": ["my {cue} is {v}", "{cue}: {v} for the hardship fund", "why do you need my {cue} {v}"],
    "card": ["my card {v} was charged twice", "I paid with card {v} and it failed", "refund to {v} please"],
    "birth_date": ["date of birth {v} for the senior discount", "DOB {v}", "I was born on {v}, am I eligible"],
    "account": ["where is my order number {v}", "account {v} shows a late fee", "customer no. {v} moved out"],
    "ip": ["I cannot log in from {v}", "the portal blocks {v} since Monday", "error from address {v}"],
    "phone": ["call me back on {v} about the pressure", "change my contact number to {v}", "text {v} when fixed"],
    "address": ["is there a leak at {v}", "start service at {v} next week", "the meter at {v} is broken"],
    "name": ["Hi, my name is {v} and my water is brown", "this is {v}, my bill is wrong", "I'm {v} and I moved"],
}
# Lines with no personal data, full of what redaction must leave alone. Invented (demo scenario).
DISTRACTORS = [
    "bills from 2019-2024 are in the portal",
    "is the office open 8.00 - 17.00 on weekdays",
    "rates for 2025 went up by 4.5%",
    "due 2025-03-14 for $45.20",
    "the 2025-26 budget adds 1 200 000 gallons a day",
    "this is urgent, the main on Alder Street burst",
    "I'm moving and need to stop service",
    "my name is not showing on the bill",
    "what is on my order history",
    "invoice 2025 has the wrong total",
    "the portal runs version 3.11.2",
    "call between 9 and 17 on weekdays",
    "Q3 2025 outage report",
    "room 101 at the treatment works",
    "a 5 minute walk from the office",
    "zip code 94103 service area",
    "meter size 5/8 inch",
    "water hardness 120 mg per litre",
    "the 12 day drought warning",
    "call 311 for city services",
    "is 1.5 kg of salt enough for the softener",
    "updated 2025-03-14 10:30",
    "FY2024 annual report",
    "page 12 of 15 of the rate schedule",
    "boil water notice 3 of 2025",
    "How do I pay my water bill online",
    "this is Fernhollow's new rate plan",
    "ages 10-12 and 13-15 for the school tour",
]


def _example_phones(region: str) -> list[tuple[str, str]]:
    """(number as written, default region) pairs from libphonenumber's example numbers."""
    out = []
    for code in sorted(phonenumbers.SUPPORTED_REGIONS):
        for kind in (PhoneNumberType.FIXED_LINE, PhoneNumberType.MOBILE, PhoneNumberType.TOLL_FREE):
            number = phonenumbers.example_number_for_type(code, kind)
            if number is None:
                continue
            out.append(phonenumbers.format_number(number, PhoneNumberFormat.E164))
            out.append(phonenumbers.format_number(number, PhoneNumberFormat.INTERNATIONAL))
            if code == region:
                out.append(phonenumbers.format_number(number, PhoneNumberFormat.NATIONAL))
    return [(p, region) for p in dict.fromkeys(out)]


def example_national_ids() -> list[tuple[str, str]]:
    """(value, cue word) pairs: the stdnum modules' own docstring examples that they validate."""
    out = []
    for name, cues in NATIONAL_MODULES.items():
        module = importlib.import_module(f"stdnum.{name}")
        for value in dict.fromkeys(_DOCTEST_CALL.findall(module.__doc__ or "")):
            if module.is_valid(value) and "\n" not in value:
                out.extend((value, cue) for cue in cues)
    return out


def _paper(value: str) -> str:
    return " ".join(value[i : i + 4] for i in range(0, len(value), 4))


def _value(kind: str, rng: random.Random, i: int, pools: dict) -> tuple[str, dict]:
    if kind == "email":
        local = rng.choice(["ann.lee", "bo_stone", "carla+bills", "dev.o'neil", "eve-marsh", "hana.ito"])
        return f"{local}{i}@{rng.choice(DOMAINS)}", {}
    if kind == "iban":
        value = rng.choice(EXAMPLE_IBANS)
        return (_paper(value) if rng.random() < 0.6 else value), {}
    if kind == "national_id":
        value, cue = rng.choice(pools["national_id"])
        return value, {"cue": cue}
    if kind == "card":
        value = rng.choice(TEST_CARDS)
        style = rng.randrange(3)
        return (value if style == 0 else ("-" if style == 2 else " ").join(_paper(value).split())), {}
    if kind == "birth_date":
        day, month, year = rng.randint(1, 28), rng.randint(1, 12), rng.randint(1930, 2005)
        forms = [
            f"{day:02d}/{month:02d}/{year}",
            f"{year}-{month:02d}-{day:02d}",
            f"{day} {rng.choice(MONTHS)} {year}",
            f"{rng.choice(MONTHS)} {day}, {year}",
            f"{day}.{month}.{year}",
        ]
        return rng.choice(forms), {}
    if kind == "account":
        digits = "".join(rng.choice("0123456789") for _ in range(rng.randint(6, 10)))
        return rng.choice([digits, f"FH-{digits}", f"A{digits}"]), {}
    if kind == "ip":
        if rng.random() < 0.6:
            net = rng.choice(["192.0.2", "198.51.100", "203.0.113"])
            return f"{net}.{rng.randint(1, 254)}", {}
        return f"2001:db8:{rng.randint(0, 0xFFFF):x}::{rng.randint(1, 0xFFFF):x}", {}
    if kind == "phone":
        return rng.choice(pools["phone"])[0], {}
    if kind == "address":
        number = f"{rng.randint(1, 2999)}{rng.choice(['', '', 'b'])}"
        return f"{number} {rng.choice(STREETS)} {rng.choice(STREET_TYPES)}", {}
    if kind == "name":
        return f"{rng.choice(FIRST)} {rng.choice(LAST)}" if rng.random() < 0.7 else rng.choice(FIRST), {}
    raise ValueError(kind)


def generate(lines: int, seed: int, region: str = "US") -> list[tuple[str, list[tuple[str, str]]]]:
    """[(line, [(kind, planted value), ...])]: about one line in four is a trap with nothing planted,
    the others plant one or two values (every kind equally often)."""
    assert all(iban.is_valid(v, check_country=False) for v in EXAMPLE_IBANS) and all(
        luhn.is_valid(v) for v in TEST_CARDS
    )
    rng = random.Random(seed)
    pools = {"phone": _example_phones(region), "national_id": example_national_ids()}
    out = []
    for i in range(lines):
        if rng.random() < 0.25:
            out.append((rng.choice(DISTRACTORS), []))
            continue
        parts, planted = [], []
        for kind in rng.sample(KINDS, 2 if rng.random() < 0.2 else 1):
            value, extra = _value(kind, rng, i, pools)
            parts.append(rng.choice(TEMPLATES[kind]).format(v=value, **extra))
            planted.append((kind, value))
        out.append((" and ".join(parts), planted))
    return out


def score(log: list[tuple[str, list[tuple[str, str]]]], options: RedactionOptions) -> dict[str, tuple[int, int, int]]:
    """kind -> (planted, found, true finds) over the log."""
    planted_n: Counter = Counter()
    found_n: Counter = Counter()
    true_n: Counter = Counter()
    for line, planted in log:
        out, found = redact(line, options)
        found_n.update(found)
        per_kind: Counter = Counter()
        for kind, value in planted:
            planted_n[kind] += 1
            if value not in out:
                per_kind[kind] += 1
        for kind, caught in per_kind.items():
            true_n[kind] += min(caught, found[kind])
    return {kind: (planted_n[kind], found_n[kind], true_n[kind]) for kind in KINDS}


def write_csv(log, path: Path) -> None:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        writer = csv.writer(fh)
        writer.writerow(["query", "count"])
        for line, _ in log:
            writer.writerow([line, 1])


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--lines", type=int, default=10_000)
    parser.add_argument("--seed", type=int, default=20261203)
    parser.add_argument("--speed-lines", type=int, default=100_000)
    parser.add_argument("--region", default="US")
    args = parser.parse_args(argv)

    log = generate(args.lines, args.seed, args.region)
    results = score(log, RedactionOptions(region=args.region))
    print(f"{args.lines} generated lines, seed {args.seed}, default phone region {args.region}")
    print(f"{'kind':<12} {'planted':>8} {'found':>8} {'true':>8} {'recall':>8} {'precision':>9}")
    worst_recall = worst_precision = 1.0
    for kind, (planted, found, true) in results.items():
        recall = true / planted if planted else 1.0
        precision = true / found if found else 1.0
        worst_recall, worst_precision = min(worst_recall, recall), min(worst_precision, precision)
        print(f"{kind:<12} {planted:>8} {found:>8} {true:>8} {recall:>8.4f} {precision:>9.4f}")
    print(f"lowest recall {worst_recall:.4f} (target >= 0.99), lowest precision {worst_precision:.4f} (target >= 0.98)")

    if args.speed_lines:
        with tempfile.TemporaryDirectory() as tmp:
            path = Path(tmp) / "queries.csv"
            write_csv(generate(args.speed_lines, args.seed + 1, args.region), path)
            started = time.process_time()
            _, summary = import_query_log(path)
            seconds = time.process_time() - started
        print(
            f"import of {summary.records} lines: {seconds:.1f} s CPU, {summary.records / seconds:,.0f} lines per second "
            f"({summary.questions} questions, {sum(summary.redacted.values())} redactions)"
        )
    return 0 if worst_recall >= 0.99 and worst_precision >= 0.98 else 1


if __name__ == "__main__":
    raise SystemExit(main())
