"""The run model: every part of an audit run as a dataclass, and results.json read and written from them.

A run is what `judgement.audit.run_audit` produces and `history.runs.load_run` rebuilds from the store;
the report, the exports, the release limits, the passages to write and the run history read these types, never
dict keys. docs/results-json.md describes every key, its type and its meaning.

JSON, both ways, lives beside the types:

* `to_json()` gives the plain JSON value, keys in field order, which is the order of results.json. It is
  the only way a run becomes JSON (results.json, the `runs` and `results` rows of the store).
* `from_json()` reads it back. Runs stored by older versions of the auditor lack the keys added
  since (docs/results-json.md marks them); a missing key takes the default given here, so those
  runs still load. Fields without a default are in every format-1 run; a value missing one raises
  TypeError or KeyError, which the store turns into an error naming the run.

`FORMAT` is the format written; `Run.from_json` dispatches on the file's own `format`, so that a new
format can be read beside the old ones. Format 2 keeps each passage once (`Run.passages`, an evidence
item names it by id, `Evidence.source` holds it in memory); format-1 runs, with the passage inline in
every evidence item and the names of before (`covered`, `briefs`, `gate`, `passed`), still load:
`_LEGACY_KEYS` and `LEGACY_VERDICTS` rename them on reading (docs/results-json.md, "What changed
from format 1").

Dates are kept as the ISO 8601 text the format holds (`as_of`, `expires`, ...), not as `date`, so that
a run reads back exactly as it was written.

The module is longer than most: the format is one contract, so all of its types stay on one page,
in the order docs/results-json.md describes them.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

from auditor.models import VERDICTS, TemporalExpression

FORMAT = 2  # the results.json format written by this version (docs/results-json.md)

# Format-1 names read as their format-2 names, wherever they occur (keys, then verdict values).
_LEGACY_KEYS = {"covered": "supported", "briefs": "to_write", "gate": "limits", "passed": "within"}
LEGACY_VERDICTS = {"covered": "supported"}

# Where a question's freshness horizon came from (Horizon.source).
HORIZON_SOURCES = ("default", "path_rule", "topic_rule", "question", "unrecorded")

# The lists of a diff, in the order a reader wants them: what got worse first.
DIFF_CATEGORIES = ("new_gaps", "newly_stale", "resolved_gaps", "refreshed", "added", "removed")

JSON = dict[str, Any]


def _plain(value: Any) -> Any:
    if isinstance(value, Record):
        return value.to_json()
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    return value


def json_key(f: dataclasses.Field) -> str:
    """The results.json key of a field: its name, unless its metadata names another."""
    return f.metadata.get("json", f.name)


class Record:
    """Base of the run model's dataclasses: `to_json` writes every field, in field order."""

    def to_json(self) -> JSON:
        return {
            key: _plain(getattr(self, f.name))
            for f in dataclasses.fields(self)  # type: ignore[arg-type]
            if (key := json_key(f)) is not None  # metadata json None: in memory only
        }


def _plain_fields(cls: type, data: Mapping[str, Any], *nested: str) -> JSON:
    """The keys of `data` that are plain fields of `cls` (less the `nested` ones, which the caller
    reads itself), as keyword arguments by field name; lists and maps copied; keys the class does
    not know are left out. A format-1 key (`_LEGACY_KEYS`) stands for its format-2 key when that
    one is absent."""
    by_key = {json_key(f): f.name for f in dataclasses.fields(cls) if f.name not in nested}
    values: JSON = {}
    for key, value in data.items():
        if key not in by_key and _LEGACY_KEYS.get(key) in by_key and _LEGACY_KEYS[key] not in data:
            key = _LEGACY_KEYS[key]
        if key in by_key:
            values[by_key[key]] = (
                list(value) if isinstance(value, list) else dict(value) if isinstance(value, dict) else value
            )
    return values


def _verdict(value: Any) -> Any:
    return LEGACY_VERDICTS.get(value, value)


def _each(reader: Callable[[Mapping[str, Any]], Any], items: Iterable[Mapping[str, Any]] | None) -> list:
    return [reader(item) for item in items or ()]


# --- one question's result ------------------------------------------------------------------------


