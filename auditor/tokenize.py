"""Tokenizer (DESIGN.md §3.4): Unicode NFKC, casefold, words of 2+ letters/digits, stopwords,
Snowball stemming. FIRST VERSION — the BM25 issue owns and deepens this module."""

from __future__ import annotations

import re
import unicodedata

import Stemmer

_WORD = re.compile(r"\w{2,}")
# Short English stopword list; common practice, no single source.
STOPWORDS = frozenset(
    "a an and are as at be but by for from has have how i if in into is it its my of on or our so "
    "that the their them then there these they this to was we were what when where which who why "
    "will with you your can do does did not no".split()
)


class Tokenizer:
    def __init__(self, language: str = "english", stopwords: str = "english"):
        self.language = language
        self.stopwords = STOPWORDS if stopwords == "english" else frozenset()
        self._stemmer = Stemmer.Stemmer(language) if language != "none" else None

    def fingerprint(self) -> str:
        return f"v1:{self.language}:{len(self.stopwords)}"

    def tokenize(self, text: str) -> list[str]:
        words = [w for w in _WORD.findall(unicodedata.normalize("NFKC", text).casefold())
                 if w not in self.stopwords]
        return self._stemmer.stemWords(words) if self._stemmer else words
