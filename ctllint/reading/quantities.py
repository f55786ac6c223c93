"""Parse quantities written with units (``120 VAC``, ``350 mA``, ``1.5 kVA``).

Values come back in SI base units. Horsepower is converted to watts at
745.7 W/hp (the mechanical horsepower); the number as written is kept so
that table lookups by horsepower stay exact.
"""
from __future__ import annotations

import math
import re

from ctllint.reading.model import Quantity

HP_W = 745.7

# unit text -> (dimension, factor to SI, kind of current)
UNITS: dict[str, tuple[str, float, str | None]] = {
    "V": ("voltage", 1.0, None),
    "VAC": ("voltage", 1.0, "AC"),
    "VDC": ("voltage", 1.0, "DC"),
    "mV": ("voltage", 1e-3, None),
    "kV": ("voltage", 1e3, None),
    "kVAC": ("voltage", 1e3, "AC"),
    "A": ("current", 1.0, None),
    "mA": ("current", 1e-3, None),
    "kA": ("current", 1e3, None),
    "VA": ("apparent_power", 1.0, None),
    "kVA": ("apparent_power", 1e3, None),
    "W": ("power", 1.0, None),
    "mW": ("power", 1e-3, None),
    "kW": ("power", 1e3, None),
    "hp": ("power", HP_W, None),
    "s": ("time", 1.0, None),
    "ms": ("time", 1e-3, None),
    "min": ("time", 60.0, None),
    "h": ("time", 3600.0, None),
    "C": ("temperature", 1.0, None),
    "K": ("temperature", 1.0, None),
}

DIMENSION_WORDS = {
    "voltage": "a voltage (V, VAC, VDC)",
    "current": "a current (A, mA)",
    "apparent_power": "an apparent power (VA, kVA)",
    "power": "a power (W, kW, hp)",
    "time": "a time (s, ms, min)",
    "temperature": "a temperature rise (C)",
}

_NUMBER = r"[0-9]+(?:\.[0-9]*)?|\.[0-9]+"
_QUANTITY = re.compile(rf"^\s*(?P<num>(?:{_NUMBER})(?:[eE][-+]?[0-9]+)?)(?:\s*(?:-\s*)?(?P<frac>[0-9]+/[0-9]+))?\s*(?P<unit>[A-Za-z]+)\s*$")


class QuantityError(ValueError):
    """The text is not a quantity of the wanted dimension; the message says why."""


def parse_quantity(text: object, dimension: str) -> Quantity:
    """Parse ``text`` as a quantity of ``dimension`` or raise QuantityError.

    Accepts ``1-1/2 hp`` and ``1/2 hp`` for horsepower, as motor tables write them.
    """
    want = DIMENSION_WORDS[dimension]
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise QuantityError(f"expected {want} with its unit, got {type(text).__name__}")
    if not isinstance(text, str):
        raise QuantityError(f"'{text}' has no unit: write {want}, e.g. '{text} {_example_unit(dimension)}'")
    s = text.strip()
    m = _QUANTITY.match(s)
    frac_only = re.match(r"^\s*(?P<frac>[0-9]+/[0-9]+)\s*(?P<unit>[A-Za-z]+)\s*$", s)
    if m:
        number = float(m.group("num"))
        if m.group("frac"):
            number += _fraction(m.group("frac"))
        unit = m.group("unit")
    elif frac_only:
        number = _fraction(frac_only.group("frac"))
        unit = frac_only.group("unit")
    else:
        if re.match(rf"^\s*-\s*(?:{_NUMBER})", s):
            raise QuantityError(f"'{text}' is negative: {want} must be zero or more")
        if re.match(rf"^\s*(?:{_NUMBER})\s*$", s):
            raise QuantityError(f"'{text}' has no unit: write {want}, e.g. '{s} {_example_unit(dimension)}'")
        raise QuantityError(f"'{text}' is not {want}")
    if unit not in UNITS:
        raise QuantityError(f"unknown unit '{unit}' in '{text}': expected {want}")
    dim, factor, kind = UNITS[unit]
    if dim != dimension:
        raise QuantityError(f"'{text}' is {DIMENSION_WORDS[dim]}, but {want} is needed here")
    if not math.isfinite(number):
        raise QuantityError(f"'{text}' is not a finite number")
    return Quantity(number * factor, dimension, kind, number, unit, s)


def _fraction(text: str) -> float:
    num, den = text.split("/")
    if int(den) == 0:
        raise QuantityError(f"'{text}' divides by zero")
    return int(num) / int(den)


def _example_unit(dimension: str) -> str:
    return {"voltage": "V", "current": "A", "apparent_power": "VA", "power": "W", "time": "s", "temperature": "C"}[dimension]


def format_si(value: float, unit: str) -> str:
    """Print a value for a message: three significant figures, no trailing zeros."""
    if value == 0:
        return f"0 {unit}"
    mag = abs(value)
    if mag >= 100:
        text = f"{value:.0f}"
    elif mag >= 10:
        text = f"{value:.1f}"
    elif mag >= 1:
        text = f"{value:.2f}"
    else:
        text = f"{value:.3g}"
    if "." in text and "e" not in text:
        text = text.rstrip("0").rstrip(".")
    return f"{text} {unit}"