@dataclass(kw_only=True)
class Statement(Record):
    """A dated statement of an evidence passage (a normalized temporal expression, docs/dates.md)."""

    expression: str
    start: str
    end: str
    granularity: str
    role: str
    text: str

    @classmethod
    def of(cls, expression: TemporalExpression) -> Statement:
        # the dates JSON line's original keys; its TIMEX3 type, value and offsets are not part of format 1
        return cls(**_plain_fields(cls, expression.as_json()))

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> Statement:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class Horizon(Record):
    """The freshness horizon a passage was judged with, and where it came from (HORIZON_SOURCES):
    the configured default, a path rule or a topic rule of `[[freshness.rules]]` (`rule` is its
    path glob or topic), or the question's own `horizon_days` column."""

    days: int
    source: str
    rule: str | None = None

    @classmethod
    def from_json(cls, data: Mapping[str, Any] | None) -> Horizon | None:
        return cls(**_plain_fields(cls, data)) if data else None

    def describe(self) -> str:
        """ "the 180-day horizon (the path rule `billing/rates-*`)" and the like."""
        where = {
            "default": "the default horizon",
            "path_rule": f"the path rule `{self.rule}`",
            "topic_rule": f"the topic rule `{self.rule}`",
            "question": "the question's own horizon_days",
        }.get(self.source)
        return f"the {self.days}-day horizon" + (f" ({where})" if where else "")


@dataclass(kw_only=True)
class SourcePassage(Record):
    """A passage some evidence refers to, stored once per run (results.json `passages`)."""

    id: int
    document: str
    page: int | None
    section: str
    owner: str | None = None
    as_of: str | None
    as_of_source: str | None
    expires: str | None
    statements: list[Statement] = field(default_factory=list)
    text: str

    @classmethod
    def from_json(cls, data: Mapping[str, Any], *, id: int | None = None) -> SourcePassage:
        """`id` replaces the item's own (format-1 evidence items, which may have none)."""
        values = _plain_fields(cls, data, "statements")
        if id is not None:
            values["id"] = id
        return cls(**values, statements=_each(Statement.from_json, data.get("statements")))


@dataclass(kw_only=True)
class Evidence(Record):
    """One retrieved passage of a question, with its support and freshness.

    `passage` is the id of its `SourcePassage` (`source`, not written: results.json names it by
    id); its passage's attributes (`document`, `section`, `as_of`, `text`, ...) read through it.
    """

    rank: int
    passage: int
    score: float
    support: float
    signals: dict[str, float] = field(default_factory=dict)
    answer_type: str | None = None
    answer_type_found: bool | None = None
    supporting: bool
    horizon: Horizon | None = None
    fresh: bool
    reasons: list[str]
    terms: dict[str, float] = field(default_factory=dict)
    source: SourcePassage = field(metadata={"json": None})

    @classmethod
    def from_json(cls, data: Mapping[str, Any], passages: Passages, *, rank: int = 1) -> Evidence:
        """An item of format 2 (its passage in `passages`) or of format 1 (the passage inline, added
        to `passages`). `rank` is the item's place in its list, for runs stored before items carried it."""
        values = _plain_fields(cls, data, "horizon", "source")
        values.setdefault("rank", rank)
        if "document" in data:  # format 1: the passage is in the item
            source = passages.add_inline(data)
        else:
            source = passages[int(data["passage"])]
        values["passage"] = source.id
        return cls(**values, horizon=Horizon.from_json(data.get("horizon")), source=source)

    document = property(lambda self: self.source.document)
    page = property(lambda self: self.source.page)
    section = property(lambda self: self.source.section)
    owner = property(lambda self: self.source.owner)
    as_of = property(lambda self: self.source.as_of)
    as_of_source = property(lambda self: self.source.as_of_source)
    expires = property(lambda self: self.source.expires)
    statements = property(lambda self: self.source.statements)
    text = property(lambda self: self.source.text)


