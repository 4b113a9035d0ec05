"""SciFact (Wadden et al., EMNLP 2020; CC BY-NC 2.0), read straight from the shared zip.

The data stays in ../shared/data/scifact/ (never copied into the repository); every function here
returns None or skips when it is absent. File layout per ../shared/data/scifact/README.md:

* corpus_train.csv: doc_id, title, abstract (a Python-style list of sentence strings, sometimes
  printed across lines without commas), structured.
* claims_<split>.csv: id, claim, evidence..., cited_doc_ids printed like "[ 5152028 11705328]"; a
  claim spans one row per evidence set. claims_validation.csv's (id, cited_doc_ids) pairs are the
  BEIR SciFact test qrels (339 pairs, 300 claims).
"""

from __future__ import annotations

import csv
import io
import json
import re
import zipfile
from pathlib import Path

# Beside the repository, never inside it: <checkout>/../shared/data/scifact/ wherever the checkout is.
FOLDER = Path(__file__).resolve().parents[1].parent / "shared" / "data" / "scifact"

# A quoted item of the printed list: '...' or "..." with backslash escapes inside.
_ITEM = re.compile(r"'((?:[^'\\]|\\.)*)'|\"((?:[^\"\\]|\\.)*)\"", re.S)
_ESCAPE = re.compile(r"\\(x[0-9a-fA-F]{2}|u[0-9a-fA-F]{4}|.)", re.S)
_SIMPLE = {"n": " ", "t": " ", "r": " "}  # line breaks inside a sentence read as spaces


def _unescape(text: str) -> str:
    def one(match: re.Match) -> str:
        code = match.group(1)
        if code[0] in "xu" and len(code) > 1:
            return chr(int(code[1:], 16))
        return _SIMPLE.get(code, code)

    return _ESCAPE.sub(one, text)


def parse_sentences(printed: str) -> list[str]:
    """The sentences of an `abstract` cell (a printed Python list of strings)."""
    return [_unescape(a if a is not None else b).strip() for a, b in (m.groups() for m in _ITEM.finditer(printed))]


def load_scifact(folder: Path = FOLDER, split: str = "validation"):
    """(corpus, claims) or None when the zip is absent.

    corpus: {doc_id: (title, abstract_text)}; claims: [(claim_id, claim_text, cited_doc_ids)] in file
    order, one entry per claim, cited_doc_ids a tuple of ints. The default split "validation" is the
    BEIR SciFact test set (300 claims, 339 qrels).
    """
    path = Path(folder) / "scifact.zip"
    if not path.is_file():
        return None
    with zipfile.ZipFile(path) as archive:

        def rows(name):
            return csv.DictReader(io.StringIO(archive.read(name).decode("utf-8")))

        corpus = {
            int(r["doc_id"]): (r["title"].strip(), " ".join(parse_sentences(r["abstract"])))
            for r in rows("corpus_train.csv")
        }
        claims: dict[int, tuple[str, list[int]]] = {}
        for r in rows(f"claims_{split}.csv"):
            text, cited = claims.setdefault(int(r["id"]), (r["claim"].strip(), []))
            for doc_id in map(int, re.findall(r"\d+", r["cited_doc_ids"])):
                if doc_id not in cited:
                    cited.append(doc_id)
    return corpus, [(cid, text, tuple(cited)) for cid, (text, cited) in claims.items()]


def fill_store(store, corpus: dict, tokenizer, exclude=()) -> dict[int, int]:
    """Write the corpus into an audit store as ingest would (one text document per abstract, one
    passage of title + abstract, token ids via Vocabulary); documents in `exclude` are left out.
    Returns {doc_id: passage id}."""
    from auditor.retrieval.vocabulary import Vocabulary

    vocabulary = Vocabulary(store)
    skip = set(exclude)
    passages = {}
    with store.transaction():
        for doc_id, (title, abstract) in corpus.items():
            if doc_id in skip:
                continue
            text = f"{title}\n{abstract}"
            document = store.db.execute(
                "INSERT INTO documents(path, source_root, kind, sha256, size, mtime, title, status, first_seen, "
                "last_seen, ingested_at) VALUES (?, 'scifact', 'text', ?, ?, '2020-01-01T00:00:00', ?, 'active', "
                "'2020-01-01', '2020-01-01', '2020-01-01')",
                [f"scifact/{doc_id}.txt", f"scifact-{doc_id}", len(text), title],
            ).lastrowid
            ids = vocabulary.ids(tokenizer.tokenize(text))
            passages[doc_id] = store.db.execute(
                "INSERT INTO passages(document_id, ordinal, text, heading_path, page, char_start, char_end, "
                "token_ids, token_count) VALUES (?, 0, ?, ?, NULL, 0, ?, ?, ?)",
                [document, text, json.dumps([title]), len(text), ids.astype("<i4").tobytes(), len(ids)],
            ).lastrowid
        store.set_meta("tokenizer", tokenizer.fingerprint())
    return passages
