"""Errors the engine reports to its callers; each message is one line for a person to read."""


class SystemFileError(ValueError):
    """A system, element-library or measurements file is missing, unreadable or invalid.

    The message names the file, the key and what was expected.
    """


class UnknownSystem(LookupError):
    """No shipped or user system has the requested name."""
