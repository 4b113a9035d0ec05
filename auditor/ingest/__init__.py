"""Ingest: folders (and sitemaps) of PDF, HTML, Markdown and text -> documents, passages,
dated statements and ingest errors in the store. See pipeline.py for the incremental rules."""

from auditor.ingest.pipeline import IngestSummary, ingest_corpus

__all__ = ["IngestSummary", "ingest_corpus"]
