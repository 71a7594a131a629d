"""What a part's name says it is when it sits in a hole: an insert, a thread-forming screw, or a
part that is no fastener (pin, shaft, bushing, tube).

The words are the rows of ``data/hole_part_words.csv`` (the trade's names, with their source);
a word matches as a whole word of the name, case and separators ("_", "-", ".") aside, and
the longest phrase wins.  A lock nut's "nylon insert" is no insert.
"""
from __future__ import annotations

import functools
import re

from geomjoint.catalog.tables import load_table

#: kinds a name can give; the first three are fastener parts, the others fill a hole
INSERT_KINDS = ("insert", "wire insert")
FORMING_KIND = "thread-forming"
NON_FASTENER_KINDS = ("pin", "shaft", "bushing", "tube")
#: the material of an insert when neither the job nor its name says: heat-set and threaded
#: inserts for plastics are brass, wire thread inserts austenitic stainless steel (common practice;
#: catalogue material names)
INSERT_MATERIALS = {"insert": "copper alloy", "wire insert": "stainless steel"}
#: phrases that name something else although they hold a word of the table (a lock nut's
#: nylon ring; a plain "bearing" face of a fastener)
_NOT_THESE = ("nylon insert", "bearing face", "bearing surface")


def _normal(name: str) -> str:
    return " " + " ".join(re.sub(r"[^a-z0-9äöüß/.-]+", " ", name.lower().replace("_", " ")).split()) + " "


@functools.lru_cache(maxsize=1)
def _phrases() -> tuple[tuple[str, str], ...]:
    out = []
    for row in load_table("hole_part_words"):
        for word in row["words"].split(";"):
            if word.strip():
                out.append((_normal(word).strip(), row["kind"]))
    # the longest phrase first: "heat set insert" before "insert", "dowel pin" before "pin"
    return tuple(sorted(out, key=lambda p: -len(p[0])))


def hole_part_kind(*names: str | None) -> str | None:
    """The kind a part's name gives it: "insert", "wire insert", "thread-forming", "pin", "shaft",
    "bushing", "tube", or None.

    >>> hole_part_kind("M3 heat set insert 5.7"), hole_part_kind("Helicoil M6x1.5D")
    ('insert', 'wire insert')
    >>> hole_part_kind("ISO 7049 ST3.5x13 tapping screw"), hole_part_kind("Dowel_6x20"), hole_part_kind("Hotend mount")
    ('thread-forming', 'pin', None)
    >>> hole_part_kind("M4 nyloc nut (nylon insert)"), hole_part_kind("spindle_pinion")
    (None, 'shaft')
    """
    for name in names:
        if not name:
            continue
        text = _normal(name)
        text = re.sub(r"[-.]", " ", text)
        if any(_normal(x).strip() in text for x in _NOT_THESE):
            continue
        for p, pattern, kind in _patterns():
            if p in text and pattern.search(text):   # the substring test first: most names hold none
                return kind
    return None


@functools.lru_cache(maxsize=1)
def _patterns() -> tuple[tuple[str, re.Pattern, str], ...]:
    """Each phrase of :func:`_phrases` (in its order) as matched: separators made spaces, a whole word."""
    out = []
    for phrase, kind in _phrases():
        p = re.sub(r"[-.]", " ", phrase)
        out.append((p, re.compile(rf"(?<![a-z0-9äöüß]){re.escape(p)}(?![a-z0-9äöüß])"), kind))
    return tuple(out)
