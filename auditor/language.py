"""The language of a text: a document's or a question's (docs/languages.md).

Languages are named as the Snowball stemmers name them ("english", "german", "spanish"), since the
tokenizer is what a language decides. Detection uses lingua-language-detector (n-gram models with
a rule filter, built for short and mixed texts), restricted to the candidate languages of the
config (`retrieval.detect`): the fewer the candidates, the better short texts are told apart.
bench/languages.py (`--part detectors`) measured it against py3langid on question-length texts.

Documents say their own language through front matter `lang:` / `language:` or HTML `lang`
(BCP 47 tags such as "de-AT"); `from_tag` reads those. The config's `[languages]` globs override
both (auditor/config.py).
"""

from __future__ import annotations

import functools

import Stemmer
from lingua import IsoCode639_1, Language, LanguageDetectorBuilder

# The languages whose stopwords and date words ship with the auditor (auditor/retrieval/stopwords/,
# auditor/temporal/languages/): the default candidates for detection.
DEFAULT_CANDIDATES = ("english", "german", "spanish")

# lingua's name for a Snowball stemmer name where the two differ; the rest are equal when upper-cased.
_LINGUA_NAMES = {"norwegian": "BOKMAL"}

# A text with fewer letters than this says too little: it gets the fallback language. Common
# practice (detectors disagree most below a few words); no single source.
MIN_LETTERS = 8


def known(name: str) -> bool:
    """True when `name` is both a Snowball stemmer and a language lingua can detect."""
    return name in Stemmer.algorithms() and _lingua(name) is not None


def _lingua(name: str) -> Language | None:
    return getattr(Language, _LINGUA_NAMES.get(name, name.upper()), None)


def _snowball(language: Language) -> str:
    for name, lingua_name in _LINGUA_NAMES.items():
        if language.name == lingua_name:
            return name
    return language.name.lower()


def from_tag(tag: str | None) -> str | None:
    """The language of a BCP 47 / ISO 639-1 tag ("de", "de-AT", "es_MX", "German"), or None."""
    if not tag or not isinstance(tag, str):
        return None
    text = tag.strip()
    if text.casefold() in {a.casefold() for a in Stemmer.algorithms()}:
        return text.casefold()
    primary = text.replace("_", "-").split("-")[0].upper()
    code = getattr(IsoCode639_1, primary, None)
    if len(primary) != 2 or code is None:
        return None
    name = _snowball(Language.from_iso_code_639_1(code))
    return name if name in Stemmer.algorithms() else None


# From this length on, lingua's low-accuracy mode (trigram models only) is as reliable as the full
# one (lingua's README, accuracy tables by text length) and loads a fraction of the models: a
# document is detected that way, a question with all n-gram models.
LONG_TEXT = 120


@functools.lru_cache(maxsize=16)
def _detector(candidates: tuple[str, ...], low_accuracy: bool):
    languages = [lang for lang in (_lingua(c) for c in candidates) if lang is not None]
    builder = LanguageDetectorBuilder.from_languages(*languages)
    return (builder.with_low_accuracy_mode() if low_accuracy else builder).build()


@functools.lru_cache(maxsize=8192)
def detect(text: str, candidates: tuple[str, ...] = DEFAULT_CANDIDATES, *, document: bool = False) -> str | None:
    """The most likely of `candidates` for `text`, or None when the text is too short to tell
    (the caller's fallback then applies). No confidence floor: on the short texts of
    bench/languages.py a floor of 0.5 sent more headings to the fallback wrongly than it saved.

    `document`: always the low-accuracy mode, so that an ingest worker never loads the large
    models (2 s) for a short file, which would eat its per-file timeout."""
    if len(candidates) == 1:
        return candidates[0]
    if sum(ch.isalpha() for ch in text[:4000]) < MIN_LETTERS:
        return None
    low = document or len(text) >= LONG_TEXT
    values = _detector(candidates, low).compute_language_confidence_values(text[:4000])
    if not values or values[0].value == 0.0:
        return None
    return _snowball(values[0].language)


def detect_or(text: str, candidates: tuple[str, ...], fallback: str) -> str:
    """`detect`, with `fallback` when it cannot tell."""
    return detect(text, candidates) or fallback
