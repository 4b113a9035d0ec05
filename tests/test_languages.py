"""Languages of documents and questions (docs/languages.md): detection, tags, per-language
tokenizing, the config's `[languages]` globs, the stored language and its migration."""

from __future__ import annotations

import json
import re
import sqlite3

import pytest
import Stemmer
from click.testing import CliRunner

from auditor import language
from auditor.cli import cli
from auditor.config import load_config
from auditor.errors import ConfigError
from auditor.ingest.html import parse_html
from auditor.ingest.markdown import parse_markdown
from auditor.ingest.pipeline import ingest_corpus
from auditor.retrieval.index import PassageIndex
from auditor.retrieval.tokenize import LANGUAGE_STOPWORDS, Tokenizer, read_snowball_list
from auditor.store import SCHEMA, Store


def test_short_questions_are_detected():
    # Question-length texts in the three shipped languages (ours; bench/languages.py measures the
    # detector on 311 such texts against py3langid).
    assert language.detect("Wie kann ich meinen Zählerstand melden?") == "german"
    assert language.detect("¿Cómo puedo pagar la factura del agua?") == "spanish"
    assert language.detect("How do I report a burst pipe?") == "english"
    # Too few letters to tell: the caller's fallback applies.
    assert language.detect("apt?") is None
    assert language.detect_or("Q3", language.DEFAULT_CANDIDATES, "german") == "german"
    # One candidate needs no detection.
    assert language.detect("anything at all", ("spanish",)) == "spanish"


def test_language_tags():
    # BCP 47 (RFC 5646): the primary subtag is an ISO 639-1 code; region and script subtags follow.
    assert language.from_tag("de") == "german"
    assert language.from_tag("de-AT") == "german"
    assert language.from_tag("es_MX") == "spanish"
    assert language.from_tag("EN-gb") == "english"
    assert language.from_tag("German") == "german"  # a Snowball name is accepted as it is
    assert language.from_tag("xx") is None and language.from_tag("") is None and language.from_tag(None) is None
    assert language.from_tag("ja") is None  # lingua knows Japanese, Snowball has no stemmer for it


def test_snowball_stopword_lists():
    # The Snowball German and Spanish lists (snowballstem.org, algorithms/*/stop.txt): the words the
    # English-only tokenizer turned into "missing terms" ("wie", "ist", "ich") are on them.
    assert {"wie", "ist", "ich", "und", "der"} <= LANGUAGE_STOPWORDS["german"]
    assert {"de", "la", "que", "el", "cómo", "puedo"} <= LANGUAGE_STOPWORDS["spanish"]
    # The file format: the first word of a line, `|` starts a comment.
    assert read_snowball_list(" | a comment\naber   |  but\n\nalle\n") == {"aber", "alle"}


def test_auto_tokenizes_each_text_in_its_language():
    tokenizer = Tokenizer()  # language "auto", stopwords "auto"
    german, spanish = Stemmer.Stemmer("german"), Stemmer.Stemmer("spanish")
    # Stopwords of the question's language dropped, the rest stemmed by that language's Snowball stemmer.
    assert tokenizer.tokenize("Wie ändere ich meine Abschlagszahlungen?") == german.stemWords(
        ["ändere", "abschlagszahlungen"]
    )
    assert tokenizer.tokenize("¿Cómo cambio mis pagos mensuales?") == spanish.stemWords(
        ["cambio", "pagos", "mensuales"]
    )
    # A document's language given by the ingest wins over detection on a short passage.
    assert tokenizer.tokenize("Zähler", "german") == german.stemWords(["zähler"])
    # A fixed language ignores the hint.
    assert Tokenizer("english", "english").tokenize("Zähler melden", "german") == ["zähler", "melden"]


def test_config_language_globs(tmp_path):
    (tmp_path / "audit.toml").write_text(
        '[languages]\n"de/**" = "german"\n"es/**" = "es-ES"\n[retrieval]\ndetect = ["german", "english"]\n',
        encoding="utf-8",
    )
    config = load_config(tmp_path / "audit.toml", env={})
    assert config.languages == (("de/**", "german"), ("es/**", "spanish"))
    assert config.retrieval.language == "auto" and config.retrieval.detect == ("german", "english")
    (tmp_path / "bad.toml").write_text('[languages]\n"de/**" = "klingon"\n', encoding="utf-8")
    with pytest.raises(ConfigError, match=r"bad\.toml.*languages\.'de/\*\*': unknown language 'klingon'"):
        load_config(tmp_path / "bad.toml", env={})
    (tmp_path / "bad2.toml").write_text('[retrieval]\ndetect = ["klingon"]\n', encoding="utf-8")
    with pytest.raises(ConfigError, match=r"bad2\.toml.*retrieval.detect: 'klingon' cannot be detected"):
        load_config(tmp_path / "bad2.toml", env={})


def test_documents_say_their_language():
    # HTML Living Standard: `lang` on <html>; front matter `lang:` in Markdown.
    page = parse_html(b"<html lang='es-MX'><body><main><p>Hola.</p></main></body></html>", "a.html")
    assert page.language == "spanish"
    meta = parse_html(
        b"<html><head><meta http-equiv='Content-Language' content='de'></head><body><p>Hallo.</p></body></html>",
        "b.html",
    )
    assert meta.language == "german"
    assert parse_markdown(b"---\nlang: de\n---\n# Titel\n\nText.\n", "c.md").language == "german"
    assert parse_markdown(b"# Title\n\nText.\n", "d.md").language is None


