"""Run history, diff and retention over runs stored through the schema (store.SCHEMA's layout).

The runs here are hand-made worked examples with invented Fernhollow questions (fixtures/demo/README.md); the
expected diffs and weight totals are worked out by hand in the comments.
"""

from __future__ import annotations

import json
import os

import pytest

from auditor.errors import AuditorError, StoreError
from auditor.history.diff import diff_runs, format_diff
from auditor.history.runs import (
    apply_retention,
    format_runs,
    history,
    list_runs,
    load_run,
    previous_run,
    record_gate,
    update_latest,
)
from auditor.results import GateResult, HistoryEntry, Run, Summary
from auditor.store import dumps

QUESTIONS = {  # id -> (question, owner, weight)
    "q-001": ("Can I pay my bill by phone?", "Billing", 88.0),
    "q-002": ("How do I report a leak?", "Field Operations", 40.0),
    "q-003": ("Is there a rebate for low-flow toilets?", "Conservation Programs", 12.0),
    "q-004": ("What do I do during a boil-water advisory?", "Water Quality", 25.0),
    "q-005": ("How do I stop service when I move?", "Customer Care", 30.0),
    "q-006": ("When is the main on Alder Street replaced?", "Field Operations", 5.0),
    "q-007": ("Do you offer autopay?", "Billing", 60.0),
    "q-008": ("What are the 2023 rates?", "Billing", 7.0),
}


def question(qid: str, verdict: str, reasons=None, weight=None) -> dict:
    text, owner, w = QUESTIONS[qid]
    return {
        "id": qid,
        "question": text,
        "owner": owner,
        "topic": None,
        "weight": w if weight is None else weight,
        "verdict": verdict,
        "reasons": reasons if reasons is not None else (["too_old"] if verdict == "stale" else []),
        "support": 0.0 if verdict == "gap" else 0.7,
        "missing_terms": [],
        "terms": [],
        "language": "english",
        "evidence": [],
        "flags": [],
        "action": {"gap": "write", "stale": "refresh"}.get(verdict),
        "horizon_days": 365,
        "missing_constraint": None,
        "needs_look": False,
        "look_reasons": [],
        "conflict": None,
    }


def run_json(as_of: str, questions: list[dict]) -> dict:
    """A run as results.json holds it (docs/results-json.md)."""
    weight = sum(q["weight"] for q in questions)
    share = lambda v: sum(q["weight"] for q in questions if q["verdict"] == v) / weight if weight else 0.0
    return {
        "format": 1,
        "run": {
            "id": None,
            "as_of": as_of,
            "horizon_days": 365,
            "started": f"{as_of}T06:00:00Z",
            "finished": f"{as_of}T06:01:00Z",
            "title": "Fernhollow help centre",
            "tokenizer": {"language": "english", "stopwords": "english"},
            "corpus": {"documents": 25, "passages": 310, "failed": 1, "freshness": 0.8, "mean_age_days": 40.0},
            "thresholds": {"support": 0.45, "weak_margin": 0.05, "source": "default", "probe": None},
            "config_fingerprint": "c0ffee",
            "corpus_fingerprint": f"corpus-{as_of}",
        },
        "summary": {
            "questions": len(questions),
            **{v: sum(q["verdict"] == v for q in questions) for v in ("supported", "stale", "gap")},
            "weight": weight,
            "fallback_exposure": share("gap"),
            "stale_exposure": share("stale"),
        },
        "questions": questions,
        "ingest_errors": [{"document": "quality/scan.pdf", "error": "encrypted PDF, no password given"}],
        "documents": [
            {
                "path": "billing/payment-options.md",
                "title": "Payment options",
                "kind": "markdown",
                "owner": "Billing",
                "status": "active",
                "doc_date": "2026-01-10",
                "doc_date_source": "front_matter:updated",
                "expires": None,
                "passages": 4,
                "as_of": "2026-01-10",
                "fresh": True,
                "reasons": [],
            }
        ],
        "briefs": [
            {"title": "autopay", "terms": ["autopay"], "weight": 60.0, "owner": "Billing", "questions": ["q-007"]}
        ],
        "history": [],
        "diff": None,
        "gate": None,
    }


def make_run(as_of: str, questions: list[dict]) -> Run:
    return Run.from_json(run_json(as_of, questions))