class Passages(dict):
    """The passages of one run being read, by id. Format-1 evidence without a store id gets the next
    negative id, so that every passage of a run has one (docs/results-json.md)."""

    @classmethod
    def of(cls, items: Iterable[Mapping[str, Any]] | None) -> Passages:
        out = cls()
        for item in items or ():
            passage = SourcePassage.from_json(item)
            out[passage.id] = passage
        return out

    def add_inline(self, data: Mapping[str, Any]) -> SourcePassage:
        pid = data.get("passage")
        if pid is None:
            pid = min([0, *self]) - 1
        pid = int(pid)
        if pid not in self:
            self[pid] = SourcePassage.from_json(data, id=pid)
        return self[pid]


@dataclass(kw_only=True)
class QuestionResult(Record):
    """A question's verdict, why, what to do, and its evidence (best first)."""

    id: str
    question: str
    owner: str | None
    topic: str | None
    weight: float
    extra: dict[str, str] = field(default_factory=dict)
    verdict: str
    reasons: list[str]
    flags: list[str] = field(default_factory=list)
    action: str | None = None
    support: float
    horizon: Horizon | None = None
    explanation: str = ""
    missing_terms: list[str]
    terms: list[str] = field(default_factory=list)
    language: str | None = None  # the question's language as the tokenizer read it (docs/languages.md)
    evidence: list[Evidence]
    # What the fact-level checks found (auditor/judgement/verdicts.fact_check, docs/judgement.md).
    missing_constraint: dict | None = None
    needs_look: bool = False
    look_reasons: list[str] = field(default_factory=list)
    conflict: dict | None = None

    @classmethod
    def from_json(cls, data: Mapping[str, Any], passages: Passages | None = None) -> QuestionResult:
        """`passages`: the run's, by id (format 2); format-1 items bring their own and add them."""
        passages = Passages() if passages is None else passages
        evidence = [Evidence.from_json(e, passages, rank=i) for i, e in enumerate(data["evidence"] or (), start=1)]
        values = _plain_fields(cls, data, "evidence", "horizon")
        values["verdict"] = _verdict(values["verdict"])
        horizon = Horizon.from_json(data.get("horizon"))
        if horizon is None and data.get("horizon_days") is not None:  # format 1: the days, not their source
            horizon = Horizon(days=int(data["horizon_days"]), source="unrecorded")
        return cls(**values, horizon=horizon, evidence=evidence)


# --- the run's figures ----------------------------------------------------------------------------


@dataclass(kw_only=True)
class Summary(Record):
    """Counts per verdict and the weighted exposures of a set of questions (docs/judgement.md)."""

    questions: int
    supported: int
    stale: int
    gap: int
    weight: float
    fallback_exposure: float
    stale_exposure: float

    @classmethod
    def of(cls, results: Sequence[QuestionResult]) -> Summary:
        """The summary of `results`: exposure is the weight share of gap (fallback) or stale questions."""
        weight = sum(q.weight for q in results)

        def share(verdict: str) -> float:
            return sum(q.weight for q in results if q.verdict == verdict) / weight if weight > 0 else 0.0

        counts = {v: sum(1 for q in results if q.verdict == v) for v in VERDICTS}
        return cls(
            questions=len(results),
            **counts,
            weight=weight,
            fallback_exposure=share("gap"),
            stale_exposure=share("stale"),
        )

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> Summary:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class LanguageSummary(Summary):
    """The summary of the questions of one language (docs/languages.md)."""

    language: str

    @classmethod
    def by_language(cls, results: Sequence[QuestionResult]) -> list[LanguageSummary]:
        """One summary per question language, by language name; questions without one are left out."""
        languages = sorted({q.language for q in results if q.language})
        return [
            cls(language=lang, **dataclasses.asdict(Summary.of([q for q in results if q.language == lang])))
            for lang in languages
        ]

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> LanguageSummary:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class Corpus(Record):
    """Corpus figures at the audit date: counts, freshness F and mean age A over searched passages."""

    documents: int
    passages: int
    failed: int
    freshness: float | None = None
    mean_age_days: float | None = None

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> Corpus:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class Thresholds(Record):
    """The support thresholds a run used, and where they came from (calibration | probe | config |
    default; docs/judgement.md), with the corpus probe's summary when it was measured or skipped."""

    support: float
    weak_margin: float
    source: str
    probe: dict | None = None

    @classmethod
    def from_json(cls, data: Mapping[str, Any] | None) -> Thresholds | None:
        return cls(**_plain_fields(cls, data)) if data else None


