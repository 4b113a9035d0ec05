"""Detectors for network identifiers in free text: e-mail addresses and IP addresses.

* E-mail: an RFC 5322 addr-spec — a dot-atom or quoted-string local part, "@", a domain of dotted
  labels (at least one dot) or a domain literal in brackets — with the UTF-8 letters that RFC 6531
  (SMTPUTF8) allows on both sides. Dotless domains ("me@home") are left: in search queries they are
  far more often not addresses.
* IP: dotted-quad IPv4 (RFC 791 notation) and IPv6 text forms (RFC 4291 §2.2, with "::" and an
  embedded IPv4 tail), each candidate validated by the standard library's `ipaddress` (which
  refuses octets above 255 and, since Python 3.9.5, leading zeros).
"""

from __future__ import annotations

import ipaddress
import re

Span = tuple[int, int]

# RFC 5322 §3.2.3 atext, plus RFC 6531 §3.3's UTF8-non-ascii: any non-ASCII character, here less
# whitespace and the punctuation blocks (general, CJK, fullwidth) so that "addr@x.org。" ends at "g".
_NON_ASCII = r"[^\x00-\x7f\s\u2000-\u206f\u3000-\u303f\uff00-\uff0f\uff1a-\uff20]"
_ATEXT = rf"(?:[A-Za-z0-9!#$%&'*+/=?^_`{{|}}~-]|{_NON_ASCII})"
_LOCAL = rf'(?:{_ATEXT}+(?:\.{_ATEXT}+)*|"(?:[^"\\\r\n]|\\.)+")'
_LABEL_CHAR = rf"(?:[A-Za-z0-9]|{_NON_ASCII})"
_LABEL = rf"{_LABEL_CHAR}(?:(?:{_LABEL_CHAR}|-)*{_LABEL_CHAR})?"
_DOMAIN = rf"(?:{_LABEL}(?:\.{_LABEL})+|\[[^\]\s]+\])"
EMAIL = re.compile(rf"(?<![\w.!#$%&'*+/=?^`{{|}}~-]){_LOCAL}@{_DOMAIN}")


def find_emails(text: str) -> list[Span]:
    return [m.span() for m in EMAIL.finditer(text)] if "@" in text else []


_IPV4 = re.compile(r"(?<![\w.])\d{1,3}(?:\.\d{1,3}){3}(?!\w|\.\d)")
# Two to eight hex groups joined by ":" (one "::" allowed by the validator), optionally ending in
# a dotted IPv4 tail.
_IPV6 = re.compile(r"(?<![\w:.])(?:[0-9A-Fa-f]{0,4}:){2,7}(?:\d{1,3}(?:\.\d{1,3}){3}|[0-9A-Fa-f]{1,4})?(?![\w:]|\.\d)")


def find_ips(text: str) -> list[Span]:
    spans = [m.span() for m in _IPV4.finditer(text) if _valid(m.group(), ipaddress.IPv4Address)]
    if ":" in text:
        for m in _IPV6.finditer(text):
            value = m.group()
            # At least two groups with digits: "a::b" is an address, "::" or "x:" alone is prose.
            if sum(1 for g in re.split(r"[:.]", value) if g) >= 2 and _valid(value, ipaddress.IPv6Address):
                spans.append(m.span())
    return sorted(spans)


def _valid(value: str, kind) -> bool:
    try:
        kind(value)
    except ValueError:
        return False
    return True
