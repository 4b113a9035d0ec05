"""Corpus Auditor: which questions does the knowledge base not support, or support only with stale passages."""

__version__ = "0.1.0"
