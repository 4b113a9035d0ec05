"""The report of a run: index.html, results.json, gaps.csv, owners/<slug>.csv and owners/<slug>.html,
and when asked for, junit.xml and summary.md for CI servers and chat (auditor/report/ci.py).

`write_report(run, out_dir)` reads only the run (`auditor.results.Run`, docs/results-json.md), so a
stored run can be reported again at any time with the same bytes out. Who owns a question, and the
CSV columns, are documented in `auditor.report.exports`.
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from pathlib import Path

from auditor.judgement.explain import explain
from auditor.progress import Progress
from auditor.report.ci import junit_xml, summary_markdown
from auditor.report.exports import all_owners, document_owner, owner_questions, owner_slugs, write_atomic, write_exports
from auditor.report.html import Highlighter, build_view, render_page
from auditor.results import Run, Summary

# The page must stay under 15 MB (the size a browser opens comfortably, docs/results-json.md) with room
# to spare; when a run is too big for the full evidence, fewer items and shorter passage text go into
# the page (results.json keeps all).
PAGE_LIMIT_BYTES = 14_500_000
PAGE_LEVELS = ((3, 5_000_000), (2, 2_500_000), (1, 1_000_000), (0, 0))


def _render_within_limit(run: Run, **view_args) -> str:
    for page_evidence, text_budget in PAGE_LEVELS:
        page = render_page(build_view(run, page_evidence=page_evidence, text_budget=text_budget, **view_args))
        if len(page.encode("utf-8")) <= PAGE_LIMIT_BYTES:
            break
    return page


__all__ = ["write_report", "fill_explanations"]


def fill_explanations(run: Run) -> None:
    """Give every question of a run stored before explanations were kept (format 1) its sentence."""
    threshold = run.info.thresholds.support if run.info.thresholds else None
    for q in run.questions:
        if not q.explanation:
            q.explanation = explain(q, audit_date=run.info.as_of, threshold=threshold)


_OWNER_FILE = re.compile(r"^[a-z0-9-]+\.(csv|html)$")


def _remove_stale_owner_files(owners_dir: Path, written: set[str]) -> None:
    """Owner files of an earlier report in the same folder whose owner is gone would mislead."""
    if not owners_dir.is_dir():
        return
    for path in owners_dir.iterdir():
        if _OWNER_FILE.match(path.name) and path.name not in written and path.is_file():
            path.unlink()


def write_report(
    run: Run, out_dir: Path, *, outputs: Iterable[str] = (), stale_in_junit: str = "fail", progress: bool = False
) -> Path:
    """Write every file of the report into `out_dir` and return the path of index.html.

    Each file goes to a temporary name and is renamed into place; index.html is renamed last so
    that a reader who finds it also finds the files it links to. `outputs` adds "junit" (junit.xml,
    stale questions failing or, with `stale_in_junit="skip"`, skipped) and "summary" (summary.md).
    `progress` draws a bar on stderr over the pages written (auditor/progress.py). Owner files left
    in owners/ by an earlier report for owners this run no longer has are removed. Output is deterministic: the
    same run object gives the same bytes (no clock is read; every date comes from the run).
    """
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    fill_explanations(run)
    owners = all_owners(run)
    highlighter = Highlighter(run.info.tokenizer)  # one word cache for every page
    slugs = owner_slugs(owners)
    write_exports(run, out_dir, slugs)
    wanted = set(outputs)
    if "junit" in wanted:
        write_atomic(out_dir / "junit.xml", junit_xml(run, stale=stale_in_junit))
    if "summary" in wanted:
        write_atomic(out_dir / "summary.md", summary_markdown(run))

    bar = Progress("report", len(owners) + 1, enabled=progress)
    owner_links = []
    for owner in owners:
        own_q = owner_questions(run, owner)
        own_d = [d for d in run.documents if document_owner(d) == owner]
        slug = slugs[owner]
        owner_page_links = {
            "files": [
                ("Full report", "../index.html"),
                (f"{owner} CSV", f"{slug}.csv"),
                ("results.json", "../results.json"),
            ]
        }
        counts = Summary.of(own_q)
        page = _render_within_limit(
            run,
            questions=own_q,
            documents=own_d,
            summary=counts,
            owner=owner,
            links=owner_page_links,
            highlighter=highlighter,
        )
        write_atomic(out_dir / "owners" / f"{slug}.html", page)
        bar.step()
        owner_links.append(
            {
                "name": owner,
                "slug": slug,
                "questions": len(own_q),
                "supported": counts.supported,
                "stale": counts.stale,
                "gap": counts.gap,
                "at_risk": sum(float(q.weight or 0) for q in own_q if q.verdict in ("gap", "stale")),
            }
        )

    _remove_stale_owner_files(
        out_dir / "owners", {f"{slug}.{ext}" for slug in slugs.values() for ext in ("csv", "html")}
    )
    links: dict[str, list] = {
        "files": [("results.json", "results.json"), ("gaps.csv", "gaps.csv")],
        "owners": owner_links,
    }
    page = _render_within_limit(
        run,
        questions=run.questions,
        documents=run.documents,
        summary=run.summary,
        links=links,
        highlighter=highlighter,
    )
    index = out_dir / "index.html"
    write_atomic(index, page)
    bar.step()
    bar.done()
    return index
