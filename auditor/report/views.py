"""Views of the run's tables for the page: the diff against the previous run, the gate outcome and
the document inventory, plus the small number and date formatters the page shares."""

from __future__ import annotations

from datetime import date

from auditor.report.exports import document_owner

LIST_LIMIT = 50  # rows per document inventory list


# --- small helpers --------------------------------------------------------------------------------


def _date(value) -> date | None:
    if not value:
        return None
    try:
        return date.fromisoformat(str(value)[:10])
    except ValueError:
        return None


def _share(part: float, whole: float) -> float:
    return part / whole if whole else 0.0


def _pct(x) -> str:
    return "–" if x is None else f"{float(x) * 100:.1f}%"


def _num(x, digits: int = 2) -> str:
    if x is None:
        return "–"
    x = float(x)
    return str(int(x)) if x.is_integer() else f"{x:.{digits}f}"


def _humanize(key: str) -> str:
    return str(key).replace("_", " ").strip().capitalize()


DIFF_ORDER = ("new_gaps", "newly_stale", "resolved_gaps", "refreshed", "added", "removed")
DIFF_META = ("base_run", "base_as_of", "head_run", "head_as_of", "summary", "counts", "weights", "exposure")


def _scalar_text(value) -> str:
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return _num(value, 3)
    if isinstance(value, (list, tuple)):
        return ", ".join(_scalar_text(v) for v in value)
    if isinstance(value, dict):
        return "; ".join(f"{k}: {_scalar_text(v)}" for k, v in value.items())
    return "" if value is None else str(value)


def _diff_entry(item) -> dict:
    """One question of a diff list (runs.diff_runs items: id, question, owner, weight, before,
    after, reasons); other fields are shown as "key value"."""
    if not isinstance(item, dict):
        return {"id": None, "text": _scalar_text(item), "change": "", "extra": ""}
    change = ""
    if "before" in item or "after" in item:
        change = f"{item.get('before') or 'not asked'} → {item.get('after') or 'not asked'}"
    extra = []
    if item.get("weight") is not None:
        extra.append(f"weight {_num(item['weight'])}")
    if item.get("owner"):
        extra.append(str(item["owner"]))
    if item.get("reasons"):
        extra.append(", ".join(map(str, item["reasons"])))
    extra += [
        f"{_humanize(k).lower()} {_scalar_text(v)}"
        for k, v in item.items()
        if k not in ("id", "question", "owner", "weight", "before", "after", "reasons") and v not in (None, "", [])
    ]
    return {
        "id": item.get("id"),
        "text": _scalar_text(item.get("question", "")),
        "change": change,
        "extra": " · ".join(extra),
    }


def diff_view(diff: dict | None) -> dict | None:
    """The diff against the previous run (runs.diff_runs) as groups of questions and a few facts.

    Known lists come first in DIFF_ORDER; any other list or field is still shown, by name.
    """
    if not isinstance(diff, dict):
        return None
    weights = diff.get("weights") if isinstance(diff.get("weights"), dict) else {}
    lists = [k for k in DIFF_ORDER if isinstance(diff.get(k), (list, tuple))]
    lists += sorted(k for k, v in diff.items() if isinstance(v, (list, tuple)) and k not in lists)
    groups = [
        {"key": k, "title": _humanize(k), "entries": [_diff_entry(x) for x in diff[k]], "weight": weights.get(k)}
        for k in lists
    ]
    facts = []
    if diff.get("base_run") is not None or diff.get("base_as_of"):
        facts.append(("Compared with", f"run #{diff.get('base_run')} of {diff.get('base_as_of')}"))
    exposure = diff.get("exposure") if isinstance(diff.get("exposure"), dict) else {}
    for name in sorted(exposure):
        pair = exposure[name]
        if isinstance(pair, (list, tuple)) and len(pair) == 2:
            facts.append((f"{_humanize(name)} exposure", f"{_pct(pair[0])} → {_pct(pair[1])}"))
    for k in sorted(diff):
        if k not in lists and k not in DIFF_META:
            facts.append((_humanize(k), _scalar_text(diff[k])))
    return {
        "groups": groups,
        "facts": facts,
        "summary": diff.get("summary") if isinstance(diff.get("summary"), str) else None,
    }


