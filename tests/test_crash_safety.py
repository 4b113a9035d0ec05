"""Crash safety of the whole scan: SIGKILL at seeded random points of ingest, audit and report.

Each trial starts from the same state (one finished November scan, then the December edits to the
knowledge base), kills the December `auditor scan` process with SIGKILL at a chosen point, runs the
scan again, and holds the outcome to a clean, uninterrupted December scan: equal results.json
(ignoring run ids and timestamps), `PRAGMA integrity_check` ok, no duplicate rows, the November run
and its report untouched, `reports/latest` pointing at a complete report.

Kill points are counted, not timed: a small wrapper (KILLER) counts the Python and C calls made by
auditor and sqlite-utils code while each stage runs and SIGKILLs its own process at the N-th one, so
a given seed kills at the same place on every machine. The knowledge base is a small invented one
(Fernhollow Water Cooperative, fixtures/demo/README.md).
"""

from __future__ import annotations

import json
import os
import random
import shutil
import signal
import sqlite3
import subprocess
import sys
from pathlib import Path

import pytest

from auditor.history.runs import load_run
from auditor.results import Run
from auditor.store import Store

REPO = Path(__file__).resolve().parent.parent
SEED = 20261201
KILLS_PER_STAGE = 3

# --- the knowledge base -----------------------------------------------------------------------------

NOVEMBER_KB = {
    "billing/pay-by-phone.md": """---
title: Paying your bill by phone
owner: Billing
updated: 2026-09-01
---
# Paying your bill by phone

As of September 2026, you can pay your water bill by phone at any hour. Call the automated payment
line and have your account number and a debit card or checking account ready. The phone payment is
posted to your water account the next business day. There is no fee for paying by phone.
""",
    "field/report-a-leak.md": """---
title: Reporting a leak
owner: Field Operations
updated: 2026-08-15
---
# Reporting a leak

To report a leak in the street, a broken hydrant or water running from a meter box, call the
Field Operations leak line. Crews respond to leak reports around the clock. Tell us the nearest
address or cross street and whether the leaking water is flooding a road or a basement.
""",
    "care/stop-service.md": """---
title: Stopping service when you move
owner: Customer Care
updated: 2026-07-01
---
# Stopping service when you move

To stop water service when you move out, ask Customer Care at least three business days before
your moving date. We read the meter on the stop date and send a final bill to your forwarding
address. Your deposit is applied to the final bill and any remaining credit is refunded.
""",
    "quality/advisory.md": """---
title: Boil-water advisory procedure
owner: Water Quality
updated: 2026-10-01
---
# Boil-water advisory procedure

During a boil-water advisory, bring tap water to a rolling boil for one minute before drinking it,
cooking with it or brushing teeth, and let it cool. Use boiled or bottled water for baby formula.
The official notice of the cooperative and the local health authority always prevails over this
page.
""",
}

# December: the leak page is replaced by an old text (its question goes stale), and a rain-barrel
# rebate page is published (its question, a gap in November, is supported).
DECEMBER_EDIT = (
    "field/report-a-leak.md",
    """---
title: Reporting a leak
owner: Field Operations
updated: 2021-03-01
---
# Reporting a leak

As of March 2021, to report a leak in the street, a broken hydrant or water running from a meter
box, call the Field Operations leak line. Crews respond to leak reports around the clock. Tell us
the nearest address or cross street and whether the leaking water is flooding a road or a basement.
""",
)
DECEMBER_ADD = (
    "conservation/rain-barrel-rebate.md",
    """---
title: Rain barrel rebate
owner: Conservation Programs
updated: 2026-11-20
---
# Rain barrel rebate

Customers who install a rain barrel to collect roof runoff for garden watering can apply for a
rain barrel rebate of up to 50 dollars per barrel, two barrels per household. Send the receipt and
a photo of the installed rain barrel with the rebate application form.
""",
)

