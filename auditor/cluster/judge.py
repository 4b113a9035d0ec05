"""Judging on the cluster's workers: questions in batches, each with only the passages it retrieved.

The audit (auditor/judgement/audit.py) retrieves first, then judges every question from its search
result, the retrieved passages and their dated statements: pure work over plain data. `ClusterJudge`
runs the audit's own judging function on the workers, a batch of questions per task, and hands the
results back in question order. Each batch carries the passages and statements of its own hits, so
what crosses the network is what the judge reads and no more.

The tokenizer (a Snowball stemmer, which cannot be pickled) is rebuilt once per worker process from
its settings.
"""

from __future__ import annotations

from collections.abc import Callable

from auditor.cluster.backend import Cluster
from auditor.retrieval.tokenize import Tokenizer

QUESTION_BATCH = 250  # a batch's passages (k per question) stay well under a megabyte of text

_TOKENIZERS: dict[tuple[str, str], Tokenizer] = {}


def judge_batch(judge: Callable, tokenizer: tuple[str, str], questions, found, passages, statements, options) -> list:
    """Runs on a worker: `judge` over one batch with a tokenizer of the given settings."""
    tok = _TOKENIZERS.get(tokenizer) or _TOKENIZERS.setdefault(tokenizer, Tokenizer(*tokenizer))
    return judge(questions, found, passages, statements, tokenizer=tok, **options)


class ClusterJudge:
    """Stands in for the audit's judging function: same arguments, same results, run on the workers."""

    def __init__(self, cluster: Cluster, judge: Callable):
        self.cluster = cluster
        self.judge = judge

    def __call__(self, questions: list, found: list, passages: dict, statements: dict, *, tokenizer, **options) -> list:
        client = self.cluster.client
        settings = (tokenizer.language, tokenizer.stopwords_name)
        futures = []
        for start in range(0, len(questions), QUESTION_BATCH):
            batch = found[start : start + QUESTION_BATCH]
            ids = {hit.passage_id for result in batch for hit in result.hits}
            futures.append(
                client.submit(
                    judge_batch,
                    self.judge,
                    settings,
                    questions[start : start + QUESTION_BATCH],
                    batch,
                    {pid: passages[pid] for pid in ids if pid in passages},
                    {pid: statements[pid] for pid in ids if pid in statements},
                    options,
                    pure=False,
                )
            )
        out: list = []
        for i, future in enumerate(futures):
            out.extend(self.cluster.result(future, f"judging questions {i * QUESTION_BATCH + 1} and on"))
        return out
