"""The Python API: check one beam span from plain inputs.

Units of the plain inputs: lengths mm, stresses MPa, moments kN·m, forces kN; bars in drafters'
notation. Example::

    from beamsched import check_span
    r = check_span(mark="B1", shape="T", bw=300, h=600, hf=125, bf=1200, span=7200,
                   fc=30, fy=400, bottom="4-25M", top="4-25M", stirrups="10M@200",
                   Mf_pos=280, Mf_neg=300, left_end="continuous", right_end="continuous")
    r.status, r.values["Mr_pos_kNm"], [c.key for c in r.checks]
"""

from __future__ import annotations

from .bars import BarArrangement, Stirrups, parse_bars, parse_stirrups
from .codes import DesignCode
from .engine import check_beam
from .model import BeamInput, BeamResult, BeamStatus, Problem

KNM, KN = 1e6, 1e3


class InputError(ValueError):
    """The input cannot be checked; ``problems`` names each field and what was expected."""

    def __init__(self, problems: list[Problem] | tuple[Problem, ...]):
        self.problems = tuple(problems)
        super().__init__("; ".join(p.message for p in self.problems))


def _bars(text: str | BarArrangement | None) -> BarArrangement | None:
    if text is None or isinstance(text, BarArrangement):
        return text
    return parse_bars(text)


def _scale(value: float | None, factor: float) -> float | None:
    return None if value is None else float(value) * factor


def check_span(
    *,
    mark: str = "beam",
    shape: str = "rect",
    bw: float,
    h: float,
    fc: float,
    fy: float,
    hf: float | None = None,
    bf: float | None = None,
    bottom: str | BarArrangement | None = None,
    top: str | BarArrangement | None = None,
    top_left: str | BarArrangement | None = None,
    top_right: str | BarArrangement | None = None,
    top_mid: str | BarArrangement | None = None,
    bottom_support: str | BarArrangement | None = None,
    stirrups: str | Stirrups | None = None,
    Mf_pos: float | None = None,
    Mf_neg: float | None = None,
    Mf_neg_left: float | None = None,
    Mf_neg_right: float | None = None,
    Mf_pos_left: float | None = None,
    Mf_pos_right: float | None = None,
    Vf: float | None = None,
    Vf_left: float | None = None,
    Vf_right: float | None = None,
    Tf: float | None = None,
    Pf: float | None = None,
    skin_bars: str | BarArrangement | None = None,
    code: DesignCode | str | None = None,
    **rest,
) -> BeamResult:
    """Check one span; plain units (mm, MPa, kN, kN·m). ``top``, ``Mf_neg`` and ``Vf`` stand
    for both ends where the per-end values are not given. Other :class:`BeamInput` fields
    (``span``, ``clear_span``, ``left_end``, ``cover_top``, ``d_bottom``, ``agg``, ``exposure``,
    ``precast``, ...) pass straight through in engine units (mm, MPa).

    Raises :class:`InputError` for input the standard does not cover, and
    :class:`beamsched.bars.NotationError` for unreadable bar notation.
    """
    shape = {"rect": "rect", "r": "rect", "rectangular": "rect", "t": "T", "l": "L"}.get(shape.lower(), shape)
    stir = parse_stirrups(stirrups) if isinstance(stirrups, str) else stirrups
    inp = BeamInput(
        mark=mark, shape=shape, bw=float(bw), h=float(h), fc=float(fc), fy=float(fy),  # type: ignore[arg-type]
        hf=_scale(hf, 1), bf=_scale(bf, 1),
        bottom_bars=_bars(bottom), top_bars_left=_bars(top_left or top), top_bars_right=_bars(top_right or top),
        top_bars_mid=_bars(top_mid), bottom_bars_support=_bars(bottom_support), stirrups=stir,
        Mf_pos=_scale(Mf_pos, KNM), Mf_neg_left=_scale(Mf_neg_left if Mf_neg_left is not None else Mf_neg, KNM),
        Mf_neg_right=_scale(Mf_neg_right if Mf_neg_right is not None else Mf_neg, KNM),
        Mf_pos_left=_scale(Mf_pos_left, KNM), Mf_pos_right=_scale(Mf_pos_right, KNM),
        Vf_left=_scale(Vf_left if Vf_left is not None else Vf, KN),
        Vf_right=_scale(Vf_right if Vf_right is not None else Vf, KN),
        Tf=_scale(Tf, KNM), Pf=_scale(Pf, KN), skin_bars=_bars(skin_bars), **rest,
    )
    result = check_beam(inp, code)
    if result.status is BeamStatus.ERROR:
        raise InputError(result.problems)
    return result
