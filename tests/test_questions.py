"""Question sets: CSV / JSON Lines / plain text loading, ids, validation, storing (docs/question-sets.md)."""

from __future__ import annotations

import codecs
import json
import sqlite3

import pytest

from auditor.errors import InputError
from auditor.models import Question
from auditor.questions.sets import load_questions, read_question_file, store_questions, stored_questions
from auditor.store import Store


def write(tmp_path, name, content, encoding="utf-8"):
    path = tmp_path / name
    if isinstance(content, bytes):
        path.write_bytes(content)
    else:
        path.write_text(content, encoding=encoding, newline="")
    return path


# --- formats --------------------------------------------------------------------------------------


def test_csv_all_columns_in_file_order(tmp_path):
    path = write(
        tmp_path,
        "set.csv",
        "id,question,owner,topic,weight,horizon_days\n"
        "pay-1,Can I pay my bill by phone?,Billing,payments,88,\n"
        "leak-2,How do I report a leak?,Field Operations,leaks,12.5,90\n",
    )
    assert load_questions(path) == [
        Question("pay-1", "Can I pay my bill by phone?", "Billing", "payments", 88.0, None),
        Question("leak-2", "How do I report a leak?", "Field Operations", "leaks", 12.5, 90),
    ]


def test_csv_rfc4180_quoting(tmp_path):
    # RFC 4180 §2 rules 5–7: fields with commas, double quotes (doubled) and line breaks are quoted.
    path = write(
        tmp_path,
        "set.csv",
        "question,owner\r\n"
        '"Is the fee $5, or $10?",Billing\r\n'
        '"What does ""boil water"" mean?",Water Quality\r\n'
        '"Two\r\nlines",\r\n'
        "Last one,\r\n",
    )
    qs = load_questions(path)
    assert [q.question for q in qs] == [
        "Is the fee $5, or $10?",
        'What does "boil water" mean?',
        "Two lines",
        "Last one",
    ]
    assert [q.id for q in qs] == ["q-001", "q-002", "q-003", "q-004"]
    assert qs[2].owner is None


def test_csv_line_numbers_count_physical_lines(tmp_path):
    # The quoted field spans lines 2–3, so the bad weight sits on physical line 5.
    path = write(tmp_path, "set.csv", 'question,weight\n"a\nb",1\nok,2\nbad,heavy\n')
    with pytest.raises(InputError, match=r"line 5: weight 'heavy' is not a number"):
        load_questions(path)


def test_semicolon_and_tab_delimiters_and_header_case(tmp_path):
    semi = write(tmp_path, "semi.csv", " Question ; Weight\nWhen is my bill due?;3\n")
    tab = write(tmp_path, "set.tsv", "question\tweight\nWhere is the office?\t2\n")
    assert load_questions(semi) == [Question("q-001", "When is my bill due?", weight=3.0)]
    assert load_questions(tab) == [Question("q-001", "Where is the office?", weight=2.0)]


def test_empty_trailing_columns_of_a_spreadsheet_export(tmp_path):
    path = write(tmp_path, "set.csv", "question,weight,,\r\nOne?,2,,\r\nTwo?,,\r\n")
    assert load_questions(path) == [Question("q-001", "One?", weight=2.0), Question("q-002", "Two?")]


def test_nested_jsonl_values_are_refused_where_they_are_used(tmp_path):
    path = write(tmp_path, "set.jsonl", '{"question": {"en": "One?"}}\n')
    with pytest.raises(InputError, match=r"line 1: question must be text"):
        load_questions(path)
    path = write(tmp_path, "set2.jsonl", '{"question": "One?", "weight": [2]}\n')
    with pytest.raises(InputError, match=r"line 1: weight \[2\] is not a number"):
        load_questions(path)


