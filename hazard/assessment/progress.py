"""A progress line on stderr (count, rate, time left) when stderr is a terminal; silent otherwise."""

from __future__ import annotations

import sys
import time
from typing import TextIO

__all__ = ["Progress"]


class Progress:
    """Counts finished items and redraws one line at most ten times a second.

    Parameters
    ----------
    total : int
        Items expected.
    label : str
        What is counted, e.g. ``"assessed"``.
    stream : file, optional
        Where to draw; stderr by default. Nothing is drawn unless it is a terminal.
    """

    def __init__(self, total: int, label: str, stream: TextIO | None = None):
        self.total, self.label, self.done = total, label, 0
        self.stream = sys.stderr if stream is None else stream
        self.enabled = hasattr(self.stream, "isatty") and self.stream.isatty()
        self.started = self.last_drawn = time.monotonic()

    def advance(self, count: int = 1) -> None:
        """Record ``count`` more finished items."""
        self.done += count
        now = time.monotonic()
        if self.enabled and (now - self.last_drawn >= 0.1 or self.done >= self.total):
            self.last_drawn = now
            self._draw(now)

    def _draw(self, now: float) -> None:
        elapsed = max(now - self.started, 1e-9)
        rate = self.done / elapsed
        left = (self.total - self.done) / rate if rate > 0 else float("inf")
        width = 24
        filled = int(width * self.done / max(self.total, 1))
        eta = f"{left:.0f} s left" if left != float("inf") else "—"
        self.stream.write(
            f"\r[{'#' * filled}{'.' * (width - filled)}] {self.done}/{self.total} {self.label}, {rate:.0f}/s, {eta}   "
        )
        self.stream.flush()

    def close(self) -> None:
        """End the line."""
        if self.enabled:
            self._draw(time.monotonic())
            self.stream.write("\n")
            self.stream.flush()
