"""Views of the run's tables for the page: the diff against the previous run, the release limits and
the document inventory, plus the small number and date formatters the page shares."""

from __future__ import annotations

from datetime import date
from typing import Any

from auditor.history.gate import describe_check
from auditor.report.exports import document_owner
from auditor.results import Diff, DiffItem, DocumentEntry, GateResult, IngestError

LIST_LIMIT = 50  # rows per document inventory list


# --- small helpers --------------------------------------------------------------------------------


def _date(value: str | None) -> date | None:
    if not value:
        return None
    try:
        return date.fromisoformat(str(value)[:10])
    except ValueError:
        return None


def _share(part: float, whole: float) -> float:
    return part / whole if whole else 0.0


def _pct(x: float | None) -> str:
    return "–" if x is None else f"{float(x) * 100:.1f}%"


def _num(x: float | None, digits: int = 2) -> str:
    if x is None:
        return "–"
    x = float(x)
    return str(int(x)) if x.is_integer() else f"{x:.{digits}f}"


def _humanize(key: str) -> str:
    return str(key).replace("_", " ").strip().capitalize()


def _scalar_text(value: Any) -> str:
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return _num(value, 3)
    if isinstance(value, (list, tuple)):
        return ", ".join(_scalar_text(v) for v in value)
    return "" if value is None else str(value)


def _diff_entry(item: DiffItem) -> dict:
    """One question of a diff list."""
    change = f"{item.before or 'not asked'} → {item.after or 'not asked'}"
    extra = []
    if item.weight is not None:
        extra.append(f"weight {_num(item.weight)}")
    if item.owner:
        extra.append(str(item.owner))
    if item.reasons:
        extra.append(", ".join(map(str, item.reasons)))
    return {"id": item.id, "text": _scalar_text(item.question or ""), "change": change, "extra": " · ".join(extra)}


def diff_view(diff: Diff | None) -> dict | None:
    """The diff against the previous run (history/diff.py) as groups of questions and a few facts."""
    if diff is None:
        return None
    groups = [
        {
            "key": name,
            "title": _humanize(name),
            "entries": [_diff_entry(x) for x in items],
            "weight": diff.weights.get(name),
        }
        for name, items in diff.lists().items()
    ]
    facts = []
    if diff.base_run is not None or diff.base_as_of:
        facts.append(("Compared with", f"run #{diff.base_run} of {diff.base_as_of}"))
    for name, pair in (("fallback", diff.exposure.fallback), ("stale", diff.exposure.stale)):
        if len(pair) == 2:
            facts.append((f"{_humanize(name)} exposure", f"{_pct(pair[0])} → {_pct(pair[1])}"))
    return {"groups": groups, "facts": facts, "summary": diff.summary}


def gate_view(gate: GateResult | None) -> dict | None:
    """The release limits (history/gate.py) as one line: within or breached, then each figure against
    its ceiling, breached ones first."""
    if gate is None:
        return None
    ordered = sorted(gate.checks, key=lambda c: c.passed)  # breached first, else in check order
    return {
        "within": bool(gate.passed),
        "message": gate.message,
        "checks": [{"text": describe_check(c), "over": not c.passed, "figure": c.figure} for c in ordered],
    }


def inventory(documents: list[DocumentEntry], ingest_errors: list[IngestError], audit: date | None) -> dict:
    """Document inventory: oldest, undated, expired, failed (with reasons), and counts."""
    docs = sorted(documents, key=lambda d: str(d.path))
    active = [d for d in docs if d.status == "active"]

    def as_of(d: DocumentEntry) -> date | None:
        return _date(d.as_of) or _date(d.doc_date)

    def expires(d: DocumentEntry) -> date | None:
        return _date(d.expires)

    dated = [d for d in active if as_of(d)]
    oldest = sorted(dated, key=lambda d: (as_of(d), str(d.path)))
    undated = [d for d in active if not as_of(d)]
    expired = [
        d for d in active if "expired" in d.reasons or (audit and (end := expires(d)) is not None and end < audit)
    ]
    expired.sort(key=lambda d: (str(d.expires or ""), str(d.path)))
    # A failed file: its kinds (documents.reasons, e.g. "encrypted") and messages (ingest_errors).
    failed: dict[str, dict] = {
        str(d.path): {"path": d.path, "owner": document_owner(d), "kinds": list(d.reasons), "errors": []}
        for d in docs
        if d.status == "failed"
    }
    for err in ingest_errors:
        entry = failed.setdefault(str(err.document), {"path": err.document, "owner": None, "kinds": [], "errors": []})
        if err.error and err.error not in entry["errors"]:
            entry["errors"].append(err.error)
    failed_list = sorted(failed.values(), key=lambda f: str(f["path"]))
    return {
        "counts": {
            "documents": len(docs),
            "active": len(active),
            "removed": sum(1 for d in docs if d.status == "removed"),
            "failed": len(failed_list),
            "undated": len(undated),
            "expired": len(expired),
            "stale": sum(1 for d in active if d.fresh is False),
        },
        "oldest": oldest[:LIST_LIMIT],
        "undated": undated[:LIST_LIMIT],
        "expired": expired[:LIST_LIMIT],
        "failed": failed_list,
        "more": {
            "oldest": max(0, len(oldest) - LIST_LIMIT),
            "undated": max(0, len(undated) - LIST_LIMIT),
            "expired": max(0, len(expired) - LIST_LIMIT),
        },
        "audit": audit,
    }
