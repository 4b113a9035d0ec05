"""HTML: the main content as blocks under their heading path, the title, and metadata dates.

Main content: the first <main> (or role="main"), else the only <article>, else <body>; navigation,
site header/footer, asides, scripts, styles, forms and cookie/consent banners are dropped. Lists
become one block with a line per item, tables one block with a line per row ("cell | cell").

Dates, most specific first (docs/ingestion.md): schema.org in JSON-LD (dateModified, datePublished,
expires), schema.org microdata (itemprop), Open Graph (article:modified_time, og:updated_time,
article:published_time, article:expiration_time), Dublin Core (DCTERMS.modified, DC.date...),
<time datetime> marked as an update/publication date, <meta http-equiv="last-modified">.

Charset, after the WHATWG encoding-sniffing steps: byte-order mark, then the <meta> prescan (or
an XHTML XML declaration), then UTF-8 when the bytes are valid UTF-8, else windows-1252 — the
standard's default for English-language locales.
"""

from __future__ import annotations

import json
import re

from bs4 import BeautifulSoup, Comment, Doctype, NavigableString, ProcessingInstruction, Tag

from auditor.ingest.dates import parse_http_date, parse_time_element, parse_w3c_datetime
from auditor.ingest.failures import IngestFailure
from auditor.ingest.text import decode_text, sniff_bom
from auditor.language import from_tag
from auditor.models import Block, MetaDate, ParsedDocument

# Chromium's HTML parser stops nesting at 512 levels (kMaximumHTMLParserDOMTreeDepth, from
# memory); deeper documents are not real pages, and walking them costs time for nothing.
MAX_DEPTH = 512

_DROP = {
    "nav",
    "aside",
    "script",
    "style",
    "noscript",
    "template",
    "form",
    "button",
    "select",
    "textarea",
    "iframe",
    "svg",
    "canvas",
    "dialog",
    "object",
    "embed",
    "head",
    "input",
}
_CHROME = {"header", "footer"}
# Cookie/consent banners by their usual id or class words ("cookie-banner", "consent-popup",
# "cookieconsent"...), not any name holding "cookie": a page about http.cookiejar is content.
_BANNER = re.compile(
    r"(?<![\w.])(?:cookies?|consent|gdpr|privacy)[-_]?(?:banner|bar|notice|popup|modal|dialog|"
    r"overlay|wall|message|consent|container|prompt)(?![\w.])|(?<![\w.])(?:cookieconsent|"
    r"cookie-?law|onetrust[-\w]*|cc-(?:banner|window)|skip-link|newsletter-signup)(?![\w.])",
    re.I,
)
_HEADINGS = {"h1": 1, "h2": 2, "h3": 3, "h4": 4, "h5": 5, "h6": 6}
_BLOCKS = {
    "p",
    "div",
    "section",
    "article",
    "main",
    "blockquote",
    "pre",
    "ul",
    "ol",
    "dl",
    "table",
    "figure",
    "figcaption",
    "address",
    "details",
    "summary",
    "fieldset",
    "hr",
    "body",
    "caption",
    "thead",
    "tbody",
    "tfoot",
    "center",
}
_LINES = {"li", "tr", "dt", "dd", "br"}
_CELLS = {"td", "th"}
# WHATWG HTML §13.2.3.2 prescan: <meta charset> or <meta http-equiv content="...; charset=...">;
# an XHTML file's XML declaration names its encoding the same way.
_META_CHARSET = re.compile(
    rb"""<meta[^>]+charset\s*=\s*["']?([A-Za-z0-9_\-:.]+)"""
    rb"""|<\?xml[^>]+encoding\s*=\s*["']([A-Za-z0-9_\-:.]+)""",
    re.I,
)
_WS = re.compile(r"[ \t\r\n\f\u00a0]+")

