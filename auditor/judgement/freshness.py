"""Passage freshness: as-of, expiry, horizons and the corpus figures (docs/freshness.md).

The rules, for audit date T and horizon H days:

* as-of, the most specific evidence first (recorded in `as_of_source`):
  1. `statement`: the latest `as_of` or `effective` statement in force by T. An `as_of` statement
     counts at the end of its interval ("updated March 2024" -> 2024-03-31); an `effective` one at
     the end of its interval too, except a range ("valid July 1, 2024 through June 30, 2025"),
     which counts at its start, its end being an expiry. A statement that begins after T is not an
     as-of: rates "effective January 1, 2027" say nothing about how current the page was before.
     Dates are capped at T.
  2. `statement` too: else the end of the latest `period` the passage describes that began by T.
  3. `metadata`: else the document date; `file` when the document date is the file's time
     (doc_date_source starting with "file:").
  4. `none`: else the passage is undated (as_of None).
* reasons:
  * `too_old`  T − as_of > H;
  * `expired`  an `expires` statement (or the end of an effective range, or the document's own
    expiry date) lies before T — unless something in the passage took effect after it: "the old
    rate applied until June 30; effective July 1 the rate is ..." is history, not an expired
    passage. A review date after the expiry does not excuse it: the reviewer left a closed window
    advertised;
  * `overtaken` a `planned` event whose interval ended before T: the passage still announces as
    coming what has happened, whenever it was last reviewed.
  An expiry after T is fine; so is an event that has happened (role `event`).
* TIMEX3 kinds (docs/dates.md): a present reference ("currently", "now"; value PRESENT_REF)
  pins the as-of to the document date, ahead of any older statement ("Updated March 2025: the fee
  is currently $12" in a document dated 2026-11-20 is as of 2026-11-20); a duration anchored to a
  date is a window from that date to its end, the end an expiry when the window is one of
  validity ("valid for 90 days from 1 March 2026" expires on date(2026, 3, 1) + timedelta(days=90));
  a schedule or recurring date (TIMEX3 SET: "every Tuesday", "annually in April") never makes a
  passage stale, nor does a duration or clock time with no place on the calendar (role `other`).
* An undated passage (no dated statement, no document date, no file time) is not stale for age:
  fresh, with as_of None and as_of_source "none", so that the judge can flag it. It can still be
  expired or overtaken by what it says.

Corpus figures follow Cho & Garcia-Molina, "Synchronizing a database to improve freshness"
(SIGMOD 2000): F(S;t) = (1/N) Σ F(e_i;t) with F = 1 for an up-to-date element, else 0, and
A(S;t) = (1/N) Σ A(e_i;t) with A = 0 when up to date, else t − as_of (here: age_days).
"""

from __future__ import annotations

import fnmatch
from datetime import date

from auditor.config import FreshnessConfig
from auditor.models import Freshness, TemporalExpression
from auditor.results import Horizon

__all__ = ["passage_freshness", "horizon_for", "horizon_choice", "corpus_freshness", "is_range"]

# Longest interval, in days, of one unit of each granularity: an expression longer than that is a
# range written with two ends ("July 1, 2024 through June 30, 2025").
_UNIT_DAYS = {"day": 1, "week": 7, "month": 31, "quarter": 92, "half": 184, "season": 92, "year": 366, "decade": 3653}


def is_range(expression: TemporalExpression) -> bool:
    """Whether the expression spans more than one unit of its granularity."""
    return (expression.end - expression.start).days + 1 > _UNIT_DAYS.get(expression.granularity, 1)


