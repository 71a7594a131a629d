"""Standard fatigue data for bolts: tabulated endurance strengths, thread K_f, Marin factor tables.

Data files (each row with its `source`):
- ``data/fatigue_endurance.csv``: fully corrected endurance strengths of bolts with rolled
  threads (Shigley 10th ed., Table 8-17).
- ``data/fatigue_kf.csv``: fatigue stress-concentration factors of threaded elements
  (Shigley 10th ed., Table 8-16).
- ``data/surface_factor.csv``: surface factor constants k_a = a S_ut^b (Shigley Table 6-2).
- ``data/reliability_factor.csv``: reliability factor k_e (Shigley Table 6-5).

Stresses MPa, lengths mm, temperatures degC.
"""
from __future__ import annotations

import functools
import math
import re
from dataclasses import dataclass
from pathlib import Path

from geomjoint.catalog.tables import load_table
from geomjoint.errors import InputError, did_you_mean
from geomjoint.units import MM_PER_INCH, MPA_PER_KPSI

#: a size counts as inside a table range within this tolerance, mm (inch sizes converted)
SIZE_TOLERANCE = 0.01

#: coefficient of variation of the endurance limit behind k_e = 1 - 0.08 z_a
#: (Shigley 10th ed., eq. 6-29, from memory)
ENDURANCE_COV = 0.08

#: Shigley 10th ed., eq. 6-27 (from memory): k_d = sum c_i T_F^i, T_F in degF, valid 70-1000 degF
TEMPERATURE_POLYNOMIAL = (0.975, 0.432e-3, -0.115e-5, 0.104e-8, -0.595e-12)
TEMPERATURE_FIT_MIN_F = 70.0
TEMPERATURE_FIT_MAX_F = 1000.0

#: our own rule for grades Table 8-16 does not name (stainless, ...): S_ut at or above this
#: value takes the high-grade K_f row (it lies between ISO 5.8 at 520 MPa and 6.8 at 600 MPa)
KF_HIGH_GRADE_MIN_TENSILE = 600.0

#: surface finish aliases accepted from the job file
SURFACE_ALIASES = {
    "machined": "machined", "cold-drawn": "machined", "cold drawn": "machined",
    "machined or cold-drawn": "machined", "ground": "ground", "hot-rolled": "hot-rolled",
    "hot rolled": "hot-rolled", "as-forged": "as-forged", "forged": "as-forged",
}

THREAD_FORMS = ("rolled", "cut", "fillet")


def _rows(name: str):
    """Rows of the data file `name` ("fatigue_kf.csv"), read once by the catalog's one loader."""
    return load_table(Path(name).stem)


def normalize_grade(name: str) -> str:
    """Canonical grade key: "class 8.8" -> "8.8", "SAE grade 5" / "grade 5" -> "SAE 5".

    >>> normalize_grade("SAE grade 5"), normalize_grade("Class 10.9"), normalize_grade("a4-80")
    ('SAE 5', '10.9', 'A4-80')
    """
    text = name.strip()
    m = re.fullmatch(r"(?i)sae\s*(?:grade\s*)?(\d+(?:\.\d)?)", text) or re.fullmatch(r"(?i)grade\s*(\d+(?:\.\d)?)", text)
    if m:
        return f"SAE {m.group(1)}"
    m = re.fullmatch(r"(?i)(?:iso\s*)?(?:property\s*)?(?:class\s*)?(\d+\.\d+)", text)
    if m:
        return m.group(1)
    return text.upper()


@dataclass(frozen=True)
class TableEndurance:
    """A row of Shigley Table 8-17 picked for a bolt."""

    Se: float           # MPa
    grade: str
    d_min: float        # mm
    d_max: float        # mm
    in_range: bool      # False: the nearest row of the grade was used
    source: str


