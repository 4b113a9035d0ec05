"""The one error a parser raises for a file it cannot ingest; the run records it and goes on."""

from __future__ import annotations

from auditor.errors import InputError


class IngestFailure(InputError):
    """A file that cannot be ingested; `kind` is the ingest_errors kind (encrypted, needs_ocr,
    too_large, empty, unreadable, not_a_<kind>, timeout, parse_error, symlink)."""

    def __init__(self, kind: str, path: str, message: str):
        super().__init__(f"{str(path)!r}: {message}")
        self.kind = kind
        self.path = str(path)

    def __reduce__(self):  # picklable across the worker pipe
        return (IngestFailure, (self.kind, self.path, str(self).split(": ", 1)[-1]))
