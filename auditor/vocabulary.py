"""Term ids for stored tokens: passages keep int32 arrays of `terms.id` so the BM25 index builds
without re-tokenizing. FIRST VERSION — the BM25 issue owns and deepens this module."""

from __future__ import annotations

import numpy as np

from .store import Store


class Vocabulary:
    def __init__(self, store: Store):
        self.store = store
        self._ids = {row["term"]: row["id"] for row in store.query("SELECT id, term FROM terms")}

    def __len__(self) -> int:
        return len(self._ids)

    def ids(self, tokens: list[str]) -> np.ndarray:
        """Ids of `tokens`, adding new terms (call inside the caller's transaction)."""
        out = np.empty(len(tokens), dtype="<i4")
        for i, token in enumerate(tokens):
            term_id = self._ids.get(token)
            if term_id is None:
                term_id = self.store.db.execute("INSERT INTO terms(term) VALUES (?)", [token]).lastrowid
                self._ids[token] = term_id
            out[i] = term_id
        return out

    def lookup(self, tokens: list[str]) -> list[int | None]:
        """Ids of `tokens` without adding; None for a term the corpus never uses."""
        return [self._ids.get(t) for t in tokens]

    def terms(self) -> dict[int, str]:
        return {i: t for t, i in self._ids.items()}
