"""One exception family: every error a user can fix is an AuditorError.

`cli.main()` turns any of these into one line on stderr and exit code 1, so messages must name the
file (`{path!r}`) and say what to do about it.
"""


class AuditorError(Exception):
    """Base of every error the user can fix."""


class ConfigError(AuditorError):
    """A configuration file or value is wrong."""


class InputError(AuditorError):
    """An input file (question set, labels, query log, document) is missing or malformed."""


class StoreError(AuditorError):
    """The SQLite store cannot be opened, is of another schema version, or is locked."""
