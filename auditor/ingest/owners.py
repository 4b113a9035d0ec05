"""Who owns a document: the config's owner map (first matching glob; front matter `owner:` wins,
see auditor/ingest/pipeline.py)."""

from __future__ import annotations

from auditor.config import Config
from auditor.ingest.walk import glob_match


def owner_from_config(config: Config, rel: str) -> str | None:
    """The config's owner for a path relative to its source root (first matching glob), else None."""
    for glob, owner in config.owners:
        if glob_match(glob, rel):
            return owner
    return None
