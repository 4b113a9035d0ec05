"""Gaps at the level of the fact (auditor/judgement/constraints.py): what of the question's own
constraint the best passage lacks, and the weak band."""

from __future__ import annotations

from auditor.judgement.constraints import (
    MissingConstraint,
    constraint_terms,
    missing_constraint,
    weak_band,
)
from auditor.retrieval.tokenize import Tokenizer

TOKENIZE = Tokenizer().tokenize


def idf_of(question: str, values: dict[str, float]) -> dict[str, float]:
    return {t: values.get(t, 1.0) for t in TOKENIZE(question)}


def test_constraint_terms_are_the_rarest_in_question_order():
    idf = {"hold": 2.0, "packag": 0.5, "graphic": 3.0, "tool": 1.0}
    assert constraint_terms(["hold", "packag", "graphic", "tool"], idf) == ["hold", "graphic"]
    assert constraint_terms(["packag"], idf) == ["packag"]
    assert constraint_terms(["a", "b", "a"], {"a": 1.0, "b": 1.0}, n=1) == ["a"]  # ties: first in the question


def test_a_page_on_the_topic_without_the_qualifier_misses_the_constraint():
    question = "How do I put a package on hold with a graphical tool?"
    idf = idf_of(question, {"hold": 2.0, "graphic": 3.0, "packag": 0.4})
    topic_only = "To hold a package, run apt-mark hold with its name. The package is then kept back."
    missing = missing_constraint(question, topic_only, idf=idf, tokenize=TOKENIZE)
    assert missing.terms == ("graphic",) and missing.answer_type is None
    assert missing.as_json() == {"terms": ["graphic"], "answer_type": None}
    answering = "Synaptic, a graphical tool, can hold a package: select it and choose Lock Version."
    assert not missing_constraint(question, answering, idf=idf, tokenize=TOKENIZE)


def test_the_terms_must_stand_together_in_one_window():
    question = "How much is the reconnection fee?"
    idf = idf_of(question, {"reconnect": 3.0, "fee": 2.0})
    scattered = "Reconnection is arranged by Customer Care.\n\nOpening hours vary.\n\nA fee list is on the rates page."
    missing = missing_constraint(question, scattered, idf=idf, tokenize=TOKENIZE)
    assert missing.terms == ("fee",)  # the window holding "reconnection" lacks "fee"
    together = "Reconnection after a shut-off carries a fee of $45."
    assert not missing_constraint(question, together, idf=idf, tokenize=TOKENIZE)


def test_the_asked_for_answer_type_is_part_of_the_constraint():
    question = "When is the reconnection fee charged?"
    idf = idf_of(question, {"reconnect": 3.0, "fee": 2.0})
    undated = "The reconnection fee is charged with the next bill."
    assert missing_constraint(question, undated, idf=idf, tokenize=TOKENIZE).answer_type == "date"
    dated = "The reconnection fee is charged on the first Monday after service is restored."
    assert missing_constraint(question, dated, idf=idf, tokenize=TOKENIZE).answer_type is None


WEAK_BAND = 0.05  # the shipped weak margin (auditor/config.py)


def test_weak_band():
    nothing = MissingConstraint()
    assert weak_band(0.60, 0.45, nothing, WEAK_BAND).needs_look is False
    assert weak_band(0.45 + WEAK_BAND / 2, 0.45, nothing, WEAK_BAND).reasons == ["near_threshold"]
    assert weak_band(0.45 + WEAK_BAND, 0.45, nothing, WEAK_BAND).needs_look is False  # the band is half-open
    missing = MissingConstraint(("graphic",))
    assert weak_band(0.90, 0.45, missing, WEAK_BAND).reasons == ["missing_constraint"]
    assert weak_band(0.46, 0.45, missing, WEAK_BAND).reasons == ["near_threshold", "missing_constraint"]


def test_the_words_asking_for_the_answer_type_are_no_constraint():
    # "much" may be the rarest word of a small corpus; it asks for an amount, which the answer type
    # already checks, so it must not be reported missing.
    question = "How much is the reconnection fee?"
    idf = idf_of(question, {"much": 5.0, "reconnect": 3.0, "fee": 2.0})
    text = "Reconnection after a shut-off carries a fee of $45."
    assert not missing_constraint(question, text, idf=idf, tokenize=TOKENIZE)