@functools.lru_cache(maxsize=1)
def _endurance_rows() -> tuple[tuple[str, float, float, float, str], ...]:
    out = []
    for r in _rows("fatigue_endurance.csv"):
        scale = MM_PER_INCH if r["size_unit"] == "in" else 1.0
        stress = MPA_PER_KPSI if r["Se_unit"] == "kpsi" else 1.0
        out.append((r["grade"], float(r["size_min"]) * scale, float(r["size_max"]) * scale,
                    float(r["Se"]) * stress, r["source"]))
    return tuple(out)


def table_endurance_grades() -> list[str]:
    """Grades listed in Shigley Table 8-17."""
    return sorted({row[0] for row in _endurance_rows()})


def table_endurance(grade: str, d: float) -> TableEndurance | None:
    """Fully corrected endurance strength of a rolled-thread bolt, Shigley 10th ed., Table 8-17.

    ``None`` when the table does not list the grade.  A size outside the grade's ranges
    takes the nearest row (``in_range`` False); the caller notes it.

    Parameters
    ----------
    grade : str
        "8.8", "10.9", "SAE 5", ...
    d : float
        Nominal diameter, mm.

    Examples
    --------
    >>> table_endurance("10.9", 12.0).Se
    162.0
    >>> round(table_endurance("SAE 5", 12.7).Se, 1)     # 18.6 kpsi
    128.2
    >>> table_endurance("8.8", 12.0).in_range           # the table starts at M16
    False
    """
    key = normalize_grade(grade)
    rows = [row for row in _endurance_rows() if row[0] == key]
    if not rows:
        return None

    def distance(row):
        lo, hi = row[1], row[2]
        return 0.0 if lo - SIZE_TOLERANCE <= d <= hi + SIZE_TOLERANCE else min(abs(d - lo), abs(d - hi))

    best = min(rows, key=distance)
    return TableEndurance(best[3], key, best[1], best[2], distance(best) == 0.0, best[4])


@functools.lru_cache(maxsize=1)
def _kf_rows() -> tuple[dict, ...]:
    return tuple(_rows("fatigue_kf.csv"))


def thread_kf(grade: str, form: str, tensile: float | None = None) -> tuple[float, str]:
    """Fatigue stress-concentration factor K_f of a threaded element, Shigley 10th ed., Table 8-16.

    Rows: SAE 0-2 / ISO 3.6-5.8 (rolled 2.2, cut 2.8, fillet 2.1) and SAE 4-8 / ISO
    6.6-10.9 (rolled 3.0, cut 3.8, fillet 2.3).  ISO classes above 10.9 take the high-grade
    row (our convention: the strongest row the table has).  A grade the table does not name (stainless, ...) is placed
    by its tensile strength against :data:`KF_HIGH_GRADE_MIN_TENSILE` (our rule).

    Returns (K_f, row name: "low" | "high").

    >>> thread_kf("10.9", "cut")
    (3.8, 'high')
    >>> thread_kf("4.6", "rolled")
    (2.2, 'low')
    """
    if form not in THREAD_FORMS:
        raise InputError(f"thread form {form!r} is not one of {', '.join(THREAD_FORMS)}")
    key = normalize_grade(grade)
    rows = _kf_rows()
    low, high = (next(r for r in rows if r["row"] == name) for name in ("low", "high"))
    chosen = None
    m_sae = re.fullmatch(r"SAE (\d+(?:\.\d)?)", key)
    m_iso = re.fullmatch(r"(\d+\.\d)", key)
    if m_sae:
        n = float(m_sae.group(1))
        chosen = low if n <= float(low["sae_max"]) else high
    elif m_iso:
        n = float(m_iso.group(1))
        chosen = low if n <= float(low["iso_max"]) else high
    elif tensile is not None:
        chosen = high if tensile >= KF_HIGH_GRADE_MIN_TENSILE else low
    else:
        raise InputError(f"grade {grade!r} has no thread K_f row and no tensile strength to place it")
    return float(chosen[form]), chosen["row"]


