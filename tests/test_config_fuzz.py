"""Property-based: any TOML text either loads or raises ConfigError — never another exception."""

import tomllib

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from auditor.config import load_config
from auditor.errors import ConfigError

KEYS = [
    "database",
    "as_of",
    "questions",
    "owners",
    "corpus",
    "freshness",
    "retrieval",
    "support",
    "gate",
    "report",
    "paths",
    "horizon_days",
    "rules",
    "path",
    "topic",
    "threshold",
    "k1",
    "jobs",
    "follow_symlinks",
    "sitemaps",
    "file",
    "url_prefix",
    "hemisphere",
    "fiscal_year_start",
    "out",
]
scalars = st.one_of(
    st.integers(-(10**6), 10**6),
    st.floats(allow_nan=False, allow_infinity=False),
    st.booleans(),
    st.text(max_size=12),
    st.dates(),
)
values = st.recursive(
    scalars,
    lambda inner: st.one_of(st.lists(inner, max_size=3), st.dictionaries(st.sampled_from(KEYS), inner, max_size=4)),
    max_leaves=12,
)


def toml_value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return repr(value)
    if isinstance(value, str):
        return '"' + value.encode("unicode_escape").decode("ascii").replace('"', '\\"') + '"'
    if isinstance(value, list):
        return "[" + ", ".join(toml_value(v) for v in value) + "]"
    if isinstance(value, dict):
        return "{" + ", ".join(f'"{k}" = {toml_value(v)}' for k, v in value.items()) + "}"
    return value.isoformat()  # date


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.dictionaries(st.sampled_from(KEYS), values, max_size=6))
def test_structured_configs_load_or_raise_config_error(tmp_path, document):
    text = "\n".join(f'"{k}" = {toml_value(v)}' for k, v in document.items())
    try:
        tomllib.loads(text)
    except tomllib.TOMLDecodeError:
        return  # the generator wrote something TOML cannot hold; not what this test is about
    path = tmp_path / "audit.toml"
    path.write_text(text, encoding="utf-8")
    try:
        load_config(path, env={}, warn=lambda message: None)
    except ConfigError as exc:
        assert str(path) in str(exc)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.text(max_size=300))
def test_arbitrary_text_loads_or_raises_config_error(tmp_path, text):
    path = tmp_path / "audit.toml"
    path.write_text(text, encoding="utf-8")
    try:
        load_config(path, env={}, warn=lambda message: None)
    except ConfigError:
        pass
