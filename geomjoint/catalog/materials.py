"""Member (clamped part) materials: modulus, Poisson's ratio, strengths, limiting surface
pressure p_G (VDI 2230-1 Table A9), thermal expansion and the Wileman fit constants.

Each material is one representative alloy (named in the data file's `example` column);
the aliases let a job file say "aluminum", "grey cast iron" or "EN-GJS-400".
"""
from __future__ import annotations

import functools
import re
from typing import Mapping

from geomjoint.catalog.tables import load_table, number
from geomjoint.catalog.types import Material
from geomjoint.errors import InputError, did_you_mean

#: Wileman, Choudhury & Green (1991) constants for any material, as tabulated in
#: Budynas & Nisbett, Shigley's Mechanical Engineering Design, Table 8-8 ("general expression")
WILEMAN_GENERAL = (0.78952, 0.62914)


def _key(name: str) -> str:
    """Lower case, punctuation and runs of spaces folded: 'EN-GJL-250' -> 'en gjl 250'."""
    return " ".join(re.sub(r"[-_/,()]+", " ", name.strip().lower()).split())


@functools.lru_cache(maxsize=1)
def _materials() -> tuple[Material, ...]:
    out = []
    for r in load_table("materials"):
        out.append(Material(
            name=r["name"], E=number(r, "E"), poisson=number(r, "poisson"),
            yield_strength=number(r, "yield"), tensile_strength=number(r, "tensile"),
            limiting_pressure=number(r, "limiting_pressure"),
            thermal_expansion=number(r, "thermal_expansion"),
            wileman_A=number(r, "wileman_A"), wileman_B=number(r, "wileman_B"),
            source=f"{r['example']}: {r['source']}", family=r["family"],
        ))
    return tuple(out)


@functools.lru_cache(maxsize=1)
def _aliases() -> Mapping[str, str]:
    """normalised name or alias -> canonical name"""
    out: dict[str, str] = {}
    for r in load_table("materials"):
        out[_key(r["name"])] = r["name"]
        for a in r["aliases"].split(";"):
            if a.strip():
                out[_key(a)] = r["name"]
    return out


#: a clamped part stiffer than this is no polymer: engineering plastics stay below about
#: 10 GPa unfilled (PA66 + 30 % glass fibre about 10 GPa), the softest structural metal
#: (magnesium) is about 45 GPa (common practice)
POLYMER_E_MAX = 12_000.0   # MPa


def creeps_under_preload(name: str, E: float | None = None) -> bool:
    """True for a polymer member: a catalog plastic, or (an inline material) E below POLYMER_E_MAX.

    A preloaded plastic part creeps and relaxes the preload; the closed forms do not
    model it, so reports carry a caution for such joints.

    >>> creeps_under_preload("acetal"), creeps_under_preload("steel"), creeps_under_preload("E=3 GPa", 3000.0)
    (True, False, True)
    """
    canon = _aliases().get(_key(name)) if isinstance(name, str) else None
    if canon is not None:
        return next(m for m in _materials() if m.name == canon).family == "polymer"
    return E is not None and E < POLYMER_E_MAX


def material_names() -> list[str]:
    """Canonical material names, in table order."""
    return [m.name for m in _materials()]


def material(name: str) -> Material:
    """The catalog material `name` (canonical name or alias, any case).

    Unknown -> InputError naming it, with the nearest valid names.

    >>> material("aluminum").E
    71000.0
    """
    if not isinstance(name, str):
        raise InputError(f"material must be a name, got {name!r}")
    canon = _aliases().get(_key(name))
    if canon is None:
        raw = [a.strip() for r in load_table("materials") for a in r["aliases"].split(";") if a.strip()]
        choices = material_names() + raw
        raise InputError(f"unknown material {name!r}" + did_you_mean(name, choices))
    return next(m for m in _materials() if m.name == canon)


#: material whose engagement rule applies when the tapped part's material is unknown (the
#: commonest tapped part, and the shortest rule: an unknown soft part is flagged by the
#: stripping check, not guessed here)
DEFAULT_ENGAGEMENT_MATERIAL = "steel"


def engagement_factor(name: str | None) -> tuple[float, str]:
    """Minimum thread engagement in a tapped part, in nominal diameters, and its source.

    By the material of the tapped part (``data/thread_engagement.csv``: steel 1.0 d, cast
    iron 1.25 d, copper alloys 1.5 d, aluminium 2.0 d).  A name the catalog does not know,
    or None, takes the rule of ``DEFAULT_ENGAGEMENT_MATERIAL``.

    >>> engagement_factor("AlSi9Cu3")[0], engagement_factor("GJL-250")[0], engagement_factor(None)[0]
    (2.0, 1.25, 1.0)
    """
    canon = _aliases().get(_key(name)) if isinstance(name, str) else None
    rows = {r["material"]: r for r in load_table("thread_engagement")}
    row = rows.get(canon) or rows[DEFAULT_ENGAGEMENT_MATERIAL]
    return float(row["factor"]), row["source"]
