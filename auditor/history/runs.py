"""Run history: list stored runs, rebuild a run object, diff two runs, keep the last N.

A run is stored as one `runs` row (summary, corpus, thresholds, ingest errors, report-only extras as
JSON) and one `results` row per question (the results.json question object, in question-set order);
see `store.SCHEMA`. `load_run` turns those rows back into the run object that `audit.run_audit`
produced, so `auditor report --run ID` renders an old run exactly as it was, with its history, its
diff against the run before it and its gate outcome.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

from auditor.errors import AuditorError, StoreError
from auditor.store import Store, dumps

# Diff categories, in the order a reader wants them: what got worse first.
DIFF_CATEGORIES = ("new_gaps", "newly_stale", "resolved_gaps", "refreshed", "added", "removed")

_LABELS = {  # singular, plural
    "new_gaps": ("new gap", "new gaps"),
    "newly_stale": ("newly stale", "newly stale"),
    "resolved_gaps": ("resolved gap", "resolved gaps"),
    "refreshed": ("refreshed", "refreshed"),
    "added": ("question added", "questions added"),
    "removed": ("question removed", "questions removed"),
}


# --- reading runs ---------------------------------------------------------------------------------


def list_runs(store: Store) -> list[dict]:
    """Every stored run, oldest first: {id, started, finished, status, as_of, horizon_days, summary}."""
    rows = store.query("SELECT id, started, finished, status, as_of, horizon_days, summary FROM runs ORDER BY id")
    for row in rows:
        row["summary"] = _json(store, row["id"], "summary", row["summary"], {})
    return rows


def load_run(store: Store, run_id: int | None = None) -> dict:
    """The run object of a stored run (results.json format 1 plus the extensions of the contract).

    `run_id=None` loads the newest run with status 'done'. `history` lists the done runs before it
    (oldest first), `diff` compares it with the newest done run before it (None for the first run),
    `gate` is the stored gate outcome (None when no gate ran). Raises StoreError naming the
    database and the run when there is no such finished run.
    """
    if run_id is None:
        row = _one(store, "SELECT * FROM runs WHERE status = 'done' ORDER BY id DESC LIMIT 1")
        if row is None:
            raise StoreError(
                f"{str(store.path)!r}: no finished run in this database; run `auditor scan` or `auditor audit` first"
            )
    else:
        row = _one(store, "SELECT * FROM runs WHERE id = ?", [run_id])
        if row is None:
            raise StoreError(
                f"{str(store.path)!r}: no run {run_id} in this database; `auditor runs` lists the stored runs"
            )
        if row["status"] != "done":
            # A running or failed run has partial results; a report of it would mislead.
            raise StoreError(
                f"{str(store.path)!r}: run {run_id} is {row['status']}, not done; "
                f"only finished runs can be reported or compared"
            )
    run = _run_object(store, row)
    run["history"] = history(store, row["id"])
    base_id = previous_run(store, row["id"])
    if base_id is not None:
        base = _run_object(store, _one(store, "SELECT * FROM runs WHERE id = ?", [base_id]))
        run["diff"] = diff_runs(base, run)
    return run


def previous_run(store: Store, run_id: int) -> int | None:
    """The id of the newest done run stored before `run_id` (the base of its diff), or None.

    "Before" is by run id, i.e. the order the runs were made in, not by audit date: a re-audit of
    an older date is still compared with the run made just before it.
    """
    row = _one(store, "SELECT id FROM runs WHERE status = 'done' AND id < ? ORDER BY id DESC LIMIT 1", [run_id])
    return row["id"] if row else None


def history(store: Store, run_id: int) -> list[dict]:
    """Done runs before `run_id`, oldest first, as {id, as_of, summary} for the report's trend chart."""
    rows = store.query("SELECT id, as_of, summary FROM runs WHERE status = 'done' AND id < ? ORDER BY id", [run_id])
    return [
        {"id": r["id"], "as_of": r["as_of"], "summary": _json(store, r["id"], "summary", r["summary"], {})}
        for r in rows
    ]


