"""One sentence per question that says why it got its verdict, naming the passage and the horizon that decided.

The sentence is stored with the question (results.json `explanation`) and shown in the page and the
owner files. It is built from the question's result alone, so a run stored before explanations were
kept gets the same sentence when it is reported again (its horizons read "unrecorded").

Which passage decided (`deciding_evidence`): for a supported question the best fresh supporting
passage, for a stale one the best stale supporting passage; a gap has none, since no passage
supports it and freshness played no part (docs/judgement.md).
"""

from __future__ import annotations

from datetime import date

from auditor.results import Evidence, Horizon, QuestionResult

SOURCE_TEXT = {
    "statement": "a dated statement in the passage",
    "metadata": "the document's metadata",
    "file": "the file's modification time only",
}


def deciding_evidence(q: QuestionResult) -> Evidence | None:
    """The evidence item the verdict rests on (see the module docstring), or None for a gap."""
    if q.verdict == "gap":
        return None
    want_fresh = q.verdict != "stale"
    chosen = [e for e in q.evidence if e.supporting and e.fresh == want_fresh]
    return max(chosen, key=lambda e: (e.support, -e.rank)) if chosen else None


def _age(as_of: str | None, audit: str | None) -> int | None:
    try:
        return (date.fromisoformat(str(audit)[:10]) - date.fromisoformat(str(as_of)[:10])).days
    except (TypeError, ValueError):
        return None


def horizon_text(horizon: Horizon | None) -> str:
    if horizon is None:
        return "the horizon"
    return horizon.describe()


def _dated(e: Evidence, audit: str | None) -> str:
    if not e.as_of:
        return "carries no date"
    s = f"is as of {e.as_of}"
    source = SOURCE_TEXT.get(str(e.as_of_source))
    if source:
        s += f" (from {source})"
    age = _age(e.as_of, audit)
    if age is not None:
        s += f", {age} days before the audit date"
    return s


def explain(q: QuestionResult, *, audit_date: str | None, threshold: float | None) -> str:
    """Why `q` has its verdict, in one or two sentences of plain text."""
    if q.verdict == "gap":
        s = "No passage supports this question"
        if threshold is not None:
            s += f" (best support {q.support:.2f}, threshold {threshold:.2f})"
        return s + "; the assistant would fall back to an outside source or answer without grounding."
    e = deciding_evidence(q)
    if e is None:  # a verdict without a supporting item: a run edited by hand
        return f"Verdict {q.verdict}; no supporting passage is recorded."
    where = e.document + (f" › {e.section}" if e.section else "")
    horizon = horizon_text(e.horizon or q.horizon)
    if q.verdict == "stale":
        reasons = []
        if "too_old" in e.reasons:
            reasons.append(f"older than {horizon}")
        if "expired" in e.reasons:
            reasons.append("its validity window closed" + (f" on {e.expires}" if e.expires else ""))
        if "overtaken" in e.reasons:
            reasons.append("it announces as planned what has since happened")
        why = "; ".join(reasons) or "stale"
        if "too_old" not in e.reasons:  # the horizon did not decide; say it was kept
            why = f"within {horizon}, but {why}"
        return f"Supported only by stale passages: the best, {where}, {_dated(e, audit_date)}: {why}."
    if e.as_of:
        tail = f", within {horizon}"
    else:
        tail = f"; undated passages count as fresh under {horizon}"
    return f"Supported by a fresh passage: {where} {_dated(e, audit_date)}{tail}."
