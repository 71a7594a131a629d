"""Input limits: refuse a model that would exhaust memory or time, before the kernel sees it.

Three guards, all raising :class:`~geomjoint.errors.InputError` (exit 2) with one line
that names the file:

* :func:`check_step_file` sniffs a STEP file with plain byte reads: empty, not
  ISO 10303-21, binary, over the size limit, truncated (no ``END-ISO-10303-21``), an
  empty DATA section, or an SI unit name that ISO 10303-41 does not define (the OCCT
  reader silently falls back to millimetres on such a file, so every length would be wrong).
* :func:`check_model_size` and :func:`check_part_extent` refuse a model with too many
  solids or faces, or a part longer than any machine (a unit slip, usually).
* :func:`count_step_solids` counts the solid entities of a file, to compare with the solids
  the reader returns (it drops or splits damaged ones without an error).
* :func:`run_with_timeout` runs one joint under a wall-clock limit (SIGALRM, same process);
  :func:`run_in_child` runs a call in a forked child, so a crash of the CAD kernel (some
  damaged STEP files make its transfer die with SIGSEGV) or a call that hangs inside C++
  comes back as an exception instead of ending the program.

The limits have defaults (:class:`Limits`) and can be changed without code through the
environment variables listed in :data:`ENV`, e.g. ``GEOMJOINT_MAX_SOLIDS=20000``;
:func:`current_limits` reads them on every call.
"""
from __future__ import annotations

import os
import re
import signal
import threading
from dataclasses import dataclass, fields, replace
from typing import Any, Callable, TypeVar

from geomjoint.errors import InputError

T = TypeVar("T")


@dataclass(frozen=True)
class Limits:
    """Input limits. The defaults are our own stated choices, not from a standard."""

    #: largest STEP file read, bytes (500 MiB: a large machine assembly is a few hundred MB)
    max_file_bytes: int = 500 * 2**20
    #: most solids in a model (a plant-sized assembly; each solid is scanned for holes)
    max_solids: int = 20_000
    #: most B-rep faces over all solids (face analysis holds every face in memory)
    max_faces: int = 2_000_000
    #: longest part, mm: 100 m is beyond any machine frame; longer is usually a unit slip
    max_extent_mm: float = 1.0e5
    #: wall-clock limit per joint, s (0 or less: no limit)
    joint_seconds: float = 300.0


#: environment variable → Limits field (values are numbers; file size in bytes)
ENV = {
    "GEOMJOINT_MAX_FILE_BYTES": "max_file_bytes",
    "GEOMJOINT_MAX_SOLIDS": "max_solids",
    "GEOMJOINT_MAX_FACES": "max_faces",
    "GEOMJOINT_MAX_EXTENT_MM": "max_extent_mm",
    "GEOMJOINT_JOINT_SECONDS": "joint_seconds",
}

#: the note a joint gets when its time limit ran out (the lead's pipeline marks it with this)
TIMEOUT_NOTE = "not analysed (timeout)"

#: bytes read from each end of a file for the sniff
SNIFF_BYTES = 64 * 1024
#: the header keyword must appear this early (ISO 10303-21: it is the first token)
HEADER_WINDOW = 200
#: chunk size when the whole file is searched for unit entities
CHUNK_BYTES = 8 * 2**20

#: SI unit names of ISO 10303-41 (si_unit_name), from memory
SI_UNIT_NAMES = frozenset({
    "METRE", "GRAM", "SECOND", "AMPERE", "KELVIN", "MOLE", "CANDELA", "RADIAN", "STERADIAN",
    "HERTZ", "NEWTON", "PASCAL", "JOULE", "WATT", "COULOMB", "VOLT", "FARAD", "OHM", "SIEMENS",
    "WEBER", "TESLA", "HENRY", "DEGREE_CELSIUS", "LUMEN", "LUX", "BECQUEREL", "GRAY", "SIEVERT",
})
#: SI prefixes of ISO 10303-41 (si_prefix), from memory
SI_PREFIXES = frozenset({
    "EXA", "PETA", "TERA", "GIGA", "MEGA", "KILO", "HECTO", "DECA", "DECI", "CENTI", "MILLI",
    "MICRO", "NANO", "PICO", "FEMTO", "ATTO",
})