QUESTIONS_CSV = """id,question,owner,weight
q-phone,Can I pay my water bill by phone?,Billing,88
q-leak,How do I report a leak in the street?,Field Operations,40
q-stop,How do I stop water service when I move out?,Customer Care,30
q-boil,What should I do during a boil-water advisory?,Water Quality,25
q-barrel,Is there a rebate for installing a rain barrel?,Conservation Programs,12
q-paperless,Can I switch to paperless statements by e-mail?,Billing,20
"""

CONFIG = """# Crash-safety and monthly-scan tests: a small invented knowledge base.
database = "state/auditor.db"
questions = ["questions.csv"]

[corpus]
paths = ["kb"]
jobs = 1

[freshness]
horizon_days = 365

[report]
title = "Fernhollow help centre (test)"

[gate]
max_gap_share = 0.9
"""


def make_site(root: Path) -> Path:
    """The November knowledge base, question set and config under `root`."""
    for rel, text in NOVEMBER_KB.items():
        path = root / "kb" / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
    (root / "questions.csv").write_text(QUESTIONS_CSV, encoding="utf-8")
    (root / "audit.toml").write_text(CONFIG, encoding="utf-8")
    return root


def december_edits(root: Path) -> None:
    for rel, text in (DECEMBER_EDIT, DECEMBER_ADD):
        path = root / "kb" / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")


# --- running scans ----------------------------------------------------------------------------------

# Runs `auditor scan ...` with the stages wrapped so the calls they make can be counted, and the
# process killed (SIGKILL, no cleanup of any kind) or paused at a chosen point.
KILLER = r"""
import json, os, signal, sys, threading, time
sys.path.insert(0, os.environ["AUDITOR_TEST_REPO"])
mode, target, at, counts_file = sys.argv[1], sys.argv[2], int(sys.argv[3]), sys.argv[4]
import auditor.ingest.pipeline, auditor.judgement.audit, auditor.report, auditor.history.runs

stage = [None]
counts = {}

def staged(module, name, label):
    original = getattr(module, name)
    def wrapper(*args, **kwargs):
        if mode == "pause" and label == target:
            open(counts_file + ".paused", "w").close()
            while not os.path.exists(counts_file + ".resume"):
                time.sleep(0.05)
        previous, stage[0] = stage[0], label
        try:
            return original(*args, **kwargs)
        finally:
            stage[0] = previous
    setattr(module, name, wrapper)

staged(auditor.ingest.pipeline, "ingest_corpus", "ingest")
staged(auditor.judgement.audit, "run_audit", "audit")
staged(auditor.report, "write_report", "report")
staged(auditor.history.runs, "update_latest", "latest")

def profile(frame, event, arg):
    label = stage[0]
    if label is None or event not in ("call", "c_call"):
        return
    if not frame.f_globals.get("__name__", "").startswith(("auditor", "sqlite_utils")):
        return
    n = counts[label] = counts.get(label, 0) + 1
    if mode == "kill" and label == target and n == at:
        where = arg.__name__ if event == "c_call" else frame.f_code.co_name
        with open(counts_file + ".killed", "w") as f:
            f.write(f"{frame.f_globals['__name__']}:{frame.f_code.co_name}:{frame.f_lineno} {event} {where}")
        os.kill(os.getpid(), signal.SIGKILL)

def save():
    with open(counts_file, "w") as f:
        json.dump(counts, f)

import atexit
atexit.register(save)
sys.setprofile(profile)
threading.setprofile(profile)
from auditor.cli import main
sys.argv = ["auditor"] + sys.argv[5:]
main()
"""


def scan_command(as_of: str, *extra: str) -> list[str]:
    return ["scan", "-c", "audit.toml", "--as-of", as_of, "--quiet", *extra]


def environment() -> dict:
    # A fixed hash seed makes set and dict orders, and so the call counts, the same in every run.
    env = dict(os.environ, AUDITOR_TEST_REPO=str(REPO), PYTHONPATH=str(REPO), PYTHONHASHSEED="0")
    for name in list(env):
        if name.startswith("AUDITOR_") and name != "AUDITOR_TEST_REPO":
            del env[name]  # the tests' own config must decide
    return env


