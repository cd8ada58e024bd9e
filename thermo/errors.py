"""Exception and warning types of :mod:`thermo`.

Every error raised for bad input is a :class:`DosInputError` whose message is a
single line saying what is wrong and where (file name, line or column).  User
interfaces print ``str(error)`` and never a traceback.
"""

from __future__ import annotations


class ModeheatError(Exception):
    """Base class of every error raised on purpose by :mod:`thermo`."""


class DosInputError(ModeheatError, ValueError):
    """Input that cannot be turned into a phonon DOS (file content or options).

    Parameters
    ----------
    message : str
        One line: what is wrong.
    source : str, optional
        File name (or ``"<text>"``) the problem was found in.
    line : int, optional
        1-based line number in ``source``.
    column : int, optional
        1-based column number in ``source``.
    """

    def __init__(self, message: str, source: str | None = None,
                 line: int | None = None, column: int | None = None):
        self.reason = " ".join(str(message).split())
        self.source = source
        self.line = line
        self.column = column
        where = []
        if source:
            where.append(str(source))
        if line is not None:
            where.append(f"line {line}")
        if column is not None:
            where.append(f"column {column}")
        text = f"{', '.join(where)}: {self.reason}" if where else self.reason
        super().__init__(text)


class OptionError(ModeheatError, ValueError):
    """An option value (unit name, temperature list, policy, ...) is invalid."""


class FitError(ModeheatError):
    """A least-squares fit, root search or minimiser that did not converge (one line: what and why)."""


class ModeheatWarning(UserWarning):
    """A result is computed but deserves attention (imaginary modes, clipping...)."""


class WorkspaceError(ModeheatError):
    """A workspace file that cannot be opened or changed, or a dataset that is not in it."""
