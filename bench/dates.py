"""Temporal extraction: our extractor against dateparser.search.search_dates on the same paragraphs.

2,000 help-centre paragraphs (utility billing, service notices, IT help desk) are generated here
with a seeded generator: dated sentences whose date spans are known, undated sentences, and the
false-positive traps of the temporal issue ("May I", "march" as a verb, "sun", "We", page counters,
standard numbers, phone numbers, prices, quantities, versions, hour ranges). Each paragraph gets its
own document date, which anchors relative expressions for both extractors. The two extractors are
timed alternately, 50 paragraphs at a time, so that load from other work on the machine falls on
both alike; our relative-span cache starts empty.

Printed: paragraphs per CPU second for both and the ratio of CPU times (the figure to quote: both
run in this process, one thread each, so a busy shared machine moves it little), and the
wall-clock ratio beside it; for each extractor the spans found, how many overlap a generated date
span, our TIME/DURATION/SET expressions that overlap none (clock times, "10-15 minutes", "once a
month": TIMEX3 of their own types, which the generator does not mark), the false positives (other
found spans that overlap none) and the
date spans missed; the spans each found that the other did not (most frequent first); peak
Python memory of each (tracemalloc, on a subset, outside the timed runs). The machine is shared:
run it two or three times and quote the range.

    python -m bench.dates [--paragraphs 2000] [--seed 7]
"""

from __future__ import annotations

import argparse
import collections
import os
import random
import time
import tracemalloc
from datetime import date, datetime, timedelta

from auditor.temporal import extract as temporal
from auditor.temporal import patterns as temporal_patterns

MONTHS = [
    "January",
    "February",
    "March",
    "April",
    "May",
    "June",
    "July",
    "August",
    "September",
    "October",
    "November",
    "December",
]
WEEKDAYS = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"]


def _day(rng: random.Random) -> date:
    return date(2019, 1, 1) + timedelta(days=rng.randrange(365 * 8))


def date_phrase(rng: random.Random) -> str:
    """One date span as help-centre text writes it."""
    d = _day(rng)
    month, abbr = MONTHS[d.month - 1], MONTHS[d.month - 1][:3]
    forms = [
        lambda: f"{month} {d.day}, {d.year}",
        lambda: f"{abbr}. {d.day}, {d.year}",
        lambda: f"{d.day} {month} {d.year}",
        lambda: f"{WEEKDAYS[d.weekday()]}, {month} {d.day}, {d.year}",
        lambda: d.isoformat(),
        lambda: f"{d.month:02d}/{d.day:02d}/{d.year}",
        lambda: f"{month} {d.year}",
        lambda: f"Q{(d.month - 1) // 3 + 1} {d.year}",
        lambda: f"the {['first', 'second', 'third', 'fourth'][(d.month - 1) // 3]} quarter of {d.year}",
        lambda: f"H{1 if d.month <= 6 else 2} {d.year}",
        lambda: f"FY{d.year}",
        lambda: f"fiscal year {d.year}",
        lambda: f"{rng.choice(['spring', 'summer', 'fall', 'winter'])} {d.year}",
        lambda: f"{rng.choice(['early ', 'mid-', 'late '])}{d.year}",
        lambda: f"the end of {d.year}",
        lambda: f"{MONTHS[min(d.month, 11) - 1]} {min(d.day, 20)} to {MONTHS[min(d.month, 11)]} 15, {d.year}",
        lambda: f"{d.year}–{d.year + 1}",
        lambda: rng.choice(
            [
                "last month",
                "next quarter",
                "two weeks ago",
                "next year",
                "last year",
                "3 days ago",
                "in two weeks",
                "this month",
                "yesterday",
                "next month",
            ]
        ),
        lambda: "the 1990s",
    ]
    return rng.choice(forms)()


