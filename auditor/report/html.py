"""The HTML pages of a run: index.html and owners/<slug>.html, self-contained and safe by construction.

* Jinja2 with autoescape on renders everything a reader sees, so the table reads without JavaScript.
* The page script gets its data as JSON in a ``<script type="application/json">`` block, with ``<``,
  ``>``, ``&``, U+2028 and U+2029 escaped so no text can close the block or break the parser.
* Highlighting is computed here as character ranges over the passage text; the script cuts the text
  at those ranges and builds text nodes and <mark> elements (never innerHTML of document text).
* A Content-Security-Policy meta tag allows only the page's own inline script and style (by
  sha256 hash): nothing is fetched, and an injected script would not run even if escaping failed.
* The page keeps evidence short (top PAGE_EVIDENCE items, passage text cut to a budget) so a run of
  10,000 questions stays under 15 MB; results.json keeps everything. Only the first SERVER_ROWS
  rows are written as HTML; the script builds the others from the data block when shown.

The module is longer than most: the view (`build_view`), the script's data block (`_page_data`) and
the page's sentences are one contract with templates/report.html.j2 and static/report.js, kept
side by side.
"""

from __future__ import annotations

import base64
import hashlib
import json
import re
from datetime import date
from functools import lru_cache
from pathlib import Path

from jinja2 import Environment, FileSystemLoader, select_autoescape
from markupsafe import Markup

from auditor.judgement.explain import explain, horizon_text
from auditor.models import STALE_REASONS, VERDICTS
from auditor.report import charts
from auditor.report.exports import best_evidence, question_owner
from auditor.report.views import _date, _humanize, _num, _pct, _share, diff_view, gate_view, inventory
from auditor.results import (
    Brief,
    Corpus,
    DocumentEntry,
    Evidence,
    HistoryEntry,
    QuestionResult,
    Run,
    RunInfo,
    Summary,
    TokenizerSettings,
)
from auditor.retrieval.tokenize import Tokenizer

HERE = Path(__file__).parent
PAGE_EVIDENCE = 3  # evidence items per question in the page (results.json keeps all)
# Rows written as HTML. Past this the page script builds rows from the data block, a page of rows
# at a time: parsing 10,000 rows of markup alone takes the browser over a second, and readers
# without JavaScript have gaps.csv, the owner pages and results.json for the complete list.
SERVER_ROWS = 1000
# The tokenizer of a run that does not say which it used: config.RetrievalConfig's defaults.
DEFAULT_TOKENIZER = TokenizerSettings(language="english", stopwords="english")
PASSAGE_CHARS = 600  # longest passage text in the page
MIN_PASSAGE_CHARS = 160
PAGE_TEXT_BUDGET = 5_000_000  # characters of passage text in one page, shared by all passages
_WORD = re.compile(r"\w{2,}")
_ASTRAL = re.compile("[\U00010000-\U0010ffff]")

CAUTION = (
    "This audit is advisory. Automated checks of support and freshness do not replace the "
    "content owner's review. Safety-related content — water quality, health, legal — must be "
    "confirmed with the responsible authority, whose official notice prevails."
)

REASON_TEXT = {
    "too_old": "older than the freshness horizon",
    "expired": "its validity window closed before the audit date",
    "overtaken": "it announces a planned event that has since happened",
}
FLAG_TEXT = {
    "stale_competitor": "a stale passage supports it too; the assistant may pick that one",
    "weak": "support is just above the threshold",
    "conflicting_values": "two fresh supporting passages give different values; reconcile them",
    "file_dated": "freshness rests on a file time only",
    "undated": "the supporting passages carry no date at all; check them by hand",
    "no_answer_type": (
        "the best passage lacks the asked-for kind of answer (a date, amount, "
        "duration, name or place), so its support was lowered"
    ),
}


