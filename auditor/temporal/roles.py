"""What a temporal expression says about the content: its role (docs/dates.md).

The cue lexicon below is ours. A role is decided from the words just before the expression (in
the same sentence, after any earlier expression), then the words just after it, then the
sentence's tense; the first rule that applies wins:

1. `other`     a copyright line (©, "Copyright", "(c)"), a citation ("(Rivera, 2019)", "et al.,
               2019", a bare year in parentheses: "4th edition (2016)"), or a recurring date
               ("June 1 through September 30 each year", "annually").
2. a strong cue, the nearest one, at most 40 characters of the same clause before the expression
   (no "and", "or", "but", "once", "when", "if" ... in between; for an as-of cue at most 20 and
   no new verb, so that "updated meters were installed in 2019" is no as-of statement):
   `as_of`     as of, as at, (last) updated, (last) reviewed, revised, (last) modified, date
               modified, (last) checked, current/accurate/correct as of, verified, information current;
   `expires`   until, till, expires, expiry, expiration, deadline, no later than, valid
               through/until, ends, will end, end of support/life/service, ending, end date,
               closes, close on, last day, is/payment due, due on/by, cut-off, up to and including,
               not after; and through/thru right before the expression (else it may mean "by way of");
   `effective` effective, takes/took effect, in effect, in force, comes into force, applies from,
               starting, starts, beginning, begins, commencing, as from, on and/or after, valid
               (from), opens/open, becomes/became, new from.
3. right after the expression: "update"/"revision" -> `as_of` ("MARCH 2024 UPDATE");
   "or later", "onwards" -> `effective`.
4. a weak cue right before the expression: from/since/after -> `effective`; by/before ->
   `expires` only after an obligation in the same sentence (must, submit, apply, pay ...);
   "after" in a sentence that refuses ("cannot be considered") -> `expires`. A weak effective cue
   yields in a past-tense sentence ("ran from ... to ..." is an event; a participle right before
   the cue, "accounts opened from", does not count as past) and when a future-tense sentence gives
   a bounded range ("will be closed from Dec 24 to Jan 2" is planned). A weak cue that yields
   leaves a reference point: `event`, unless the date lies after the reference date.
5. `planned`   "scheduled/planned/slated/expected for|in|on" right before it.
6. `period`    for, during, throughout, covering, over, applies to ... right before it, or a noun
               the date qualifies right after it ("2023 rates", "2024 property assessment", "FY2025
               budget"), or for a year/quarter/half/season a noun right before it ("Annual Report 2023").
7. `planned`   a future-tense sentence (will, shall, scheduled, planned, upcoming, expected (to),
               is set to, going to, intends/aims to, proposed ...) or a relative expression that
               points forward (next month, in two weeks, tomorrow) — but never one that points
               back ("two weeks ago", "last year"); or a date after the reference (document) date
               in a sentence with no past tense.
8. `event`     anything else: a dated happening.
"""

from __future__ import annotations

import functools
import re
from datetime import date