def _run_object(store: Store, row: dict) -> dict:
    run_id = row["id"]
    extras = _json(store, run_id, "extras", row["extras"], {})
    questions = [
        _json(store, run_id, f"results[{r['position']}]", r["result"], None)
        for r in store.query("SELECT position, result FROM results WHERE run_id = ? ORDER BY position", [run_id])
    ]
    return {
        "format": 1,
        "run": {
            "id": run_id,
            "as_of": row["as_of"],
            "horizon_days": row["horizon_days"],
            "started": row["started"],
            "finished": row["finished"],
            "title": extras.get("title"),
            "tokenizer": extras.get("tokenizer"),
            "corpus": _json(store, run_id, "corpus", row["corpus"], {}),
            "thresholds": _json(store, run_id, "thresholds", row["thresholds"], {}),
            "config_fingerprint": row["config_fingerprint"],
            "corpus_fingerprint": row["corpus_fingerprint"],
        },
        "summary": _json(store, run_id, "summary", row["summary"], {}),
        "questions": questions,
        "ingest_errors": _json(store, run_id, "ingest_errors", row["ingest_errors"], []),
        "documents": extras.get("documents", []),
        "briefs": extras.get("briefs", []),
        "history": [],
        "diff": None,
        "gate": _json(store, run_id, "gate", row["gate"], None) if row["gate"] else None,
    }


def _one(store: Store, sql: str, params=()) -> dict | None:
    rows = store.query(sql, params)
    return rows[0] if rows else None


def _json(store: Store, run_id: int, column: str, text: str | None, default):
    if text is None or text == "":
        return default
    try:
        return json.loads(text)
    except ValueError as exc:
        raise StoreError(
            f"{str(store.path)!r}: run {run_id} has an unreadable {column} ({exc}); "
            f"delete the run or restore the database from a backup"
        ) from None


# --- writing around a run -------------------------------------------------------------------------


def record_gate(store: Store, run_id: int, gate: dict | None) -> None:
    """Store a gate outcome (evaluate_gate's dict) with its run."""
    with store.transaction():
        cursor = store.db.execute(
            "UPDATE runs SET gate = ? WHERE id = ?", [dumps(gate) if gate is not None else None, run_id]
        )
    if cursor.rowcount == 0:
        raise StoreError(f"{str(store.path)!r}: no run {run_id} to record the gate outcome on")


def apply_retention(store: Store, keep: int) -> list[int]:
    """Keep the newest `keep` done runs; delete older runs with their results. Returns deleted ids.

    `keep <= 0` keeps everything (the config's 0 = keep every run). Runs of any status older than
    the oldest kept done run go too (failed runs, rows of killed scans); the newest run is never
    deleted, and nothing is deleted while no run is done, so history is never emptied by a
    series of failures.
    """
    if not keep or keep <= 0:
        return []
    with store.transaction():
        done = [r["id"] for r in store.query("SELECT id FROM runs WHERE status = 'done' ORDER BY id DESC")]
        if not done:
            return []
        oldest_kept = done[:keep][-1]
        newest = store.query("SELECT max(id) AS id FROM runs")[0]["id"]
        doomed = [
            r["id"]
            for r in store.query("SELECT id FROM runs WHERE id < ? AND id != ? ORDER BY id", [oldest_kept, newest])
        ]
        if doomed:
            marks = ",".join("?" * len(doomed))
            # Results first: the foreign key cascades only when PRAGMA foreign_keys is on.
            store.db.execute(f"DELETE FROM results WHERE run_id IN ({marks})", doomed)
            store.db.execute(f"DELETE FROM runs WHERE id IN ({marks})", doomed)
    return doomed


