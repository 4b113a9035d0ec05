"""The store: schema creation, versioning, transactions."""

import sqlite3

import pytest

from auditor.errors import StoreError
from auditor.store import SCHEMA_VERSION, Store


def test_schema_created_with_version_and_wal(tmp_path):
    with Store(tmp_path / "a.db") as store:
        assert store.get_meta("schema_version") == str(SCHEMA_VERSION)
        assert store.db.journal_mode == "wal"
        assert {
            "documents",
            "passages",
            "statements",
            "questions",
            "runs",
            "results",
            "ingest_errors",
            "terms",
            "calibrations",
        } <= set(store.db.table_names())
        assert store.db.execute("PRAGMA integrity_check").fetchone()[0] == "ok"


def test_newer_schema_is_refused(tmp_path):
    path = tmp_path / "a.db"
    with Store(path) as store:
        store.set_meta("schema_version", str(SCHEMA_VERSION + 1))
    with pytest.raises(StoreError, match="newer than this auditor"):
        Store(path)


def test_foreign_database_is_refused(tmp_path):
    path = tmp_path / "other.db"
    conn = sqlite3.connect(path)
    conn.execute("CREATE TABLE t(x)")
    conn.close()
    with pytest.raises(StoreError, match="not an audit database"):
        Store(path)


def test_not_a_database_file(tmp_path):
    path = tmp_path / "junk.db"
    path.write_bytes(b"this is not sqlite" * 100)
    with pytest.raises(StoreError, match="cannot open"):
        Store(path)


def test_transaction_rolls_back_on_error(tmp_path):
    with Store(tmp_path / "a.db") as store:
        with pytest.raises(RuntimeError):
            with store.transaction():
                store.set_meta("k", "v")
                raise RuntimeError("boom")
        assert store.get_meta("k") is None
        with store.transaction():
            store.set_meta("k", "v")
        assert store.get_meta("k") == "v"
