"""Support thresholds from a team's own labelled questions (`auditor calibrate --labels FILE`).

The labels file is CSV with a header: `question` and `answerable` (yes/no) are required,
`expected_document` (a path relative to the source root; several separated by ";") and `id`,
`topic`, `owner`, `weight`, `note` are optional. A question is a gap when its best passage support is
below the threshold, so the gap verdict is a classifier of "not answerable": this module measures it
(ROC AUC, precision / recall / F1 across thresholds), picks a threshold — maximum F1, or the highest
recall that still reaches a target precision — and stores it in `calibrations`, where the next
audit finds it.
"""

from __future__ import annotations

import csv
from dataclasses import dataclass
from pathlib import Path

from auditor.clock import utc_now
from auditor.config import Config
from auditor.errors import InputError
from auditor.judgement.measures import roc_auc
from auditor.judgement.thresholds import resolve_thresholds
from auditor.judgement.verdicts import assess_questions
from auditor.progress import Progress
from auditor.retrieval.index import PassageIndex
from auditor.store import Store, dumps

REQUIRED = ("question", "answerable")
OPTIONAL = ("expected_document", "id", "topic", "owner", "weight", "note")
_YES = {"yes", "y", "true", "1"}
_NO = {"no", "n", "false", "0"}

# The thresholds printed in the table (the chosen one is added): a 0.05 grid, common practice.
TABLE_GRID = tuple(round(0.05 * i, 2) for i in range(1, 20))


@dataclass(frozen=True)
class Label:
    question: str
    answerable: bool
    expected_documents: tuple[str, ...] = ()
    id: str = ""


