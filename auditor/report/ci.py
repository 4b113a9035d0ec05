"""Outputs for CI servers and chat: junit.xml (JUnit XML) and summary.md (Markdown), docs/ci.md.

Both are written from the run alone, like the rest of the report, and only when asked for
(`[report] outputs`, or `--outputs` on the command line).

junit.xml: one test suite per owner, one test case per question. A gap fails (`<failure type="gap">`);
a stale question fails too (`type="stale"`), or is reported as skipped when `[report] stale_in_junit
= "skip"`; a supported question passes. Each suite's `<properties>` hold, per question,
`<id>.support` (the support its verdict rests on) and `<id>.evidence` (the deciding passage, or the
best one for a gap) — the JUnit schema CI servers read (tests/data/junit-10.xsd) has properties on
suites only, not on test cases. Each test case's `<system-out>` holds its explanation. Characters
XML 1.0 cannot carry (control characters) are dropped.

summary.md: the headline figures as a table, the release-limits line, the new gaps since the last
run (heaviest first, at most SUMMARY_GAPS rows) and the caution that the audit is advisory. Text
from questions is escaped so that it shows as written and cannot add markup.
"""

from __future__ import annotations

import re

from lxml import etree

from auditor.judgement.explain import deciding_evidence
from auditor.models import VERDICTS
from auditor.report.exports import best_evidence, question_owner, slugify
from auditor.results import Evidence, QuestionResult, Run

SUMMARY_GAPS = 20  # new gaps listed in summary.md; the rest are in gaps.csv
# XML 1.0 §2.2 Char: tab, line feed, carriage return and everything from U+0020 but surrogates,
# U+FFFE and U+FFFF.
_NOT_XML = re.compile("[^\t\n\r\u0020-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")
# CommonMark §2.4: any ASCII punctuation may be backslash-escaped; these can start markup inside a
# line (emphasis, code, links, images, strikethrough, table cells). Text here never starts a line.
_MARKDOWN_SPECIAL = re.compile(r"([\\`*_\[\]|~!])")


def _x(text: object) -> str:
    return _NOT_XML.sub("", "" if text is None else str(text))


def _where(e: Evidence | None) -> str:
    if e is None:
        return "no passage retrieved"
    s = e.document + (f" › {e.section}" if e.section else "")
    return s + (f" (as of {e.as_of})" if e.as_of else " (undated)")


def _figure(value: float) -> str:
    return f"{value:.4f}".rstrip("0").rstrip(".") if value else "0"


def junit_xml(run: Run, *, stale: str = "fail") -> bytes:
    """junit.xml of `run` (see the module docstring); `stale` is "fail" or "skip"."""
    info = run.info
    title = info.title or "Knowledge base"
    by_owner: dict[str, list[QuestionResult]] = {}
    for q in run.questions:
        by_owner.setdefault(question_owner(q), []).append(q)
    failing = {"gap"} | ({"stale"} if stale == "fail" else set())
    root = etree.Element(
        "testsuites",
        name=_x(f"corpus audit: {title}, {info.as_of}"),
        tests=str(len(run.questions)),
        failures=str(sum(q.verdict in failing for q in run.questions)),
        errors="0",
    )
    for owner in sorted(by_owner):
        questions = by_owner[owner]
        suite = etree.SubElement(
            root,
            "testsuite",
            name=_x(owner),
            tests=str(len(questions)),
            failures=str(sum(q.verdict in failing for q in questions)),
            errors="0",
            skipped=str(sum(q.verdict == "stale" and stale == "skip" for q in questions)),
            timestamp=_x(info.finished or info.started),
        )
        properties = etree.SubElement(suite, "properties")
        for name, value in (("audit.as_of", info.as_of), ("audit.run", info.id)):
            etree.SubElement(properties, "property", name=name, value=_x(value))
        for q in questions:
            e = deciding_evidence(q) or best_evidence(q)
            etree.SubElement(properties, "property", name=_x(f"{q.id}.support"), value=_figure(q.support))
            etree.SubElement(properties, "property", name=_x(f"{q.id}.evidence"), value=_x(_where(e)))
        for q in questions:
            case = etree.SubElement(
                suite, "testcase", name=_x(f"{q.id}: {q.question}"), classname=f"corpus-audit.{slugify(owner)}"
            )
            message = _x(q.explanation)
            if q.verdict in failing:
                failure = etree.SubElement(case, "failure", type=q.verdict, message=message)
                failure.text = _x(f"{q.verdict}: {q.action or ''} {', '.join(q.reasons)}".strip())
            elif q.verdict == "stale":
                etree.SubElement(case, "skipped", type="stale", message=message)
            out = etree.SubElement(case, "system-out")
            out.text = _x(f"verdict {q.verdict}; support {_figure(q.support)}; evidence {_where(e)}\n{q.explanation}")
    return etree.tostring(root, xml_declaration=True, encoding="UTF-8", pretty_print=True)


def markdown_text(text: object) -> str:
    """Text that shows literally in Markdown: punctuation escaped, `<` `>` `&` as character references."""
    plain = " ".join(str(text or "").split())
    plain = plain.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
    return _MARKDOWN_SPECIAL.sub(r"\\\1", plain)


def _pct(value: float | None) -> str:
    return "–" if value is None else f"{value * 100:.1f}%"


def summary_markdown(run: Run) -> str:
    """summary.md of `run` (see the module docstring)."""
    info, s = run.info, run.summary
    title = markdown_text(info.title or "Knowledge base")
    lines = [
        f"## Corpus audit: {title}, {info.as_of}",
        "",
        f"Run {info.id}; {info.corpus.documents} documents, {info.corpus.passages} passages, "
        f"{info.corpus.failed} failed to read; default freshness horizon {info.horizon_days} days.",
        "",
        "| questions | " + " | ".join(VERDICTS) + " | fallback exposure | stale exposure |",
        "|---:|" + "---:|" * len(VERDICTS) + "---:|---:|",
        f"| {s.questions} | "
        + " | ".join(str(getattr(s, v)) for v in VERDICTS)
        + f" | {_pct(s.fallback_exposure)} | {_pct(s.stale_exposure)} |",
        "",
    ]
    if run.gate is not None:
        lines += [f"**{markdown_text(run.gate.message)}**", ""]
    diff = run.diff
    if diff is None:
        gaps = sorted((q for q in run.questions if q.verdict == "gap"), key=lambda q: -q.weight)
        heading = "Gaps (no earlier run to compare with)"
        rows = [(q.id, q.question, question_owner(q), q.weight) for q in gaps]
    else:
        new = sorted([*diff.new_gaps, *(i for i in diff.added if i.after == "gap")], key=lambda i: -i.weight)
        heading = f"New gaps since run {diff.base_run} ({diff.base_as_of})"
        rows = [(i.id, i.question or "", i.owner or "unassigned", i.weight) for i in new]
    lines.append(f"### {heading}: {len(rows)}")
    lines.append("")
    if rows:
        lines += ["| id | question | owner | weight |", "|---|---|---|---:|"]
        for qid, text, owner, weight in rows[:SUMMARY_GAPS]:
            lines.append(f"| {markdown_text(qid)} | {markdown_text(text)} | {markdown_text(owner)} | {weight:g} |")
        if len(rows) > SUMMARY_GAPS:
            lines += ["", f"{len(rows) - SUMMARY_GAPS} more in gaps.csv."]
        lines.append("")
    lines.append(
        "The audit is advisory: automated checks of support and freshness do not replace the content owner's review."
    )
    return "\n".join(lines) + "\n"
