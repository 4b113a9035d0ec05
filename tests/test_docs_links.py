"""Every docs/ page that the code, the tests, the benchmarks or the top-level guides cite exists, and
docs/architecture.md names every module of the package.

A comment that sends a reader to a page that is not there is worse than no comment; a module the
architecture page does not list is one a newcomer cannot place."""

from __future__ import annotations

import re
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
DOCS = REPO / "docs"
CITING = [REPO / "auditor", REPO / "tests", REPO / "bench", REPO / "README.md", REPO / "DEVELOPERS.md"]
SUFFIXES = {".py", ".md", ".j2", ".js", ".css", ".toml"}
# A citation: docs/<name>.md not inside a longer path or a quoted file name (tests write files such
# as "docs/guide.md" into temporary knowledge bases; those are data, not citations).
CITATION = re.compile(r"(?<![\w/.\"'-])docs/([\w-]+\.md)\b")


def cited_pages() -> dict[str, set[str]]:
    """docs page name -> the files citing it."""
    cited: dict[str, set[str]] = {}
    for place in CITING:
        files = [place] if place.is_file() else [p for p in place.rglob("*") if p.suffix in SUFFIXES]
        for file in files:
            if file == Path(__file__):
                continue
            for name in CITATION.findall(file.read_text(encoding="utf-8", errors="replace")):
                cited.setdefault(name, set()).add(str(file.relative_to(REPO)))
    return cited


def test_every_cited_docs_page_exists():
    cited = cited_pages()
    # The scan must find the citations it is meant to check, or it would pass on nothing.
    assert {"cli.md", "architecture.md", "freshness.md"} <= set(cited)
    missing = {name: sorted(files) for name, files in cited.items() if not (DOCS / name).is_file()}
    assert missing == {}


def test_the_citation_pattern_skips_file_names_in_test_data():
    assert CITATION.findall("see docs/cli.md and (docs/schema.md).") == ["cli.md", "schema.md"]
    assert CITATION.findall('{"docs/guide.md": "# Guide"}') == []
    assert CITATION.findall("fixtures/docs/x.md") == []


def test_the_architecture_page_names_every_module():
    text = (DOCS / "architecture.md").read_text(encoding="utf-8")
    package = REPO / "auditor"
    unnamed = []
    for module in sorted(package.rglob("*.py")):
        rel = module.relative_to(package).as_posix()
        if rel.endswith("__init__.py") and module.parent != package:
            name = f"auditor/{module.parent.relative_to(package).as_posix()}/"  # a package: its row
        elif module.parent == package:
            name = f"auditor/{rel}"
        else:
            name = rel  # rows within a package name the module as `ingest/walk.py`
        if f"`{name}`" not in text:
            unnamed.append(name)
    assert unnamed == []