GATE_COLUMNS = (
    ("limit", "Limit"),
    ("figure", "Figure"),
    ("value", "Value"),
    ("max", "Limit value"),
    ("passed", "Result"),
)


def gate_view(gate: dict | None) -> dict | None:
    """The gate outcome (gate.evaluate_gate: passed, checks, message) with one row per check."""
    if not isinstance(gate, dict):
        return None
    passed = gate.get("passed", gate.get("ok"))
    checks = [c for c in gate.get("checks") or [] if isinstance(c, dict)]
    known = [k for k, _ in GATE_COLUMNS]
    cols = [k for k in known if any(k in c for c in checks)]
    cols += sorted({k for c in checks for k in c if k not in known})
    headers = [dict(GATE_COLUMNS).get(k, _humanize(k)) for k in cols]
    rows = []
    for c in checks:
        cells = []
        for k in cols:
            v = c.get(k)
            if k == "passed":
                cells.append("passed" if v else "failed")
            elif k in ("value", "max") and isinstance(v, float):
                cells.append(_num(v, 3))
            else:
                cells.append(_scalar_text(v))
        rows.append({"cells": cells, "failed": c.get("passed", c.get("ok")) is False})
    facts = [
        (_humanize(k), _scalar_text(v))
        for k, v in sorted(gate.items())
        if k not in ("passed", "ok", "checks", "message")
    ]
    return {
        "passed": bool(passed),
        "message": gate.get("message"),
        "headers": headers,
        "rows": rows,
        "row_count": len(rows),
        "facts": facts,
    }


def inventory(documents: list[dict], ingest_errors, audit: date | None) -> dict:
    """Document inventory: oldest, undated, expired, failed (with reasons), and counts."""
    docs = sorted(documents, key=lambda d: str(d.get("path")))
    active = [d for d in docs if d.get("status", "active") == "active"]

    def as_of(d):
        return _date(d.get("as_of")) or _date(d.get("doc_date"))

    dated = [d for d in active if as_of(d)]
    oldest = sorted(dated, key=lambda d: (as_of(d), str(d.get("path"))))
    undated = [d for d in active if not as_of(d)]
    expired = [
        d
        for d in active
        if "expired" in (d.get("reasons") or [])
        or (audit and _date(d.get("expires")) and _date(d.get("expires")) < audit)
    ]
    expired.sort(key=lambda d: (str(d.get("expires") or ""), str(d.get("path"))))
    # A failed file: its kinds (documents.reasons, e.g. "encrypted") and messages (ingest_errors).
    failed = {
        str(d.get("path")): {
            "path": d.get("path"),
            "owner": document_owner(d),
            "kinds": list(d.get("reasons") or []),
            "errors": [],
        }
        for d in docs
        if d.get("status") == "failed"
    }
    for err in ingest_errors or []:
        entry = failed.setdefault(
            str(err.get("document")), {"path": err.get("document"), "owner": None, "kinds": [], "errors": []}
        )
        if err.get("error") and err.get("error") not in entry["errors"]:
            entry["errors"].append(err.get("error"))
    failed = list(failed.values())
    failed.sort(key=lambda f: str(f["path"]))
    return {
        "counts": {
            "documents": len(docs),
            "active": len(active),
            "removed": sum(1 for d in docs if d.get("status") == "removed"),
            "failed": len(failed),
            "undated": len(undated),
            "expired": len(expired),
            "stale": sum(1 for d in active if d.get("fresh") is False),
        },
        "oldest": oldest[:LIST_LIMIT],
        "undated": undated[:LIST_LIMIT],
        "expired": expired[:LIST_LIMIT],
        "failed": failed,
        "more": {
            "oldest": max(0, len(oldest) - LIST_LIMIT),
            "undated": max(0, len(undated) - LIST_LIMIT),
            "expired": max(0, len(expired) - LIST_LIMIT),
        },
        "audit": audit,
    }