# A shape per verdict, so that colour is never the only cue (WCAG 2.1 §1.4.1): a check for
# supported, a half-filled circle for stale (support there, out of date), an empty one for a gap.
# A verdict added to models.VERDICTS without its own glyph gets a plain bullet.
VERDICT_GLYPHS = {"supported": "✓", "stale": "◐", "gap": "○"}
OTHER_GLYPH = "•"


def _verdict_class(verdict: str) -> str:
    return verdict if verdict in VERDICTS else "other"


def verdict_glyph(verdict: str) -> str:
    return VERDICT_GLYPHS.get(verdict, OTHER_GLYPH)


def badge(verdict: str) -> Markup:
    """The verdict's badge: its glyph (hidden from screen readers, which read the word) and its word."""
    return Markup('<span class="v v-{}"><span class="glyph" aria-hidden="true">{}</span> {}</span>').format(
        _verdict_class(verdict), verdict_glyph(verdict), verdict
    )


def script_json(value) -> Markup:
    """JSON safe inside <script type="application/json">: no `<`, `>`, `&`, U+2028, U+2029 left."""
    text = json.dumps(value, ensure_ascii=False, separators=(",", ":"), sort_keys=False)
    text = (
        text.replace("&", "\\u0026")
        .replace("<", "\\u003c")
        .replace(">", "\\u003e")
        .replace("\u2028", "\\u2028")
        .replace("\u2029", "\\u2029")
    )
    return Markup(text)


def csp_hash(source: str) -> str:
    return "'sha256-" + base64.b64encode(hashlib.sha256(source.encode("utf-8")).digest()).decode() + "'"


@lru_cache(maxsize=1)
def _static() -> tuple[str, str]:
    css = (HERE / "static" / "report.css").read_text(encoding="utf-8")
    js = (HERE / "static" / "report.js").read_text(encoding="utf-8")
    return css, js


@lru_cache(maxsize=1)
def _environment() -> Environment:
    env = Environment(
        loader=FileSystemLoader(str(HERE / "templates")),
        autoescape=select_autoescape(default=True, default_for_string=True),
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
    )
    env.filters.update(pct=_pct, num=_num, verdict_class=_verdict_class, humanize=_humanize, badge=badge)
    return env


class Highlighter:
    """Finds the words of a text whose token (per the run's tokenizer) is one of the matched terms.

    `settings` are the tokenizer settings of the run (`run.tokenizer` when the run carries them,
    else the defaults, which are the project's defaults too).
    """

    def __init__(self, settings: TokenizerSettings | None = None):
        settings = settings or DEFAULT_TOKENIZER
        self._tok: Tokenizer | None
        try:
            self._tok = Tokenizer(settings.language, settings.stopwords)
        except Exception:  # the page still renders, matching words as written
            self._tok = None
        self._cache: dict[str, str] = {}
        self._words: dict[str, list[tuple[int, int, str, str]]] = {}

    def token(self, word: str) -> str:
        hit = self._cache.get(word)
        if hit is None:
            out = self._tok.tokenize(word) if self._tok else [word.casefold()]
            hit = self._cache[word] = out[0] if len(out) == 1 else word.casefold()
        return hit

    def words(self, text: str) -> list[tuple[int, int, str, str]]:
        """(start, end, token, casefolded word) of each word, offsets in UTF-16 code units."""
        hit = self._words.get(text)
        if hit is None:
            spans = [(m.start(), m.end(), m.group()) for m in _WORD.finditer(text)]
            if _ASTRAL.search(text):  # JS strings count astral characters as two units
                units = [0]
                for c in text:
                    units.append(units[-1] + (2 if ord(c) > 0xFFFF else 1))
                spans = [(units[s], units[e], w) for s, e, w in spans]
            hit = self._words[text] = [(s, e, self.token(w), w.casefold()) for s, e, w in spans]
        return hit

    def ranges(self, text: str, terms: list[str]) -> list[int]:
        """Flat [start, end, start, end, ...] of matched words, in UTF-16 code units (as JS counts)."""
        wanted = set(terms)
        if not wanted:
            return []
        return [x for s, e, tok, low in self.words(text) if tok in wanted or low in wanted for x in (s, e)]