_OTHER_LEFT = re.compile(
    r"(?i:(?:©|\(c\)|\bcopyright)\s*(?:©\s*)?$|\bet\s+al\.?,?\s*$|"
    r"\([A-Z][A-Za-z.&' -]{1,60},\s*$)"
)
_STRONG = [
    (
        "as_of",
        r"as\s+of|as\s+at|(?:last[\s_]+)?updated(?:\s+on)?|(?:last[\s_]+)?reviewed(?:\s+on)?|revised(?:\s+on)?|"
        r"(?:last[\s_]+)?modified(?:\s+on)?|date[\s_]+modified|(?:last\s+)?checked(?:\s+on)?|"
        r"current\s+as\s+of|accurate\s+as\s+of|correct\s+as\s+of|verified(?:\s+on)?|"
        r"information\s+(?:is\s+)?current",
    ),
    (
        "expires",
        r"until|till|expires?(?:\s+on)?|expiry(?:\s+date)?|expiration(?:\s+date)?|"
        r"deadline(?:\s+is)?|no\s+later\s+than|valid\s+(?:through|thru|until|till|to)|ends(?:\s+on)?|"
        r"end\s+of\s+(?:support|life|service|sale)(?:\s+on)?|(?:will|to)\s+end(?:\s+on)?|ending(?:\s+on)?|end\s+date|closes(?:\s+on)?|"
        r"close\s+on|will\s+close(?:\s+on)?|last\s+day(?:\s+(?:to\s+\w+|for\s+\w+))?(?:\s+is)?|"
        r"(?:is|are|payment|bills?|amount)\s+due(?:\s+(?:on|by))?|due\s+(?:on|by|date)|"
        r"cut-?off(?:\s+date)?|up\s+to\s+and\s+including|not\s+after",
    ),
    (
        "effective",
        r"effective(?:\s+(?:from|on|as\s+of))?|takes?\s+effect(?:\s+on)?|took\s+effect(?:\s+on)?|"
        r"in\s+effect(?:\s+from)?|in\s+force(?:\s+from)?|comes?\s+into\s+force(?:\s+on)?|"
        r"appl(?:y|ies)\s+(?:from|to\s+bills\s+(?:issued|dated)\s+(?:on\s+or\s+)?after)|"
        r"starting(?:\s+(?:on|from|in))?|starts(?:\s+on)?|beginning(?:\s+(?:on|in))?|"
        r"begins(?:\s+on)?|commencing(?:\s+on)?|as\s+from|on\s+(?:and|or)\s+after|"
        r"from\s+and\s+after|valid\s+from|valid|opens?(?:\s+(?:on|from))?|becomes?|became|new\s+from",
    ),
]
# Cues that count only right before the expression. "through" is also "by way of" ("pay through
# the portal on ..."), so it is a strong expiry cue only there; the weak ones are weighed below.
_NEAR = [
    ("through", r"through|thru"),
    ("weak_effective", r"from|since|after"),
    ("weak_expires", r"by|before"),
]
_PERIOD_LEFT = (
    r"for|during|throughout|covering|covers|cover|over|for\s+the|appl(?:y|ies)\s+to|"
    r"in\s+the\s+(?:calendar|fiscal)\s+year"
)


def _compile(pairs):
    """One alternation with a group per role; its last match in a window is the nearest cue.
    Where two cues start alike, the earlier pair wins ("valid through" is an expiry, not "valid").
    Matched against lower-cased text: without re.I the engine skips an alternative at its first
    letter, which makes the scan of each window several times cheaper."""
    return re.compile("|".join(rf"(?P<{role}>\b(?:{body})\b[\s:,-]*)" for role, body in pairs))


