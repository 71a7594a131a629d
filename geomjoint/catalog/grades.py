"""Bolt strength grades: ISO 898-1 property classes, SAE J429 grades, ISO 3506-1 stainless classes.

Each grade may have several size rows (ISO 8.8 splits at d = 16 mm, SAE 2 and 5 split by
diameter); `grade(name, d)` picks the row for the bolt's nominal diameter.  For stainless
steel (ISO 3506-1) no proof stress is defined: the proof strength is taken as R_p0.2.
"""
from __future__ import annotations

import functools
import re

from geomjoint.catalog.tables import load_table, number, to_mm, to_mpa
from geomjoint.catalog.types import Grade
from geomjoint.errors import InputError, did_you_mean

#: a size on a row boundary belongs to the row listed first (the smaller sizes); this
#: tolerance keeps inch sizes converted to mm (1 in = MM_PER_INCH mm) on their own boundary
_SIZE_TOL_MM = 1e-6


@functools.lru_cache(maxsize=1)
def _rows() -> tuple[Grade, ...]:
    out = []
    for r in load_table("grades"):
        ru, su = r["range_unit"], r["stress_unit"]
        out.append(Grade(
            name=r["name"], system=r["system"],
            proof=to_mpa(number(r, "proof"), su),
            yield_strength=to_mpa(number(r, "yield"), su),
            tensile=to_mpa(number(r, "tensile"), su),
            d_min=to_mm(number(r, "d_min"), ru),
            d_max=to_mm(number(r, "d_max"), ru),
            source=r["source"],
        ))
    return tuple(out)


def grade_names() -> list[str]:
    """Canonical names of every grade, in table order ("4.6", ..., "SAE 1", ..., "A4-80")."""
    names: list[str] = []
    for g in _rows():
        if g.name not in names:
            names.append(g.name)
    return names


def _canonical(name: str) -> str | None:
    """Map the ways a grade is written ("class 8.8", "SAE grade 5", "a4 80") to its table name."""
    s = name.strip().lower()
    s = re.sub(r"\b(iso\s*898(-1)?|property\s+class|class|pc)\b", " ", s)
    s = " ".join(s.split())
    known = grade_names()
    m = re.fullmatch(r"(?:(?:sae|j429)\s*)*(?:grade|gr\.?)?\s*(\d+(?:\.\d)?)", s)
    if m and s.startswith(("sae", "j429", "grade", "gr")):
        cand = f"SAE {m.group(1)}"
        if cand in known:
            return cand
        # "grade 8.8" without "SAE" is sometimes written for the ISO class
        if not s.startswith(("sae", "j429")) and m.group(1) in known:
            return m.group(1)
        return None
    m = re.fullmatch(r"(?:iso\s*3506(?:-1)?\s*)?(a[1-5])\s*[- _]?\s*(\d{2,3})", s)
    if m:
        cand = f"{m.group(1).upper()}-{m.group(2)}"
        return cand if cand in known else None
    m = re.fullmatch(r"(\d+)\s*\.\s*(\d)", s)
    if m:
        cand = f"{m.group(1)}.{m.group(2)}"
        if cand in known:
            return cand
        # "5.2", "8.2" are SAE grades written bare
        return f"SAE {cand}" if f"SAE {cand}" in known else None
    m = re.fullmatch(r"(\d+)", s)
    if m:  # a bare integer is an SAE grade: ISO classes always have a dot
        cand = f"SAE {m.group(1)}"
        return cand if cand in known else None
    return None


def grade(name: str, d: float) -> Grade:
    """Strength of grade `name` for a bolt of nominal diameter `d` [mm].

    Accepts "8.8", "class 8.8", "10.9", "SAE 5", "SAE grade 8", "grade 5", "A2-70", "a4 80".
    Unknown grade, or a diameter outside every size row of the grade -> InputError naming it.

    >>> grade("8.8", 12).proof, grade("8.8", 20).proof
    (580.0, 600.0)
    """
    if not isinstance(name, str):
        raise InputError(f"grade must be a string such as '8.8' or 'SAE 5', got {name!r}")
    canon = _canonical(name)
    if canon is None:
        raise InputError(f"unknown bolt grade {name!r}" + did_you_mean(name, grade_names()))
    rows = [g for g in _rows() if g.name == canon]
    for g in rows:
        if g.d_min - _SIZE_TOL_MM <= d <= g.d_max + _SIZE_TOL_MM:
            return g
    ranges = ", ".join(f"{g.d_min:g}-{g.d_max:g} mm" for g in rows)
    raise InputError(f"grade {canon!r} is not defined for d = {d:g} mm (sizes {ranges})")
