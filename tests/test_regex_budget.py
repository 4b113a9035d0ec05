"""Every compiled regular expression of the package finishes on adversarial 100 KB inputs within a
CPU-time budget: no catastrophic (exponential or polynomial) backtracking.

Python's `re` is a backtracking engine without memoization, so a pattern such as `\\s*-?\\s*x`
(two quantifiers that can share characters) costs O(n²) on a run of n spaces, and three such
quantifiers O(n³); on untrusted documents that turns one file into a hung ingest worker or a hung
`auditor dates`. The patterns are collected automatically — every `re.Pattern` in the globals of
every `auditor` module, also inside module-level lists, tuples and dicts — so a new pattern is
covered the day it is added.

Each pattern is exercised the way the package uses it: the package's source is read for
`NAME.method(` calls, and a pattern only ever anchored with `.match`/`.fullmatch` is tried with
those; anything searched (`search`, `finditer`, `findall`, `sub`, `split`) or whose uses cannot be
found is tried with `finditer` over the whole input, the most demanding use. A few patterns are
applied only to short slices by every caller; they are tried at that length (BOUNDED, each naming
its call site).

The inputs: long runs of the usual suspects (digits, spaces, "1-1-1-…", month names, nested
brackets, unterminated comments and links) plus inputs built from each pattern's own literals
(its words and punctuation repeated, with spaces or digits between), so each pattern meets the text
most likely to make it backtrack. The budget is CPU time, measured in a child process that the
kernel ends past it (tests/cpu_budget.py), so a busy shared machine does not make the test flaky and
a pattern that backtracks for minutes fails in seconds; a linear pattern takes a few milliseconds on 100 KB, so one second is a
margin of more than 20x. (Budget and sizes: the project's hardening rule in DEVELOPERS.md, "100 KB ... under a second".)
"""

from __future__ import annotations

import importlib
import itertools
import pkgutil
import re
import time
from pathlib import Path

import pytest

import auditor
from tests.cpu_budget import OverBudget, run_in_budget

SIZE = 100_000
BUDGET_S = 1.0
SLOWEST = 4  # inputs run at full size after screening (see test_pattern_is_linear_enough)
PACKAGE = Path(auditor.__file__).parent

# Patterns every caller applies to a bounded slice only: tried at that length.
BOUNDED = {
    "auditor.temporal.extract._WORD_BEFORE": 13,  # temporal._sentences: search(text, mark - 12, mark + 1)
    "auditor.ingest.html._META_CHARSET": 4096,  # html._charset: search(data[:4096])
    "auditor.temporal.patterns._YEAR_AFTER_YEAR": 12,  # year_in_context: gap only when start - previous_end < 12
}

# Patterns that fail the budget today: the bug and the fix are in the hardening report; the owner
# fixes the pattern and removes the entry (strict: a fixed pattern makes its entry fail).
KNOWN_SLOW = {}


def _collect() -> dict[str, re.Pattern]:
    found: dict[int, tuple[str, re.Pattern]] = {}

    def defines(name: str) -> bool:
        module, _, short = name.rpartition(".")
        path = PACKAGE.parent / (module.replace(".", "/") + ".py")
        if not path.exists():
            path = path.with_suffix("") / "__init__.py"
        return bool(re.search(rf"^{re.escape(short)}\s*=", path.read_text(encoding="utf-8"), re.M))

    def walk(value, name: str, depth: int) -> None:
        if isinstance(value, re.Pattern):
            # A pattern imported into other modules is named after the module that defines it.
            if id(value) not in found or ("[" not in name and defines(name)):
                found[id(value)] = (name, value)
        elif depth < 3 and isinstance(value, (list, tuple, set, frozenset)):
            for i, item in enumerate(value):
                walk(item, f"{name}[{i}]", depth + 1)
        elif depth < 3 and isinstance(value, dict):
            for key, item in value.items():
                walk(item, f"{name}[{key!r}]", depth + 1)

    for info in pkgutil.walk_packages(auditor.__path__, "auditor."):
        module = importlib.import_module(info.name)
        for key, value in vars(module).items():
            if not key.startswith("__"):
                walk(value, f"{info.name}.{key}", 0)
    return {name: pattern for name, pattern in sorted(found.values(), key=lambda item: item[0])}


PATTERNS = _collect()
# The package's code less its import statements (a name imported elsewhere is not a use).
SOURCE = re.sub(
    r"^\s*from\s+\S+\s+import\s+(?:\([^)]*\)|[^\n]*)",
    "",
    "\n".join(p.read_text(encoding="utf-8") for p in PACKAGE.rglob("*.py")),
    flags=re.M,
)