_STRONG_CUES = _compile(_STRONG)
_NEAR_CUES = _compile(_NEAR)
_PERIOD_CUE = re.compile(rf"(?i:\b(?:{_PERIOD_LEFT})\s+(?:the\s+)?(?:(?:calendar|fiscal|school|tax)\s+year\s+)?)$")
_PLANNED_LEFT = re.compile(
    r"(?i:\b(?:scheduled|planned|slated|set|expected|tentatively)\s+(?:for|in|on|to\s+\w+\s+(?:in|on))\s+(?:the\s+)?$)"
)
_PERIOD_NOUN = (
    r"(?:water\s+)?rates?|rate\s+schedules?|tariffs?|fees?|charges?|prices?|pricing|"
    r"budgets?|reports?|annual|water\s+quality|consumer\s+confidence|seasons?|programs?|programmes?|"
    r"figures|results|data|levels|surveys?|editions?|calendar|billing|assessments?|statements?|"
    r"summary|holidays?|schedules?|plans?|allowances?|quotas?|tiers?|cycle|rebates?|campaigns?|"
    r"restrictions|projects|statistics|targets|goals|capital|newsletters?|bulletins?|issues?|audits?|reviews?|surcharges?|discounts?|credits?"
)
# the noun may follow directly ("2023 rates") or after one word ("2024 property assessment")
_PERIOD_RIGHT = re.compile(
    rf"(?i:\s*(?:[-–]\s*)?(?:(?!(?:to|for|and|or|the|a|an|of|in|on|at|by|is|are|was|will)\b)"
    rf"[A-Za-z]+\s+)?(?:{_PERIOD_NOUN})\b)"
)
_PERIOD_LEFT_NOUN = re.compile(
    r"(?i:\b(?:report|statistics|results|targets|budget|rates|schedule|edition|"
    r"plan|review|summary|figures)\s*:?\s*$)"
)
_AS_OF_RIGHT = re.compile(r"(?i:\s*(?:update|revision)\b)")
_EFFECTIVE_RIGHT = re.compile(r"(?i:\s*(?:,\s*)?(?:(?:or|and)\s+(?:later|after|thereafter)|onwards?)\b)")
_RECURRING = re.compile(r"(?i:\s*(?:,\s*)?(?:(?:each|every)\s+(?:year|month|week|season)|annually|yearly)\b)")
_OBLIGATION = re.compile(
    r"(?i:\b(?:must|need\s+to|needs\s+to|have\s+to|has\s+to|required|requires|submit|"
    r"submitted|apply|applications?|pay|paid|payment|received|return|returned|"
    r"register|enrol|enroll|sign\s+up|send|sent|complete|completed\s+by|"
    r"postmarked|file|claim|request|renew|redeem)\b)"
)
# Tense cues, looked up as words (a set lookup is several times faster than a regex scan).
_FUTURE_WORDS = {
    "will",
    "shall",
    "scheduled",
    "planned",
    "upcoming",
    "expected",
    "forthcoming",
    "anticipated",
    "tentatively",
    "proposed",
}
_FUTURE_HINTS = {
    "plan",
    "plans",
    "expect",
    "expects",
    "set",
    "going",
    "intend",
    "intends",
    "aim",
    "aims",
    "coming",
    "be",
}
_FUTURE_PHRASES = re.compile(
    r"(?i:\b(?:plans?\s+to|expects?\s+to|(?:is|are)\s+set\s+to|(?:is|are)\s+going\s+to|"
    r"intends?\s+to|aims?\s+to|coming\s+soon|(?:is|are)\s+to\s+be)\b)"
)
_PAST_WORDS = {
    "was",
    "were",
    "had",
    "did",
    "completed",
    "replaced",
    "installed",
    "happened",
    "occurred",
    "took",
    "ended",
    "closed",
    "launched",
    "opened",
    "introduced",
    "began",
    "started",
    "finished",
    "received",
    "ran",
    "moved",
    "changed",
    "rose",
    "fell",
    "increased",
    "decreased",
    "upgraded",
    "repaired",
    "issued",
    "sent",
    "published",
    "adopted",
    "approved",
    "merged",
    "retired",
    "used",
    "released",
    "mailed",
    "lasted",
    "declared",
    "frozen",
    "caused",
    "damaged",
    "met",
    "answered",
}
_WORDS = re.compile(r"[a-z']+")
# a participle right before a weak cue modifies a noun ("accounts opened from ...", "applications
# received after ..."); it does not put the sentence in the past
_PARTICIPLE_BEFORE_CUE = re.compile(r"(?i:\b\w+(?:ed|en)\s+(?:on\s+or\s+)?(?:from|after|since|before|by)\s*$)")
_NEGATION = re.compile(r"(?i:\b(?:cannot|can't|not|no\s+longer|won't)\b)")
_STRONG_REACH = 40  # characters a strong cue may stand before its expression ("effective for bills on")
_TAIL = 70  # the cues anchored at the end of the left context are shorter than this
_WINDOW = 80


_CLAUSE_BREAK = re.compile(r"[.;!?]|\b(?:then|but|while|and|or|once|when|if|unless|because)\b")


_NEW_VERB = re.compile(r"(?i:\b(?:was|were|is|are|will|has|have|had|be|been)\b)")
_AS_OF_REACH = 20  # "reviewed this guide in January 2024", not "updated meters were installed in 2019"


_ASCII_LOWER = str.maketrans("ABCDEFGHIJKLMNOPQRSTUVWXYZ", "abcdefghijklmnopqrstuvwxyz")


def _nearest(cues: re.Pattern, left: str, reach: int) -> str | None:
    """The role of the cue nearest the end of `left`, if no more than `reach` characters of the
    same clause stand between it and the expression (an as-of cue: fewer, and no new verb)."""
    last = None
    # the cues are ASCII and matched in lower case (`_compile`); offsets stay those of `left`
    lower = left.lower() if left.isascii() else left.translate(_ASCII_LOWER)
    for last in cues.finditer(lower, max(0, len(left) - reach - 30)):  # noqa: B007 - keep the last match
        pass
    if last is None:
        return None
    between = left[last.end() :]
    if len(between) > reach or _CLAUSE_BREAK.search(between):
        return None
    if last.lastgroup == "as_of" and (len(between) > _AS_OF_REACH or _NEW_VERB.search(between)):
        return None
    return last.lastgroup


# the tense words of `tense`, and news past tense the role lexicon does not need ("said" opens most
# reported sentences; a verb in -ed: "reached", not "need"). A participle after is/are/be ("will be
# paid", "is closed") is no past; "would" looks ahead from a past report, "payable" to a payment,
# "plans to", "set to" to what is planned.
_TENSE_CUE = re.compile(
    r"(?i:\b(?:(?P<future>"
    + "|".join(sorted(_FUTURE_WORDS | {"would", "payable"}))
    + r"|(?:plans?|planning|expects?|intends?|aims?|set|due)\s+to)"
    r"|(?<!\bis )(?<!\bare )(?<!\bbe )(?<!\bbeen )(?<!\bget )(?<!\bgets )(?P<past>"
    + "|".join(sorted(_PAST_WORDS))
    + r"|said|told|grew|came|went|gave|made|saw|won|lost|paid|sold|bought|left|[a-z]{2,}[^e\s]ed))\b)"
)


