"""Temporal expressions -> normalized intervals with roles (DESIGN.md §3.2).
FIRST VERSION — the temporal issue owns and deepens this module."""

from __future__ import annotations

import calendar
import re
from datetime import date

from .models import TemporalExpression

_MONTHS = {m.lower(): i for i, m in enumerate(calendar.month_name) if m}
_MONTHS.update({m.lower(): i for i, m in enumerate(calendar.month_abbr) if m})
_MONTH = "|".join(sorted(_MONTHS, key=len, reverse=True))
_PATTERN = re.compile(
    rf"(?P<iso>\b(?P<iy>\d{{4}})-(?P<im>\d{{2}})-(?P<id>\d{{2}})\b)"
    rf"|(?P<mdy>\b(?P<m1>{_MONTH})\.?\s+(?P<d1>\d{{1,2}})(?:st|nd|rd|th)?,?\s+(?P<y1>\d{{4}})\b)"
    rf"|(?P<my>\b(?P<m2>{_MONTH})\s+(?P<y2>\d{{4}})\b)",
    re.IGNORECASE,
)
_SENTENCE = re.compile(r"[^.!?\n]+(?:[.!?]+|$)")
_CUES = [
    ("as_of", re.compile(r"\b(as of|updated|reviewed|current as of)\b", re.I)),
    ("expires", re.compile(r"\b(until|through|expires?|deadline|no later than|valid through|closes?|closed)\b", re.I)),
    ("planned", re.compile(r"\b(will|scheduled|upcoming|planned)\b", re.I)),
    ("effective", re.compile(r"\b(effective|starting|beginning|from)\b", re.I)),
]


def _role(sentence: str) -> str:
    for role, cue in _CUES:
        if cue.search(sentence):
            return role
    return "event"


def extract(text: str, reference_date: date | None = None, *, day_first: bool = False,
            fiscal_year_start: int = 1, hemisphere: str = "north") -> list[TemporalExpression]:
    found = []
    for sentence_match in _SENTENCE.finditer(text):
        sentence = sentence_match.group().strip()
        for m in _PATTERN.finditer(sentence_match.group()):
            try:
                if m.group("iso"):
                    start = end = date(int(m["iy"]), int(m["im"]), int(m["id"]))
                    gran = "day"
                elif m.group("mdy"):
                    start = end = date(int(m["y1"]), _MONTHS[m["m1"].lower()], int(m["d1"]))
                    gran = "day"
                else:
                    y, mo = int(m["y2"]), _MONTHS[m["m2"].lower()]
                    start, end = date(y, mo, 1), date(y, mo, calendar.monthrange(y, mo)[1])
                    gran = "month"
            except ValueError:
                continue
            offset = sentence_match.start()
            found.append(TemporalExpression(sentence, m.group(), start, end, gran, _role(sentence),
                                            offset + m.start(), offset + m.end()))
    return found
