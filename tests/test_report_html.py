"""Structure of the HTML report, parsed with BeautifulSoup (lxml) and checked against results.json."""

from __future__ import annotations

import base64
import colorsys
import hashlib
import json
import os
import re

import pytest
from bs4 import BeautifulSoup
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from auditor import models
from auditor.report import html as report_html
from auditor.report import write_report
from auditor.report.charts import age_histogram, trend, verdicts_by_owner
from tests import report_samples as samples


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    out = tmp_path_factory.mktemp("report")
    index = write_report(samples.sample_run(), out)
    results = json.loads((out / "results.json").read_text(encoding="utf-8"))
    soup = BeautifulSoup(index.read_text(encoding="utf-8"), "lxml")
    return out, soup, results


def figure(soup, key):
    node = soup.select_one(f'[data-figure="{key}"] data')
    assert node is not None, key
    return node["value"]


def page_data(soup):
    return json.loads(soup.find("script", id="report-data").string)


def test_write_report_returns_index_and_writes_every_file(report):
    out, _, results = report
    names = sorted(p.relative_to(out).as_posix() for p in out.rglob("*") if p.is_file())
    owners = [
        "billing",
        "conservation-programs",
        "customer-care",
        "field-operations",
        "unassigned",
        "water-quality",
        "web-team-img-src-x-onerror-window-pwned-owner",
    ]
    expected = sorted(
        ["index.html", "results.json", "gaps.csv"]
        + [f"owners/{o}.csv" for o in owners]
        + [f"owners/{o}.html" for o in owners]
    )
    assert names == expected  # and no temporary file is left behind


def test_headline_figures_equal_results_json(report):
    _, soup, results = report
    summary, corpus = results["summary"], results["run"]["corpus"]
    for key in ("questions", "supported", "stale", "gap"):
        assert int(figure(soup, key)) == summary[key]
    for key in ("fallback_exposure", "stale_exposure"):
        assert float(figure(soup, key)) == pytest.approx(summary[key])
    assert float(figure(soup, "freshness")) == pytest.approx(corpus["freshness"])
    assert float(figure(soup, "mean_age_days")) == pytest.approx(corpus["mean_age_days"])
    # Shown text agrees with the machine value: 3 gaps of 13 questions, 27.6 % fallback exposure.
    assert (
        soup.select_one('[data-figure="fallback_exposure"] data').get_text()
        == f"{summary['fallback_exposure'] * 100:.1f}%"
    )
    assert (
        soup.select_one('[data-figure="gap"] .note').get_text()
        == f"{summary['gap'] / summary['questions'] * 100:.1f}% of questions"
    )


def test_header_facts_equal_results_json(report):
    _, soup, results = report
    run = results["run"]
    assert soup.h1.get_text(" ", strip=True) == run["title"]
    assert soup.select_one('[data-field="as_of"]')["datetime"] == run["as_of"]
    assert int(soup.select_one('[data-field="horizon_days"]')["value"]) == run["horizon_days"]
    for key in ("documents", "passages", "failed"):
        assert int(soup.select_one(f'[data-field="{key}"]')["value"]) == run["corpus"][key]
    assert float(soup.select_one('[data-field="support_threshold"]')["value"]) == run["thresholds"]["support"]


def test_question_table_has_one_row_per_question_in_order(report):
    _, soup, results = report
    rows = soup.select("#questions > tbody > tr")
    assert [r.select_one(".qid").get_text() for r in rows] == [q["id"] for q in results["questions"]]
    for row, q in zip(rows, results["questions"]):
        cells = row.find_all("td", recursive=False)
        badge = cells[4].select_one(".v")
        # WCAG 2.1 §1.4.1: colour is not the only cue. The badge shows its glyph and its word.
        glyph = badge.select_one(".glyph")
        assert glyph["aria-hidden"] == "true" and glyph.get_text() == report_html.VERDICT_GLYPHS[q["verdict"]]
        assert badge.get_text() == f"{glyph.get_text()} {q['verdict']}"
        assert cells[3].get_text() == report_html._num(q["weight"])
        assert (cells[6].get_text() or None) == q["action"]
    # Owner rule: own owner, else best evidence's owner, else "unassigned".
    owners = {r.select_one(".qid").get_text(): r.find_all("td", recursive=False)[1].get_text() for r in rows}
    assert owners["q-001"] == "Billing"
    assert owners["q-003"] == "Conservation Programs"  # from its supporting evidence
    assert owners["q-010"] == "unassigned"  # no owner, no evidence


