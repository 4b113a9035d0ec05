"""Question sets and query logs, with personal-data redaction before anything is stored."""
