"""Plain data passed between the pipeline stages (docs/architecture.md).

Stages talk through these dataclasses and the SQLite store; none of them holds behaviour beyond
trivial derived values, so every stage can be tested with hand-made instances.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from datetime import date

# Valid values live here once, so that error messages and validation cannot drift apart.
GRANULARITIES = ("day", "week", "month", "quarter", "half", "season", "year", "decade")
TIMEX_TYPES = ("DATE", "TIME", "DURATION", "SET")  # TIMEX3 types (ISO 24617-1:2012)
ROLES = ("as_of", "effective", "expires", "planned", "event", "period", "other")
VERDICTS = ("supported", "stale", "gap")
STALE_REASONS = ("too_old", "expired", "overtaken")


# --- ingest ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class MetaDate:
    """A date a document states about itself, with where it came from.

    `kind` is what the date means: "modified", "published", "reviewed", "expires" or "created".
    `source` names the standard field, e.g. "front_matter:updated", "jsonld:dateModified",
    "og:article:modified_time", "dcterms:modified", "time:datetime", "pdf:xmp:ModifyDate",
    "pdf:info:ModDate", "sitemap:lastmod", "http:last-modified".
    """

    value: date
    kind: str
    source: str


@dataclass(frozen=True)
class Block:
    """A run of text from a parser: a paragraph, list or table, under a heading path."""

    text: str
    heading_path: tuple[str, ...] = ()
    page: int | None = None


@dataclass
class ParsedDocument:
    """What a format parser returns for one file."""

    blocks: list[Block]
    title: str | None = None
    dates: list[MetaDate] = field(default_factory=list)  # most specific first
    owner: str | None = None  # front matter `owner:`, wins over the config's owner map
    tags: tuple[str, ...] = ()
    language: str | None = None  # what the file says: front matter `lang:` or HTML `lang` (docs/languages.md)


@dataclass(frozen=True)
class Passage:
    """A retrievable unit of ~100–250 words, never across documents."""

    ordinal: int
    text: str
    heading_path: tuple[str, ...]
    page: int | None
    char_start: int  # offsets into the document's concatenated block text
    char_end: int


# --- temporal -------------------------------------------------------------------------------------


@dataclass(frozen=True)
class TemporalExpression:
    """A normalized temporal expression (docs/dates.md).

    `char_start`/`char_end` locate `expression` in the text that was scanned. `timex_type` and
    `value` are its TIMEX3 type (one of TIMEX_TYPES) and value (ISO-TimeML, ISO 24617-1:2012:
    "2026-03-05", "2026-Q3", "P3D", "XXXX-WXX-2", "PRESENT_REF"; None for a range written with two
    ends, which TIMEX3 would annotate as two expressions).
    """

    text: str  # the sentence it stands in
    expression: str  # the span as written
    start: date
    end: date
    granularity: str
    role: str
    char_start: int = 0
    char_end: int = 0
    timex_type: str = "DATE"
    value: str | None = None

    def as_json(self) -> dict:
        """The `auditor dates` JSON line: the original keys first, then the TIMEX3 type and value
        and the character offsets of the expression in its input ("end" already names the
        interval's end, so the offsets are an object of their own)."""
        return {
            "text": self.text,
            "expression": self.expression,
            "start": self.start.isoformat(),
            "end": self.end.isoformat(),
            "granularity": self.granularity,
            "role": self.role,
            "type": self.timex_type,
            "value": self.value,
            "offsets": {"begin": self.char_start, "end": self.char_end},
        }


@dataclass(frozen=True)
class Freshness:
    """Freshness of one passage at audit date T (docs/freshness.md)."""

    as_of: date | None
    as_of_source: str  # statement | metadata | file | none
    expires: date | None
    fresh: bool
    reasons: tuple[str, ...]  # subset of STALE_REASONS, empty when fresh
    age_days: int | None  # T − as_of, None when undated


# --- questions ----------------------------------------------------------------------------------


@dataclass(frozen=True)
class Question:
    id: str
    question: str
    owner: str | None = None
    topic: str | None = None
    weight: float = 1.0
    horizon_days: int | None = None  # per-question override of the freshness horizon
    # The question file's other columns, (name, value) in file order: kept and carried to the report.
    extra: tuple[tuple[str, str], ...] = ()