def test_rows_explain_without_javascript(report):
    _, soup, _ = report
    row = soup.select_one("#q1")  # q-002, the autopay gap
    why = row.select_one("details .why")
    assert "No passage supports this question" in why.p.get_text()
    assert [c.get_text() for c in why.select(".chip.miss")] == ["autopay"]
    assert why.select_one(".act").get_text().startswith("Write:")
    stale = soup.select_one("#q2 details .why")  # q-003 expired rebate
    assert stale.select_one(".act").get_text().startswith("Retire:")
    assert "its validity window closed" in stale.p.get_text()
    flags = [c.get_text() for c in soup.select("#q7 .flags .chip")]  # q-008
    assert flags == ["weak", "file_dated"]


def test_hostile_strings_show_literally_and_add_no_markup(report):
    _, soup, results = report
    # Only our two script elements exist: the JSON data block and the page script.
    scripts = soup.find_all("script")
    assert [s.get("type") for s in scripts] == ["application/json", None]
    assert scripts[1].string == report_html._static()[1]
    assert soup.find_all("img") == []
    assert not any(a.get("href", "").strip().lower().startswith("javascript:") for a in soup.find_all("a"))
    assert not [(t.name, k) for t in soup.find_all(True) for k in t.attrs if k.lower().startswith("on")]
    q11 = soup.select_one("#q10 summary").get_text()
    assert samples.HOSTILE_SCRIPT in q11 and samples.HOSTILE_IMG in q11
    q12 = soup.select_one("#q11 summary").get_text()
    assert samples.HOSTILE_TEMPLATE in q12 and samples.HOSTILE_LINK in q12 and samples.HOSTILE_CLOSE in q12
    owners = [o.get_text() for o in soup.select("#f-owner option")]
    assert samples.HOSTILE_OWNER in owners
    assert [h.get_text() for h in soup.select(".brief h3")][-1] == f"Brief {samples.HOSTILE_SCRIPT}"
    failed = [li.get_text() for li in soup.select("#inv-failed li")]
    assert any(samples.HOSTILE_CLOSE in f for f in failed)
    # The chart labels the hostile owner as text, inside the SVG.
    titles = [t.get_text() for t in soup.select("svg title")]
    assert any(samples.HOSTILE_OWNER in t for t in titles)
    # The data block survives the hostile passage text exactly.
    data = page_data(soup)
    assert data["p"]["700"]["txt"].startswith("Pay online " + samples.HOSTILE_LINK)


def test_script_json_escapes_everything_that_could_end_the_block():
    value = {"t": "</script><!-- <script> & \u2028 \u2029 >"}
    text = str(report_html.script_json(value))
    assert not set("<>&\u2028\u2029") & set(text)
    assert json.loads(text) == value


def test_content_security_policy_allows_only_the_page_script_and_style(report):
    _, soup, _ = report
    csp = soup.find("meta", attrs={"http-equiv": "Content-Security-Policy"})["content"]
    directives = dict(d.strip().split(" ", 1) for d in csp.split(";"))
    assert directives["default-src"] == "'none'"

    def digest(text):
        return "'sha256-" + base64.b64encode(hashlib.sha256(text.encode()).digest()).decode() + "'"

    assert directives["script-src"] == digest(soup.find_all("script")[1].string)
    assert directives["style-src"] == digest(soup.style.string)
    # Nothing is loaded from outside: no src, no stylesheet links.
    assert not soup.find_all(src=True)
    assert not soup.find_all("link")


def test_output_is_deterministic(tmp_path):
    a, b = tmp_path / "a", tmp_path / "b"
    write_report(samples.sample_run(), a)
    write_report(samples.sample_run(), b)
    files = sorted(p.relative_to(a) for p in a.rglob("*") if p.is_file())
    assert files == sorted(p.relative_to(b) for p in b.rglob("*") if p.is_file())
    for rel in files:
        assert (a / rel).read_bytes() == (b / rel).read_bytes(), rel


def test_a_failed_render_leaves_the_previous_report_intact(tmp_path, monkeypatch):
    write_report(samples.sample_run(), tmp_path)
    before = (tmp_path / "index.html").read_bytes()

    def broken(view):
        raise RuntimeError("disk full")

    monkeypatch.setattr("auditor.report.render_page", broken)
    with pytest.raises(RuntimeError):
        write_report(samples.sample_run(), tmp_path)
    assert (tmp_path / "index.html").read_bytes() == before
    assert not [p for p in tmp_path.rglob("*") if p.name.endswith(".tmp")]


