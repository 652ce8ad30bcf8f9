"""Errors raised by pathsieve.

Every error says what was wrong, where (file and line, or row and column) and
what to do.  The CLI prints ``str(error)`` on one line and exits non-zero; it
never shows a traceback for bad user input.
"""

from __future__ import annotations

__all__ = [
    "ConfigError",
    "InputError",
    "OntologyError",
    "PathsieveError",
    "SchemeError",
    "VocabError",
]


class PathsieveError(Exception):
    """Base class; ``code`` is a short stable identifier (E1xx vocab, E2xx input...)."""

    code = "E000"

    def __init__(self, message: str, *, path: object = None, line: int | None = None) -> None:
        self.message = message
        self.path = None if path is None else str(path)
        self.line = line
        super().__init__(self.__str__())

    def __str__(self) -> str:
        where = ""
        if self.path is not None:
            where = self.path if self.line is None else f"{self.path}:{self.line}"
            where += ": "
        return f"{where}{self.message} [{self.code}]"


class VocabError(PathsieveError):
    """A vocabulary data file (lexicon, headers, triggers, abbreviations) is broken."""

    code = "E100"


class OntologyError(VocabError):
    """The OBO ontology does not parse or fails a check."""

    code = "E110"


class SchemeError(VocabError):
    """A label scheme file is broken or names something that does not exist."""

    code = "E120"


class InputError(PathsieveError):
    """A report export cannot be read (missing column, bad encoding, unreadable file)."""

    code = "E200"


class ConfigError(PathsieveError):
    """Bad command-line or API configuration (unknown scheme, unwritable output...)."""

    code = "E300"
