"""Print the declared minimum version of every dependency as a `name==floor` pin, one per line.

Installing these pins together with the project (`make min-versions`, see DEVELOPERS.md) checks that
the floors in pyproject.toml are true: the suite must pass with the oldest releases we claim to support.
Every requirement must carry a `>=` floor; one without a floor is an error, so none slips through.

    python -m tools.min_versions [--extras test,dev]
"""

from __future__ import annotations

import argparse
import re
import sys
import tomllib
from pathlib import Path

PYPROJECT = Path(__file__).resolve().parent.parent / "pyproject.toml"
# PEP 508 name, optional extras, then the version specifiers up to a marker or a comment.
_REQUIREMENT = re.compile(r"^\s*([A-Za-z0-9][A-Za-z0-9._-]*)\s*(\[[^\]]*\])?\s*([^;]*)")
_FLOOR = re.compile(r">=\s*([0-9][^,\s]*)")


def floors(requirements: list[str]) -> list[str]:
    """`name==floor` for each requirement; ValueError names one that has no `>=` floor."""
    pins = []
    for requirement in requirements:
        match = _REQUIREMENT.match(requirement)
        if not match:
            raise ValueError(f"{requirement!r}: not a requirement this script can read")
        name, extras, specifiers = match.group(1), match.group(2) or "", match.group(3)
        floor = _FLOOR.search(specifiers)
        if not floor:
            raise ValueError(f"{str(PYPROJECT)!r}: {requirement!r} has no '>=' floor")
        pins.append(f"{name}{extras}=={floor.group(1)}")
    return pins


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--extras", default="", help="comma-separated optional-dependency groups to include")
    args = parser.parse_args(argv)
    project = tomllib.loads(PYPROJECT.read_text(encoding="utf-8"))["project"]
    requirements = list(project["dependencies"])
    for extra in filter(None, args.extras.split(",")):
        requirements += project["optional-dependencies"][extra]
    try:
        print("\n".join(floors(requirements)))
    except ValueError as exc:
        print(exc, file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
