"""Support signals and verdict rules (docs/judgement.md)."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from rank_bm25 import BM25Okapi

from auditor.judgement.answer_types import ANSWER_TYPES, expected_answer_type, has_answer_type
from auditor.judgement.support import (
    ANSWER_TYPE_PENALTY,
    SIGNAL_WEIGHTS,
    Judged,
    bm25_share,
    combine,
    judge,
    passage_support,
    phrase_coverage,
    split_sentences,
    term_coverage,
    window_coverage,
)
from auditor.judgement.verdicts import CONFLICT_FLAG, EvidencePassage, fact_check
from auditor.retrieval.tokenize import Tokenizer

TOKENIZE = Tokenizer().tokenize


# --- signals ----------------------------------------------------------------------------------------

WORDS = st.sampled_from("meter leak bill rate water main pipe valve fee".split())


@settings(max_examples=60, deadline=None)
@given(
    docs=st.lists(st.lists(WORDS, min_size=1, max_size=12), min_size=2, max_size=8),
    query=st.lists(WORDS, min_size=1, max_size=4, unique=True),
)
def test_bm25_share_stays_below_one_for_the_reference_scores(docs, query):
    # The bound Σ idf_t·(k1+1) holds because each BM25 term weight tf·(k1+1)/(tf + K) < k1 + 1
    # (Robertson & Zaragoza, "The Probabilistic Relevance Framework: BM25 and Beyond", 2009, §3.4).
    # Scores and idf values are rank-bm25's (BM25Okapi), so the bound is checked on another
    # implementation's numbers; ours here is only bm25_share, a division clamped to [0, 1], checked to
    # be score / max_score below the bound. Our BM25 itself is held to rank-bm25 in test_bm25_references.py.
    bm25 = BM25Okapi(docs, k1=1.2, b=0.75)
    max_score = sum(max(bm25.idf.get(t, 0.0), 0.0) * (1.2 + 1) for t in query)
    for score in bm25.get_scores(query):
        share = bm25_share(score, max_score)
        assert 0.0 <= share <= 1.0
        if max_score > 0 and score > 0:
            assert score < max_score
            assert share == pytest.approx(score / max_score)


def test_bm25_share_approaches_one_as_term_frequency_grows():
    # tf·(k1+1)/(tf + k1) → k1+1 as tf → ∞ for a passage of average length (same source).
    k1, idf = 1.2, 2.0
    weight = lambda tf: idf * tf * (k1 + 1) / (tf + k1)
    assert bm25_share(weight(1), idf * (k1 + 1)) == pytest.approx(1 / (k1 + 1))
    assert bm25_share(weight(1000), idf * (k1 + 1)) > 0.99
    assert bm25_share(5.0, 0.0) == 0.0


def test_term_coverage_is_the_idf_weighted_share():
    idf = {"autopay": 3.0, "bill": 1.0}
    assert term_coverage({"bill"}, idf) == pytest.approx(0.25)  # 1 / (3 + 1), by hand
    assert term_coverage({"bill", "autopay", "other"}, idf) == 1.0
    assert term_coverage(set(), idf) == 0.0
    assert term_coverage({"x"}, {}) == 0.0


def test_split_sentences_breaks_at_stops_and_lines():
    text = "Pay online. Or call us!\n- item one\n\nLast line"
    spans = split_sentences(text)
    assert [text[a:b] for a, b in spans] == ["Pay online.", "Or call us!", "- item one", "Last line"]
    assert split_sentences("   ") == []


def test_window_coverage_needs_the_terms_together():
    idf = {"leak": 2.0, "report": 1.0}
    scattered = [{"leak"}, {"other"}, {"other"}, {"report"}]
    together = [{"other"}, {"leak"}, {"report"}, {"other"}]
    assert window_coverage(scattered, idf, 2) == (pytest.approx(2 / 3), 0)
    assert window_coverage(together, idf, 2) == (1.0, 1)
    assert window_coverage([], idf) == (0.0, 0)
    assert window_coverage([{"leak"}], idf, 3) == (pytest.approx(2 / 3), 0)


def test_phrase_coverage_counts_adjacent_pairs_in_either_order():
    idf = {"typing": 1.0, "override": 3.0, "decorator": 2.0}
    question = ["typing", "override", "decorator"]  # pairs weigh 4 and 5
    assert phrase_coverage(["override", "decorator", "typing"], question, idf) == pytest.approx(5 / 9)
    assert phrase_coverage(["override", "typing", "decorator"], question, idf) == pytest.approx(4 / 9)
    assert phrase_coverage(["typing", "x", "override", "y", "decorator"], question, idf) == 0.0
    assert phrase_coverage(["typing", "override", "decorator"], question, idf) == 1.0
    # One term: no pairs, term coverage stands in.
    assert phrase_coverage(["override"], ["override"], {"override": 3.0}) == 1.0
    assert phrase_coverage(["typing"], ["override"], {"override": 3.0}) == 0.0


def test_combine_is_a_weighted_mean():
    assert sum(SIGNAL_WEIGHTS.values()) == pytest.approx(1.0)
    assert combine({name: 1.0 for name in SIGNAL_WEIGHTS}) == pytest.approx(1.0)
    assert combine({name: 0.0 for name in SIGNAL_WEIGHTS}) == 0.0
    assert combine({"a": 0.2, "b": 0.8}, {"a": 1, "b": 3}) == pytest.approx(0.65)
    with pytest.raises(ValueError):
        combine({"a": 1}, {"a": 0})


def _support(question, text, score=5.0):
    terms = TOKENIZE(question)
    idf = {t: 1.0 for t in terms}
    return passage_support(question, text, score=score, max_score=2.2 * len(idf), idf=idf, tokenize=TOKENIZE)


def test_passage_support_prefers_a_passage_that_answers_in_one_window():
    question = "How do I report a water leak?"
    close = "To report a water leak, call the leak line. Crews come out day and night."
    far = (
        "Water use rises in summer. Gardens need care. Meters are read monthly. "
        "You can report problems online. A leak may raise your bill."
    )
    a, b = _support(question, close), _support(question, far)
    assert a.signals["coverage"] == b.signals["coverage"] == 1.0
    assert a.signals["window"] == 1.0 > b.signals["window"]
    assert a.support > b.support
    assert close[a.window[0] : a.window[1]].startswith("To report a water leak")


def test_passage_support_downgrades_when_the_answer_type_is_absent():
    question = "When does the rebate programme close?"
    dated = "The rebate programme closes on 30 June 2025."
    undated = "The rebate programme closes once the budget is spent."
    a, b = _support(question, dated), _support(question, undated)
    assert a.answer_type == "date" and a.answer_type_found and not b.answer_type_found
    assert b.support == pytest.approx(a.support * ANSWER_TYPE_PENALTY, abs=1e-6)


# --- answer types -----------------------------------------------------------------------------------


# Coarse classes after Li & Roth (COLING 2002): NUM:date, NUM:money/count, NUM:period, HUM, LOC.
@pytest.mark.parametrize(
    "question, answer_type",
    [
        ("When is the office open?", "date"),
        ("What time does the lobby close?", "date"),
        ("How much is the late fee?", "amount"),
        ("How many meters can one account have?", "amount"),
        ("What does a new connection cost?", "amount"),
        ("How long does a reconnection take?", "duration"),
        ("How often are meters read?", "duration"),
        ("Who do I call about a burst pipe?", "name"),
        ("Which team handles rebates?", "name"),
        ("Where do I drop off my payment?", "place"),
        ("Can I pay my bill by phone?", None),
        ("What is a boil-water advisory?", None),
    ],
)
def test_expected_answer_type(question, answer_type):
    assert expected_answer_type(question) == answer_type


@pytest.mark.parametrize(
    "text, answer_type, found",
    [
        ("Rates changed on 1 March 2024.", "date", True),
        ("The lobby is open weekdays 8 a.m. to 5 p.m.", "date", True),
        ("Rates change from time to time.", "date", False),
        ("The late fee is $12.50.", "amount", True),
        ("Connections are free for new homes.", "amount", True),
        ("There is a fee.", "amount", False),
        ("Reconnection takes 2 business days.", "duration", True),
        ("Reconnection takes three to five days.", "duration", True),
        ("Reconnection is quick.", "duration", False),
        ("Call Customer Care about burst pipes.", "name", True),
        ("Our field crew will come out.", "name", True),
        ("Call us.", "name", False),
        ("Drop payments at 12 Mill Road.", "place", True),
        ("Pay on our website.", "place", True),
        ("Pay it soon.", "place", False),
    ],
)
def test_has_answer_type(text, answer_type, found):
    assert has_answer_type(text, answer_type) is found


def test_has_answer_type_without_a_type_and_with_an_unknown_one():
    assert has_answer_type("anything", None)
    with pytest.raises(ValueError, match="unknown answer type"):
        has_answer_type("x", "colour")
    assert set(ANSWER_TYPES) == {"date", "amount", "duration", "name", "place"}


# --- verdicts ---------------------------------------------------------------------------------------

T, M = 0.45, 0.05


def test_no_evidence_is_a_gap_to_write():
    v = judge([], threshold=T, weak_margin=M)
    assert (v.verdict, v.reasons, v.flags, v.action, v.support) == ("gap", [], [], "write", 0.0)


def test_low_support_is_a_gap():
    v = judge([Judged(0.30, True), Judged(0.20, False, ("too_old",))], threshold=T, weak_margin=M)
    assert v.verdict == "gap" and v.reasons == [] and v.action == "write"
    assert v.supporting == [False, False] and v.support == 0.30


def test_a_fresh_supporting_passage_covers_and_flags_competitors():
    v = judge([Judged(0.80, False, ("too_old",)), Judged(0.47, True, (), "file")], threshold=T, weak_margin=M)
    assert v.verdict == "supported" and v.action is None and v.reasons == []
    assert v.flags == ["stale_competitor", "weak", "file_dated"]
    assert v.support == 0.47 and v.supporting == [True, True]


def test_support_resting_on_undated_passages_is_flagged():
    # Undated passages count as fresh for want of evidence (freshness.py); the flag says so.
    v = judge([Judged(0.90, True, (), "none")], threshold=T, weak_margin=M)
    assert (v.verdict, v.flags) == ("supported", ["undated"])
    mixed = judge([Judged(0.90, True, (), "none"), Judged(0.60, True, (), "statement")], threshold=T, weak_margin=M)
    assert mixed.flags == []


def test_supported_without_flags():
    v = judge([Judged(0.90, True, (), "statement"), Judged(0.10, False, ("expired",))], threshold=T, weak_margin=M)
    assert (v.verdict, v.flags) == ("supported", [])


def test_stale_only_support_is_refreshed_or_retired():
    old = judge([Judged(0.7, False, ("too_old",)), Judged(0.6, False, ("expired",))], threshold=T, weak_margin=M)
    assert old.verdict == "stale" and old.reasons == ["too_old", "expired"] and old.action == "refresh"
    ended = judge(
        [Judged(0.7, False, ("overtaken",)), Judged(0.6, False, ("expired", "too_old"))], threshold=T, weak_margin=M
    )
    assert ended.reasons == ["too_old", "expired", "overtaken"] and ended.action == "retire"


def test_missing_answer_type_is_flagged_on_the_strongest_passage():
    support = 0.48 * ANSWER_TYPE_PENALTY  # below T only because of the downgrade
    v = judge([Judged(support, True, answer_type_found=False)], threshold=T, weak_margin=M)
    assert v.verdict == "gap" and v.reasons == [] and v.flags == ["no_answer_type"]
    supported = judge([Judged(0.3, True), Judged(0.6, True, answer_type_found=False)], threshold=T, weak_margin=M)
    assert supported.verdict == "supported" and supported.flags == ["no_answer_type"]
    fine = judge([Judged(0.6, True), Judged(0.3, True, answer_type_found=False)], threshold=T, weak_margin=M)
    assert fine.flags == []


def test_threshold_is_inclusive():
    assert judge([Judged(T, True)], threshold=T, weak_margin=0.0).verdict == "supported"
    assert judge([Judged(math.nextafter(T, 0), True)], threshold=T, weak_margin=0.0).verdict == "gap"


# --- what a judged question gains beyond its verdict (auditor/judgement/verdicts.py) ---------------


def _evidence(pid, document, text, support, fresh=True):
    first, last = split_sentences(text)[0][0], split_sentences(text)[-1][1]
    return EvidencePassage(pid, document, text, (first, last), support, fresh)


def test_fact_check_reports_missing_constraint_weak_band_and_conflict():
    # Demo-style passages (invented Fernhollow help-centre text, like fixtures/demo).
    question = "How much is the reconnection fee?"
    idf = {t: 2.0 for t in TOKENIZE(question)} | {"reconnect": 3.0}
    evidence = [
        _evidence(1, "billing/fees.md", "The reconnection fee is $45 after a shut-off.", 0.80),
        _evidence(2, "customer-care/moving.md", "Reconnection costs $60; the fee is on your next bill.", 0.70),
        _evidence(3, "billing/old-fees.md", "The reconnection fee was $30.", 0.75, fresh=False),
    ]
    checked = fact_check(
        question,
        evidence,
        verdict="supported",
        support=0.80,
        threshold=0.45,
        weak_margin=0.05,
        idf=idf,
        tokenize=TOKENIZE,
    )
    shown = checked.as_json()
    assert shown["missing_constraint"] == {"terms": [], "answer_type": None}
    assert shown["needs_look"] is False and shown["look_reasons"] == []
    # The stale $30 page does not count: the two fresh ones disagree.
    assert [v["value"] for v in shown["conflict"]["values"]] == ["$45", "$60"]
    assert CONFLICT_FLAG == "conflicting_values"
    # Below the threshold the second page no longer supports, so nothing conflicts.
    alone = fact_check(
        question,
        evidence,
        verdict="supported",
        support=0.80,
        threshold=0.72,
        weak_margin=0.05,
        idf=idf,
        tokenize=TOKENIZE,
    )
    assert alone.conflict is None


def test_fact_check_weak_band_only_for_supported_questions():
    question = "How do I put a package on hold with a graphical tool?"
    idf = {t: 1.0 for t in TOKENIZE(question)} | {"hold": 2.0, "graphic": 3.0}
    evidence = [_evidence(1, "pkg.html", "To hold a package, run apt-mark hold with its name.", 0.47)]
    near = fact_check(
        question,
        evidence,
        verdict="supported",
        support=0.47,
        threshold=0.45,
        weak_margin=0.05,
        idf=idf,
        tokenize=TOKENIZE,
    )
    assert near.look.reasons == ["near_threshold", "missing_constraint"]
    assert near.missing.terms == ("graphic",)
    gap = fact_check(
        question, evidence, verdict="gap", support=0.47, threshold=0.5, weak_margin=0.05, idf=idf, tokenize=TOKENIZE
    )
    assert gap.look.needs_look is False and gap.missing.terms == ("graphic",)  # a gap still says why
    nothing = fact_check(
        question, [], verdict="gap", support=0.0, threshold=0.45, weak_margin=0.05, idf=idf, tokenize=TOKENIZE
    )
    assert nothing.missing.terms == ("hold", "graphic")
