"""TOML configuration -> frozen dataclasses.

Precedence: defaults < file < environment (AUDITOR_*) < command-line flags. Relative paths in a file
are relative to that file's folder, so a config can be run from anywhere. Unknown keys warn (a typo
must not silently do nothing); a bad value is a ConfigError naming the key and the file.
"""

from __future__ import annotations

import dataclasses
import os
import sys
import tomllib
from collections.abc import Mapping
from dataclasses import dataclass, field
from datetime import date
from pathlib import Path
from typing import Any

import phonenumbers

from auditor.errors import ConfigError
from auditor.language import DEFAULT_CANDIDATES, from_tag
from auditor.retrieval.bm25 import Params
from auditor.retrieval.tokenize import Tokenizer


@dataclass(frozen=True)
class SitemapConfig:
    file: Path  # sitemaps.org XML file
    url_prefix: str  # URL prefix of the web export ...
    folder: str  # ... and the folder (relative to a corpus path) that holds its files


@dataclass(frozen=True)
class CorpusConfig:
    paths: tuple[Path, ...] = ()
    include: tuple[str, ...] = ("**/*",)
    exclude: tuple[str, ...] = ()
    follow_symlinks: bool = False  # links are never followed out of the source root either way
    max_file_mb: float = 50.0
    jobs: int = 0  # 0 = one per core
    timeout_s: float = 60.0  # per file
    day_first: bool = False  # numeric dates: 03/04/2025 is 3 April when true
    fiscal_year_start: int = 1  # month in which the fiscal year begins
    hemisphere: str = "north"  # seasons
    sitemaps: tuple[SitemapConfig, ...] = ()


@dataclass(frozen=True)
class HorizonRule:
    horizon_days: int
    path: str | None = None  # glob over document paths
    topic: str | None = None  # question topic


@dataclass(frozen=True)
class FreshnessConfig:
    horizon_days: int = 365
    rules: tuple[HorizonRule, ...] = ()


@dataclass(frozen=True)
class RetrievalConfig:
    variant: str = "lucene"  # see bm25.VARIANTS
    k1: float = 1.2
    b: float = 0.75
    delta: float = 0.5  # BM25+ / BM25L
    top_k: int = 5
    language: str = "auto"  # "auto": each text's own language (docs/languages.md); a Snowball stemmer; "none"
    stopwords: str = "auto"  # "auto": the language's own list; a built-in list name; "none"
    detect: tuple[str, ...] = DEFAULT_CANDIDATES  # the languages "auto" chooses among, first = fallback


@dataclass(frozen=True)
class SupportConfig:
    # Shipped defaults; `auditor calibrate` stores replacements in the database.
    threshold: float = 0.45
    weak_margin: float = 0.05
    # The corpus probe (auditor/judgement/probe.py) places the threshold when no labelled calibration
    # is stored. None: on while `threshold` is the shipped one; a threshold written in the file or
    # given in code is the owner's choice and turns it off unless `probe` is set too.
    probe: bool | None = None
    probe_questions: int = 200
    probe_scale: float = 0.55


@dataclass(frozen=True)
class GateConfig:
    max_gap_share: float | None = None
    max_fallback_exposure: float | None = None
    max_stale_share: float | None = None
    max_stale_exposure: float | None = None
    max_new_gaps: int | None = None


@dataclass(frozen=True)
class ReportConfig:
    out: Path | None = None  # default reports/<as-of>/
    title: str = "Knowledge base audit"
    keep_runs: int = 0  # 0 = keep every run
    # Files written beside the page, results.json and the CSV files (docs/ci.md): "junit" (junit.xml)
    # and "summary" (summary.md); `--outputs` on the command line replaces this list.
    outputs: tuple[str, ...] = ()
    stale_in_junit: str = "fail"  # a stale question's test case: "fail" or "skip"


REPORT_OUTPUTS = ("junit", "summary")


@dataclass(frozen=True)
class RedactionConfig:
    """The `[redaction]` table (docs/question-sets.md): which kinds of personal data query-log
    imports redact (all by default), the region of phone numbers written without a country code,
    and `strict` (drop any record still holding eight or more digits in a row)."""

    email: bool = True
    iban: bool = True
    national_id: bool = True
    card: bool = True
    birth_date: bool = True
    account: bool = True
    ip: bool = True
    phone: bool = True
    address: bool = True
    name: bool = True
    phone_region: str = "US"  # ISO 3166-1 alpha-2, as phonenumbers reads it
    strict: bool = False


@dataclass(frozen=True)
class ClusterConfig:
    # docs/scale.md: "tcp://host:8786" for a running Dask scheduler, "local" or "local:N" for a
    # LocalCluster of N worker processes on this machine; None runs everything in this process.
    scheduler: str | None = None
    shared: Path | None = None  # a folder every worker and this machine see (default: beside the database)


