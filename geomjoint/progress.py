"""Progress of a long run on stderr, readable where it is sent.

On a terminal one line is updated in place; in a log or a pipe (stderr not a terminal) whole
lines are printed, at most one per ``LINE_INTERVAL_SECONDS`` and always the last, so a CI log
reads "analysed: 12/40 joints" line by line.  Nothing is written to stdout (``--json`` keeps
stdout for the document), and a run shorter than ``PROGRESS_AFTER_SECONDS`` shows nothing.
"""
from __future__ import annotations

import sys
import time
from typing import TextIO

#: a run longer than this (s) shows progress (a short run needs none)
PROGRESS_AFTER_SECONDS = 2.0

#: least time between two whole progress lines in a log, s (a line every few seconds is
#: readable in a CI log without flooding it)
LINE_INTERVAL_SECONDS = 10.0


class Progress:
    """``Progress("analysed", total)``; call ``update(done)`` after each item."""

    def __init__(self, label: str, total: int, *, quiet: bool = False, stream: TextIO | None = None,
                 clock=time.monotonic, started: float | None = None):
        self.label, self.total, self.quiet = label, total, quiet
        self.stream = stream if stream is not None else sys.stderr
        self.clock = clock
        self.started = clock() if started is None else started
        self.last_line: float | None = None
        try:
            self.in_place = self.stream.isatty()
        except (AttributeError, ValueError):  # a closed or unusual stream: plain lines
            self.in_place = False

    def update(self, done: int) -> None:
        if self.quiet:
            return
        now = self.clock()
        finished = done >= self.total
        if now - self.started < PROGRESS_AFTER_SECONDS and self.last_line is None:
            return
        text = f"{self.label}: {done}/{self.total} joints"
        if self.in_place:
            self.stream.write("\r" + text + ("\n" if finished else ""))
        elif finished or self.last_line is None or now - self.last_line >= LINE_INTERVAL_SECONDS:
            self.stream.write(text + "\n")
        else:
            return
        self.last_line = now
        self.stream.flush()
