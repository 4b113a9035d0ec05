"""docs/results-json.md documents every key results.json emits, in order, with the right defaults.

Two sources of keys are held against the page: the typed run model (auditor/results.py, its
dataclass fields walked from `Run` through their type hints) and a real results.json of the demo
(a first scan, then a second one half a year later, which has history, a diff and a failed gate).
"""

from __future__ import annotations

import dataclasses
import json
import re
import shutil
import types
import typing
from datetime import date

import pytest

from auditor import results
from auditor.config import load_config
from auditor.results import DIFF_CATEGORIES, Record, Run, json_key
from auditor.scan import scan
from auditor.store import Store
from tests import report_samples as samples
from tests.conftest import DEMO, REPO

DOC = REPO / "docs" / "results-json.md"
_ROW = re.compile(r"^\| `([^`]+)` \| ([^|]+) \| ([^|]+) \| (.+) \|$")


def sections() -> dict[str, dict]:
    """Each section of the page that names a model class (`ClassName` in its text): its table rows
    as key -> (type, default, meaning), in page order, and its whole text."""
    found: dict[str, dict] = {}
    for part in re.split(r"\n(?=#{2,3} )", DOC.read_text(encoding="utf-8")):
        rows = {m[1]: (m[2].strip(), m[3].strip(), m[4]) for line in part.splitlines() if (m := _ROW.match(line))}
        for name in re.findall(r"`([A-Z]\w+)`", part.split("\n|", 1)[0]):
            if isinstance(getattr(results, name, None), type):
                found[name] = {"rows": rows, "text": part}
    return found


def record_types(hint) -> list[type]:
    """The model classes inside a type hint: `X`, `X | None`, `list[X]`, `dict[str, X]`."""
    if isinstance(hint, type) and issubclass(hint, Record):
        return [hint]
    if typing.get_origin(hint) in (list, dict, typing.Union, types.UnionType):
        return [t for arg in typing.get_args(hint) for t in record_types(arg)]
    return []


def model_classes() -> list[type]:
    seen: list[type] = []
    todo = [Run]
    while todo:
        cls = todo.pop(0)
        if cls in seen:
            continue
        seen.append(cls)
        todo += [t for hint in typing.get_type_hints(cls).values() for t in record_types(hint)]
    return seen


def json_fields(cls: type) -> list[dataclasses.Field]:
    """The fields results.json holds (`Evidence.source` is in memory only)."""
    return [f for f in dataclasses.fields(cls) if json_key(f) is not None]


def model_keys(cls: type) -> list[str]:
    keys = [json_key(f) for f in json_fields(cls)]
    return ["format", *keys] if cls is Run else keys


def has_default(f: dataclasses.Field) -> bool:
    return f.default is not dataclasses.MISSING or f.default_factory is not dataclasses.MISSING


def test_every_model_class_has_its_section_with_every_key_in_order():
    page = sections()
    classes = model_classes()
    assert len(classes) == 21  # Run and every part of it; a new part needs a section
    for cls in classes:
        assert cls.__name__ in page, f"docs/results-json.md has no section naming `{cls.__name__}`"
        assert list(page[cls.__name__]["rows"]) == model_keys(cls), cls.__name__


# Defaults that the reader supplies rather than the field: an evidence item's rank is its place.
READER_DEFAULTS = {("Evidence", "rank"): "its place in the list, from 1"}
# Keys a format-1 run has under its own name (auditor/results.py _LEGACY_KEYS).
FORMAT1_NAMES = {"supported": "covered", "to_write": "briefs", "limits": "gate", "within": "passed"}


def test_the_default_column_says_which_keys_older_runs_may_lack():
    # "—" for a key every format-1 run has (a field without a default), the default otherwise.
    page = sections()
    for cls in model_classes():
        rows = page[cls.__name__]["rows"]
        for f in json_fields(cls):
            documented = rows[json_key(f)][1]
            if (cls.__name__, f.name) in READER_DEFAULTS:
                assert documented == READER_DEFAULTS[cls.__name__, f.name]
                continue
            assert (documented != "—") == has_default(f), (cls.__name__, f.name, documented)
            if f.default is not dataclasses.MISSING:
                assert documented == f"`{json.dumps(f.default)}`", (cls.__name__, f.name, documented)
            if f.default_factory is not dataclasses.MISSING:
                assert documented == f"`{json.dumps(f.default_factory())}`", (cls.__name__, f.name, documented)