def test_files_are_readable_by_others(tmp_path):
    write_report(samples.sample_run(), tmp_path)
    mask = os.umask(0o022)
    os.umask(mask)
    assert (tmp_path / "index.html").stat().st_mode & 0o777 == 0o666 & ~mask


def test_charts_match_the_run(report):
    _, soup, results = report
    svgs = soup.select("svg.chart")
    assert len(svgs) == 3  # owners, age, trend (history has 3 runs)
    bars = svgs[0]
    # Billing: 3 questions, 2 stale + 1 gap, drawn as two segments in that order.
    segs = [r for r in bars.find_all("rect") if r.title and r.title.get_text().startswith("Billing:")]
    assert [s.title.get_text() for s in segs] == ["Billing: 2 stale", "Billing: 1 gap"]
    assert float(segs[0]["width"]) == pytest.approx(2 * float(segs[1]["width"]), abs=0.2)
    trend_points = svgs[2].find_all("circle")
    assert len(trend_points) == 3 * (len(results["history"]) + 1)  # earlier runs and this one
    labels = [t.get_text() for t in svgs[2].select("text.axis") if re.match(r"\d{4}-", t.get_text())]
    assert labels == [h["as_of"] for h in results["history"]] + [results["run"]["as_of"]]


def test_age_histogram_counts_and_horizon():
    svg = BeautifulSoup(str(age_histogram([0, 10, 200, 400, 800], 365, undated=2)), "lxml")
    bars = [r for r in svg.find_all("rect") if r.title]  # (legend swatches have no title)
    assert sum(int(b.title.get_text().rsplit(": ", 1)[1]) for b in bars) == 5
    line = svg.select_one("line.horizon")
    # Bins of 365/6 days (at most 16 bins over 0..800): 14 bins, the horizon on the edge of the 7th.
    assert len(bars) == 14
    assert float(line["x1"]) == pytest.approx(float(bars[6]["x"]) - 1, abs=0.1)
    assert [b.title.get_text().split(" days")[0] for b in bars[5:7]] == ["304–364", "365–425"]
    stale = [b for b in bars if "v-stale" in b["class"]]
    assert sum(int(b.title.get_text().rsplit(": ", 1)[1]) for b in stale) == 2  # 400 and 800
    assert "2 undated" in svg.get_text()


def test_trend_absent_without_history(tmp_path):
    run = samples.sample_run()
    run.history = []
    soup = BeautifulSoup(write_report(run, tmp_path).read_text(encoding="utf-8"), "lxml")
    assert len(soup.select("svg.chart")) == 2
    assert trend([{"label": "a", "supported_share": 0.5, "stale_exposure": 0.1, "fallback_exposure": 0.2}])


def test_verdicts_by_owner_merges_the_long_tail():
    counts = {f"owner {i:02d}": {"gap": 1} for i in range(20)}
    svg = BeautifulSoup(str(verdicts_by_owner(counts)), "lxml")
    labels = [t.contents[0].strip() for t in svg.select("text.label")]
    assert len(labels) == 14 and labels[-1] == "7 other owners"


def test_diff_and_gate_are_shown(report):
    _, soup, results = report
    # One line of figures against their ceilings, breached ones first and marked in words.
    line = soup.select_one("#limits")
    assert line.select_one('[data-field="within"]').get_text() == "breached"
    shown = [(x["data-figure"], x.get_text(), "over" in x["class"]) for x in line.select(".lim")]
    checks = sorted(results["limits"]["checks"], key=lambda c: c["within"])
    assert [(f, over) for f, _, over in shown] == [(c["figure"], not c["within"]) for c in checks]
    assert all(text.startswith("over: ") == over for _, text, over in shown)
    assert shown[0][1] == "over: fallback exposure 0.28 (ceiling 0.25)"
    assert soup.select_one("section.gate") is None and soup.select_one(".gate-table") is None
    diff = results["diff"]
    groups = [g["data-diff"] for g in soup.select("[data-diff]")]
    assert groups == ["new_gaps", "newly_stale", "resolved_gaps", "refreshed", "added", "removed"]
    for key in groups:
        group = soup.select_one(f'[data-diff="{key}"]')
        assert int(group.select_one(".count").get_text()) == len(diff[key]) == diff["counts"][key]
        assert [li.select_one(".qid").get_text() for li in group.select("li")] == [i["id"] for i in diff[key]]
    stale = soup.select_one('[data-diff="newly_stale"] li')
    assert stale.select_one(".change").get_text() == "supported → stale"
    assert soup.select_one("section[aria-labelledby=diff-h] .lead").get_text() == diff["summary"]


