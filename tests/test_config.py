"""Config loading: precedence defaults < file < environment < flags, unknown keys, bad values."""

from datetime import date
from pathlib import Path

import pytest

from auditor.cli import _config
from auditor.config import load_config
from auditor.errors import ConfigError


def write(tmp_path, text, name="audit.toml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_defaults_without_file():
    config = load_config(None, env={})
    assert config.freshness.horizon_days == 365
    assert config.retrieval.variant == "lucene"
    assert config.database == Path.cwd() / "auditor.db"


def test_file_values_and_relative_paths(tmp_path):
    path = write(
        tmp_path,
        """
database = "data/a.db"
as_of = 2026-12-01
questions = ["q.csv"]
[corpus]
paths = ["kb"]
exclude = ["**/drafts/**"]
[freshness]
horizon_days = 200
[[freshness.rules]]
path = "rates/**"
horizon_days = 90
[owners]
"billing/**" = "Billing"
""",
    )
    config = load_config(path, env={})
    assert config.database == tmp_path / "data" / "a.db"
    assert config.as_of == date(2026, 12, 1)
    assert config.questions == (tmp_path / "q.csv",)
    assert config.corpus.paths == (tmp_path / "kb",)
    assert config.corpus.exclude == ("**/drafts/**",)
    assert config.freshness.horizon_days == 200
    assert config.freshness.rules[0].path == "rates/**" and config.freshness.rules[0].horizon_days == 90
    assert config.owners == (("billing/**", "Billing"),)


def test_environment_overrides_file_and_flags_override_environment(tmp_path, monkeypatch):
    path = write(tmp_path, "[freshness]\nhorizon_days = 200\n")
    assert load_config(path, env={"AUDITOR_HORIZON_DAYS": "30"}).freshness.horizon_days == 30
    monkeypatch.setenv("AUDITOR_HORIZON_DAYS", "30")
    assert _config(str(path), horizon=7).freshness.horizon_days == 7
    assert _config(str(path)).freshness.horizon_days == 30


def test_unknown_key_warns_and_is_ignored(tmp_path):
    path = write(tmp_path, "horizon = 3\n[freshness]\nhorizon_day = 5\n")
    warnings = []
    config = load_config(path, env={}, warn=warnings.append)
    assert config.freshness.horizon_days == 365
    assert len(warnings) == 2
    assert "'horizon'" in warnings[0] and "'freshness.horizon_day'" in warnings[1]


@pytest.mark.parametrize(
    "text, key",
    [
        ('[freshness]\nhorizon_days = "soon"\n', "freshness.horizon_days"),
        ('as_of = "yesterday"\n', "as_of"),
        ("[corpus]\nfollow_symlinks = 3\n", "corpus.follow_symlinks"),
        ("[support]\nthreshold = 1.5\n", "support.threshold"),
        ('[corpus]\nhemisphere = "east"\n', "corpus.hemisphere"),
        ("[[freshness.rules]]\nhorizon_days = 3\n", "freshness.rules[0]"),
        ('[[freshness.rules]]\npath = "rates/**"\n', "freshness.rules[0].horizon_days"),
        ("questions = 3\n", "questions"),
        ("[gate]\nmax_gap_share = 1.5\n", "gate.max_gap_share"),
        ('[retrieval]\nvariant = "bm99"\n', "lucene"),  # the message lists the valid variants
        ('[retrieval]\nlanguage = "klingon"\n', "klingon"),
        ("[gate]\nmax_new_gaps = -1\n", "gate.max_new_gaps"),
    ],
)
def test_bad_value_names_key_and_file(tmp_path, text, key):
    path = write(tmp_path, text)
    with pytest.raises(ConfigError) as info:
        load_config(path, env={})
    assert str(path) in str(info.value) and key in str(info.value)


def test_invalid_toml_and_missing_file(tmp_path):
    with pytest.raises(ConfigError, match="not valid TOML"):
        load_config(write(tmp_path, "database = \n"), env={})
    with pytest.raises(ConfigError, match="config file not found"):
        load_config(tmp_path / "nope.toml", env={})


def test_release_limits_table_and_its_former_name(tmp_path):
    new = write(tmp_path, name="new.toml", text="[limits]\nmax_gap_share = 0.25\n")
    old = write(tmp_path, name="old.toml", text="[gate]\nmax_gap_share = 0.25\n")
    assert load_config(new, env={}).gate == load_config(old, env={}).gate
    assert load_config(new, env={}).gate.max_gap_share == 0.25
    both = write(tmp_path, name="both.toml", text="[gate]\nmax_gap_share = 0.25\n[limits]\nmax_gap_share = 0.5\n")
    with pytest.raises(ConfigError, match=r"both.toml': \[limits\] and \[gate\] are the same table; keep one"):
        load_config(both, env={})
    bad = write(tmp_path, name="bad.toml", text="[limits]\nmax_gap_share = 2\n")
    with pytest.raises(ConfigError, match="limits.max_gap_share must be a share between 0 and 1"):
        load_config(bad, env={})


def test_report_outputs_are_checked(tmp_path):
    good = write(tmp_path, name="good.toml", text='[report]\noutputs = ["junit", "summary"]\nstale_in_junit = "skip"\n')
    assert load_config(good, env={}).report.outputs == ("junit", "summary")
    bad = write(tmp_path, name="bad.toml", text='[report]\noutputs = ["pdf"]\n')
    with pytest.raises(ConfigError, match="report.outputs: unknown output 'pdf'; choose from junit, summary"):
        load_config(bad, env={})
    stale = write(tmp_path, name="stale.toml", text='[report]\nstale_in_junit = "pass"\n')
    with pytest.raises(ConfigError, match="report.stale_in_junit must be 'fail' or 'skip'"):
        load_config(stale, env={})
