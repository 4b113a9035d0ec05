"""The corpus probe (auditor/judgement/probe.py) and where an audit's threshold comes from
(auditor/judgement/thresholds.py).

Two differently built knowledge bases, both ingested by the real pipeline: the demo help centre
(fixtures/demo/kb: Markdown, HTML and PDF articles of the invented Fernhollow cooperative) and the
project's own developer documentation (README.md, DEVELOPERS.md, bench/README.md: long Markdown
pages of prose and tables).
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import numpy as np
import pytest

from auditor.config import Config, CorpusConfig, SupportConfig, load_config
from auditor.errors import ConfigError
from auditor.ingest.pipeline import ingest_corpus
from auditor.judgement import probe
from auditor.judgement.thresholds import probe_settings, resolve_thresholds
from auditor.retrieval.index import PassageIndex
from auditor.store import Store

REPO = Path(__file__).resolve().parents[1]


def ingested(tmp_path: Path, name: str, root: Path, include: tuple[str, ...]) -> tuple[Store, Config]:
    db = tmp_path / f"{name}.db"
    config = Config(database=db, corpus=CorpusConfig(paths=(root,), include=include))
    store = Store(db)
    ingest_corpus(store, config, jobs=1)
    return store, config


@pytest.fixture(scope="module")
def corpora(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("probe")
    docs = tmp / "developer-docs"
    docs.mkdir()
    for name in ("README.md", "DEVELOPERS.md", "bench/README.md"):
        shutil.copy(REPO / name, docs / name.replace("/", "-"))
    built = {
        "demo": ingested(tmp, "demo", REPO / "fixtures" / "demo" / "kb", ("**/*.md", "**/*.html", "**/*.pdf")),
        "developer docs": ingested(tmp, "docs", docs, ("**/*.md",)),
    }
    yield built
    for store, _ in built.values():
        store.close()


def test_probe_moves_the_threshold_on_two_differently_built_corpora(corpora):
    thresholds = {}
    for name, (store, config) in corpora.items():
        index = PassageIndex.load_or_build(store, config.retrieval)
        outcome = probe.run_probe(store, index, config.retrieval.top_k)
        assert len(outcome.visible) == len(outcome.hidden) >= probe.MIN_PROBES
        # The placement rule against numpy's quantile (method "linear" is type 7 of Hyndman & Fan,
        # The American Statistician 1996, the definition probe._quantile follows).
        expected = probe.SCALE * float(np.quantile(outcome.visible, probe.VISIBLE_QUANTILE, method="linear"))
        assert outcome.threshold == pytest.approx(expected, abs=1e-4)
        # Hiding the source must cost support: the probe separates present from absent answers.
        assert outcome.separation > 0.8, name
        assert np.median(outcome.hidden) < np.median(outcome.visible)
        thresholds[name] = outcome.threshold
    demo, docs = thresholds["demo"], thresholds["developer docs"]
    shipped = SupportConfig().threshold
    assert abs(demo - shipped) > 0.01 and abs(docs - shipped) > 0.01  # moved off the shipped default
    assert demo != docs  # and to a place of each corpus' own


def test_probe_is_seeded_and_cached_under_the_corpus_fingerprint(corpora):
    store, config = corpora["demo"]
    index = PassageIndex.load_or_build(store, config.retrieval)
    first = probe.run_probe(store, index, 5)
    assert probe.run_probe(store, index, 5).visible == first.visible  # same seed, same probes
    other_seed = probe.run_probe(store, index, 5, probe.ProbeSettings(seed=1))
    assert [q for q, _, _ in probe.probe_questions(store, index, probe.ProbeSettings(seed=1))] != [
        q for q, _, _ in probe.probe_questions(store, index, probe.ProbeSettings())
    ]
    assert abs(other_seed.threshold - first.threshold) < 0.1  # a stable quantile, not a coin toss
    cached = probe.cached_probe(store, index, 5)
    stored = json.loads(store.get_meta(probe.META_KEY))
    assert stored["threshold"] == cached.threshold == first.threshold
    assert probe.cached_probe(store, index, 5).hidden == cached.hidden  # read back, not measured again


def test_audit_thresholds_name_their_source(corpora, tmp_path):
    store, config = corpora["developer docs"]
    index = PassageIndex.load_or_build(store, config.retrieval)
    probed = resolve_thresholds(store, config, index)
    assert probed["source"] == "probe" and probed["probe"]["probes"] >= probe.MIN_PROBES
    assert probed["support"] == probe.cached_probe(store, index, 5, probe_settings(config)).threshold
    # A threshold written in the config file is the owner's choice: the probe steps aside.
    toml = tmp_path / "audit.toml"
    toml.write_text('database = "x.db"\n[support]\nthreshold = 0.5\n', encoding="utf-8")
    owner = load_config(toml, env={})
    assert owner.support.probe is False
    assert resolve_thresholds(store, owner, index) == {"support": 0.5, "weak_margin": 0.05, "source": "config"}
    # Labelled calibration still wins over both.
    with store.transaction():
        store.db.execute(
            "INSERT INTO calibrations (created, labels, thresholds, metrics) VALUES ('2026-12-01', 'l.csv', ?, '{}')",
            [json.dumps({"support": 0.33, "weak_margin": 0.04})],
        )
    try:
        assert resolve_thresholds(store, config, index) == {
            "support": 0.33,
            "weak_margin": 0.04,
            "source": "calibration",
        }
    finally:
        with store.transaction():
            store.db.execute("DELETE FROM calibrations")


def test_a_corpus_too_small_to_probe_keeps_the_configured_threshold(tmp_path):
    kb = tmp_path / "kb"
    kb.mkdir()
    (kb / "hours.md").write_text("# Office hours\n\nThe cooperative office is open from nine to five on weekdays.\n")
    store, config = ingested(tmp_path, "tiny", kb, ("**/*.md",))
    with store:
        index = PassageIndex.load_or_build(store, config.retrieval)
        result = resolve_thresholds(store, config, index)
    assert result["source"] == "default" and result["support"] == SupportConfig().threshold
    assert "at least 20" in result["probe"]["skipped"]


@pytest.mark.parametrize(
    "line",
    ["probe_questions = 5", "probe_questions = 100000", "probe_scale = 0", "probe_scale = 1.5"],
)
def test_bad_probe_settings_are_one_clear_line_and_nothing_stored_is_lost(corpora, tmp_path, line):
    store, _ = corpora["demo"]
    before = store.db.execute("SELECT count(*) FROM passages").fetchone()[0], store.get_meta(probe.META_KEY)
    toml = tmp_path / "audit.toml"
    toml.write_text(f'database = "x.db"\n[support]\n{line}\n', encoding="utf-8")
    with pytest.raises(ConfigError) as error:
        load_config(toml, env={})
    message = str(error.value)
    assert message.startswith(f"{str(toml)!r}: ") and "\n" not in message and "support.probe_" in message
    with pytest.raises(ConfigError, match=r"^'where': support\.probe_"):
        probe.ProbeSettings(questions=5).check("where")
    assert (store.db.execute("SELECT count(*) FROM passages").fetchone()[0], store.get_meta(probe.META_KEY)) == before