def test_briefs_link_to_their_questions(report):
    _, soup, _ = report
    first = soup.select(".brief")[0]
    assert first.h3.get_text() == "autopay (payments)"  # highest weight first
    link = first.select_one("a")
    assert link["href"] == "#q1" and soup.select_one("#q1 .qid").get_text() == "q-002"


def test_document_inventory(report):
    _, soup, results = report
    oldest = [tr.td.get_text() for tr in soup.select("#inv-oldest tbody tr")]
    assert oldest[:2] == ["quality/annual-report-2019.pdf", "field/leaks-2021.md"]
    assert [li.contents[0].strip() for li in soup.select("#inv-undated li")] == ["care/start-stop-old.txt"]
    assert [li.contents[0].strip() for li in soup.select("#inv-expired li")] == ["conservation/toilet-rebate.html"]
    failed = [li.contents[0].strip().rstrip(":") for li in soup.select("#inv-failed li")]
    assert failed == ["quality/scan.pdf", "web/broken.html"]
    scan = soup.select("#inv-failed li")[0]
    assert [c.get_text() for c in scan.select(".chip")] == ["encrypted"]
    assert scan.select_one(".err").get_text() == "encrypted PDF, no password given"
    counts = {d["data-count"]: int(d.data["value"]) for d in soup.select(".inv-counts [data-count]")}
    assert counts["documents"] == len(results["documents"])
    assert counts["removed"] == 1 and counts["failed"] == 2


def test_caution_and_accessibility_basics(report):
    _, soup, _ = report
    caution = soup.select_one("aside.caution")
    assert "advisory" in caution.get_text() and "responsible authority" in caution.get_text()
    assert soup.html["lang"] == "en"
    assert soup.find("header") and soup.find("main") and soup.find("footer")
    assert len(soup.find_all("h1")) == 1
    # Heading levels never skip downwards (h1 → h2 → h3).
    levels = [int(h.name[1]) for h in soup.find_all(re.compile(r"^h[1-6]$"))]
    assert all(b - a <= 1 for a, b in zip(levels, levels[1:]))
    for control in soup.select("#filters select, #filters input"):
        assert control.find_parent("label") is not None
    for row in soup.select("#questions > tbody > tr"):
        assert row.select_one("td details > summary") is not None
    for svg in soup.select("svg.chart"):
        assert svg["role"] == "img" and svg["aria-label"]


def test_owner_page_holds_only_that_owner(report):
    out, _, results = report
    soup = BeautifulSoup((out / "owners" / "field-operations.html").read_text(encoding="utf-8"), "lxml")
    ids = [q.get_text() for q in soup.select("#questions > tbody .qid")]
    assert ids == ["q-004", "q-009"]  # q-004 through its evidence's owner
    assert int(figure(soup, "questions")) == 2 and int(figure(soup, "supported")) == 1
    assert float(figure(soup, "stale_exposure")) == pytest.approx(12 / 82)
    docs = [tr.td.get_text() for tr in soup.select("#inv-oldest tbody tr")]
    assert sorted(docs) == ["field/alder-street-main.txt", "field/leaks-2021.md", "field/leaks.md"]
    assert soup.select_one("section.gate") is None  # the gate is about the whole release
    assert {a["href"] for a in soup.select(".links a")} == {"../index.html", "field-operations.csv", "../results.json"}
    index = BeautifulSoup((out / "index.html").read_text(encoding="utf-8"), "lxml")
    row = next(tr for tr in index.select("#owners tbody tr") if tr.td.get_text() == "Field Operations")
    cells = [td.get_text() for td in row.find_all("td")]
    assert cells[1:6] == ["2", "1", "1", "0", "12"]  # questions, supported, stale, gap, weight at risk
    assert [a["href"] for a in row.select("a")] == ["owners/field-operations.html", "owners/field-operations.csv"]