_JSONLD_KEYS = [("dateModified", "modified"), ("datePublished", "published"), ("expires", "expires")]
# (attribute, name, MetaDate kind, source)
_META = [
    ("property", "article:modified_time", "modified", "og:article:modified_time"),
    ("property", "og:updated_time", "modified", "og:updated_time"),
    ("property", "article:published_time", "published", "og:article:published_time"),
    ("property", "article:expiration_time", "expires", "og:article:expiration_time"),
    ("name", "dcterms.modified", "modified", "dcterms:modified"),
    ("name", "dc.date.modified", "modified", "dc:date.modified"),
    ("name", "dcterms.issued", "published", "dcterms:issued"),
    ("name", "dc.date", "published", "dc:date"),
    ("name", "dcterms.date", "published", "dcterms:date"),
    ("name", "dcterms.created", "created", "dcterms:created"),
    ("name", "dcterms.valid", "expires", "dcterms:valid"),
]
_TIME_HINTS = [
    ("modified", re.compile(r"updat|modif|revis|review|changed", re.I)),
    ("published", re.compile(r"publish|posted|issued|created", re.I)),
    ("expires", re.compile(r"expir|valid until|valid through", re.I)),
]


def _charset(data: bytes) -> str | None:
    m = _META_CHARSET.search(data[:4096])
    if not m:
        return None
    name = (m.group(1) or m.group(2)).decode("ascii", "replace").lower()
    # WHATWG Encoding: "iso-8859-1" and "ascii" labels mean windows-1252.
    return "cp1252" if name in ("iso-8859-1", "latin1", "us-ascii", "ascii", "windows-1252") else name


def parse_html(data: bytes, path: str) -> ParsedDocument:
    """An HTML file -> ParsedDocument (main content blocks, title, metadata dates)."""
    declared = None if sniff_bom(data) else _charset(data)
    text = decode_text(data, path, declared=declared, kind="html")
    if "<" not in text[:65536]:
        raise IngestFailure("not_a_html", path, "no HTML markup in the file")
    # multi_valued_attributes=None: "class" stays one string; splitting every attribute of every
    # tag is a sixth of bs4's parse time and only `class` is read here.
    soup = BeautifulSoup(text, "lxml", multi_valued_attributes=None)
    scan = _scan(soup, path)
    dates = _dates(scan)
    title = _title(soup, scan)
    root = scan.main or (scan.articles[0] if len(scan.articles) == 1 else None) or soup.body or soup
    # Inside <main>/<article> a <header> holds the title: keep it; around <body> it is site chrome.
    blocks = _blocks(root, keep_chrome=root.name not in ("body", "[document]"))
    if not any(b.heading_path == () or b.text != b.heading_path[-1] for b in blocks):
        raise IngestFailure("empty", path, "no text in the page's main content")
    if title is None:
        title = next((b.text for b in blocks if b.heading_path and b.text == b.heading_path[-1]), None)
    return ParsedDocument(blocks=blocks, title=title, dates=dates, language=_language(soup))


def _language(soup) -> str | None:
    """The page's language: `lang` / `xml:lang` on <html> (HTML Living Standard, "The lang and
    xml:lang attributes"), else a Content-Language <meta>."""
    html = soup.find("html")
    if html is not None:
        for attribute in ("lang", "xml:lang"):
            if language := from_tag(html.get(attribute)):
                return language
    meta = soup.find("meta", attrs={"http-equiv": lambda v: isinstance(v, str) and v.lower() == "content-language"})
    return from_tag(meta.get("content")) if meta is not None else None


class _Scan:
    """What one pass over the tree finds: the elements dates, title and content root come from."""

    def __init__(self):
        self.scripts: list[Tag] = []
        self.metas: list[Tag] = []
        self.times: list[Tag] = []
        self.itemprops: dict[str, Tag] = {}
        self.main: Tag | None = None
        self.articles: list[Tag] = []