def run_scan(root: Path, as_of: str, *extra: str, timeout: float = 300) -> subprocess.CompletedProcess:
    """The real `auditor scan` in a fresh process, in `root`."""
    return subprocess.run(
        [sys.executable, "-m", "auditor.cli", *scan_command(as_of, *extra)],
        cwd=root,
        env=environment(),
        capture_output=True,
        text=True,
        timeout=timeout,
    )


def wrapped_scan(root: Path, as_of: str, mode: str, target: str = "-", at: int = 0, *extra: str, wait: bool = True):
    """`auditor scan` under KILLER; returns the CompletedProcess (or the Popen when not waiting)."""
    counts = root / "stage-calls.json"
    args = [sys.executable, "-c", KILLER, mode, target, str(at), str(counts), *scan_command(as_of, *extra)]
    if not wait:
        return subprocess.Popen(
            args, cwd=root, env=environment(), stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True
        )
    return subprocess.run(args, cwd=root, env=environment(), capture_output=True, text=True, timeout=300)


# --- what must hold ---------------------------------------------------------------------------------


def comparable(results: dict) -> dict:
    """results.json without what legitimately differs between two equal scans: run ids, timestamps,
    and the run-to-run parts (history, diff, gate) that name run ids."""
    run = {k: v for k, v in results["run"].items() if k not in ("id", "started", "finished")}
    rest = {k: v for k, v in results.items() if k not in ("run", "history", "diff", "gate")}
    return {"run": run, **rest}


def db_facts(db: Path) -> dict:
    """Integrity, duplicate checks and row counts of an audit database."""
    conn = sqlite3.connect(db)
    try:
        one = lambda sql: conn.execute(sql).fetchone()[0]
        return {
            "integrity": one("PRAGMA integrity_check"),
            "duplicate_documents": one("SELECT count(*) - count(DISTINCT path) FROM documents"),
            "duplicate_passages": one(
                "SELECT count(*) FROM (SELECT document_id, ordinal FROM passages "
                "GROUP BY document_id, ordinal HAVING count(*) > 1)"
            ),
            "duplicate_statements": one(
                "SELECT count(*) FROM (SELECT passage_id, char_start, char_end, role "
                "FROM statements GROUP BY 1, 2, 3, 4 HAVING count(*) > 1)"
            ),
            "duplicate_terms": one("SELECT count(*) - count(DISTINCT term) FROM terms"),
            "duplicate_results": one(
                "SELECT count(*) FROM (SELECT run_id, qid FROM results GROUP BY run_id, qid HAVING count(*) > 1)"
            ),
            "orphan_passages": one("SELECT count(*) FROM passages WHERE document_id NOT IN (SELECT id FROM documents)"),
            "orphan_results": one("SELECT count(*) FROM results WHERE run_id NOT IN (SELECT id FROM runs)"),
            "documents": sorted(conn.execute("SELECT path, sha256, status FROM documents").fetchall()),
            "passages": sorted(
                conn.execute(
                    "SELECT d.path, p.ordinal, p.text FROM passages p JOIN documents d ON d.id = p.document_id"
                ).fetchall()
            ),
            "statements": one("SELECT count(*) FROM statements"),
            "terms": sorted(r[0] for r in conn.execute("SELECT term FROM terms")),
        }
    finally:
        conn.close()


CLEAN_DB_FACTS = {
    "integrity": "ok",
    "duplicate_documents": 0,
    "duplicate_passages": 0,
    "duplicate_statements": 0,
    "duplicate_terms": 0,
    "duplicate_results": 0,
    "orphan_passages": 0,
    "orphan_results": 0,
}


