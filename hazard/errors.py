"""The one error type for bad input: it names the file, the line and the fix."""

from __future__ import annotations

__all__ = ["InputError"]


class InputError(ValueError):
    """Input that the method cannot accept.

    The message is one line: ``FILE:LINE: problem; fix``. The CLI prints it and exits with code 2.

    Parameters
    ----------
    problem : str
        What is wrong, e.g. ``"duplicate wavelength 450 nm"``.
    fix : str
        What the user should do, e.g. ``"remove one of the two rows"``.
    path : str, optional
        The file at fault.
    line : int, optional
        1-based line number in that file.

    Examples
    --------
    >>> str(InputError("text in a number column", "use '.' as decimal point", "lamp.csv", 7))
    "lamp.csv:7: text in a number column; fix: use '.' as decimal point"
    """

    def __init__(self, problem: str, fix: str, path: str | None = None, line: int | None = None):
        self.problem, self.fix, self.path, self.line = problem, fix, path, line
        where = "" if path is None else (f"{path}:{line}: " if line is not None else f"{path}: ")
        super().__init__(f"{where}{problem}; fix: {fix}")