# SI_UNIT(prefix, name), or SI_UNIT(*, prefix, name) in the simple-instance form
_SI_UNIT = re.compile(rb"SI_UNIT\s*\(\s*(?:\*\s*,\s*)?(\$|\.[A-Za-z_]*\.)\s*,\s*(\$|\.[A-Za-z_]*\.)\s*\)")
_ENTITY_ID = re.compile(rb"#(\d+)\s*=")
_EMPTY_DATA = re.compile(rb"\bDATA\s*;\s*ENDSEC\s*;")
# bytes that never occur in an ISO 10303-21 text file: NUL and the C0 controls but tab, LF, FF, CR
_BINARY = re.compile(rb"[\x00-\x08\x0b\x0e-\x1f\x7f]")


def current_limits(**overrides: Any) -> Limits:
    """The limits in force: defaults ← environment variables (:data:`ENV`) ← ``overrides``.

    >>> current_limits(max_solids=10).max_solids
    10
    """
    limits = Limits()
    kinds = {f.name: f.type for f in fields(Limits)}
    for var, name in ENV.items():
        text = os.environ.get(var)
        if text is None or not text.strip():
            continue
        try:
            value = float(text)
        except ValueError:
            raise InputError(f"expected a number, got {text!r}", where=f"environment {var}") from None
        if value != value or value < 0:
            raise InputError(f"must be a number >= 0, got {text!r}", where=f"environment {var}")
        limits = replace(limits, **{name: int(value) if kinds[name] in (int, "int") else value})
    return replace(limits, **overrides) if overrides else limits


def _where(path: Any) -> str:
    return os.fspath(path)


def check_step_file(path: str | os.PathLike, limits: Limits | None = None) -> None:
    """Sniff a STEP file before the kernel reads it; raise InputError naming the file.

    Refused: missing, a folder, empty, over ``max_file_bytes``, no ``ISO-10303-21`` at the
    start, binary bytes (NUL or C0 controls, which ISO 10303-21 text never holds), no
    ``END-ISO-10303-21`` at the end (a truncated download or copy), an empty DATA section,
    and SI unit names or prefixes outside ISO 10303-41 (see :func:`check_step_units`).

    >>> import tempfile, pathlib
    >>> p = pathlib.Path(tempfile.mkdtemp()) / "x.step"
    >>> _ = p.write_bytes(b"")
    >>> try:
    ...     check_step_file(p)
    ... except InputError as exc:
    ...     print(str(exc).endswith("x.step: empty file, not a STEP model"))
    True
    """
    limits = limits or current_limits()
    where = _where(path)
    if not os.path.exists(where):
        raise InputError("file not found", where=where)
    if os.path.isdir(where):
        raise InputError("is a folder, not a STEP file", where=where)
    size = os.path.getsize(where)
    if size == 0:
        raise InputError("empty file, not a STEP model", where=where)
    if size > limits.max_file_bytes:
        raise InputError(f"file is {size / 2**20:.1f} MiB, over the limit of {limits.max_file_bytes / 2**20:.1f} MiB "
                         f"(raise it with GEOMJOINT_MAX_FILE_BYTES)", where=where)
    with open(where, "rb") as fh:
        head = fh.read(SNIFF_BYTES)
        fh.seek(max(0, size - SNIFF_BYTES))
        tail = fh.read()
    if b"ISO-10303-21" not in head[:HEADER_WINDOW]:
        raise InputError("not a STEP file (it does not start with ISO-10303-21)", where=where)
    # an old DOS tool may end a text file with Ctrl-Z (0x1a): allowed after the trailer only
    tail = tail.rstrip(b" \t\r\n\x1a")
    if size <= SNIFF_BYTES:          # the head is the whole file: the same allowance
        head = head.rstrip(b" \t\r\n\x1a")
    for chunk in (head, tail):
        bad = _BINARY.search(chunk)
        if bad:
            raise InputError(f"binary bytes (0x{bad.group()[0]:02x}) in a STEP file, which is plain text; "
                             f"the file is damaged or not STEP", where=where)
    if b"END-ISO-10303-21" not in tail:
        raise InputError("truncated STEP file (no END-ISO-10303-21 at the end)", where=where)
    if _EMPTY_DATA.search(head):
        raise InputError("the DATA section is empty: the file holds no entities, so no solids", where=where)
    check_step_units(where)


