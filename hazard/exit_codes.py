"""The command line's exit codes, in one place (README "Exit codes")."""

from __future__ import annotations

__all__ = ["EXIT_CONTRADICTED", "EXIT_INPUT", "EXIT_INTERNAL", "EXIT_OK", "EXIT_SOME_FAILED"]

EXIT_OK = 0
"""Done."""
EXIT_INTERNAL = 1
"""A defect of the tool (never caused by input); rerun with --debug for the traceback."""
EXIT_INPUT = 2
"""Bad input or usage: one line on stderr naming the file, the line and the fix."""
EXIT_SOME_FAILED = 3
"""Some products of a batch could not be assessed; the others were."""
EXIT_CONTRADICTED = 4
"""A vendor claim is contradicted."""
