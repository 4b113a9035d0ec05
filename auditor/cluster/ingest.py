"""Parsing on the cluster's workers, each writing its shard as Parquet; the client stores the shards.

The ingest pipeline (auditor/ingest/pipeline.py) decides on this machine what to parse and writes
the results to SQLite; `ShardRunner` stands in for its local process pool (auditor/ingest/pool.py)
with the same contract: (task, status, value) for every task, `value` as `parse_file` returns it.

A shard is a run of consecutive tasks (the pipeline's order: largest files first) of about equal
bytes, several per worker thread so that the scheduler can balance them. Its worker runs
`parse_file` on each and writes four Parquet files (pyarrow) into the shared folder:

    documents.parquet   one row per task: status and the document fields as JSON
    passages.parquet    text, place and token ids (ids local to the shard, int32 lists)
    statements.parquet  the dated statements of each passage
    terms.parquet       the shard's vocabulary: local id -> term

Shards are handed back in task order, not completion order, so documents and passages get the same
ids whatever the number of workers (the local pool with one job gives the same order). The client
merges each shard's vocabulary into the store's `terms` as it writes the shard.

Limits (docs/scale.md): `corpus.timeout_s` is not enforced on the workers (a thread cannot be
stopped; a hanging parser holds its worker until the engine's own timeouts); a worker that dies is
retried by Dask, and a shard that keeps killing workers stops the scan with one line.
"""

from __future__ import annotations

import json
import os
import shutil
from collections.abc import Callable, Iterator
from datetime import date
from pathlib import Path

import numpy as np
import pyarrow as pa
import pyarrow.parquet as pq

from auditor.cluster.backend import Cluster
from auditor.models import MetaDate, Passage, TemporalExpression

SHARDS_PER_THREAD = 4
MAX_SHARD_FILES = 2000  # keeps one shard's parsed output (held until written) to tens of MB


