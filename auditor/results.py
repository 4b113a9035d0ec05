"""The run model: every part of an audit run as a dataclass, and results.json read and written from them.

A run is what `judgement.audit.run_audit` produces and `history.runs.load_run` rebuilds from the store;
the report, the exports, the gate, the content briefs and the run history read these types, never
dict keys. docs/results-json.md describes every key, its type and its meaning.

JSON, both ways, lives beside the types:

* `to_json()` gives the plain JSON value, keys in field order, which is the order of results.json. It is
  the only way a run becomes JSON (results.json, the `runs` and `results` rows of the store).
* `from_json()` reads it back. Runs stored by older versions of the auditor lack the keys added
  since (docs/results-json.md marks them); a missing key takes the default given here, so those
  runs still load. Fields without a default are in every format-1 run; a value missing one raises
  TypeError or KeyError, which the store turns into an error naming the run.

`FORMAT` is the format written; `Run.from_json` dispatches on the file's own `format`, so that a new
format can be read beside the old ones.

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

FORMAT = 1  # the results.json format written by this version (docs/results-json.md)

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
        return {json_key(f): _plain(getattr(self, f.name)) for f in dataclasses.fields(self)}  # type: ignore[arg-type]


def _plain_fields(cls: type, data: Mapping[str, Any], *nested: str) -> JSON:
    """The keys of `data` that are plain fields of `cls` (less the `nested` ones, which the caller
    reads itself), lists and maps copied; keys the class does not know are left out."""
    names = {f.name for f in dataclasses.fields(cls)} - set(nested)
    return {
        k: (list(v) if isinstance(v, list) else dict(v) if isinstance(v, dict) else v)
        for k, v in data.items()
        if k in names
    }


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
class Evidence(Record):
    """One retrieved passage of a question, with its support and freshness."""

    rank: int
    document: str
    page: int | None
    section: str
    passage: int | None
    owner: str | None = None
    score: float
    support: float
    signals: dict[str, float] = field(default_factory=dict)
    answer_type: str | None = None
    answer_type_found: bool | None = None
    supporting: bool
    as_of: str | None
    as_of_source: str | None
    expires: str | None
    fresh: bool
    reasons: list[str]
    terms: dict[str, float] = field(default_factory=dict)
    statements: list[Statement] = field(default_factory=list)
    text: str

    @classmethod
    def from_json(cls, data: Mapping[str, Any], *, rank: int = 1) -> Evidence:
        """`rank` is the item's place in its list, for runs stored before items carried it."""
        values = _plain_fields(cls, data, "statements")
        values.setdefault("rank", rank)
        return cls(**values, statements=_each(Statement.from_json, data.get("statements")))


@dataclass(kw_only=True)
class QuestionResult(Record):
    """A question's verdict, why, what to do, and its evidence (best first)."""

    id: str
    question: str
    owner: str | None
    topic: str | None
    weight: float
    verdict: str
    reasons: list[str]
    flags: list[str] = field(default_factory=list)
    action: str | None = None
    support: float
    horizon_days: int | None = None
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
    def from_json(cls, data: Mapping[str, Any]) -> QuestionResult:
        evidence = [Evidence.from_json(e, rank=i) for i, e in enumerate(data["evidence"] or (), start=1)]
        return cls(**_plain_fields(cls, data, "evidence"), evidence=evidence)


# --- the run's figures ----------------------------------------------------------------------------


@dataclass(kw_only=True)
class Summary(Record):
    """Counts per verdict and the weighted exposures of a set of questions (docs/judgement.md)."""

    questions: int
    covered: int
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
    """A content brief: gap questions grouped into one passage to write (judgement/briefs.py)."""

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
        return cls(**_plain_fields(cls, data))


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
    """One limit of the release gate: the figure it bounds, its value and whether it passed."""

    limit: str
    figure: str = ""
    max: float
    value: float
    passed: bool

    @classmethod
    def from_json(cls, data: Mapping[str, Any]) -> GateCheck:
        return cls(**_plain_fields(cls, data))


@dataclass(kw_only=True)
class GateResult(Record):
    """The release gate's outcome (history/gate.py): passed, each check, and one line for the operator."""

    passed: bool
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
    """One audit run: what results.json holds (docs/results-json.md); `info` is its `run` key."""

    info: RunInfo = field(metadata={"json": "run"})
    summary: Summary
    languages: list[LanguageSummary] = field(default_factory=list)
    questions: list[QuestionResult]
    ingest_errors: list[IngestError]
    documents: list[DocumentEntry] = field(default_factory=list)
    briefs: list[Brief] = field(default_factory=list)
    history: list[HistoryEntry] = field(default_factory=list)
    diff: Diff | None = None
    gate: GateResult | None = None

    def to_json(self) -> JSON:
        """results.json: `format` first, then every part in the order of docs/results-json.md."""
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


def _read_format1(data: Mapping[str, Any]) -> Run:
    return Run(
        info=RunInfo.from_json(data["run"]),
        summary=Summary.from_json(data["summary"]),
        languages=_each(LanguageSummary.from_json, data.get("languages")),
        questions=_each(QuestionResult.from_json, data["questions"]),
        ingest_errors=_each(IngestError.from_json, data["ingest_errors"]),
        documents=_each(DocumentEntry.from_json, data.get("documents")),
        briefs=_each(Brief.from_json, data.get("briefs")),
        history=_each(HistoryEntry.from_json, data.get("history")),
        diff=Diff.from_json(data.get("diff")),
        gate=GateResult.from_json(data.get("gate")),
    )


_READERS: dict[int, Callable[[Mapping[str, Any]], Run]] = {1: _read_format1}
