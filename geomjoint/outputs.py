"""Writing output files safely: a new folder, atomic writes, names that cannot escape it."""
from __future__ import annotations

import os
import re
import tempfile
from datetime import datetime
from pathlib import Path

from geomjoint.errors import InputError

#: longest file-name stem we make from a part or joint name (file systems allow 255 bytes)
MAX_NAME_LENGTH = 80


def safe_name(name: str) -> str:
    """A file/node name made from a model's part name: no path separators, no '..', no NUL."""
    cleaned = re.sub(r"[^A-Za-z0-9._ -]+", "_", name.replace("\x00", ""))
    cleaned = cleaned.strip(" .") or "unnamed"
    cleaned = cleaned.replace("..", "_")
    return cleaned[:MAX_NAME_LENGTH]


def new_output_folder(beside: Path, stem: str) -> Path:
    """A folder that did not exist before, next to ``beside`` (never inside the inputs' names)."""
    stamp = datetime.now().strftime("%Y%m%d-%H%M%S")
    base = beside / f"{safe_name(stem)}-results-{stamp}"
    candidate, n = base, 1
    while candidate.exists():
        n += 1
        candidate = base.with_name(f"{base.name}-{n}")
    candidate.mkdir(parents=True)
    return candidate


def prepare_output_folder(out: Path, inputs: list[Path]) -> Path:
    """Create ``out`` if needed; refuse a path that is a file or one of the inputs."""
    out = Path(out)
    if out.exists() and not out.is_dir():
        raise InputError("output path exists and is not a folder", where=str(out))
    resolved_inputs = {p.resolve() for p in inputs}
    if out.resolve() in resolved_inputs:
        raise InputError("output folder would replace an input", where=str(out))
    out.mkdir(parents=True, exist_ok=True)
    return out


def write_atomic(path: Path, data: bytes | str, protect: list[Path] = ()) -> Path:
    """Write ``data`` to ``path`` through a temporary file and a rename.

    A crash mid-write leaves no half-written file under the final name.  ``protect``
    lists input files that must never be replaced.
    """
    path = Path(path)
    if any(path.resolve() == Path(p).resolve() for p in protect):
        raise InputError("refusing to overwrite an input file", where=str(path))
    if isinstance(data, str):
        data = data.encode("utf-8")
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".part")
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o666 & ~umask)  # mkstemp makes 0600; an output is an ordinary file
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return path
