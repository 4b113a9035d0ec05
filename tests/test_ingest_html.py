"""HTML parsing: main content, heading hierarchy, lists and tables, title, charset, and the date
fields of each metadata standard in the example formats of its specification."""

from __future__ import annotations

import codecs
import json
from datetime import date

import pytest

from auditor.ingest.failures import IngestFailure
from auditor.ingest.html import parse_html
from auditor.ingest.parse import choose_doc_date
from tests.ingest_helpers import html_page

PAGE = html_page(
    """
    <div id="cookie-banner">We use cookies. <button>Accept</button></div>
    <header><a href="/">Fernhollow</a><nav><a href="/billing">Billing</a><a href="/help">Help</a></nav></header>
    <main>
      <h1>Paying your bill</h1>
      <p>You can pay in several ways.</p><p style="display: none">Old offer</p><p hidden>Draft note</p>
      <div class="modal consent-popup">Your privacy choices</div>
      <h2>By phone<a class="headerlink" href="#by-phone">¶</a></h2>
      <p>Call   the payment line,
         any time.</p>
      <h3>Fees</h3>
      <ul><li>Card: no fee</li><li>Bank <b>transfer</b>: no fee</li></ul>
      <h2>In person</h2>
      <table><tr><th>Office</th><th>Hours</th></tr><tr><td>Main Street</td><td>8–17</td></tr></table>
      <form><input name="q"><button>Search</button></form>
      <script>var tracking = "secret";</script><style>p { color: red }</style>
    </main>
    <aside>Related: outage map</aside>
    <footer>© Fernhollow Water Cooperative</footer>
    """,
    title="Paying your bill | Fernhollow",
)


def test_main_content_only_with_heading_path():
    doc = parse_html(PAGE.encode(), "pay.html")
    texts = [b.text for b in doc.blocks]
    joined = "\n".join(texts)
    for chrome in (
        "cookies",
        "Accept",
        "Billing",
        "Help",
        "Related",
        "©",
        "Search",
        "tracking",
        "color",
        "privacy",
        "¶",
        "Old offer",
        "Draft note",
    ):
        assert chrome not in joined
    assert doc.title == "Paying your bill | Fernhollow"
    by_text = {b.text: b.heading_path for b in doc.blocks}
    assert by_text["Call the payment line, any time."] == ("Paying your bill", "By phone")
    assert by_text["- Card: no fee\n- Bank transfer: no fee"] == ("Paying your bill", "By phone", "Fees")
    # h2 after an h3 pops back to the h1 › h2 level.
    assert by_text["Office | Hours\nMain Street | 8–17"] == ("Paying your bill", "In person")
    # Headings are blocks of their own, so passages start with them.
    assert by_text["By phone"] == ("Paying your bill", "By phone")


def test_body_without_main_drops_site_header_and_footer():
    page = html_page("<header>Site name</header><h1>Leaks</h1><p>Report leaks.</p><footer>Footer text</footer>")
    doc = parse_html(page.encode(), "leaks.html")
    assert [b.text for b in doc.blocks] == ["Leaks", "Report leaks."]


def test_article_header_is_kept_inside_the_article():
    page = html_page("<nav>x</nav><article><header><h1>Advisory</h1></header><p>Boil water.</p></article>")
    doc = parse_html(page.encode(), "a.html")
    assert [b.text for b in doc.blocks] == ["Advisory", "Boil water."]


def _dates(head: str = "", body: str = "<p>Text.</p>"):
    doc = parse_html(html_page(body, head=head).encode(), "d.html")
    return [(d.value, d.kind, d.source) for d in doc.dates]


def test_schema_org_json_ld():
    # schema.org Date/DateTime values are ISO 8601; the offset form below is the usual example
    # format of schema.org Article markup (from memory of its examples).
    data = {
        "@context": "https://schema.org",
        "@type": "Article",
        "headline": "Rates",
        "datePublished": "2015-02-05T08:00:00+08:00",
        "dateModified": "2015-02-05T09:20:00+08:00",
        "expires": "2016-01-01",
        "author": {"@type": "Person", "name": "A", "dateModified": "1999-01-01"},
    }
    head = f'<script type="application/ld+json">{json.dumps(data)}</script>'
    assert _dates(head) == [
        (date(2015, 2, 5), "modified", "jsonld:dateModified"),
        (date(2015, 2, 5), "published", "jsonld:datePublished"),
        (date(2016, 1, 1), "expires", "jsonld:expires"),
    ]


def test_json_ld_graph_and_broken_blocks():
    graph = {
        "@context": "https://schema.org",
        "@graph": [
            {"@type": "WebSite", "name": "x"},
            {
                "@type": "WebPage",
                "dateModified": "2024-06-30",
                "datePublished": {"@value": "2020-01-02", "@type": "Date"},
            },
        ],
    }  # JSON-LD 1.1 typed value (section from memory: 4.2.1)
    head = (
        '<script type="application/ld+json">{not json</script>'
        f'<script type="application/ld+json">{json.dumps(graph)}</script>'
    )
    assert _dates(head) == [
        (date(2024, 6, 30), "modified", "jsonld:dateModified"),
        (date(2020, 1, 2), "published", "jsonld:datePublished"),
    ]


def test_open_graph_article_times():
    # The Open Graph protocol (ogp.me), type "article": article:published_time,
    # article:modified_time, article:expiration_time are "datetime" values (ISO 8601).
    head = (
        '<meta property="article:published_time" content="2013-09-17T05:59:00+01:00">'
        '<meta property="article:modified_time" content="2013-09-16T19:08:47+01:00">'
        '<meta property="article:expiration_time" content="2014-09-17">'
    )
    assert _dates(head) == [
        (date(2013, 9, 16), "modified", "og:article:modified_time"),
        (date(2013, 9, 17), "published", "og:article:published_time"),
        (date(2014, 9, 17), "expires", "og:article:expiration_time"),
    ]