@pytest.fixture(scope="module")
def demo_results(tmp_path_factory) -> list[dict]:
    """results.json of two real demo scans: the first, and one half a year later."""
    target = tmp_path_factory.mktemp("docs") / "demo"
    shutil.copytree(DEMO, target)
    text = (target / "audit.toml").read_text(encoding="utf-8")
    text = text.replace("../../reports/demo/auditor.db", "work/auditor.db").replace("../../reports/demo", "work/report")
    (target / "audit.toml").write_text(text, encoding="utf-8")
    config = load_config(target / "audit.toml", env={})
    first = scan(config, jobs=1).out_dir
    later = scan(config, jobs=1, as_of=date(2027, 6, 1), out_dir=target / "work" / "later").out_dir
    with Store(config.database) as store:
        assert store.query("SELECT count(*) AS n FROM runs")[0]["n"] == 2
    return [json.loads((out / "results.json").read_text(encoding="utf-8")) for out in (first, later)]


def walk(value, hint, page: dict, where: str, seen: set[str]) -> None:
    """Hold a JSON value against the model type `hint` and the page's section of that type."""
    origin, args = typing.get_origin(hint), typing.get_args(hint)
    if value is None:
        return
    if isinstance(hint, type) and issubclass(hint, Record):
        assert isinstance(value, dict), where
        seen.add(hint.__name__)
        rows = page[hint.__name__]["rows"]
        assert list(value) == list(rows), f"{where}: keys not as documented"
        hints = typing.get_type_hints(hint)
        for f in json_fields(hint):
            walk(value[json_key(f)], hints[f.name], page, f"{where}.{json_key(f)}", seen)
    elif origin in (typing.Union, types.UnionType):
        walk(value, next(a for a in args if a is not type(None)), page, where, seen)
    elif origin is list:
        for i, item in enumerate(value):
            walk(item, args[0], page, f"{where}[{i}]", seen)


def test_a_real_results_json_emits_only_documented_keys(demo_results):
    page = sections()
    for data in demo_results:
        assert data["format"] == results.FORMAT == 2
        seen: set[str] = set()
        walk(data, Run, page, "results.json", seen)
    # The later scan holds every part of the format, so every section was held against real output.
    assert seen == {cls.__name__ for cls in model_classes()}
    # Map keys that are names, not data: the support signals and the diff's lists.
    later = demo_results[1]
    signals = {k for q in later["questions"] for e in q["evidence"] for k in e["signals"]}
    # Horizons of every source the demo's config uses, each documented.
    sources = {e["horizon"]["source"] for q in later["questions"] for e in q["evidence"]}
    assert sources == {"default", "path_rule", "topic_rule", "question"}, sources
    assert all(f"`{name}`" in page["Horizon"]["text"] for name in results.HORIZON_SOURCES)
    evidence_text = page["Evidence"]["text"]
    assert signals and all(f"`{name}` (" in evidence_text for name in signals), signals
    for name in ("counts", "weights"):
        assert list(later["diff"][name]) == list(DIFF_CATEGORIES)
    assert all(f"`{name}`" in page["Diff"]["text"] for name in DIFF_CATEGORIES)


def test_the_page_names_only_files_of_this_repository():
    # Every file the page cites exists (auditor/..., docs/...).
    cited = set(re.findall(r"`((?:auditor|docs)/[\w/.-]+)`", DOC.read_text(encoding="utf-8")))
    assert cited and all((REPO / path).exists() for path in cited), cited


def test_an_older_run_reads_with_the_documented_defaults():
    # tests/report_samples.py bare_json: only the keys every format-1 run has, as older runs stored them.
    page = sections()
    bare = samples.bare_json()
    filled: list[tuple[str, str, object]] = []

    def compare(old, new, hint):
        origin, args = typing.get_origin(hint), typing.get_args(hint)
        if isinstance(hint, type) and issubclass(hint, Record):
            hints = typing.get_type_hints(hint)
            for f in json_fields(hint):
                key = json_key(f)
                if FORMAT1_NAMES.get(key) in old:
                    compare(old[FORMAT1_NAMES[key]], new[key], hints[f.name])
                elif key in old:
                    compare(old[key], new[key], hints[f.name])
                else:
                    filled.append((hint.__name__, key, new[key]))
        elif origin in (typing.Union, types.UnionType) and old is not None:
            compare(old, new, next(a for a in args if a is not type(None)))
        elif origin is list:
            for a, b in zip(old, new):
                compare(a, b, args[0])

    compare(bare, Run.from_json(bare).to_json(), Run)
    assert len(filled) > 20
    for cls, key, value in filled:
        documented = page[cls]["rows"][key][1]
        if (cls, key) == ("Evidence", "rank"):
            assert value == 1  # the only item of its list
        elif (cls, key) == ("Run", "passages"):
            assert [p["id"] for p in value] == [1]  # gathered from the evidence items
        elif (cls, key) == ("Evidence", "passage"):
            assert value == 1
        else:
            assert documented == f"`{json.dumps(value)}`", (cls, key, value)
