"""The language of a document (docs/languages.md): the config's `[languages]` globs first, then
what the document says (front matter `lang:`, HTML `lang`), then detection over its text.

The config wins over the document: an HTML template often carries a site-wide `lang` that a
translated page never changed, and the person running the audit can correct that without editing
the files.
"""

from __future__ import annotations

from auditor.config import Config
from auditor.ingest.walk import glob_match
from auditor.language import detect
from auditor.models import Block

# Enough text to tell a language reliably, little enough to keep detection cheap on a large file.
SAMPLE_CHARS = 4000


def language_from_config(config: Config, rel: str) -> str | None:
    """The config's language for a path relative to its source root (first matching glob), else None."""
    for glob, language in config.languages:
        if glob_match(glob, rel):
            return language
    return None


def sample(blocks: list[Block]) -> str:
    """The first SAMPLE_CHARS characters of a document's block text (headings included)."""
    parts, size = [], 0
    for block in blocks:
        parts.append(block.text)
        size += len(block.text)
        if size >= SAMPLE_CHARS:
            break
    return "\n".join(parts)[:SAMPLE_CHARS]


def document_language(
    configured: str | None, stated: str | None, blocks: list[Block], candidates: tuple[str, ...]
) -> tuple[str, str]:
    """(language, source): source is "config", "document", "detected" or "fallback" (the first
    candidate, when the text says too little)."""
    if configured:
        return configured, "config"
    if stated:
        return stated, "document"
    found = detect(sample(blocks), candidates, document=True)
    return (found, "detected") if found else (candidates[0], "fallback")
