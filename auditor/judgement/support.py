"""Support judgement (docs/judgement.md): how well a retrieved passage supports a question, and the
verdict (supported / stale / gap) of a question from its evidence.

Scoring is a handful of small pure functions over plain values, so each signal can be tested and
measured on its own (bench/holdout.py prints what each one contributes):

* `bm25_share`      — the BM25 score over the question's maximum achievable score Σ idf_t·(k1+1)
                      (the bound holds because a BM25 term weight tf·(k1+1)/(tf + k1·norm) < k1+1).
* `term_coverage`   — the IDF-weighted share of the question's terms that the passage contains.
                      Terms the corpus never uses carry the highest IDF, so a question about
                      something the knowledge base never mentions cannot be supported.
* `window_coverage` — the same share inside the best window of consecutive sentences: a passage
                      supports a question when the question's terms occur *together*, not
                      scattered over a long passage (proximity, common practice in passage
                      retrieval; e.g. Tao & Zhai, SIGIR 2007, "An exploration of proximity measures").
* `phrase_coverage` — the IDF-weighted share of the question's adjacent term pairs that also stand
                      next to each other (either order) in the passage: "typing override" asks for
                      something else than a page that says "typing" in one place and "override" in
                      another (term dependence as in the unordered windows of the sequential
                      dependence model, Metzler & Croft, SIGIR 2005; here the narrowest window).
* answer-type cues  — a when / how much / how long / who / where question needs a date / amount /
                      duration / name / place in the supporting window (auditor.judgement.answer_types);
                      otherwise support is multiplied by ANSWER_TYPE_PENALTY (reason
                      `no_answer_type`).

`support` combines the signals with the weights in SIGNAL_WEIGHTS (a convex combination, so support
stays in [0, 1]).
"""

from __future__ import annotations

import re
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field

from auditor.judgement.answer_types import expected_answer_type, has_answer_type

# The registry of support signals and their weights in the combined score. The weights were chosen
# on three corpora at once (bench/shared_defaults.py): the demo, the SciFact hold-out and the Python
# manual — the mean F1 of the gap verdict at the shared threshold, with no corpus left behind; they
# sum to 1.
SIGNAL_WEIGHTS: dict[str, float] = {"bm25": 0.3, "coverage": 0.3, "window": 0.2, "phrase": 0.2}

# Support of a passage without the asked-for answer type is multiplied by this. A soft downgrade:
# on the three corpora a harder one (0.8) cost more true answers than it caught gaps
# (bench/shared_defaults.py).
ANSWER_TYPE_PENALTY = 0.9

# Sentences per window (a question is usually answered within two adjacent sentences; common
# practice, no source).
WINDOW_SENTENCES = 2

# A sentence ends at . ! ? followed by a space, or at a line break (lists, table rows, headings).
_SENTENCE_BREAK = re.compile(r"(?<=[.!?])\s+|\n+")

ACTIONS = ("write", "refresh", "retire")


# --- signals --------------------------------------------------------------------------------------


def bm25_share(score: float, max_score: float) -> float:
    """BM25 score normalized by the question's maximum achievable score, in [0, 1]."""
    if max_score <= 0:
        return 0.0
    return min(1.0, max(0.0, score / max_score))


def term_coverage(present: Iterable[str], idf: Mapping[str, float]) -> float:
    """IDF-weighted share of the question's terms (keys of `idf`) that occur in `present`."""
    total = sum(max(0.0, w) for w in idf.values())
    if total <= 0:
        return 0.0
    present = set(present)
    return sum(max(0.0, w) for t, w in idf.items() if t in present) / total


def split_sentences(text: str) -> list[tuple[int, int]]:
    """(start, end) character offsets of the sentences of `text`, in order, blanks skipped."""
    spans, start = [], 0
    for match in _SENTENCE_BREAK.finditer(text):
        if text[start : match.start()].strip():
            spans.append((start, match.start()))
        start = match.end()
    if text[start:].strip():
        spans.append((start, len(text)))
    return spans


def window_coverage(
    sentence_terms: Sequence[set[str]], idf: Mapping[str, float], window: int = WINDOW_SENTENCES
) -> tuple[float, int]:
    """Best IDF-weighted term coverage over windows of `window` consecutive sentences.

    Returns (coverage, index of the window's first sentence); (0.0, 0) for a passage without
    sentences. A passage shorter than the window is one window.
    """
    if not sentence_terms:
        return 0.0, 0
    best, best_at = -1.0, 0
    for i in range(max(1, len(sentence_terms) - window + 1)):
        terms = set().union(*sentence_terms[i : i + window])
        value = term_coverage(terms, idf)
        if value > best:
            best, best_at = value, i
    return best, best_at


def phrase_coverage(tokens: Sequence[str], question_terms: Sequence[str], idf: Mapping[str, float]) -> float:
    """IDF-weighted share of the question's adjacent term pairs found adjacent (either order) in
    `tokens`; a pair weighs idf_a + idf_b. A one-term question has no pairs: its term coverage
    stands in, so the signal does not punish short questions."""
    pairs = list(dict.fromkeys((a, b) for a, b in zip(question_terms, question_terms[1:]) if a != b))
    if not pairs:
        return term_coverage(tokens, idf)
    adjacent = set(zip(tokens, tokens[1:]))
    weight = lambda pair: max(0.0, idf.get(pair[0], 0.0)) + max(0.0, idf.get(pair[1], 0.0))
    total = sum(weight(p) for p in pairs)
    if total <= 0:
        return 0.0
    return sum(weight(p) for p in pairs if p in adjacent or (p[1], p[0]) in adjacent) / total


