"""One error root. The CLI and the app turn these into one-line messages and exit codes."""

from __future__ import annotations


class TabqError(Exception):
    """Anything tabq reports to a person. `exit_code` is what the CLI exits with."""

    exit_code = 1


class InputError(TabqError):
    """The person gave us something we cannot use: a bad file, table name or question."""

    exit_code = 2


class TableFileError(InputError):
    """A table file is missing, empty, binary, unreadable or of an unknown kind."""


class UnknownTableError(InputError):
    """A SQLite file has no table of the asked name (or several and none was chosen)."""


class QuestionError(InputError):
    """The question is empty or cannot be read as a question."""


class ModelError(TabqError):
    """A model folder or one of its files is damaged, foreign or of another version."""


class QueryError(TabqError):
    """A generated query failed or ran past its time limit."""
