"""Sitemaps (sitemaps.org protocol 0.9): <lastmod> applied to a web export's files."""

from __future__ import annotations

from auditor.config import SitemapConfig
from auditor.ingest.pipeline import ingest_corpus
from auditor.ingest.sitemap import read_sitemap
from auditor.store import Store
from tests.ingest_helpers import config_for, html_page, write_tree

# The protocol's example file, with the URLs of our export (sitemaps.org/protocol.html:
# <lastmod> in W3C Datetime, date-only or full).
SITEMAP = """<?xml version="1.0" encoding="UTF-8"?>
<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">
   <url><loc>https://help.example.org/site/</loc><lastmod>2005-01-01</lastmod></url>
   <url><loc>https://help.example.org/site/billing/fees.html</loc><lastmod>2004-12-23T18:00:15+00:00</lastmod>
        <changefreq>monthly</changefreq></url>
   <url><loc>https://help.example.org/site/own-date.html</loc><lastmod>2001-01-01</lastmod></url>
   <url><loc>https://help.example.org/site/leaks</loc><lastmod>2004-11-23</lastmod></url>
   <url><loc>https://elsewhere.example.org/x.html</loc><lastmod>2000-01-01</lastmod></url>
   <url><loc>https://help.example.org/site/bad.html</loc><lastmod>yesterday</lastmod></url>
</urlset>"""


def test_read_sitemap():
    import tempfile
    from pathlib import Path

    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "sitemap.xml"
        path.write_text(SITEMAP)
        dates = read_sitemap(path)
    assert {k: v.isoformat() for k, v in dates.items()} == {
        "https://help.example.org/site/": "2005-01-01",
        "https://help.example.org/site/billing/fees.html": "2004-12-23",
        "https://help.example.org/site/own-date.html": "2001-01-01",
        "https://help.example.org/site/leaks": "2004-11-23",
        "https://elsewhere.example.org/x.html": "2000-01-01",
    }


def test_lastmod_dates_files_without_their_own(tmp_path):
    plain = html_page("<main><h1>Page</h1><p>Text.</p></main>")
    root = write_tree(
        tmp_path / "kb",
        {
            "export/index.html": plain,
            "export/billing/fees.html": plain,
            "export/leaks.html": plain,
            "export/own-date.html": html_page(
                "<main><p>Text.</p></main>", head='<meta name="DCTERMS.modified" content="2010-10-10">'
            ),
            "export/unlisted.html": plain,
        },
    )
    (tmp_path / "sitemap.xml").write_text(SITEMAP)
    sitemaps = (
        SitemapConfig(file=tmp_path / "sitemap.xml", url_prefix="https://help.example.org/site/", folder="export"),
    )
    config = config_for(root, sitemaps=sitemaps)
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config)
        dates = {r["path"]: (r["doc_date"], r["doc_date_source"]) for r in store.query("SELECT * FROM documents")}
        assert dates["export/index.html"] == ("2005-01-01", "sitemap:lastmod")
        assert dates["export/billing/fees.html"] == ("2004-12-23", "sitemap:lastmod")
        assert dates["export/leaks.html"] == ("2004-11-23", "sitemap:lastmod")  # extensionless URL
        assert dates["export/own-date.html"] == ("2010-10-10", "dcterms:modified")  # in-file metadata wins
        assert dates["export/unlisted.html"][1] == "file:mtime"
        # A new <lastmod> re-dates the file even though its bytes did not change.
        (tmp_path / "sitemap.xml").write_text(SITEMAP.replace("2004-12-23T18:00:15+00:00", "2006-02-02"))
        summary = ingest_corpus(store, config)
        assert (summary.changed, summary.unchanged) == (1, 4)
        assert store.query("SELECT doc_date FROM documents WHERE path = 'export/billing/fees.html'") == [
            {"doc_date": "2006-02-02"}
        ]


def test_broken_sitemap_is_an_input_error(tmp_path):
    import pytest

    from auditor.errors import InputError

    root = write_tree(tmp_path / "kb", {"a.md": "# A\n\nText.\n"})
    (tmp_path / "sitemap.xml").write_text("<urlset><url>")
    config = config_for(root, sitemaps=(SitemapConfig(tmp_path / "sitemap.xml", "https://x/", ""),))
    with Store(tmp_path / "a.db") as store, pytest.raises(InputError, match="sitemap is not well-formed XML"):
        ingest_corpus(store, config)