@dataclass(kw_only=True)
class TokenizerSettings(Record):
    """The tokenizer the run searched with; the report highlights matched words with the same one."""

    language: str
    stopwords: str

    @classmethod
    def from_json(cls, data: Mapping[str, Any] | None) -> TokenizerSettings | None:
        return cls(**_plain_fields(cls, data)) if data else None


@dataclass(kw_only=True)
class RunInfo(Record):
    """What was audited when, with which settings (results.json `run`)."""

    id: int | None
    as_of: str
    horizon_days: int
    started: str
    finished: str | None = None
    title: str | None = None
    tokenizer: TokenizerSettings | None = None
    corpus: Corpus
    thresholds: Thresholds | None = None
    config_fingerprint: str = ""
    corpus_fingerprint: str = ""

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> RunInfo:
        return cls(
            **_plain_fields(cls, data, "tokenizer", "corpus", "thresholds"),
            tokenizer=TokenizerSettings.from_json(data.get("tokenizer")),
            corpus=Corpus.from_json(data["corpus"]),
            thresholds=Thresholds.from_json(data.get("thresholds")),
        )


# --- documents, errors, briefs, history -----------------------------------------------------------


@dataclass(kw_only=True)
class IngestError(Record):
    """A file that could not be ingested, with the reason."""

    document: str
    error: str

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> IngestError:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class DocumentEntry(Record):
    """A document of the inventory: where it stands, and how fresh its passages are."""

    path: str
    title: str | None = None
    kind: str | None = None
    owner: str | None = None
    status: str = "active"
    doc_date: str | None = None
    doc_date_source: str | None = None
    expires: str | None = None
    passages: int = 0
    as_of: str | None = None
    fresh: bool | None = None
    reasons: list[str] = field(default_factory=list)

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> DocumentEntry:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class Brief(Record):
    """A passage to write: gap questions grouped by what they ask (judgement/briefs.py)."""

    title: str
    terms: list[str]
    weight: float
    owner: str
    questions: list[str]
    examples: list[str] = field(default_factory=list)
    topic: str | None = None

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> Brief:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class HistoryEntry(Record):
    """An earlier finished run, for the trend chart."""

    id: int | None
    as_of: str
    summary: Summary

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> HistoryEntry:
        return cls(id=data["id"], as_of=data["as_of"], summary=Summary.from_json(data["summary"]))


# --- diff and gate --------------------------------------------------------------------------------


@dataclass(kw_only=True)
class DiffItem(Record):
    """One question whose verdict changed between two runs (None: not in that run's question set)."""

    id: str
    question: str | None
    owner: str | None
    weight: float
    before: str | None
    after: str | None
    reasons: list[str]

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> DiffItem:
        values = _plain_fields(cls, data)
        return cls(**{**values, "before": _verdict(values["before"]), "after": _verdict(values["after"])})


@dataclass(kw_only=True)
class ExposureChange(Record):
    """Fallback and stale exposure of the base run and of the head run, as [before, after]."""

    fallback: list[float | None]
    stale: list[float | None]

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> ExposureChange:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class Diff(Record):
    """What changed from run `base_run` to run `head_run`, question by question (history/diff.py)."""

    base_run: int | None
    base_as_of: str | None
    head_run: int | None
    head_as_of: str | None
    new_gaps: list[DiffItem]
    newly_stale: list[DiffItem]
    resolved_gaps: list[DiffItem]
    refreshed: list[DiffItem]
    added: list[DiffItem]
    removed: list[DiffItem]
    counts: dict[str, int]
    weights: dict[str, float]
    exposure: ExposureChange
    summary: str

    def lists(self) -> dict[str, list[DiffItem]]:
        """The change lists by category, in DIFF_CATEGORIES order."""
        return {name: getattr(self, name) for name in DIFF_CATEGORIES}

    @classmethod
    def from_json(cls, data: Mapping[str, Any] | None) -> Diff | None:
        if data is None:
            return None
        lists: dict[str, Any] = {name: _each(DiffItem.from_json, data.get(name)) for name in DIFF_CATEGORIES}
        return cls(
            **_plain_fields(cls, data, "exposure", *DIFF_CATEGORIES),
            **lists,
            exposure=ExposureChange.from_json(data["exposure"]),
        )