def store_run(store, run: dict, status: str = "done", gate: dict | None = None) -> int:
    """Write a run the way the stored run layout says: one runs row, one results row per question."""
    head = run["run"]
    with store.transaction():
        cursor = store.db.execute(
            "INSERT INTO runs (started, finished, status, as_of, horizon_days, config_fingerprint, "
            "corpus_fingerprint, thresholds, corpus, summary, gate, ingest_errors, extras) "
            "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
            [
                head["started"],
                head["finished"],
                status,
                head["as_of"],
                head["horizon_days"],
                head["config_fingerprint"],
                head["corpus_fingerprint"],
                dumps(head["thresholds"]),
                dumps(head["corpus"]),
                dumps(run["summary"]),
                dumps(gate) if gate else None,
                dumps(run["ingest_errors"]),
                dumps(
                    {
                        "documents": run["documents"],
                        "briefs": run["briefs"],
                        "title": head["title"],
                        "tokenizer": head["tokenizer"],
                    }
                ),
            ],
        )
        head["id"] = cursor.lastrowid
        for i, q in enumerate(run["questions"]):
            store.db.execute(
                "INSERT INTO results (run_id, position, qid, verdict, weight, result) VALUES (?, ?, ?, ?, ?, ?)",
                [head["id"], i, q["id"], q["verdict"], q["weight"], dumps(q)],
            )
    return head["id"]


# November and December: every kind of change once, q-001 and q-005 unchanged.
NOVEMBER = [
    question("q-001", "supported"),
    question("q-002", "supported"),
    question("q-003", "gap"),
    question("q-004", "stale"),
    question("q-005", "supported"),
    question("q-006", "stale"),
    question("q-008", "supported"),
]
DECEMBER = [
    question("q-001", "supported"),
    question("q-002", "gap"),
    question("q-003", "supported"),
    question("q-004", "supported"),
    question("q-005", "supported"),
    question("q-006", "gap"),
    question("q-007", "gap"),
    question("q-008", "stale", ["expired"]),
]


def test_diff_sorts_every_verdict_change_into_exactly_one_list():
    diff = diff_runs(make_run("2026-11-01", NOVEMBER), make_run("2026-12-01", DECEMBER))
    ids = {name: [i.id for i in items] for name, items in diff.lists().items()}
    # q-002 supported->gap and q-006 stale->gap are new gaps; q-008 supported->stale; q-003 gap->supported;
    # q-004 stale->supported; q-007 is new to the set; nothing was dropped.
    assert ids == {
        "new_gaps": ["q-002", "q-006"],
        "newly_stale": ["q-008"],
        "resolved_gaps": ["q-003"],
        "refreshed": ["q-004"],
        "added": ["q-007"],
        "removed": [],
    }
    assert diff.new_gaps[1].to_json() == {
        "id": "q-006",
        "question": "When is the main on Alder Street replaced?",
        "owner": "Field Operations",
        "weight": 5.0,
        "before": "stale",
        "after": "gap",
        "reasons": [],
    }
    assert diff.newly_stale[0].reasons == ["expired"]
    assert diff.added[0].before is None and diff.added[0].after == "gap"
    # weights: new gaps 40 + 5 = 45; the others one question each
    assert diff.weights == {
        "new_gaps": 45.0,
        "newly_stale": 7.0,
        "resolved_gaps": 12.0,
        "refreshed": 25.0,
        "added": 60.0,
        "removed": 0.0,
    }
    assert diff.counts["new_gaps"] == 2
    # fallback exposure: November 12/207 = 0.058, December (40+5+60)/267 = 0.393
    assert diff.exposure.fallback == pytest.approx([12 / 207, 105 / 267])
    assert diff.summary == (
        "2 new gaps (weight 45), 1 newly stale (weight 7), 1 resolved gap (weight 12), "
        "1 refreshed (weight 25), 1 question added (weight 60); "
        "fallback exposure 0.06 -> 0.39"
    )


def test_diff_of_removed_question_and_of_identical_runs():
    base = make_run("2026-11-01", NOVEMBER)
    head = make_run("2026-12-01", [q for q in NOVEMBER if q["id"] != "q-004"])
    diff = diff_runs(base, head)
    assert [i.id for i in diff.removed] == ["q-004"]
    assert diff.removed[0].before == "stale" and diff.removed[0].after is None
    assert diff.removed[0].weight == 25.0
    same = diff_runs(base, make_run("2026-12-01", NOVEMBER))
    assert all(not items for items in same.lists().values())
    assert same.summary.startswith("no verdict changed")


def test_diff_uses_head_weight_when_traffic_changed():
    base = make_run("2026-11-01", [question("q-001", "supported", weight=88.0)])
    head = make_run("2026-12-01", [question("q-001", "gap", weight=120.0)])
    assert diff_runs(base, head).weights["new_gaps"] == 120.0


