"""docs/configuration.md documents every configuration key: each field of the config dataclasses
(auditor/config.py) appears there under its dotted key, and so does each AUDITOR_* variable.

A new field without a line in the reference fails here, so the reference cannot fall behind."""

from __future__ import annotations

import dataclasses
import re
import typing
from pathlib import Path

from auditor import config as config_module
from auditor.config import ENVIRONMENT, Config

DOC = Path(__file__).resolve().parent.parent / "docs" / "configuration.md"


def _item_class(hint) -> type | None:
    """The dataclass of an array-of-tables field (`tuple[SitemapConfig, ...]`), else None."""
    if typing.get_origin(hint) is tuple:
        args = [a for a in typing.get_args(hint) if a is not Ellipsis]
        if len(args) == 1 and dataclasses.is_dataclass(args[0]):
            return args[0]
    return None


def documented_keys() -> set[str]:
    """Every key as the reference writes it: `database`, `corpus.paths`, `corpus.sitemaps[].file`."""
    keys = set()

    def walk(cls, prefix: str) -> None:
        hints = typing.get_type_hints(cls, vars(config_module))
        for field in dataclasses.fields(cls):
            hint = hints[field.name]
            if dataclasses.is_dataclass(hint):  # a [section]
                walk(hint, f"{field.name}.")
                continue
            keys.add(prefix + field.name)
            item = _item_class(hint)
            if item is not None:
                walk(item, f"{prefix}{field.name}[].")

    walk(Config, "")
    return keys


def test_every_config_field_is_in_the_reference():
    text = DOC.read_text(encoding="utf-8")
    written = set(re.findall(r"`([a-z0-9_.\[\]]+)`", text))
    keys = documented_keys()
    # The walk itself must see the nested tables, or the check below would pass on too little.
    assert {"database", "corpus.sitemaps[].url_prefix", "freshness.rules[].topic", "report.keep_runs"} <= keys
    assert sorted(keys - written) == []


def test_every_section_and_environment_variable_is_in_the_reference():
    text = DOC.read_text(encoding="utf-8")
    hints = typing.get_type_hints(Config, vars(config_module))
    sections = [f.name for f in dataclasses.fields(Config) if dataclasses.is_dataclass(hints[f.name])]
    assert "corpus" in sections and "report" in sections
    for name in [*sections, "owners"]:
        assert f"### `[{name}]`" in text, name
    for variable in [*ENVIRONMENT, "AUDITOR_CONFIG"]:
        assert f"`{variable}`" in text, variable
