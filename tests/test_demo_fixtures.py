"""Integrity of the demo knowledge base in fixtures/demo/ (fictional Fernhollow Water Cooperative).

These checks hold the fixture files to what fixtures/demo/README.md promises: every question has an
expected verdict, every verdict and stale reason is exercised, the labelled set points at real
documents, the PDFs are real PDFs with the Info dates their generator states and regenerate
byte-identically, front matter parses, and the questions are clear-cut for a lexical judge (a gap
question uses a term the knowledge base never uses; a supported or stale question shares its terms
with the document that decides it). The audit itself is held to expected.csv by the end-to-end test.
"""

from __future__ import annotations

import csv
import importlib.util
import json
import re
from datetime import UTC, date, datetime
from pathlib import Path

import pytest
import yaml
from bs4 import BeautifulSoup
from pypdf import PdfReader
from pypdf.errors import PdfReadError, PdfStreamError

from auditor.config import load_config
from auditor.models import STALE_REASONS, VERDICTS
from auditor.retrieval.tokenize import Tokenizer

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
KB = DEMO / "kb"
AS_OF = date(2026, 12, 1)
OWNERS = {"Billing", "Field Operations", "Conservation Programs", "Customer Care", "Water Quality"}
BROKEN = "quality/scan-2019.pdf"
EXCLUDED = "customer-care/_template.md"  # excluded by audit.toml's "**/_*"


def read_csv(name: str) -> list[dict]:
    with open(DEMO / name, newline="", encoding="utf-8") as f:
        return list(csv.DictReader(f))


