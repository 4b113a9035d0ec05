"""Runs for the report tests, as results.json holds them (`*_json`, docs/results-json.md) and as the
typed runs (`auditor.results.Run`) that `run_audit` / `runs.load_run` return.

`sample_run()` is the invented Fernhollow Water Cooperative (fixtures/demo/README.md) with every verdict,
reason, flag and action, several owners, a history of three runs, a diff, a gate outcome, ingest
errors, and hostile strings in questions, owners, topics, paths, passages, briefs and errors.
`bare_run()` has only the keys every format-1 run has, as runs stored by older versions do.
`large_run(n)` is a deterministic run of `n` questions over a shared pool of passages, for size and
speed checks. All content is invented for tests only.
"""

from __future__ import annotations

import random
from datetime import date, timedelta

from auditor.results import Run

# Strings that must show literally and never run. The `__pwned` assignments let the browser test
# see whether any of them executed.
HOSTILE_SCRIPT = "<script>window.__pwned = 'script';</script>"
HOSTILE_CLOSE = "</script><script>window.__pwned = 'close';</script>"
HOSTILE_IMG = '"><img src=x onerror="window.__pwned=\'img\'">'
HOSTILE_TEMPLATE = "{{ 7*7 }} {% if true %}yes{% endif %}"
HOSTILE_LINK = "<a href=\"javascript:window.__pwned='link'\">pay here</a>"
HOSTILE_OWNER = 'Web Team "><img src=x onerror="window.__pwned=\'owner\'">'
HOSTILE_STRINGS = (HOSTILE_SCRIPT, HOSTILE_CLOSE, HOSTILE_IMG, HOSTILE_TEMPLATE, HOSTILE_LINK)

AS_OF = date(2026, 12, 1)
HORIZON = 365


def _iso(d: date | None) -> str | None:
    return d.isoformat() if d else None


def statement(expression, start, end, granularity, role, text):
    return {
        "expression": expression,
        "start": start,
        "end": end,
        "granularity": granularity,
        "role": role,
        "text": text,
    }


def evidence(
    document,
    section,
    passage,
    text,
    *,
    score,
    support,
    supporting,
    as_of,
    source="statement",
    expires=None,
    fresh=True,
    reasons=(),
    owner=None,
    terms=None,
    statements=(),
    rank=1,
    page=None,
    answer_type=None,
    answer_type_found=True,
):
    # The keys and their order follow what auditor/judgement/audit.py writes for one evidence item.
    return {
        "rank": rank,
        "document": document,
        "page": page,
        "section": section,
        "passage": passage,
        "owner": owner,
        "score": score,
        "support": support,
        "signals": {
            "bm25": round(support * 0.6, 4),
            "coverage": round(min(1.0, support * 1.2), 4),
            "window": round(support, 4),
        },
        "answer_type": answer_type,
        "answer_type_found": answer_type_found,
        "supporting": supporting,
        "as_of": as_of,
        "as_of_source": source,
        "expires": expires,
        "fresh": fresh,
        "reasons": list(reasons),
        "terms": dict(terms or {}),
        "statements": list(statements),
        "text": text,
    }


def question(
    qid,
    text,
    *,
    owner,
    topic,
    weight,
    verdict,
    reasons=(),
    support,
    missing=(),
    evidence_items=(),
    flags=(),
    action=None,
    horizon_days=HORIZON,
):
    terms = sorted({t for e in evidence_items for t in e["terms"]} | set(missing))
    return {
        "id": qid,
        "question": text,
        "owner": owner,
        "topic": topic,
        "weight": weight,
        "verdict": verdict,
        "reasons": list(reasons),
        "flags": list(flags),
        "action": action,
        "support": support,
        "horizon_days": horizon_days,
        "missing_terms": list(missing),
        "terms": terms,
        "language": None,
        "evidence": list(evidence_items),
        "missing_constraint": None,
        "needs_look": False,
        "look_reasons": [],
        "conflict": None,
    }


def summarize(questions):
    weight = sum(q["weight"] for q in questions)
    out = {"questions": len(questions)}
    for v in ("supported", "stale", "gap"):
        out[v] = sum(1 for q in questions if q["verdict"] == v)
    out["weight"] = weight
    out["fallback_exposure"] = round(sum(q["weight"] for q in questions if q["verdict"] == "gap") / weight, 4)
    out["stale_exposure"] = round(sum(q["weight"] for q in questions if q["verdict"] == "stale") / weight, 4)
    return out


