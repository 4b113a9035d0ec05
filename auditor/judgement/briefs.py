"""Passages to write: the gap questions of a run, grouped into a to-do list an owner can write from.

Grouping, in two passes over the gap questions taken heaviest first (question-set order on a tie):

1. **shared missing terms** — a question joins the first brief whose seed (the missing terms of the
   question that opened it) shares at least `min_shared_terms` terms with its own, the brief
   sharing the most terms winning; else it opens a brief. Comparing with the seed only (leader
   clustering) keeps "autopay" and "meter" questions apart even when one question misses both.
2. **nearest topic** — what is left alone after pass 1 (one-question briefs, and gap questions whose
   terms all occur in the corpus) is grouped by its nearest topic: the question's `topic`, else the
   top heading of its best evidence passage's section, else that passage's folder.

Missing terms that a redacted query owes only to a placeholder ("[email]" read as "email") are
left out (`missing_terms`). Each brief: `title` (its terms, and its topic in parentheses), `terms`
(the missing terms — for a pass-1 brief those shared by two or more of its questions — by falling
weight), `weight` (the
questions' total), `owner` (by weight among the questions' owners: a question's owner, else its
best evidence passage's owner, else "unassigned"), `questions` (ids, heaviest first), `examples`
(up to three question texts) and `topic`. Briefs are sorted by weight, heaviest first; the output
depends only on the input, never on dict or set order.
"""

from __future__ import annotations

import re
from collections import Counter, defaultdict
from collections.abc import Sequence

from auditor.questions.redact import PLACEHOLDERS
from auditor.results import Brief, Evidence, QuestionResult

UNASSIGNED = "unassigned"
EXAMPLES = 3


def _owner(question: QuestionResult) -> str:
    owner = (question.owner or "").strip()
    if owner and owner != UNASSIGNED:
        return owner
    best = _best_evidence(question)
    owner = ((best.owner if best else None) or "").strip()
    return owner if owner and owner != UNASSIGNED else UNASSIGNED


def _best_evidence(question: QuestionResult) -> Evidence | None:
    if not question.evidence:
        return None
    # Evidence is stored best first; `rank` says so explicitly.
    return min(enumerate(question.evidence), key=lambda e: (e[1].rank, e[0]))[1]


def nearest_topic(question: QuestionResult) -> str | None:
    """The question's topic, else its best evidence's top heading, else that passage's folder."""
    topic = (question.topic or "").strip()
    if topic:
        return topic
    best = _best_evidence(question)
    if best is None:
        return None
    section = (best.section or "").split("›")[0].strip()
    if section:
        return section
    document = (best.document or "").strip()
    if not document:
        return None
    folder, _, name = document.rpartition("/")
    return folder or name


def missing_terms(question: QuestionResult) -> list[str]:
    """The question's missing terms, less those that only come from a redaction placeholder.

    A redacted query "my email is [email]" keeps the word; "write to [email]" tokenizes to the
    term "email" through its placeholder alone — nothing an owner should write about.
    """
    terms = list(dict.fromkeys(question.missing_terms))
    text = question.question or ""
    # Words of the placeholders present: "[national_id]" reads as "national" and "id".
    words = [w for k, placeholder in PLACEHOLDERS.items() if placeholder in text for w in k.split("_")]
    if not words:
        return terms
    bare = text
    for placeholder in PLACEHOLDERS.values():
        bare = bare.replace(placeholder, " ")

    def from_placeholder_only(term: str) -> bool:
        # Terms are stems ("nation" of "national"): a stem that begins a placeholder word and
        # begins no word of the question's own text came from the placeholder alone.
        return any(w.startswith(term) for w in words) and not re.search(rf"\b{re.escape(term)}", bare, re.IGNORECASE)

    return [t for t in terms if not from_placeholder_only(t)]


def _ordered_terms(members: list[QuestionResult], shared_only: bool) -> list[str]:
    weight: dict[str, float] = defaultdict(float)
    count: Counter[str] = Counter()
    first: dict[str, int] = {}
    for m in members:
        for term in missing_terms(m):
            weight[term] += float(m.weight)
            count[term] += 1
            first.setdefault(term, len(first))
    terms = [t for t in first if not shared_only or count[t] >= 2]
    return sorted(terms, key=lambda t: (-weight[t], -count[t], first[t]))


def _vote(values: list[tuple[str | None, float]], default):
    tally: dict[str, float] = defaultdict(float)
    for value, weight in values:
        if value is not None and value != UNASSIGNED:
            tally[value] += weight
    return min(tally, key=lambda v: (-tally[v], v)) if tally else default


def _brief(members: list[QuestionResult], shared_only: bool) -> Brief:
    terms = _ordered_terms(members, shared_only)
    if shared_only and not terms:  # cannot happen for a pass-1 brief, kept for safety
        terms = _ordered_terms(members, False)
    topic = _vote([(nearest_topic(m), float(m.weight)) for m in members], None)
    if terms:
        title = ", ".join(terms[:3]) + (f" ({topic})" if topic else "")
    else:
        title = topic or members[0].question
    return Brief(
        title=title,
        terms=terms,
        weight=sum(float(m.weight) for m in members),
        owner=_vote([(_owner(m), float(m.weight)) for m in members], UNASSIGNED),
        questions=[m.id for m in members],
        examples=[m.question for m in members[:EXAMPLES]],
        topic=topic,
    )


def content_briefs(question_results: Sequence[QuestionResult], *, min_shared_terms: int = 1) -> list[Brief]:
    """Passages to write (module docstring) for the gap questions of a run's `questions`."""
    if not isinstance(min_shared_terms, int) or min_shared_terms < 1:
        raise ValueError(f"min_shared_terms must be a whole number of at least 1, got {min_shared_terms!r}")
    gaps = [(pos, q) for pos, q in enumerate(question_results) if q.verdict == "gap"]
    gaps.sort(key=lambda pq: (-float(pq[1].weight), pq[0]))

    # Pass 1: leader clustering on missing terms.
    seeds: list[frozenset] = []
    clusters: list[list[QuestionResult]] = []
    leftovers: list[QuestionResult] = []
    for _pos, q in gaps:
        terms = frozenset(missing_terms(q))
        if not terms:
            leftovers.append(q)
            continue
        best, best_shared = None, 0
        for i, seed in enumerate(seeds):
            shared = len(terms & seed)
            if shared >= min_shared_terms and shared > best_shared:
                best, best_shared = i, shared
        if best is None:
            seeds.append(terms)
            clusters.append([q])
        else:
            clusters[best].append(q)

    order = {id(q): i for i, (_pos, q) in enumerate(gaps)}
    made: list[tuple[int, Brief]] = []  # (weight order of the brief's first question, brief)
    alone: list[QuestionResult] = []
    for members in clusters:
        if len(members) > 1:
            made.append((order[id(members[0])], _brief(members, shared_only=True)))
        else:
            alone.append(members[0])

    # Pass 2: what stands alone is grouped by nearest topic, in weight order.
    by_topic: dict[str, list[QuestionResult]] = {}
    for q in sorted(alone + leftovers, key=lambda q: order[id(q)]):
        topic = nearest_topic(q)
        if topic is None:
            made.append((order[id(q)], _brief([q], shared_only=False)))
        else:
            by_topic.setdefault(topic, []).append(q)
    for members in by_topic.values():
        made.append((order[id(members[0])], _brief(members, shared_only=False)))

    made.sort(key=lambda ob: (-ob[1].weight, ob[1].title, ob[0]))
    return [brief for _order, brief in made]