def split_shards(tasks: list[dict], sizes: list[int], shards: int) -> list[list[dict]]:
    """Consecutive runs of `tasks` of about equal total size, at most MAX_SHARD_FILES each."""
    if not tasks:
        return []
    target = max(1, sum(sizes) // max(1, shards))
    out: list[list[dict]] = [[]]
    held = 0
    for task, size in zip(tasks, sizes):
        if out[-1] and (held + size > target or len(out[-1]) >= MAX_SHARD_FILES):
            out.append([])
            held = 0
        out[-1].append(task)
        held += size
    return out


class ShardRunner:
    """`run_tasks` of auditor/ingest/pool.py on a Dask cluster (one call per ingest)."""

    def __init__(self, cluster: Cluster):
        self.cluster = cluster

    def __call__(
        self, tasks: list, target: Callable, settings, *, jobs: int, timeout: float, init: Callable | None = None
    ) -> Iterator[tuple[dict, str, object]]:
        # `jobs` and `timeout` belong to the local pool: the cluster's size is its own (module docstring).
        sizes = [max(1, int(os.path.getsize(t["file"]))) if os.path.exists(t["file"]) else 1 for t in tasks]
        shards = split_shards(tasks, sizes, SHARDS_PER_THREAD * self.cluster.threads)
        folder = self.cluster.work / "ingest"
        client = self.cluster.client
        futures = [
            client.submit(parse_shard, shard, target, settings, init, str(folder / f"{i:06d}"), pure=False)
            for i, shard in enumerate(shards)
        ]
        for i, (shard, future) in enumerate(zip(shards, futures)):
            path = Path(self.cluster.result(future, f"parsing shard {i} ({shard[0]['file']!r} and on)"))
            future.release()
            for task, (status, value) in zip(shard, read_shard(path)):
                yield task, status, value
            shutil.rmtree(path, ignore_errors=True)


# --- on a worker --------------------------------------------------------------------------------

_DOCUMENT = pa.schema([("status", pa.string()), ("value", pa.string())])
_PASSAGE = pa.schema(
    [
        ("doc", pa.int32()),
        ("ordinal", pa.int32()),
        ("text", pa.string()),
        ("heading_path", pa.list_(pa.string())),
        ("page", pa.int32()),
        ("char_start", pa.int64()),
        ("char_end", pa.int64()),
        ("tokens", pa.list_(pa.int32())),
    ]
)
_STATEMENT = pa.schema(
    [
        ("doc", pa.int32()),
        ("passage", pa.int32()),  # index in the document's passages
        ("text", pa.string()),
        ("expression", pa.string()),
        ("start", pa.date32()),
        ("end", pa.date32()),
        ("granularity", pa.string()),
        ("role", pa.string()),
        ("char_start", pa.int64()),
        ("char_end", pa.int64()),
    ]
)


def parse_shard(tasks: list[dict], target: Callable, settings, init: Callable | None, out: str) -> str:
    """Run target(task, settings) for each task and write the shard to `out`; returns `out`.

    Runs on a worker. Idempotent: a rerun after a worker died replaces the folder whole.
    """
    if init is not None:
        init(settings)
    documents: dict[str, list] = {name: [] for name in _DOCUMENT.names}
    passages: dict[str, list] = {name: [] for name in _PASSAGE.names}
    statements: dict[str, list] = {name: [] for name in _STATEMENT.names}
    vocabulary: dict[str, int] = {}
    for doc, task in enumerate(tasks):
        try:
            value = target(task, settings)
        except Exception as exc:  # reported for this file only, as the local pool does
            documents["status"].append("error")
            documents["value"].append(json.dumps(f"{type(exc).__name__}: {' '.join(str(exc).split())[:200]}"))
            continue
        documents["status"].append("ok")
        documents["value"].append(json.dumps(_document_json(value)))
        for index, (passage, tokens, found) in enumerate(value.get("passages", ())):
            passages["doc"].append(doc)
            passages["ordinal"].append(passage.ordinal)
            passages["text"].append(passage.text)
            passages["heading_path"].append(list(passage.heading_path))
            passages["page"].append(passage.page)
            passages["char_start"].append(passage.char_start)
            passages["char_end"].append(passage.char_end)
            passages["tokens"].append([vocabulary.setdefault(t, len(vocabulary)) for t in tokens])
            for s in found:
                statements["doc"].append(doc)
                statements["passage"].append(index)
                for name in ("text", "expression", "start", "end", "granularity", "role", "char_start", "char_end"):
                    statements[name].append(getattr(s, name))
    target_dir = Path(out)
    work = target_dir.with_name(target_dir.name + f".{os.getpid()}.tmp")
    shutil.rmtree(work, ignore_errors=True)
    work.mkdir(parents=True)
    pq.write_table(pa.table(documents, schema=_DOCUMENT), work / "documents.parquet")
    pq.write_table(pa.table(passages, schema=_PASSAGE), work / "passages.parquet")
    pq.write_table(pa.table(statements, schema=_STATEMENT), work / "statements.parquet")
    pq.write_table(
        pa.table({"term": list(vocabulary)}, schema=pa.schema([("term", pa.string())])), work / "terms.parquet"
    )
    shutil.rmtree(target_dir, ignore_errors=True)
    os.replace(work, target_dir)
    return out


def _document_json(value: dict) -> dict:
    """parse_file's result without its passages, as JSON (dates as ISO 8601 strings)."""
    out = {k: v for k, v in value.items() if k not in ("passages", "dates", "doc_date", "expires")}
    if value.get("ok"):
        out["dates"] = [[d.value.isoformat(), d.kind, d.source] for d in value["dates"]]
        out["doc_date"] = value["doc_date"].isoformat()
        out["expires"] = value["expires"].isoformat() if value["expires"] else None
    return out


# --- on the client ------------------------------------------------------------------------------


def read_shard(folder: Path) -> list[tuple[str, object]]:
    """(status, value) per task of a shard, `value` as parse_file returned it on the worker."""
    documents = pq.read_table(folder / "documents.parquet").to_pydict()
    passages = pq.read_table(folder / "passages.parquet")
    statements = pq.read_table(folder / "statements.parquet").to_pydict()
    terms = np.array(pq.read_table(folder / "terms.parquet").column("term").to_pylist(), dtype=object)
    by_passage: dict[tuple[int, int], list[TemporalExpression]] = {}
    for i, (doc, index) in enumerate(zip(statements["doc"], statements["passage"])):
        by_passage.setdefault((doc, index), []).append(
            TemporalExpression(
                statements["text"][i],
                statements["expression"][i],
                statements["start"][i],
                statements["end"][i],
                statements["granularity"][i],
                statements["role"][i],
                statements["char_start"][i],
                statements["char_end"][i],
            )
        )
    tokens = passages.column("tokens").combine_chunks()
    offsets = tokens.offsets.to_numpy()
    ids = tokens.values.to_numpy()
    columns = passages.drop_columns(["tokens"]).to_pydict()
    per_doc: dict[int, list] = {}
    for i, doc in enumerate(columns["doc"]):
        found = per_doc.setdefault(doc, [])
        passage = Passage(
            columns["ordinal"][i],
            columns["text"][i],
            tuple(columns["heading_path"][i]),
            columns["page"][i],
            columns["char_start"][i],
            columns["char_end"][i],
        )
        found.append((passage, terms[ids[offsets[i] : offsets[i + 1]]].tolist(), by_passage.get((doc, len(found)), [])))
    out: list[tuple[str, object]] = []
    for doc, (status, text) in enumerate(zip(documents["status"], documents["value"])):
        value = json.loads(text)
        if status == "ok" and value.get("ok"):
            value["dates"] = [MetaDate(date.fromisoformat(v), kind, source) for v, kind, source in value["dates"]]
            value["doc_date"] = date.fromisoformat(value["doc_date"])
            value["expires"] = date.fromisoformat(value["expires"]) if value["expires"] else None
            value["passages"] = per_doc.get(doc, [])
        if status == "ok" and "cpu" in value:
            value["cpu"] = tuple(value["cpu"])
        out.append((status, value))
    return out