PHONE = (
    "You can pay your bill by phone any day between 7 am and 9 pm. Call the payment line and "
    "have your account number ready. As of February 2023, a convenience fee of $1.50 applies "
    "to card payments by phone."
)
AUTOPAY_NONE = (
    "Payment options: by mail with the remittance slip, in person at the Fernhollow office, "
    "or online through the customer portal. Updated March 2026."
)
REBATE = (
    "The 2024 toilet rebate programme pays up to $100 for each WaterSense toilet. Applications "
    "must be received no later than June 30, 2025. Send the form with your receipt."
)
MAIN = (
    "Main replacement on Alder Street is scheduled for spring 2025. Expect short interruptions of "
    "service; door hangers will be left 48 hours ahead."
)
BOIL = (
    "Boil-water advisory: bring water to a rolling boil for one minute before drinking. Reviewed "
    "October 2026 with the county health department. Use bottled water for infant formula."
)
QUALITY = (
    "The 2019 annual water quality report shows all regulated contaminants below the limits. "
    "Lead sampling results for 2019 are listed in table 3."
)
START = (
    "To start service, submit the start-service form at least two business days ahead. A deposit "
    "may apply. Last reviewed on 2026-09-14."
)
LEAK = (
    "Report a leak in the street or at the meter 24 hours a day on the emergency line. Leaks on "
    "your side of the meter are your responsibility. Current as of August 2026."
)
HOSTILE_TEXT = (
    f"Pay online {HOSTILE_LINK} or see {HOSTILE_SCRIPT} and {HOSTILE_CLOSE} and "
    f"{HOSTILE_IMG} and {HOSTILE_TEMPLATE}. Updated\u2028 May 2026 — pay 💧 online."
)


def sample_json() -> dict:
    """The demo-shaped run with every verdict, reason, flag and hostile string, as results.json holds it."""
    return format2(sample_json_format1())


