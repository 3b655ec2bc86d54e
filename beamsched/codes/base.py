"""The design-code interface: everything standard-specific sits behind it.

The solver and the checks ask a :class:`DesignCode` for factors, stress-block parameters,
limits and clause labels, and never hold a number from a standard themselves. A new standard
(ACI 318, EN 1992-1-1) is a new module in this package that implements this interface and
registers itself in ``beamsched.codes``.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray


@dataclass(frozen=True, slots=True)
class StressBlock:
    """Equivalent rectangular stress block: intensity alpha1·phi_c·f'c over depth a = beta1·c."""

    alpha1: float
    beta1: float
    eps_cu: float


@dataclass(frozen=True, slots=True)
class FlangeWidth:
    """The effective flange width used, and why."""

    bf: float  # effective width (mm), bw + overhang(s)
    overhang: float  # effective overhang on each flanged side (mm)
    governing: str  # words: which limit governed, or "as scheduled"
    limits: dict[str, float]  # each overhang limit that applied (mm), by its words
    reduced: bool  # True when a scheduled width was cut back to the limit
    computed: bool  # True when no width was scheduled and the limit set it
    clause: str


@dataclass(frozen=True, slots=True)
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


# ==============================================================================================
# Shear, torsion, detailing, serviceability and scope provisions (issue 5).
#
# Kept apart from :class:`DesignCode` so that a code module can be added in stages: the checks
# that need these provisions ask ``isinstance(code, DetailingProvisions)`` and report
# ``not_checked`` when the code in force does not provide them. The generic arithmetic
# (Vc = φc λ β √f'c bw dv, Vs, εx, bar spacing geometry) sits in ``beamsched.solve.shear``;
# only the standard's numbers, rules and clause labels sit here.
# ==============================================================================================


@dataclass(frozen=True, slots=True)
class ShearAngles:
    """β and θ for a column of sections (or one section: 0-d arrays), and the rule that set
    them: the code's number for it, whose method, clause and words :meth:`DetailingProvisions.shear_rule`
    and :meth:`DetailingProvisions.shear_basis` give. NaN where a value does not apply."""

    beta: NDArray[np.float64]
    theta: NDArray[np.float64]  # degrees; NaN where no θ is needed
    rule: NDArray[np.int64]
    sze: NDArray[np.float64]  # equivalent crack spacing used (mm); NaN where none was used
    eps_x: NDArray[np.float64]  # longitudinal strain at mid-depth (general method); NaN elsewhere


