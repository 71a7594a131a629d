"""Error types that map to the command line's exit codes.

`InputError` is bad input (exit 2): its message is one line that names the file,
key or part, so the user can fix it without reading a traceback.
"""
from __future__ import annotations


class InputError(Exception):
    """Bad input from the user: a job file, a model, a designation (exit code 2)."""

    def __init__(self, message: str, *, where: str | None = None):
        text = f"{where}: {message}" if where else message
        super().__init__(text.replace("\n", " "))


def nearest(name: str, choices, n: int = 3) -> list[str]:
    """The `n` valid names closest to `name` (for "did you mean ..." messages)."""
    import difflib

    choices = list(choices)
    found = difflib.get_close_matches(name, choices, n=n, cutoff=0.4)
    if not found:
        lowered = {c.lower(): c for c in choices}
        found = [lowered[c] for c in difflib.get_close_matches(name.lower(), list(lowered), n=n, cutoff=0.3)]
    return found


def did_you_mean(name: str, choices) -> str:
    """A short suffix "(did you mean 'a', 'b'?)" or an empty string."""
    near = nearest(name, choices)
    if not near:
        return ""
    return " (did you mean " + ", ".join(repr(c) for c in near) + "?)"
