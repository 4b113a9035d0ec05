"""Release limits: ceilings on a run's figures, turned into within / breached and one line for the operator.

`auditor scan` exits with code 3 when a limit is breached; the outcome is also stored with the run
(`runs.gate`) and written into results.json (`limits`). The limits are the config's `[limits]`
table (`[gate]` in configs written before, still read).

Figures (all from the run object, docs/judgement.md):
  gap_share          gap questions / questions (unweighted)
  fallback_exposure  weight share of gap questions (summary.fallback_exposure)
  stale_share        stale questions / questions (unweighted)
  stale_exposure     weight share of stale questions (summary.stale_exposure)
  new_gaps           questions that are gaps now and were not gaps in the previous done run;
                     a question new to the set that is a gap counts (it was not a gap before,
                     because nobody asked it), so with no previous run every gap is new. A
                     release check should not pass vacuously on its first run; use only the share
                     limits if that is not wanted.
A figure is within its limit when it is at most the ceiling; limits left unset (None) are not checked.
The line names every checked figure against its ceiling, breached ones first, e.g.
"release limits breached: fallback exposure 0.27 (ceiling 0.20); within: gap share 0.10 (ceiling 0.25)".
"""

from __future__ import annotations

from auditor.config import GateConfig
from auditor.results import Diff, GateCheck, GateResult, Run

# limit (the config key) -> figure it bounds; the order of the checks and of the message.
LIMITS = {
    "max_gap_share": "gap_share",
    "max_fallback_exposure": "fallback_exposure",
    "max_stale_share": "stale_share",
    "max_stale_exposure": "stale_exposure",
    "max_new_gaps": "new_gaps",
}


def gate_figures(run: Run, diff: Diff | None) -> dict[str, float | int]:
    """The figures the limits bound, computed from the run's summary and its diff (see module doc)."""
    summary = run.summary
    total = summary.questions
    if diff is None:
        new_gaps = summary.gap
    else:
        new_gaps = len(diff.new_gaps) + sum(item.after == "gap" for item in diff.added)
    return {
        "gap_share": summary.gap / total if total else 0.0,
        "fallback_exposure": float(summary.fallback_exposure),
        "stale_share": summary.stale / total if total else 0.0,
        "stale_exposure": float(summary.stale_exposure),
        "new_gaps": int(new_gaps),
    }


def evaluate_gate(run: Run, diff: Diff | None, limits: GateConfig) -> GateResult:
    """Hold the run against the configured limits; the message is one line (see the module docstring)."""
    figures = gate_figures(run, diff)
    checks = []
    for limit, figure in LIMITS.items():
        maximum = getattr(limits, limit)
        if maximum is None:
            continue
        value = figures[figure]
        checks.append(GateCheck(limit=limit, figure=figure, max=maximum, value=value, passed=value <= maximum))
    failed = [c for c in checks if not c.passed]
    kept = [c for c in checks if c.passed]
    if failed:
        message = "release limits breached: " + "; ".join(describe_check(c) for c in failed)
        if kept:
            message += "; within: " + "; ".join(describe_check(c) for c in kept)
    elif checks:
        message = "release limits within: " + "; ".join(describe_check(c) for c in checks)
    else:
        message = "release limits: none set"
    return GateResult(passed=not failed, checks=checks, message=message)


def describe_check(check: GateCheck) -> str:
    """ "fallback exposure 0.27 (ceiling 0.20)": the figure against its ceiling."""
    value, maximum = _pair(
        check.value, check.max, integer=(check.figure or check.limit) in ("new_gaps", "max_new_gaps")
    )
    # A check stored without its figure (an older run) is named by its limit.
    name = check.figure or check.limit.removeprefix("max_")
    return f"{name.replace('_', ' ')} {value} (ceiling {maximum})"


def _pair(value: float, maximum: float, *, integer: bool) -> tuple[str, str]:
    """Value and limit as text with just enough decimals that a failing pair never reads equal."""
    if integer:
        return f"{value:g}", f"{maximum:g}"
    for digits in (2, 3, 4, 6):
        left, right = f"{value:.{digits}f}", f"{maximum:.{digits}f}"
        if (left != right) or value == maximum:
            return left, right
    return repr(float(value)), repr(float(maximum))