@dataclass(frozen=True)
class Config:
    source: Path | None = None  # the file it was read from
    database: Path = Path("auditor.db")
    as_of: date | None = None  # audit date; None = today
    questions: tuple[Path, ...] = ()
    owners: tuple[tuple[str, str], ...] = ()  # (glob, owner), first match wins
    languages: tuple[tuple[str, str], ...] = ()  # (glob, language) of documents, first match wins
    corpus: CorpusConfig = field(default_factory=CorpusConfig)
    freshness: FreshnessConfig = field(default_factory=FreshnessConfig)
    retrieval: RetrievalConfig = field(default_factory=RetrievalConfig)
    support: SupportConfig = field(default_factory=SupportConfig)
    gate: GateConfig = field(default_factory=GateConfig)
    report: ReportConfig = field(default_factory=ReportConfig)
    redaction: RedactionConfig = field(default_factory=RedactionConfig)
    cluster: ClusterConfig = field(default_factory=ClusterConfig)

    def replace(self, **changes: Any) -> Config:
        return dataclasses.replace(self, **changes)

    def audit_date(self) -> date:
        return self.as_of or date.today()


# Environment variables, applied between the file and the flags: name -> (section, key).
ENVIRONMENT = {
    "AUDITOR_DB": (None, "database"),
    "AUDITOR_AS_OF": (None, "as_of"),
    "AUDITOR_HORIZON_DAYS": ("freshness", "horizon_days"),
    "AUDITOR_OUT": ("report", "out"),
    "AUDITOR_JOBS": ("corpus", "jobs"),
}


def load_config(path: str | Path | None = None, env: Mapping[str, str] | None = None, warn=None) -> Config:
    """Read `path` (TOML) over the defaults, then the AUDITOR_* environment."""
    warn = warn or (lambda message: print(f"warning: {message}", file=sys.stderr))
    environment: Mapping[str, str] = os.environ if env is None else env
    raw: dict[str, Any] = {}
    base = Path.cwd()
    source: Path | None = None
    if path is not None:
        source = Path(path)
        try:
            raw = tomllib.loads(source.read_text(encoding="utf-8"))
        except FileNotFoundError:
            raise ConfigError(f"{str(source)!r}: config file not found") from None
        except (OSError, UnicodeDecodeError) as exc:
            raise ConfigError(f"{str(source)!r}: cannot read config file ({exc})") from None
        except tomllib.TOMLDecodeError as exc:
            raise ConfigError(f"{str(source)!r}: not valid TOML ({exc})") from None
        base = source.resolve().parent
    where = repr(str(source)) if source else "environment"
    for name, (section, key) in ENVIRONMENT.items():
        if environment.get(name):
            target = raw.setdefault(section, {}) if section else raw
            if not isinstance(target, dict):
                raise ConfigError(f"{where}: [{section}] must be a table")
            value = environment[name]
            if key in ("database", "out"):
                value = str(Path(value).resolve())  # relative to where the command runs, not the file
            target[key] = value
    return _build(raw, base, source, where, warn)


