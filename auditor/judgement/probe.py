"""The corpus probe: a support threshold fitted to this knowledge base without labels (docs/judgement.md).

How support behaves depends on the corpus: a reference manual whose every page repeats the same
twenty words gives an off-topic question more support than a help centre of short distinct
articles does. The probe measures that on the corpus itself, with the hide-the-source idea of the
labelled hold-out (`auditor calibrate --holdout`) made label-free:

1. draw probe questions from the corpus's own passages (seeded): a sentence of a passage, reduced
   to a few of its content words, as a searcher would type them;
2. judge each probe twice with the audit's own functions: once against the whole corpus (its
   source is there: how support looks when the answer exists) and once with its source document
   and that passage's near-duplicates hidden (how support looks when the knowledge base talks about
   the topic but does not hold the answer);
3. place the threshold at `scale` times the lower quartile of the visible supports: how much
   support a question reaches on this corpus when its answer is there sets the scale of support,
   and the threshold is a fixed fraction of it. The hidden pass gives the probe's separation, the
   ROC AUC of visible against hidden support: how well support tells a present answer from an
   absent one on this corpus (a query-performance figure in the sense of Cronen-Townsend, Zhou &
   Croft, SIGIR 2002, measured instead of predicted), shown beside the threshold.

`scale` is the one setting. Its default was chosen on two labelled Debian documentation corpora and
checked leave-one-corpus-out on three (bench/transfer.py, figures in bench/README.md), never on the
corpus being audited. Placing the threshold at a quantile of the hidden supports instead was
measured too and transferred worse (bench/README.md).

The probe is deterministic for a corpus and its settings, and cached in the store's meta table under
the corpus fingerprint, so an unchanged corpus is probed once.
"""

from __future__ import annotations

import json
import random
import re
from dataclasses import asdict, dataclass, field

from auditor.errors import ConfigError
from auditor.judgement.measures import roc_auc
from auditor.judgement.support import split_sentences
from auditor.judgement.verdicts import assess_questions, load_passages
from auditor.retrieval.index import PassageIndex, corpus_fingerprint
from auditor.store import SEARCHED_STATUSES, Store

# Probe questions per corpus: enough for a stable quantile (the 0.9-quantile of 200 draws moves by
# about 0.02 between seeds on the bench corpora), few enough to cost well under a second.
PROBE_QUESTIONS = 200
# Content words per probe question: real help-desk questions carry three to six (bench/data/).
PROBE_TERMS = 4
# The threshold is SCALE times the VISIBLE_QUANTILE of the visible supports (bench/transfer.py).
VISIBLE_QUANTILE = 0.25
SCALE = 0.55
# Passages sharing this share of their distinct terms with the source are near-duplicates (Jaccard
# resemblance, Broder, "On the resemblance and containment of documents", 1997).
NEAR_DUPLICATE = 0.8
# Probes are drawn from sentences of at least this many words (headings and list stubs are not
# questions anyone would ask about).
MIN_SENTENCE_WORDS = 8
META_KEY = "support_probe"
# Fewer probe questions than this give no usable quantile (a corpus of a few pages).
MIN_PROBES = 20

_WORD = re.compile(r"[^\W\d_][\w'-]*[^\W_]|[^\W\d_]", re.U)


class ProbeUnavailable(Exception):
    """The corpus is too small to probe; the configured threshold stays."""


@dataclass(frozen=True)
class ProbeSettings:
    questions: int = PROBE_QUESTIONS
    terms: int = PROBE_TERMS
    scale: float = SCALE
    seed: int = 0

    def check(self, where: str = "config") -> None:
        """ConfigError naming `where` (a file) for settings the probe cannot use."""
        if not MIN_PROBES <= self.questions <= 5000:
            raise ConfigError(f"{where!r}: support.probe_questions must be between 20 and 5000, not {self.questions}")
        if not 2 <= self.terms <= 10:
            raise ConfigError(f"{where!r}: support.probe_terms must be between 2 and 10, not {self.terms}")
        if not 0.0 < self.scale < 1.0:
            raise ConfigError(f"{where!r}: support.probe_scale must be above 0 and below 1, not {self.scale}")


@dataclass(frozen=True)
class ProbeOutcome:
    threshold: float
    visible: list[float] = field(default_factory=list)  # support of each probe with its source present
    hidden: list[float] = field(default_factory=list)  # ... and with its source hidden
    settings: ProbeSettings = ProbeSettings()
    corpus: str = ""  # corpus fingerprint the probe was measured on

    def summary(self) -> dict:
        """What results.json and the report show of the probe."""
        return {
            "probes": len(self.hidden),
            "scale": self.settings.scale,
            "visible_quartile": round(_quantile(self.visible, VISIBLE_QUANTILE), 4),
            "hidden_median": round(_quantile(self.hidden, 0.5), 4),
            "separation": round(self.separation, 4),
        }

    @property
    def separation(self) -> float:
        """ROC AUC of visible against hidden probe support (0.5: support cannot tell them apart)."""
        return roc_auc(self.visible, self.hidden)


