"""One exception family for everything a user can get wrong.

Every error says what is wrong, where (file, line, column where known) and what to do.
The command line turns it into one line on stderr and exit status 2.
"""

from __future__ import annotations


class UvcheckError(Exception):
    """Base class: a problem with the user's input or request, not a bug.

    Parameters
    ----------
    what : str
        What is wrong, in plain words.
    where : str, optional
        The place: ``"file.csv line 12, column 2"``, ``"listing key 'claims[2].time'"``.
    todo : str, optional
        What the user can do about it.
    """

    def __init__(self, what: str, where: str | None = None, todo: str | None = None):
        self.what = what
        self.where = where
        self.todo = todo
        super().__init__(self.one_line())

    def one_line(self) -> str:
        parts = []
        if self.where:
            parts.append(f"{self.where}: ")
        parts.append(self.what.rstrip("."))
        if self.todo:
            todo = self.todo.rstrip(".")
            parts.append(f". {todo[:1].upper()}{todo[1:]}")
        return "".join(parts) + "."


class InputFormatError(UvcheckError):
    """A spectrum or listing file cannot be read as it stands."""


class UnitError(UvcheckError):
    """A unit or quantity text is unknown or of the wrong kind."""


class ConfigurationError(UvcheckError):
    """Options that contradict each other or a request that cannot be evaluated."""


class OutputExistsError(UvcheckError):
    """An output file exists and --force was not given."""


class UnmodelledListingError(ConfigurationError):
    """A listing states too little to model the lamp's output (no technology, wavelength or
    band); its claims can still be listed, each not assessable."""