def _cut(text: str, limit: int) -> tuple[str, bool]:
    """Cut at a word boundary near `limit` characters."""
    text = " ".join(str(text or "").split())
    if len(text) <= limit:
        return text, False
    cut = text.rfind(" ", 0, limit)
    return text[: cut if cut > limit // 2 else limit].rstrip() + " …", True


# --- explanations (plain text; the template escapes them) -----------------------------------------


def verdict_sentence(q: QuestionResult, run: RunInfo) -> str:
    """The question's explanation (as stored, else built now from its result, judgement/explain.py),
    then what needs a look and the fact-level findings in words."""
    threshold = run.thresholds.support if run.thresholds else None
    s = q.explanation or explain(q, audit_date=run.as_of, threshold=threshold)
    if q.needs_look:
        s += " Needs a look: " + "; ".join(LOOK_TEXT.get(r, r) for r in q.look_reasons) + "."
    return s + _fact_sentence(q)


LOOK_TEXT = {
    "near_threshold": "support is within the weak margin of the threshold",
    "missing_constraint": "the best passage is on the topic but not on the asked-for fact",
}


def _fact_sentence(q: QuestionResult) -> str:
    """The fact-level findings in words: what the best passage lacks, and conflicting values."""
    out = ""
    missing = q.missing_constraint or {}
    lacking = [f"“{t}”" for t in missing.get("terms") or []]
    if missing.get("answer_type"):
        lacking.append(f"a {missing['answer_type']}")
    if lacking:
        out += " The best passage lacks " + " and ".join(lacking) + " from the question."
    if q.conflict:
        values = [f"{v['value']} ({v['document']})" for v in q.conflict.get("values", [])]
        out += " Conflicting values: " + " vs ".join(values) + "; the owner must reconcile them."
    return out


def best_line(q: QuestionResult, best: Evidence | None) -> str | None:
    """Which passage supports a supported question (stale and gap rows name it in their action)."""
    if q.verdict != "supported" or best is None or not best.document:
        return None
    line = "Supported by " + str(best.document)
    if best.section:
        line += " › " + str(best.section)
    if best.as_of:
        line += ", as of " + str(best.as_of)
    return line


def _script_row(row: dict) -> dict:
    """What the script needs to build a row that is not written as HTML (see SERVER_ROWS)."""
    q: QuestionResult = row["q"]
    out = {"id": q.id, "q": q.question, "a": q.action, "y": row["why"]}
    for key, value in (
        ("ac", row["action_text"]),
        ("m", q.missing_terms),
        ("f", [list(f) for f in row["flags"]]),
        ("b", row["best_line"]),
        ("xc", [[k, v] for k, v in q.extra.items()]),
    ):
        if value:
            out[key] = value
    return out


def action_sentence(q: QuestionResult) -> str | None:
    best = best_evidence(q)
    where = best.document if best else None
    if q.action == "write":
        terms = q.missing_terms
        s = "Write: add a passage that answers this question"
        return s + (f", using the words users use ({', '.join(terms)})." if terms else ".")
    if q.action == "refresh":
        return "Refresh: bring " + (where or "the supporting passage") + " up to date and state when it was reviewed."
    if q.action == "retire":
        return (
            "Retire: remove or rewrite "
            + (where or "the supporting passage")
            + "; what it says has expired or been overtaken."
        )
    return None


# --- the view model -------------------------------------------------------------------------------


def _figures(summary: Summary, corpus: Corpus) -> list[dict]:
    n = summary.questions or 0
    figs: list[dict] = [{"key": "questions", "label": "Questions", "value": n, "text": str(n)}]
    for v in VERDICTS:
        c = getattr(summary, v) or 0
        figs.append(
            {
                "key": v,
                "label": v.capitalize(),
                "value": c,
                "text": str(c),
                "note": _pct(_share(c, n)) + " of questions",
                "cls": v,
            }
        )
    figs.append(
        {
            "key": "fallback_exposure",
            "label": "Fallback exposure",
            "value": summary.fallback_exposure,
            "text": _pct(summary.fallback_exposure),
            "note": "weighted share of gap questions",
            "cls": "gap",
        }
    )
    figs.append(
        {
            "key": "stale_exposure",
            "label": "Stale exposure",
            "value": summary.stale_exposure,
            "text": _pct(summary.stale_exposure),
            "note": "weighted share of stale questions",
            "cls": "stale",
        }
    )
    figs.append(
        {
            "key": "freshness",
            "label": "Corpus freshness F",
            "value": corpus.freshness,
            "text": _num(corpus.freshness, 3),
            "note": "share of passages up to date",
        }
    )
    figs.append(
        {
            "key": "mean_age_days",
            "label": "Mean age A",
            "value": corpus.mean_age_days,
            "text": "–" if corpus.mean_age_days is None else f"{_num(corpus.mean_age_days, 1)} d",
            "note": "days out of date, 0 when fresh",
        }
    )
    return figs


def _evidence_ages(questions: list[QuestionResult], audit: date | None) -> tuple[list[int], int]:
    """Age of the youngest supporting passage of each question that has one; undated counted."""
    ages: list[int] = []
    undated = 0
    if audit is None:
        return ages, undated
    for q in questions:
        dated = [_date(e.as_of) for e in q.evidence if e.supporting]
        if not dated:
            continue
        known = [d for d in dated if d is not None]
        if known:
            ages.append(max(0, (audit - max(known)).days))
        else:
            undated += 1
    return ages, undated


def _owner_counts(questions: list[QuestionResult], owners: list[str]) -> dict[str, dict[str, int]]:
    counts: dict[str, dict[str, int]] = {}
    for q, owner in zip(questions, owners):
        c = counts.setdefault(owner, {})
        c[q.verdict] = c.get(q.verdict, 0) + 1
    return counts


def _trend_points(run: Run) -> list[dict]:
    entries = list(run.history)
    current = HistoryEntry(id=run.info.id, as_of=run.info.as_of, summary=run.summary)
    if not entries or entries[-1].id != current.id:
        entries.append(current)
    points = []
    for e in entries:
        s = e.summary
        points.append(
            {
                "label": str(e.as_of or e.id or ""),
                "supported_share": _share(s.supported or 0, s.questions or 0),
                "stale_exposure": s.stale_exposure,
                "fallback_exposure": s.fallback_exposure,
            }
        )
    return points


def _page_data(
    questions: list[QuestionResult],
    owners_of: list[str],
    owner_index: dict[str, int],
    topic_index: dict[str, int],
    horizon: int | None,
    *,
    page_evidence: int,
    text_budget: int,
    highlighter: Highlighter,
) -> dict:
    """What the page script needs: filter keys per row and short evidence; passages deduplicated.

    Per question: {"v": verdict, "o": owner index, "t": topic index (-1: none), "w": weight,
    "s": support, "k": the terms scored in its evidence, "e": evidence, and only when they differ
    from the page-wide value: "h" horizon days, "sk" support signal names, "at" the kind of answer
    asked for}. Each evidence item is the array [passage key, rank, BM25 score, support,
    supporting 0/1, fresh 0/1, reasons (indexes into "R"), contribution of each term of "k",
    highlights, value of each support signal of "sk", answer type found 1/0/null, the horizon it
    was judged with (index into "H", the horizons named with their source; -1: not recorded)]. Highlights
    are delta-coded [gap, length, gap, length, ...] in UTF-16 code units, each gap counted from
    the previous end. Passages ("p") are keyed by passage id. The shape keeps a 10,000-question
    page small.
    """
    hl = highlighter
    passages: dict[str, dict] = {}
    reason_codes: dict[str, int] = {r: k for k, r in enumerate(STALE_REASONS)}
    horizon_codes: dict[str, int] = {}  # "the 180-day horizon (the path rule `billing/rates-*`)" -> index
    all_signals = sorted({k for q in questions for e in q.evidence[:page_evidence] for k in e.signals})
    rows = []
    keyed = []  # (evidence item, passage key, matched terms): highlight once the text is cut
    for i, q in enumerate(questions):
        items = q.evidence[:page_evidence]
        qterms = sorted({t for e in items for t in e.terms})
        snames = sorted({k for e in items for k in e.signals})
        answer_type = next((e.answer_type for e in items if e.answer_type), None)
        ev_out = []
        for j, e in enumerate(items):
            key = str(e.passage) if e.passage is not None else f"{i}.{j}"
            if key not in passages:
                passages[key] = {
                    "d": e.document,
                    "sec": e.section,
                    "pg": e.page,
                    "ao": e.as_of,
                    "src": e.as_of_source,
                    "ex": e.expires,
                    "st": [[s.expression, s.role, s.start, s.end, s.granularity] for s in e.statements],
                    "_raw": e.text or "",
                }
            terms = e.terms
            contrib = [round(float(terms.get(t) or 0), 2) for t in qterms]
            item = [
                key,
                e.rank,
                round(float(e.score or 0), 2),
                round(float(e.support or 0), 3),
                int(bool(e.supporting)),
                int(bool(e.fresh)),
                [reason_codes.setdefault(str(r), len(reason_codes)) for r in e.reasons],
                contrib,
            ]
            horizon_key = horizon_text(e.horizon) if e.horizon else ""
            horizon_code = horizon_codes.setdefault(horizon_key, len(horizon_codes)) if horizon_key else -1
            found = e.answer_type_found
            keyed.append(
                (
                    item,
                    key,
                    [t for t in qterms if float(terms.get(t) or 0) > 0],
                    [round(float(e.signals.get(k) or 0), 2) for k in snames],
                    None if found is None else int(bool(found)),
                    horizon_code,
                )
            )
            ev_out.append(item)
        row = {
            "v": q.verdict,
            "o": owner_index[owners_of[i]],
            "t": topic_index.get(str(q.topic), -1),
            "w": q.weight,
            "s": q.support,
            "k": qterms,
            "e": ev_out,
        }
        if q.horizon and q.horizon.days != horizon:
            row["h"] = q.horizon.days
        if snames != all_signals:
            row["sk"] = snames
        if answer_type:
            row["at"] = answer_type
        rows.append(row)
    limit = PASSAGE_CHARS
    if passages:
        limit = max(MIN_PASSAGE_CHARS, min(PASSAGE_CHARS, text_budget // len(passages)))
    for p in passages.values():
        p["txt"], p["cut"] = _cut(p.pop("_raw"), limit)
    for item, key, matched, signal_values, found_code, horizon_code in keyed:
        flat = hl.ranges(passages[key]["txt"], matched)
        coded, end = [], 0
        for k in range(0, len(flat), 2):
            coded += [flat[k] - end, flat[k + 1] - flat[k]]
            end = flat[k + 1]
        item += [coded, signal_values, found_code, horizon_code]
    return {
        "q": rows,
        "p": passages,
        "h": horizon,
        "sk": all_signals,
        "R": sorted(reason_codes, key=lambda r: reason_codes[r]),
        "H": sorted(horizon_codes, key=lambda h: horizon_codes[h]),
    }


def build_view(
    run: Run,
    *,
    questions: list[QuestionResult],
    documents: list[DocumentEntry],
    summary: Summary,
    owner: str | None = None,
    links: dict | None = None,
    page_evidence: int = PAGE_EVIDENCE,
    text_budget: int = PAGE_TEXT_BUDGET,
    highlighter: Highlighter | None = None,
) -> dict:
    """Everything the template shows, for the whole run or one owner's share of it.

    Pass one `highlighter` to several calls to share its word cache between pages.
    """
    info = run.info
    audit = _date(info.as_of)
    horizon = info.horizon_days
    owners_of = [question_owner(q) for q in questions]
    owner_names = sorted(set(owners_of))
    owner_index = {name: k for k, name in enumerate(owner_names)}
    topics = sorted({str(q.topic) for q in questions if q.topic not in (None, "")})
    topic_index = {t: k for k, t in enumerate(topics)}

    rows = []
    for i, (q, own) in enumerate(zip(questions, owners_of)):
        rows.append(
            {
                "i": i,
                "q": q,
                "owner": own,
                "verdict": q.verdict,
                "why": verdict_sentence(q, info),
                "action_text": action_sentence(q),
                "flags": [(f, FLAG_TEXT.get(f, "")) for f in q.flags],
                "best_line": best_line(q, best_evidence(q)),
            }
        )

    ages, undated = _evidence_ages(questions, audit)
    chart_owner = charts.verdicts_by_owner(_owner_counts(questions, owners_of))
    chart_age = charts.age_histogram(ages, int(horizon or 365), undated)
    points = _trend_points(run) if owner is None else []
    chart_trend = charts.trend(points) if len(points) >= 2 else None

    index_of = {str(q.id): i for i, q in enumerate(questions)}
    briefs: list[dict] = []
    for b in run.briefs:
        if owner is not None and (b.owner or "unassigned") != owner:
            continue
        qs = [(index_of[str(x)], questions[index_of[str(x)]].question) for x in b.questions if str(x) in index_of]
        briefs.append({"b": b, "questions": qs})
    briefs.sort(key=_brief_order)

    return {
        "title": info.title or "Knowledge base",
        "owner": owner,
        "run": info,
        "corpus": info.corpus,
        "summary": summary,
        "languages": run.languages if owner is None and len(run.languages) > 1 else [],
        "thresholds": info.thresholds,
        "figures": _figures(summary, info.corpus),
        "charts": {"owner": chart_owner, "age": chart_age, "trend": chart_trend},
        "diff": diff_view(run.diff) if owner is None else None,
        "gate": gate_view(run.gate) if owner is None else None,
        "briefs": briefs,
        "rows": rows[:SERVER_ROWS],
        "row_count": len(rows),
        "owner_names": owner_names,
        "topics": topics,
        "inventory": inventory(documents, run.ingest_errors if owner is None else [], audit),
        "caution": CAUTION,
        "redacted": sorted(run.redacted.items()) if owner is None else [],
        "verdicts": VERDICTS,
        "links": links or {},
        "data": dict(
            _page_data(
                questions,
                owners_of,
                owner_index,
                topic_index,
                horizon,
                page_evidence=page_evidence,
                text_budget=text_budget,
                highlighter=highlighter or Highlighter(),
            ),
            audit=info.as_of,
            V=list(VERDICTS),
            G={v: verdict_glyph(v) for v in sorted({*VERDICTS, *(q.verdict for q in questions)})},
            server_rows=min(SERVER_ROWS, len(rows)),
            x=[_script_row(r) for r in rows[SERVER_ROWS:]],
        ),
        "audit_date": info.as_of,
        "horizon": horizon,
    }


def _brief_order(item: dict) -> tuple[float, str]:
    brief: Brief = item["b"]
    return -float(brief.weight or 0), str(brief.title)


def render_page(view: dict) -> str:
    """Render one page of the report from a view built by `build_view`."""
    css, js = _static()
    csp = (
        f"default-src 'none'; base-uri 'none'; form-action 'none'; style-src {csp_hash(css)}; script-src {csp_hash(js)}"
    )
    return (
        _environment()
        .get_template("report.html.j2")
        .render(v=view, css=Markup(css), js=Markup(js), csp=csp, data_json=script_json(view["data"]))
    )