def _quantile(values: list[float], q: float) -> float:
    """Linear-interpolated quantile (type 7 of Hyndman & Fan, The American Statistician 1996)."""
    ordered = sorted(values)
    if not ordered:
        raise ValueError("quantile of nothing")
    position = q * (len(ordered) - 1)
    low = int(position)
    high = min(low + 1, len(ordered) - 1)
    return ordered[low] + (ordered[high] - ordered[low]) * (position - low)


def place_threshold(visible: list[float], scale: float) -> float:
    """`scale` times the VISIBLE_QUANTILE of the probes' support with their source present."""
    return round(scale * _quantile(visible, VISIBLE_QUANTILE), 4)


def probe_questions(store: Store, index: PassageIndex, settings: ProbeSettings) -> list[tuple[str, int, str]]:
    """(probe text, source passage id, source document path), seeded; fewer when the corpus is small."""
    rows = store.db.execute(
        "SELECT p.id FROM passages p JOIN documents d ON d.id = p.document_id "
        f"WHERE d.status IN {SEARCHED_STATUSES} AND p.token_count >= ? ORDER BY p.id",
        [MIN_SENTENCE_WORDS],
    ).fetchall()
    rng = random.Random(settings.seed)
    ids = [r[0] for r in rows]
    picked = sorted(rng.sample(ids, min(len(ids), settings.questions * 2)))  # some have no usable sentence
    passages = load_passages(store, picked)
    out = []
    for pid in picked:
        text = passages[pid]["text"]
        sentences = [text[a:b] for a, b in split_sentences(text)]
        candidates = []
        for sentence in sentences:
            words = [w for w in dict.fromkeys(_WORD.findall(sentence)) if index.tokenizer.tokenize(w)]
            if len(_WORD.findall(sentence)) >= MIN_SENTENCE_WORDS and len(words) >= settings.terms:
                candidates.append(words)
        if not candidates:
            continue
        words = rng.choice(candidates)
        keep = sorted(rng.sample(range(len(words)), settings.terms))
        out.append((" ".join(words[i] for i in keep), pid, passages[pid]["path"]))
        if len(out) == settings.questions:
            break
    return out


def _jaccard(a: set, b: set) -> float:
    return len(a & b) / len(a | b) if a or b else 0.0


def run_probe(store: Store, index: PassageIndex, k: int, settings: ProbeSettings = ProbeSettings()) -> ProbeOutcome:
    """Probe the corpus (no cache); raises ConfigError for unusable settings."""
    settings.check()
    probes = probe_questions(store, index, settings)
    if len(probes) < MIN_PROBES:
        raise ProbeUnavailable(f"the corpus gives {len(probes)} probe questions; at least {MIN_PROBES} are needed")
    texts = [p[0] for p in probes]
    visible = assess_questions(store, index, texts, k)
    # Near-duplicates of the source among the visible hits are hidden with it.
    hit_texts = load_passages(store, sorted({pid for _, pid, _ in probes}))
    tokenize = index.tokenizer.tokenize
    hidden_docs = []
    for (_, pid, path), seen in zip(probes, visible):
        source = set(tokenize(hit_texts[pid]["text"]))
        drop = {path}
        for doc, text in zip(seen.documents, seen.texts):
            if _jaccard(source, set(tokenize(text))) >= NEAR_DUPLICATE:
                drop.add(doc)
        hidden_docs.append(drop)
    hidden = assess_questions(store, index, texts, k, hidden=hidden_docs)
    visible_supports = [a.support for a in visible]
    return ProbeOutcome(
        place_threshold(visible_supports, settings.scale),
        visible_supports,
        [a.support for a in hidden],
        settings,
        corpus_fingerprint(store),
    )


def cached_probe(store: Store, index: PassageIndex, k: int, settings: ProbeSettings = ProbeSettings()) -> ProbeOutcome:
    """The stored probe of this corpus and settings, else a fresh one (then stored)."""
    fingerprint = corpus_fingerprint(store)
    stored = store.get_meta(META_KEY)
    key = {"corpus": fingerprint, "settings": asdict(settings), "k": k}
    if stored:
        try:
            data = json.loads(stored)
            if data.get("key") == key:
                return ProbeOutcome(float(data["threshold"]), data["visible"], data["hidden"], settings, fingerprint)
        except (ValueError, KeyError, TypeError):
            pass  # a damaged cache entry is measured again
    outcome = run_probe(store, index, k, settings)
    payload = {"key": key, "threshold": outcome.threshold, "visible": outcome.visible, "hidden": outcome.hidden}
    with store.transaction():
        store.set_meta(META_KEY, json.dumps(payload))
    return outcome
