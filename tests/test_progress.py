"""Progress on the long commands: drawn on stderr for a terminal only, never with --quiet (auditor/progress.py)."""

from __future__ import annotations

import io

import pytest
from click.testing import CliRunner

from auditor import cli as cli_module
from auditor.cli import cli
from auditor.progress import Progress


class Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_the_bar_redraws_at_most_once_per_percent_and_clears_its_line():
    out = Terminal()
    bar = Progress("audit", 10_000, enabled=True, stream=out)
    for _ in range(10_000):
        bar.step()
    text = out.getvalue()
    assert text.count("\r") == 101  # 0 % is never drawn: the first step is 1 of 100 percent; 100 % is
    assert text.endswith("] 10000/10000 100%")
    bar.done()
    assert out.getvalue()[len(text) :].strip() == "" and out.getvalue().endswith("\r")


def test_a_disabled_bar_writes_nothing():
    out = Terminal()
    bar = Progress("report", 3, enabled=False, stream=out)
    bar.step()
    bar.done()
    assert out.getvalue() == ""


@pytest.fixture
def site(tmp_path):
    kb = tmp_path / "kb"
    kb.mkdir()
    (kb / "pay.md").write_text("# Paying\n\nUpdated 2026-10-01. Pay your water bill by phone at 555-0100.\n")
    (kb / "leak.md").write_text("# Leaks\n\nUpdated 2026-09-01. Report a leak on the street at any hour.\n")
    (tmp_path / "questions.csv").write_text("id,question\nq1,How do I pay my bill by phone?\nq2,Where is the pool?\n")
    (tmp_path / "labels.csv").write_text(
        "question,answerable,expected_document\nHow do I pay by phone?,yes,pay.md\nWhere is the pool?,no,\n"
    )
    (tmp_path / "audit.toml").write_text('database = "a.db"\nas_of = 2026-12-01\nquestions = ["questions.csv"]\n')
    return tmp_path


def run(site, monkeypatch, terminal: bool, *args):
    # The CLI draws only when stderr is a terminal; the test runner's stderr is not one.
    monkeypatch.setattr(cli_module, "_progress", lambda quiet: terminal and not quiet)
    monkeypatch.chdir(site)
    result = CliRunner().invoke(cli, list(args))
    assert result.exit_code == 0, result.output
    return result.stderr


# ingest draws its own bar (auditor/ingest/pipeline.py, tests/test_ingest_walk.py); here it only
# has to take --quiet.
def test_ingest_takes_quiet(site, monkeypatch):
    assert "\r" not in run(site, monkeypatch, True, "ingest", "kb", "--quiet")


@pytest.mark.parametrize(
    "args, label",
    [
        (("audit", "--out", "r"), "audit"),
        (("report", "--out", "r2"), "report"),
        (("calibrate", "--labels", "labels.csv", "--holdout"), "calibrate"),
    ],
)
def test_each_long_command_draws_progress_on_a_terminal_and_not_with_quiet(site, monkeypatch, args, label):
    run(site, monkeypatch, False, "ingest", "kb")
    if args[0] == "report":
        run(site, monkeypatch, False, "audit", "--out", "r")
    shown = run(site, monkeypatch, True, *args)
    assert f"\r{label} [" in shown, shown
    assert "\r" not in run(site, monkeypatch, True, *args, "--quiet")
    assert "\r" not in run(site, monkeypatch, False, *args)
