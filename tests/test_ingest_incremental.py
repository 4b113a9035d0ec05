"""Incremental behaviour an owner relies on: a broken re-export keeps the last good version,
tokenizer changes re-tokenize, owner maps re-apply, several roots keep paths unique."""

from __future__ import annotations

import json

import numpy as np

from auditor.config import RetrievalConfig
from auditor.ingest.pipeline import ingest_corpus
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import Store
from tests.ingest_helpers import config_for, write_tree

GUIDE = "# Leaks\n\nReport running leaks on the hotline any time.\n"


def test_a_broken_new_version_keeps_the_last_good_one(tmp_path):
    root = write_tree(tmp_path / "kb", {"leaks.md": GUIDE, "other.txt": "Other\n\nText."})
    config = config_for(root)
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config)
        good = store.query(
            "SELECT p.text FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.path = 'leaks.md'"
        )
        (root / "leaks.md").write_bytes(b"\x00\x01\x02\x03 binary junk " * 20)
        summary = ingest_corpus(store, config)
        assert summary.line() == "0 new, 0 changed, 1 unchanged, 0 removed, 1 failed"
        doc = store.query("SELECT status, sha256 FROM documents WHERE path = 'leaks.md'")[0]
        assert doc["status"] == "failed"
        # The last good passages stay (and its hash, so the fixed file is seen as changed).
        assert (
            store.query(
                "SELECT p.text FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.path = 'leaks.md'"
            )
            == good
        )
        error = store.query("SELECT kind, error FROM ingest_errors WHERE path = 'leaks.md'")[0]
        assert error["kind"] == "not_a_markdown" and error["error"].startswith(repr(str(root / "leaks.md")))
        # Unchanged and still broken: not parsed again, still reported.
        again = ingest_corpus(store, config)
        assert (again.parsed, again.failed) == (0, 1) and again.failures[0]["kind"] == "not_a_markdown"
        # Fixed: active again, the error row drops out.
        (root / "leaks.md").write_text(GUIDE.replace("any time", "day and night"), encoding="utf-8")
        fixed = ingest_corpus(store, config)
        assert fixed.line() == "0 new, 1 changed, 1 unchanged, 0 removed, 0 failed"
        assert store.query("SELECT status FROM documents WHERE path = 'leaks.md'") == [{"status": "active"}]
        assert store.query("SELECT count(*) AS n FROM ingest_errors")[0]["n"] == 0


def test_a_removed_failed_file_drops_its_error(tmp_path):
    root = write_tree(tmp_path / "kb", {"a.md": GUIDE, "zero.txt": b""})
    with Store(tmp_path / "a.db") as store:
        assert ingest_corpus(store, config_for(root)).failed == 1
        (root / "zero.txt").unlink()
        assert ingest_corpus(store, config_for(root)).failed == 0
        assert store.query("SELECT count(*) AS n FROM ingest_errors")[0]["n"] == 0


def test_new_tokenizer_fingerprint_retokenizes_every_passage(tmp_path):
    root = write_tree(tmp_path / "kb", {"a.md": GUIDE, "b.txt": "Billing\n\nPaying bills by phone."})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        assert store.get_meta("tokenizer") == Tokenizer().fingerprint()
        unstemmed = config_for(root).replace(retrieval=RetrievalConfig(language="none"))
        summary = ingest_corpus(store, unstemmed)
        passages = store.query("SELECT text, token_ids, token_count FROM passages")
        assert summary.retokenized == len(passages) == 2 and summary.parsed == 0
        tokenizer = Tokenizer("none")  # the config's default stopwords: the fallback language's (English) list
        assert store.get_meta("tokenizer") == tokenizer.fingerprint() != Tokenizer().fingerprint()
        vocabulary = Vocabulary(store)
        for p in passages:
            tokens = tokenizer.tokenize(p["text"])
            assert np.frombuffer(p["token_ids"], dtype="<i4").tolist() == vocabulary.lookup(tokens)
            assert p["token_count"] == len(tokens)
        assert "paying" in vocabulary.terms().values()  # unstemmed
        assert ingest_corpus(store, unstemmed).retokenized == 0


