"""Security properties that DEVELOPERS.md's "Security" section names and no other test holds.

* SQL is parameterized: a scan of a corpus and question set full of SQL payloads (file name, front
  matter, text, question id/owner/topic/text) never puts a payload into the text of an SQL
  statement — every statement the store's connection prepares is recorded before binding — and the
  payloads come back byte for byte.
* Paths never escape the source root: include globs that climb out of the root ("../**", absolute
  paths) reach nothing outside it, and report files for hostile owner names stay inside the report
  folder.
"""

from __future__ import annotations

import json
import sqlite3

import pytest

from auditor.config import load_config
from tests import report_samples as samples

# The classic injection shapes (OWASP SQL Injection Prevention Cheat Sheet lists quote breaking,
# statement stacking and comment truncation); the marker makes them findable in SQL text.
MARKER = "Zq9x"
PAYLOADS = [
    f"{MARKER}'); DROP TABLE documents; --",
    f'{MARKER}" OR "1"="1',
    f"{MARKER}' OR 1=1 /*",
    f"{MARKER}\\'; SELECT load_extension('x'); --",
]


class RecordingConnection(sqlite3.Connection):
    """Records the SQL text of every statement before its parameters are bound."""

    statements: list[str] = []

    def execute(self, sql, *args):
        RecordingConnection.statements.append(sql)
        return super().execute(sql, *args)

    def executemany(self, sql, *args):
        RecordingConnection.statements.append(sql)
        return super().executemany(sql, *args)

    def executescript(self, sql):
        RecordingConnection.statements.append(sql)
        return super().executescript(sql)

    def cursor(self, *args, **kwargs):
        return super().cursor(RecordingCursor)


class RecordingCursor(sqlite3.Cursor):
    def execute(self, sql, *args):
        RecordingConnection.statements.append(sql)
        return super().execute(sql, *args)

    def executemany(self, sql, *args):
        RecordingConnection.statements.append(sql)
        return super().executemany(sql, *args)


@pytest.fixture
def recorded(monkeypatch):
    import auditor.store

    real = sqlite3.connect
    RecordingConnection.statements = []
    monkeypatch.setattr(
        auditor.store.sqlite3, "connect", lambda *a, **k: real(*a, **dict(k, factory=RecordingConnection))
    )
    return RecordingConnection.statements


def test_sql_payloads_are_bound_never_spliced_into_statements(demo_copy, recorded):
    from auditor.scan import scan
    from auditor.store import Store

    kb = demo_copy / "kb" / "billing"
    name = PAYLOADS[0].replace("/", "_") + ".md"  # a file name may hold anything but "/"
    title, owner = PAYLOADS[1], PAYLOADS[2]
    (kb / name).write_text(
        f"---\ntitle: '{title.replace(chr(39), chr(39) * 2)}'\nowner: '{owner.replace(chr(39), chr(39) * 2)}'\n"
        f"updated: 2026-10-01\n---\n\n# Autopay {MARKER}\n\nAutopay withdraws the bill "
        f"on its due date. {PAYLOADS[3]}\n",
        encoding="utf-8",
    )
    questions = demo_copy / "questions.csv"
    with questions.open("a", encoding="utf-8") as handle:
        handle.write(
            '"{}","How does autopay {} work?","{}","{}",5,\n'.format(
                *(p.replace('"', '""') for p in (PAYLOADS[0], PAYLOADS[3], PAYLOADS[1], PAYLOADS[2]))
            )
        )
    config = load_config(demo_copy / "audit.toml", env={})
    outcome = scan(config)

    assert recorded, "the recording connection was not used"
    spliced = [s for s in recorded if MARKER in s]
    assert spliced == []
    with Store(config.database) as store:
        # Nothing dropped, and every payload stored as the literal value it was.
        assert store.query("SELECT title, owner FROM documents WHERE path = ?", [f"billing/{name}"]) == [
            {"title": title, "owner": owner}
        ]
        texts = " ".join(r["text"] for r in store.query("SELECT text FROM passages"))
        assert PAYLOADS[3] in texts
    run = json.loads((outcome.out_dir / "results.json").read_text(encoding="utf-8"))
    question = next(q for q in run["questions"] if q["id"] == PAYLOADS[0])
    assert (question["question"], question["owner"], question["topic"]) == (
        f"How does autopay {PAYLOADS[3]} work?",
        PAYLOADS[1],
        PAYLOADS[2],
    )


def test_the_recorder_sees_spliced_sql(recorded, tmp_path):
    # The check above is able to fail: a value formatted into the SQL text is caught.
    from auditor.store import Store

    with Store(tmp_path / "a.db") as store:
        store.db.execute(f"SELECT '{MARKER}'")
    assert any(MARKER in s for s in recorded)


def test_include_globs_never_reach_outside_the_source_root(tmp_path):
    from auditor.config import Config, CorpusConfig
    from auditor.ingest.pipeline import ingest_corpus
    from auditor.store import Store

    root, outside = tmp_path / "kb", tmp_path / "outside"
    root.mkdir()
    outside.mkdir()
    (root / "inside.md").write_text("# Inside\n\nMeters are read monthly.\n", encoding="utf-8")
    (outside / "secret.md").write_text("# Secret\n\nNot part of the corpus.\n", encoding="utf-8")
    corpus = CorpusConfig(
        paths=(root,),
        include=("**/*", "../**", "../outside/*", str(outside / "*"), "/**"),
        follow_symlinks=True,
        jobs=1,
    )
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, Config(corpus=corpus), jobs=1)
        paths = [r["path"] for r in store.query("SELECT path FROM documents")]
        texts = " ".join(r["text"] for r in store.query("SELECT text FROM passages"))
    assert paths == ["inside.md"]
    assert "Secret" not in texts


@pytest.mark.parametrize("owner", ["../../escaped", "/etc/cron.d/x", "..", "owners/../../x", "C:\\evil", "\x00nul"])
def test_report_files_for_hostile_owner_names_stay_inside_the_report_folder(tmp_path, owner):
    from auditor.report import write_report
    from auditor.results import Run

    run = samples.sample_json()
    for q in run["questions"]:
        q["owner"] = owner
        for e in q.get("evidence", []):
            e["owner"] = owner
    for d in run.get("documents", []):
        d["owner"] = owner
    out = tmp_path / "deep" / "report"
    write_report(Run.from_json(run), out)
    written = [p for p in tmp_path.rglob("*") if p.is_file()]
    assert written and all(out.resolve() in p.resolve().parents for p in written)
    assert all(".." not in p.relative_to(out).parts for p in written)