def _build(raw: dict, base: Path, source: Path | None, where: str, warn) -> Config:
    reader = _Reader(where, base, warn)
    top = reader.table(
        raw,
        "",
        ({f.name for f in dataclasses.fields(Config)} - {"source"})
        | {"limits"},  # every section and key; [limits] is read into `gate`
    )
    corpus_raw = reader.table(top.get("corpus", {}), "corpus", {f.name for f in dataclasses.fields(CorpusConfig)})
    sitemaps = []
    for i, item in enumerate(reader.array(corpus_raw.pop("sitemaps", []), "corpus.sitemaps")):
        item = reader.table(item, f"corpus.sitemaps[{i}]", {"file", "url_prefix", "folder"})
        sitemaps.append(
            SitemapConfig(
                file=reader.path(item.get("file"), f"corpus.sitemaps[{i}].file", required=True),
                url_prefix=reader.string(item.get("url_prefix"), f"corpus.sitemaps[{i}].url_prefix", required=True),
                folder=reader.string(item.get("folder", ""), f"corpus.sitemaps[{i}].folder"),
            )
        )
    corpus = reader.fill(CorpusConfig, corpus_raw, "corpus", sitemaps=tuple(sitemaps))
    if corpus.hemisphere not in ("north", "south"):
        raise ConfigError(f"{where}: corpus.hemisphere must be 'north' or 'south', not {corpus.hemisphere!r}")
    if not 1 <= corpus.fiscal_year_start <= 12:
        raise ConfigError(f"{where}: corpus.fiscal_year_start must be a month number 1-12")

    fresh_raw = reader.table(top.get("freshness", {}), "freshness", {"horizon_days", "rules"})
    rules = []
    for i, item in enumerate(reader.array(fresh_raw.pop("rules", []), "freshness.rules")):
        item = reader.table(item, f"freshness.rules[{i}]", {"path", "topic", "horizon_days"})
        if "horizon_days" not in item:
            raise ConfigError(f"{where}: freshness.rules[{i}].horizon_days is required")
        rule = reader.fill(HorizonRule, item, f"freshness.rules[{i}]")
        if (rule.path is None) == (rule.topic is None):
            raise ConfigError(f"{where}: freshness.rules[{i}] needs exactly one of 'path' or 'topic'")
        rules.append(rule)
    freshness = reader.fill(FreshnessConfig, fresh_raw, "freshness", rules=tuple(rules))

    owners_raw = reader.table(top.get("owners", {}), "owners", None)
    owners = tuple((str(glob), reader.string(owner, f"owners.{glob!r}")) for glob, owner in owners_raw.items())

    languages_raw = reader.table(top.get("languages", {}), "languages", None)
    languages = []
    for glob, name in languages_raw.items():
        language = from_tag(reader.string(name, f"languages.{glob!r}"))
        if language is None:
            raise ConfigError(f"{where}: languages.{glob!r}: unknown language {name!r}; give e.g. 'german' or 'de'")
        languages.append((str(glob), language))

    questions = tuple(reader.path(p, "questions") for p in reader.array(top.get("questions", []), "questions"))
    # The release limits: `[limits]`, or `[gate]` as configs written before the rename call it.
    if "limits" in top and "gate" in top:
        raise ConfigError(f"{where}: [limits] and [gate] are the same table; keep one")
    limits_key = "gate" if "gate" in top else "limits"
    config = Config(
        source=source,
        database=reader.path(top.get("database", "auditor.db"), "database"),
        as_of=reader.date(top.get("as_of"), "as_of"),
        questions=questions,
        owners=owners,
        languages=tuple(languages),
        corpus=corpus,
        freshness=freshness,
        retrieval=reader.fill(
            RetrievalConfig,
            reader.table(top.get("retrieval", {}), "retrieval", {f.name for f in dataclasses.fields(RetrievalConfig)}),
            "retrieval",
        ),
        support=reader.fill(
            SupportConfig,
            reader.table(top.get("support", {}), "support", {f.name for f in dataclasses.fields(SupportConfig)}),
            "support",
        ),
        gate=reader.fill(
            GateConfig,
            reader.table(top.get(limits_key, {}), limits_key, {f.name for f in dataclasses.fields(GateConfig)}),
            limits_key,
        ),
        report=reader.fill(
            ReportConfig,
            reader.table(top.get("report", {}), "report", {f.name for f in dataclasses.fields(ReportConfig)}),
            "report",
        ),
        redaction=reader.fill(
            RedactionConfig,
            reader.table(top.get("redaction", {}), "redaction", {f.name for f in dataclasses.fields(RedactionConfig)}),
            "redaction",
        ),
        cluster=reader.fill(
            ClusterConfig,
            reader.table(top.get("cluster", {}), "cluster", {f.name for f in dataclasses.fields(ClusterConfig)}),
            "cluster",
        ),
    )
    if config.redaction.phone_region not in phonenumbers.SUPPORTED_REGIONS:
        raise ConfigError(
            f"{where}: redaction.phone_region must be a region code phonenumbers knows (such as 'US', 'GB'), "
            f"not {config.redaction.phone_region!r}"
        )
    if config.freshness.horizon_days < 0:
        raise ConfigError(f"{where}: freshness.horizon_days must not be negative")
    if not 0.0 <= config.support.threshold <= 1.0:
        raise ConfigError(f"{where}: support.threshold must lie between 0 and 1")
    if not 20 <= config.support.probe_questions <= 5000 or not 0.0 < config.support.probe_scale < 1.0:
        raise ConfigError(f"{where}: support.probe_questions must be 20-5000 and support.probe_scale above 0, below 1")
    given = top.get("support", {})
    if isinstance(given, dict) and "threshold" in given and "probe" not in given:
        config = config.replace(support=dataclasses.replace(config.support, probe=False))  # the owner's threshold
    for limit in dataclasses.fields(GateConfig):
        value = getattr(config.gate, limit.name)
        if value is not None and (value < 0 or (limit.name != "max_new_gaps" and value > 1)):
            bound = "a whole number of at least 0" if limit.name == "max_new_gaps" else "a share between 0 and 1"
            raise ConfigError(f"{where}: {limits_key}.{limit.name} must be {bound}, not {value!r}")
    for name in config.report.outputs:
        if name not in REPORT_OUTPUTS:
            raise ConfigError(
                f"{where}: report.outputs: unknown output {name!r}; choose from {', '.join(REPORT_OUTPUTS)}"
            )
    if config.report.stale_in_junit not in ("fail", "skip"):
        raise ConfigError(
            f"{where}: report.stale_in_junit must be 'fail' or 'skip', not {config.report.stale_in_junit!r}"
        )
    _check_retrieval(config.retrieval, where)
    if config.retrieval.top_k < 1:
        raise ConfigError(f"{where}: retrieval.top_k must be at least 1")
    return config


