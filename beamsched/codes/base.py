"""The design-code interface: everything standard-specific sits behind it.

The solver and the checks ask a :class:`DesignCode` for factors, stress-block parameters,
limits and clause labels, and never hold a number from a standard themselves. A new standard
(ACI 318, EN 1992-1-1) is a new module in this package that implements this interface and
registers itself in ``beamsched.codes``.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass


@dataclass(frozen=True)
class StressBlock:
    """Equivalent rectangular stress block: intensity alpha1·phi_c·f'c over depth a = beta1·c."""

    alpha1: float
    beta1: float
    eps_cu: float


@dataclass(frozen=True)
class FlangeWidth:
    """The effective flange width used, and why."""

    bf: float  # effective width (mm), bw + overhang(s)
    overhang: float  # effective overhang on each flanged side (mm)
    governing: str  # words: which limit governed, or "as scheduled"
    limits: dict[str, float]  # each overhang limit that applied (mm), by its words
    reduced: bool  # True when a scheduled width was cut back to the limit
    computed: bool  # True when no width was scheduled and the limit set it
    clause: str


@dataclass(frozen=True)
class MaterialError:
    field: str
    value: float
    expected: str


class DesignCode(ABC):
    """One edition of one concrete design standard."""

    id: str  # machine id, e.g. "CSA A23.3-19"
    name: str  # display name
    Es: float  # MPa

    @abstractmethod
    def phi_c(self, precast: bool = False) -> float: ...

    @abstractmethod
    def phi_s(self) -> float: ...

    @abstractmethod
    def stress_block(self, fc: float) -> StressBlock: ...

    @abstractmethod
    def material_errors(self, fc: float, fy: float, fyt: float | None) -> list[MaterialError]: ...

    @abstractmethod
    def effective_flange_width(
        self,
        shape: str,
        bw: float,
        hf: float,
        bf_scheduled: float | None,
        span: float | None,
        clear_to_next_web: float | None,
        continuous: bool,
    ) -> FlangeWidth: ...

    @abstractmethod
    def min_tension_steel(self, fc: float, fy: float, bt: float, h: float) -> float:
        """Minimum area of tension reinforcement (mm²)."""

    @abstractmethod
    def min_steel_tension_width(self, shape: str, bw: float, bf: float, flange_in_tension: bool) -> float:
        """The width of the tension zone bt used for the minimum steel (mm)."""

    min_steel_exemption: float  # As,prov >= this x As,req waives the minimum

    @abstractmethod
    def cd_limit(self, fy: float) -> float:
        """Largest c/d at which the tension steel may be taken to yield."""

    @abstractmethod
    def bar_clear_spacing(self, db: float, agg: float) -> float:
        """Minimum clear distance between parallel bars (mm)."""

    clauses: dict[str, str]  # clause labels by topic
