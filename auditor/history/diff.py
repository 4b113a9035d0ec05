"""The diff of two runs: which questions changed verdict, sorted into the lists a reader acts on.

Each change is in exactly one list (results.DIFF_CATEGORIES, what got worse first):
  new_gaps       supported or stale before, gap now
  newly_stale    supported before, stale now
  resolved_gaps  gap before, supported or stale now (`after` says which)
  refreshed      stale before, supported now
  added          in head's question set only (whatever its verdict)
  removed        in base's question set only
"""

from __future__ import annotations

from auditor.results import DIFF_CATEGORIES, Diff, DiffItem, ExposureChange, QuestionResult, Run

_LABELS = {  # singular, plural
    "new_gaps": ("new gap", "new gaps"),
    "newly_stale": ("newly stale", "newly stale"),
    "resolved_gaps": ("resolved gap", "resolved gaps"),
    "refreshed": ("refreshed", "refreshed"),
    "added": ("question added", "questions added"),
    "removed": ("question removed", "questions removed"),
}


def diff_runs(base: Run, head: Run) -> Diff:
    """What changed from run `base` to run `head`, question by question (matched by question id).

    Items carry before/after the verdicts (None when absent) and reasons head's stale reasons
    (base's for removed); weight is head's (base's for removed). `weights` sums the weights per
    list, `counts` the items; `summary` is one line of text ("1 new gap (weight 12), ...; fallback
    exposure 0.21 -> 0.18").
    """
    base_q = _keyed(base.questions)
    head_q = _keyed(head.questions)
    lists: dict[str, list[DiffItem]] = {name: [] for name in DIFF_CATEGORIES}
    for key, after in head_q.items():
        before = base_q.get(key)
        if before is None:
            lists["added"].append(_item(after, None, after.verdict))
            continue
        was, now = before.verdict, after.verdict
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
            lists["removed"].append(_item(before, before.verdict, None))

    counts = {name: len(items) for name, items in lists.items()}
    weights = {name: _round(sum(i.weight for i in items)) for name, items in lists.items()}
    exposure = ExposureChange(
        fallback=[base.summary.fallback_exposure, head.summary.fallback_exposure],
        stale=[base.summary.stale_exposure, head.summary.stale_exposure],
    )
    return Diff(
        base_run=base.info.id,
        base_as_of=base.info.as_of,
        head_run=head.info.id,
        head_as_of=head.info.as_of,
        **lists,
        counts=counts,
        weights=weights,
        exposure=exposure,
        summary=_diff_line(counts, weights, exposure),
    )


def _keyed(questions: list[QuestionResult]) -> dict[tuple[str, int], QuestionResult]:
    # A question set should not repeat an id; if one does, its n-th use is matched with the n-th.
    seen: dict[str, int] = {}
    keyed = {}
    for q in questions:
        n = seen.get(q.id, 0)
        seen[q.id] = n + 1
        keyed[(q.id, n)] = q
    return keyed


def _item(q: QuestionResult, before: str | None, after: str | None) -> DiffItem:
    return DiffItem(
        id=q.id,
        question=q.question,
        owner=q.owner,
        weight=float(q.weight),
        before=before,
        after=after,
        reasons=list(q.reasons),
    )


def _round(value: float) -> float:
    return round(value, 6)


def _diff_line(counts: dict[str, int], weights: dict[str, float], exposure: ExposureChange) -> str:
    parts = []
    for name in DIFF_CATEGORIES:
        n = counts[name]
        if n:
            label = _LABELS[name][0 if n == 1 else 1]
            parts.append(f"{n} {label} (weight {_figure(weights[name])})")
    changes = ", ".join(parts) if parts else "no verdict changed"
    before, after = exposure.fallback
    tail = ""
    if before is not None and after is not None:
        tail = f"; fallback exposure {before:.2f} -> {after:.2f}"
    return changes + tail


def _figure(value: float) -> str:
    return f"{value:g}"


def format_diff(diff: Diff | None) -> str:
    """The diff as text: the one-line summary, then each non-empty list, one question a line."""
    if diff is None:
        return "no earlier finished run to compare with"
    lines = [f"run {diff.head_run} ({diff.head_as_of}) against run {diff.base_run} ({diff.base_as_of}): {diff.summary}"]
    for name, items in diff.lists().items():
        if not items:
            continue
        lines.append("")
        lines.append(f"{_LABELS[name][1]} ({len(items)}, weight {_figure(diff.weights[name])}):")
        width = max(len(str(i.id)) for i in items)
        for i in items:
            change = f"{i.before or '-'} -> {i.after or '-'}"
            reasons = f" ({', '.join(i.reasons)})" if i.reasons and i.after == "stale" else ""
            owner = i.owner or "unassigned"
            lines.append(
                f"  {str(i.id).ljust(width)}  weight {_figure(i.weight)}  {change}{reasons}  [{owner}]  {i.question}"
            )
    return "\n".join(lines)