def sample_json_format1() -> dict:
    """`sample_json` as results.json format 1 held it: each passage inside every evidence item."""
    st_phone = statement(
        "As of February 2023",
        "2023-02-01",
        "2023-02-28",
        "month",
        "as_of",
        "As of February 2023, a convenience fee of $1.50 applies to card payments by phone.",
    )
    st_rebate = statement(
        "June 30, 2025",
        "2025-06-30",
        "2025-06-30",
        "day",
        "expires",
        "Applications must be received no later than June 30, 2025.",
    )
    st_rebate_p = statement(
        "2024",
        "2024-01-01",
        "2024-12-31",
        "year",
        "period",
        "The 2024 toilet rebate programme pays up to $100 for each WaterSense toilet.",
    )
    st_main = statement(
        "spring 2025",
        "2025-03-01",
        "2025-05-31",
        "season",
        "planned",
        "Main replacement on Alder Street is scheduled for spring 2025.",
    )
    st_boil = statement(
        "October 2026",
        "2026-10-01",
        "2026-10-31",
        "month",
        "as_of",
        "Reviewed October 2026 with the county health department.",
    )
    st_quality = statement(
        "2019",
        "2019-01-01",
        "2019-12-31",
        "year",
        "period",
        "The 2019 annual water quality report shows all regulated contaminants below the limits.",
    )
    st_start = statement("2026-09-14", "2026-09-14", "2026-09-14", "day", "as_of", "Last reviewed on 2026-09-14.")
    st_leak = statement("August 2026", "2026-08-01", "2026-08-31", "month", "as_of", "Current as of August 2026.")
    st_hostile = statement("May 2026", "2026-05-01", "2026-05-31", "month", "as_of", "Updated May 2026.")

    ev_phone = evidence(
        "billing/payment-options.md",
        "Paying › By phone",
        213,
        PHONE,
        score=11.92,
        support=0.71,
        supporting=True,
        as_of="2023-02-28",
        fresh=False,
        reasons=["too_old"],
        owner="Billing",
        statements=[st_phone],
        terms={"pay": 3.1, "bill": 2.7, "phone": 6.12},
    )
    ev_autopay = evidence(
        "billing/payment-options.md",
        "Paying › Options",
        214,
        AUTOPAY_NONE,
        score=4.1,
        support=0.22,
        supporting=False,
        as_of="2026-03-31",
        owner="Billing",
        terms={"payment": 4.1},
        statements=[statement("March 2026", "2026-03-01", "2026-03-31", "month", "as_of", "Updated March 2026.")],
    )
    ev_rebate = evidence(
        "conservation/toilet-rebate.html",
        "Rebates › Toilets",
        301,
        REBATE,
        score=14.2,
        support=0.83,
        supporting=True,
        as_of="2024-12-31",
        source="statement",
        expires="2025-06-30",
        fresh=False,
        reasons=["too_old", "expired"],
        owner="Conservation Programs",
        statements=[st_rebate_p, st_rebate],
        terms={"toilet": 5.5, "rebat": 6.0, "appli": 2.7},
    )
    ev_main = evidence(
        "field/alder-street-main.txt",
        "Projects › Alder Street",
        402,
        MAIN,
        score=9.8,
        support=0.64,
        supporting=True,
        as_of="2024-11-02",
        source="metadata",
        fresh=False,
        reasons=["too_old", "overtaken"],
        owner="Field Operations",
        statements=[st_main],
        terms={"main": 4.2, "replac": 3.9, "alder": 1.7},
    )
    ev_boil = evidence(
        "quality/boil-water.md",
        "Advisories › Boil water",
        511,
        BOIL,
        score=12.5,
        support=0.88,
        supporting=True,
        as_of="2026-10-31",
        owner="Water Quality",
        statements=[st_boil],
        terms={"boil": 7.1, "water": 1.2, "advisori": 4.2},
    )
    ev_quality = evidence(
        "quality/annual-report-2019.pdf",
        "Annual report › Lead",
        520,
        QUALITY,
        score=10.4,
        support=0.69,
        supporting=True,
        as_of="2019-12-31",
        page=3,
        fresh=False,
        reasons=["too_old"],
        owner="Water Quality",
        statements=[st_quality],
        terms={"lead": 6.4, "water": 1.1, "qualiti": 2.9},
    )
    ev_start = evidence(
        "care/start-stop.md",
        "Service › Start",
        601,
        START,
        score=13.0,
        support=0.79,
        supporting=True,
        as_of="2026-09-14",
        owner="Customer Care",
        statements=[st_start],
        terms={"start": 5.0, "servic": 3.1, "deposit": 4.9},
    )
    ev_start_file = evidence(
        "care/start-stop-old.txt",
        "Service",
        602,
        "Starting service: call us. Deposits are refundable after a year.",
        score=6.0,
        support=0.41,
        supporting=True,
        as_of="2026-06-01",
        source="file",
        owner="Customer Care",
        rank=1,
        terms={"start": 2.5, "deposit": 3.5},
    )
    ev_leak = evidence(
        "field/leaks.md",
        "Emergencies › Leaks",
        410,
        LEAK,
        score=9.9,
        support=0.74,
        supporting=True,
        as_of="2026-08-31",
        owner="Field Operations",
        statements=[st_leak],
        terms={"leak": 6.6, "meter": 3.3},
    )
    ev_leak_old = evidence(
        "field/leaks-2021.md",
        "Leaks",
        411,
        "Leaks: call the office during business hours. Updated 2021.",
        score=7.7,
        support=0.52,
        supporting=True,
        as_of="2021-12-31",
        fresh=False,
        reasons=["too_old"],
        owner="Field Operations",
        rank=2,
        statements=[statement("2021", "2021-01-01", "2021-12-31", "year", "as_of", "Updated 2021.")],
        terms={"leak": 5.9},
    )
    ev_hostile = evidence(
        f"web/{HOSTILE_SCRIPT}.html",
        f"Pay › {HOSTILE_IMG}",
        700,
        HOSTILE_TEXT,
        score=8.8,
        support=0.66,
        supporting=True,
        as_of="2026-05-31",
        owner=HOSTILE_OWNER,
        statements=[st_hostile],
        terms={"pay": 3.3, "onlin": 2.1, "script": 1.1},
    )

    def ranked(*items):
        out = []
        for k, item in enumerate(items, 1):
            out.append(dict(item, rank=k))
        return out

    qs = [
        question(
            "q-001",
            "Can I pay my bill by phone?",
            owner="Billing",
            topic="payments",
            weight=88.0,
            verdict="stale",
            reasons=["too_old"],
            support=0.71,
            evidence_items=ranked(ev_phone, ev_autopay),
            action="refresh",
        ),
        question(
            "q-002",
            "How do I set up autopay?",
            owner="Billing",
            topic="payments",
            weight=140.0,
            verdict="gap",
            support=0.22,
            missing=["autopay"],
            evidence_items=ranked(ev_autopay),
            action="write",
        ),
        question(
            "q-003",
            "Is the toilet rebate still available?",
            owner=None,
            topic="rebates",
            weight=35.0,
            verdict="stale",
            reasons=["too_old", "expired"],
            support=0.83,
            evidence_items=ranked(ev_rebate),
            action="retire",
        ),
        question(
            "q-004",
            "When will the Alder Street main replacement happen?",
            owner=None,
            topic="projects",
            weight=12.0,
            verdict="stale",
            reasons=["too_old", "overtaken"],
            support=0.64,
            evidence_items=ranked(ev_main),
            action="retire",
        ),
        question(
            "q-005",
            "What do I do during a boil-water advisory?",
            owner="Water Quality",
            topic="advisories",
            weight=60.0,
            verdict="supported",
            support=0.88,
            evidence_items=ranked(ev_boil),
        ),
        question(
            "q-006",
            "Is there lead in my water?",
            owner="Water Quality",
            topic="quality",
            weight=44.0,
            verdict="stale",
            reasons=["too_old"],
            support=0.69,
            evidence_items=ranked(ev_quality),
            action="refresh",
        ),
        question(
            "q-007",
            "How do I start water service?",
            owner="Customer Care",
            topic="service",
            weight=95.0,
            verdict="supported",
            support=0.79,
            evidence_items=ranked(ev_start, ev_start_file),
        ),
        question(
            "q-008",
            "Is the deposit refundable?",
            owner="Customer Care",
            topic="service",
            weight=20.0,
            verdict="supported",
            support=0.41,
            flags=["weak", "file_dated"],
            evidence_items=ranked(ev_start_file),
        ),
        question(
            "q-009",
            "How do I report a leak?",
            owner="Field Operations",
            topic="emergencies",
            weight=70.0,
            verdict="supported",
            support=0.74,
            flags=["stale_competitor"],
            evidence_items=ranked(ev_leak, ev_leak_old),
        ),
        question(
            "q-010",
            "Can I get a payment plan for a large bill?",
            owner=None,
            topic=None,
            weight=25.0,
            verdict="gap",
            support=0.0,
            missing=["plan", "instal"],
            evidence_items=[],
            action="write",
        ),
        question(
            "q-011",
            f"Why does the portal show {HOSTILE_SCRIPT} and {HOSTILE_IMG}?",
            owner=HOSTILE_OWNER,
            topic=f"web {HOSTILE_TEMPLATE}",
            weight=3.0,
            verdict="supported",
            support=0.66,
            flags=["no_answer_type"],
            evidence_items=ranked(ev_hostile),
        ),
        question(
            "q-012",
            f"{HOSTILE_CLOSE} {HOSTILE_LINK} {HOSTILE_TEMPLATE}",
            owner=None,
            topic=None,
            weight=1.0,
            verdict="gap",
            support=0.05,
            missing=["<script>", "javascript:"],
            evidence_items=[],
            action="write",
        ),
        question(
            "q-013",
            "Can I pay by phone in Spanish?",
            owner="Billing",
            topic="payments",
            weight=9.0,
            verdict="stale",
            reasons=["too_old"],
            support=0.58,
            missing=["spanish"],
            evidence_items=ranked(ev_phone),
            action="refresh",
            horizon_days=180,
        ),
    ]
    documents = [
        {
            "path": "billing/payment-options.md",
            "title": "Payment options",
            "kind": "markdown",
            "owner": "Billing",
            "status": "active",
            "doc_date": "2026-03-31",
            "doc_date_source": "front_matter:updated",
            "expires": None,
            "passages": 6,
            "as_of": "2023-02-28",
            "fresh": False,
            "reasons": ["too_old"],
        },
        {
            "path": "conservation/toilet-rebate.html",
            "title": "Toilet rebate",
            "kind": "html",
            "owner": "Conservation Programs",
            "status": "active",
            "doc_date": "2024-01-15",
            "doc_date_source": "jsonld:dateModified",
            "expires": "2025-06-30",
            "passages": 3,
            "as_of": "2024-12-31",
            "fresh": False,
            "reasons": ["too_old", "expired"],
        },
        {
            "path": "field/alder-street-main.txt",
            "title": "Alder Street main",
            "kind": "text",
            "owner": "Field Operations",
            "status": "active",
            "doc_date": "2024-11-02",
            "doc_date_source": "sitemap:lastmod",
            "expires": None,
            "passages": 2,
            "as_of": "2024-11-02",
            "fresh": False,
            "reasons": ["too_old", "overtaken"],
        },
        {
            "path": "field/leaks.md",
            "title": "Leaks",
            "kind": "markdown",
            "owner": "Field Operations",
            "status": "active",
            "doc_date": "2026-08-31",
            "doc_date_source": "front_matter:updated",
            "expires": None,
            "passages": 2,
            "as_of": "2026-08-31",
            "fresh": True,
            "reasons": [],
        },
        {
            "path": "field/leaks-2021.md",
            "title": "Leaks (2021)",
            "kind": "markdown",
            "owner": "Field Operations",
            "status": "active",
            "doc_date": "2021-12-31",
            "doc_date_source": "front_matter:date",
            "expires": None,
            "passages": 1,
            "as_of": "2021-12-31",
            "fresh": False,
            "reasons": ["too_old"],
        },
        {
            "path": "quality/boil-water.md",
            "title": "Boil-water advisory",
            "kind": "markdown",
            "owner": "Water Quality",
            "status": "active",
            "doc_date": "2026-10-31",
            "doc_date_source": "front_matter:last_reviewed",
            "expires": None,
            "passages": 4,
            "as_of": "2026-10-31",
            "fresh": True,
            "reasons": [],
        },
        {
            "path": "quality/annual-report-2019.pdf",
            "title": "Water quality report 2019",
            "kind": "pdf",
            "owner": "Water Quality",
            "status": "active",
            "doc_date": "2020-03-02",
            "doc_date_source": "pdf:info:ModDate",
            "expires": None,
            "passages": 12,
            "as_of": "2019-12-31",
            "fresh": False,
            "reasons": ["too_old"],
        },
        {
            "path": "care/start-stop.md",
            "title": "Start or stop service",
            "kind": "markdown",
            "owner": "Customer Care",
            "status": "active",
            "doc_date": "2026-09-14",
            "doc_date_source": "front_matter:last_reviewed",
            "expires": None,
            "passages": 3,
            "as_of": "2026-09-14",
            "fresh": True,
            "reasons": [],
        },
        {
            "path": "care/start-stop-old.txt",
            "title": None,
            "kind": "text",
            "owner": "Customer Care",
            "status": "active",
            "doc_date": None,
            "doc_date_source": None,
            "expires": None,
            "passages": 1,
            "as_of": None,
            "fresh": None,
            "reasons": [],
        },
        {
            "path": "care/holiday-hours-2020.md",
            "title": "Holiday hours",
            "kind": "markdown",
            "owner": "Customer Care",
            "status": "removed",
            "doc_date": "2020-12-01",
            "doc_date_source": "front_matter:date",
            "expires": None,
            "passages": 0,
            "as_of": "2020-12-01",
            "fresh": False,
            "reasons": ["too_old"],
        },
        {
            "path": f"web/{HOSTILE_SCRIPT}.html",
            "title": HOSTILE_IMG,
            "kind": "html",
            "owner": HOSTILE_OWNER,
            "status": "active",
            "doc_date": "2026-05-31",
            "doc_date_source": "og:article:modified_time",
            "expires": None,
            "passages": 1,
            "as_of": "2026-05-31",
            "fresh": True,
            "reasons": [],
        },
        {
            "path": "quality/scan.pdf",
            "title": None,
            "kind": None,
            "owner": None,
            "status": "failed",
            "doc_date": None,
            "doc_date_source": None,
            "expires": None,
            "passages": 0,
            "as_of": None,
            "fresh": None,
            "reasons": ["encrypted"],
        },
    ]
    ingest_errors = [
        {"document": "quality/scan.pdf", "error": "encrypted PDF, no password given"},
        {"document": "web/broken.html", "error": f"not valid UTF-8 near byte 1024 {HOSTILE_CLOSE}"},
    ]
    summary = summarize(qs)
    history = [  # earlier done runs, oldest first (runs.history)
        {
            "id": 4,
            "as_of": "2026-09-01",
            "summary": {
                "questions": 11,
                "supported": 8,
                "stale": 1,
                "gap": 2,
                "weight": 560.0,
                "fallback_exposure": 0.22,
                "stale_exposure": 0.05,
            },
        },
        {
            "id": 5,
            "as_of": "2026-10-01",
            "summary": {
                "questions": 12,
                "supported": 7,
                "stale": 2,
                "gap": 3,
                "weight": 590.0,
                "fallback_exposure": 0.31,
                "stale_exposure": 0.08,
            },
        },
        {
            "id": 6,
            "as_of": "2026-11-01",
            "summary": {
                "questions": 12,
                "supported": 6,
                "stale": 3,
                "gap": 3,
                "weight": 600.0,
                "fallback_exposure": 0.29,
                "stale_exposure": 0.15,
            },
        },
    ]

    def change(q, before, after):
        return {
            "id": q["id"],
            "question": q["question"],
            "owner": q["owner"],
            "weight": q["weight"],
            "before": before,
            "after": after,
            "reasons": q["reasons"],
        }

    by_id = {q["id"]: q for q in qs}
    lists = {
        "new_gaps": [change(by_id["q-012"], "stale", "gap")],
        "newly_stale": [change(by_id["q-001"], "supported", "stale")],
        "resolved_gaps": [change(by_id["q-007"], "gap", "supported")],
        "refreshed": [],
        "added": [change(by_id["q-013"], None, "stale")],
        "removed": [
            {
                "id": "q-099",
                "question": "Where do I buy a rain barrel?",
                "owner": "Conservation Programs",
                "weight": 4.0,
                "before": "supported",
                "after": None,
                "reasons": [],
            }
        ],
    }
    # The shape of runs.diff_runs.
    diff = {
        "base_run": 6,
        "base_as_of": "2026-11-01",
        "head_run": 7,
        "head_as_of": "2026-12-01",
        **lists,
        "counts": {k: len(v) for k, v in lists.items()},
        "weights": {k: sum(i["weight"] for i in v) for k, v in lists.items()},
        "exposure": {"fallback": [0.29, summary["fallback_exposure"]], "stale": [0.15, summary["stale_exposure"]]},
        "summary": "1 new gap (weight 1), 1 newly stale (weight 88), 1 resolved gap (weight 95), "
        "1 added (weight 9), 1 removed (weight 4); fallback exposure 0.29 -> 0.28",
    }
    # The shape of gate.evaluate_gate.
    gate = {
        "passed": False,
        "checks": [
            {
                "limit": "max_fallback_exposure",
                "figure": "fallback_exposure",
                "max": 0.25,
                "value": summary["fallback_exposure"],
                "passed": False,
            },
            {"limit": "max_stale_share", "figure": "stale_share", "max": 0.5, "value": 5 / 13, "passed": True},
            {"limit": "max_new_gaps", "figure": "new_gaps", "max": 0, "value": 1, "passed": False},
        ],
        "message": "gate failed: fallback_exposure 0.28 > max 0.25, new_gaps 1 > max 0",
    }
    briefs = [  # the shape of briefs.content_briefs
        {
            "title": "autopay (payments)",
            "terms": ["autopay"],
            "weight": 140.0,
            "owner": "Billing",
            "questions": ["q-002"],
            "examples": ["How do I set up autopay?"],
            "topic": "payments",
        },
        {
            "title": "plan, instal",
            "terms": ["plan", "instal"],
            "weight": 26.0,
            "owner": "unassigned",
            "questions": ["q-010", "q-012"],
            "examples": [qs[9]["question"], qs[11]["question"]],
            "topic": None,
        },
        {
            "title": f"Brief {HOSTILE_SCRIPT}",
            "terms": [HOSTILE_IMG],
            "weight": 1.0,
            "owner": HOSTILE_OWNER,
            "questions": ["q-011"],
            "examples": [qs[10]["question"]],
            "topic": HOSTILE_TEMPLATE,
        },
    ]
    return {
        "format": 1,
        "run": {
            "id": 7,
            "as_of": AS_OF.isoformat(),
            "horizon_days": HORIZON,
            "started": "2026-12-01T06:00:00Z",
            "finished": "2026-12-01T06:02:11Z",
            "title": "Fernhollow Water Cooperative help centre",
            "tokenizer": {"language": "english", "stopwords": "english"},
            "corpus": {"documents": 12, "passages": 35, "failed": 2, "freshness": 0.4571, "mean_age_days": 412.6},
            "thresholds": {"support": 0.35, "weak_margin": 0.08, "source": "default", "probe": None},
            "config_fingerprint": "c0ffee1234567890abcdef",
            "corpus_fingerprint": "feedface0987654321",
        },
        "summary": summary,
        "languages": [],
        "questions": qs,
        "ingest_errors": ingest_errors,
        "documents": documents,
        "briefs": briefs,
        "history": history,
        "diff": diff,
        "gate": gate,
    }


