"""Ingest: folders (and sitemaps) of PDF, HTML, Markdown and text -> documents, passages,
dated statements and ingest errors in the store. See pipeline.py for the incremental rules."""