def test_list_runs_and_load_run_round_trip(store):
    november = run_json("2026-11-01", NOVEMBER)
    first = store_run(store, november)
    december = run_json("2026-12-01", DECEMBER)
    second = store_run(store, december, gate={"passed": True, "checks": [], "message": "gate passed: no limits set"})
    store_run(store, run_json("2026-12-02", DECEMBER), status="running")  # a scan in progress

    runs = list_runs(store)
    assert [(r.id, r.status, r.as_of) for r in runs] == [
        (first, "done", "2026-11-01"),
        (second, "done", "2026-12-01"),
        (second + 1, "running", "2026-12-02"),
    ]
    assert runs[1].summary is not None and runs[1].summary.gap == 3 and runs[1].horizon_days == 365
    # A row as save_run leaves it while the run is in progress: no summary yet.
    store.db.execute(
        "INSERT INTO runs (started, as_of, horizon_days) VALUES ('2026-12-03T06:00:00Z', '2026-12-03', 365)"
    )
    assert list_runs(store)[-1].summary is None
    assert format_runs(list_runs(store)).splitlines()[-1].split()[-6:] == ["-"] * 6

    loaded = load_run(store)  # newest done, not the running one
    assert loaded.info.id == second
    stored = loaded.to_json()
    expected = Run.from_json(december).to_json()  # the format-1 input as format 2
    for key in ("format", "run", "summary", "questions", "passages", "ingest_errors", "documents"):
        assert stored[key] == expected[key], key
    assert stored["format"] == 2
    # The brief was stored without the keys added later (examples, topic): they load as their defaults.
    assert stored["to_write"] == [dict(december["briefs"][0], examples=[], topic=None)]
    assert loaded.gate == GateResult(passed=True, checks=[], message="gate passed: no limits set")
    assert loaded.history == [
        HistoryEntry(id=first, as_of="2026-11-01", summary=Summary.from_json(november["summary"]))
    ]
    assert loaded.diff is not None and loaded.diff.base_run == first and loaded.diff.head_run == second
    assert loaded.diff == diff_runs(Run.from_json(november), Run.from_json(december))

    oldest = load_run(store, first)
    assert oldest.history == [] and oldest.diff is None and oldest.gate is None
    assert [q.id for q in oldest.questions] == [q["id"] for q in NOVEMBER]  # question-set order


def test_previous_run_skips_failed_runs(store):
    first = store_run(store, run_json("2026-10-01", NOVEMBER))
    store_run(store, run_json("2026-11-01", NOVEMBER), status="failed")
    third = store_run(store, run_json("2026-12-01", DECEMBER))
    assert previous_run(store, third) == first
    assert previous_run(store, first) is None
    assert [h.id for h in history(store, third)] == [first]
    diff = load_run(store, third).diff
    assert diff is not None and diff.base_run == first


def test_load_run_errors_name_the_database_and_the_run(store):
    with pytest.raises(StoreError) as empty:
        load_run(store)
    assert str(empty.value).startswith(f"{str(store.path)!r}: no finished run")
    done = store_run(store, run_json("2026-11-01", NOVEMBER))
    with pytest.raises(StoreError) as missing:
        load_run(store, 42)
    assert str(missing.value).startswith(f"{str(store.path)!r}: no run 42 in this database")
    running = store_run(store, run_json("2026-12-01", DECEMBER), status="running")
    with pytest.raises(StoreError, match=f"run {running} is running, not done"):
        load_run(store, running)
    store.db.execute("UPDATE results SET result = '{broken' WHERE run_id = ? AND position = 2", [done])
    with pytest.raises(StoreError, match=rf"run {done} has an unreadable results\[2\]"):
        load_run(store, done)


def test_a_stored_part_without_a_format1_key_is_named(store):
    # Valid JSON of the wrong shape: a question object with only its id, a gate check with nothing.
    done = store_run(store, run_json("2026-11-01", NOVEMBER))
    store.db.execute('UPDATE results SET result = \'{"id": "q-001"}\' WHERE run_id = ? AND position = 1', [done])
    with pytest.raises(StoreError, match=rf"^'.*': run {done} has an unreadable results\[1\] \(KeyError: 'evidence'\)"):
        load_run(store, done)
    other = store_run(store, run_json("2026-12-01", NOVEMBER), gate={"passed": False, "checks": [{}], "message": ""})
    with pytest.raises(StoreError, match=rf"run {other} has an unreadable gate"):
        load_run(store, other)