def bare_json() -> dict:
    """Only the keys every format-1 run has (docs/results-json.md), as an older stored run has them."""
    return {
        "format": 1,
        "run": {
            "id": 3,
            "as_of": "2026-12-01",
            "horizon_days": 365,
            "started": "2026-12-01T06:00:00Z",
            "corpus": {"documents": 2, "passages": 5, "failed": 1},
        },
        "summary": {
            "questions": 2,
            "covered": 1,
            "stale": 0,
            "gap": 1,
            "weight": 3.0,
            "fallback_exposure": 2 / 3,
            "stale_exposure": 0.0,
        },
        "questions": [
            {
                "id": "a",
                "question": "Can I pay by phone?",
                "owner": None,
                "topic": None,
                "weight": 1.0,
                "verdict": "covered",
                "reasons": [],
                "support": 0.7,
                "missing_terms": [],
                "evidence": [
                    {
                        "document": "pay.md",
                        "page": None,
                        "section": "Pay",
                        "passage": 1,
                        "score": 3.0,
                        "support": 0.7,
                        "supporting": True,
                        "as_of": "2026-10-01",
                        "as_of_source": "metadata",
                        "expires": None,
                        "fresh": True,
                        "reasons": [],
                        "text": "Pay by phone.",
                    }
                ],
            },
            {
                "id": "b",
                "question": "Autopay?",
                "owner": "Billing",
                "topic": "payments",
                "weight": 2.0,
                "verdict": "gap",
                "reasons": [],
                "support": 0.1,
                "missing_terms": ["autopay"],
                "evidence": [],
            },
        ],
        "ingest_errors": [{"document": "scan.pdf", "error": "encrypted PDF, no password given"}],
    }


