"""CLI: every command has --help; exit codes 0, 1 (user-fixable error, one line) and 2 (bad usage)."""

import json
import subprocess
import sys

import pytest
from click.testing import CliRunner

from auditor.cli import cli

COMMANDS = ["scan", "ingest", "audit", "report", "runs", "diff", "dates", "search", "calibrate"]


@pytest.fixture
def runner():
    return CliRunner()


@pytest.mark.parametrize("command", COMMANDS)
def test_every_command_has_help(runner, command):
    result = runner.invoke(cli, [command, "--help"])
    assert result.exit_code == 0, result.output
    assert result.output.startswith(f"Usage: cli {command}") or f"{command} [OPTIONS]" in result.output


def test_group_lists_every_command(runner):
    result = runner.invoke(cli, ["--help"])
    for command in COMMANDS:
        assert f"  {command} " in result.output


@pytest.mark.parametrize(
    "args",
    [
        ["scan", "--bogus"],
        ["scan", "--as-of", "not-a-date"],
        ["search"],
        ["calibrate"],
        ["ingest"],
        ["nonsense"],
    ],
)
def test_bad_usage_exits_2(runner, args):
    assert runner.invoke(cli, args).exit_code == 2


def one_error_line(result):
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    assert "Traceback" not in result.stderr
    return lines[0]


def test_bad_config_exits_1_with_one_line(runner, tmp_path):
    config = tmp_path / "audit.toml"
    config.write_text("[freshness]\nhorizon_days = 'soon'\n", encoding="utf-8")
    result = runner.invoke(cli, ["scan", "-c", str(config)])
    assert result.exit_code == 1
    line = one_error_line(result)
    assert str(config) in line and "freshness.horizon_days" in line


def test_missing_question_file_exits_1_naming_it(runner, tmp_path):
    config = tmp_path / "audit.toml"
    config.write_text('questions = ["missing.csv"]\ndatabase = "a.db"\n[corpus]\npaths = ["."]\n', encoding="utf-8")
    result = runner.invoke(cli, ["scan", "-c", str(config)])
    assert result.exit_code == 1
    assert str(tmp_path / "missing.csv") in one_error_line(result)


def test_audit_with_missing_question_file(runner, tmp_path):
    result = runner.invoke(cli, ["audit", "--db", str(tmp_path / "a.db"), "--questions", str(tmp_path / "q.csv")])
    assert result.exit_code == 1
    assert "q.csv" in one_error_line(result)


def test_report_without_runs_exits_1(runner, tmp_path):
    result = runner.invoke(cli, ["report", "--db", str(tmp_path / "a.db")])
    assert result.exit_code == 1
    one_error_line(result)


def test_dates_prints_json_lines_from_stdin(runner):
    result = runner.invoke(
        cli,
        ["dates", "--reference-date", "2026-12-01", "-"],
        input="Rates are effective March 1, 2025. Call us any time.\n",
    )
    assert result.exit_code == 0, result.output
    rows = [json.loads(line) for line in result.output.splitlines()]
    assert rows[0]["expression"] == "March 1, 2025"
    assert (rows[0]["start"], rows[0]["end"], rows[0]["granularity"]) == ("2025-03-01", "2025-03-01", "day")
    assert rows[0]["role"] == "effective"
    # the format is extended, not renamed: the original keys, then TIMEX3 type, value and offsets, and the language
    assert set(rows[0]) == {
        "text",
        "expression",
        "start",
        "end",
        "granularity",
        "role",
        "type",
        "value",
        "offsets",
        "language",
    }
    assert (rows[0]["type"], rows[0]["value"], rows[0]["offsets"]) == ("DATE", "2025-03-01", {"begin": 20, "end": 33})
    assert rows[0]["language"] == "english"  # detected: no --language given


def test_dates_unreadable_file_exits_1(runner, tmp_path):
    result = runner.invoke(cli, ["dates", str(tmp_path / "none.txt")])
    assert result.exit_code == 1
    assert "none.txt" in one_error_line(result)


def test_console_script_entry_point(tmp_path):
    # The installed entry point goes through main(): same one-line error, exit 1, no traceback.
    result = subprocess.run(
        [sys.executable, "-c", "from auditor.cli import main; main()", "scan", "-c", str(tmp_path / "none.toml")],
        capture_output=True,
        text=True,
    )
    assert result.returncode == 1
    assert result.stderr.strip().count("\n") == 0 and "none.toml" in result.stderr


def test_dates_takes_calendar_settings_from_config_and_flags(runner, tmp_path):
    # A July fiscal year: FY2025 runs 2024-07-01..2025-06-30 (the US federal convention names a
    # fiscal year by the calendar year it ends in; from memory).
    config = tmp_path / "audit.toml"
    config.write_text("[corpus]\nfiscal_year_start = 7\nday_first = true\n", encoding="utf-8")
    text = "The FY2025 budget applies. The notice of 03/04/2025 stands.\n"
    rows = [
        json.loads(line)
        for line in runner.invoke(
            cli, ["dates", "-c", str(config), "--reference-date", "2026-12-01", "-"], input=text
        ).output.splitlines()
    ]
    fiscal = next(r for r in rows if "FY2025" in r["expression"])
    assert (fiscal["start"], fiscal["end"]) == ("2024-07-01", "2025-06-30")
    numeric = next(r for r in rows if "03/04/2025" in r["expression"])
    assert numeric["start"] == "2025-04-03"
    flipped = [
        json.loads(line)
        for line in runner.invoke(
            cli, ["dates", "-c", str(config), "--month-first", "--reference-date", "2026-12-01", "-"], input=text
        ).output.splitlines()
    ]
    assert next(r for r in flipped if "03/04/2025" in r["expression"])["start"] == "2025-03-04"
