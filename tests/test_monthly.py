"""Monthly scans end to end with the real `auditor scan`: the diff between two months, and two
scans on one database at the same time.

The knowledge base is the small invented one of test_crash_safety (Fernhollow, fixtures/demo/README.md). In
December one page is replaced by a text dated March 2021 — older than the 365-day horizon, so its
question goes stale (docs/freshness.md, `too_old`) — and one page is added that answers a question
nothing answered in November (a gap filled). The diff must show exactly those two changes.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time

import pytest

from auditor.history.runs import list_runs, load_run
from auditor.results import GateResult
from auditor.store import Store
from tests.test_crash_safety import december_edits, environment, make_site, run_scan, wrapped_scan


def verdicts(results: dict) -> dict[str, str]:
    return {q["id"]: q["verdict"] for q in results["questions"]}


def auditor(root, *args) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-m", "auditor.cli", *args],
        cwd=root,
        env=environment(),
        capture_output=True,
        text=True,
        timeout=300,
    )


@pytest.mark.slow
def test_two_monthly_scans_diff_shows_exactly_the_two_changes(tmp_path):
    root = make_site(tmp_path / "site")
    november = run_scan(root, "2026-11-01")
    assert november.returncode == 0, november.stderr
    before = json.loads((root / "reports" / "2026-11-01" / "results.json").read_text())
    # The premises, from the documents' own text: the leak page (updated 2026-08-15) answers q-leak
    # freshly; nothing mentions a rain barrel or paperless statements yet.
    assert verdicts(before) == {
        "q-phone": "supported",
        "q-leak": "supported",
        "q-stop": "supported",
        "q-boil": "supported",
        "q-barrel": "gap",
        "q-paperless": "gap",
    }
    assert before["diff"] is None
    # The first scan of a schedule has nothing to compare with, and that is not an error.
    first_diff = auditor(root, "diff", "-c", "audit.toml")
    assert (first_diff.returncode, first_diff.stdout) == (
        0,
        "run 1 (2026-11-01) is the first finished run; nothing to compare yet\n",
    )

    december_edits(root)
    december = run_scan(root, "2026-12-01")
    assert december.returncode == 0, december.stderr
    after = json.loads((root / "reports" / "2026-12-01" / "results.json").read_text())
    diff = after["diff"]
    assert [(i["id"], i["before"], i["after"]) for i in diff["newly_stale"]] == [("q-leak", "supported", "stale")]
    assert "too_old" in diff["newly_stale"][0]["reasons"]
    assert [(i["id"], i["before"], i["after"]) for i in diff["resolved_gaps"]] == [("q-barrel", "gap", "supported")]
    for name in ("new_gaps", "refreshed", "added", "removed"):
        assert diff[name] == [], name
    assert diff["weights"]["newly_stale"] == 40.0 and diff["weights"]["resolved_gaps"] == 12.0
    assert diff["base_run"] == before["run"]["id"] and diff["head_run"] == after["run"]["id"]
    # fallback exposure: November gaps q-barrel 12 + q-paperless 20 of 215; December q-paperless 20 of 215
    assert diff["exposure"]["fallback"] == pytest.approx([32 / 215, 20 / 215])
    assert after["history"] == [{"id": before["run"]["id"], "as_of": "2026-11-01", "summary": before["summary"]}]
    assert diff["summary"] in december.stdout

    # The same diff from the command line, and the run history.
    shown = auditor(root, "diff", "-c", "audit.toml")
    assert shown.returncode == 0, shown.stderr
    lines = shown.stdout.splitlines()
    assert lines[0] == (
        "run 2 (2026-12-01) against run 1 (2026-11-01): 1 newly stale (weight 40), "
        "1 resolved gap (weight 12); fallback exposure 0.15 -> 0.09"
    )
    assert [line.split()[0] for line in lines if line.startswith("  ")] == ["q-leak", "q-barrel"]
    listed = auditor(root, "runs", "-c", "audit.toml")
    assert [line.split()[:3] for line in listed.stdout.splitlines()[1:]] == [
        ["1", "done", "2026-11-01"],
        ["2", "done", "2026-12-01"],
    ]
    assert os.readlink(root / "reports" / "latest") == "2026-12-01"

    # A stored run reported again is the run the scan reported: history, diff and gate included.
    again = auditor(root, "report", "-c", "audit.toml", "--run", "2", "--out", "again")
    assert again.returncode == 0, again.stderr
    rebuilt = json.loads((root / "again" / "results.json").read_text())
    assert rebuilt == after


def start_paused_scan(root, as_of="2026-11-01"):
    """A real scan that takes the lock and then waits, just before ingest, until told to go on."""
    scan = wrapped_scan(root, as_of, "pause", "ingest", 0, wait=False)
    marker = root / "stage-calls.json.paused"
    deadline = time.monotonic() + 120
    while not marker.exists():
        assert scan.poll() is None, scan.communicate()
        assert time.monotonic() < deadline, "the first scan never reached ingest"
        time.sleep(0.05)
    return scan


@pytest.mark.slow
def test_two_scans_at_once_one_runs_the_other_is_refused_or_waits(tmp_path):
    root = make_site(tmp_path / "site")
    db = root / "state" / "auditor.db"
    first = start_paused_scan(root)
    try:
        refused = run_scan(root, "2026-11-01")
        assert refused.returncode == 1
        assert refused.stderr.startswith(f"error: {str(db)!r}: another scan holds the lock (pid {first.pid} since 20")
        assert refused.stderr.rstrip().endswith("; wait with --wait SECONDS")
        assert refused.stderr.count("\n") == 1  # one line, no traceback

        waiting = subprocess.Popen(
            [
                sys.executable,
                "-m",
                "auditor.cli",
                "scan",
                "-c",
                "audit.toml",
                "--as-of",
                "2026-11-01",
                "--quiet",
                "--wait",
                "120",
            ],
            cwd=root,
            env=environment(),
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
        )
        # The waiting scan says once, on stderr, that it met the held lock; nothing else of it
        # reaches stderr before the lock is free (--quiet), so its first line is that one.
        said = waiting.stderr.readline()
        assert said.startswith(f"{str(db)!r}: waiting for the lock (pid {first.pid} since 20"), said
        assert said.rstrip().endswith("), up to 120 s")
        assert waiting.poll() is None  # it said so and is still waiting
    finally:
        (root / "stage-calls.json.resume").touch()
    out, err = first.communicate(timeout=300)
    assert first.returncode == 0, err
    out, err = waiting.communicate(timeout=300)
    assert waiting.returncode == 0, err

    with Store(db) as store:
        runs = list_runs(store)
    # Two finished runs (the refused scan left none), the waiting one audited after the first finished.
    assert [r.status for r in runs] == ["done", "done"]
    assert runs[1].started >= runs[0].finished


@pytest.mark.slow
def test_scan_after_a_killed_scan_takes_over_its_lock(tmp_path):
    root = make_site(tmp_path / "site")
    first = start_paused_scan(root)
    os.kill(first.pid, signal.SIGKILL)
    first.communicate(timeout=60)
    assert first.returncode == -signal.SIGKILL
    after = run_scan(root, "2026-11-01")
    assert after.returncode == 0, after.stderr
    assert (
        verdicts(json.loads((root / "reports" / "2026-11-01" / "results.json").read_text()))["q-phone"] == "supported"
    )


@pytest.mark.slow
def test_retention_keeps_the_newest_runs_after_a_scan(tmp_path):
    root = make_site(tmp_path / "site")
    config = root / "audit.toml"
    config.write_text(config.read_text().replace("[report]\n", "[report]\nkeep_runs = 1\n"), encoding="utf-8")
    for as_of in ("2026-11-01", "2026-12-01"):
        done = run_scan(root, as_of)
        assert done.returncode == 0, done.stderr
    listed = auditor(root, "runs", "-c", "audit.toml")
    assert [line.split()[:3] for line in listed.stdout.splitlines()[1:]] == [["2", "done", "2026-12-01"]]
    # The December report was written before the November run was dropped, so it keeps its diff;
    # the November report folder stays on disk (retention is about the database).
    december = json.loads((root / "reports" / "2026-12-01" / "results.json").read_text())
    assert december["diff"]["base_run"] == 1 and december["history"][0]["id"] == 1
    assert (root / "reports" / "2026-11-01" / "results.json").is_file()


@pytest.mark.slow
def test_failed_gate_exits_3_with_the_limit_and_keeps_the_report(tmp_path):
    root = make_site(tmp_path / "site")
    config = root / "audit.toml"
    config.write_text(
        config.read_text().replace("max_gap_share = 0.9", "max_fallback_exposure = 0.10"), encoding="utf-8"
    )
    done = run_scan(root, "2026-11-01")
    # November: gaps q-barrel (12) and q-paperless (20) of weight 215 -> 32/215 = 0.149 > 0.10
    assert done.returncode == 3, done.stderr
    assert done.stderr.splitlines() == ["release limits breached: fallback exposure 0.15 (ceiling 0.10)"]
    results = json.loads((root / "reports" / "latest" / "results.json").read_text())
    assert results["limits"]["within"] is False
    assert results["limits"]["checks"][0]["value"] == pytest.approx(32 / 215)

    with Store(root / "state" / "auditor.db") as store:
        assert load_run(store).gate == GateResult.from_json(results["limits"])  # stored with the run
