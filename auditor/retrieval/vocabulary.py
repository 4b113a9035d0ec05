"""Term ids for stored tokens: passages keep little-endian int32 arrays of `terms.id`, so the BM25
index builds without re-tokenizing.

Terms are looked up on demand rather than loaded whole: a corpus of a million passages has a
vocabulary of millions of terms, and a question needs only a dozen of them.
"""

from __future__ import annotations

import numpy as np

from auditor.store import Store, chunked, marks


class Vocabulary:
    """The `terms` table of a store, with a cache of the terms seen so far."""

    def __init__(self, store: Store):
        self.store = store
        self._ids: dict[str, int] = {}

    def __len__(self) -> int:
        return self.store.db.execute("SELECT count(*) FROM terms").fetchone()[0]

    def _fetch(self, terms: list[str]) -> None:
        for chunk in chunked(terms):
            for term_id, term in self.store.db.execute(
                f"SELECT id, term FROM terms WHERE term IN ({marks(chunk)})", chunk
            ):
                self._ids[term] = term_id

    def ids(self, tokens: list[str]) -> np.ndarray:
        """Ids of `tokens` (little-endian int32), adding new terms; call inside a transaction.

        INSERT OR IGNORE then SELECT, so that another writer adding the same term at the same time
        cannot make this fail.
        """
        unknown = sorted({t for t in tokens if t not in self._ids})
        if unknown:
            self._fetch(unknown)
            new = [t for t in unknown if t not in self._ids]
            if new:
                self.store.db.conn.executemany("INSERT OR IGNORE INTO terms(term) VALUES (?)", [(t,) for t in new])
                self._fetch(new)
        return np.fromiter((self._ids[t] for t in tokens), dtype="<i4", count=len(tokens))

    def lookup(self, tokens: list[str]) -> list[int | None]:
        """Ids of `tokens` without adding; None for a term the store has never seen."""
        unknown = sorted({t for t in tokens if t not in self._ids})
        if unknown:
            self._fetch(unknown)
        return [self._ids.get(t) for t in tokens]

    def terms(self) -> dict[int, str]:
        """Every stored term by id (reads the whole table)."""
        return {term_id: term for term_id, term in self.store.db.execute("SELECT id, term FROM terms")}
