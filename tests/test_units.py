"""Quantity parsing at the boundary. Conversion factors are SI definitions (BIPM SI Brochure, 9th ed.)
and the inch of the 1959 international agreement (1 in = 25.4 mm exactly)."""
import math

import pytest

from geomjoint.errors import InputError
from geomjoint.units import convert, parse_percent, parse_quantity


@pytest.mark.parametrize("text, kind, expected", [
    ("16 mm", "length", 16.0),
    ("0.5 in", "length", 12.7),                 # 1 in = 25.4 mm exactly
    ("2 cm", "length", 20.0),
    ("30 kN", "force", 30_000.0),
    ("1 lbf", "force", 4.4482216152605),        # 1 lbf = 4.4482216152605 N (exact by definition)
    ("60 N*m", "torque", 60_000.0),
    ("60 N·m", "torque", 60_000.0),
    ("10 lbf*ft", "torque", 10 * 4.4482216152605 * 304.8),
    ("71 GPa", "stress", 71_000.0),
    ("120 ksi", "stress", 120 * 6.894757293168361),  # 1 psi = 6894.757... Pa
    ("30 deg", "angle", 30.0),
    ("0.5 rad", "angle", math.degrees(0.5)),
    ("120 degC", "temperature", 120.0),
    ("212 degF", "temperature", 100.0),
])
def test_parse_quantity(text, kind, expected):
    assert parse_quantity(text, kind, where="t") == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("value, kind", [
    (16, "length"),          # a bare number has no unit
    ("16", "length"),
    ("16 kN", "length"),     # wrong dimension
    ("three mm", "length"),
    ("30 mm", "angle"),
    (True, "force"),
    ([1], "force"),
])
def test_parse_quantity_rejects(value, kind):
    with pytest.raises(InputError) as err:
        parse_quantity(value, kind, where="job.toml: thickness")
    assert "job.toml: thickness" in str(err.value)
    assert "\n" not in str(err.value)


def test_percent():
    assert parse_percent("75%", where="p") == pytest.approx(0.75)
    with pytest.raises(InputError):
        parse_percent("lots", where="p")


def test_convert_round_trip():
    assert convert(25.4, "length", "in") == pytest.approx(1.0)
    assert convert(1000.0, "torque", "N*m") == pytest.approx(1.0)


def test_repeated_quantities_read_alike_and_bad_ones_always_name_their_key():
    # a text read once is remembered (jobs repeat "30 deg" per joint); a bad one is never
    # remembered as good and each time names its own key
    from geomjoint.errors import InputError
    from geomjoint.units import parse_quantity

    assert parse_quantity("30 deg", "angle", where="a") == parse_quantity(" 30 deg", "angle", where="b") == 30.0
    assert parse_quantity("1 in", "length", where="a") == 25.4       # ISO 31-1 / NIST: 1 in = 25.4 mm exactly
    for where in ("job.toml: J01.cone_angle", "job.toml: J02.cone_angle"):
        with pytest.raises(InputError) as exc:
            parse_quantity("30 furlongs", "angle", where=where)
        assert where in str(exc.value)