def test_owner_map_changes_apply_to_unchanged_files(tmp_path):
    root = write_tree(
        tmp_path / "kb",
        {"field/leaks.md": GUIDE, "billing/fees.md": "---\nowner: Billing Team\n---\n# Fees\n\nFive percent.\n"},
    )
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        owners = {r["path"]: (r["owner"], r["owner_source"]) for r in store.query("SELECT * FROM documents")}
        assert owners == {
            "field/leaks.md": ("unassigned", "default"),
            "billing/fees.md": ("Billing Team", "front_matter"),
        }
        mapped = config_for(root, owners=(("field/**", "Field Operations"), ("**/*.md", "Everyone")))
        assert ingest_corpus(store, mapped).parsed == 0
        owners = {r["path"]: (r["owner"], r["owner_source"]) for r in store.query("SELECT * FROM documents")}
        # First match wins; front matter wins over the map.
        assert owners == {
            "field/leaks.md": ("Field Operations", "config"),
            "billing/fees.md": ("Billing Team", "front_matter"),
        }


def test_several_roots_keep_paths_unique(tmp_path):
    a = write_tree(tmp_path / "sites" / "help", {"index.md": GUIDE})
    b = write_tree(tmp_path / "manuals" / "help", {"index.md": "# Manual\n\nManual text.\n"})
    config = config_for(a, owners=(("index.md", "Root-relative"),))
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config, paths=[a, b])
        assert summary.new == 2
        docs = {r["path"]: (r["source_root"], r["owner"]) for r in store.query("SELECT * FROM documents")}
        # Paths are relative to the roots' common parent; globs match the path within each root.
        assert docs == {
            "sites/help/index.md": (str(a), "Root-relative"),
            "manuals/help/index.md": (str(b), "Root-relative"),
        }


def test_single_file_path_and_include_exclude(tmp_path):
    root = write_tree(
        tmp_path / "kb",
        {
            "a.md": GUIDE,
            "drafts/b.md": GUIDE,
            "_template.md": GUIDE,
            ".hidden/c.md": GUIDE,
            ".d.md": GUIDE,
            "notes.csv": "a,b\n",
        },
    )
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root, exclude=("drafts/**", "**/_*")))
        assert summary.new == 1
        assert [r["path"] for r in store.query("SELECT path FROM documents")] == ["a.md"]
    with Store(tmp_path / "b.db") as store:
        ingest_corpus(store, config_for(root), paths=[root / "drafts" / "b.md"])
        assert [r["path"] for r in store.query("SELECT path FROM documents")] == ["b.md"]


def test_meta_dates_are_all_kept(tmp_path):
    root = write_tree(tmp_path / "kb", {"a.md": "---\nupdated: 2024-01-02\ndate: 2020-05-06\n---\n# A\n\nText.\n"})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        row = store.query("SELECT meta_dates FROM documents")[0]
    assert json.loads(row["meta_dates"]) == [
        {"value": "2024-01-02", "kind": "modified", "source": "front_matter:updated"},
        {"value": "2020-05-06", "kind": "published", "source": "front_matter:date"},
    ]


def test_new_parser_code_reparses_everything(tmp_path):
    root = write_tree(tmp_path / "kb", {"a.md": GUIDE, "b.txt": "B\n\nText."})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        from auditor.ingest.pipeline import parser_fingerprint

        assert store.get_meta("ingest:parser") == parser_fingerprint()
        store.set_meta("ingest:parser", "an older parser")
        summary = ingest_corpus(store, config_for(root))
        assert (summary.parsed, summary.changed, summary.unchanged) == (2, 2, 0)
        assert ingest_corpus(store, config_for(root)).parsed == 0
