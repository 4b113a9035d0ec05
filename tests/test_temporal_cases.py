"""Table-driven check of the extractor against sentences written for the project.

tests/data/temporal_cases.jsonl holds help-centre sentences (the fictional Fernhollow Water
Cooperative, an IT help desk, and every pattern family of docs/dates.md), each with the expected
expressions: [span as written, start, end, granularity, role]. It includes the false-positive traps
the common false positives ("May I", "march" as a verb, weekdays, versions, phone numbers, page counters,
standard numbers, prices, quantities, hour ranges) with no expected expression. The reference
(document) date is 2024-11-01 unless a case gives `ref`; `opts` are extract() options.

The expected values were worked out by hand from the calendar and the conventions in
auditor/temporal.py's docstring, not produced by the extractor. Cases marked with a "set" were
written after the extractor's rules were in place, and run once before any rule was changed for
them; their first-run figures were:
  holdout   40 sentences: precision 1.000, recall 0.943, role accuracy 0.909 (33 matched)
  holdout2  30 sentences: precision 0.963, recall 0.963, role accuracy 0.731 (26 matched)
  holdout3  30 sentences: precision 1.000, recall 1.000, role accuracy 0.880 (25 matched)
  holdout4  30 sentences: precision 0.960, recall 0.960, role accuracy 0.875 (24 matched); two of
            its labels were then corrected to the documented conventions (the end of a week is its
            last third with the remainder, Nov 8–10; a past "expired on" is an event, as "closed on"
            is), which accounts for the one extra/missed pair and one role miss
so role accuracy on unseen text is lower than on the table the rules grew with; the figures of
each set are printed apart.
"""

from __future__ import annotations

import json
from datetime import date
from pathlib import Path

import pytest

from auditor.temporal.extract import extract

CASES = Path(__file__).parent / "data" / "temporal_cases.jsonl"
DEFAULT_REFERENCE = "2024-11-01"


def load_cases():
    cases = []
    for number, line in enumerate(CASES.read_text(encoding="utf-8").splitlines(), start=1):
        if line.strip():
            case = json.loads(line)
            case["line"] = number
            cases.append(case)
    return cases


def spans(text: str, written: str) -> list[tuple[int, int]]:
    found, at = [], text.find(written)
    while at >= 0:
        found.append((at, at + len(written)))
        at = text.find(written, at + 1)
    return found


def score(case):
    """(matched pairs, false positives, misses) for one case; a found expression matches an expected
    one when their spans overlap and start, end and granularity are equal."""
    reference = date.fromisoformat(case.get("ref", DEFAULT_REFERENCE))
    found = extract(case["text"], reference, **case.get("opts", {}))
    expected = [tuple(item) for item in case["expect"]]
    used, pairs, false_positives = set(), [], []
    for expression in found:
        for i, (written, start, end, granularity, _role) in enumerate(expected):
            if i in used:
                continue
            overlaps = any(
                expression.char_start < e and s < expression.char_end for s, e in spans(case["text"], written)
            )
            if overlaps and (expression.start.isoformat(), expression.end.isoformat(), expression.granularity) == (
                start,
                end,
                granularity,
            ):
                used.add(i)
                pairs.append((expression, expected[i]))
                break
        else:
            false_positives.append(expression)
    misses = [item for i, item in enumerate(expected) if i not in used]
    return pairs, false_positives, misses


def test_table_has_enough_cases():
    cases = load_cases()
    assert len(cases) >= 150
    # the traps: sentences in which nothing is a date
    assert sum(1 for c in cases if not c["expect"]) >= 30


def figures(cases):
    """(precision, recall, role accuracy, counts, problems) over `cases`."""
    true_positive = false_positive = false_negative = right_role = 0
    problems = []
    for case in cases:
        pairs, extra, missed = score(case)
        true_positive += len(pairs)
        false_positive += len(extra)
        false_negative += len(missed)
        right_role += sum(1 for found, expected in pairs if found.role == expected[4])
        problems += [f"line {case['line']}: extra {e.expression!r} {e.start}..{e.end} {e.granularity}" for e in extra]
        problems += [f"line {case['line']}: missed {m}" for m in missed]
        problems += [
            f"line {case['line']}: {f.expression!r} role {f.role}, expected {x[4]}" for f, x in pairs if f.role != x[4]
        ]
    precision = true_positive / (true_positive + false_positive)
    recall = true_positive / (true_positive + false_negative)
    counts = f"{len(cases)} sentences, {true_positive} matched, {false_positive} extra, {false_negative} missed"
    return precision, recall, right_role / true_positive, counts, problems


def test_precision_recall_and_role_accuracy(capsys):
    cases = load_cases()
    precision, recall, role_accuracy, counts, problems = figures(cases)
    with capsys.disabled():
        print(
            f"\ntemporal cases: precision {precision:.3f}, recall {recall:.3f}, "
            f"role accuracy {role_accuracy:.3f} ({counts})"
        )
        for name in sorted({c["set"] for c in cases if c.get("set")}):
            held = figures([c for c in cases if c.get("set") == name])
            print(
                f"  of which {name}: precision {held[0]:.3f}, recall {held[1]:.3f}, "
                f"role accuracy {held[2]:.3f} ({held[3]})"
            )
        for problem in problems:
            print("  " + problem)
    assert precision >= 0.95
    assert recall >= 0.95
    assert role_accuracy >= 0.90


@pytest.mark.parametrize("case", [c for c in load_cases() if not c["expect"]], ids=lambda c: c["text"][:40])
def test_traps_yield_nothing(case):
    reference = date.fromisoformat(case.get("ref", DEFAULT_REFERENCE))
    assert extract(case["text"], reference, **case.get("opts", {})) == []