DATED = {
    "billing": [
        "As of {d}, the monthly base charge for a residential meter is ${price}.",
        "New volumetric rates take effect on {d}.",
        "The rate schedule for {d} is posted on the Rates page.",
        "Applications for the leak adjustment credit are accepted until {d}.",
        "Bills issued after {d} include the new wastewater surcharge.",
        "This page was last reviewed on {d}.",
        "Budget billing amounts were recalculated in {d}.",
        "The senior discount programme has been available since {d}.",
    ],
    "notices": [
        "Crews will replace the water main on {street} in {d}.",
        "A boil-water advisory was issued on {d} for the {zone} zone.",
        "Hydrant flushing in the {zone} district is scheduled for {d}.",
        "The {zone} reservoir was inspected in {d} and returned to service.",
        "Planned outage: {d}, between 9 a.m. and 3 p.m.",
        "Service interruptions are expected during {d}.",
    ],
    "helpdesk": [
        "The VPN client was upgraded {d}.",
        "Multi-factor authentication becomes mandatory on {d}.",
        "Laptop refresh for the {team} team is planned for {d}.",
        "Support for the legacy ticketing system ends on {d}.",
        "Password rules were last updated {d}.",
        "The file-share migration is expected to finish by {d}.",
    ],
}
UNDATED = [
    "Call the billing team if you have questions about your statement.",
    "You can pay online, by phone, or in person at the customer service centre.",
    "We recommend reading your meter once a month to catch leaks early.",
    "Restart your computer before you contact the service desk.",
    "Please have your account number ready when you call.",
    "The self-service portal lets you reset your password at any time.",
    "Most leaks come from running toilets and dripping taps.",
    "Our crews carry photo identification; ask to see it.",
]
TRAPS = [
    "May I set up a payment plan over the phone?",
    "You may march your request straight to the front counter.",
    "We can help you sign up for paperless billing.",
    "Use sun protection when you read meters outdoors.",
    "See page {n} of {m} in the customer handbook.",
    "Our laboratory is accredited to ISO 9001 and ISO/IEC 17025:2017.",
    "Call 1-800-555-{four} or 555-0134 to report a leak.",
    "Office hours are 9-5, Monday to Friday.",
    "The connection charge is ${year} for large industrial meters.",
    "We serve {year} households in the {zone} zone.",
    "Version 2.{n}.{year} of the app fixes the login bug.",
    "Turn the valve 1.5 turns and wait 10-15 minutes.",
    "Room {year} is on the second floor of the operations building.",
    "Error code {year} means the meter did not respond.",
    "Sat nav users should enter the postcode, not the street name.",
    "Upload files of up to 2048 MB to the ticket.",
]
STREETS = ["Alder Lane", "Birch Road", "Cedar Street", "Elm Street", "Oak Avenue"]
ZONES = ["Hillcrest", "Riverside", "North", "Millbrook"]
TEAMS = ["Finance", "Field Operations", "Customer Care"]


def make_paragraphs(count: int, seed: int) -> list[tuple[str, date, list[tuple[int, int]]]]:
    """(paragraph, document date, generated date spans) triples, about 85 words a paragraph."""
    rng = random.Random(seed)
    paragraphs = []
    for _ in range(count):
        topic = rng.choice(list(DATED))
        parts, truth, length = [], [], 0
        while length < 85:
            kind = rng.random()
            fill = {
                "price": f"{rng.randint(10, 40)}.{rng.randint(0, 99):02d}",
                "street": rng.choice(STREETS),
                "zone": rng.choice(ZONES),
                "team": rng.choice(TEAMS),
                "n": rng.randint(2, 30),
                "m": rng.randint(31, 60),
                "four": rng.randint(1000, 9999),
                "year": rng.randint(2000, 2030),
            }
            offset = sum(len(p) + 1 for p in parts)
            if kind < 0.45:
                template, phrase = rng.choice(DATED[topic]), date_phrase(rng)
                head = template.split("{d}")[0].format(**fill)
                if head.endswith(" in ") and phrase.startswith("in "):  # not "inspected in in two weeks"
                    phrase = phrase[3:]
                truth.append((offset + len(head), offset + len(head) + len(phrase)))
                sentence = head + phrase + template.split("{d}")[1].format(**fill)
            elif kind < 0.75:
                sentence = rng.choice(UNDATED)
            else:
                sentence = rng.choice(TRAPS).format(**fill)
            parts.append(sentence)
            length += len(sentence.split())
        paragraphs.append((" ".join(parts), _day(rng), truth))
    return paragraphs


def ours(paragraph: str, reference: date) -> list[tuple[int, int, str, str]]:
    return [(e.char_start, e.char_end, e.expression, e.timex_type) for e in temporal.extract(paragraph, reference)]


def theirs(paragraph: str, reference: date) -> list[tuple[int, int, str]]:
    from dateparser.search import search_dates

    found = (
        search_dates(
            paragraph,
            languages=["en"],
            settings={"RELATIVE_BASE": datetime(reference.year, reference.month, reference.day)},
        )
        or []
    )
    spans, at = [], 0
    for text, _ in found:  # search_dates gives strings; locate them in order
        start = paragraph.find(text, at)
        if start < 0:
            start = paragraph.find(text)
        spans.append((start, start + len(text), text))
        at = max(at, start + len(text))
    return spans


def _overlaps(span, others) -> bool:
    return any(span[0] < o[1] and o[0] < span[1] for o in others)


