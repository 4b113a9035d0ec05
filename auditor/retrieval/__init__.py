"""Retrieval: tokenizer, vocabulary, BM25 variants and the store-backed passage index."""
