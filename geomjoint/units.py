"""Quantities with units, parsed only at the boundary (job file, command line).

Inside the program every number is in N, mm, MPa (N/mm^2), N*mm, degrees Celsius
and radians for angles.  This module turns strings such as "16 mm", "71 GPa",
"30 kN", "60 N*m", "30 deg" or "0.5 in" into those units, and back for reports.
"""
from __future__ import annotations

import functools
import math
import re

from geomjoint.errors import InputError

#: one inch in millimetres, exact by definition (international inch, 1959).  The one home of
#: the number: catalog/, mechanics/ and report/ import it from here (this module imports
#: nothing of geomjoint but errors, so the ground floor may use it)
MM_PER_INCH = 25.4

#: kpsi to MPa: 1 lbf/in^2 = 4.4482216152605 N / 645.16 mm^2 = 6.894757 kPa (exact definitions
#: of the pound-force and the inch)
MPA_PER_KPSI = 6.894757293168361

#: internal unit of each kind of quantity
INTERNAL = {
    "length": "mm",
    "force": "N",
    "stress": "MPa",
    "torque": "N*mm",
    "angle": "deg",
    "temperature": "degC",
    "stiffness": "N/mm",
}

_DIMENSIONS = {
    "length": "[length]",
    "force": "[force]",
    "stress": "[pressure]",
    "torque": "[force]*[length]",
    "angle": "",
    "temperature": "[temperature]",
    "stiffness": "[force]/[length]",
}


@functools.lru_cache(maxsize=1)
def registry():
    """The shared pint registry (built once; pint is slow to start)."""
    import pint

    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("kpsi = 1000 * psi = ksi")
    return ureg


_NUMBER = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*$")


def parse_quantity(value, kind: str, *, where: str, allow_bare: bool = False) -> float:
    """Parse ``value`` as a quantity of ``kind`` and return it in the internal unit.

    Parameters
    ----------
    value : str or number
        "16 mm", "0.625 in", "30 kN", "60 N*m", "71 GPa", "30 deg", "120 degC".
        A bare number is accepted only with ``allow_bare`` (it is then taken to be
        in the internal unit already), because a missing unit is the commonest
        slip in a job file.
    kind : str
        One of the keys of :data:`INTERNAL`.
    where : str
        The file and key, for the error message.

    Examples
    --------
    >>> parse_quantity("30 kN", "force", where="job")
    30000.0
    >>> parse_quantity("60 N*m", "torque", where="job")
    60000.0
    """
    if isinstance(value, bool):
        raise InputError(f"expected a {kind} with a unit, got {value!r}", where=where)
    if isinstance(value, (int, float)):
        if allow_bare:
            return float(value)
        raise InputError(
            f"{value!r} has no unit; write it as a string with its unit, e.g. \"{value} {INTERNAL[kind]}\"",
            where=where,
        )
    if not isinstance(value, str):
        raise InputError(f"expected a {kind} such as \"10 {INTERNAL[kind]}\", got {value!r}", where=where)
    text = value.strip()
    if _NUMBER.match(text):
        if allow_bare:
            return float(text)
        raise InputError(f"{value!r} has no unit, e.g. \"{text} {INTERNAL[kind]}\"", where=where)
    known = _known_value(text, kind)
    if known is not None:
        return known
    return _unit_value(value, text, kind, where)     # raises the error that names the key


@functools.lru_cache(maxsize=4096)
def _known_value(text: str, kind: str) -> float | None:
    """A quantity text already read (a job repeats "30 deg" for every joint; pint takes ~1 ms
    a parse), or None when it does not read (the caller then raises the error)."""
    try:
        return _unit_value(text, text, kind, where="")
    except InputError:
        return None


def _unit_value(value, text: str, kind: str, where: str) -> float:
    """``text`` (a number with a unit) in the internal unit of ``kind``."""
    ureg = registry()
    try:
        q = ureg.Quantity(text.replace("·", "*"))
    except Exception:
        raise InputError(f"cannot read {value!r} as a {kind}", where=where) from None
    if kind == "angle":
        if q.dimensionless and not isinstance(q.magnitude, complex):
            try:
                result = float(q.to("deg").magnitude)
            except Exception:
                raise InputError(f"cannot read {value!r} as an angle", where=where) from None
        else:
            raise InputError(f"{value!r} is not an angle (e.g. \"30 deg\")", where=where)
    else:
        if not q.check(_DIMENSIONS[kind]):
            raise InputError(
                f"{value!r} is not a {kind} (expected a unit like {INTERNAL[kind]})", where=where
            )
        result = float(q.to(INTERNAL[kind]).magnitude)
    if not math.isfinite(result):
        raise InputError(f"{value!r} is not a finite number", where=where)
    return result


def parse_percent(value, *, where: str) -> float:
    """Parse "75%" (or 0.75) as a fraction 0.75."""
    if isinstance(value, str) and value.strip().endswith("%"):
        try:
            return float(value.strip()[:-1]) / 100.0
        except ValueError:
            raise InputError(f"cannot read {value!r} as a percentage", where=where) from None
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return float(value)
    raise InputError(f"expected a percentage such as \"75%\", got {value!r}", where=where)


def convert(value: float, kind: str, unit: str) -> float:
    """Convert an internal value of ``kind`` to ``unit`` (for reports)."""
    ureg = registry()
    return float(ureg.Quantity(value, INTERNAL[kind]).to(unit).magnitude)
