"""Error types shared by every layer.

Every error that means "the input was bad" derives from :class:`LedgerError`;
the command line prints its message on one line and exits with code 2.

>>> str(LedgerError("tau must lie in the upper half plane"))
'tau must lie in the upper half plane'
"""


class LedgerError(Exception):
    """Bad input of any kind: reported as one line, exit code 2."""


class ExpressionError(LedgerError):
    """A malformed expression; ``column`` is 1-based (0 when unknown)."""

    def __init__(self, message: str, column: int = 0, text: str = ""):
        self.column = column
        self.text = text
        self.reason = message
        where = f"column {column}: " if column else ""
        super().__init__(f"{where}{message}")


class DivergentGraphError(LedgerError):
    """A graph function whose lattice sum diverges."""


class ProjectError(LedgerError):
    """A project file that cannot be read, validated or written."""


class ProjectChangedError(ProjectError):
    """The file changed on disk since it was loaded; saving would lose that change."""


class ConventionError(LedgerError):
    """An unknown or inconsistent convention declaration."""


class NotAvailableError(LedgerError):
    """A capability that this build does not provide (yet)."""
