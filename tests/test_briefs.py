"""Passages to write from the gap questions of a run (auditor/judgement/briefs.py: gaps grouped by shared
missing terms and nearest topic, with total weight, example questions and a suggested owner)."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from auditor.judgement.briefs import content_briefs, missing_terms, nearest_topic
from auditor.results import QuestionResult


def q(qid, text, *, verdict="gap", weight=1.0, missing=(), owner=None, topic=None, evidence=()):
    """A question's result, read from its results.json shape (docs/results-json.md)."""
    return QuestionResult.from_json(
        {
            "id": qid,
            "question": text,
            "owner": owner,
            "topic": topic,
            "weight": weight,
            "verdict": verdict,
            "reasons": [],
            "support": 0.1,
            "missing_terms": list(missing),
            "evidence": [dict(e) for e in evidence],
        }
    )


def ev(document, section="", owner="unassigned", rank=1):
    return {
        "rank": rank,
        "document": document,
        "page": None,
        "section": section,
        "passage": None,
        "owner": owner,
        "score": 1.0,
        "support": 0.2,
        "supporting": False,
        "as_of": None,
        "as_of_source": None,
        "expires": None,
        "fresh": True,
        "reasons": [],
        "text": "",
    }


# Invented demo questions (fixtures/demo/README.md).
RUN = [
    q("q01", "How much is the base charge?", verdict="supported", weight=96, topic="rates", owner="Billing"),
    q("q02", "Can I sign up for autopay?", weight=40, missing=["autopay"], topic="payments", owner="Billing"),
    q(
        "q03",
        "Does autopay work with a credit union account?",
        weight=25,
        missing=["autopay", "union"],
        topic="payments",
    ),
    q("q04", "Is there an autopay discount?", weight=10, missing=["autopay", "discount"]),
    q(
        "q05",
        "Do you offer a graywater permit?",
        weight=30,
        missing=["graywat", "permit"],
        evidence=[ev("conservation/rebates.md", "Rebates › Toilets", owner="Conservation Programs")],
    ),
    q(
        "q06",
        "Can I get a rain barrel?",
        weight=12,
        missing=["barrel"],
        evidence=[ev("conservation/rebates.md", "Rebates › Closed programmes", owner="Conservation Programs")],
    ),
    q(
        "q07",
        "What is the lead service line inventory?",
        weight=8,
        missing=["inventori"],
        topic="quality",
        owner="Water Quality",
    ),
    q(
        "q08",
        "Why is my pressure low at night?",
        weight=5,
        missing=[],
        evidence=[ev("field/pressure.md", "", owner="Field Operations")],
    ),
    q("q09", "Is the advisory lifted?", verdict="stale", weight=50, topic="quality"),
    q("q10", "Can I pay with crypto?", weight=2, missing=["crypto"]),
]


def test_briefs_of_the_demo_like_run():
    briefs = content_briefs(RUN)
    assert [b.to_json() for b in briefs] == [
        {
            "title": "autopay (payments)",
            "terms": ["autopay"],
            "weight": 75.0,
            "owner": "Billing",
            "questions": ["q02", "q03", "q04"],
            "examples": [
                "Can I sign up for autopay?",
                "Does autopay work with a credit union account?",
                "Is there an autopay discount?",
            ],
            "topic": "payments",
        },
        # Nothing shared by term; grouped by the top heading of the nearest passage.
        {
            "title": "graywat, permit, barrel (Rebates)",
            "terms": ["graywat", "permit", "barrel"],
            "weight": 42.0,
            "owner": "Conservation Programs",
            "questions": ["q05", "q06"],
            "examples": ["Do you offer a graywater permit?", "Can I get a rain barrel?"],
            "topic": "Rebates",
        },
        {
            "title": "inventori (quality)",
            "terms": ["inventori"],
            "weight": 8.0,
            "owner": "Water Quality",
            "questions": ["q07"],
            "examples": ["What is the lead service line inventory?"],
            "topic": "quality",
        },
        # No missing term, no section: the passage's folder is the nearest topic.
        {
            "title": "field",
            "terms": [],
            "weight": 5.0,
            "owner": "Field Operations",
            "questions": ["q08"],
            "examples": ["Why is my pressure low at night?"],
            "topic": "field",
        },
        {
            "title": "crypto",
            "terms": ["crypto"],
            "weight": 2.0,
            "owner": "unassigned",
            "questions": ["q10"],
            "examples": ["Can I pay with crypto?"],
            "topic": None,
        },
    ]


def test_every_gap_once_and_nothing_else():
    briefs = content_briefs(RUN)
    ids = [i for b in briefs for i in b.questions]
    assert sorted(ids) == sorted(x.id for x in RUN if x.verdict == "gap")
    assert sum(b.weight for b in briefs) == sum(x.weight for x in RUN if x.verdict == "gap")


def test_min_shared_terms_two_splits_single_term_overlap():
    run = [
        q("a", "A", weight=3, missing=["autopay", "union"]),
        q("b", "B", weight=2, missing=["autopay", "union", "fee"]),
        q("c", "C", weight=1, missing=["autopay", "discount"]),
    ]
    one = content_briefs(run)
    assert [b.questions for b in one] == [["a", "b", "c"]]
    assert one[0].terms == ["autopay", "union"]  # shared by two or more questions
    two = content_briefs(run, min_shared_terms=2)
    assert [b.questions for b in two] == [["a", "b"], ["c"]]
    with pytest.raises(ValueError):
        content_briefs(run, min_shared_terms=0)