def run_interleaved(extractors, paragraphs, chunk=50):
    """Time each extractor over the same paragraphs, alternating every `chunk` paragraphs so that a
    change in the shared machine's load falls on both alike. Returns (CPU seconds, wall-clock
    seconds, results) per extractor: both run in this process on one thread, so CPU time is their
    cost, and wall-clock time on a busy machine is mostly the neighbours' (both are printed)."""
    cpu = [0.0] * len(extractors)
    wall = [0.0] * len(extractors)
    results: list[list] = [[] for _ in extractors]
    for at in range(0, len(paragraphs), chunk):
        part = paragraphs[at : at + chunk]
        for i, extractor in enumerate(extractors):
            started, started_cpu = time.perf_counter(), time.process_time()
            results[i].extend(extractor(text, reference) for text, reference, _ in part)
            cpu[i] += time.process_time() - started_cpu
            wall[i] += time.perf_counter() - started
    return list(zip(cpu, wall, results))


def peak_memory(extractor, paragraphs) -> float:
    tracemalloc.start()
    for text, reference, _ in paragraphs:
        extractor(text, reference)
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    return peak / 2**20


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--paragraphs", type=int, default=2000)
    parser.add_argument("--seed", type=int, default=7)
    args = parser.parse_args()
    paragraphs = make_paragraphs(args.paragraphs, args.seed)
    words = sum(len(p.split()) for p, _, _ in paragraphs) / len(paragraphs)
    truth_count = sum(len(t) for _, _, t in paragraphs)
    print(f"{len(paragraphs)} paragraphs, {words:.0f} words each on average, {truth_count} generated date spans")

    ours("warm up 2024-01-01 and two weeks ago", date(2024, 1, 1))  # imports, pattern compilation
    theirs("warm up 2024-01-01", date(2024, 1, 1))
    temporal_patterns.dateparser_span.cache_clear()
    (our_time, our_wall, our_found), (their_time, their_wall, their_found) = run_interleaved([ours, theirs], paragraphs)
    n = len(paragraphs)
    print(f"\n{'':28}{'ours':>12}{'dateparser':>14}")
    print(f"{'paragraphs per CPU second':28}{n / our_time:12.0f}{n / their_time:14.1f}")
    print(f"{'CPU ms per paragraph':28}{1000 * our_time / n:12.3f}{1000 * their_time / n:14.3f}")
    print(f"{'wall-clock ms per paragraph':28}{1000 * our_wall / n:12.3f}{1000 * their_wall / n:14.3f}")
    print(f"speed ratio (dateparser CPU time / ours): {their_time / our_time:.1f}x")
    print(f"wall-clock ratio (load {os.getloadavg()[0]:.1f}): {their_wall / our_wall:.1f}x")

    stats = {}
    only = {"ours": collections.Counter(), "dateparser": collections.Counter()}
    for name, found in (("ours", our_found), ("dateparser", their_found)):
        other = their_found if name == "ours" else our_found
        spans = hits = false_positive = missed = other_kinds = 0
        for (_text, _, truth), mine, others in zip(paragraphs, found, other):
            spans += len(mine)
            hits += sum(1 for s in mine if _overlaps(s, truth))
            # a clock time, duration or schedule ("9 a.m.", "10-15 minutes", "once a month") is a
            # TIMEX3 of its own type, not a date span: counted apart (dateparser types nothing)
            other_kinds += sum(1 for s in mine if not _overlaps(s, truth) and s[3:4] not in ((), ("DATE",)))
            false_positive += sum(1 for s in mine if not _overlaps(s, truth) and s[3:4] in ((), ("DATE",)))
            missed += sum(1 for t in truth if not _overlaps(t, mine))
            for s in mine:
                if not _overlaps(s, others):
                    only[name][s[2]] += 1
        stats[name] = (spans, hits, other_kinds, false_positive, missed)
    print(f"\n{'':28}{'ours':>12}{'dateparser':>14}")
    labels = [
        "spans found",
        "overlap a date span",
        "TIME/DURATION/SET elsewhere",
        "false positives",
        "date spans missed",
    ]
    for i, label in enumerate(labels):
        print(f"{label:28}{stats['ours'][i]:12d}{stats['dateparser'][i]:14d}")
    for name in ("ours", "dateparser"):
        print(f"\nfound by {name} only: {sum(only[name].values())} spans, {len(only[name])} distinct; most frequent:")
        for text, count in only[name].most_common(12):
            print(f"  {count:5d}  {text!r}")

    subset = paragraphs[:200]
    print(
        f"\npeak Python memory over {len(subset)} paragraphs (tracemalloc): "
        f"ours {peak_memory(ours, subset):.1f} MiB, dateparser {peak_memory(theirs, subset):.1f} MiB"
    )


if __name__ == "__main__":
    main()