@dataclass(kw_only=True)
class GateCheck(Record):
    """One release limit (history/gate.py): the figure it bounds, its value and whether it is within."""

    limit: str
    figure: str = ""
    max: float
    value: float
    passed: bool = field(metadata={"json": "within"})

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> GateCheck:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class GateResult(Record):
    """The run held against its release limits (history/gate.py): within all of them or not, each
    limit, and one line for the operator. results.json `limits`."""

    passed: bool = field(metadata={"json": "within"})
    checks: list[GateCheck]
    message: str

    @classmethod
    def from_json(cls, data: Mapping[str, Any] | None) -> GateResult | None:
        if data is None:
            return None
        return cls(**_plain_fields(cls, data, "checks"), checks=_each(GateCheck.from_json, data.get("checks")))


# --- the run --------------------------------------------------------------------------------------


@dataclass(kw_only=True)
class Run(Record):
    """One audit run: what results.json holds (docs/results-json.md); `info` is its `run` key.

    `passages` are those the evidence refers to, each once, by id; `to_json` collects them from
    the evidence, so a run built or changed in memory always writes the passages it uses.
    """

    info: RunInfo = field(metadata={"json": "run"})
    summary: Summary
    languages: list[LanguageSummary] = field(default_factory=list)
    questions: list[QuestionResult]
    passages: list[SourcePassage] = field(default_factory=list)
    ingest_errors: list[IngestError]
    documents: list[DocumentEntry] = field(default_factory=list)
    briefs: list[Brief] = field(default_factory=list, metadata={"json": "to_write"})
    history: list[HistoryEntry] = field(default_factory=list)
    diff: Diff | None = None
    gate: GateResult | None = field(default=None, metadata={"json": "limits"})
    # Personal data taken out of the query logs before storage, counts by kind only (never values).
    redacted: dict[str, int] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if not self.passages:
            self.passages = used_passages(self.questions)

    def to_json(self) -> JSON:
        """results.json: `format` first, then every part in the order of docs/results-json.md."""
        self.passages = used_passages(self.questions)
        return {"format": FORMAT, **super().to_json()}

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> Run:
        """A run from results.json of any format this version reads (ValueError for another)."""
        reader = _READERS.get(data.get("format"))  # type: ignore[arg-type]
        if reader is None:
            raise ValueError(
                f"results format {data.get('format')!r} is not one this auditor reads (it reads {sorted(_READERS)})"
            )
        return reader(data)


def used_passages(questions: Iterable[QuestionResult]) -> list[SourcePassage]:
    """Every passage the questions' evidence refers to, once, by id."""
    found: dict[int, SourcePassage] = {}
    for q in questions:
        for e in q.evidence:
            found.setdefault(e.passage, e.source)
    return [found[k] for k in sorted(found)]


def _read(data: Mapping[str, Any], passages: Passages) -> Run:
    """Formats 1 and 2 alike: format-1 names are read as their format-2 names (_LEGACY_KEYS)."""

    def key(name: str, old: str) -> Any:
        return data.get(name, data.get(old))

    return Run(
        info=RunInfo.from_json(data["run"]),
        summary=Summary.from_json(data["summary"]),
        languages=_each(LanguageSummary.from_json, data.get("languages")),
        questions=[QuestionResult.from_json(q, passages) for q in data["questions"]],
        ingest_errors=_each(IngestError.from_json, data["ingest_errors"]),
        documents=_each(DocumentEntry.from_json, data.get("documents")),
        briefs=_each(Brief.from_json, key("to_write", "briefs")),
        history=_each(HistoryEntry.from_json, data.get("history")),
        diff=Diff.from_json(data.get("diff")),
        gate=GateResult.from_json(key("limits", "gate")),
    )


def _read_format1(data: Mapping[str, Any]) -> Run:
    return _read(data, Passages())


def _read_format2(data: Mapping[str, Any]) -> Run:
    return _read(data, Passages.of(data["passages"]))


_READERS: dict[int, Callable[[Mapping[str, Any]], Run]] = {1: _read_format1, 2: _read_format2}