def test_page_evidence_is_short_and_highlighted(report):
    _, soup, results = report
    data = page_data(soup)
    q1 = data["q"][0]
    assert q1["k"] == ["bill", "pay", "payment", "phone"]  # terms scored in its evidence
    key, rank, score, support, ok, fresh, reasons, contrib, coded, signals, found, horizon = q1["e"][0]
    assert data["H"][horizon] == "the 365-day horizon (the default horizon)"
    assert (key, rank, score, support, ok, fresh) == ("213", 1, 11.92, 0.71, 1, 0)
    assert [data["R"][r] for r in reasons] == ["too_old"]
    assert contrib == [2.7, 3.1, 0.0, 6.12]
    assert data["sk"] == ["bm25", "coverage", "window"] and "sk" not in q1  # page-wide names
    assert signals == [round(x, 2) for x in (0.71 * 0.6, 0.71 * 1.2, 0.71)] and found == 1
    assert "h" not in q1 and data["q"][12]["h"] == 180  # only q-013 overrides the horizon
    text, marked, end = data["p"][key]["txt"], [], 0
    for gap, length in zip(coded[::2], coded[1::2]):
        start = end + gap
        end = start + length
        marked.append(text[start:end])
    # Snowball stems "payment" to "payment", not "pay": only the words whose token matched are marked.
    assert marked == ["pay", "bill", "phone", "phone"]


def test_highlight_ranges_count_utf16_units():
    hl = report_html.Highlighter()
    text = "💧 water pay 💧 paying"
    ranges = hl.ranges(text, ["pay"])
    # JavaScript counts 💧 (U+1F4A7) as two code units: "pay" starts at 2+1+5+1 = 9.
    assert ranges == [9, 12, 16, 22]


def test_large_run_stays_under_the_page_limit(tmp_path):
    run = samples.large_run(10_000)
    index = write_report(run, tmp_path)
    size = index.stat().st_size
    assert size < 15_000_000, size
    soup = BeautifulSoup(index.read_text(encoding="utf-8"), "lxml")
    # The first SERVER_ROWS rows are HTML; the script builds the rest from the data block.
    rows = soup.select("#questions > tbody > tr")
    assert len(rows) == report_html.SERVER_ROWS
    assert [r.select_one(".qid").get_text() for r in rows[-2:]] == ["L00998", "L00999"]
    assert int(figure(soup, "questions")) == 10_000
    assert "first 1000 of 10000 questions" in soup.select_one("#rows-note").get_text()
    data = page_data(soup)
    assert len(data["q"]) == 10_000 and data["server_rows"] == 1000
    assert len(data["x"]) == 9_000 and data["x"][0]["id"] == "L01000"
    assert data["x"][0]["q"] == run.questions[1000].question
    assert all(len(q["e"]) == 3 for q in data["q"])  # top 3 evidence items fit in the page
    assert all(len(p["txt"]) <= report_html.PASSAGE_CHARS + 2 for p in data["p"].values())
    # results.json keeps every evidence item with its full text.
    results = json.loads((tmp_path / "results.json").read_text(encoding="utf-8"))
    passages = {p["id"]: p for p in results["passages"]}
    assert passages[results["questions"][0]["evidence"][0]["passage"]]["text"] == run.questions[0].evidence[0].text


def test_a_bare_format1_run_renders(tmp_path):
    """Only the keys every format-1 run has (an older stored run): no documents, briefs, history, diff,
    gate, flags, terms or statements. The page still renders, with the figures of the summary."""
    run = samples.bare_run()
    index = write_report(run, tmp_path)
    soup = BeautifulSoup(index.read_text(encoding="utf-8"), "lxml")
    assert float(figure(soup, "fallback_exposure")) == pytest.approx(2 / 3)
    assert figure(soup, "freshness") == ""  # not in this run: shown as a dash, no value
    assert soup.select_one('[data-figure="freshness"] data').get_text() == "–"
    assert len(soup.select("svg.chart")) == 2  # no history, no trend
    assert soup.select_one("section.gate") is None and soup.select_one("#diff-h") is None
    assert [li.contents[0].strip().rstrip(":") for li in soup.select("#inv-failed li")] == ["scan.pdf"]
    assert soup.h1.get_text() == "Knowledge base"  # no title in the run
    assert soup.select_one("#rows-note") is None  # every row is in the HTML
    assert sorted(p.name for p in (tmp_path / "owners").iterdir()) == [
        "billing.csv",
        "billing.html",
        "unassigned.csv",
        "unassigned.html",
    ]
    data = page_data(soup)
    assert data["q"][0]["e"][0][7] == [] and data["sk"] == []  # no terms, no signals