def check_step_units(path: str | os.PathLike) -> None:
    """Refuse SI_UNIT entities whose name or prefix ISO 10303-41 does not define.

    The file is searched in chunks, so memory stays small for a large file.
    """
    where = _where(path)
    overlap = 256
    with open(where, "rb") as fh:
        carry = b""
        while True:
            block = fh.read(CHUNK_BYTES)
            if not block:
                break
            text = carry + block
            for m in _SI_UNIT.finditer(text):
                prefix, name = (g.strip(b".").decode("ascii").upper() for g in m.groups())
                bad = None
                if m.group(2) == b"$" or name not in SI_UNIT_NAMES:
                    bad = f"unit name {m.group(2).decode()}"
                elif m.group(1) != b"$" and prefix not in SI_PREFIXES:
                    bad = f"unit prefix {m.group(1).decode()}"
                if bad:
                    ids = _ENTITY_ID.findall(text, 0, m.start())
                    entity = f"entity #{ids[-1].decode()}" if ids else "an SI_UNIT entity"
                    raise InputError(f"{entity}: {bad} is not an SI unit of ISO 10303-41; "
                                     f"the lengths of this file cannot be trusted", where=where)
            carry = text[-overlap:]


def check_model_size(n_solids: int, n_faces: int, path: str | os.PathLike, limits: Limits | None = None) -> None:
    """Refuse a model with more solids or faces than the limits allow (before the scan)."""
    limits = limits or current_limits()
    where = _where(path)
    if n_solids > limits.max_solids:
        raise InputError(f"model has {n_solids} solids, over the limit of {limits.max_solids} "
                         f"(raise it with GEOMJOINT_MAX_SOLIDS)", where=where)
    if n_faces > limits.max_faces:
        raise InputError(f"model has {n_faces} faces, over the limit of {limits.max_faces} "
                         f"(raise it with GEOMJOINT_MAX_FACES)", where=where)


def check_part_extent(part: str, extent_mm: float, path: str | os.PathLike, limits: Limits | None = None) -> None:
    """Refuse a part whose bounding-box diagonal (mm) is beyond ``max_extent_mm``, or not finite."""
    limits = limits or current_limits()
    where = _where(path)
    if not extent_mm == extent_mm or extent_mm in (float("inf"), float("-inf")):
        raise InputError(f"part {part!r} has no finite size", where=where)
    if extent_mm > limits.max_extent_mm:
        raise InputError(f"part {part!r} is {extent_mm / 1000:.4g} m long, over the limit of "
                         f"{limits.max_extent_mm / 1000:g} m; is the file's length unit right? "
                         f"(raise the limit with GEOMJOINT_MAX_EXTENT_MM)", where=where)


class JointTimeout(TimeoutError):
    """A joint's analysis ran past its time limit."""


def run_with_timeout(fn: Callable[..., T], seconds: float | None, *args: Any, **kwargs: Any) -> T:
    """Call ``fn(*args, **kwargs)``; raise :class:`JointTimeout` after ``seconds`` of wall time.

    Uses ``signal.setitimer(ITIMER_REAL)`` and SIGALRM, so it needs the main thread of a
    Unix process (each forked worker is one). Elsewhere (another thread, no SIGALRM as on
    Windows) and for ``seconds`` None or <= 0 it simply calls ``fn`` without a limit.
    Caveat: Python handles the signal between bytecodes, so a single long call inside the
    C++ kernel (one OCP boolean) is interrupted only when it returns to Python; a hard
    limit on such a call needs a worker process that the parent kills.
    A timer already running (an outer call) is put back, less the time spent, afterwards.

    >>> run_with_timeout(sum, 1.0, [1, 2, 3])
    6
    """
    usable = (seconds is not None and seconds > 0 and hasattr(signal, "SIGALRM")
              and threading.current_thread() is threading.main_thread())
    if not usable:
        return fn(*args, **kwargs)

    def _alarm(signum, frame):
        raise JointTimeout(f"time limit of {seconds:g} s reached")

    import time

    previous = signal.signal(signal.SIGALRM, _alarm)
    outer_left, _ = signal.getitimer(signal.ITIMER_REAL)
    started = time.monotonic()
    signal.setitimer(signal.ITIMER_REAL, min(seconds, outer_left) if outer_left > 0 else seconds)
    try:
        return fn(*args, **kwargs)
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
        if outer_left > 0:
            signal.setitimer(signal.ITIMER_REAL, max(outer_left - (time.monotonic() - started), 1e-3))


# ISO 10303-42 solid representations a part can carry (entity instances, simple form)
_SOLID_ENTITY = re.compile(rb"=\s*(?:MANIFOLD_SOLID_BREP|BREP_WITH_VOIDS|FACETED_BREP)\s*\(")