def folder_bytes(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def stored_run(db: Path, run_id: int) -> Run:
    with Store(db) as store:
        return load_run(store, run_id)


@pytest.fixture(scope="module")
def before_december(tmp_path_factory):
    """One finished November scan, then the December edits: the state every trial starts from."""
    root = make_site(tmp_path_factory.mktemp("crash") / "base")
    done = run_scan(root, "2026-11-01")
    assert done.returncode == 0, done.stderr
    december_edits(root)
    return root


@pytest.fixture(scope="module")
def clean_december(before_december, tmp_path_factory):
    """The uninterrupted December scan, with the number of calls each stage makes."""
    root = tmp_path_factory.mktemp("crash") / "clean"
    shutil.copytree(before_december, root, symlinks=True)
    done = wrapped_scan(root, "2026-12-01", "count")
    assert done.returncode == 0, done.stderr
    counts = json.loads((root / "stage-calls.json").read_text())
    results = json.loads((root / "reports" / "2026-12-01" / "results.json").read_text())
    return root, counts, results


def kill_points():
    """(stage, fraction) pairs drawn with a fixed seed, one in each equal slice of the stage so the
    points spread over it; the kill comes at that fraction of the stage's call count."""
    rng = random.Random(SEED)
    points = [
        (stage, (k + rng.random()) / KILLS_PER_STAGE)
        for stage in ("ingest", "audit", "report")
        for k in range(KILLS_PER_STAGE)
    ]
    # ... plus the very end of the audit stage, where its run is written in one transaction, and
    # the moment reports/latest is being switched.
    return points + [("audit", 0.999), ("latest", rng.random())]


@pytest.mark.slow
@pytest.mark.parametrize("stage,fraction", kill_points(), ids=lambda v: v if isinstance(v, str) else f"{v:.3f}")
def test_scan_killed_and_run_again_equals_a_clean_scan(stage, fraction, before_december, clean_december, tmp_path):
    clean_root, counts, clean_results = clean_december
    assert counts.get(stage, 0) >= (2 if stage == "latest" else 50), counts  # the stage ran under the wrapper
    at = min(counts[stage], max(1, int(fraction * counts[stage])))
    root = tmp_path / "trial"
    shutil.copytree(before_december, root, symlinks=True)
    november_report = folder_bytes(root / "reports" / "2026-11-01")
    db = root / "state" / "auditor.db"
    november_run = stored_run(db, 1)

    killed = wrapped_scan(root, "2026-12-01", "kill", stage, at)
    assert killed.returncode == -signal.SIGKILL, (killed.returncode, killed.stderr)
    where = (root / "stage-calls.json.killed").read_text()
    print(f"killed in {stage} at call {at} of {counts[stage]}: {where}")

    # Right after the kill: nothing earlier is damaged, and `latest` is a complete report.
    assert {k: v for k, v in db_facts(db).items() if k in CLEAN_DB_FACTS} == CLEAN_DB_FACTS
    assert folder_bytes(root / "reports" / "2026-11-01") == november_report
    latest = json.loads((root / "reports" / "latest" / "results.json").read_text())
    assert latest["run"]["as_of"] in ("2026-11-01", "2026-12-01")

    again = run_scan(root, "2026-12-01")
    assert again.returncode == 0, again.stderr
    results = json.loads((root / "reports" / "2026-12-01" / "results.json").read_text())
    assert comparable(results) == comparable(clean_results)

    facts, clean_facts = db_facts(db), db_facts(clean_root / "state" / "auditor.db")
    assert {k: v for k, v in facts.items() if k in CLEAN_DB_FACTS} == CLEAN_DB_FACTS
    assert facts == clean_facts
    assert stored_run(db, 1) == november_run
    assert folder_bytes(root / "reports" / "2026-11-01") == november_report
    assert os.readlink(root / "reports" / "latest") == "2026-12-01"
    assert json.loads((root / "reports" / "latest" / "results.json").read_text()) == results
    # A kill after the audit committed (in the report stage, or the last calls of the audit stage)
    # leaves that finished run beside the rerun's; a kill before leaves nothing of it.
    with sqlite3.connect(db) as conn:
        done = [r[0] for r in conn.execute("SELECT count(*) FROM runs WHERE status = 'done'")][0]
        running = [r[0] for r in conn.execute("SELECT count(*) FROM runs WHERE status = 'running'")][0]
    assert done in ((2,) if stage == "ingest" else (2, 3)), where
    assert running == 0