def combine(signals: Mapping[str, float], weights: Mapping[str, float] = SIGNAL_WEIGHTS) -> float:
    """Weighted mean of the signals named in `weights`, in [0, 1]."""
    total = sum(weights.values())
    if total <= 0:
        raise ValueError("signal weights must sum to more than 0")
    return sum(w * signals[name] for name, w in weights.items()) / total


@dataclass(frozen=True)
class PassageSupport:
    """Support of one passage for one question, with the signals it came from."""

    support: float
    signals: dict[str, float]
    window: tuple[int, int]  # character span of the best sentence window in the passage text
    answer_type: str | None  # what the question asks for, None when nothing specific
    answer_type_found: bool


def passage_support(
    question: str,
    passage_text: str,
    *,
    score: float,
    max_score: float,
    idf: Mapping[str, float],
    tokenize: Callable[[str], list[str]],
    weights: Mapping[str, float] = SIGNAL_WEIGHTS,
    window: int = WINDOW_SENTENCES,
) -> PassageSupport:
    """Support of `passage_text` for `question` from its BM25 score and its text.

    `idf` maps every question term (tokenized as the index does) to its IDF; `tokenize` must be
    the index's tokenizer so that terms match.
    """
    spans = split_sentences(passage_text)
    sentence_tokens = [tokenize(passage_text[a:b]) for a, b in spans]
    sentence_terms = [set(tokens) for tokens in sentence_tokens]
    passage_terms = set().union(*sentence_terms) if sentence_terms else set()
    win, first = window_coverage(sentence_terms, idf, window)
    if spans:
        span = (spans[first][0], spans[min(len(spans), first + window) - 1][1])
    else:
        span = (0, 0)
    signals = {
        "bm25": bm25_share(score, max_score),
        "coverage": term_coverage(passage_terms, idf),
        "window": win,
        "phrase": phrase_coverage([t for tokens in sentence_tokens for t in tokens], tokenize(question), idf),
    }
    value = combine(signals, weights)
    answer_type = expected_answer_type(question)
    found = has_answer_type(passage_text[span[0] : span[1]], answer_type)
    if not found:
        value *= ANSWER_TYPE_PENALTY
    return PassageSupport(round(value, 6), signals, span, answer_type, found)


# --- verdicts -------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Judged:
    """What the judge makes of one piece of evidence: support and freshness."""

    support: float
    fresh: bool
    reasons: tuple[str, ...] = ()  # stale reasons of the passage (too_old, expired, overtaken)
    as_of_source: str = "statement"
    answer_type_found: bool = True


@dataclass
class Verdict:
    verdict: str  # supported | stale | gap
    reasons: list[str]
    flags: list[str]
    action: str | None
    support: float
    supporting: list[bool] = field(default_factory=list)  # per evidence item


_STALE_ORDER = ("too_old", "expired", "overtaken")


def judge(evidence: Sequence[Judged], *, threshold: float, weak_margin: float) -> Verdict:
    """Verdict of a question from its judged evidence (docs/judgement.md).

    supported — some supporting passage is fresh; flags `stale_competitor` (a stale passage supports
              it too), `weak` (best fresh support < threshold + weak_margin), `file_dated` (the
              fresh support rests on file times only), `undated` (it rests on passages with no
              date at all, which count as fresh for want of evidence).
    stale   — supporting passages exist, none fresh; reasons are their stale reasons; action
              `retire` when every one has ended (expired or overtaken), else `refresh`.
    gap     — nothing supports it; action `write`. Reasons are freshness reasons (docs/freshness.md),
              so a gap has none; what explains it is in the evidence: the question's
              `missing_terms`, the per-passage signals, and the flag below.
    Any verdict gets the flag `no_answer_type` when the passage with the highest support lacks the
    asked-for answer type (its support was downgraded).
    """
    supporting = [e.support >= threshold for e in evidence]
    best = max((e.support for e in evidence), default=0.0)
    flags: list[str] = []
    chosen = [e for e, s in zip(evidence, supporting) if s]
    fresh = [e for e in chosen if e.fresh]
    stale = [e for e in chosen if not e.fresh]
    strongest = max(evidence, key=lambda e: e.support) if evidence else None
    if strongest is not None and not strongest.answer_type_found:
        flags.append("no_answer_type")
    if fresh:
        if stale:
            flags.append("stale_competitor")
        top = max(e.support for e in fresh)
        if top < threshold + weak_margin:
            flags.append("weak")
        if all(e.as_of_source == "file" for e in fresh):
            flags.append("file_dated")
        elif all(e.as_of_source == "none" for e in fresh):
            flags.append("undated")
        return Verdict("supported", [], _ordered(flags), None, top, supporting)
    if stale:
        reasons = sorted({r for e in stale for r in e.reasons}, key=_reason_key)
        ended = all(set(e.reasons) & {"expired", "overtaken"} for e in stale)
        return Verdict(
            "stale",
            reasons,
            _ordered(flags),
            "retire" if ended else "refresh",
            max(e.support for e in stale),
            supporting,
        )
    return Verdict("gap", [], _ordered(flags), "write", best, supporting)


def _reason_key(reason: str) -> int:
    return _STALE_ORDER.index(reason) if reason in _STALE_ORDER else len(_STALE_ORDER)


_FLAG_ORDER = (
    "stale_competitor",
    "weak",
    "conflicting_values",
    "file_dated",
    "undated",
    "no_answer_type",
)


def ordered_flags(flags: list[str]) -> list[str]:
    """Flags once each, in the order the report lists them."""
    return _ordered(flags)


def _ordered(flags: list[str]) -> list[str]:
    return sorted(set(flags), key=lambda f: _FLAG_ORDER.index(f) if f in _FLAG_ORDER else len(_FLAG_ORDER))
