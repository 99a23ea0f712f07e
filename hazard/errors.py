"""The one error type for bad input: it names the file, the line and the fix, on one line."""

from __future__ import annotations

__all__ = ["InputError", "excerpt", "one_line"]

MAX_PROBLEM_CHARS = 400
"""A problem statement longer than this is cut: messages land in summaries and on screen [characters]."""
EXCERPT_CHARS = 40
"""How much of an offending cell a message quotes [characters]."""


def one_line(text: str, limit: int) -> str:
    r"""``text`` as one printable line of at most ``limit`` characters.

    Control characters (line breaks, tabs, NUL, escape sequences) are shown as escapes; the middle is cut with an
    ellipsis when it is too long.

    Examples
    --------
    >>> one_line("a\nb\x1b[2J", 20)
    'a\\nb\\x1b[2J'
    >>> one_line("x" * 30, 11)
    'xxxxx…xxxxx'
    """
    if len(text) > 4 * limit:  # only the ends can be shown: escape those, not the whole text
        text = text[: 2 * limit] + text[-2 * limit :]
    printable = "".join(c if c.isprintable() else c.encode("unicode_escape").decode("ascii") for c in text)
    if len(printable) <= limit:
        return printable
    keep = (limit - 1) // 2
    return f"{printable[:keep]}…{printable[len(printable) - keep :]}"


def excerpt(value: object, limit: int = EXCERPT_CHARS) -> str:
    """A short, printable, quoted excerpt of an offending cell for a message.

    Examples
    --------
    >>> excerpt("abc"), excerpt("a" * 100, 9)
    ("'abc'", "'aaaa…aaaa'")
    """
    return f"'{one_line(str(value), limit)}'"


class InputError(ValueError):
    """Input that the method cannot accept.

    The message is one line: ``FILE:LINE: problem; fix``. The CLI prints it and exits with code 2. Control
    characters are shown as escapes and an over-long problem is cut, so the message stays one readable line
    whatever the input held.

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
        problem, fix = one_line(problem, MAX_PROBLEM_CHARS), one_line(fix, MAX_PROBLEM_CHARS)
        path = None if path is None else one_line(str(path), MAX_PROBLEM_CHARS)
        self.problem, self.fix, self.path, self.line = problem, fix, path, line
        where = "" if path is None else (f"{path}:{line}: " if line is not None else f"{path}: ")
        super().__init__(f"{where}{problem}; fix: {fix}")
