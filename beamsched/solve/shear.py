"""Shear and detailing arithmetic, free of any one standard.

Small pure functions; every argument in engine units (mm, MPa, N, N·mm) and every factor
(β, θ, φ, limits) passed in by the caller, who takes them from the design code. The sectional
shear model is the one of the modified compression field theory as codified (concrete term
β √f'c bw dv, stirrup term Av fyt dv cot θ / s, crushing cap k φc f'c bw dv).

The shear functions work on columns: each argument a number or an array (one row a section),
each row worked out on its own with the same operations in the same order, so a section's
numbers do not depend on the sections worked out with it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "concrete_shear",
    "stirrup_shear",
    "crushing_limit",
    "shear_resistance",
    "ShearResistance",
    "strain_eps_x",
    "longitudinal_tension",
    "tan_degrees",
    "corner_bar_offset",
    "bars_per_layer",
    "LayerFit",
]


def tan_degrees(theta_deg: ArrayLike) -> NDArray[np.float64]:
    """tan θ of each θ in degrees, as ``math.tan(math.radians(θ))``: numpy's own tangent may
    differ from it in the last bit, and a section must give the same numbers whether it is
    worked out alone or in a column. Worked out once per distinct θ (few: θ = 35° for every
    section of the simplified method)."""
    theta = np.asarray(theta_deg, dtype=float)
    distinct, where = np.unique(theta, return_inverse=True)
    tan = np.array([math.tan(math.radians(t)) for t in distinct.tolist()])
    return tan[where].reshape(theta.shape)


def concrete_shear(phi_c: ArrayLike, lam: ArrayLike, beta: ArrayLike, root_fc: ArrayLike, bw: ArrayLike,
                   dv: ArrayLike) -> NDArray[np.float64]:
    """Vc = φc λ β √f'c bw dv (N); ``root_fc`` is √f'c with any cap already applied."""
    return np.asarray(phi_c, dtype=float) * lam * beta * root_fc * bw * dv


def stirrup_shear(phi_s: ArrayLike, av: ArrayLike, fyt: ArrayLike, dv: ArrayLike, theta_deg: ArrayLike,
                  s: ArrayLike) -> NDArray[np.float64]:
    """Vs = φs Av fyt dv cot θ / s (N), stirrups perpendicular to the member axis."""
    return np.asarray(phi_s, dtype=float) * av * fyt * dv / tan_degrees(theta_deg) / s


def crushing_limit(k: ArrayLike, phi_c: ArrayLike, fc: ArrayLike, bw: ArrayLike, dv: ArrayLike) -> NDArray[np.float64]:
    """Vr,max = k φc f'c bw dv (N)."""
    return np.asarray(k, dtype=float) * phi_c * fc * bw * dv


@dataclass(frozen=True, slots=True)
class ShearResistance:
    vc: NDArray[np.float64]
    vs: NDArray[np.float64]
    vr_max: NDArray[np.float64]
    vr: NDArray[np.float64]  # min(vc + vs, vr_max)
    capped: NDArray[np.bool_]  # True where the crushing limit governs


def shear_resistance(vc: ArrayLike, vs: ArrayLike, vr_max: ArrayLike) -> ShearResistance:
    """Vr = Vc + Vs, not more than the crushing limit."""
    vc, vs, vr_max = np.asarray(vc, dtype=float), np.asarray(vs, dtype=float), np.asarray(vr_max, dtype=float)
    total = vc + vs
    return ShearResistance(vc, vs, vr_max, np.minimum(total, vr_max), total > vr_max)


def strain_eps_x(mf: ArrayLike, vf: ArrayLike, nf: ArrayLike, dv: ArrayLike, es: ArrayLike,
                 as_: ArrayLike) -> NDArray[np.float64]:
    """εx = (Mf/dv + Vf + 0.5 Nf) / (2 Es As): longitudinal strain at mid-depth, non-prestressed,
    Nf positive in tension (infinite without tension steel). The caller applies the code's floor
    on Mf and its bounds on εx."""
    as_ = np.asarray(as_, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        eps = (np.asarray(mf, dtype=float) / dv + vf + 0.5 * np.asarray(nf, dtype=float)) / (2.0 * np.asarray(es, dtype=float) * as_)
    return np.where(as_ > 0, eps, math.inf)


def longitudinal_tension(mf: ArrayLike, vf: ArrayLike, vs: ArrayLike, nf: ArrayLike, dv: ArrayLike,
                         theta_deg: ArrayLike) -> NDArray[np.float64]:
    """Ft = Mf/dv + 0.5 Nf + (Vf − 0.5 Vs) cot θ (N): the tension the flexural tension steel
    must carry where shear and moment act together (Nf positive in tension)."""
    return (np.asarray(mf, dtype=float) / dv + 0.5 * np.asarray(nf, dtype=float)
            + (np.asarray(vf, dtype=float) - 0.5 * np.asarray(vs, dtype=float)) / tan_degrees(theta_deg))


def corner_bar_offset(db: float, bend_inside_diameter: float) -> float:
    """Distance from the inside face of a stirrup's vertical leg to the centre of the corner bar
    (mm), the bar resting on the stirrup's horizontal leg and pushed into the bend.

    With inside bend radius r: a bar that rests on the horizontal leg (centre db/2 above it) and
    touches the bend arc (centre (r, r)) has (x − r)² + (r − db/2)² = (r − db/2)², so x = r; a bar
    too large for the bend (db/2 ≥ r) bears on both legs, x = db/2.
    """
    return max(bend_inside_diameter / 2.0, db / 2.0)


@dataclass(frozen=True, slots=True)
class LayerFit:
    inside: float  # clear width inside the stirrups (or between the covers) (mm)
    offset: float  # corner-bar centre in from that inside face (mm)
    pitch: float  # centre-to-centre spacing of the bars: clear + db (mm)
    span: float  # distance between the two corner-bar centres available (mm)
    fit: int  # bars that fit in one layer


def bars_per_layer(width: float, side_cover: float, stirrup_db: float, bend_inside_diameter: float,
                   db: float, clear: float) -> LayerFit:
    """How many bars of diameter db fit side by side in one layer across ``width``.

    The corner bars sit in the stirrup bends (``corner_bar_offset``); the others at centre
    spacing db + clear between them. Without stirrups pass ``stirrup_db = 0`` and
    ``bend_inside_diameter = 0`` (the corner bars then sit at db/2 inside the cover).
    """
    inside = width - 2.0 * (side_cover + stirrup_db)
    offset = corner_bar_offset(db, bend_inside_diameter)
    pitch = db + clear
    span = inside - 2.0 * offset
    if span >= 0:
        fit = int(math.floor(span / pitch + 1e-9)) + 1
    else:
        fit = 1 if inside >= db else 0  # one bar, centred, bearing on the stirrup legs
    return LayerFit(inside, offset, pitch, span, fit)
