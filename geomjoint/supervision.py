"""What the supervising process of `geomjoint.cli.entry` needs to hear from its worker.

The worker writes "reading PATH" before the CAD kernel reads a file and "read" after it;
if the kernel then kills the worker with a signal, the supervisor names the file.
"""
from __future__ import annotations

import os

#: environment variable holding the pipe's file descriptor in the worker
READING_FD_VARIABLE = "GEOMJOINT_READING_FD"


def _tell(message: str) -> None:
    fd = os.environ.get(READING_FD_VARIABLE)
    if fd:
        try:
            os.write(int(fd), (message + "\n").encode("utf-8"))
        except OSError:  # no supervisor listening (an in-process call): nothing to tell
            pass


def announce_reading(path: str) -> None:
    """The CAD kernel is about to read ``path``."""
    _tell(f"reading {path}")


def announce_read() -> None:
    """The kernel is done with the file: a later crash is not the file's fault."""
    _tell("read")


def file_being_read(messages: bytes) -> str | None:
    """The file the worker was reading when it died, from everything it announced."""
    lines = [line for line in messages.decode("utf-8", "replace").splitlines() if line]
    if lines and lines[-1].startswith("reading "):
        return lines[-1][len("reading "):]
    return None