def passage_freshness(
    statements: list[TemporalExpression],
    *,
    audit_date: date,
    horizon_days: int,
    doc_date: date | None,
    doc_date_source: str | None,
    doc_expires: date | None = None,
) -> Freshness:
    """Freshness of one passage at `audit_date` from its dated statements (see the module docstring).

    `doc_date`/`doc_date_source` are the document's date and where it came from (the
    documents.doc_date_source string, "file:..." for a file time); `doc_expires` is the document's
    own expiry date from its metadata, if any.
    """
    today = audit_date
    stated: list[date] = []  # as_of / effective evidence
    effective_starts: list[date] = []
    periods: list[date] = []
    expiries: list[date] = []
    planned_ends: list[date] = []
    present: list[date] = []
    for s in statements:
        if s.timex_type == "SET" or s.role == "other":
            continue  # a schedule recurs; nothing recurring is out of date
        if s.value == "PRESENT_REF":
            present.append(min(doc_date or s.start, today))
            continue
        if s.timex_type == "DURATION" and s.role in ("effective", "expires"):
            # a window of validity counted from a date: in force from its start, over at its end
            expiries.append(s.end)
            if s.role == "effective" and s.start <= today:
                effective_starts.append(s.start)
                stated.append(s.start)
            continue
        if s.role == "as_of" and s.start <= today:
            stated.append(min(s.end, today))
        elif s.role == "effective":
            if s.start <= today:
                effective_starts.append(s.start)
            if is_range(s):
                expiries.append(s.end)
                if s.start <= today:
                    stated.append(s.start)
            elif s.start <= today:
                stated.append(min(s.end, today))
        elif s.role == "period" and s.start <= today:
            periods.append(min(s.end, today))
        elif s.role == "expires":
            expiries.append(s.end)
        elif s.role == "planned":
            planned_ends.append(s.end)

    if present:
        as_of, source = max(present + stated), "statement"
    elif stated:
        as_of, source = max(stated), "statement"
    elif periods:
        as_of, source = max(periods), "statement"
    elif doc_date is not None:
        as_of = min(doc_date, today)
        source = "file" if (doc_date_source or "").startswith("file:") else "metadata"
    else:
        as_of, source = None, "none"

    # An expiry followed by something that took effect after it is history the passage has moved
    # past ("... in force until February 28; effective March 1 ..."); a later review date is not.
    live = [d for d in expiries if not any(start > d for start in effective_starts)]
    if doc_expires is not None:
        live.append(doc_expires)
    live.sort()
    reasons = []
    age = (today - as_of).days if as_of is not None else None
    if age is not None and age > horizon_days:
        reasons.append("too_old")
    if any(d < today for d in live):
        reasons.append("expired")
    if any(d < today for d in planned_ends):
        reasons.append("overtaken")
    return Freshness(
        as_of=as_of,
        as_of_source=source,
        expires=live[0] if live else None,
        fresh=not reasons,
        reasons=tuple(reasons),
        age_days=age,
    )


def _glob_match(path: str, pattern: str) -> bool:
    """fnmatch over a POSIX path, where a leading "**/" may also match nothing."""
    path = path.replace("\\", "/")
    if fnmatch.fnmatchcase(path, pattern):
        return True
    while pattern.startswith("**/"):
        pattern = pattern[3:]
        if fnmatch.fnmatchcase(path, pattern):
            return True
    return False


def horizon_for(
    freshness_config: FreshnessConfig, *, path: str | None = None, topic: str | None = None, override: int | None = None
) -> int:
    """The freshness horizon in days (see `horizon_choice`)."""
    return horizon_choice(freshness_config, path=path, topic=topic, override=override).days


def horizon_choice(
    freshness_config: FreshnessConfig, *, path: str | None = None, topic: str | None = None, override: int | None = None
) -> Horizon:
    """The freshness horizon and where it came from: a per-question override, else the first topic
    rule that names `topic` (case-insensitive), else the first path-glob rule matching `path`
    (relative document path), else the default."""
    if override is not None:
        return Horizon(days=int(override), source="question")
    rules = freshness_config.rules
    if topic:
        for rule in rules:
            if rule.topic is not None and rule.topic.casefold() == topic.casefold():
                return Horizon(days=rule.horizon_days, source="topic_rule", rule=rule.topic)
    if path:
        for rule in rules:
            if rule.path is not None and _glob_match(str(path), rule.path):
                return Horizon(days=rule.horizon_days, source="path_rule", rule=rule.path)
    return Horizon(days=freshness_config.horizon_days, source="default")


def corpus_freshness(items: list[Freshness]) -> tuple[float, float]:
    """(F, A): the share of up-to-date passages and their mean age in days (Cho & Garcia-Molina
    2000, see the module docstring). A stale passage with no as-of counts age 0. An empty corpus
    gives (1.0, 0.0): nothing in it is out of date."""
    if not items:
        return 1.0, 0.0
    fresh = sum(1 for item in items if item.fresh)
    age = sum(0 if item.fresh else (item.age_days or 0) for item in items)
    return fresh / len(items), age / len(items)