def update_latest(out_dir: str | Path, link: str | Path | None = None) -> Path:
    """Point `<parent of out_dir>/latest` (or `link`) at the report folder `out_dir`, atomically.

    A relative symbolic link is made under a temporary name and renamed over the old one
    (os.replace), so a reader sees either the previous report or the new one, never neither. Where
    symbolic links are not available the link is a small text file holding the folder's path.
    Call it last, after the report files are in place.
    """
    out_dir = Path(out_dir)
    link = Path(link) if link is not None else out_dir.parent / "latest"
    if link.is_dir() and not link.is_symlink():
        raise AuditorError(
            f"{str(link)!r}: is a folder, not the link to the newest report; move it away so the link can be made"
        )
    try:
        target = os.path.relpath(out_dir.resolve(), link.parent.resolve())
    except ValueError:  # another drive (Windows)
        target = str(out_dir.resolve())
    temporary = link.with_name(f".{link.name}.{os.getpid()}.tmp")
    _remove_dead_temporaries(link)
    try:
        if temporary.is_symlink() or temporary.exists():
            temporary.unlink()
        try:
            os.symlink(target, temporary, target_is_directory=True)
        except (OSError, NotImplementedError):
            temporary.write_text(target + "\n", encoding="utf-8")
        os.replace(temporary, link)
    except OSError as exc:
        raise AuditorError(f"{str(link)!r}: cannot point it at the newest report ({exc})") from None
    return link


def _remove_dead_temporaries(link: Path) -> None:
    """Drop temporary links left by a scan killed inside update_latest (its pid no longer runs)."""
    for leftover in link.parent.glob(f".{link.name}.*.tmp"):
        try:
            pid = int(leftover.name[len(link.name) + 2 : -4])
            os.kill(pid, 0)
        except ValueError:
            continue
        except ProcessLookupError:
            try:
                leftover.unlink()
            except OSError:
                pass
        except PermissionError:  # alive, another user's
            continue


# --- diff -----------------------------------------------------------------------------------------


def diff_runs(base: dict, head: dict) -> dict:
    """What changed from run `base` to run `head`, question by question (matched by question id).

    Each change is in exactly one list:
      new_gaps       covered or stale before, gap now
      newly_stale    covered before, stale now
      resolved_gaps  gap before, covered or stale now (`after` says which)
      refreshed      stale before, covered now
      added          in head's question set only (whatever its verdict)
      removed        in base's question set only
    Items are {id, question, owner, weight, before, after, reasons} with before/after the verdicts
    (None when absent) and reasons head's stale reasons (base's for removed); weight is head's
    (base's for removed). `weights` sums the weights per list, `counts` the items; `summary` is one
    line of text ("1 new gap (weight 12), ...; fallback exposure 0.21 -> 0.18").
    """
    base_q = _keyed(base.get("questions", []))
    head_q = _keyed(head.get("questions", []))
    lists: dict[str, list[dict]] = {name: [] for name in DIFF_CATEGORIES}
    for key, after in head_q.items():
        before = base_q.get(key)
        if before is None:
            lists["added"].append(_item(after, None, after["verdict"]))
            continue
        was, now = before["verdict"], after["verdict"]
        if was == now:
            continue
        if now == "gap":
            category = "new_gaps"
        elif was == "gap":
            category = "resolved_gaps"
        elif now == "stale":
            category = "newly_stale"
        else:
            category = "refreshed"
        lists[category].append(_item(after, was, now))
    for key, before in base_q.items():
        if key not in head_q:
            lists["removed"].append(_item(before, before["verdict"], None))

    base_sum, head_sum = base.get("summary", {}), head.get("summary", {})
    diff = {
        "base_run": base["run"].get("id"),
        "base_as_of": base["run"].get("as_of"),
        "head_run": head["run"].get("id"),
        "head_as_of": head["run"].get("as_of"),
        **lists,
        "counts": {name: len(items) for name, items in lists.items()},
        "weights": {name: _round(sum(i["weight"] for i in items)) for name, items in lists.items()},
        "exposure": {
            "fallback": [base_sum.get("fallback_exposure"), head_sum.get("fallback_exposure")],
            "stale": [base_sum.get("stale_exposure"), head_sum.get("stale_exposure")],
        },
    }
    diff["summary"] = _diff_line(diff)
    return diff