def test_record_gate(store):
    run_id = store_run(store, run_json("2026-12-01", DECEMBER))
    gate = {
        "passed": False,
        "checks": [{"limit": "max_new_gaps", "max": 1, "value": 3, "passed": False}],
        "message": "gate failed: new_gaps 3 > max 1",
    }
    typed = GateResult.from_json(gate)
    record_gate(store, run_id, typed)
    assert json.loads(store.query("SELECT gate FROM runs WHERE id = ?", [run_id])[0]["gate"]) == typed.to_json()
    assert load_run(store, run_id).gate == typed
    # A check stored without its figure (an older shape) loads with an empty one.
    assert typed.checks[0].figure == "" and typed.to_json()["checks"][0] == {
        "limit": "max_new_gaps",
        "figure": "",
        "max": 1,
        "value": 3,
        "within": False,
    }
    with pytest.raises(StoreError, match="no run 99 to record"):
        record_gate(store, 99, typed)


def test_retention_keeps_the_newest_done_runs_and_never_the_newest_run(store):
    ids = [store_run(store, run_json(f"2026-0{m}-01", NOVEMBER)) for m in range(1, 6)]
    failed = store_run(store, run_json("2026-06-01", NOVEMBER), status="failed")
    assert apply_retention(store, 0) == []  # 0 = keep every run
    deleted = apply_retention(store, 2)
    assert deleted == ids[:3]
    assert [r.id for r in list_runs(store)] == ids[3:] + [failed]
    assert store.query("SELECT count(*) AS n FROM results WHERE run_id IN (?, ?, ?)", ids[:3])[0]["n"] == 0
    assert store.query("SELECT count(*) AS n FROM results")[0]["n"] == 3 * len(NOVEMBER)
    assert apply_retention(store, 2) == []  # idempotent
    # keep=1 with a failed run newest: the newest done run stays, the failed newest run stays too
    assert apply_retention(store, 1) == [ids[3]]
    assert [r.id for r in list_runs(store)] == [ids[4], failed]
    assert load_run(store).info.id == ids[4]


def test_retention_deletes_nothing_without_a_done_run(store):
    store_run(store, run_json("2026-11-01", NOVEMBER), status="failed")
    store_run(store, run_json("2026-12-01", NOVEMBER), status="failed")
    assert apply_retention(store, 1) == []
    assert len(list_runs(store)) == 2


def test_update_latest_replaces_the_link_atomically(tmp_path):
    reports = tmp_path / "reports"
    for day in ("2026-11-01", "2026-12-01"):
        (reports / day).mkdir(parents=True)
        (reports / day / "results.json").write_text(json.dumps({"as_of": day}))
    link = update_latest(reports / "2026-11-01")
    assert link == reports / "latest" and link.is_symlink()
    assert os.readlink(link) == "2026-11-01"  # relative, so the folder can be moved as a whole
    update_latest(reports / "2026-12-01")
    assert json.loads((reports / "latest" / "results.json").read_text())["as_of"] == "2026-12-01"
    assert sorted(p.name for p in reports.iterdir()) == ["2026-11-01", "2026-12-01", "latest"]  # no temp left
    # a temporary link left by a killed scan (pid 2**22 + 1 is above Linux's pid_max, never alive) goes
    os.symlink("2026-11-01", reports / f".latest.{2**22 + 1}.tmp")
    update_latest(reports / "2026-12-01")
    assert sorted(p.name for p in reports.iterdir()) == ["2026-11-01", "2026-12-01", "latest"]
    (tmp_path / "other" / "latest").mkdir(parents=True)
    (tmp_path / "other" / "run").mkdir()
    with pytest.raises(AuditorError, match="is a folder, not the link"):
        update_latest(tmp_path / "other" / "run")


def test_format_runs_and_diff(store):
    assert format_runs([]) == "no runs yet"
    store_run(store, run_json("2026-11-01", NOVEMBER))
    store_run(store, run_json("2026-12-01", DECEMBER))
    table = format_runs(list_runs(store)).splitlines()
    assert table[0].split() == [
        "run",
        "status",
        "as",
        "of",
        "started",
        "finished",
        "questions",
        "supported",
        "stale",
        "gap",
        "fallback",
        "stale",
        "exp.",
    ]
    # December: 8 questions, 4 supported, 1 stale, 3 gap; fallback 105/267 = 0.39, stale 7/267 = 0.03
    assert table[2].split() == [
        "2",
        "done",
        "2026-12-01",
        "2026-12-01T06:00:00Z",
        "2026-12-01T06:01:00Z",
        "8",
        "4",
        "1",
        "3",
        "0.39",
        "0.03",
    ]
    text = format_diff(load_run(store).diff).splitlines()
    assert text[0].startswith("run 2 (2026-12-01) against run 1 (2026-11-01): 2 new gaps (weight 45)")
    assert "new gaps (2, weight 45):" in text
    assert any(line.split()[:5] == ["q-008", "weight", "7", "supported", "->"] and "(expired)" in line for line in text)
    assert format_diff(None) == "no earlier finished run to compare with"
