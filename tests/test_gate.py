"""The release gate on hand-worked runs (figures computed by hand in the comments).

Fallback and stale exposure are the weight shares of gap and stale questions (docs/judgement.md); the
gap and stale shares are the unweighted counts over the question count.
"""

from __future__ import annotations

import pytest

from auditor.config import GateConfig, load_config
from auditor.history.diff import diff_runs
from auditor.history.gate import evaluate_gate, gate_figures
from tests.test_runs import DECEMBER, NOVEMBER, make_run, question


def test_figures_of_a_worked_run():
    run = make_run("2026-12-01", DECEMBER)
    figures = gate_figures(run, None)
    # 8 questions: 3 gaps (q-002 40, q-006 5, q-007 60), 1 stale (q-008 7); weight 267
    assert figures["gap_share"] == pytest.approx(3 / 8)
    assert figures["stale_share"] == pytest.approx(1 / 8)
    assert figures["fallback_exposure"] == pytest.approx(105 / 267)
    assert figures["stale_exposure"] == pytest.approx(7 / 267)
    # no previous run: every gap is new
    assert figures["new_gaps"] == 3
    # against November: q-002 and q-006 became gaps, q-007 is a new question that is a gap -> 3;
    # q-003 was a gap and no longer is, which does not offset them
    diff = diff_runs(make_run("2026-11-01", NOVEMBER), run)
    assert gate_figures(run, diff)["new_gaps"] == 3
    unchanged = diff_runs(run, make_run("2027-01-01", DECEMBER))
    assert gate_figures(run, unchanged)["new_gaps"] == 0


def test_failing_limit_is_named_with_its_figures():
    # a gap of weight 27 and a supported question of weight 73: fallback exposure 27/100 = 0.27
    questions = [question("q-001", "gap", weight=27.0), question("q-002", "supported", weight=73.0)]
    run = make_run("2026-12-01", questions)
    gate = evaluate_gate(run, None, GateConfig(max_fallback_exposure=0.20))
    assert gate.passed is False
    assert gate.message == "release limits breached: fallback exposure 0.27 (ceiling 0.20)"
    assert [c.to_json() for c in gate.checks] == [
        {
            "limit": "max_fallback_exposure",
            "figure": "fallback_exposure",
            "max": 0.20,
            "value": pytest.approx(0.27),
            "within": False,
        }
    ]


def test_every_failed_limit_is_listed_in_order_and_passing_ones_are_not():
    run = make_run("2026-12-01", DECEMBER)
    diff = diff_runs(make_run("2026-11-01", NOVEMBER), run)
    limits = GateConfig(
        max_gap_share=0.25, max_fallback_exposure=0.5, max_stale_share=0.1, max_stale_exposure=0.05, max_new_gaps=2
    )
    gate = evaluate_gate(run, diff, limits)
    # gap share 3/8 = 0.375 > 0.25; exposure 0.393 <= 0.5; stale share 1/8 = 0.125 > 0.1;
    # stale exposure 7/267 = 0.026 <= 0.05; new gaps 3 > 2
    assert gate.passed is False
    assert gate.message == (
        "release limits breached: gap share 0.38 (ceiling 0.25); stale share 0.12 (ceiling 0.10); "
        "new gaps 3 (ceiling 2); within: fallback exposure 0.39 (ceiling 0.50); stale exposure 0.03 (ceiling 0.05)"
    )
    assert [(c.limit, c.passed) for c in gate.checks] == [
        ("max_gap_share", False),
        ("max_fallback_exposure", True),
        ("max_stale_share", False),
        ("max_stale_exposure", True),
        ("max_new_gaps", False),
    ]


def test_a_figure_equal_to_its_limit_passes():
    run = make_run(
        "2026-12-01",
        [question("q-001", "gap", weight=1.0)] + [question(f"q-00{i}", "supported", weight=1.0) for i in range(2, 6)],
    )
    gate = evaluate_gate(run, None, GateConfig(max_gap_share=0.2, max_fallback_exposure=0.2, max_new_gaps=1))
    # 1 of 5 questions, weight 1 of 5: exactly 0.2; one gap, no previous run: 1 new gap
    assert gate.passed is True
    assert gate.message == (
        "release limits within: gap share 0.20 (ceiling 0.20); fallback exposure 0.20 (ceiling 0.20); "
        "new gaps 1 (ceiling 1)"
    )


def test_a_narrow_failure_never_reads_as_equal():
    # weight 2004 of 10000 gaps: 0.2004 > 0.20 must not print as "0.20 > max 0.20"
    run = make_run(
        "2026-12-01", [question("q-001", "gap", weight=2004.0), question("q-002", "supported", weight=7996.0)]
    )
    gate = evaluate_gate(run, None, GateConfig(max_fallback_exposure=0.2))
    assert gate.message == "release limits breached: fallback exposure 0.2004 (ceiling 0.2000)"


def test_no_limits_and_an_empty_question_set():
    run = make_run("2026-12-01", [])
    assert evaluate_gate(run, None, GateConfig()).to_json() == {
        "within": True,
        "checks": [],
        "message": "release limits: none set",
    }
    gate = evaluate_gate(run, None, GateConfig(max_gap_share=0.0, max_new_gaps=0))
    assert gate.passed is True and [c.value for c in gate.checks] == [0.0, 0]


def test_limits_read_from_a_config_file(tmp_path):
    path = tmp_path / "audit.toml"
    path.write_text("[gate]\nmax_stale_exposure = 0.01\nmax_new_gaps = 5\n", encoding="utf-8")
    config = load_config(path, env={})
    gate = evaluate_gate(make_run("2026-12-01", DECEMBER), None, config.gate)
    # stale exposure 7/267 = 0.026 > 0.01; 3 new gaps <= 5
    assert gate.message == "release limits breached: stale exposure 0.03 (ceiling 0.01); within: new gaps 3 (ceiling 5)"
