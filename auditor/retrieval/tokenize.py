"""Tokenizer (docs/judgement.md): Unicode NFKC, casefold, words of 2+ letters/digits, a stopword list,
Snowball stemming.

Passages are tokenized once at ingest and stored as term ids, so the question side must use the very
same settings: `fingerprint()` names them, and the index refuses a database whose stored fingerprint
differs.

Languages (docs/languages.md): with `language = "auto"` (the default) each text is tokenized with the
stemmer and stopword list of its own language: a document's passages with the document's language
(given by the ingest), a question with the language detected in it (auditor/language.py). Stems of
different languages rarely coincide, so one index holds them all. Stopword lists per language are the
Snowball project's, in auditor/retrieval/stopwords/<language>.txt (the Snowball file format: one
word at the start of a line, `|` starts a comment); English keeps the list below.
"""

from __future__ import annotations

import hashlib
import re
import unicodedata
from pathlib import Path

import Stemmer

from auditor import language as languages
from auditor.errors import ConfigError

# A word is a run of 2+ letters or digits. `\w` also matches "_", which is punctuation in prose
# ("snake_case" reads as two words), hence `[^\W_]`.
_WORD = re.compile(r"[^\W_]{2,}")

# Lucene's English stop set (EnglishAnalyzer.ENGLISH_STOP_WORDS_SET, 33 words; from memory of the
# Lucene source, org.apache.lucene.analysis.en).
LUCENE_ENGLISH = frozenset(
    "a an and are as at be but by for if in into is it no not of on or such that the their then "
    "there these they this to was will with".split()
)

# The default list: Lucene's set plus the question and pronoun words that every help-desk question
# carries ("how do I ...", "can my ..."), which would otherwise match every passage. Common practice,
# no single source.
ENGLISH = LUCENE_ENGLISH | frozenset(
    "an from has have how i its my our so them we were what when where which who why you your can do does did".split()
)

_STOPWORD_FOLDER = Path(__file__).with_name("stopwords")


def read_snowball_list(text: str) -> frozenset[str]:
    """The words of a stopword file in the Snowball format: the first word of each line, `|` to
    the end of the line a comment (snowballstem.org, algorithms/*/stop.txt)."""
    words = set()
    for line in text.splitlines():
        head = line.split("|", 1)[0].split()
        if head:
            words.add(unicodedata.normalize("NFKC", head[0]).casefold())
    return frozenset(words)


def _shipped_lists() -> dict[str, frozenset[str]]:
    found = {"english": ENGLISH}
    for file in sorted(_STOPWORD_FOLDER.glob("*.txt")):
        found[file.stem] = read_snowball_list(file.read_text(encoding="utf-8"))
    return found


# Stopword list of each language; "auto" picks the text's language from here.
LANGUAGE_STOPWORDS: dict[str, frozenset[str]] = _shipped_lists()

# Built-in stopword lists by name; the config's `retrieval.stopwords` picks one ("auto": the list
# of the text's language, none for a language without one).
STOPWORD_LISTS: dict[str, frozenset[str]] = {
    **LANGUAGE_STOPWORDS,
    "lucene": LUCENE_ENGLISH,
    "none": frozenset(),
}

# Bump when the tokenizing rules change: stored token ids become invalid.
RULES_VERSION = 2


class Tokenizer:
    """Text -> list of index terms.

    `language` is a Snowball stemmer name, "none" (no stemming) or "auto" (each text's own
    language, detected among `candidates` unless the caller gives it; `fallback` when it cannot
    be told). `stopwords` is a list name from STOPWORD_LISTS or "auto" (the language's own list).
    """

    def __init__(
        self,
        language: str = "auto",
        stopwords: str = "auto",
        candidates: tuple[str, ...] = languages.DEFAULT_CANDIDATES,
    ):
        if language not in ("none", "auto") and language not in Stemmer.algorithms():
            raise ConfigError(
                f"retrieval.language: unknown stemmer {language!r}; choose one of "
                f"{', '.join(['auto', 'none', *Stemmer.algorithms()])}"
            )
        if stopwords != "auto" and stopwords not in STOPWORD_LISTS:
            raise ConfigError(
                f"retrieval.stopwords: unknown stopword list {stopwords!r}; choose one of "
                f"{', '.join(['auto', *STOPWORD_LISTS])}"
            )
        unknown = [c for c in candidates if not languages.known(c)]
        if unknown or not candidates:
            raise ConfigError(
                f"retrieval.detect: {', '.join(map(repr, unknown)) or 'an empty list'} cannot be detected; "
                "give Snowball stemmer names such as 'english', 'german', 'spanish'"
            )
        self.language = language
        self.stopwords_name = stopwords
        self.candidates = tuple(candidates)
        self.fallback = self.candidates[0]
        self._stemmers: dict[str, Stemmer.Stemmer | None] = {}
        # The single-language view kept for callers that read it (the report's highlighter).
        self.stopwords = self._stopwords_for(self.fallback if language == "auto" else language)

    def _stopwords_for(self, language: str) -> frozenset[str]:
        if self.stopwords_name != "auto":
            return STOPWORD_LISTS[self.stopwords_name]
        if language == "none":  # no stemming, but the fallback language's stopwords
            language = self.fallback
        return LANGUAGE_STOPWORDS.get(language, frozenset())

    def _stemmer(self, language: str) -> Stemmer.Stemmer | None:
        if language not in self._stemmers:
            self._stemmers[language] = None if language == "none" else Stemmer.Stemmer(language)
        return self._stemmers[language]

    def fingerprint(self) -> str:
        """Names the rules, stemmer and stopword list, so stored token ids can be checked."""
        if self.language != "auto" and self.stopwords_name != "auto":  # the fingerprint of older stores
            digest = hashlib.sha256(" ".join(sorted(self.stopwords)).encode()).hexdigest()[:12]
            return f"tok{RULES_VERSION}:{self.language}:{self.stopwords_name}:{digest}"
        used = self.candidates if self.language == "auto" else (self.language,)
        lists = " ".join(f"{lang}={' '.join(sorted(self._stopwords_for(lang)))}" for lang in used)
        digest = hashlib.sha256(lists.encode()).hexdigest()[:12]
        return f"tok{RULES_VERSION}:{self.language}[{','.join(self.candidates)}]:{self.stopwords_name}:{digest}"

    def language_of(self, text: str) -> str:
        """The language `tokenize` uses for `text` when the caller does not give one."""
        if self.language != "auto":
            return self.language
        if len(text.split()) < 2:  # one word tells no language reliably (the report's highlighter asks word by word)
            return self.fallback
        return languages.detect_or(text, self.candidates, self.fallback)

    def tokenize(self, text: str, language: str | None = None) -> list[str]:
        """NFKC, casefold, words of 2+ letters/digits, stopwords dropped, then stemmed.

        `language` (a document's, given by the ingest) is used in "auto" mode; without it the
        language is detected in `text`. A fixed `retrieval.language` ignores it.
        """
        if not text:
            return []
        if self.language != "auto":
            lang = self.language
        elif language is not None and language in Stemmer.algorithms():
            lang = language
        else:
            lang = self.language_of(text)
        stop = self._stopwords_for(lang)
        words = [w for w in _WORD.findall(unicodedata.normalize("NFKC", text).casefold()) if w not in stop]
        stemmer = self._stemmer(lang)
        return stemmer.stemWords(words) if stemmer else words