WORDS = (
    "bill pay phone meter leak rate deposit service start stop water main street rebate toilet "
    "boil advisory lead quality pressure hydrant sewer account portal autopay late fee refund "
    "outage repair crew schedule permit backflow irrigation drought tier usage reading"
).split()
OWNERS = (
    "Billing",
    "Field Operations",
    "Conservation Programs",
    "Customer Care",
    "Water Quality",
    "Engineering",
    "Web Team",
)


def large_json(n: int = 10_000, passages: int = 4_000, seed: int = 7) -> dict:
    """A run of `n` questions, each with 3 evidence items drawn from `passages` shared passages."""
    rng = random.Random(seed)
    pool = []
    for pid in range(passages):
        words = [rng.choice(WORDS) for _ in range(160)]
        age = rng.randint(0, 1400)
        as_of = AS_OF - timedelta(days=age)
        text = " ".join(words).capitalize() + f". Updated {as_of.isoformat()}."
        pool.append(
            {
                "pid": pid,
                "text": text,
                "as_of": as_of.isoformat(),
                "age": age,
                "owner": OWNERS[pid % len(OWNERS)],
                "document": f"kb/{OWNERS[pid % len(OWNERS)].lower().replace(' ', '-')}/doc-{pid // 8}.md",
                "section": f"Section {pid % 8} › Part {pid % 3}",
            }
        )
    qs = []
    for i in range(n):
        terms = rng.sample(WORDS, rng.randint(4, 8))
        chosen = rng.sample(pool, 3)
        items = []
        for k, p in enumerate(chosen, 1):
            support = round(rng.random(), 3)
            fresh = p["age"] <= HORIZON
            items.append(
                evidence(
                    p["document"],
                    p["section"],
                    p["pid"],
                    p["text"],
                    score=round(support * 20, 3),
                    support=support,
                    supporting=support >= 0.35,
                    as_of=p["as_of"],
                    fresh=fresh,
                    reasons=[] if fresh else ["too_old"],
                    owner=p["owner"],
                    rank=k,
                    terms={t: round(rng.random() * 5, 3) for t in terms[:4]},
                    statements=[
                        statement(p["as_of"], p["as_of"], p["as_of"], "day", "as_of", "Updated " + p["as_of"] + ".")
                    ],
                )
            )
        sup = [e for e in items if e["supporting"]]
        if not sup:
            verdict, action = "gap", "write"
        elif any(e["fresh"] for e in sup):
            verdict, action = "supported", None
        else:
            verdict, action = "stale", "refresh"
        qs.append(
            question(
                f"L{i:05d}",
                "How do I " + " ".join(terms) + "?",
                owner=OWNERS[i % len(OWNERS)] if i % 5 else None,
                topic=terms[0],
                weight=float(rng.randint(1, 50)),
                verdict=verdict,
                reasons=["too_old"] if verdict == "stale" else [],
                support=max(e["support"] for e in items),
                missing=[terms[-1]] if verdict == "gap" else [],
                evidence_items=items,
                action=action,
            )
        )
    run = sample_json_format1()
    run["questions"] = qs
    run["summary"] = summarize(qs)
    run["run"]["corpus"] = {
        "documents": passages // 8,
        "passages": passages,
        "failed": 0,
        "freshness": 0.26,
        "mean_age_days": 520.0,
    }
    run["diff"] = None
    run["briefs"] = []
    return format2(run)


