"""junit.xml and summary.md, the outputs for CI servers and chat (auditor/report/ci.py).

junit.xml is validated against the JUnit schema of the Jenkins xUnit plugin (tests/data/junit-10.xsd,
source and MIT licence named in the file), the JUnit format Jenkins and other CI servers read.
summary.md is rendered with markdown-it-py (CommonMark with the GFM table extension, the Markdown
of CI step summaries and chat), and its figures are held against results.json of the same report.
"""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner
from lxml import etree
from markdown_it import MarkdownIt

from auditor.cli import cli
from auditor.report import write_report
from auditor.report.ci import junit_xml, summary_markdown
from auditor.results import Summary
from tests import report_samples as samples
from tests.conftest import REPO, format1_database

SCHEMA = etree.XMLSchema(etree.parse(str(REPO / "tests" / "data" / "junit-10.xsd")))


def validated(data: bytes) -> etree._Element:
    root = etree.fromstring(data)
    SCHEMA.assertValid(root)  # Jenkins xUnit plugin junit-10.xsd
    return root


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    out = tmp_path_factory.mktemp("ci")
    write_report(samples.sample_run(), out, outputs=("junit", "summary"))
    return out, json.loads((out / "results.json").read_text(encoding="utf-8"))


def test_junit_has_one_case_per_question_and_gaps_and_stale_fail(report):
    out, results = report
    root = validated((out / "junit.xml").read_bytes())
    cases = root.findall("testsuite/testcase")
    assert len(cases) == len(results["questions"]) == int(root.get("tests")) == 13
    verdicts = {q["id"]: q["verdict"] for q in results["questions"]}
    failed = {
        c.get("name").split(":")[0]: c.find("failure").get("type") for c in cases if c.find("failure") is not None
    }
    assert failed == {qid: v for qid, v in verdicts.items() if v in ("gap", "stale")}
    assert int(root.get("failures")) == len(failed) == 8 and not root.findall(".//skipped")
    # Suites per owner; each suite's properties hold its questions' support and deciding evidence.
    for suite in root.findall("testsuite"):
        props = {p.get("name"): p.get("value") for p in suite.find("properties")}
        ids = [c.get("name").split(":")[0] for c in suite.findall("testcase")]
        assert int(suite.get("tests")) == len(ids)
        for qid in ids:
            q = next(q for q in results["questions"] if q["id"] == qid)
            assert float(props[f"{qid}.support"]) == pytest.approx(q["support"], abs=5e-5)
            assert props[f"{qid}.evidence"]
    # The explanation travels as the failure message and in system-out.
    gap = next(c for c in cases if c.get("name").startswith("q-002:"))
    assert gap.find("failure").get("message").startswith("No passage supports this question")
    assert "support 0.22" in gap.find("system-out").text


def test_junit_can_report_stale_questions_as_skipped():
    run = samples.sample_run()
    root = validated(junit_xml(run, stale="skip"))
    stale = sum(q.verdict == "stale" for q in run.questions)
    assert len(root.findall(".//skipped")) == stale == 5
    assert int(root.get("failures")) == sum(q.verdict == "gap" for q in run.questions) == 3
    assert sum(int(s.get("skipped")) for s in root.findall("testsuite")) == stale


def test_junit_drops_characters_xml_cannot_carry():
    run = samples.bare_run()
    run.questions[0].question = "Bell\x07 and <b>bold</b> & \x00 more"
    root = validated(junit_xml(run))
    (case,) = [c for c in root.iter("testcase") if c.get("name").startswith("a:")]
    assert case.get("name") == "a: Bell and <b>bold</b> &  more"  # XML 1.0 §2.2: no C0 controls but tab, LF, CR


def rendered(text: str):
    md = MarkdownIt("commonmark").enable("table")
    return md, md.parse(text), md.render(text)


def table_rows(tokens) -> list[list[str]]:
    """Rows of every table in token order, as the inline text of their cells."""
    rows, row = [], None
    for i, tok in enumerate(tokens):
        if tok.type == "tr_open":
            row = []
        elif tok.type in ("th_open", "td_open"):
            row.append("".join(c.content for c in tokens[i + 1].children if c.type == "text"))
        elif tok.type == "tr_close":
            rows.append(row)
    return rows


def test_summary_renders_with_the_figures_of_results_json(report):
    out, results = report
    text = (out / "summary.md").read_text(encoding="utf-8")
    _, tokens, html = rendered(text)
    rows = table_rows(tokens)
    s = results["summary"]
    assert rows[0] == ["questions", "supported", "stale", "gap", "fallback exposure", "stale exposure"]
    assert rows[1] == [
        str(s["questions"]),
        str(s["supported"]),
        str(s["stale"]),
        str(s["gap"]),
        f"{s['fallback_exposure'] * 100:.1f}%",
        f"{s['stale_exposure'] * 100:.1f}%",
    ]
    # The limits line, as the run states it, shown literally (its ">" escaped).
    assert f"<strong>{results['limits']['message'].replace('>', '&gt;')}</strong>" in html
    # New gaps since the last run: the diff's new gaps and the added questions that are gaps.
    new = [i["id"] for i in results["diff"]["new_gaps"]] + [
        i["id"] for i in results["diff"]["added"] if i["after"] == "gap"
    ]
    listed = [r[0] for r in rows[3:]]
    assert rows[2] == ["id", "question", "owner", "weight"] and sorted(listed) == sorted(new) == ["q-012"]
    # Hostile question text shows as text: no tag, no link of its own.
    assert "<script" not in html and "<a href" not in html and "&lt;script&gt;" in html


def test_outputs_are_chosen_by_config_and_flag(tmp_path):
    db = format1_database(tmp_path / "auditor.db")
    config = tmp_path / "audit.toml"
    config.write_text(f'database = "{db.name}"\n[report]\noutputs = ["summary"]\nstale_in_junit = "skip"\n')
    runner = CliRunner()
    plain = runner.invoke(cli, ["report", "-c", str(config), "--out", str(tmp_path / "a")])
    assert plain.exit_code == 0, plain.output
    assert (tmp_path / "a" / "summary.md").is_file() and not (tmp_path / "a" / "junit.xml").exists()
    flagged = runner.invoke(cli, ["report", "-c", str(config), "--out", str(tmp_path / "b"), "--outputs", "junit"])
    assert flagged.exit_code == 0, flagged.output
    assert (tmp_path / "b" / "junit.xml").is_file() and not (tmp_path / "b" / "summary.md").exists()
    root = validated((tmp_path / "b" / "junit.xml").read_bytes())
    assert len(root.findall(".//skipped")) == 2  # the two stale questions of the stored run, by the config
    none = runner.invoke(cli, ["report", "-c", str(config), "--out", str(tmp_path / "c"), "--outputs", "none"])
    assert none.exit_code == 0 and not (tmp_path / "c" / "summary.md").exists()
    bad = runner.invoke(cli, ["report", "-c", str(config), "--outputs", "pdf"])
    assert bad.exit_code == 2 and "unknown output 'pdf'" in bad.output
    # The summary of a run with no earlier one lists its gaps.
    first = runner.invoke(cli, ["report", "-c", str(config), "--run", "1", "--out", str(tmp_path / "d")])
    assert first.exit_code == 0
    text = (tmp_path / "d" / "summary.md").read_text(encoding="utf-8")
    assert "### Gaps (no earlier run to compare with): 2" in text


def test_summary_of_an_empty_run_still_renders():
    run = samples.bare_run()
    run.questions, run.summary = [], Summary.of([])
    _, tokens, _ = rendered(summary_markdown(run))
    assert table_rows(tokens)[1][0] == "0"