@functools.lru_cache(maxsize=1)
def _surface_rows() -> dict[str, tuple[float, float, float]]:
    return {r["finish"]: (float(r["a_MPa"]), float(r["a_kpsi"]), float(r["b"])) for r in _rows("surface_factor.csv")}


def surface_constants(finish: str, unit: str = "MPa") -> tuple[float, float]:
    """Constants (a, b) of the surface factor k_a = a S_ut^b, Shigley 10th ed., Table 6-2.

    ``unit`` "MPa" (S_ut in MPa) or "kpsi".

    >>> surface_constants("machined")
    (4.51, -0.265)
    >>> surface_constants("cold-drawn", "kpsi")
    (2.7, -0.265)
    """
    key = SURFACE_ALIASES.get(finish.strip().lower())
    if key is None:
        raise InputError(f"unknown surface finish {finish!r}{did_you_mean(finish, SURFACE_ALIASES)}", where="surface")
    a_mpa, a_kpsi, b = _surface_rows()[key]
    if unit == "MPa":
        return a_mpa, b
    if unit == "kpsi":
        return a_kpsi, b
    raise ValueError(f"unit must be MPa or kpsi, got {unit!r}")


@functools.lru_cache(maxsize=1)
def _reliability_rows() -> dict[float, float]:
    return {float(r["reliability"]): float(r["k_e"]) for r in _rows("reliability_factor.csv")}


def reliability_table() -> dict[float, float]:
    """Shigley 10th ed., Table 6-5 as {reliability: k_e}."""
    return dict(_reliability_rows())


def reliability_factor_formula(reliability: float) -> float:
    """k_e = 1 - 0.08 z_a with z_a the standard normal quantile of the reliability (Shigley eq. 6-29).

    >>> round(reliability_factor_formula(0.99), 3)
    0.814
    """
    from scipy.stats import norm

    if not 0.0 < reliability < 1.0:
        raise InputError(f"reliability must be between 0 and 1, got {reliability}", where="reliability")
    return 1.0 - ENDURANCE_COV * float(norm.ppf(reliability))


def reliability_factor(reliability: float) -> float:
    """Reliability factor k_e: the Table 6-5 value where tabulated, else eq. 6-29.

    >>> reliability_factor(0.99)
    0.814
    >>> round(reliability_factor(0.98), 3)
    0.836
    """
    table = _reliability_rows()
    for r, k in table.items():
        if math.isclose(r, reliability, rel_tol=0.0, abs_tol=1e-12):
            return k
    return reliability_factor_formula(reliability)


def temperature_factor(temperature: float) -> float:
    """Temperature factor k_d, Shigley 10th ed., eq. 6-27 (polynomial fit in degF, from memory).

        k_d = 0.975 + 0.432e-3 T_F - 0.115e-5 T_F^2 + 0.104e-8 T_F^3 - 0.595e-12 T_F^4

    valid 70 <= T_F <= 1000 degF.  Below 70 degF (21.1 degC) we take k_d = 1.0 (the fit's
    value at 70 degF); low-temperature embrittlement is not assessed.  Above 1000 degF
    (537.8 degC) -> InputError.

    Parameters
    ----------
    temperature : float
        Service temperature, degC.

    >>> temperature_factor(20.0)
    1.0
    >>> round(temperature_factor((500 - 32) / 1.8), 3)    # 500 degF
    0.996
    """
    t_f = temperature * 1.8 + 32.0
    if t_f > TEMPERATURE_FIT_MAX_F + 1e-9:
        raise InputError(
            f"service temperature {temperature:.0f} degC is above the 538 degC limit of the k_d fit",
            where="temperature",
        )
    if t_f < TEMPERATURE_FIT_MIN_F:
        return 1.0
    return float(sum(c * t_f ** i for i, c in enumerate(TEMPERATURE_POLYNOMIAL)))