def nearest_tense(left: str, right: str) -> tuple[bool, bool] | None:
    """(future, past) by the tense word nearest an expression, `left` ending and `right` starting
    at it; None when neither holds one. In "said on Friday it will close on Monday" the nearest
    verb, not the sentence, tells which Friday and which Monday."""
    before = None
    for before in _TENSE_CUE.finditer(left):  # noqa: B007 - keep the last match
        pass
    after = _TENSE_CUE.search(right)
    if before is None and after is None:
        return None
    if after is None or (before is not None and len(left) - before.end() <= after.start()):
        cue = before
    else:
        cue = after
    assert cue is not None
    return (True, False) if cue.lastgroup == "future" else (False, True)


@functools.lru_cache(maxsize=1024)
def tense(sentence: str) -> tuple[bool, bool]:
    """(speaks of the future, speaks of the past), computed once per sentence."""
    lower = sentence.lower()
    words = set(_WORDS.findall(lower))
    future = (
        not _FUTURE_WORDS.isdisjoint(words)
        or "'ll" in lower
        or (not _FUTURE_HINTS.isdisjoint(words) and _FUTURE_PHRASES.search(lower) is not None)
    )
    return future, not _PAST_WORDS.isdisjoint(words)


def role_for(
    left: str,
    right: str,
    sentence: str,
    *,
    start: date,
    reference_date: date | None,
    granularity: str = "day",
    future_relative: bool = False,
    past_relative: bool = False,
    bounded: bool = False,
    expression: str = "",
) -> str:
    """The role of an expression, given the sentence text to its `left` and `right` (see module doc)."""
    left, right = left[-_WINDOW:], right[:_WINDOW]
    if _OTHER_LEFT.search(left, max(0, len(left) - _TAIL)) or _RECURRING.match(right):
        return "other"
    if expression.isdigit() and left.endswith("(") and right.startswith(")"):
        return "other"  # "4th edition (2016)": a publication year
    near = _nearest(_NEAR_CUES, left, 5)
    if near == "through":
        return "expires"
    strong = _nearest(_STRONG_CUES, left, _STRONG_REACH)
    if strong:
        return strong
    if _AS_OF_RIGHT.match(right):
        return "as_of"
    if _EFFECTIVE_RIGHT.match(right):
        return "effective"
    future, past = tense(sentence)
    future = (future or future_relative) and not past_relative
    weak = {"weak_effective": "effective", "weak_expires": "expires"}.get(near or "")
    if weak is not None:
        participle = _PARTICIPLE_BEFORE_CUE.search(left)
        if participle:
            past = tense(sentence.replace(participle.group(), " "))[1]
        if weak == "effective" and left.rstrip().lower().endswith("after") and _NEGATION.search(sentence):
            return "expires"  # "applications received after 30 April cannot be considered"
        cue = weak
        if weak == "expires" and not _OBLIGATION.search(left):
            weak = None  # "apply by ...", "must be received before ..."; not "tickets opened before ..."
        if weak == "effective" and past and not future:
            weak = None  # "the campaign ran from ... to ..." tells of an event
        if weak == "effective" and future and bounded:
            weak = None  # "will be closed from Dec 24 to Jan 2": a planned event, not a lasting change
        if weak:
            return weak
        if not (cue == "effective" and future and bounded):
            # a reference point ("laptops bought before 2020"): an event unless it lies ahead
            if reference_date is None or start <= reference_date:
                return "event"
    if _PLANNED_LEFT.search(left, max(0, len(left) - _TAIL)):
        return "planned"
    if _PERIOD_CUE.search(left, max(0, len(left) - _TAIL)) or _PERIOD_RIGHT.match(right):
        return "period"
    if granularity in ("year", "quarter", "half", "season") and _PERIOD_LEFT_NOUN.search(
        left, max(0, len(left) - _TAIL)
    ):
        return "period"  # "Annual Report 2023", "Outage statistics 2024-Q3"
    if future:
        return "planned"
    if reference_date is not None and start > reference_date and not past:
        return "planned"
    return "event"