def _corpus(tmp_path, languages: str = "") -> object:
    kb = tmp_path / "kb"
    (kb / "de").mkdir(parents=True, exist_ok=True)
    (kb / "es").mkdir(exist_ok=True)
    (kb / "de" / "zaehler.md").write_text(
        "# Zählerstand melden\n\nSie können Ihren Zählerstand jederzeit im Kundenportal melden. "
        "Die Ablesung erfolgt einmal im Jahr durch unsere Mitarbeiter.\n",
        encoding="utf-8",
    )
    (kb / "es" / "factura.md").write_text(
        "# Pagar la factura\n\nPuede pagar la factura del agua con domiciliación bancaria o en nuestras oficinas.\n",
        encoding="utf-8",
    )
    (kb / "es" / "etiqueta.md").write_text(
        "---\nlang: de\n---\n# Hinweis\n\nDieser Text ist deutsch.\n", encoding="utf-8"
    )
    (tmp_path / "audit.toml").write_text(
        f'database = "audit.db"\n[corpus]\npaths = ["kb"]\n{languages}', encoding="utf-8"
    )
    return load_config(tmp_path / "audit.toml", env={})


def test_ingest_stores_each_documents_language(tmp_path):
    config = _corpus(tmp_path)
    with Store(config.database) as store:
        ingest_corpus(store, config, jobs=1)
        rows = {r["path"]: (r["language"], r["language_source"]) for r in store.query("SELECT * FROM documents")}
        assert rows == {
            "de/zaehler.md": ("german", "detected"),
            "es/factura.md": ("spanish", "detected"),
            "es/etiqueta.md": ("german", "document"),
        }
        # Questions in either language find their passage in the one index.
        index = PassageIndex.load_or_build(store, config.retrieval, save=False)
        german, spanish = index.search_many(["Wie melde ich meinen Zählerstand?", "¿Cómo pago la factura?"])
        paths = {
            p["id"]: p["path"]
            for p in store.query("SELECT p.id, d.path FROM passages p JOIN documents d ON d.id = p.document_id")
        }
        assert paths[german.hits[0].passage_id] == "de/zaehler.md" and german.missing_terms == []
        assert paths[spanish.hits[0].passage_id] == "es/factura.md" and spanish.missing_terms == []


def test_config_globs_win_and_a_changed_rule_reparses(tmp_path):
    config = _corpus(tmp_path)
    with Store(config.database) as store:
        ingest_corpus(store, config, jobs=1)
    config = _corpus(tmp_path, '[languages]\n"es/**" = "spanish"\n')
    with Store(config.database) as store:
        summary = ingest_corpus(store, config, jobs=1)
        rows = {r["path"]: (r["language"], r["language_source"]) for r in store.query("SELECT * FROM documents")}
        assert rows["es/etiqueta.md"] == ("spanish", "config") and rows["es/factura.md"] == ("spanish", "config")
        assert rows["de/zaehler.md"] == ("german", "detected")
        assert summary.parsed == 2  # the two files whose rule changed, not the German one


def test_schema_3_database_is_migrated_and_retokenized(tmp_path):
    # A database of schema 3 (the one before document languages): no language columns, passages
    # tokenized as English.
    path = tmp_path / "old.db"
    old = re.sub(r"    language(?:_source)? +TEXT,[^\n]*\n", "", SCHEMA)
    assert "language" not in old.split("CREATE TABLE IF NOT EXISTS passages")[0].split("documents (")[1]
    conn = sqlite3.connect(path)
    conn.executescript(old)
    conn.execute("INSERT INTO meta VALUES ('schema_version', '3')")
    conn.execute(
        "INSERT INTO documents(path, source_root, kind, sha256, size, mtime, first_seen, last_seen, ingested_at) "
        "VALUES ('a.md', '/kb', 'markdown', 'x', 1, 't', 't', 't', 't')"
    )
    conn.execute(
        "INSERT INTO passages(document_id, ordinal, text, heading_path, char_start, char_end, token_ids, token_count) "
        "VALUES (1, 0, 'Sie können Ihren Zählerstand jederzeit im Kundenportal melden.', '[]', 0, 10, x'', 0)"
    )
    conn.execute("INSERT INTO meta VALUES ('tokenizer', 'tok2:english:english:0')")
    conn.commit()
    conn.close()
    tmp_kb = tmp_path / "kb"
    tmp_kb.mkdir()
    (tmp_path / "audit.toml").write_text('database = "old.db"\n[corpus]\npaths = ["kb"]\n', encoding="utf-8")
    config = load_config(tmp_path / "audit.toml", env={})
    with Store(path) as store:
        assert store.get_meta("schema_version") == "4"
        summary = ingest_corpus(store, config, jobs=1)
        assert summary.retokenized == 1
        row = store.query("SELECT language, language_source FROM documents")[0]
        assert (row["language"], row["language_source"]) == ("german", "detected")


def test_dates_command_takes_a_language(tmp_path):
    runner = CliRunner()
    result = runner.invoke(
        cli, ["dates", "--reference-date", "2026-03-15", "--language", "de", "-"], input="Stand: 1. März 2026\n"
    )
    assert result.exit_code == 0, result.output
    row = json.loads(result.output.splitlines()[0])
    assert (row["expression"], row["role"], row["language"]) == ("1. März 2026", "as_of", "german")
    detected = runner.invoke(
        cli, ["dates", "--reference-date", "2026-03-15", "-"], input="Válida hasta el 31 de diciembre de 2024.\n"
    )
    assert json.loads(detected.output.splitlines()[0])["language"] == "spanish"
    bad = runner.invoke(cli, ["dates", "--language", "klingon", "-"], input="x\n")
    assert bad.exit_code != 0 and "unknown language 'klingon'" in bad.output