def test_dublin_core_meta():
    # DCMI "Expressing Dublin Core metadata using HTML/XHTML meta and link elements": names are
    # prefixed DC./DCTERMS. (case-insensitive here); values in W3CDTF.
    head = '<meta name="DCTERMS.modified" content="2007-03-01"><meta name="DC.date" content="2007-01">'
    assert _dates(head) == [
        (date(2007, 3, 1), "modified", "dcterms:modified"),
        (date(2007, 1, 1), "published", "dc:date"),
    ]


def test_time_element_marked_as_update():
    # WHATWG <time datetime>: only a time element that says what it dates becomes a document date;
    # other time elements are dated statements for the temporal stage.
    body = (
        '<p>Last updated <time datetime="2011-11-18T14:54:39.929-06:00">Friday</time>.</p>'
        '<p>The outage is on <time datetime="2012-01-05">5 January</time>.</p>'
        '<p><time itemprop="datePublished" datetime="2011-W47">week 47</time></p>'
    )
    assert _dates(body=body) == [
        (date(2011, 11, 21), "published", "microdata:datePublished"),
        (date(2011, 11, 18), "modified", "time:datetime"),
    ]


def test_http_equiv_last_modified_imf_fixdate():
    # RFC 9110 §8.8.2 Last-Modified carries an HTTP-date; IMF-fixdate example from §5.6.7.
    head = '<meta http-equiv="Last-Modified" content="Sun, 06 Nov 1994 08:49:37 GMT">'
    assert _dates(head) == [(date(1994, 11, 6), "modified", "http:last-modified")]


def test_doc_date_prefers_a_modified_date_over_a_more_specific_published_one():
    head = (
        '<script type="application/ld+json">{"@type": "Article", "datePublished": "2020-01-01"}</script>'
        '<meta property="article:modified_time" content="2023-05-01">'
    )
    doc = parse_html(html_page("<p>x</p>", head=head).encode(), "p.html")
    chosen = choose_doc_date(doc.dates)
    assert (chosen.value, chosen.source) == (date(2023, 5, 1), "og:article:modified_time")


@pytest.mark.parametrize(
    "encoding, prefix",
    [("utf-8", codecs.BOM_UTF8), ("utf-16-le", codecs.BOM_UTF16_LE), ("utf-16-be", codecs.BOM_UTF16_BE)],
)
def test_charset_from_bom(encoding, prefix):
    page = html_page("<p>Café crème — naïve</p>").replace('<meta charset="utf-8">', "")
    doc = parse_html(prefix + page.encode(encoding), "bom.html")
    assert doc.blocks[0].text == "Café crème — naïve"


def test_charset_from_meta_windows_1252():
    page = (
        '<html><head><meta http-equiv="Content-Type" content="text/html; charset=windows-1252">'
        "</head><body><p>Caf\xe9 \u2013 2\u20ac</p></body></html>"
    )
    doc = parse_html(page.encode("cp1252"), "legacy.html")
    assert doc.blocks[0].text == "Café – 2€"


def test_charset_from_xml_declaration():
    page = '<?xml version="1.0" encoding="ISO-8859-1"?><html><body><p>Gr\xfc\xdfe</p></body></html>'
    assert parse_html(page.encode("latin-1"), "x.xhtml").blocks[0].text == "Grüße"


def test_charset_detected_when_undeclared():
    # No BOM and no meta: UTF-8 when valid, else windows-1252 (WHATWG HTML §13.2.3.1: the
    # implementation-defined default is windows-1252 for English-language locales).
    page = "<html><body><p>Caf\xe9 r\xe9sum\xe9</p></body></html>"
    assert parse_html(page.encode("utf-8"), "u.html").blocks[0].text == "Café résumé"
    assert parse_html(page.encode("cp1252"), "w.html").blocks[0].text == "Café résumé"


def test_empty_page_and_non_html():
    with pytest.raises(IngestFailure) as empty:
        parse_html(html_page("<nav>menu only</nav>").encode(), "/kb/empty.html")
    assert empty.value.kind == "empty" and str(empty.value).startswith("'/kb/empty.html': ")
    with pytest.raises(IngestFailure) as plain:
        parse_html(b"just words, no markup", "/kb/plain.html")
    assert plain.value.kind == "not_a_html"


def test_deep_nesting_is_refused_quickly():
    page = "<html><body>" + "<div>" * 100_000 + "deep" + "</div>" * 100_000 + "</body></html>"
    with pytest.raises(IngestFailure) as deep:
        parse_html(page.encode(), "/kb/deep.html")
    assert deep.value.kind == "parse_error" and "nested deeper than 512" in str(deep.value)
    # 400 levels is still a page.
    page = "<html><body>" + "<div>" * 400 + "<p>fine</p>" + "</div>" * 400 + "</body></html>"
    assert [b.text for b in parse_html(page.encode(), "ok.html").blocks] == ["fine"]


def test_pages_about_cookies_are_content():
    # Found on the Python 3.11 manual (Debian python3.11-doc): <section id="module-http.cookiejar">.
    page = html_page(
        '<div class="cookie-notice">We use cookies</div><main><section id="module-http.cookiejar">'
        "<h1>http.cookiejar</h1><p>Cookie handling for HTTP clients.</p></section>"
        '<div id="cookies">Cookie objects are described here.</div></main>'
    )
    doc = parse_html(page.encode(), "cookiejar.html")
    assert [b.text for b in doc.blocks] == [
        "http.cookiejar",
        "Cookie handling for HTTP clients.",
        "Cookie objects are described here.",
    ]