# Written out by hand from docs/results-json.md, apart from auditor/results.py, so that the
# tests compare the writer with the documented format rather than with itself.
PASSAGE_KEYS = ("document", "page", "section", "owner", "as_of", "as_of_source", "expires", "statements", "text")
EVIDENCE_KEYS = (
    "rank", "passage", "score", "support", "signals", "answer_type", "answer_type_found", "supporting",
    "horizon", "fresh", "reasons", "terms",
)  # fmt: skip
QUESTION_KEYS = (
    "id", "question", "owner", "topic", "weight", "extra", "verdict", "reasons", "flags", "action",
    "support", "horizon", "explanation", "missing_terms", "terms", "language", "evidence",
    "missing_constraint", "needs_look", "look_reasons", "conflict",
)  # fmt: skip
QUESTION_DEFAULTS = {
    "language": None,
    "missing_constraint": None,
    "needs_look": False,
    "look_reasons": [],
    "conflict": None,
}


def format2(data: dict) -> dict:
    """A format-1 run of these samples as format 2: passages once, by id; the names of format 2."""
    passages: dict[int, dict] = {}
    questions = []
    for q in data["questions"]:
        default = {"days": q.get("horizon_days") or data["run"]["horizon_days"], "source": "default", "rule": None}
        items = []
        for e in q["evidence"]:
            passages.setdefault(e["passage"], {"id": e["passage"], **{k: e.get(k) for k in PASSAGE_KEYS}})
            item = {**e, "horizon": default}
            items.append({k: item.get(k) for k in EVIDENCE_KEYS})
        new = {**q, "extra": {}, "horizon": default, "explanation": "", "evidence": items}
        questions.append({k: new.get(k, QUESTION_DEFAULTS.get(k)) for k in QUESTION_KEYS})
    gate = data["gate"]
    if gate is not None:
        checks = [{**{k: v for k, v in c.items() if k != "passed"}, "within": c["passed"]} for c in gate["checks"]]
        gate = {"within": gate["passed"], "checks": checks, "message": gate["message"]}
    return {
        "format": 2,
        "run": data["run"],
        "summary": data["summary"],
        "languages": data.get("languages", []),
        "questions": questions,
        "passages": [passages[k] for k in sorted(passages)],
        "ingest_errors": data["ingest_errors"],
        "documents": data["documents"],
        "to_write": data["briefs"],
        "history": data["history"],
        "diff": data["diff"],
        "limits": gate,
        "redacted": data.get("redacted", {}),
    }


def sample_run() -> Run:
    return Run.from_json(sample_json())


def bare_run() -> Run:
    return Run.from_json(bare_json())


def large_run(n: int = 10_000, passages: int = 4_000, seed: int = 7) -> Run:
    return Run.from_json(large_json(n, passages, seed))
