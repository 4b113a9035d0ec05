"""Command line: a thin skin over the library. Each command parses flags, calls one function, prints.

Exit codes (docs/cli.md): 0 done; 1 an error the user can fix (one line on stderr, no traceback);
2 bad usage (click's own); 3 a release limit breached.
"""

from __future__ import annotations

import dataclasses
import json
import os
import sys
from datetime import date
from pathlib import Path

import click

from auditor import __version__
from auditor.config import REPORT_OUTPUTS, Config, load_config
from auditor.errors import AuditorError, InputError
from auditor.history.diff import diff_runs, format_diff
from auditor.history.lock import ScanLock
from auditor.history.runs import format_runs, list_runs, load_run, previous_run
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement.calibrate import calibrate as run_calibrate
from auditor.judgement.calibrate import format_calibration
from auditor.language import detect_or, from_tag
from auditor.report import write_report
from auditor.results import Run
from auditor.retrieval.index import PassageIndex, describe_hits
from auditor.scan import audit_and_report, default_out_dir, load_question_files, question_lines, summary_lines
from auditor.scan import scan as run_scan
from auditor.store import Store
from auditor.temporal.extract import extract

EXIT_GATE_FAILED = 3


class AuditorGroup(click.Group):
    """Turns every AuditorError into one line on stderr and exit code 1, for main() and CliRunner alike."""

    def invoke(self, ctx: click.Context):
        try:
            return super().invoke(ctx)
        except AuditorError as exc:
            click.echo(f"error: {exc}", err=True)
            ctx.exit(1)


def _config(
    path: str | None,
    *,
    db: str | None = None,
    as_of: date | None = None,
    horizon: int | None = None,
    out: str | None = None,
    outputs: str | None = None,
) -> Config:
    """Defaults < file < environment < flags. Without -c, ./audit.toml is used when present."""
    if path is None:
        path = os.environ.get("AUDITOR_CONFIG") or ("audit.toml" if Path("audit.toml").is_file() else None)
    config = load_config(path)
    changes: dict = {}
    if db:
        changes["database"] = Path(db)
    if as_of:
        changes["as_of"] = as_of
    if horizon is not None:
        if horizon < 0:
            raise click.BadParameter("must not be negative", param_hint="--horizon")
        changes["freshness"] = dataclasses.replace(config.freshness, horizon_days=horizon)
    report = config.report
    if out:
        report = dataclasses.replace(report, out=Path(out))
    if outputs is not None:
        names = tuple(n.strip() for n in outputs.split(",") if n.strip() and n.strip() != "none")
        unknown = [n for n in names if n not in REPORT_OUTPUTS]
        if unknown:
            raise click.BadParameter(
                f"unknown output {unknown[0]!r}; choose from {', '.join(REPORT_OUTPUTS)} or none",
                param_hint="--outputs",
            )
        report = dataclasses.replace(report, outputs=names)
    if report != config.report:
        changes["report"] = report
    return config.replace(**changes) if changes else config


def _progress(quiet: bool) -> bool:
    return not quiet and sys.stderr.isatty()


class IsoDate(click.ParamType):
    name = "YYYY-MM-DD"

    def convert(self, value, param, ctx):
        if isinstance(value, date):
            return value
        try:
            return date.fromisoformat(value)
        except ValueError:
            self.fail(f"{value!r} is not a date YYYY-MM-DD", param, ctx)


ISO_DATE = IsoDate()
config_option = click.option(
    "-c",
    "--config",
    "config_path",
    type=click.Path(dir_okay=False),
    help="TOML config (default: ./audit.toml when present).",
)
db_option = click.option(
    "--db", type=click.Path(dir_okay=False), help="SQLite database (default: the config's, else ./auditor.db)."
)
wait_option = click.option(
    "--wait",
    type=click.FloatRange(min=0),
    default=0.0,
    help="Wait this many seconds for another scan's lock (default: refuse at once).",
)
quiet_option = click.option(
    "-q", "--quiet", is_flag=True, help="No progress bar (one is drawn on stderr only when it is a terminal)."
)
outputs_option = click.option(
    "--outputs",
    help="Files for CI and chat beside the report, comma-separated: junit (junit.xml), summary (summary.md); "
    "'none' for neither (default: the config's [report] outputs).",
)


@click.group(cls=AuditorGroup, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="auditor")
def cli():
    """Corpus Auditor: which questions does the knowledge base not support, or support only with stale passages?"""