def _luminance(hex_colour: str) -> float:
    # WCAG 2.1, "relative luminance" (https://www.w3.org/TR/WCAG21/#dfn-relative-luminance).
    rgb = [int(hex_colour[i : i + 2], 16) / 255 for i in (1, 3, 5)]
    lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4 for c in rgb]
    return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]


def _contrast(a: str, b: str) -> float:
    # WCAG 2.1, "contrast ratio" (https://www.w3.org/TR/WCAG21/#dfn-contrast-ratio).
    la, lb = sorted((_luminance(a), _luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def test_text_colours_meet_wcag_aa_contrast():
    css = report_html._static()[0]
    root = css[css.index(":root {") : css.index("}", css.index(":root {"))]
    var = dict(re.findall(r"--([\w-]+):\s*(#[0-9a-fA-F]{6})", root))
    white = "#ffffff"
    pairs = [  # (text, background) as the stylesheet uses them
        (white, var["supported"]),
        (white, var["stale"]),
        (white, var["gap"]),
        (white, var["ink-2"]),
        (var["text"], var["paper"]),
        (var["muted"], var["paper"]),
        (var["muted"], white),
        (var["gap"], var["gap-bg"]),
        (var["stale"], var["stale-bg"]),
        (var["supported"], var["supported-bg"]),
        (var["accent"], white),
        (var["ink"], var["mark"]),
        ("#9fd6d2", var["ink"]),
        ("#b9c8cc", var["ink"]),
    ]
    # WCAG 2.1 success criterion 1.4.3: at least 4.5:1 for normal text.
    low = [(t, b, round(_contrast(t, b), 2)) for t, b in pairs if _contrast(t, b) < 4.5]
    assert low == []
    assert _contrast("#000000", "#ffffff") == pytest.approx(21.0)  # the formula's known maximum


# Any text, including markup, template syntax, quotes and line separators (not NUL or CR, which
# the HTML parser itself rewrites: WHATWG HTML §13.2.3.5 "preprocessing the input stream").
_TEXT = st.text(st.characters(blacklist_categories=("Cs",), blacklist_characters="\x00\r"), max_size=60)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(question=_TEXT, owner=_TEXT, passage=_TEXT)
def test_any_text_shows_literally(tmp_path, question, owner, passage):
    run = samples.bare_run()
    run.questions[0].question = question
    run.questions[0].owner = owner
    run.questions[0].evidence[0].source.text = passage
    index = write_report(run, tmp_path)
    # Python's own parser keeps control characters as the WHATWG tokenizer does; libxml2 drops some.
    soup = BeautifulSoup(index.read_text(encoding="utf-8"), "html.parser")
    assert soup.select_one("#q0 summary").contents[-1] == " " + question
    expected_owner = owner.strip() if owner.strip() and owner.strip() != "unassigned" else "unassigned"
    assert soup.select_one("#q0").find_all("td", recursive=False)[1].get_text() == expected_owner
    assert [s.get("type") for s in soup.find_all("script")] == ["application/json", None]
    data = page_data(soup)
    assert data["p"]["1"]["txt"] == " ".join(passage.split())


def test_palette_is_no_traffic_light_and_draws_no_edge_stripes():
    css = report_html._static()[0]
    root = css[css.index(":root {") : css.index("}", css.index(":root {"))]
    var = dict(re.findall(r"--([\w-]+):\s*(#[0-9a-fA-F]{6})", root))
    hues = {}
    for verdict in models.VERDICTS:
        r, g, b = (int(var[verdict][i : i + 2], 16) / 255 for i in (1, 3, 5))
        hues[verdict] = colorsys.rgb_to_hsv(r, g, b)[0] * 360
    # Common practice, no published bound: green reads 75-165 degrees of hue, red and amber 0-60.
    assert not any(75 <= h <= 165 for h in hues.values()), hues
    assert sum(h <= 60 or h >= 345 for h in hues.values()) <= 1, hues
    # No coloured stripe down the left edge of rows, tiles or cards.
    assert not re.search(r"border-left[^;]*var\(--(supported|stale|gap)", css)
    assert "box-shadow: inset" not in css
