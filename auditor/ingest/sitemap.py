"""Sitemaps (sitemaps.org protocol 0.9): `<lastmod>` dates applied to the files of a web export.

A configured `[[corpus.sitemaps]]` entry maps a URL prefix to a folder (relative to a corpus
path): `https://example.org/help/billing/fees.html` with prefix `https://example.org/help/` and
folder `site` is the file `<corpus path>/site/billing/fees.html`. A URL ending in "/" names that
folder's index.html; a URL without a suffix also matches "<name>.html".
"""

from __future__ import annotations

from datetime import date
from pathlib import Path
from urllib.parse import unquote, urlsplit

from lxml import etree

from auditor.errors import InputError
from auditor.ingest.dates import parse_w3c_datetime
from auditor.models import MetaDate

_NS = "{http://www.sitemaps.org/schemas/sitemap/0.9}"


def read_sitemap(file: Path) -> dict[str, date]:
    """URL -> lastmod date for every <url> of a sitemap file that has a valid <lastmod>."""
    try:
        parser = etree.XMLParser(resolve_entities=False, no_network=True, huge_tree=False)
        tree = etree.parse(str(file), parser)
    except OSError as exc:
        raise InputError(f"{str(file)!r}: cannot read sitemap ({exc})") from None
    except etree.XMLSyntaxError as exc:
        raise InputError(f"{str(file)!r}: sitemap is not well-formed XML ({exc})") from None
    out: dict[str, date] = {}
    for url in tree.iter(f"{_NS}url", "url"):
        loc = url.findtext(f"{_NS}loc") or url.findtext("loc")
        lastmod = url.findtext(f"{_NS}lastmod") or url.findtext("lastmod")
        if loc and lastmod and (d := parse_w3c_datetime(lastmod.strip())):
            out[loc.strip()] = d
    return out


def _candidates(rest: str) -> list[str]:
    rest = unquote(rest).lstrip("/")
    if rest == "" or rest.endswith("/"):
        return [rest + "index.html"]
    if "." not in rest.rsplit("/", 1)[-1]:
        return [rest, rest + ".html", rest + "/index.html"]
    return [rest]


def lastmod_dates(sitemaps, roots: list[Path]) -> dict[str, MetaDate]:
    """Absolute file path (as a string) -> MetaDate(kind "modified", source "sitemap:lastmod")."""
    out: dict[str, MetaDate] = {}
    for entry in sitemaps:
        for loc, lastmod in read_sitemap(entry.file).items():
            if not loc.startswith(entry.url_prefix):
                continue
            rest = (
                urlsplit(loc[len(entry.url_prefix) :]).path
                if "://" in loc[len(entry.url_prefix) :]
                else loc[len(entry.url_prefix) :].split("?")[0].split("#")[0]
            )
            for root in roots:
                for rel in _candidates(rest):
                    file = (root / entry.folder / rel) if entry.folder else root / rel
                    out.setdefault(str(file), MetaDate(lastmod, "modified", "sitemap:lastmod"))
    return out