@cli.command()
@config_option
@click.option("--as-of", type=ISO_DATE, help="Audit date (default: the config's, else today).")
@click.option("--out", type=click.Path(file_okay=False), help="Report folder (default: reports/<as-of>/).")
@wait_option
@click.option("--jobs", type=click.IntRange(min=1), help="Parser processes (default: one per core).")
@click.option("--cluster", help="Dask scheduler to run on: tcp://host:port, local or local:N (docs/scale.md).")
@outputs_option
@quiet_option
def scan(config_path, as_of, out, wait, jobs, cluster, outputs, quiet):
    """The main job: ingest, audit, compare with the last run, check the release limits, report."""
    config = _config(config_path, as_of=as_of, out=out, outputs=outputs)
    if cluster:
        config = config.replace(cluster=dataclasses.replace(config.cluster, scheduler=cluster))
    outcome = run_scan(config, wait=wait, jobs=jobs, progress=_progress(quiet))
    for line in outcome.question_lines:
        click.echo(line, err=True)
    click.echo(f"ingest: {outcome.ingest_line}")
    _finish(outcome.run, outcome.out_dir)


def _finish(run: Run, out_dir: Path) -> None:
    for line in summary_lines(run):
        click.echo(line)
    click.echo(f"report: {out_dir / 'index.html'}")
    if run.gate is not None and not run.gate.passed:
        click.echo(run.gate.message, err=True)
        sys.exit(EXIT_GATE_FAILED)


@cli.command()
@click.argument("paths", nargs=-1, required=True, type=click.Path(exists=True))
@config_option
@db_option
@click.option("--jobs", type=click.IntRange(min=1), help="Parser processes (default: one per core).")
@wait_option
@quiet_option
def ingest(paths, config_path, db, jobs, wait, quiet):
    """Ingest documents under PATH... into the database (unchanged files are skipped)."""
    config = _config(config_path, db=db)
    with ScanLock(config.database, wait=wait), Store(config.database) as store:
        summary = ingest_corpus(store, config, paths=[Path(p) for p in paths], jobs=jobs, progress=_progress(quiet))
    for error in summary.errors:
        click.echo(f"failed: {error}", err=True)
    click.echo(summary.line())


@cli.command()
@click.option(
    "--questions",
    "question_files",
    multiple=True,
    type=click.Path(dir_okay=False),
    help="Question set or query log (CSV, JSONL or text); default: the config's.",
)
@config_option
@db_option
@click.option("--as-of", type=ISO_DATE, help="Audit date (default: the config's, else today).")
@click.option("--horizon", type=int, help="Freshness horizon in days (default: the config's, else 365).")
@click.option("--out", type=click.Path(file_okay=False), help="Report folder (default: reports/<as-of>/).")
@wait_option
@outputs_option
@quiet_option
def audit(question_files, config_path, db, as_of, horizon, out, wait, outputs, quiet):
    """Audit the stored corpus against a question set and write the report."""
    config = _config(config_path, db=db, as_of=as_of, horizon=horizon, out=out, outputs=outputs)
    sets = load_question_files(config, [Path(p) for p in question_files] or None)
    for line in question_lines(sets):
        click.echo(line, err=True)
    with ScanLock(config.database, wait=wait), Store(config.database) as store:
        run, out_dir = audit_and_report(store, config, sets, as_of=config.audit_date(), progress=_progress(quiet))
    _finish(run, out_dir)


@cli.command()
@config_option
@db_option
@click.option("--run", "run_id", type=int, help="Run id (default: the newest).")
@click.option("--out", type=click.Path(file_okay=False), help="Report folder (default: reports/<as-of>/).")
@outputs_option
@quiet_option
def report(config_path, db, run_id, out, outputs, quiet):
    """Write the report of a stored run again, without re-auditing."""
    config = _config(config_path, db=db, out=out, outputs=outputs)
    with Store(config.database) as store:
        run = load_run(store, run_id)
    out_dir = default_out_dir(config, date.fromisoformat(run.info.as_of))
    index = write_report(
        run,
        out_dir,
        outputs=config.report.outputs,
        stale_in_junit=config.report.stale_in_junit,
        progress=_progress(quiet),
    )
    click.echo(f"report: {index}")


@cli.command()
@config_option
@db_option
def runs(config_path, db):
    """Run history."""
    with Store(_config(config_path, db=db).database) as store:
        click.echo(format_runs(list_runs(store)))


@cli.command()
@click.argument("base", type=int, required=False)
@click.argument("head", type=int, required=False)
@config_option
@db_option
def diff(base, head, config_path, db):
    """What changed between two runs (default: the newest and the one before it)."""
    with Store(_config(config_path, db=db).database) as store:
        head_run = load_run(store, head)
        if base is None:
            base = previous_run(store, head_run.info.id) if head_run.info.id is not None else None
            if base is None:
                # The first scan of a schedule is not an error: say so and succeed.
                click.echo(
                    f"run {head_run.info.id} ({head_run.info.as_of}) is the first finished run; nothing to compare yet"
                )
                return
        click.echo(format_diff(diff_runs(load_run(store, base), head_run)))


