"""Loading the catalog's CSV data files (geomjoint/catalog/data/*.csv).

Every data file has a `source` column naming the standard or handbook each row comes
from.  Files are read once per process (`functools.lru_cache`) and handed out as tuples
of read-only mappings, so no caller can change the cached data by accident.
"""
from __future__ import annotations

import csv
import functools
from pathlib import Path
from types import MappingProxyType
from typing import Mapping

from geomjoint.errors import InputError
from geomjoint.units import MM_PER_INCH, MPA_PER_KPSI

#: folder of the standard-data CSV files
DATA_DIR = Path(__file__).resolve().parent / "data"

__all__ = ["DATA_DIR", "MM_PER_INCH", "MPA_PER_KPSI", "load_table", "number", "to_mm", "to_mpa"]


@functools.lru_cache(maxsize=None)
def load_table(name: str) -> tuple[Mapping[str, str], ...]:
    """Rows of the data file `name` (e.g. "threads_metric"), as read-only dicts of strings.

    Raises InputError if the file is missing or has no `source` column (a broken
    installation, named so it can be fixed).

    >>> load_table("threads_metric")[0]["series"]
    'coarse'
    """
    path = DATA_DIR / f"{name}.csv"
    if not path.is_file():
        raise InputError(f"catalog data file {path.name} not found in {DATA_DIR}")
    with path.open(newline="", encoding="utf-8") as handle:
        reader = csv.DictReader(handle)
        if reader.fieldnames is None or "source" not in reader.fieldnames:
            raise InputError(f"catalog data file {path.name} has no 'source' column")
        rows = []
        for row in reader:
            if None in row or None in row.values():
                # a stray comma (extra field) or a short line would shift every column
                raise InputError(f"catalog data file {path.name} line {reader.line_num}: wrong number of fields")
            rows.append(MappingProxyType({k: v.strip() for k, v in row.items()}))
    return tuple(rows)


def number(row: Mapping[str, str], key: str) -> float | None:
    """The float in column `key` of `row`, or None for an empty cell."""
    text = row.get(key, "")
    return float(text) if text else None


#: factors from the data files' units to the internal ones (mm, MPa)
LENGTH_UNITS = MappingProxyType({"mm": 1.0, "in": MM_PER_INCH})
STRESS_UNITS = MappingProxyType({"MPa": 1.0, "kpsi": MPA_PER_KPSI})


def _in_internal(value: float, unit: str, factors: Mapping[str, float], kind: str) -> float:
    if unit not in factors:
        raise InputError(f"catalog data: unknown {kind} unit {unit!r}")
    return value * factors[unit]


def to_mm(value: float, unit: str) -> float:
    """A length given in the data file's unit ("mm" or "in") in millimetres.

    >>> to_mm(2.0, "in")
    50.8
    """
    return _in_internal(value, unit, LENGTH_UNITS, "length")


def to_mpa(value: float, unit: str) -> float:
    """A stress given in the data file's unit ("MPa" or "kpsi") in MPa.

    >>> round(to_mpa(120.0, "kpsi"), 1)
    827.4
    """
    return _in_internal(value, unit, STRESS_UNITS, "stress")