def uses(name: str) -> set[str]:
    """How the package calls the pattern: {"search"}, {"match"}, {"fullmatch"} or a mix."""
    short = name.rsplit(".", 1)[-1]
    if "[" in short:  # inside a container: called through a loop variable; assume the worst
        return {"search", "match", "fullmatch"}
    methods = set(re.findall(rf"\b{re.escape(short)}\.(\w+)\(", SOURCE))
    kinds = {
        "match" if m == "match" else "fullmatch" if m == "fullmatch" else "search"
        for m in methods
        if m in ("search", "finditer", "findall", "sub", "subn", "split", "match", "fullmatch")
    }
    escapes = re.search(
        rf"\b{re.escape(short)}\b(?!\.(?:search|finditer|findall|sub|subn|split|match|fullmatch|pattern|flags)\()",
        SOURCE.replace(f"{short} = re.compile", ""),
    )
    if not kinds or escapes:  # passed around, or built into another pattern: assume the worst
        kinds |= {"search", "match", "fullmatch"}
    return kinds


GENERIC = [
    "1",
    " ",
    "\t",
    "\n",
    "\n ",
    "1-",
    "1/",
    "1.",
    "1:",
    "1 ",
    "1-1 ",
    "1.1.",
    "+1 ",
    "(1) ",
    "00",
    "a",
    "a ",
    "a.",
    "a-",
    "a@",
    "a@a.",
    "@a",
    ".",
    "!",
    "?",
    "-",
    "*",
    "_",
    "#",
    "# ",
    "|",
    "'",
    '"',
    "[",
    "[a](",
    "![",
    "(",
    "([",
    "<",
    "<!--",
    "<http://",
    "<meta ",
    "---\n",
    "[\n",
    "March ",
    "May 5 ",
    "Q1 2024 ",
    "2024 ",
    "2024-",
    "2024-01-01 ",
    "early ",
    "the end of ",
    "from ",
    "(Ab, ",
    "x\u00a0",
    "\u00e9.",
    "Jan. ",
]


def literals(pattern: re.Pattern) -> list[str]:
    """Runs of literal characters in the pattern (its words and punctuation), longest first."""
    try:
        from re import _parser as sre_parse  # Python 3.11+
    except ImportError:  # pragma: no cover
        import sre_parse
    runs: set[str] = set()

    def walk(items) -> None:
        current = ""
        for op, arg in items:
            if str(op) == "LITERAL":
                current += chr(arg)
                continue
            if current:
                runs.add(current)
            current = ""
            if isinstance(arg, tuple):
                for sub in arg:
                    if isinstance(sub, sre_parse.SubPattern):
                        walk(sub)
                    elif isinstance(sub, list):
                        for alt in sub:
                            if isinstance(alt, sre_parse.SubPattern):
                                walk(alt)
            elif isinstance(arg, list):
                for alt in arg:
                    if isinstance(alt, sre_parse.SubPattern):
                        walk(alt)
        if current:
            runs.add(current)

    source = pattern.pattern if isinstance(pattern.pattern, str) else pattern.pattern.decode("latin-1")
    walk(sre_parse.parse(source, pattern.flags & ~re.UNICODE if isinstance(pattern.pattern, bytes) else pattern.flags))
    ordered = sorted((r for r in runs if r.strip()), key=lambda r: (-len(r), r))
    # A handful of distinct ones: the longest words and every short punctuation run.
    return ordered[:4] + [r for r in ordered if not r.isalnum()][:4]


