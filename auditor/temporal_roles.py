"""What a temporal expression says about the content: its role (DESIGN.md §3.2).

The cue lexicon below is ours. A role is decided from the words just before the expression (in
the same sentence, after any earlier expression), then from the words just after it, then from the
sentence's tense, in this order:

1. `other`    copyright lines (©, "Copyright", "(c)") and citations ("(Rivera, 2019)", "et al., 2019")
2. strong cues, the nearest one wins:
   `as_of`     as of, as at, updated, last updated, reviewed, revised, current as of, accurate as of,
               correct as of, verified, information current
   `effective` effective, takes/took effect, in effect, in force, applies/apply from, starting,
               starts, beginning, begins, commencing, as from, on and after, on or after, valid from,
               opens, open, becomes, new from
   `expires`   until, till, through, thru, expires/expired?, expiry, expiration, deadline, no later
               than, valid through/until, ends, ending, end date, closes, will close, close on,
               last day, due, cut-off, up to and including
3. weak cues, the nearest one wins, unless the sentence speaks of the future (then `planned`):
   `effective` from, since, after;  `expires` by, before (only with an obligation: must, submit,
   apply, pay, received ...)
4. `period`   for, during, throughout, covering, in fiscal ...; or a noun that a date qualifies
              right after it ("2023 rates", "the 2024 water quality report", "FY2025 budget")
5. `planned`  the sentence is in the future tense (will, scheduled, planned, upcoming, expected to,
              is set to, going to, coming), or the expression is a future relative one (next month,
              in two weeks, tomorrow), or it lies after the document date without a past tense
6. `event`    anything else: a dated happening
"""

from __future__ import annotations

import re
from datetime import date

_OTHER_LEFT = re.compile(r"(?i:(?:©|\(c\)|\bcopyright)\s*(?:©\s*)?$|\bet\s+al\.?,?\s*$|"
                         r"\([A-Z][A-Za-z.&' -]{1,60},\s*$)")
_STRONG = [
    ("as_of", r"as\s+of|as\s+at|(?:last\s+)?updated(?:\s+on)?|(?:last\s+)?reviewed(?:\s+on)?|revised(?:\s+on)?|"
              r"current\s+as\s+of|accurate\s+as\s+of|correct\s+as\s+of|verified(?:\s+on)?|"
              r"information\s+(?:is\s+)?current"),
    ("effective", r"effective(?:\s+(?:from|on|as\s+of))?|takes?\s+effect(?:\s+on)?|took\s+effect(?:\s+on)?|"
                  r"in\s+effect(?:\s+from)?|in\s+force(?:\s+from)?|comes?\s+into\s+force(?:\s+on)?|"
                  r"appl(?:y|ies)\s+(?:from|to\s+bills\s+(?:issued|dated)\s+(?:on\s+or\s+)?after)|"
                  r"starting(?:\s+(?:on|from|in))?|starts(?:\s+on)?|beginning(?:\s+(?:on|in))?|"
                  r"begins(?:\s+on)?|commencing(?:\s+on)?|as\s+from|on\s+(?:and|or)\s+after|"
                  r"from\s+and\s+after|valid\s+from|valid|opens?(?:\s+(?:on|from))?|becomes?|new\s+from"),
    ("expires", r"until|till|through|thru|expires?(?:\s+on)?|expiry(?:\s+date)?|expiration(?:\s+date)?|"
                r"deadline(?:\s+is)?|no\s+later\s+than|valid\s+(?:through|until|till|to)|ends?(?:\s+on)?|"
                r"ending(?:\s+on)?|end\s+date|closes(?:\s+on)?|close\s+on|will\s+close(?:\s+on)?|"
                r"last\s+day(?:\s+(?:to\s+\w+|for\s+\w+))?(?:\s+is)?|due(?:\s+(?:on|by))?|cut-?off(?:\s+date)?|"
                r"up\s+to\s+and\s+including|not\s+after|while\s+funds\s+last,?\s+until"),
]
_WEAK = [
    ("effective", r"from|since|after"),
    ("expires", r"by|before"),
]
_PERIOD_LEFT = r"for|during|throughout|covering|covers|cover|over|for\s+the|in\s+the\s+(?:calendar|fiscal)\s+year"


def _compile(pairs):
    return [(role, re.compile(rf"(?i:\b(?:{body})\b[\s:,-]*)")) for role, body in pairs]


_STRONG_CUES = _compile(_STRONG)
_WEAK_CUES = _compile(_WEAK)
_PERIOD_CUE = re.compile(rf"(?i:\b(?:{_PERIOD_LEFT})\s+(?:the\s+)?(?:(?:calendar|fiscal|school|tax)\s+year\s+)?)$")
_PLANNED_LEFT = re.compile(r"(?i:\b(?:scheduled|planned|slated|set|expected|tentatively)\s+(?:for|in|on|to\s+\w+\s+(?:in|on))\s+(?:the\s+)?$)")
_PERIOD_NOUN = (r"(?:water\s+)?rates?|rate\s+schedules?|tariffs?|fees?|charges?|prices?|pricing|"
                r"budgets?|reports?|annual|water\s+quality|consumer\s+confidence|seasons?|programs?|programmes?|"
                r"figures|results|data|levels|surveys?|editions?|calendar|billing|assessments?|statements?|"
                r"summary|holidays?|schedules?|plans?|allowances?|quotas?|tiers?|cycle|rebates?|campaigns?|"
                r"restrictions|projects|statistics|targets|goals|capital")
