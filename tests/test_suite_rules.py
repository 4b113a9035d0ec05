"""Rules the test suite keeps, checked on its own source (ast) so that CI fails when one is broken.

* No test marked xfail with ``run`` set to anything but True: a known bug that never runs hides whether it is still there
  (and what else it breaks); it runs and fails, or it is fixed.
* No hypothesis ``settings`` with a ``deadline`` other than None: a wall-clock deadline fails on a
  loaded machine, not on slow code. Examples are bounded instead, and timings belong in bench/.
* No ``time.sleep(...)`` directly followed by an assertion on a process's ``poll()``: after a sleep,
  "still running" says nothing about what the other process reached. Wait on something it makes
  observable (a line it prints, a file it writes) instead.

The rules are common practice for reliable test suites, with no single published source.
"""

from __future__ import annotations

import ast
from collections import Counter
from pathlib import Path

import pytest

TESTS = Path(__file__).resolve().parent

XFAIL_NOT_RUN = "xfail that never runs"
DEADLINE = "hypothesis deadline"
SLEEP_THEN_POLL = "sleep, then assert on poll()"

# Known breaches, (file, rule) -> how many, each with the work that removes it. An entry that no
# longer matches fails too, so that this set only shrinks.
ALLOWED: dict[tuple[str, str], int] = {}


def _dotted(node: ast.expr) -> str:
    if isinstance(node, ast.Name):
        return node.id
    if isinstance(node, ast.Attribute):
        return f"{_dotted(node.value)}.{node.attr}"
    return ""


def _is_constant(node: ast.expr, value: object) -> bool:
    return isinstance(node, ast.Constant) and node.value is value


def _is_sleep(statement: ast.stmt) -> bool:
    return (
        isinstance(statement, ast.Expr)
        and isinstance(statement.value, ast.Call)
        and _dotted(statement.value.func) in ("time.sleep", "sleep")
    )


def _asserts_on_poll(statement: ast.stmt) -> bool:
    return isinstance(statement, ast.Assert) and any(
        isinstance(n, ast.Call) and isinstance(n.func, ast.Attribute) and n.func.attr == "poll"
        for n in ast.walk(statement.test)
    )


def breaches(source: str) -> list[tuple[int, str]]:
    """(line, rule) of each breach of the rules above in a module's source."""
    found = []
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, ast.Call):
            name = _dotted(node.func).rsplit(".", 1)[-1]
            for kw in node.keywords:
                # run set to False, or anything but a literal True: a variable could hide the same mark
                if name == "xfail" and kw.arg == "run" and not _is_constant(kw.value, True):
                    found.append((node.lineno, XFAIL_NOT_RUN))
                if name in ("settings", "register_profile") and kw.arg == "deadline":
                    if not _is_constant(kw.value, None):
                        found.append((node.lineno, DEADLINE))
        for field in ("body", "orelse", "finalbody"):
            block = getattr(node, field, None)
            if isinstance(block, list):
                for first, then in zip(block, block[1:]):
                    if _is_sleep(first) and _asserts_on_poll(then):
                        found.append((then.lineno, SLEEP_THEN_POLL))
    return sorted(found)


# --- the scanner on small examples: each rule can fail ---------------------------------------------


@pytest.mark.parametrize(
    "source, rules",
    [
        # the literal False, spelt in two pieces so a plain text search for the mark finds only real uses
        ("CARD = pytest.mark.xfail(run=" + 'False, reason="slow")', [XFAIL_NOT_RUN]),
        ('CARD = pytest.mark.xfail(run=0 == 1, reason="slow")', [XFAIL_NOT_RUN]),
        ('CARD = pytest.mark.xfail(run=bool(0), reason="slow")', [XFAIL_NOT_RUN]),
        ("@pytest.mark.xfail(run=RUN)\ndef test_x(): pass", [XFAIL_NOT_RUN]),
        ("@pytest.mark.xfail(strict=True, reason='known')\ndef test_x(): pass", []),
        ("@pytest.mark.xfail(run=True)\ndef test_x(): pass", []),
        ("FUZZ = settings(max_examples=100, deadline=3000, derandomize=True)", [DEADLINE]),
        ("@hypothesis.settings(deadline=timedelta(seconds=1))\ndef test_x(): pass", [DEADLINE]),
        ('settings.register_profile("ci", deadline=500)', [DEADLINE]),
        ("FUZZ = settings(max_examples=100, deadline=None)", []),
        ("settings(max_examples=10)", []),
        # the lock test as it was: a sleep, then "still waiting"
        ("def test_x():\n    time.sleep(1.0)\n    assert waiting.poll() is None", [SLEEP_THEN_POLL]),
        ("try:\n    sleep(2)\n    assert p.poll() is None, p\nfinally:\n    pass", [SLEEP_THEN_POLL]),
        # polling for an observable event, with a sleep between tries: allowed
        ("while not marker.exists():\n    assert scan.poll() is None\n    time.sleep(0.05)", []),
        ("line = waiting.stderr.readline()\nassert waiting.poll() is None", []),
    ],
)
def test_the_scanner_finds_each_breach(source, rules):
    assert [rule for _, rule in breaches(source)] == rules


# --- the suite itself ----------------------------------------------------------------------------


def test_the_suite_keeps_its_rules():
    found: Counter[tuple[str, str]] = Counter()
    where: dict[tuple[str, str], list[str]] = {}
    for path in sorted(TESTS.rglob("*.py")):
        name = str(path.relative_to(TESTS))
        for line, rule in breaches(path.read_text(encoding="utf-8")):
            found[name, rule] += 1
            where.setdefault((name, rule), []).append(f"{name}:{line}: {rule}")
    unexpected = [place for key, places in where.items() if found[key] > ALLOWED.get(key, 0) for place in places]
    assert not unexpected, "\n".join(unexpected)
    stale = [
        f"{name}: {rule} (allowed {n}, found {found[name, rule]})"
        for (name, rule), n in ALLOWED.items()
        if found[name, rule] < n
    ]
    assert not stale, "fixed: remove from ALLOWED in tests/test_suite_rules.py:\n" + "\n".join(stale)