def _check_retrieval(retrieval: RetrievalConfig, where: str) -> None:
    """Let the BM25 and tokenizer registries judge their settings now, so the message names the file."""
    try:
        Params(retrieval.variant, retrieval.k1, retrieval.b, retrieval.delta)
        Tokenizer(retrieval.language, retrieval.stopwords, retrieval.detect)
    except ConfigError as exc:
        raise ConfigError(f"{where}: {exc}") from None


class _Reader:
    """Type-checks raw TOML values against the dataclass field types, naming the key on error."""

    def __init__(self, where: str, base: Path, warn):
        self.where, self.base, self.warn = where, base, warn

    def fail(self, key: str, expected: str, value: Any) -> ConfigError:
        return ConfigError(f"{self.where}: {key} must be {expected}, not {value!r}")

    def table(self, value: Any, key: str, allowed: set[str] | None) -> dict:
        if not isinstance(value, dict):
            raise self.fail(key or "the top level", "a table", value)
        value = dict(value)
        if allowed is not None:
            for unknown in sorted(set(value) - allowed):
                self.warn(f"{self.where}: unknown key {'.'.join(filter(None, [key, unknown]))!r} ignored")
                del value[unknown]
        return value

    def array(self, value: Any, key: str) -> list:
        if isinstance(value, (str, dict)) or not isinstance(value, (list, tuple)):
            if isinstance(value, str) and key in ("questions", "corpus.paths", "corpus.include", "corpus.exclude"):
                return [value]
            raise self.fail(key, "an array", value)
        return list(value)

    def string(self, value: Any, key: str, required: bool = False) -> str:
        if value is None and required:
            raise ConfigError(f"{self.where}: {key} is required")
        if not isinstance(value, str):
            raise self.fail(key, "a string", value)
        return value

    def path(self, value: Any, key: str, required: bool = False) -> Path:
        text = self.string(value, key, required)
        path = Path(text).expanduser()
        # normpath, not resolve(): "../reports" should read cleanly in messages without following links.
        return Path(os.path.normpath(path if path.is_absolute() else self.base / path))

    def date(self, value: Any, key: str) -> date | None:
        if value is None or isinstance(value, date):
            return value
        try:
            return date.fromisoformat(str(value))
        except ValueError:
            raise self.fail(key, "a date YYYY-MM-DD", value) from None

    def fill(self, cls, raw: dict, section: str, **given):
        values = dict(given)
        hints = {f.name: f.type for f in dataclasses.fields(cls)}
        for key, value in raw.items():
            if key in given:
                continue
            name = f"{section}.{key}"
            hint = str(hints[key])
            optional = "None" in hint
            if value is None and optional:
                values[key] = None
            elif hint.startswith("tuple[Path"):
                values[key] = tuple(self.path(v, name) for v in self.array(value, name))
            elif hint.startswith("tuple[str"):
                values[key] = tuple(self.string(v, name) for v in self.array(value, name))
            elif hint.startswith("Path"):
                values[key] = self.path(value, name)
            elif hint.startswith("bool"):
                values[key] = self._bool(value, name)
            elif hint.startswith("int"):
                values[key] = self._number(value, name, int)
            elif hint.startswith("float"):
                values[key] = self._number(value, name, float)
            elif hint.startswith("str"):
                values[key] = self.string(value, name)
            else:  # pragma: no cover - a field type this reader does not know is a programming error
                raise TypeError(f"no reader for {cls.__name__}.{key}: {hint}")
        return cls(**values)

    def _bool(self, value: Any, key: str) -> bool:
        if isinstance(value, bool):
            return value
        if isinstance(value, str) and value.lower() in ("true", "false", "1", "0", "yes", "no"):
            return value.lower() in ("true", "1", "yes")
        raise self.fail(key, "true or false", value)

    def _number(self, value: Any, key: str, kind):
        if isinstance(value, bool):
            raise self.fail(key, "a number", value)
        try:
            number = kind(value) if isinstance(value, str) else value
        except ValueError:
            raise self.fail(key, "a number", value) from None
        if kind is int and isinstance(number, float) and number.is_integer():
            number = int(number)
        if not isinstance(number, (int, float)) or (kind is int and not isinstance(number, int)):
            raise self.fail(key, "a whole number" if kind is int else "a number", value)
        return kind(number)