# the noun may follow directly ("2023 rates") or after one word ("2024 property assessment")
_PERIOD_RIGHT = re.compile(rf"(?i:^\s*(?:-|–)?\s*(?:(?!(?:to|for|and|or|the|a|an|of|in|on|at|by|is|are|was|will)\b)"
                           rf"[A-Za-z]+\s+)?(?:{_PERIOD_NOUN})\b)")
_PERIOD_LEFT_NOUN = re.compile(r"(?i:\b(?:report|statistics|results|targets|budget|rates|schedule|edition|"
                               r"plan|review|summary|figures)\s*:?\s*$)")
_AS_OF_RIGHT = re.compile(r"(?i:^\s*(?:update|revision)\b)")
_EFFECTIVE_RIGHT = re.compile(r"(?i:^\s*(?:,\s*)?(?:(?:or|and)\s+(?:later|after|thereafter)|onwards?)\b)")
_RECURRING = re.compile(r"(?i:^\s*(?:,\s*)?(?:each|every)\s+(?:year|month|week|season)|^\s*(?:,\s*)?(?:annually|yearly)\b)")
_OBLIGATION = re.compile(r"(?i:\b(?:must|need\s+to|needs\s+to|have\s+to|has\s+to|required|requires|submit|"
                         r"submitted|apply|applications?|pay|paid|payment|received|return|returned|"
                         r"register|enrol|enroll|sign\s+up|send|sent|complete|completed\s+by|"
                         r"postmarked|file|claim|request|renew|redeem)\b)")
_FUTURE = re.compile(r"(?i:\b(?:will|shall|'ll|scheduled|planned|plans?\s+to|upcoming|expected\s+to|expected|"
                     r"expects?\s+to|(?:is|are)\s+set\s+to|(?:is|are)\s+going\s+to|intends?\s+to|"
                     r"aims?\s+to|forthcoming|coming\s+soon|(?:is|are)\s+to\s+be|anticipated|"
                     r"tentatively|proposed)\b)")
_PAST = re.compile(r"(?i:\b(?:was|were|had|has\s+been|have\s+been|did|completed|replaced|installed|"
                   r"happened|occurred|took\s+place|ended|closed|launched|opened|introduced|began|"
                   r"started|finished|received|ran|moved|changed|rose|fell|increased|decreased|"
                   r"upgraded|repaired|issued|sent|published|adopted|approved|merged|retired|used|"
                   r"released|mailed|lasted|declared|frozen|caused|damaged|met|answered)\b)")
_STRONG_REACH = 40  # characters a strong cue may stand before its expression ("effective for bills on")
_WINDOW = 80


def _nearest(cues, left: str, reach: int):
    """The role of the cue whose match ends closest to the end of `left` (ties: the longer match),
    if no more than `reach` characters of the same clause stand between it and the expression."""
    best = None
    for role, pattern in cues:
        for m in pattern.finditer(left):
            key = (m.end(), m.end() - m.start())
            if best is None or key > best[0]:
                best = (key, role)
    if best is None:
        return None
    (end, _), role = best
    between = left[end:]
    if len(between) > reach or re.search(r"[.;!?]|\b(?:then|but|while|and|or)\b", between):
        return None
    return role


def role_for(left: str, right: str, sentence: str, *, start: date, reference_date: date | None,
             granularity: str = "day", future_relative: bool = False, past_relative: bool = False,
             bounded: bool = False) -> str:
    """The role of an expression, given the sentence text to its `left` and `right` (see module doc)."""
    left = left[-_WINDOW:]
    if _OTHER_LEFT.search(left) or _RECURRING.search(right):
        return "other"
    strong = _nearest(_STRONG_CUES, left, _STRONG_REACH)
    if strong:
        return strong
    if _AS_OF_RIGHT.search(right):
        return "as_of"
    if _EFFECTIVE_RIGHT.search(right):
        return "effective"
    future = (bool(_FUTURE.search(sentence)) or future_relative) and not past_relative
    past = bool(_PAST.search(sentence))
    weak = _nearest(_WEAK_CUES, left, 5)
    if weak == "expires" and not _OBLIGATION.search(sentence):
        weak = None
    if weak == "effective" and past and not future:
        weak = None  # "the campaign ran from ... to ..." tells of an event
    if weak == "effective" and future and bounded:
        weak = None  # "will be closed from Dec 24 to Jan 2": a planned event, not a lasting change
    if weak == "expires" and future and not _OBLIGATION.search(left):
        weak = None  # "we will finish by 2030"
    if weak:
        return weak
    if _PLANNED_LEFT.search(left):
        return "planned"
    if _PERIOD_CUE.search(left) or _PERIOD_RIGHT.search(right):
        return "period"
    if granularity in ("year", "quarter", "half", "season") and _PERIOD_LEFT_NOUN.search(left):
        return "period"  # "Annual Report 2023", "Outage statistics 2024-Q3"
    if future:
        return "planned"
    if reference_date is not None and start > reference_date and not past:
        return "planned"
    return "event"
