"""End-to-end ingest into a real SQLite store: all four formats, incremental re-runs, removal,
owners, tokens and statements. Documents are built inside the tests (fpdf2/pypdf for PDFs)."""

from __future__ import annotations

import json
from datetime import date

import numpy as np
import pytest

from auditor.ingest.pipeline import ingest_corpus
from auditor.retrieval.tokenize import Tokenizer
from auditor.retrieval.vocabulary import Vocabulary
from auditor.store import Store
from auditor.temporal import extract as temporal
from tests.ingest_helpers import config_for, html_page, make_pdf, write_tree, xmp_packet

FEES_MD = (
    "---\ntitle: Late fees\nowner: Billing\nupdated: 2024-03-01\nexpires: 2025-01-01\ntags: [fees, billing]\n---\n"
    "# Billing\n\n## Late fees\n\nAs of March 2024 a late fee of 5% applies to unpaid bills. It changed last month.\n\n"
    "## Paying\n\nPay by phone or online.\n"
)


@pytest.fixture()
def corpus(tmp_path):
    root = tmp_path / "kb"
    write_tree(
        root,
        {
            "billing/fees.md": FEES_MD,
            "care/start.txt": "Start service\n\nCall the contact centre to start service.",
            "field/leaks.html": html_page(
                "<nav>Home | Billing</nav><main><h1>Leaks</h1><p>Report leaks on the hotline.</p></main><footer>Contact</footer>",
                head='<meta property="article:modified_time" content="2024-05-06T10:00:00+02:00">',
            ),
            "quality/report.pdf": make_pdf(
                ["Introduction to the water quality report.", "Results for 2023 were within limits."],
                sections=[(1, "Introduction", 0), (2, "Results", 0)],
                info={"/ModDate": "D:20240102030405+01'00'"},
                xmp=xmp_packet("2024-02-03T10:00:00Z"),
            ),
        },
    )
    return root


def test_all_formats_land_in_the_store(tmp_path, corpus):
    config = config_for(corpus, owners=(("field/**", "Field Operations"),))
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config)
        assert summary.line() == "4 new, 0 changed, 0 unchanged, 0 removed, 0 failed"
        docs = {r["path"]: r for r in store.query("SELECT * FROM documents")}
        assert set(docs) == {"billing/fees.md", "care/start.txt", "field/leaks.html", "quality/report.pdf"}
        fees = docs["billing/fees.md"]
        assert (fees["owner"], fees["owner_source"]) == ("Billing", "front_matter")
        assert (fees["doc_date"], fees["doc_date_source"], fees["expires"]) == (
            "2024-03-01",
            "front_matter:updated",
            "2025-01-01",
        )
        assert json.loads(fees["tags"]) == ["fees", "billing"]
        leaks = docs["field/leaks.html"]
        assert (leaks["owner"], leaks["owner_source"]) == ("Field Operations", "config")
        # Open Graph article:modified_time, ISO 8601 with offset: the date as written.
        assert (leaks["doc_date"], leaks["doc_date_source"]) == ("2024-05-06", "og:article:modified_time")
        report = docs["quality/report.pdf"]
        # XMP ModifyDate is more specific than Info ModDate (docs/ingestion.md order).
        assert (report["doc_date"], report["doc_date_source"]) == ("2024-02-03", "pdf:xmp:ModifyDate")
        start = docs["care/start.txt"]
        assert start["doc_date_source"] == "file:mtime"
        assert start["owner"] == "unassigned" and start["owner_source"] == "default"

        passages = store.query(
            "SELECT p.*, d.path FROM passages p JOIN documents d ON d.id = p.document_id ORDER BY p.id"
        )
        pdf = [p for p in passages if p["path"] == "quality/report.pdf"]
        assert [(json.loads(p["heading_path"]), p["page"]) for p in pdf] == [(["Introduction"], 1), (["Results"], 2)]
        html = [p for p in passages if p["path"] == "field/leaks.html"]
        assert "Home" not in html[0]["text"] and "Contact" not in html[0]["text"]
        assert "Report leaks on the hotline." in html[0]["text"]

        # token_ids are the Vocabulary ids of the Tokenizer's tokens of the passage text.
        vocabulary, tokenizer = Vocabulary(store), Tokenizer()
        for p in passages:
            ids = np.frombuffer(p["token_ids"], dtype="<i4")
            assert ids.tolist() == vocabulary.lookup(tokenizer.tokenize(p["text"]))
            assert p["token_count"] == len(ids)
        # Statements are temporal.extract over the passage text with the document date as reference.
        fee_passage = next(p for p in passages if "late fee" in p["text"])
        stored = store.query(
            "SELECT expression, sentence, start, end, granularity, role, char_start, char_end "
            "FROM statements WHERE passage_id = ? ORDER BY id",
            [fee_passage["id"]],
        )
        # The document date (front matter updated: 2024-03-01) anchors relative expressions.
        expected = temporal.extract(fee_passage["text"], reference_date=date(2024, 3, 1))
        assert [tuple(s.values()) for s in stored] == [
            (
                e.expression,
                e.text,
                e.start.isoformat(),
                e.end.isoformat(),
                e.granularity,
                e.role,
                e.char_start,
                e.char_end,
            )
            for e in expected
        ]
        assert [s["expression"] for s in stored] == ["March 2024", "last month"]
        assert stored[1]["start"] == "2024-02-01"  # "last month" seen from 2024-03-01
        for s in stored:
            assert fee_passage["text"][s["char_start"] : s["char_end"]] == s["expression"]


def test_rerun_parses_nothing_and_one_change_reparses_one_file(tmp_path, corpus):
    config = config_for(corpus)
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config)
        before = store.query("SELECT id, document_id FROM passages ORDER BY id")
        again = ingest_corpus(store, config)
        assert again.line() == "0 new, 0 changed, 4 unchanged, 0 removed, 0 failed"
        assert again.parsed == 0
        assert store.query("SELECT id, document_id FROM passages ORDER BY id") == before

        (corpus / "billing/fees.md").write_text(FEES_MD.replace("5%", "7%"), encoding="utf-8")
        changed = ingest_corpus(store, config)
        assert changed.line() == "0 new, 1 changed, 3 unchanged, 0 removed, 0 failed"
        assert changed.parsed == 1
        fees = store.query(
            "SELECT p.text FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.path = 'billing/fees.md'"
        )
        assert any("7%" in p["text"] for p in fees) and not any("5%" in p["text"] for p in fees)
        # Other documents' passages were not touched.
        others = [
            r
            for r in before
            if r["document_id"] != store.query("SELECT id FROM documents WHERE path = 'billing/fees.md'")[0]["id"]
        ]
        assert all(r in store.query("SELECT id, document_id FROM passages") for r in others)


def test_removed_file_is_marked_and_its_passages_deleted(tmp_path, corpus):
    config = config_for(corpus)
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config)
        (corpus / "care/start.txt").unlink()
        summary = ingest_corpus(store, config)
        assert summary.removed == 1
        row = store.query("SELECT id, status FROM documents WHERE path = 'care/start.txt'")[0]
        assert row["status"] == "removed"
        assert store.query("SELECT count(*) AS n FROM passages WHERE document_id = ?", [row["id"]])[0]["n"] == 0
        # Coming back counts as new.
        (corpus / "care/start.txt").write_text("Start service\n\nCall us.", encoding="utf-8")
        assert ingest_corpus(store, config).new == 1
