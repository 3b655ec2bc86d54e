"""Reinforcing bars: the CSA G30.18 metric catalogue and drafters' bar notation.

Notation understood (spaces are free, case does not matter):

* longitudinal bars, one layer: ``4-25M``, or mixed sizes in one layer ``2-25M + 2-20M``;
* several layers: ``4-25M / 2-25M`` (the first layer is the one nearest the face);
* stirrups: ``10M@200`` (two legs, spacing in mm) and, for more legs, ``4L-10M@200`` or
  ``10M@200 (4 legs)``.

Anything else raises :class:`NotationError` with a message that says what was expected.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field

__all__ = [
    "Bar",
    "BarGroup",
    "BarLayer",
    "BarArrangement",
    "Stirrups",
    "NotationError",
    "CATALOGUE",
    "bar",
    "parse_bars",
    "parse_stirrups",
]


@dataclass(frozen=True, slots=True)
class Bar:
    """One bar size: designation, nominal diameter db (mm) and nominal area (mm²)."""

    size: str
    db: float
    area: float


# CSA G30.18 metric bar sizes, nominal diameter (mm) and nominal area (mm²).
# Source: CSA G30.18 (from memory; the same table is reproduced in CSA A23.1 and the CAC
# Concrete Design Handbook). Each area is the rounded value of pi*db^2/4 (tests check this).
CATALOGUE: dict[str, Bar] = {
    b.size: b
    for b in (
        Bar("10M", 11.3, 100.0),
        Bar("15M", 16.0, 200.0),
        Bar("20M", 19.5, 300.0),
        Bar("25M", 25.2, 500.0),
        Bar("30M", 29.9, 700.0),
        Bar("35M", 35.7, 1000.0),
        Bar("45M", 43.7, 1500.0),
        Bar("55M", 56.4, 2500.0),
    )
}

KNOWN_SIZES = ", ".join(CATALOGUE)


class NotationError(ValueError):
    """Bar or stirrup notation that cannot be read; the message says what was expected."""


def bar(size: str) -> Bar:
    """Return the catalogue bar for a designation such as ``"25M"`` (case-insensitive)."""
    key = size.strip().upper()
    if key not in CATALOGUE:
        raise NotationError(f"unknown bar size '{size.strip()}': sizes known are {KNOWN_SIZES}")
    return CATALOGUE[key]


@dataclass(frozen=True, slots=True)
class BarGroup:
    """``count`` bars of one size in one layer."""

    count: int
    bar: Bar

    @property
    def area(self) -> float:
        return self.count * self.bar.area

    def __str__(self) -> str:
        return f"{self.count}-{self.bar.size}"


@dataclass(frozen=True, slots=True)
class BarLayer:
    """The bars of one layer; they rest side by side on the same line at the face.

    ``area``, ``count``, ``max_db`` and the notation are worked out once, when the layer is
    made (every check of every span reads them; the reader shares one layer between rows)."""

    groups: tuple[BarGroup, ...]
    area: float = field(init=False, repr=False, compare=False)
    count: int = field(init=False, repr=False, compare=False)
    max_db: float = field(init=False, repr=False, compare=False)
    _text: str = field(init=False, repr=False, compare=False)
    _hash: int = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_hash", hash(self.groups))
        object.__setattr__(self, "area", sum(g.area for g in self.groups))
        object.__setattr__(self, "count", sum(g.count for g in self.groups))
        object.__setattr__(self, "max_db", max(g.bar.db for g in self.groups))
        object.__setattr__(self, "_text", " + ".join(str(g) for g in self.groups))

    def __hash__(self) -> int:  # equal objects hash alike: _hash is the hash of the compared field
        return self._hash

    def __reduce__(self):  # made again when unpickled: a text's hash differs between processes
        return (BarLayer, (self.groups,))

    def __str__(self) -> str:
        return self._text


@dataclass(frozen=True, slots=True)
class BarArrangement:
    """Bars at one face, layer by layer; ``layers[0]`` is nearest the face.

    ``area``, ``count``, ``max_db``, ``largest_bar`` and the notation are worked out once, when
    the arrangement is made."""

    layers: tuple[BarLayer, ...]
    area: float = field(init=False, repr=False, compare=False)
    count: int = field(init=False, repr=False, compare=False)
    max_db: float = field(init=False, repr=False, compare=False)
    largest_bar: Bar = field(init=False, repr=False, compare=False)
    _text: str = field(init=False, repr=False, compare=False)
    _hash: int = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_hash", hash(self.layers))
        object.__setattr__(self, "area", sum(layer.area for layer in self.layers))
        object.__setattr__(self, "count", sum(layer.count for layer in self.layers))
        object.__setattr__(self, "max_db", max(layer.max_db for layer in self.layers))
        object.__setattr__(self, "largest_bar",
                           max((g.bar for layer in self.layers for g in layer.groups), key=lambda b: b.db))
        object.__setattr__(self, "_text", " / ".join(str(layer) for layer in self.layers))

    def __hash__(self) -> int:  # equal objects hash alike: _hash is the hash of the compared field
        return self._hash

    def __reduce__(self):  # made again when unpickled (see BarLayer)
        return (BarArrangement, (self.layers,))

    def __str__(self) -> str:
        return self._text


@dataclass(frozen=True, slots=True)
class Stirrups:
    """Closed stirrups: bar size, number of vertical legs, spacing s (mm)."""

    bar: Bar
    spacing: float
    legs: int = 2

    @property
    def area(self) -> float:
        """Av, the area of all legs at one section (mm²)."""
        return self.legs * self.bar.area

    def __str__(self) -> str:
        spacing = f"{self.spacing:g}"
        if self.legs == 2:
            return f"{self.bar.size}@{spacing}"
        return f"{self.legs}L-{self.bar.size}@{spacing}"


_DASHES = str.maketrans({"\u2013": "-", "\u2014": "-", "\u2212": "-", "\u00d7": "x"})
_GROUP = re.compile(r"^(\d+)\s*-\s*(\d+)\s*M$", re.IGNORECASE)
_SIZE = re.compile(r"^(\d+)\s*M$", re.IGNORECASE)
# Not a limit of any standard: a plausibility ceiling on the bars in one group (a wide band beam
# holds a few dozen in a layer; common practice). A larger count is a typing slip, and its area
# could not even be represented.
MAX_GROUP_COUNT = 1000
_GROUP_EXPECTED = "a bar group such as '4-25M' (count, dash, size)"


def _parse_group(text: str, whole: str) -> BarGroup:
    m = _GROUP.match(text.strip())
    if not m:
        raise NotationError(
            f"cannot read '{text.strip()}' in '{whole}': expected {_GROUP_EXPECTED}; "
            "join sizes in one layer with '+' and layers with '/', e.g. '2-25M + 2-20M / 2-20M'"
        )
    digits = m.group(1).lstrip("0") or "0"
    if len(digits) > len(str(MAX_GROUP_COUNT)) or int(digits) > MAX_GROUP_COUNT:
        def shown(t: str, n: int) -> str:
            return t if len(t) <= n else t[:n] + "…"

        group = text.strip()
        where = f"'{shown(group, 40)}'" + ("" if group == whole else f" in '{shown(whole, 60)}'")
        count = digits if len(digits) <= 12 else f"{digits[:6]}… ({len(digits)} digits)"
        raise NotationError(f"{where}: {count} bars in one group; expected a bar count of at most {MAX_GROUP_COUNT} "
                            "(no beam layer holds more)")
    count = int(digits)
    if count < 1:
        raise NotationError(f"'{text.strip()}' in '{whole}': the bar count must be 1 or more")
    return BarGroup(count, bar(m.group(2) + "M"))


def parse_bars(text: str) -> BarArrangement:
    """Read longitudinal bar notation, e.g. ``"4-25M"``, ``"2-25M + 2-20M / 2-20M"``."""
    whole = str(text).strip()
    if not whole:
        raise NotationError("bar notation is blank: expected e.g. '4-25M'")
    norm = whole.translate(_DASHES)
    layers = []
    for layer_text in norm.split("/"):
        if not layer_text.strip():
            raise NotationError(f"empty layer in '{whole}': write layers as '4-25M / 2-25M'")
        groups = tuple(_parse_group(g, whole) for g in layer_text.split("+"))
        layers.append(BarLayer(groups))
    return BarArrangement(tuple(layers))


_STIRRUP = re.compile(
    r"^(?:(\d+)\s*L\s*-?\s*)?(\d+)\s*M\s*@\s*(\d+(?:\.\d+)?)\s*(?:mm)?\s*(?:\(\s*(\d+)\s*legs?\s*\))?$",
    re.IGNORECASE,
)
STIRRUP_EXPECTED = "stirrups as '10M@200' (two legs, spacing in mm), '4L-10M@200' or '10M@200 (4 legs)'"


def parse_stirrups(text: str) -> Stirrups:
    """Read stirrup notation: ``10M@200``, ``4L-10M@200`` or ``10M@200 (4 legs)``."""
    whole = str(text).strip()
    m = _STIRRUP.match(whole.translate(_DASHES))
    if not m:
        raise NotationError(f"cannot read stirrups '{whole}': expected {STIRRUP_EXPECTED}")
    legs_prefix, size, spacing, legs_suffix = m.groups()
    if legs_prefix and legs_suffix and legs_prefix != legs_suffix:
        raise NotationError(f"'{whole}' gives two different leg counts")
    legs = int(legs_prefix or legs_suffix or 2)
    if legs < 1:
        raise NotationError(f"'{whole}': the number of legs must be 1 or more")
    s = float(spacing)
    if not math.isfinite(s) or s <= 0:
        raise NotationError(f"'{whole}': the stirrup spacing must be greater than zero (mm)")
    return Stirrups(bar(size + "M"), s, legs)