def count_step_solids(path: str | os.PathLike) -> int:
    """Number of solid entities (MANIFOLD_SOLID_BREP, BREP_WITH_VOIDS, FACETED_BREP) in a STEP file.

    The reader drops a solid whose shell is not closed and splits a non-manifold one, without
    an error; comparing this count with the distinct solids after transfer (instances of one
    part share one solid) tells that a part was lost or changed. Searched in chunks, like
    :func:`check_step_units`.
    """
    count, carry = 0, b""
    with open(_where(path), "rb") as fh:
        while True:
            block = fh.read(CHUNK_BYTES)
            if not block:
                break
            text = carry + block
            # count matches that end in the new block only, so none is counted twice
            count += sum(1 for m in _SOLID_ENTITY.finditer(text) if m.end() > len(carry))
            carry = text[-64:]
    return count


class ChildCrashed(RuntimeError):
    """The child process died without an answer (killed by a signal, e.g. a segmentation fault)."""

    def __init__(self, message: str, signal_number: int | None = None):
        super().__init__(message)
        self.signal_number = signal_number


def run_in_child(fn: Callable[..., T], *args: Any, seconds: float | None = None, **kwargs: Any) -> T:
    """Call ``fn(*args, **kwargs)`` in a forked child process and return its (picklable) result.

    A crash of native code in the child (the CAD kernel's STEP transfer dies with SIGSEGV on
    some damaged files) cannot take the caller down: it comes back as :class:`ChildCrashed`.
    An exception raised by ``fn`` is raised again here (it must pickle; InputError does).
    With ``seconds`` the child is killed when the time is up and :class:`JointTimeout` is
    raised: a hard limit that also stops a long call inside C++, unlike :func:`run_with_timeout`.
    Needs the ``fork`` start method (Linux, macOS); elsewhere ``fn`` runs in this process.

    >>> run_in_child(pow, 2, 10)
    1024
    """
    import multiprocessing
    import pickle

    if "fork" not in multiprocessing.get_all_start_methods():
        return fn(*args, **kwargs)
    ctx = multiprocessing.get_context("fork")
    receive, send = ctx.Pipe(duplex=False)

    def child() -> None:
        import faulthandler

        receive.close()
        faulthandler.disable()              # the parent reports a crash in one line; no dump on stderr
        try:
            payload = (True, fn(*args, **kwargs))
        except BaseException as exc:        # everything goes back to the parent
            payload = (False, exc)
        try:
            send.send_bytes(pickle.dumps(payload))
        except Exception as exc:            # an answer that does not pickle
            send.send_bytes(pickle.dumps((False, RuntimeError(f"child result not picklable: {exc}"))))
        send.close()

    proc = ctx.Process(target=child, daemon=True)
    proc.start()
    send.close()
    try:
        ready = receive.poll(seconds if seconds and seconds > 0 else None)
        if not ready:
            proc.kill()
            proc.join()
            raise JointTimeout(f"time limit of {seconds:g} s reached")
        try:
            ok, value = pickle.loads(receive.recv_bytes())
        except EOFError:                    # the child died before it answered
            proc.join()
            code = proc.exitcode
            signum = -code if code is not None and code < 0 else None
            name = signal.Signals(signum).name if signum else f"exit status {code}"
            raise ChildCrashed(f"the child process died ({name})", signum) from None
    finally:
        receive.close()
        if proc.is_alive():
            proc.join(5)
    proc.join()
    if ok:
        return value
    raise value


# an entity instance at the start of a statement: "#123 =" (ISO 10303-21 §10); strings and
# comments are skipped first so that a "#1=" inside a name is not taken for one
_STRING_OR_COMMENT = re.compile(rb"'(?:[^']|'')*'|/\*.*?\*/", re.S)
_INSTANCE = re.compile(rb"(?:^|;)\s*#(\d+)\s*=")


def step_entity_ids(path: str | os.PathLike) -> list[int]:
    """The ``#id`` of every entity instance of a STEP file's DATA section, in file order.

    The reader numbers entities by their order in the file (1, 2, ...); its check list
    gives that ordinal, which is not the ``#id`` a user finds in the file: entry ``n - 1``
    of this list is.

    >>> import tempfile, os
    >>> text = b"ISO-10303-21;HEADER;ENDSEC;DATA;#10=A('x;#3=',#20);#20=B();ENDSEC;END-ISO-10303-21;"
    >>> with tempfile.NamedTemporaryFile(suffix=".step", delete=False) as fh:
    ...     _ = fh.write(text)
    >>> step_entity_ids(fh.name)
    [10, 20]
    >>> os.remove(fh.name)
    """
    with open(_where(path), "rb") as fh:
        text = fh.read()
    start = re.search(rb"\bDATA\s*;", text)
    body = _STRING_OR_COMMENT.sub(b"''", text[start.end() - 1 if start else 0:])
    return [int(m.group(1)) for m in _INSTANCE.finditer(body)]