@cli.command()
@click.argument("files", nargs=-1, type=click.Path(allow_dash=True, dir_okay=False))
@config_option
@click.option("--reference-date", type=ISO_DATE, help="Anchor for relative expressions (default: today).")
@click.option("--day-first/--month-first", default=None, help="Read 03/04/2025 as 3 April (default: the config's).")
@click.option(
    "--fiscal-year-start", type=click.IntRange(1, 12), help="Month the fiscal year starts (default: the config's)."
)
@click.option("--hemisphere", type=click.Choice(["north", "south"]), help="For seasons (default: the config's).")
@click.option(
    "--language",
    default="auto",
    show_default=True,
    help="Language of the text: a name (german) or code (de); auto detects it per file.",
)
def dates(files, config_path, reference_date, day_first, fiscal_year_start, hemisphere, language):
    """Temporal expressions in FILE... (or standard input) as JSON lines, each naming the language used."""
    config = _config(config_path)
    corpus = config.corpus
    if day_first is None:
        day_first = corpus.day_first
    chosen = None if language == "auto" else from_tag(language)
    if language != "auto" and chosen is None:
        raise click.BadParameter(f"unknown language {language!r}; give e.g. 'german', 'de' or 'auto'")
    for name in files or ("-",):
        if name == "-":
            text = sys.stdin.read()
        else:
            try:
                text = Path(name).read_text(encoding="utf-8", errors="replace")
            except OSError as exc:
                raise InputError(f"{name!r}: cannot read ({exc.strerror})") from None
        used = chosen or detect_or(text, config.retrieval.detect, config.retrieval.detect[0])
        for expression in extract(
            text,
            reference_date or date.today(),
            day_first=day_first,
            fiscal_year_start=fiscal_year_start or corpus.fiscal_year_start,
            hemisphere=hemisphere or corpus.hemisphere,
            language=used,
        ):
            click.echo(json.dumps({**expression.as_json(), "language": used}, ensure_ascii=False))


@cli.command()
@click.argument("query")
@config_option
@db_option
@click.option("-k", "k", type=click.IntRange(min=1), default=5, show_default=True, help="How many passages.")
@click.option("--json", "as_json", is_flag=True, help="JSON instead of text.")
def search(query, config_path, db, k, as_json):
    """Top passages for QUERY with a per-term score breakdown."""
    config = _config(config_path, db=db)
    with Store(config.database) as store:
        result = PassageIndex.load_or_build(store, config.retrieval).search(query, k)
        hits = describe_hits(store, result)
    if as_json:
        click.echo(
            json.dumps(
                {
                    "query": query,
                    "terms": result.terms,
                    "missing_terms": result.missing_terms,
                    "message": result.message,
                    "hits": hits,
                },
                ensure_ascii=False,
                indent=2,
            )
        )
        return
    if result.missing_terms:
        click.echo(f"never in the corpus: {', '.join(result.missing_terms)}")
    if not hits:
        click.echo(result.message or "no passage matches")
    for rank, hit in enumerate(hits, 1):
        breakdown = ", ".join(f"{t} {s:.2f}" for t, s in sorted(hit["term_scores"].items(), key=lambda x: -x[1]))
        where = hit["document"] + (f" p.{hit['page']}" if hit.get("page") else "")
        click.echo(f"{rank}. {hit['score']:.3f}  {where}  {hit['section']}\n   [{breakdown}]\n   {hit['text'][:240]}")


@cli.command()
@click.option("--labels", required=True, type=click.Path(dir_okay=False), help="Labelled questions CSV.")
@config_option
@db_option
@click.option(
    "--target-precision",
    type=click.FloatRange(0, 1),
    help="Pick the threshold that finds the most gaps while keeping this gap precision.",
)
@click.option(
    "--holdout", is_flag=True, help="Also hide each question's expected documents and measure the gap verdict."
)
@quiet_option
def calibrate(labels, config_path, db, target_precision, holdout, quiet):
    """Choose support thresholds from labelled questions; later audits use them."""
    config = _config(config_path, db=db)
    with Store(config.database) as store:
        outcome = run_calibrate(
            store, config, Path(labels), target_precision=target_precision, holdout=holdout, progress=_progress(quiet)
        )
    click.echo(format_calibration(outcome))


def main() -> None:
    cli(prog_name="auditor")


if __name__ == "__main__":  # pragma: no cover
    main()