def test_demo_question_set_loads():
    # The demo's contact-centre question set (fixtures/demo, fixtures/demo/README.md) as the audit reads it.
    from pathlib import Path

    demo = Path(__file__).resolve().parent.parent / "fixtures" / "demo" / "questions.csv"
    if not demo.exists():
        pytest.skip("demo fixtures not present")
    qs = load_questions(demo)
    # The standard library's csv reader is the reference for what the file holds.
    import csv

    with open(demo, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert [(q.id, q.question, q.owner, q.topic, q.weight) for q in qs] == [
        (r["id"], r["question"], r["owner"] or None, r["topic"] or None, float(r["weight"] or 1)) for r in rows
    ]
    assert len({q.id for q in qs}) == len(rows) > 0


def test_jsonl_same_keys(tmp_path):
    # JSON Lines (jsonlines.org): UTF-8, one JSON value per line; blank lines tolerated.
    lines = [
        {"id": 7, "question": "Who reads the meter?", "weight": 4, "horizon_days": 30},
        {"question": "Wie melde ich ein Leck?", "topic": "leaks", "owner": None},
    ]
    path = write(tmp_path, "set.jsonl", "\n".join(json.dumps(x, ensure_ascii=False) for x in lines) + "\n\n")
    assert load_questions(path) == [
        Question("7", "Who reads the meter?", weight=4.0, horizon_days=30),
        Question("q-002", "Wie melde ich ein Leck?", topic="leaks"),
    ]


def test_plain_text_skips_blank_and_comment_lines(tmp_path):
    path = write(tmp_path, "set.txt", "# contact centre, November\n\nCan I pay by phone?\n  How do I stop service?  \n")
    assert load_questions(path) == [
        Question("q-001", "Can I pay by phone?"),
        Question("q-002", "How do I stop service?"),
    ]


def test_content_sniffing_without_a_known_extension(tmp_path):
    csv_like = write(tmp_path, "set.data", "question,weight\nA?,2\n")
    jsonl_like = write(tmp_path, "set2.data", '{"question": "B?"}\n')
    text_like = write(tmp_path, "set3", "Plain question, with a comma?\n")
    assert load_questions(csv_like) == [Question("q-001", "A?", weight=2.0)]
    assert load_questions(jsonl_like) == [Question("q-001", "B?")]
    assert load_questions(text_like) == [Question("q-001", "Plain question, with a comma?")]


def test_generated_ids_widen_past_999(tmp_path):
    path = write(tmp_path, "big.txt", "".join(f"Question {i}?\n" for i in range(1, 1201)))
    qs = load_questions(path)
    assert (qs[0].id, qs[998].id, qs[-1].id) == ("q-0001", "q-0999", "q-1200")
    assert len({q.id for q in qs}) == 1200


def test_encodings_bom_and_utf16(tmp_path):
    bom = write(tmp_path, "bom.csv", codecs.BOM_UTF8 + "question\nÀ quelle heure ?\n".encode())
    u16 = write(tmp_path, "u16.txt", "Wann kommt die Rechnung?\n".encode("utf-16"))
    assert load_questions(bom)[0].question == "À quelle heure ?"
    assert load_questions(u16)[0].question == "Wann kommt die Rechnung?"


def test_query_log_is_delegated(tmp_path):
    # A count column makes it a query log: merged, weighted, redacted.
    path = write(tmp_path, "log.csv", "query,count\nPay my bill,3\npay my bill!,2\nmail me at ann@example.org,1\n")
    qs = load_questions(path)
    assert [(q.question, q.weight) for q in qs] == [("Pay my bill", 5.0), ("mail me at [email]", 1.0)]


def test_read_question_file_returns_the_log_summary(tmp_path, caplog):
    log = write(
        tmp_path,
        "log.jsonl",
        '{"utterance": "Leak on my street", "count": 2}\n{"utterance": "call +44 20 7946 0123", "count": 1}\n',
    )
    questions, summary = read_question_file(log)
    assert (
        summary.line() == "2 log lines -> 2 questions (0 exact and 0 near duplicates merged, 0 empty); redacted 1 phone"
    )
    with caplog.at_level("INFO", logger="auditor.questions.sets"):
        assert load_questions(log) == questions
    assert "redacted 1 phone" in caplog.text
    plain = write(tmp_path, "set.txt", "Leak on my street?\n")
    assert read_question_file(plain) == ([Question("q-001", "Leak on my street?")], None)


def test_question_with_count_column_is_a_query_log(tmp_path):
    path = write(tmp_path, "log.csv", "question,count\nA b c,2\na B c,1\n")
    assert [(q.question, q.weight) for q in load_questions(path)] == [("A b c", 3.0)]


# --- bad files: one clear error naming the file and the line --------------------------------------


@pytest.mark.parametrize(
    "name, content, message",
    [
        ("dup.csv", "id,question\na,One?\nb,Two?\na,Three?\n", r"line 4: duplicate id 'a' \(first on line 2\)"),
        ("dupgen.csv", "id,question\nq-002,One?\n,Two?\n", r"line 3: duplicate id 'q-002' \(first on line 2\)"),
        ("w0.csv", "question,weight\nOne?,0\n", r"line 2: weight must be a finite number above 0"),
        ("wneg.csv", "question,weight\nOne?,-3\n", r"line 2: weight must be a finite number above 0"),
        ("wnan.csv", "question,weight\nOne?,nan\n", r"line 2: weight must be a finite number above 0"),
        ("wtext.jsonl", '{"question": "One?", "weight": "lots"}\n', r"line 1: weight 'lots' is not a number"),
        ("wbool.jsonl", '{"question": "One?", "weight": true}\n', r"line 1: weight True is not a number"),
        ("hz.csv", "question,horizon_days\nOne?,30.5\n", r"line 2: horizon_days '30.5' is not a whole number"),
        ("hz0.jsonl", '{"question": "One?", "horizon_days": 0}\n', r"line 1: horizon_days must be above 0"),
        # A misspelt known column is refused, naming the column it probably means.
        ("misspelt.csv", "question,wieght\nOne?,3\n", r"line 1: column 'wieght' looks like a misspelling of 'weight'"),
        ("misspelt_header_only.csv", "question,wieght\n", r"line 1: column 'wieght' looks like a misspelling"),
        ("late_header.csv", "\n\nquestion,wieght\nOne?,1\n", r"line 3: column 'wieght' looks like a misspelling"),
        ("qestion.csv", "id,qestion\n1,One?\n", r"line 1: column 'qestion' looks like a misspelling of 'question'"),
        (
            "misspelt.jsonl",
            '{"question": "One?"}\n{"question": "Two?", "ownr": "x"}\n',
            r"line 2: column 'ownr' looks like a misspelling of 'owner'",
        ),
        ("noquestion.csv", "id,owner\n1,Billing\n", r"line 1: the header needs a 'question' column"),
        ("emptyq.csv", "id,question\n1,\n", r"line 2: empty question"),
        ("extra.csv", "question,owner\nOne?,Billing,surplus\n", r"line 2: 3 fields but the header has 2"),
        ("dupcol.csv", "question,Question\nOne?,Two?\n", r"line 1: column 'question' appears twice"),
        ("emptycol.csv", "question,,weight\nOne?,,1\n", r"line 1: empty column name in the header"),
        ("badjson.jsonl", '{"question": "One?"}\n{"question": \n', r"line 2: not valid JSON"),
        ("array.jsonl", '["One?"]\n', r"line 1: expected a JSON object, got list"),
        ("empty.txt", "", r"no questions found"),
        ("blank.txt", "\n  \n# only a comment\n", r"no questions found"),
        ("header_only.csv", "question,weight\n", r"no questions found"),
        ("empty.jsonl", "", r"no questions found"),
    ],
)
def test_bad_question_files(tmp_path, name, content, message):
    path = write(tmp_path, name, content)
    with pytest.raises(InputError, match=message) as info:
        load_questions(path)
    text = str(info.value)
    assert text.startswith(repr(str(path)) + ": ") and "\n" not in text


def test_missing_file_and_folder(tmp_path):
    with pytest.raises(InputError, match=r"file not found") as info:
        load_questions(tmp_path / "nope.csv")
    assert str(info.value).startswith(repr(str(tmp_path / "nope.csv")))
    with pytest.raises(InputError, match=r"is a folder"):
        load_questions(tmp_path)


def test_undecodable_file_names_the_line(tmp_path):
    # Latin-1 "é" (0xE9) on line 3 is not valid UTF-8 (RFC 3629 §3: 0xE9 must start a 3-byte form).
    path = write(tmp_path, "latin1.txt", "One?\nTwo?\nCaf\xe9 hours?\n".encode("latin-1"))
    with pytest.raises(InputError, match=r"line 3: not valid UTF-8 \(byte 0xe9\)"):
        load_questions(path)


# --- storing --------------------------------------------------------------------------------------


def test_store_questions_replaces_the_set_in_one_transaction(tmp_path):
    store = Store(tmp_path / "audit.db")
    first = [Question("a", "One?", "Billing", "pay", 2.0, 30), Question("b", "Two?")]
    assert store_questions(store, first, "set.csv") == 2
    assert store_questions(store, [Question("x", "Other?")], "other.csv") == 1
    assert stored_questions(store, "set.csv") == first
    second = [Question("c", "Three?")]
    store_questions(store, second, "set.csv")
    assert stored_questions(store, "set.csv") == second
    assert stored_questions(store, "other.csv") == [Question("x", "Other?")]
    # A failing write (duplicate position is impossible, so break the schema's NOT NULL instead)
    # leaves the previous set in place.
    with pytest.raises(sqlite3.IntegrityError):
        store_questions(store, [Question("d", None)], "set.csv")  # type: ignore[arg-type]
    assert stored_questions(store, "set.csv") == second
    store.close()


def test_extra_columns_are_kept_with_one_warning_line(tmp_path):
    path = write(
        tmp_path, "team.csv", "id,question,notes,URL,channel\nq1,One?,ask Dana,https://x.example/a,chat\nq2,Two?,,,\n"
    )
    warnings: list[str] = []
    questions, summary = read_question_file(path, warn=warnings.append)
    assert summary is None
    assert questions == [
        Question("q1", "One?", extra=(("notes", "ask Dana"), ("url", "https://x.example/a"), ("channel", "chat"))),
        Question("q2", "Two?", extra=(("notes", ""), ("url", ""), ("channel", ""))),
    ]
    assert warnings == [
        f"{str(path)!r}: kept columns 'notes', 'url', 'channel' as they are "
        "(known columns: id, question, owner, topic, weight, horizon_days)"
    ]
    # JSON Lines: other keys too, numbers as JSON text; and a known column that is also spelt right
    # stays a kept column ("questions" beside "question").
    lines = write(tmp_path, "team.jsonl", '{"question": "One?", "rank": 3, "questions": "x"}\n')
    assert load_questions(lines) == [Question("q-001", "One?", extra=(("rank", "3"), ("questions", "x")))]