def test_owner_rules_question_then_evidence_then_unassigned():
    def owner(*questions):
        return content_briefs(list(questions))[0].owner

    assert owner(q("a", "A", missing=["x"], owner="Billing", evidence=[ev("d.md", owner="Customer Care")])) == "Billing"
    assert (
        owner(q("a", "A", missing=["x"], owner="unassigned", evidence=[ev("d.md", owner="Customer Care")]))
        == "Customer Care"
    )
    # The best evidence is rank 1, wherever it stands in the list.
    ranked = [ev("d.md", owner="Field Operations", rank=2), ev("e.md", owner="Billing", rank=1)]
    assert owner(q("a", "A", missing=["x"], evidence=ranked)) == "Billing"
    assert owner(q("a", "A", missing=["x"])) == "unassigned"
    # A brief's owner is the weight majority of its questions' owners.
    mixed = [
        q("a", "A", weight=2, missing=["x"], owner="Billing"),
        q("b", "B", weight=3, missing=["x"], owner="Customer Care"),
        q("c", "C", weight=2, missing=["x"], owner="Billing"),
    ]
    assert owner(*mixed) == "Billing"


def test_leader_clustering_does_not_chain():
    # b shares a term with a and with c, but c shares nothing with a's seed: c stands alone.
    run = [
        q("a", "A", weight=3, missing=["meter"]),
        q("b", "B", weight=2, missing=["meter", "autopay"]),
        q("c", "C", weight=1, missing=["autopay"]),
    ]
    assert [b.questions for b in content_briefs(run)] == [["a", "b"], ["c"]]


def test_no_gaps_no_briefs():
    assert content_briefs([x for x in RUN if x.verdict != "gap"]) == []
    assert content_briefs([]) == []


def test_nearest_topic():
    assert nearest_topic(q("a", "A", topic="rates", evidence=[ev("x/y.md", "S › T")])) == "rates"
    assert nearest_topic(q("a", "A", evidence=[ev("x/y.md", "Paying › By phone")])) == "Paying"
    assert nearest_topic(q("a", "A", evidence=[ev("billing/late/fees.md")])) == "billing/late"
    assert nearest_topic(q("a", "A", evidence=[ev("faq.md")])) == "faq.md"
    assert nearest_topic(q("a", "A")) is None


@given(
    st.lists(
        st.tuples(
            st.sets(st.sampled_from(["autopay", "meter", "leak", "fee", "rebate"]), max_size=3),
            st.sampled_from([None, "rates", "leaks"]),
            st.sampled_from(["gap", "gap", "supported", "stale"]),
        ),
        max_size=25,
    ),
    st.randoms(use_true_random=False),
)
@settings(max_examples=150)
def test_partition_weight_and_order_independence(specs, rnd):
    # Distinct weights: the briefs cannot depend on the order the questions arrive in.
    run = [
        q(f"q{i}", f"Q{i}", verdict=v, weight=float(len(specs) - i) + 0.5, missing=sorted(m), topic=t)
        for i, (m, t, v) in enumerate(specs)
    ]
    briefs = content_briefs(run)
    gap_ids = sorted(x.id for x in run if x.verdict == "gap")
    assert sorted(i for b in briefs for i in b.questions) == gap_ids
    assert [b.weight for b in briefs] == sorted((b.weight for b in briefs), reverse=True)
    for b in briefs:
        members = [x for x in run if x.id in b.questions]
        assert b.weight == sum(x.weight for x in members)
        assert b.examples == [x.question for x in members][:3]
        for term in b.terms:
            assert any(term in x.missing_terms for x in members)
    shuffled = run[:]
    rnd.shuffle(shuffled)
    assert content_briefs(shuffled) == briefs


def test_terms_from_redaction_placeholders_are_no_content():
    # Query-log text is redacted to "[email]" etc.; the tokenizer reads the placeholder as a word.
    only = q("a", "write to [email] about autopay", missing=["email", "autopay"])
    said = q("b", "my email [email] bounces", missing=["email", "bounc"])
    assert missing_terms(only) == ["autopay"]
    assert missing_terms(said) == ["email", "bounc"]
    assert missing_terms(q("c", "call [phone]", missing=["phone", "call"])) == ["call"]
    # Two-word kinds tokenize to two stems (Snowball English: "national" -> "nation").
    two = q(
        "e",
        "is my [national_id] or [birth_date] needed for a rebate",
        missing=["nation", "id", "birth", "date", "rebat"],
    )
    assert missing_terms(two) == ["rebat"]
    kept = q("f", "which date is my [birth_date] checked against", missing=["date", "birth", "check"])
    assert missing_terms(kept) == ["date", "check"]
    briefs = content_briefs([only, q("d", "send the bill to [email]", weight=2, missing=["email"])])
    assert [(b.terms, b.questions) for b in briefs] == [([], ["d"]), (["autopay"], ["a"])]
