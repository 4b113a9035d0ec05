"""Which support threshold an audit uses, and where it came from (docs/judgement.md).

In order: the newest labelled calibration (`auditor calibrate --labels`, source "calibration"); else
the corpus probe of this knowledge base (source "probe", auditor/judgement/probe.py) unless the
config turns it off — a threshold written in the config file does; else the config's threshold
(source "config" when the file sets it, "default" when it is the shipped one). The result is what
results.json keeps as `run.thresholds`: `support`, `weak_margin`, `source`, and with the probe its
`probe` summary (or why it was skipped).
"""

from __future__ import annotations

import json

from auditor.config import Config, SupportConfig
from auditor.judgement.probe import ProbeSettings, ProbeUnavailable, cached_probe
from auditor.retrieval.index import PassageIndex
from auditor.store import Store


def probe_on(support: SupportConfig) -> bool:
    """Whether the probe places the threshold: as configured, else while the threshold is the shipped one."""
    return support.probe if support.probe is not None else support.threshold == SupportConfig.threshold


def probe_settings(config: Config) -> ProbeSettings:
    return ProbeSettings(questions=config.support.probe_questions, scale=config.support.probe_scale)


def resolve_thresholds(store: Store, config: Config, index: PassageIndex) -> dict:
    """run.thresholds for an audit of `store` with `config` (see the module docstring)."""
    row = store.db.execute("SELECT thresholds FROM calibrations ORDER BY id DESC LIMIT 1").fetchone()
    if row:
        stored = json.loads(row[0])
        return {
            "support": float(stored["support"]),
            "weak_margin": float(stored.get("weak_margin", config.support.weak_margin)),
            "source": "calibration",
        }
    configured = {
        "support": config.support.threshold,
        "weak_margin": config.support.weak_margin,
        "source": "default" if config.support == SupportConfig() else "config",
    }
    if not probe_on(config.support):
        return configured
    try:
        outcome = cached_probe(store, index, config.retrieval.top_k, probe_settings(config))
    except ProbeUnavailable as exc:
        return configured | {"probe": {"skipped": str(exc)}}
    return {
        "support": outcome.threshold,
        "weak_margin": config.support.weak_margin,
        "source": "probe",
        "probe": outcome.summary(),
    }