def _scan(soup: BeautifulSoup, path: str) -> _Scan:
    """One iterative pass (bs4's find() walks the whole tree each call; pages can be large), which
    also refuses trees nested deeper than MAX_DEPTH."""
    scan = _Scan()
    stack: list[tuple[Tag, int]] = [(soup, 0)]
    while stack:
        node, depth = stack.pop()
        if depth > MAX_DEPTH:
            raise IngestFailure(
                "parse_error", path, f"HTML nested deeper than {MAX_DEPTH} elements; not a page a browser would show"
            )
        name = node.name
        if name == "meta":
            scan.metas.append(node)
        elif name == "script":
            if "ld+json" in (_attr(node, "type") or "").lower():
                scan.scripts.append(node)
        elif name == "time":
            scan.times.append(node)
        elif name == "article":
            scan.articles.append(node)
        if scan.main is None and (name == "main" or _attr(node, "role") == "main") and name != "[document]":
            scan.main = node
        prop = _attr(node, "itemprop")
        if prop in ("dateModified", "datePublished", "expires"):
            scan.itemprops.setdefault(prop, node)
        children = [c for c in node.contents if isinstance(c, Tag)]
        stack.extend((c, depth + 1) for c in reversed(children))
    return scan


def _title(soup: BeautifulSoup, scan: _Scan) -> str | None:
    if soup.title and soup.title.string and soup.title.string.strip():
        return _WS.sub(" ", soup.title.string).strip()
    for meta in scan.metas:
        if _attr(meta, "property") == "og:title" and (_attr(meta, "content") or "").strip():
            return (_attr(meta, "content") or "").strip()
    return None


_PERMALINK = {"¶", "§", "#", "🔗"}


def _dropped(tag: Tag, inside_root: bool) -> bool:
    if tag.name in _DROP or (tag.name in _CHROME and not inside_root):
        return True
    # Documentation generators append permalink anchors ("¶") to headings and definitions.
    if tag.name == "a" and (_attr(tag, "href") or "").startswith("#") and tag.get_text().strip() in _PERMALINK:
        return True
    if (
        _attr(tag, "hidden") is not None
        or _attr(tag, "aria-hidden") == "true"
        or _attr(tag, "role") in ("navigation", "banner", "contentinfo")
    ):
        return True
    style = _attr(tag, "style")
    if style and "display:none" in style.replace(" ", "").lower():
        return True
    marker = f"{_attr(tag, 'id') or ''} {_attr(tag, 'class') or ''}".strip()
    return bool(marker and _BANNER.search(marker))


def _attr(tag: Tag, name: str) -> str | None:
    """An attribute's value as text: with multi_valued_attributes=None (parse_html) bs4 gives every
    attribute as one string; a list, should one come, is joined the way bs4 would split it."""
    value = tag.get(name)
    return value if value is None or isinstance(value, str) else " ".join(value)


class _OnClose:
    __slots__ = ("run",)

    def __init__(self, run):
        self.run = run


def _blocks(root: Tag, keep_chrome: bool) -> list[Block]:
    """Walk the content tree without recursion (pages can nest deeply) into blocks."""
    blocks: list[Block] = []
    headings: list[tuple[int, str]] = []
    lines: list[str] = []
    current: list[str] = []

    def end_line() -> None:
        line = "".join(current)
        current.clear()
        line = line.rstrip() if preformatted[0] else _WS.sub(" ", line).strip()
        line = line.rstrip(" |")  # a table row ends with a cell separator
        if line.strip():
            lines.append(line)

    def end_block() -> None:
        end_line()
        if lines:
            blocks.append(Block("\n".join(lines), tuple(h for _, h in headings)))
            lines.clear()

    def end_preformatted() -> None:
        end_block()
        preformatted[0] -= 1

    preformatted = [0]
    # Stack items: a node to visit, or an _OnClose to run when its element closes (not a bare
    # callable: bs4 Tags are callable themselves).
    stack: list = [root]
    while stack:
        item = stack.pop()
        if isinstance(item, _OnClose):
            item.run()
            continue
        if isinstance(item, (Comment, Doctype, ProcessingInstruction)):
            continue
        if isinstance(item, NavigableString):
            current.append(str(item))
            continue
        if not isinstance(item, Tag):
            continue
        name = item.name
        if item is not root and _dropped(item, keep_chrome):
            continue
        if name in _HEADINGS:
            end_block()
            title = _WS.sub(" ", item.get_text(" ")).strip().rstrip("¶§🔗 ")
            if title:
                level = _HEADINGS[name]
                while headings and headings[-1][0] >= level:
                    headings.pop()
                headings.append((level, title))
                blocks.append(Block(title, tuple(h for _, h in headings)))
            continue
        children = list(reversed(item.contents))
        if name in _BLOCKS:
            end_block()
            if name == "pre":
                preformatted[0] += 1
                stack.append(_OnClose(end_preformatted))
            else:
                stack.append(_OnClose(end_block))
        elif name in _LINES:
            end_line()
            stack.append(_OnClose(end_line))
            if name == "li":
                current.append("- ")
        elif name in _CELLS:
            stack.append(_OnClose(lambda: current.append(" | ")))
        elif name == "img" and _attr(item, "alt"):
            current.append(f" {item['alt']} ")
        stack.extend(children)
    end_block()
    return blocks


