"""docs/tutorial.md is true: its commands, run in order in an empty folder, print what the page shows.

Each ```console block holds commands (lines starting with "$ ", a here-document running to its
closing EOF line) each followed by its expected output; a `...` in an expected line matches any
text. Commands run with bash, stderr merged into stdout as a terminal shows it, the installed
`auditor` command first on PATH, and `fixtures` linked to the repository's fixtures folder.
"""

from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

from tests.conftest import REPO

TUTORIAL = REPO / "docs" / "tutorial.md"


def steps(text: str) -> list[tuple[str, list[str]]]:
    """(command, expected output lines) of every console block, in page order."""
    out: list[tuple[str, list[str]]] = []
    for block in re.findall(r"```console\n(.*?)```", text, flags=re.S):
        lines = block.splitlines()
        i = 0
        while i < len(lines):
            line = lines[i]
            assert line.startswith("$ "), f"docs/tutorial.md: output before any command: {line!r}"
            command = [line[2:]]
            i += 1
            if "<<'EOF'" in line:
                while lines[i] != "EOF":
                    command.append(lines[i])
                    i += 1
                command.append(lines[i])
                i += 1
            expected = []
            while i < len(lines) and not lines[i].startswith("$ "):
                expected.append(lines[i])
                i += 1
            out.append(("\n".join(command), expected))
    return out


def matches(expected: str, got: str) -> bool:
    pattern = ".*".join(re.escape(part) for part in expected.split("..."))
    return re.fullmatch(pattern, got) is not None


def test_the_page_has_the_steps_it_promises():
    found = steps(TUTORIAL.read_text(encoding="utf-8"))
    commands = [c.split()[0] + " " + c.split()[1] for c, _ in found if c.startswith("auditor ")]
    assert commands == [
        "auditor scan",
        "auditor calibrate",
        "auditor scan",
        "auditor diff",
        "auditor scan",
    ]
    assert all(expected for c, expected in found if c.startswith("auditor "))


@pytest.mark.slow
def test_every_command_prints_what_the_tutorial_shows(tmp_path):
    (tmp_path / "fixtures").symlink_to(REPO / "fixtures")
    env = dict(os.environ)
    env["PATH"] = str(Path(sys.executable).parent) + os.pathsep + env.get("PATH", "")
    env["PYTHONUNBUFFERED"] = "1"  # stdout and stderr interleaved as they were written
    for key in [k for k in env if k.startswith("AUDITOR_")]:
        del env[key]
    for command, expected in steps(TUTORIAL.read_text(encoding="utf-8")):
        done = subprocess.run(
            ["bash", "-c", command],
            cwd=tmp_path,
            env=env,
            stdout=subprocess.PIPE,
            stderr=subprocess.STDOUT,
            text=True,
            timeout=300,
        )
        got = done.stdout.splitlines()
        assert len(got) == len(expected) and all(matches(e, g) for e, g in zip(expected, got)), (
            f"$ {command}\nexpected:\n" + "\n".join(expected) + "\ngot:\n" + done.stdout
        )