class DetailingProvisions(ABC):
    """Provisions beyond flexure. Every length in mm, stress MPa, force N, moment N·mm.

    The shear provisions work on columns: each argument a number or an array (one row a
    section), each result an array of the same shape (0-d for numbers), every row worked out
    on its own. The words that go with a decision (the method chosen, the rule that set β, why
    minimum stirrups are required, the governing spacing limit) come from one section's values,
    by methods that make the same decision with the same code."""

    # -- shear (sectional method) --------------------------------------------------------------
    @abstractmethod
    def shear_depth(self, d: ArrayLike, h: ArrayLike) -> NDArray[np.float64]:
        """Effective shear depth dv."""

    @abstractmethod
    def shear_root_fc(self, fc: ArrayLike) -> NDArray[np.float64]:
        """√f'c as used for Vc (with any cap)."""

    @abstractmethod
    def shear_simplified_applies(self, fc: ArrayLike, fy: ArrayLike, axial_tension: ArrayLike) -> NDArray[np.bool_]:
        """Whether the simplified method may be used."""

    @abstractmethod
    def shear_method_words(self, fc: float, fy: float, axial_tension: bool) -> str:
        """For one section: which method is used, and why (words)."""

    @abstractmethod
    def shear_special_member(self, shape: ArrayLike, h: ArrayLike, hf: ArrayLike, bw: ArrayLike) -> NDArray[np.bool_]:
        """Whether the member is of a special type that allows the fixed β (``hf`` NaN or None
        where there is no flange)."""

    @abstractmethod
    def shear_special_member_words(self, shape: str, h: float, hf: float | None, bw: float) -> str | None:
        """For one section: words naming the special member type, or None."""

    @abstractmethod
    def shear_special(self) -> ShearAngles:
        """β (and its rule) for the special member types, without counted stirrups."""

    @abstractmethod
    def shear_simplified(self, dv: ArrayLike, agg: ArrayLike, min_stirrups: ArrayLike) -> ShearAngles:
        """β and θ by the simplified method."""

    @abstractmethod
    def shear_general_moment(self, mf: ArrayLike, vf: ArrayLike, dv: ArrayLike) -> NDArray[np.float64]:
        """The moment to use in εx (the code's lower bound applied)."""

    @abstractmethod
    def shear_general(self, eps_x: ArrayLike, dv: ArrayLike, agg: ArrayLike, fc: ArrayLike,
                      min_stirrups: ArrayLike) -> ShearAngles:
        """β and θ by the general method, εx as computed (the code applies its own bounds)."""

    @abstractmethod
    def shear_rule(self, rule: int) -> tuple[str, str]:
        """The method ("simplified", "general" or "special member") and the clause of a rule
        number of :class:`ShearAngles`."""

    @abstractmethod
    def shear_basis(self, rule: int, agg: float, fc: float) -> str:
        """For one section: words stating the rule that set β."""

    @abstractmethod
    def shear_crushing_factor(self) -> float:
        """k in Vr,max = k φc f'c bw dv."""

    @abstractmethod
    def min_shear_reinforcement(self, fc: ArrayLike, bw: ArrayLike, s: ArrayLike, fyt: ArrayLike) -> NDArray[np.float64]:
        """Av,min (mm²) for stirrups at spacing s."""

    @abstractmethod
    def min_stirrups_tests(self, vf: ArrayLike, vc: ArrayLike, h: ArrayLike) -> tuple[NDArray[np.bool_], ...]:
        """Each test that requires minimum stirrups at a section, as a column of its outcome
        (``vf`` NaN where not scheduled: that test is then not met)."""

    @abstractmethod
    def min_stirrups_reasons(self, vf: float | None, vc: float, h: float) -> list[str]:
        """For one section: why minimum stirrups are required (empty: not required by these tests)."""

    @abstractmethod
    def high_shear_limit(self, lam: ArrayLike, phi_c: ArrayLike, fc: ArrayLike, bw: ArrayLike,
                         dv: ArrayLike) -> NDArray[np.float64]:
        """The Vf above which the tighter stirrup spacing applies (N)."""

    @abstractmethod
    def stirrup_spacing_limit(self, dv: ArrayLike, high_shear: ArrayLike) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
        """Largest stirrup spacing (mm), and where the limit in terms of dv governs (for
        :meth:`stirrup_spacing_words`)."""

    @abstractmethod
    def stirrup_spacing_words(self, high_shear: bool, dv_governs: bool) -> str:
        """The words of the governing spacing limit."""

    @abstractmethod
    def long_steel_vs_cap(self, vs: ArrayLike, vf: ArrayLike) -> NDArray[np.float64]:
        """The Vs that may be used in the longitudinal-steel equation."""

    # -- torsion -------------------------------------------------------------------------------
    @abstractmethod
    def torsion_cracking(self, acp: float, pc: float, lam: float, phi_c: float, fc: float) -> float:
        """Tcr (N·mm) for a gross section of area Acp and perimeter pc."""

    @abstractmethod
    def torsion_threshold_fraction(self) -> float:
        """Torsion may be neglected where Tf ≤ this × Tcr."""

    @abstractmethod
    def torsion_flange_overhang(self, h: float, hf: float) -> tuple[float, str]:
        """Largest flange overhang on each side counted in Acp and pc (mm), and its words."""

    # -- detailing -----------------------------------------------------------------------------
    @abstractmethod
    def stirrup_bend_diameter(self, ds: float) -> tuple[float, str]:
        """Inside bend diameter of a stirrup of diameter ds (mm) and the rule's words."""

    # -- crack control and skin reinforcement --------------------------------------------------
    @abstractmethod
    def crack_control_applies(self, fy: float) -> bool: ...

    @abstractmethod
    def crack_fs_default(self, fy: float) -> float:
        """Service steel stress fs taken without a service moment (MPa)."""

    @abstractmethod
    def crack_cover_cap(self) -> float:
        """Largest clear cover used for dc and A (mm)."""

    @abstractmethod
    def crack_z_limit(self, exposure: str) -> float:
        """Limit on z (N/mm) for the exposure."""

    @abstractmethod
    def crack_epoxy_factor(self) -> float:
        """Factor on z for epoxy-coated bars."""

    @abstractmethod
    def concrete_modulus(self, fc: float, density_kg_m3: float) -> float:
        """Ec (MPa)."""

    @abstractmethod
    def skin_required(self, h: float) -> bool: ...

    @abstractmethod
    def skin_ratio(self, exposure: str) -> float:
        """ρsk: skin reinforcement area over the side strip area Acs."""

    @abstractmethod
    def skin_max_spacing(self) -> float: ...

    # -- minimum depth (deflection) ------------------------------------------------------------
    @abstractmethod
    def min_depth_divisor(self, left_end: str, right_end: str) -> tuple[float, str]:
        """ℓn over this is the minimum h; and the words of the end condition."""

    @abstractmethod
    def min_depth_fy_factor(self, fy: float) -> float: ...

    @abstractmethod
    def min_depth_density_factor(self, density_kg_m3: float | None) -> float: ...

    # -- scope ---------------------------------------------------------------------------------
    @abstractmethod
    def deep_member_span_ratio(self, continuous: bool) -> float:
        """Clear span over h below which the member is a deep flexural member."""

    @abstractmethod
    def deep_shear_span_ratio(self) -> float:
        """Shear span over d below which the span is a deep shear span."""

    @abstractmethod
    def beam_column_axial_limit(self, fc: float, ag: float) -> float:
        """Factored axial compression (N) above which the member is a beam-column."""

    @abstractmethod
    def density_kg_m3(self, density: str, lam: float) -> float | None:
        """Density to use for the concrete class (the class's lowest, where only the class is known)."""
