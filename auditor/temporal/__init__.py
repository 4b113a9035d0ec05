"""Temporal expressions: find dated statements, normalize them to intervals, give each a role."""
