"""Discovery: globs, hidden files, type detection, document paths; and the progress bar."""

from __future__ import annotations

import os
import sys

import pytest

from auditor.config import CorpusConfig
from auditor.ingest.pipeline import ingest_corpus
from auditor.ingest.walk import discover, glob_match
from auditor.store import Store
from tests.ingest_helpers import config_for, make_pdf, write_tree


@pytest.mark.parametrize(
    "pattern, path, expected",
    [
        ("**/*", "a.md", True),
        ("**/*", "x/y/a.md", True),
        ("billing/**", "billing/rates/2024.md", True),
        ("billing/**", "billing-old/a.md", False),
        ("billing/*", "billing/rates/2024.md", False),
        ("*.pdf", "quality/report.pdf", True),  # no "/": matches the name at any depth
        ("**/_*", "customer-care/_template.md", True),
        ("**/_*", "_top.md", True),
        ("**/_*", "care/a_b.md", False),
        ("rates-?.md", "billing/rates-1.md", True),
        ("billing/rates-*", "billing/rates-2025-26.md", True),
        ("/billing/*.md", "billing/a.md", True),
    ],
)
def test_glob_semantics(pattern, path, expected):
    assert glob_match(pattern, path) is expected


def test_discovery_skips_hidden_and_unknown_types_but_finds_misnamed_pdfs(tmp_path):
    root = write_tree(
        tmp_path / "kb",
        {
            "a.md": "# A\n",
            ".git/config.md": "x",
            ".draft.md": "x",
            "img.png": b"\x89PNG....",
            "data.csv": "a,b",
            "scan.bin": make_pdf(["Text in a PDF with an odd name."]),
            "page.HTM": "<p>x</p>",
        },
    )
    found, skipped = discover([root], CorpusConfig())
    assert [(f.doc_path, f.kind) for f in found] == [("a.md", "markdown"), ("page.HTM", "html"), ("scan.bin", "pdf")]
    assert skipped == []


def test_file_named_txt_holding_a_pdf_is_parsed_as_pdf(tmp_path):
    root = write_tree(tmp_path / "kb", {"notes.txt": make_pdf(["Meters are read every two months."])})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        assert store.query("SELECT kind FROM documents") == [{"kind": "pdf"}]
        assert "Meters are read" in store.query("SELECT text FROM passages")[0]["text"]


def test_progress_bar_only_on_a_terminal(tmp_path, capfd):
    root = write_tree(tmp_path / "kb", {"a.md": "# A\n\nText.\n", "b.md": "# B\n\nText.\n"})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root), progress=True)  # stderr is captured: not a TTY
    assert capfd.readouterr().err == ""

    master, slave = os.openpty()
    saved = sys.stderr
    sys.stderr = os.fdopen(slave, "w")
    try:
        with Store(tmp_path / "b.db") as store:
            ingest_corpus(store, config_for(root), progress=True)
        sys.stderr.flush()
        output = os.read(master, 65536).decode()
    finally:
        sys.stderr.close()
        sys.stderr = saved
        os.close(master)
    assert "ingest [" in output and "2/2" in output and "parsed 2 files" in output


def test_a_file_name_that_is_not_utf8_is_stored_escaped(tmp_path):
    root = write_tree(tmp_path / "kb", {"good.md": "# A\n\nText.\n"})
    with open(os.path.join(os.fsencode(root), b"caf\xe9.md"), "wb") as handle:  # Latin-1 name
        handle.write(b"# Cafe\n\nOpening hours.\n")
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root))
        assert summary.new == 2
        assert sorted(r["path"] for r in store.query("SELECT path FROM documents")) == ["caf\\xe9.md", "good.md"]