def make_pdfs():
    spec = importlib.util.spec_from_file_location("demo_make_pdfs", DEMO / "make_pdfs.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def front_matter(path: Path) -> dict:
    text = path.read_text(encoding="utf-8")
    assert text.startswith("---\n"), f"{path}: no front matter"
    _, block, _ = text.split("---\n", 2)
    data = yaml.safe_load(block)
    assert isinstance(data, dict), f"{path}: front matter is not a mapping"
    return data


def kb_documents() -> list[str]:
    return sorted(str(p.relative_to(KB)) for p in KB.rglob("*") if p.is_file())


def document_text(rel: str) -> str:
    """Plain text of a demo document, boilerplate removed (our own simple extraction)."""
    path = KB / rel
    if path.suffix == ".md":
        return path.read_text(encoding="utf-8").split("---\n", 2)[2]
    if path.suffix == ".html":
        soup = BeautifulSoup(path.read_text(encoding="utf-8"), "html.parser")
        for tag in soup.select("script, nav, header, footer, .cookie-banner"):
            tag.decompose()
        return soup.get_text(" ")
    if path.suffix == ".pdf":
        return "\n".join(page.extract_text() for page in PdfReader(path).pages)
    return path.read_text(encoding="utf-8")


def pdf_date(value: str) -> datetime:
    """Parse an ISO 32000-1 §7.9.4 date string (D:YYYYMMDDHHmmSS followed by Z or an offset)."""
    m = re.fullmatch(r"D:(\d{4})(\d{2})(\d{2})(\d{2})(\d{2})(\d{2})(Z|[+-]\d{2}'?\d{2}'?)?", value)
    assert m, f"not a PDF date: {value!r}"
    assert m.group(7) in (None, "Z"), "the demo writes UTC dates"
    return datetime(*map(int, m.groups()[:6]), tzinfo=UTC)


# --- questions, expected verdicts, labels ----------------------------------------------------------


def test_questions_are_well_formed():
    rows = read_csv("questions.csv")
    assert list(rows[0]) == ["id", "question", "owner", "topic", "weight", "horizon_days"]
    ids = [r["id"] for r in rows]
    assert len(ids) == len(set(ids)), "duplicate question id"
    assert 38 <= len(rows) <= 50
    for r in rows:
        assert r["question"].strip() and r["topic"].strip()
        assert r["owner"] in OWNERS, r
        assert 3 <= float(r["weight"]) <= 120, r
        if r["horizon_days"]:
            assert int(r["horizon_days"]) > 0
    assert sum(1 for r in rows if r["horizon_days"]) >= 2


def test_every_question_has_an_expected_verdict_and_back():
    questions = {r["id"] for r in read_csv("questions.csv")}
    expected = [r["id"] for r in read_csv("expected.csv")]
    assert len(expected) == len(set(expected))
    assert set(expected) == questions


def test_expected_verdicts_cover_every_verdict_and_reason():
    rows = read_csv("expected.csv")
    assert list(rows[0]) == ["id", "verdict", "reasons", "flags", "document", "why"]
    docs = set(kb_documents())
    seen_reasons = set()
    for r in rows:
        assert r["verdict"] in VERDICTS, r
        reasons = [x for x in r["reasons"].split(";") if x]
        assert set(reasons) <= set(STALE_REASONS), r
        assert bool(reasons) == (r["verdict"] == "stale"), f"{r['id']}: reasons only and always on stale"
        seen_reasons.update(reasons)
        # the flags the README promises; both are flags of a supported verdict (auditor/judgement/support.py)
        assert set(filter(None, r["flags"].split(";"))) <= {"stale_competitor", "file_dated"}, r
        assert not r["flags"] or r["verdict"] == "supported", r
        assert r["why"].strip(), r
        if r["verdict"] == "gap":
            assert r["document"] == "", r
        else:
            assert r["document"] in docs and r["document"] not in (BROKEN, EXCLUDED), r
    assert {r["verdict"] for r in rows} == set(VERDICTS)
    assert seen_reasons == set(STALE_REASONS)
    # supported questions whose stale competitor is the superseded rate schedule
    assert sum(1 for r in rows if r["verdict"] == "supported" and "stale competitor" in r["why"]) >= 2
    # the question that shows the file_dated flag rests on the one undated document
    assert any("file_dated" in r["why"] and r["document"] == "customer-care/contact-directory.txt" for r in rows)


def test_labels_point_at_real_documents():
    rows = read_csv("labels.csv")
    assert list(rows[0]) == ["question", "answerable", "expected_document"]
    assert 25 <= len(rows) <= 45
    docs = set(kb_documents())
    for r in rows:
        assert r["answerable"] in ("yes", "no"), r
        if r["answerable"] == "yes":
            assert r["expected_document"] in docs, r
            assert r["expected_document"] not in (BROKEN, EXCLUDED), r
        else:
            assert r["expected_document"] == "", r
    answers = [r["answerable"] for r in rows]
    assert answers.count("no") >= 8 and answers.count("yes") >= 15
    # some overlap the question set, some are new paraphrases
    questions = {r["question"] for r in read_csv("questions.csv")}
    overlap = sum(1 for r in rows if r["question"] in questions)
    assert 5 <= overlap <= len(rows) - 10


# --- clear-cut for a lexical judge ----------------------------------------------------------------


@pytest.fixture(scope="module")
def corpus_terms():
    tokenizer = Tokenizer()
    texts = {
        rel: set(tokenizer.tokenize(document_text(rel))) for rel in kb_documents() if rel not in (BROKEN, EXCLUDED)
    }
    return tokenizer, texts


def test_gap_questions_use_a_term_the_kb_never_uses(corpus_terms):
    tokenizer, texts = corpus_terms
    vocabulary = set().union(*texts.values())
    questions = {r["id"]: r["question"] for r in read_csv("questions.csv")}
    for r in read_csv("expected.csv"):
        if r["verdict"] == "gap":
            missing = set(tokenizer.tokenize(questions[r["id"]])) - vocabulary
            assert missing, f"{r['id']}: every term occurs in the knowledge base"


def test_supported_questions_share_their_terms_with_the_deciding_document(corpus_terms):
    tokenizer, texts = corpus_terms
    questions = {r["id"]: r["question"] for r in read_csv("questions.csv")}
    for r in read_csv("expected.csv"):
        if r["verdict"] == "gap":
            continue
        terms = set(tokenizer.tokenize(questions[r["id"]]))
        share = len(terms & texts[r["document"]]) / len(terms)
        # 0.8: every key content word, at most one incidental word ("get", "much") missing
        assert share >= 0.8, f"{r['id']}: only {share:.2f} of {sorted(terms)} in {r['document']}"


# --- documents ------------------------------------------------------------------------------------


def test_knowledge_base_has_every_format_and_owner():
    docs = kb_documents()
    assert 22 <= len(docs) <= 30
    assert {Path(d).suffix for d in docs} == {".md", ".html", ".txt", ".pdf"}
    assert {d.split("/")[0] for d in docs} == {"billing", "customer-care", "field-ops", "conservation", "quality"}


def test_markdown_front_matter_parses_with_dates_in_range():
    for path in sorted(KB.rglob("*.md")):
        data = front_matter(path)
        rel = str(path.relative_to(KB))
        assert data.get("title"), rel
        assert data.get("owner") in OWNERS, rel
        if rel == EXCLUDED:
            continue
        stamp = data.get("updated") or data.get("last_reviewed")
        assert isinstance(stamp, date), f"{rel}: updated/last_reviewed must be a YAML date"
        assert date(2023, 1, 1) <= stamp < AS_OF, rel
        assert isinstance(data.get("tags"), list), rel


HTML_DATE_CUES = {
    "billing/payment-options.html": ("jsonld", "dateModified", "2026-09-08"),
    "conservation/rebates-2026.html": ("jsonld", "expires", "2026-06-30"),
    "billing/landlord-accounts.html": ("og", "article:modified_time", "2025-07-10"),
    "field-ops/alder-street-main-replacement.html": ("og", "article:modified_time", "2026-01-20"),
    "field-ops/outage-map.html": ("dcterms", "DCTERMS.modified", "2026-11-02"),
    "field-ops/report-a-leak.html": ("time", "datetime", "2026-08-21"),
}


@pytest.mark.parametrize("rel", sorted(HTML_DATE_CUES))
def test_html_pages_carry_their_date_cue_and_boilerplate(rel):
    kind, name, value = HTML_DATE_CUES[rel]
    soup = BeautifulSoup((KB / rel).read_text(encoding="utf-8"), "html.parser")
    if kind == "jsonld":
        data = json.loads(soup.find("script", type="application/ld+json").string)
        found = data.get(name)
    elif kind == "og":
        found = soup.find("meta", attrs={"property": name})["content"][:10]
    elif kind == "dcterms":
        found = soup.find("meta", attrs={"name": name})["content"]
    else:
        found = soup.find("time")["datetime"]
    assert found == value
    # boilerplate the HTML parser has to strip
    assert soup.find("nav") and soup.find("footer") and soup.select(".cookie-banner")
    assert soup.find("main")


def test_html_pages_are_all_listed():
    assert sorted(str(p.relative_to(KB)) for p in KB.rglob("*.html")) == sorted(HTML_DATE_CUES)


def test_exactly_one_document_has_no_date_at_all():
    undated = []
    for rel in kb_documents():
        if rel.endswith(".txt"):
            text = (KB / rel).read_text(encoding="utf-8")
            if not re.search(r"\b(19|20)\d{2}\b", text):
                undated.append(rel)
    assert undated == ["customer-care/contact-directory.txt"]


def test_safety_pages_carry_the_official_notice_caution():
    for rel in ("quality/boil-water-advisory.md", "quality/taste-and-odor.md", "quality/water-quality-report-2023.pdf"):
        text = " ".join(document_text(rel).split())
        assert "prevail" in text and "Health Department" in text, rel


# --- PDFs -----------------------------------------------------------------------------------------


def test_pdfs_have_the_stated_info_dates_and_text_layer():
    generator = make_pdfs()
    assert generator.DOCUMENTS
    for doc in generator.DOCUMENTS:
        reader = PdfReader(KB / doc["path"])
        info = reader.metadata
        assert pdf_date(info["/CreationDate"]) == doc["created"]
        assert pdf_date(info["/ModDate"]) == doc["modified"]
        assert info["/Title"] == doc["title"]
        assert len(reader.pages) == len(doc["pages"])
        for page, paragraphs in zip(reader.pages, doc["pages"]):
            text = " ".join(page.extract_text().split())
            for heading, paragraph in paragraphs:
                assert " ".join(paragraph.split()) in text, (doc["path"], heading)


def test_stated_pdf_dates_fit_the_scenario():
    generator = make_pdfs()
    dates = {doc["path"]: doc["modified"].date() for doc in generator.DOCUMENTS}
    assert date(2023, 1, 1) <= dates["quality/water-quality-report-2023.pdf"] < date(2025, 1, 1)  # too_old
    assert date(2025, 12, 1) <= dates["conservation/water-wise-garden-guide.pdf"] < AS_OF  # fresh


def test_broken_pdf_is_a_truncated_pdf_that_does_not_parse():
    data = (KB / BROKEN).read_bytes()
    assert data.startswith(b"%PDF-")
    assert b"%%EOF" not in data and b"trailer" not in data
    with pytest.raises((PdfReadError, PdfStreamError)):
        reader = PdfReader(KB / BROKEN)
        reader.pages[0].extract_text()


def test_make_pdfs_regenerates_byte_identical_files(tmp_path):
    written = make_pdfs().build(tmp_path)
    assert len(written) == 3
    for path in written:
        rel = path.relative_to(tmp_path)
        assert path.read_bytes() == (KB / rel).read_bytes(), f"{rel} differs from the committed file"


# --- config and query log -------------------------------------------------------------------------


def test_audit_config_loads_cleanly():
    warnings = []
    config = load_config(DEMO / "audit.toml", env={}, warn=warnings.append)
    assert warnings == []
    assert config.as_of == AS_OF
    assert config.freshness.horizon_days == 365
    assert [r.path for r in config.freshness.rules if r.path] == ["billing/rates-*"]
    assert [r.topic for r in config.freshness.rules if r.topic] == ["landlord"]
    assert config.questions == (DEMO / "questions.csv",)
    assert config.corpus.paths == (DEMO / "kb",)
    assert {owner for _, owner in config.owners} == OWNERS
    # database and report live under the git-ignored reports/ folder
    assert config.database.resolve() == (DEMO.parent.parent / "reports" / "demo" / "auditor.db").resolve()
    assert config.report.out.resolve() == (DEMO.parent.parent / "reports" / "demo").resolve()
    # every owner glob names a real folder
    folders = {d.split("/")[0] for d in kb_documents()}
    assert {glob.split("/")[0] for glob, _ in config.owners} == folders
    # the topic rule is used by questions, and the gate limits hold for the expected verdicts
    questions = read_csv("questions.csv")
    assert any(q["topic"] == "landlord" for q in questions)
    verdicts = {r["id"]: r["verdict"] for r in read_csv("expected.csv")}
    total = sum(float(q["weight"]) for q in questions)
    gap_weight = sum(float(q["weight"]) for q in questions if verdicts[q["id"]] == "gap")
    stale_weight = sum(float(q["weight"]) for q in questions if verdicts[q["id"]] == "stale")
    share = lambda v: sum(1 for x in verdicts.values() if x == v) / len(verdicts)
    assert share("gap") <= config.gate.max_gap_share
    assert share("stale") <= config.gate.max_stale_share
    assert gap_weight / total <= config.gate.max_fallback_exposure
    assert stale_weight / total <= config.gate.max_stale_exposure


def luhn_valid(number: str) -> bool:
    """Luhn (mod 10) check digit, ISO/IEC 7812-1 Annex B."""
    digits = [int(c) for c in number if c.isdigit()][::-1]
    total = sum(d if i % 2 == 0 else (d * 2 - 9 if d > 4 else d * 2) for i, d in enumerate(digits))
    return total % 10 == 0


def test_query_log_has_duplicates_and_only_invented_personal_data():
    rows = read_csv("querylog.csv")
    assert list(rows[0]) == ["text", "count", "timestamp"]
    for r in rows:
        assert int(r["count"]) >= 1
        datetime.fromisoformat(r["timestamp"].replace("Z", "+00:00"))
    texts = [r["text"] for r in rows]
    normalized = [re.sub(r"[^a-z0-9 ]", "", t.lower()).strip() for t in texts]
    assert len(set(normalized)) < len(normalized) - 5, "near-duplicates differing only in case/punctuation"
    emails = re.findall(r"[\w.+-]+@([\w-]+\.[\w.]+)", " ".join(texts))
    assert emails and set(emails) <= {"example.org", "example.com"}  # RFC 2606 reserved domains
    phones = re.findall(r"555-(\d{4})", " ".join(texts))
    assert phones and all(0 <= int(p) - 100 <= 99 for p in phones)  # 555-0100..0199, reserved for fiction
    cards = re.findall(r"\b(?:\d{4}[ -]?){3}\d{4}\b", " ".join(texts))
    # 4111 1111 1111 1111: the widely published test card number (from memory); it passes Luhn
    assert cards and all(re.sub(r"\D", "", c) == "4111111111111111" and luhn_valid(c) for c in cards)