def load_labels(path: str | Path) -> list[Label]:
    """Read a labels CSV; any problem is an InputError naming the file (and the line)."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise InputError(f"{str(path)!r}: labels file not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"{str(path)!r}: cannot read labels file ({exc})") from None
    reader = csv.DictReader(text.splitlines())
    columns = [c.strip().lower() for c in (reader.fieldnames or [])]
    missing = [c for c in REQUIRED if c not in columns]
    if missing:
        raise InputError(
            f"{str(path)!r}: labels need the column(s) {', '.join(missing)} "
            f"(header has {', '.join(columns) or 'nothing'})"
        )
    unknown = [c for c in columns if c not in REQUIRED + OPTIONAL]
    if unknown:
        raise InputError(
            f"{str(path)!r}: unknown column(s) {', '.join(unknown)}; expected {', '.join(REQUIRED + OPTIONAL)}"
        )
    reader.fieldnames = columns
    labels = []
    for line, row in enumerate(reader, start=2):
        if None in row:
            raise InputError(f"{str(path)!r}: line {line} has more fields than the header")
        question = (row.get("question") or "").strip()
        answer = (row.get("answerable") or "").strip().lower()
        if not question:
            raise InputError(f"{str(path)!r}: line {line}: empty question")
        if answer not in _YES | _NO:
            raise InputError(f"{str(path)!r}: line {line}: answerable must be yes or no, not {answer!r}")
        docs = tuple(d.strip() for d in (row.get("expected_document") or "").split(";") if d.strip())
        labels.append(Label(question, answer in _YES, docs, (row.get("id") or "").strip() or f"l{line - 1}"))
    if not labels:
        raise InputError(f"{str(path)!r}: no labelled questions")
    if all(l.answerable for l in labels) or not any(l.answerable for l in labels):
        raise InputError(f"{str(path)!r}: labels need both answerable and unanswerable questions")
    return labels


# --- measures -------------------------------------------------------------------------------------


def gap_metrics(supports: list[float], unanswerable: list[bool], threshold: float) -> dict:
    """Precision, recall and F1 of the gap verdict (support < threshold) against the labels."""
    tp = sum(1 for s, u in zip(supports, unanswerable) if s < threshold and u)
    fp = sum(1 for s, u in zip(supports, unanswerable) if s < threshold and not u)
    fn = sum(1 for s, u in zip(supports, unanswerable) if s >= threshold and u)
    precision = tp / (tp + fp) if tp + fp else 1.0  # no gap verdicts: none of them is wrong
    recall = tp / (tp + fn) if tp + fn else 0.0
    f1 = 2 * precision * recall / (precision + recall) if precision + recall else 0.0
    return {
        "threshold": round(threshold, 4),
        "gaps": tp + fp,
        "tp": tp,
        "fp": fp,
        "fn": fn,
        "precision": precision,
        "recall": recall,
        "f1": f1,
    }


def candidate_thresholds(supports: list[float]) -> list[float]:
    """Midpoints between adjacent distinct support values, plus one below and one above all: every
    distinct gap verdict, each at the threshold farthest from the scores on either side."""
    values = sorted(set(round(s, 6) for s in supports))
    inner = [(a + b) / 2 for a, b in zip(values, values[1:])]
    return [max(0.0, values[0] - 0.01)] + inner + [min(1.0, values[-1] + 0.01)]


def choose_threshold(
    supports: list[float], unanswerable: list[bool], *, target_precision: float | None = None
) -> tuple[dict, str]:
    """The maximum-F1 threshold, or with `target_precision` the highest recall reaching it.

    Returns (metrics at the chosen threshold, how it was chosen). When no threshold reaches the
    target, maximum F1 is used and the choice says so.
    """
    rows = [gap_metrics(supports, unanswerable, t) for t in candidate_thresholds(supports)]
    if target_precision is not None:
        reaching = [r for r in rows if r["precision"] >= target_precision and r["gaps"] > 0]
        if reaching:
            best = max(reaching, key=lambda r: (r["recall"], -r["threshold"]))
            return best, f"highest recall with precision >= {target_precision:g}"
        choice = f"max F1 (no threshold reaches precision {target_precision:g})"
    else:
        choice = "max F1"
    return max(rows, key=lambda r: (r["f1"], -r["threshold"])), choice


# --- the command ----------------------------------------------------------------------------------


def calibrate(
    store: Store,
    config: Config,
    labels_path: str | Path,
    *,
    target_precision: float | None = None,
    holdout: bool = False,
    progress: bool = False,
) -> dict:
    """Measure the gap verdict on labelled questions, choose a threshold and store it.

    With `holdout`, each answerable question's expected documents are hidden and the share of those
    questions that then get the gap verdict is measured (how often a removed answer would be caught).
    `progress` draws a bar on stderr over the questions searched (auditor/progress.py).
    """
    labels = load_labels(labels_path)
    index = PassageIndex.load_or_build(store, config.retrieval)
    previous = resolve_thresholds(store, config, index)
    k = config.retrieval.top_k
    texts = [l.question for l in labels]
    picked = [l for l in labels if l.answerable and l.expected_documents] if holdout else []
    bar = Progress("calibrate", 2 if picked else 1, enabled=progress)  # one step per batch searched
    supports = [a.support for a in assess_questions(store, index, texts, k)]
    bar.step()
    unanswerable = [not l.answerable for l in labels]
    auc = roc_auc(
        [-s for s, u in zip(supports, unanswerable) if u], [-s for s, u in zip(supports, unanswerable) if not u]
    )
    chosen, choice = choose_threshold(supports, unanswerable, target_precision=target_precision)
    threshold = chosen["threshold"]
    table = [gap_metrics(supports, unanswerable, t) for t in sorted(set(TABLE_GRID) | {threshold})]

    held = None
    if holdout:
        known = {r["path"] for r in store.query("SELECT path FROM documents WHERE status = 'active'")}
        if picked:
            hidden = [set(l.expected_documents) for l in picked]
            hidden_supports = [
                a.support for a in assess_questions(store, index, [l.question for l in picked], k, hidden=hidden)
            ]
            bar.step()
            fired = sum(1 for s in hidden_supports if s < threshold)
            held = {
                "questions": len(picked),
                "gap": fired,
                "gap_rate": fired / len(picked),
                "unknown_documents": sorted({d for l in picked for d in l.expected_documents} - known),
            }
        else:
            held = {"questions": 0, "gap": 0, "gap_rate": None, "unknown_documents": []}

    bar.done()
    thresholds = {"support": threshold, "weak_margin": config.support.weak_margin}
    metrics = {
        "auc": auc,
        "choice": choice,
        "precision": chosen["precision"],
        "recall": chosen["recall"],
        "f1": chosen["f1"],
        "questions": len(labels),
        "unanswerable": sum(unanswerable),
        "holdout": held,
    }
    created = utc_now()
    with store.transaction():
        calibration_id = store.db.execute(
            "INSERT INTO calibrations (created, labels, thresholds, metrics) VALUES (?, ?, ?, ?)",
            [created, str(labels_path), dumps(thresholds), dumps(metrics)],
        ).lastrowid
    return {
        "id": calibration_id,
        "labels": str(labels_path),
        "created": created,
        "thresholds": thresholds,
        "previous": previous,
        "metrics": metrics,
        "table": table,
        "questions": [
            {"id": l.id, "question": l.question, "answerable": l.answerable, "support": s, "gap": s < threshold}
            for l, s in zip(labels, supports)
        ],
    }


def format_calibration(outcome: dict) -> str:
    """The printable table: metrics across thresholds, the chosen row marked."""
    m = outcome["metrics"]
    chosen = outcome["thresholds"]["support"]
    lines = [
        f"labels: {outcome['labels']} ({m['questions']} questions, {m['unanswerable']} not answerable)",
        f"ROC AUC of support for 'not answerable': {m['auc']:.3f}",
        "",
        f"{'threshold':>9}  {'gaps':>5}  {'precision':>9}  {'recall':>6}  {'F1':>5}",
    ]
    for row in outcome["table"]:
        mark = "  <- chosen" if row["threshold"] == chosen else ""
        lines.append(
            f"{row['threshold']:>9.3f}  {row['gaps']:>5}  {row['precision']:>9.3f}  "
            f"{row['recall']:>6.3f}  {row['f1']:>5.3f}{mark}"
        )
    held = m.get("holdout")
    if held is not None:
        lines.append("")
        if held["questions"]:
            lines.append(
                f"hold-out: expected documents hidden for {held['questions']} answerable questions; "
                f"gap verdict fires for {held['gap']} ({held['gap_rate']:.0%})"
            )
        else:
            lines.append("hold-out: no answerable question names an expected document")
        if held["unknown_documents"]:
            lines.append(f"hold-out: not in the corpus: {', '.join(held['unknown_documents'])}")
    previous = outcome["previous"]
    lines += [
        "",
        f"stored support threshold {chosen:.3f} ({m['choice']}; was {previous['support']:.3f} "
        f"from {previous['source']}), weak margin {outcome['thresholds']['weak_margin']:.3f}; "
        f"calibration {outcome['id']}",
    ]
    return "\n".join(lines)
