"""Shared test fixtures."""

from __future__ import annotations

import shutil
import sqlite3
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
DEMO = REPO / "fixtures" / "demo"
SHARED_DATA = REPO.parent / "shared" / "data"


@pytest.fixture
def store(tmp_path):
    """A fresh audit database on disk."""
    from auditor.store import Store

    with Store(tmp_path / "audit.db") as s:
        yield s


@pytest.fixture
def demo_copy(tmp_path):
    """The demo knowledge base copied to a temporary folder, with its config pointing inside it."""
    target = tmp_path / "demo"
    shutil.copytree(DEMO, target)
    config = (target / "audit.toml").read_text(encoding="utf-8")
    config = config.replace("../../reports/demo/auditor.db", "work/auditor.db").replace(
        "../../reports/demo", "work/report"
    )
    (target / "audit.toml").write_text(config, encoding="utf-8")
    return target


FORMAT1_SQL = REPO / "tests" / "data" / "format1.sql"


def format1_database(path: Path) -> Path:
    """A database as the auditor of results.json format 1 stored it (tests/test_format1_store.py says
    how it was made), rebuilt from its SQL text dump at `path`."""
    conn = sqlite3.connect(path)
    try:
        conn.executescript(FORMAT1_SQL.read_text(encoding="utf-8"))
    finally:
        conn.close()
    return path
