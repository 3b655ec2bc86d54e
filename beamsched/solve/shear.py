"""Shear and detailing arithmetic, free of any one standard.

Small pure functions; every argument in engine units (mm, MPa, N, N·mm) and every factor
(β, θ, φ, limits) passed in by the caller, who takes them from the design code. The sectional
shear model is the one of the modified compression field theory as codified (concrete term
β √f'c bw dv, stirrup term Av fyt dv cot θ / s, crushing cap k φc f'c bw dv).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "concrete_shear",
    "stirrup_shear",
    "crushing_limit",
    "shear_resistance",
    "ShearResistance",
    "strain_eps_x",
    "longitudinal_tension",
    "corner_bar_offset",
    "bars_per_layer",
    "LayerFit",
]


def concrete_shear(phi_c: float, lam: float, beta: float, root_fc: float, bw: float, dv: float) -> float:
    """Vc = φc λ β √f'c bw dv (N); ``root_fc`` is √f'c with any cap already applied."""
    return phi_c * lam * beta * root_fc * bw * dv


def stirrup_shear(phi_s: float, av: float, fyt: float, dv: float, theta_deg: float, s: float) -> float:
    """Vs = φs Av fyt dv cot θ / s (N), stirrups perpendicular to the member axis."""
    return phi_s * av * fyt * dv / math.tan(math.radians(theta_deg)) / s


def crushing_limit(k: float, phi_c: float, fc: float, bw: float, dv: float) -> float:
    """Vr,max = k φc f'c bw dv (N)."""
    return k * phi_c * fc * bw * dv


@dataclass(frozen=True, slots=True)
class ShearResistance:
    vc: float
    vs: float
    vr_max: float
    vr: float  # min(vc + vs, vr_max)
    capped: bool  # True where the crushing limit governs


def shear_resistance(vc: float, vs: float, vr_max: float) -> ShearResistance:
    """Vr = Vc + Vs, not more than the crushing limit."""
    total = vc + vs
    return ShearResistance(vc, vs, vr_max, min(total, vr_max), total > vr_max)


def strain_eps_x(mf: float, vf: float, nf: float, dv: float, es: float, as_: float) -> float:
    """εx = (Mf/dv + Vf + 0.5 Nf) / (2 Es As): longitudinal strain at mid-depth, non-prestressed,
    Nf positive in tension. The caller applies the code's floor on Mf and its bounds on εx."""
    if as_ <= 0:
        return math.inf
    return (mf / dv + vf + 0.5 * nf) / (2.0 * es * as_)


def longitudinal_tension(mf: float, vf: float, vs: float, nf: float, dv: float, theta_deg: float) -> float:
    """Ft = Mf/dv + 0.5 Nf + (Vf − 0.5 Vs) cot θ (N): the tension the flexural tension steel
    must carry where shear and moment act together (Nf positive in tension)."""
    return mf / dv + 0.5 * nf + (vf - 0.5 * vs) / math.tan(math.radians(theta_deg))


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