def inputs(pattern: re.Pattern, size: int) -> list[str]:
    def repeat(unit: str) -> str:
        return (unit * (size // len(unit) + 1))[:size]

    units = list(GENERIC)
    for lit in literals(pattern):
        units += [lit, lit + " ", lit + "1", " " + lit + "  "]
    return [repeat(u) for u in dict.fromkeys(units)]


def _apply(pattern: re.Pattern, text, kinds: set[str]) -> None:
    if "search" in kinds:
        for _ in pattern.finditer(text):
            pass
    if "match" in kinds:
        pattern.match(text)
    if "fullmatch" in kinds:
        pattern.fullmatch(text)


def run_within_budget(pattern: re.Pattern, text, kinds: set[str], budget: float) -> float:
    """CPU seconds for the pattern's uses on `text`; raises OverBudget past `budget`."""
    return run_in_budget(lambda: _apply(pattern, text, kinds), budget)[1]


def screen(pattern: re.Pattern, texts: list, kinds: set[str], budget: float) -> list[float]:
    """CPU seconds for each text, all measured in one child process (one fork per pattern, not per
    input) that the kernel ends past `budget` for each text."""

    def each() -> list[float]:
        seconds = []
        for text in texts:
            started = time.process_time()
            _apply(pattern, text, kinds)
            seconds.append(time.process_time() - started)
        return seconds

    return run_in_budget(each, budget * len(texts))[0]


def test_patterns_are_collected():
    # The walk must find the package's main patterns, or the budget test below checks nothing.
    for name in (
        "auditor.temporal.patterns.CANDIDATES",
        "auditor.questions.detect_net.EMAIL",
        "auditor.questions.detect_numbers._IBAN",
        "auditor.questions.detect_cues._ADDRESS",
        "auditor.ingest.markdown._ATX",
        "auditor.ingest.text._CONTROL",
    ):
        assert name in PATTERNS, name
    assert len(PATTERNS) >= 60
    assert uses("auditor.ingest.markdown._ATX") == {"match"}
    assert uses("auditor.ingest.text._CONTROL") == {"search"}


def test_budget_catches_catastrophic_backtracking():
    # The harness itself: a textbook exponential pattern (a+)+b must be stopped at the budget.
    evil = re.compile(r"(a+)+b")
    with pytest.raises(OverBudget):
        run_within_budget(evil, "a" * 40, {"match"}, 0.2)
    assert run_within_budget(re.compile(r"a+"), "a" * SIZE, {"search", "match"}, BUDGET_S) < BUDGET_S


def test_budget_ends_a_long_c_call():
    # A C loop runs no Python signal handler until it returns (CPython runs handlers between
    # bytecodes), so a SIGPROF alarm alone would let this run for minutes: the child's CPU limit
    # (RLIMIT_CPU) ends it a few seconds in.
    with pytest.raises(OverBudget):
        run_in_budget(lambda: sum(itertools.repeat(1, 10**12)), 0.2)


def _stubborn() -> None:
    # Code under test that swallows every exception, the budget's own included.
    while True:
        try:
            sum(itertools.repeat(1, 10**12))
        except BaseException:  # swallowing is the point of this case
            continue


def test_budget_ends_code_that_swallows_the_alarm():
    with pytest.raises(OverBudget):
        run_in_budget(_stubborn, 0.2)


def test_budget_returns_the_result_and_reports_failures():
    result, seconds = run_in_budget(lambda: sorted(range(1000, 0, -1))[:3], 1.0)
    assert result == [1, 2, 3] and 0.0 <= seconds < 1.0
    with pytest.raises(AssertionError, match="ZeroDivisionError"):
        run_in_budget(lambda: 1 // 0, 1.0)


def _params():
    for name, pattern in PATTERNS.items():
        marks = [pytest.mark.xfail(strict=True, reason=KNOWN_SLOW[name])] if name in KNOWN_SLOW else []
        yield pytest.param(name, pattern, id=name.removeprefix("auditor."), marks=marks)


@pytest.mark.parametrize("name, pattern", list(_params()))
def test_pattern_is_linear_enough(name, pattern):
    """Screen every input at a tenth of the size, then run the slowest few at full size: a pattern
    that backtracks super-linearly on an input is already the slowest on it at 10 KB (CPU time
    grows with the square or cube of the length, linear inputs take about a millisecond), and this
    keeps the test to a few seconds instead of minutes."""
    size = BOUNDED.get(name, SIZE)
    kinds = uses(name)

    def subject(text: str):
        return text.encode("utf-8")[: len(text)] if isinstance(pattern.pattern, bytes) else text

    def fail(text: str) -> None:
        pytest.fail(f"{name} ({sorted(kinds)}) exceeded {BUDGET_S} s CPU on {len(text):,} chars of {text[:24]!r}...")

    full = inputs(pattern, size)
    small = [subject(text[: max(1, size // 10)]) for text in full]
    try:
        seconds = screen(pattern, small, kinds, BUDGET_S)
    except OverBudget:
        fail(full[0][: max(1, size // 10)] + " (screening, all inputs)")
    for i, s in enumerate(seconds):
        if s >= BUDGET_S:
            fail(small[i])
    for _, i in sorted(((s, i) for i, s in enumerate(seconds)), reverse=True)[:SLOWEST]:
        try:
            assert run_within_budget(pattern, subject(full[i]), kinds, BUDGET_S) < BUDGET_S
        except OverBudget:
            fail(full[i])
