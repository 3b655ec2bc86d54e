"""Units in schedule headers, converted at the edge with pint.

A header such as ``Mf- (kip-ft)`` carries its unit in brackets. :func:`unit_factor` turns the
unit text into the factor that takes a value in that unit to the engine's unit for the
column's dimension (mm, MPa, N, N·mm). Spellings engineers type (``kNm``, ``kN-m``, ``kip·in``,
``k-ft``, ``N/mm²``) are normalised first; anything else goes to pint, and a unit pint does
not know, or one of the wrong dimension, is an error that names the column. Nothing is guessed.
"""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Literal

import pint

Dimension = Literal["length", "span", "stress", "force", "moment"]

# The engine's unit for each dimension (see beamsched.model), and its display name.
ENGINE_UNIT: dict[str, str] = {
    "length": "mm",
    "span": "mm",
    "stress": "MPa",
    "force": "N",
    "moment": "N*mm",
}
DIMENSION_WORDS = {
    "length": "a length (mm, m, in, ft)",
    "span": "a length (m, mm, ft, in)",
    "stress": "a stress (MPa, psi, ksi)",
    "force": "a force (kN, N, kip)",
    "moment": "a moment (kN·m, kip-ft, kip·in)",
}

# The units a declared unit system stands for, where a header gives none.
UNIT_SYSTEMS: dict[str, dict[str, str]] = {
    "SI": {"length": "mm", "span": "m", "stress": "MPa", "force": "kN", "moment": "kN·m"},
    "US customary": {"length": "in", "span": "ft", "stress": "psi", "force": "kip", "moment": "kip-ft"},
}
_SYSTEM_ALIASES = {
    "si": "SI", "metric": "SI", "si (metric)": "SI", "si metric": "SI", "mm-mpa-kn": "SI",
    "us": "US customary", "us customary": "US customary", "us-customary": "US customary",
    "imperial": "US customary", "usc": "US customary", "customary": "US customary",
    "us customary (in, ft, psi, kip)": "US customary",
}

# Spellings engineers type -> a pint expression. Keys are lower case, spaces removed.
_SPELLINGS: dict[str, str] = {
    # lengths
    "mm": "mm", "millimetre": "mm", "millimetres": "mm", "millimeter": "mm", "millimeters": "mm",
    "m": "m", "metre": "m", "metres": "m", "meter": "m", "meters": "m", "cm": "cm",
    "in": "inch", "in.": "inch", "inch": "inch", "inches": "inch", '"': "inch",
    "ft": "foot", "ft.": "foot", "foot": "foot", "feet": "foot", "'": "foot",
    # stresses
    "mpa": "MPa", "n/mm2": "MPa", "n/mm^2": "MPa", "n/mm²": "MPa", "kpa": "kPa", "gpa": "GPa",
    "psi": "psi", "ksi": "ksi", "lb/in2": "psi", "lb/in^2": "psi", "lbf/in2": "psi",
    # forces
    "n": "N", "kn": "kN", "mn": "MN", "kip": "kip", "kips": "kip", "k": "kip", "lb": "lbf", "lbf": "lbf",
    "lbs": "lbf",
    # moments
    "knm": "kN*m", "kn-m": "kN*m", "kn.m": "kN*m", "kn*m": "kN*m", "kn·m": "kN*m", "kn⋅m": "kN*m",
    "kn×m": "kN*m", "kn-mm": "kN*mm", "nmm": "N*mm", "n-mm": "N*mm", "n·mm": "N*mm", "n.mm": "N*mm",
    "n*mm": "N*mm", "nm": "N*m", "n-m": "N*m", "n·m": "N*m", "mnm": "MN*m", "mn-m": "MN*m", "mn·m": "MN*m",
    "kip-ft": "kip*foot", "kipft": "kip*foot", "kip·ft": "kip*foot", "kip.ft": "kip*foot", "kip*ft": "kip*foot",
    "kips-ft": "kip*foot", "kip-feet": "kip*foot", "k-ft": "kip*foot", "kft": "kip*foot", "ft-kip": "kip*foot",
    "ft-kips": "kip*foot", "ft·kip": "kip*foot", "ftkip": "kip*foot",
    "kip-in": "kip*inch", "kipin": "kip*inch", "kip·in": "kip*inch", "kip.in": "kip*inch", "kip*in": "kip*inch",
    "kips-in": "kip*inch", "k-in": "kip*inch", "in-kip": "kip*inch", "in-kips": "kip*inch", "in·kip": "kip*inch",
    "lb-ft": "lbf*foot", "lbf-ft": "lbf*foot", "ft-lb": "lbf*foot", "lb-in": "lbf*inch", "in-lb": "lbf*inch",
}

_registry: pint.UnitRegistry | None = None


def registry() -> pint.UnitRegistry:
    global _registry
    if _registry is None:
        _registry = pint.UnitRegistry()
    return _registry


class UnitError(ValueError):
    """A unit that cannot be read, or one of the wrong kind for its column."""


def normalise_system(text: str) -> str | None:
    """'SI', 'metric', 'US customary', 'imperial' ... -> 'SI' or 'US customary' (None: unknown)."""
    key = re.sub(r"\s+", " ", str(text).strip().lower())
    return _SYSTEM_ALIASES.get(key)


def _pint_expression(unit_text: str) -> str:
    raw = unit_text.strip()
    key = _key(raw)
    if key in _SPELLINGS:
        return _SPELLINGS[key]
    # kN·m-like products with any dot: try the product form of the known pieces.
    pieces = re.split(r"[·⋅*.\-×]", key)
    if len(pieces) == 2 and all(p in _SPELLINGS for p in pieces):
        return f"{_SPELLINGS[pieces[0]]}*{_SPELLINGS[pieces[1]]}"
    return raw


def _key(unit_text: str) -> str:
    return re.sub(r"\s+", "", unit_text.lower()).replace("\u2212", "-").replace("\u2013", "-")


def is_known_spelling(unit_text: str) -> bool:
    """True for the unit spellings beamsched knows by name (not those it leaves to pint)."""
    key = _key(unit_text)
    if key in _SPELLINGS:
        return True
    pieces = re.split(r"[·⋅*.\-×]", key)
    return len(pieces) == 2 and all(p in _SPELLINGS for p in pieces)


@lru_cache(maxsize=512)
def unit_factor(unit_text: str, dimension: Dimension) -> float:
    """The factor taking a value in ``unit_text`` to the engine unit of ``dimension``.

    Raises :class:`UnitError` with the reason when the unit is unknown or of the wrong kind.
    """
    expr = _pint_expression(unit_text)
    ureg = registry()
    try:
        q = ureg.Quantity(1.0, ureg.parse_units(expr))
    except Exception as exc:  # pint raises several error types for unreadable text
        raise UnitError(f"unknown unit '{unit_text}': expected {DIMENSION_WORDS[dimension]}") from exc
    if q.dimensionality != ureg.parse_units(ENGINE_UNIT[dimension]).dimensionality:
        raise UnitError(f"'{unit_text}' is not {DIMENSION_WORDS[dimension]}")
    return float(q.to(ENGINE_UNIT[dimension]).magnitude)


def split_value_unit(text: str) -> tuple[float, str] | None:
    """'30 MPa' -> (30.0, 'MPa'); '4000psi' -> (4000.0, 'psi'); None when not of that form."""
    m = re.match(r"^\s*([-+]?\d+(?:\.\d+)?(?:[eE][-+]?\d+)?)\s*([^\d\s.,].*?)\s*$", str(text))
    if not m:
        return None
    return float(m.group(1)), m.group(2)