def _keyed(questions: list[dict]) -> dict[tuple[str, int], dict]:
    # A question set should not repeat an id; if one does, its n-th use is matched with the n-th.
    seen: dict[str, int] = {}
    keyed = {}
    for q in questions:
        n = seen.get(q["id"], 0)
        seen[q["id"]] = n + 1
        keyed[(q["id"], n)] = q
    return keyed


def _item(q: dict, before: str | None, after: str | None) -> dict:
    return {
        "id": q["id"],
        "question": q.get("question"),
        "owner": q.get("owner"),
        "weight": float(q.get("weight", 1.0)),
        "before": before,
        "after": after,
        "reasons": list(q.get("reasons") or []),
    }


def _round(value: float) -> float:
    return round(value, 6)


def _diff_line(diff: dict) -> str:
    parts = []
    for name in DIFF_CATEGORIES:
        n = diff["counts"][name]
        if n:
            label = _LABELS[name][0 if n == 1 else 1]
            parts.append(f"{n} {label} (weight {_figure(diff['weights'][name])})")
    changes = ", ".join(parts) if parts else "no verdict changed"
    before, after = diff["exposure"]["fallback"]
    exposure = ""
    if before is not None and after is not None:
        exposure = f"; fallback exposure {before:.2f} -> {after:.2f}"
    return changes + exposure


def _figure(value: float) -> str:
    return f"{value:g}"


# --- text for the CLI -----------------------------------------------------------------------------


def format_runs(runs: list[dict]) -> str:
    """The run history as an aligned text table, one run a line."""
    if not runs:
        return "no runs yet"
    header = (
        "run",
        "status",
        "as of",
        "started",
        "finished",
        "questions",
        "covered",
        "stale",
        "gap",
        "fallback",
        "stale exp.",
    )
    rows = [header]
    for r in runs:
        s = r.get("summary") or {}
        rows.append(
            (
                str(r["id"]),
                r["status"],
                r["as_of"] or "",
                r["started"] or "",
                r["finished"] or "-",
                _count(s, "questions"),
                _count(s, "covered"),
                _count(s, "stale"),
                _count(s, "gap"),
                _share(s, "fallback_exposure"),
                _share(s, "stale_exposure"),
            )
        )
    widths = [max(len(row[i]) for row in rows) for i in range(len(header))]
    numeric = set(range(5, len(header))) | {0}
    lines = []
    for row in rows:
        cells = [cell.rjust(w) if i in numeric else cell.ljust(w) for i, (cell, w) in enumerate(zip(row, widths))]
        lines.append("  ".join(cells).rstrip())
    return "\n".join(lines)


def _count(summary: dict, key: str) -> str:
    value = summary.get(key)
    return "-" if value is None else f"{value:g}" if isinstance(value, float) else str(value)


def _share(summary: dict, key: str) -> str:
    value = summary.get(key)
    return "-" if value is None else f"{value:.2f}"


def format_diff(diff: dict | None) -> str:
    """The diff as text: the one-line summary, then each non-empty list, one question a line."""
    if diff is None:
        return "no earlier finished run to compare with"
    lines = [
        f"run {diff['head_run']} ({diff['head_as_of']}) against run {diff['base_run']} "
        f"({diff['base_as_of']}): {diff['summary']}"
    ]
    for name in DIFF_CATEGORIES:
        items = diff[name]
        if not items:
            continue
        lines.append("")
        lines.append(f"{_LABELS[name][1]} ({len(items)}, weight {_figure(diff['weights'][name])}):")
        width = max(len(str(i["id"])) for i in items)
        for i in items:
            change = f"{i['before'] or '-'} -> {i['after'] or '-'}"
            reasons = f" ({', '.join(i['reasons'])})" if i["reasons"] and i["after"] == "stale" else ""
            owner = i["owner"] or "unassigned"
            lines.append(
                f"  {str(i['id']).ljust(width)}  weight {_figure(i['weight'])}  {change}{reasons}  "
                f"[{owner}]  {i['question']}"
            )
    return "\n".join(lines)
