"""Gaps at the level of the fact (docs/judgement.md): does the best passage hold the question's own
constraint, or only its topic?

A page on the right topic can lack what the question asks for: "How do I put a package on hold with
a graphical tool?" meets a page on holding packages that never names a graphical tool. The
constraint of a question is what sets it apart from other questions on the same topic:

* its rarest terms — the CONSTRAINT_TERMS terms of highest IDF (ties broken by question order;
  the words that ask for the answer type, "how much", "what date", are not among them), which must
  stand together in one sentence window of the passage (the window of
  `support.window_coverage`); a term the corpus never uses is always among them;
* the asked-for answer type (a date, an amount, a duration, a name, a place) in that window
  (`answer_types`).

`missing_constraint` says what the best passage lacks (empty when nothing); `weak_band` puts a
supported question in the weak band: its support is within the weak margin above the threshold (the
band of the `weak` flag, support.judge), or a constraint is missing. Such a question stays supported (the verdict vocabulary of results.json is
unchanged) and is shown to its owner as "needs a look" with the reason.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field

from auditor.judgement.answer_types import expected_answer_type, has_answer_type, without_cue
from auditor.judgement.support import WINDOW_SENTENCES, split_sentences

# Rarest question terms that make the constraint: two, because one rare term is usually the topic
# itself ("stash") and the second what is asked of it ("temporarily", "graphical"); common practice
# in passage retrieval for short queries, no source.
CONSTRAINT_TERMS = 2


@dataclass(frozen=True)
class MissingConstraint:
    """What the best passage lacks of the question's constraint."""

    terms: tuple[str, ...] = ()  # constraint terms not together in any sentence window
    answer_type: str | None = None  # the asked-for answer type when the window has none

    def __bool__(self) -> bool:
        return bool(self.terms) or self.answer_type is not None

    def as_json(self) -> dict:
        return {"terms": list(self.terms), "answer_type": self.answer_type}


def constraint_terms(terms: Sequence[str], idf: Mapping[str, float], n: int = CONSTRAINT_TERMS) -> list[str]:
    """The n highest-IDF distinct terms of the question, in question order."""
    distinct = list(dict.fromkeys(terms))
    ranked = sorted(range(len(distinct)), key=lambda i: (-idf.get(distinct[i], 0.0), i))[:n]
    return [distinct[i] for i in sorted(ranked)]


def missing_constraint(
    question: str,
    passage_text: str,
    *,
    idf: Mapping[str, float],
    tokenize: Callable[[str], list[str]],
    window: int = WINDOW_SENTENCES,
) -> MissingConstraint:
    """What of the question's constraint the passage lacks: the constraint terms missing from the
    sentence window that holds most of them, and the answer type when that window has none."""
    wanted = constraint_terms(tokenize(without_cue(question)), idf)
    spans = split_sentences(passage_text)
    sentence_terms = [set(tokenize(passage_text[a:b])) for a, b in spans]
    best: tuple[int, int, int] = (-1, 0, 0)  # (constraint terms found, first sentence, last sentence)
    for i in range(max(1, len(spans) - window + 1)):
        found = set().union(*sentence_terms[i : i + window]) if sentence_terms else set()
        count = sum(1 for t in wanted if t in found)
        if count > best[0]:
            best = (count, i, min(len(spans), i + window) - 1)
    first, last = best[1], best[2]
    present = set().union(*sentence_terms[first : last + 1]) if sentence_terms else set()
    lacking = tuple(t for t in wanted if t not in present)
    text = passage_text[spans[first][0] : spans[last][1]] if spans else ""
    asked = expected_answer_type(question)
    return MissingConstraint(lacking, asked if asked and not has_answer_type(text, asked) else None)


@dataclass(frozen=True)
class WeakBand:
    """Whether a supported question needs a look, and why."""

    needs_look: bool
    reasons: list[str] = field(default_factory=list)  # near_threshold, missing_constraint


def weak_band(support: float, threshold: float, missing: MissingConstraint, band: float) -> WeakBand:
    """A supported question needs a look when its support is within `band` (the weak margin) above
    the threshold or its best passage lacks part of the constraint."""
    reasons = []
    if threshold <= support < threshold + band:
        reasons.append("near_threshold")
    if missing:
        reasons.append("missing_constraint")
    return WeakBand(bool(reasons), reasons)
