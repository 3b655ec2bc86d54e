"""Section geometry: the concrete outline and where each bar sits.

Depths are measured from a face in mm. The concrete outline is described, for the flexure
solver, as a stack of rectangles measured from the compression face, so the same solver serves
sagging (flange on top, in compression) and hogging (the section turned over: the web's soffit
in compression, the flange in tension).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal

from .bars import BarArrangement

Face = Literal["top", "bottom"]


@dataclass(frozen=True, slots=True)
class Rect:
    """A band of the outline: from depth y0 to y1 below the compression face, ``width`` wide."""

    y0: float
    y1: float
    width: float


@dataclass(frozen=True, slots=True)
class Section:
    """Concrete outline: rectangular, T (flange both sides) or L (flange one side)."""

    shape: Literal["rect", "T", "L"]
    bw: float
    h: float
    hf: float | None = None
    bf: float | None = None  # the effective flange width in use

    @property
    def flanged(self) -> bool:
        return self.shape in ("T", "L") and self.hf is not None and self.bf is not None

    def outline_from(self, compression_face: Face) -> tuple[Rect, ...]:
        """The outline as bands measured down from the compression face."""
        if not self.flanged:
            return (Rect(0.0, self.h, self.bw),)
        hf, bf = float(self.hf), float(self.bf)  # type: ignore[arg-type]
        if compression_face == "top":
            return (Rect(0.0, hf, bf), Rect(hf, self.h, self.bw))
        return (Rect(0.0, self.h - hf, self.bw), Rect(self.h - hf, self.h, bf))

    @property
    def area(self) -> float:
        return sum((r.y1 - r.y0) * r.width for r in self.outline_from("top"))


@dataclass(frozen=True, slots=True)
class PlacedBars:
    """Bars of one size in one layer, at one depth below their own face."""

    count: int
    size: str
    db: float
    area: float  # total area of the group (mm²)
    depth: float  # centre depth below the face they sit at (mm)
    layer: int  # 1 = nearest the face
    lumped: bool = False  # placed at an explicit d rather than by cover


def place_bars(
    bars: BarArrangement,
    cover: float,
    stirrup_db: float,
    layer_clear: Callable[[float, float], float],
    explicit_depth: float | None = None,
) -> tuple[PlacedBars, ...]:
    """Place each group of bars below its face.

    Bars of one layer rest on the same line (the inside of the stirrup), each at its own centre
    depth: cover + stirrup db + its own db/2. Each further layer rests at a clear distance
    ``layer_clear(db_below, db_above)`` above the largest bar of the layer below.

    ``explicit_depth``: the scheduled depth of the centroid of all these bars below their face
    (h - d); every group is then lumped at that depth.
    """
    if explicit_depth is not None:
        return tuple(
            PlacedBars(g.count, g.bar.size, g.bar.db, g.area, explicit_depth, i + 1, lumped=True)
            for i, layer in enumerate(bars.layers)
            for g in layer.groups
        )
    placed: list[PlacedBars] = []
    base = cover + stirrup_db  # the line the first layer rests on
    previous_db: float | None = None
    for i, layer in enumerate(bars.layers):
        if previous_db is not None:
            base += previous_db + layer_clear(previous_db, layer.max_db)
        for g in layer.groups:
            placed.append(PlacedBars(g.count, g.bar.size, g.bar.db, g.area, base + g.bar.db / 2, i + 1))
        previous_db = layer.max_db
    return tuple(placed)


def centroid_depth(placed: tuple[PlacedBars, ...]) -> float:
    """Area-weighted depth of a set of placed bars below their face (mm)."""
    area = sum(p.area for p in placed)
    return sum(p.area * p.depth for p in placed) / area