def _dates(scan: _Scan) -> list[MetaDate]:
    found: list[MetaDate] = []
    for script in scan.scripts:
        try:
            data = json.loads(script.string or "")
        except (json.JSONDecodeError, TypeError, RecursionError):
            continue
        for key, kind in _JSONLD_KEYS:
            value = _jsonld_first(data, key)
            if isinstance(value, dict):  # an expanded value object: {"@value": "...", "@type": "Date"}
                value = value.get("@value")
            if isinstance(value, str) and (d := parse_w3c_datetime(value)):
                found.append(MetaDate(d, kind, f"jsonld:{key}"))
    used = set()
    for key, kind in _JSONLD_KEYS:
        tag = scan.itemprops.get(key)
        if tag is not None:
            used.add(id(tag))
            value = _attr(tag, "content") or _attr(tag, "datetime") or tag.get_text()
            parse = parse_time_element if tag.name == "time" else parse_w3c_datetime
            if d := parse(value.strip()):
                found.append(MetaDate(d, kind, f"microdata:{key}"))
    metas = scan.metas
    for attr, name, kind, source in _META:
        for meta in metas:
            if (_attr(meta, attr) or "").strip().lower() == name and (d := parse_w3c_datetime(_attr(meta, "content"))):
                found.append(MetaDate(d, kind, source))
                break
    for time in scan.times:
        if id(time) in used:
            continue
        hint = " ".join(
            filter(
                None,
                [
                    _attr(time, "itemprop"),
                    _attr(time, "class"),
                    "updated" if time.has_attr("pubdate") else None,
                    _preceding_text(time),
                ],
            )
        )
        for kind, pattern in _TIME_HINTS:
            if pattern.search(hint):
                d = parse_time_element(_attr(time, "datetime") or time.get_text())
                if d:
                    found.append(MetaDate(d, kind, "time:datetime"))
                break
    for meta in metas:
        if (_attr(meta, "http-equiv") or "").lower() == "last-modified" and (
            d := parse_http_date(_attr(meta, "content"))
        ):
            found.append(MetaDate(d, "modified", "http:last-modified"))
            break
    return found


def _preceding_text(tag: Tag) -> str:
    prev = tag.previous_sibling
    text = str(prev) if isinstance(prev, NavigableString) else (prev.get_text() if isinstance(prev, Tag) else "")
    return text[-40:]


def _jsonld_first(data, key: str):
    """The first value of `key` in a JSON-LD tree (objects, lists, @graph), breadth first so the
    page's own entity wins over nested ones (an article's author's dates)."""
    queue = [data]
    while queue:
        node = queue.pop(0)
        if isinstance(node, dict):
            if key in node:
                value = node[key]
                return value[0] if isinstance(value, list) and value else value
            queue.extend(v for v in node.values() if isinstance(v, (dict, list)))
        elif isinstance(node, list):
            queue.extend(node)
    return None
