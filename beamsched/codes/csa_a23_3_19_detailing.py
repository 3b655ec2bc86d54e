"""CSA A23.3-19 provisions beyond flexure: shear (11.2, 11.3), torsion threshold (11.2.9.1),
crack control and skin reinforcement (10.6), minimum depth (9.8.2.1), deep members (10.7.1)
and the project's scope limits.

Each method names its clause. Values recalled from memory rather than read from the clause text
are marked so here and in the tests that check them ("from memory").
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .base import DetailingProvisions, ShearAngles

DETAILING_CLAUSES = {
    "dv": "2.3",  # notation: dv, taken as the greater of 0.9d and 0.72h
    "shear_resistance": "11.3.3",
    "vc": "11.3.4",
    "vs": "11.3.5.1",
    "shear_special": "11.3.6.2",
    "shear_simplified": "11.3.6.3",
    "shear_general": "11.3.6.4",
    "min_stirrups": "11.2.8.1",
    "min_stirrups_area": "11.2.8.2",
    "stirrup_spacing": "11.3.8.1",
    "stirrup_spacing_high": "11.3.8.3",
    "long_steel": "11.3.9",
    "torsion_threshold": "11.2.9.1",
    "torsion_design": "11.3.10",
    "stirrup_bend": "A23.1 (stirrup bends)",
    "crack_control": "10.6.1",
    "skin": "10.6.2",
    "Ec": "8.6.2.2",
    "min_depth": "9.8.2.1",
    "deep_member": "10.7.1",
    "deep_shear_span": "11.4",
    "sfrs": "21",
    "beam_column": "10.1",
}


class CSAA23319Detailing(DetailingProvisions):
    """Mixed into :class:`~beamsched.codes.csa_a23_3_19.CSAA23319`."""

    # -- shear -----------------------------------------------------------------------------------
    SQRT_FC_MAX = 8.0  # cl. 11.3.4: √f'c not taken greater than 8 MPa
    SIMPLIFIED_FC_MAX = 60.0  # cl. 11.3.6.3
    SIMPLIFIED_FY_MAX = 400.0  # cl. 11.3.6.3 (longitudinal steel)
    BETA_MIN_STIRRUPS, THETA_SIMPLIFIED = 0.18, 35.0  # cl. 11.3.6.3(a)
    BETA_SPECIAL = 0.21  # cl. 11.3.6.2
    AGG_SIZE_EFFECT = 20.0  # cl. 11.3.6.3(b): β = 230/(1000 + dv) for aggregate ≥ 20 mm
    EPS_X_MAX = 3.0e-3  # cl. 11.3.6.4 (from memory)
    SZE_MIN_STIRRUPS = 300.0  # cl. 11.3.6.4: sze = 300 mm with at least minimum stirrups
    CRUSHING = 0.25  # cl. 11.3.3
    H_MIN_STIRRUPS = 750.0  # cl. 11.2.8.1(b)

    # the rules that set β, as numbered in ShearAngles.rule
    SIMPLIFIED_MIN_STIRRUPS, SIMPLIFIED_DV, SIMPLIFIED_SZE, GENERAL_MIN_STIRRUPS, GENERAL, SPECIAL = range(6)

    def shear_depth(self, d: ArrayLike, h: ArrayLike) -> NDArray[np.float64]:
        """cl. 2.3 (notation): dv, the greater of 0.9 d and 0.72 h."""
        return np.maximum(0.9 * np.asarray(d, dtype=float), 0.72 * np.asarray(h, dtype=float))

    def shear_root_fc(self, fc: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.4: √f'c not taken greater than 8 MPa."""
        return np.minimum(np.sqrt(np.asarray(fc, dtype=float)), self.SQRT_FC_MAX)

    def _simplified_excluded(self, fc: ArrayLike, fy: ArrayLike,
                             axial_tension: ArrayLike) -> tuple[NDArray[np.bool_], NDArray[np.bool_], NDArray[np.bool_]]:
        """cl. 11.3.6.3: what rules out the simplified method: f'c > 60 MPa, longitudinal
        fy > 400 MPa; and (beamsched policy, conservative) axial tension, so that Nf enters εx."""
        return (np.asarray(fc) > self.SIMPLIFIED_FC_MAX, np.asarray(fy) > self.SIMPLIFIED_FY_MAX,
                np.asarray(axial_tension, dtype=bool))

    def shear_simplified_applies(self, fc: ArrayLike, fy: ArrayLike, axial_tension: ArrayLike) -> NDArray[np.bool_]:
        """cl. 11.3.6.3: f'c ≤ 60 MPa and longitudinal fy ≤ 400 MPa. beamsched also takes the
        general method under axial tension, so that Nf enters εx (a policy, conservative)."""
        high_fc, high_fy, tension = self._simplified_excluded(fc, fy, axial_tension)
        return ~(high_fc | high_fy | tension)

    def shear_method_words(self, fc: float, fy: float, axial_tension: bool) -> str:
        """Why the method of :meth:`shear_simplified_applies` was chosen (cl. 11.3.6.3, 11.3.6.4)."""
        high_fc, high_fy, tension = self._simplified_excluded(fc, fy, axial_tension)
        out = []
        if high_fc:
            out.append(f"f'c = {fc:g} MPa > {self.SIMPLIFIED_FC_MAX:g} MPa")
        if high_fy:
            out.append(f"fy = {fy:g} MPa > {self.SIMPLIFIED_FY_MAX:g} MPa")
        if tension:
            out.append("axial tension (Nf must enter εx)")
        if out:
            return "general method (cl. 11.3.6.4): " + ", ".join(out)
        return (f"simplified method (cl. 11.3.6.3): f'c ≤ {self.SIMPLIFIED_FC_MAX:g} MPa, "
                f"fy ≤ {self.SIMPLIFIED_FY_MAX:g} MPa")

    def _special_member_tests(self, shape: ArrayLike, h: ArrayLike, hf: ArrayLike,
                              bw: ArrayLike) -> tuple[NDArray[np.bool_], NDArray[np.bool_], NDArray, NDArray]:
        """cl. 11.3.6.2 (from memory): (c) beams with h ≤ 250 mm; (e) beams cast integrally with
        slabs whose depth below the slab is not more than half the web width or 350 mm. beamsched
        reads (e) as the lesser of the two, the reading that admits fewer members. Slabs, footings
        and joist construction (a, b, d) are not beams of a schedule. Returns (c), (e), the depth
        below the slab and its limit."""
        h = np.asarray(h, dtype=float)
        hf = np.asarray(np.nan if hf is None else hf, dtype=float)
        below = h - hf  # NaN without a flange: (e) is then not met
        limit = np.minimum(0.5 * np.asarray(bw, dtype=float), 350.0)
        flanged = np.isin(shape, ("T", "L"))
        return h <= 250.0, flanged & (below <= limit), below, limit

    def shear_special_member(self, shape: ArrayLike, h: ArrayLike, hf: ArrayLike, bw: ArrayLike) -> NDArray[np.bool_]:
        """cl. 11.3.6.2 (from memory): β = 0.21 for (c) beams with h ≤ 250 mm and (e) beams cast
        integrally with slabs (see :meth:`_special_member_tests`)."""
        shallow, integral, _, _ = self._special_member_tests(shape, h, hf, bw)
        return shallow | integral

    def shear_special_member_words(self, shape: str, h: float, hf: float | None, bw: float) -> str | None:
        """The special member type of cl. 11.3.6.2 that applies, in words, or None."""
        shallow, integral, below, limit = self._special_member_tests(shape, h, hf, bw)
        if shallow:
            return f"beam with h = {h:g} mm ≤ 250 mm (cl. 11.3.6.2)"
        if integral:
            return (f"beam cast integrally with a slab, depth below the slab {float(below):g} mm ≤ "
                    f"{float(limit):g} mm = lesser of bw/2 and 350 mm (cl. 11.3.6.2)")
        return None

    def shear_special(self) -> ShearAngles:
        """cl. 11.3.6.2: β = 0.21 for the special member types."""
        nan = np.array(np.nan)
        return ShearAngles(np.array(self.BETA_SPECIAL), nan, np.array(self.SPECIAL), nan, nan)

    def shear_simplified(self, dv: ArrayLike, agg: ArrayLike, min_stirrups: ArrayLike) -> ShearAngles:
        """cl. 11.3.6.3: (a) with at least minimum stirrups β = 0.18; (b) without, β = 230/(1000 + dv)
        for aggregate ≥ 20 mm; (c) for any aggregate, dv replaced by sze = 35 dv/(15 + ag). θ = 35°."""
        dv, agg = np.asarray(dv, dtype=float), np.asarray(agg, dtype=float)
        rule = np.where(min_stirrups, self.SIMPLIFIED_MIN_STIRRUPS,
                        np.where(agg >= self.AGG_SIZE_EFFECT, self.SIMPLIFIED_DV, self.SIMPLIFIED_SZE))
        sze = np.where(rule == self.SIMPLIFIED_DV, dv, 35.0 * dv / (15.0 + agg))
        sze = np.where(rule == self.SIMPLIFIED_MIN_STIRRUPS, np.nan, sze)
        beta = np.where(rule == self.SIMPLIFIED_MIN_STIRRUPS, self.BETA_MIN_STIRRUPS, 230.0 / (1000.0 + sze))
        return ShearAngles(beta, np.full(beta.shape, self.THETA_SIMPLIFIED), rule, sze, np.full(beta.shape, np.nan))

    def shear_general_moment(self, mf: ArrayLike, vf: ArrayLike, dv: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.6.4: Mf in εx not taken less than (Vf − Vp) dv (Vp = 0: no prestress)."""
        mf, floor = np.asarray(mf, dtype=float), np.asarray(vf, dtype=float) * dv
        return np.where(floor > mf, floor, mf)  # Mf where equal, as a scheduled −0.0 stays

    def _ag_effective(self, agg: ArrayLike, fc: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.6.4 (from memory): ag taken as zero for f'c > 70 MPa and reduced linearly to
        zero from f'c = 60 to 70 MPa."""
        agg, fc = np.asarray(agg, dtype=float), np.asarray(fc, dtype=float)
        return np.where(fc <= 60.0, agg, np.where(fc >= 70.0, 0.0, agg * (70.0 - fc) / 10.0))

    def shear_general(self, eps_x: ArrayLike, dv: ArrayLike, agg: ArrayLike, fc: ArrayLike,
                      min_stirrups: ArrayLike) -> ShearAngles:
        """cl. 11.3.6.4: β = 0.40/(1 + 1500 εx) · 1300/(1000 + sze), θ = 29 + 7000 εx; εx taken as
        zero when negative (the conservative option) and not more than 3.0e-3; sze = 300 mm with at
        least minimum stirrups, else 35 sz/(15 + ag) ≥ 0.85 sz with sz = dv."""
        dv = np.asarray(dv, dtype=float)
        eps = np.minimum(np.maximum(np.asarray(eps_x, dtype=float), 0.0), self.EPS_X_MAX)
        ag = self._ag_effective(agg, fc)
        sze = np.where(min_stirrups, self.SZE_MIN_STIRRUPS, np.maximum(35.0 * dv / (15.0 + ag), 0.85 * dv))
        beta = 0.40 / (1.0 + 1500.0 * eps) * 1300.0 / (1000.0 + sze)
        theta = 29.0 + 7000.0 * eps
        rule = np.where(min_stirrups, self.GENERAL_MIN_STIRRUPS, self.GENERAL)
        return ShearAngles(*np.broadcast_arrays(beta, theta, rule, sze, eps))

    def shear_rule(self, rule: int) -> tuple[str, str]:
        """The method and clause of each rule: cl. 11.3.6.3, 11.3.6.4, 11.3.6.2."""
        if rule == self.SPECIAL:
            return "special member", DETAILING_CLAUSES["shear_special"]
        if rule in (self.GENERAL_MIN_STIRRUPS, self.GENERAL):
            return "general", DETAILING_CLAUSES["shear_general"]
        return "simplified", DETAILING_CLAUSES["shear_simplified"]

    def shear_basis(self, rule: int, agg: float, fc: float) -> str:
        """The words of each rule that sets β (cl. 11.3.6.2, 11.3.6.3, 11.3.6.4)."""
        if rule == self.SPECIAL:
            return "β = 0.21 for the special member types"
        if rule == self.SIMPLIFIED_MIN_STIRRUPS:
            return "β = 0.18 with at least the minimum stirrups"
        if rule == self.SIMPLIFIED_DV:
            return f"β = 230/(1000 + dv), aggregate {agg:g} mm ≥ 20 mm"
        if rule == self.SIMPLIFIED_SZE:
            return f"β = 230/(1000 + sze), sze = 35 dv/(15 + ag), aggregate {agg:g} mm < 20 mm"
        if rule == self.GENERAL_MIN_STIRRUPS:
            words = "sze = 300 mm (at least minimum stirrups)"
        else:
            words = f"sze = 35 dv/(15 + ag) ≥ 0.85 dv with ag = {float(self._ag_effective(agg, fc)):g} mm"
        return f"β = 0.40/(1 + 1500 εx) · 1300/(1000 + sze), {words}"

    def shear_crushing_factor(self) -> float:
        """cl. 11.3.3: Vr ≤ 0.25 φc f'c bw dv (+ Vp)."""
        return self.CRUSHING

    def min_shear_reinforcement(self, fc: ArrayLike, bw: ArrayLike, s: ArrayLike, fyt: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.2.8.2, Eq. 11.1: Av,min = 0.06 √f'c bw s / fyt."""
        return 0.06 * np.sqrt(np.asarray(fc, dtype=float)) * bw * s / fyt

    def min_stirrups_tests(self, vf: ArrayLike, vc: ArrayLike, h: ArrayLike) -> tuple[NDArray[np.bool_], ...]:
        """cl. 11.2.8.1: (a) where Vf > Vc; (b) beams with h > 750 mm; (c) where Tf > 0.25 Tcr
        (torsion above the threshold makes the span incomplete, see the torsion check)."""
        return vf > vc, h > self.H_MIN_STIRRUPS  # type: ignore[operator]  (numbers or arrays alike)

    def min_stirrups_reasons(self, vf: float | None, vc: float, h: float) -> list[str]:
        """The tests of :meth:`min_stirrups_tests` that are met, in words (cl. 11.2.8.1)."""
        over_vc, deep = self.min_stirrups_tests(np.nan if vf is None else vf, vc, h)
        out = []
        if over_vc:
            out.append(f"Vf = {vf / 1e3:.1f} kN > Vc = {vc / 1e3:.1f} kN (cl. 11.2.8.1(a))")  # type: ignore[operator]
        if deep:
            out.append(f"h = {h:g} mm > 750 mm (cl. 11.2.8.1(b))")
        return out

    def high_shear_limit(self, lam: ArrayLike, phi_c: ArrayLike, fc: ArrayLike, bw: ArrayLike,
                         dv: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.8.3: the spacing limits halve where Vf > 0.125 λ φc f'c bw dv."""
        return 0.125 * np.asarray(lam, dtype=float) * phi_c * fc * bw * dv

    def _spacing_factor(self, high_shear: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.8.3: the limits of cl. 11.3.8.1 are halved at high shear."""
        return np.where(high_shear, 0.5, 1.0)

    def stirrup_spacing_limit(self, dv: ArrayLike, high_shear: ArrayLike) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
        """cl. 11.3.8.1: s ≤ 0.7 dv and ≤ 600 mm; cl. 11.3.8.3: half those at high shear."""
        k = self._spacing_factor(high_shear)
        a, b = 0.7 * k * dv, 600.0 * k
        return np.where(a <= b, a, b), a <= b

    def stirrup_spacing_words(self, high_shear: bool, dv_governs: bool) -> str:
        """The limit of :meth:`stirrup_spacing_limit` that governs, in words."""
        k = float(self._spacing_factor(high_shear))
        return f"{0.7 * k:g} dv" if dv_governs else f"{600 * k:g} mm"

    def long_steel_vs_cap(self, vs: ArrayLike, vf: ArrayLike) -> NDArray[np.float64]:
        """cl. 11.3.9: beamsched does not take Vs greater than Vf in (Vf − 0.5 Vs) cot θ, so the
        shear term never falls below 0.5 Vf cot θ (from memory; conservative)."""
        return np.minimum(vs, vf)

    # -- torsion ---------------------------------------------------------------------------------
    def torsion_cracking(self, acp: float, pc: float, lam: float, phi_c: float, fc: float) -> float:
        """cl. 11.2.9.1: Tcr = (Acp²/pc) 0.38 λ φc √f'c (no prestress, no axial load)."""
        return acp ** 2 / pc * 0.38 * lam * phi_c * math.sqrt(fc)

    def torsion_threshold_fraction(self) -> float:
        """cl. 11.2.9.1: torsion may be neglected where Tf ≤ 0.25 Tcr."""
        return 0.25

    def torsion_flange_overhang(self, h: float, hf: float) -> tuple[float, str]:
        """cl. 11.2.9.1 (from memory): the overhang counted in Acp and pc on each side is not more
        than the projection of the web below the slab, h − hf, nor 4 hf."""
        a, b = h - hf, 4.0 * hf
        return (a, "h − hf (the web's projection below the slab)") if a <= b else (b, "4 hf")

    # -- detailing -------------------------------------------------------------------------------
    def stirrup_bend_diameter(self, ds: float) -> tuple[float, str]:
        """CSA A23.1, minimum inside bend diameter of stirrups and ties (from memory): 4 db for 10M
        and 15M, 6 db for 20M and 25M."""
        k = 4.0 if ds <= 16.0 else 6.0
        return k * ds, f"inside bend diameter {k:g} ds of the stirrup (A23.1, from memory)"

    # -- crack control, skin reinforcement -------------------------------------------------------
    def crack_control_applies(self, fy: float) -> bool:
        """cl. 10.6.1: where the specified yield strength exceeds 300 MPa."""
        return fy > 300.0

    def crack_fs_default(self, fy: float) -> float:
        """cl. 10.6.1: fs may be taken as 60 % of fy."""
        return 0.6 * fy

    def crack_cover_cap(self) -> float:
        """cl. 10.6.1: the clear cover used for dc and A need not exceed 50 mm."""
        return 50.0

    def crack_z_limit(self, exposure: str) -> float:
        """cl. 10.6.1: z ≤ 30 000 N/mm for interior, 25 000 N/mm for exterior exposure."""
        return 30_000.0 if exposure == "interior" else 25_000.0

    def crack_epoxy_factor(self) -> float:
        """cl. 10.6.1: z multiplied by 1.2 for epoxy-coated bars."""
        return 1.2

    def concrete_modulus(self, fc: float, density_kg_m3: float) -> float:
        """cl. 8.6.2.2: Ec = (3300 √f'c + 6900)(γc/2300)^1.5."""
        return (3300.0 * math.sqrt(fc) + 6900.0) * (density_kg_m3 / 2300.0) ** 1.5

    def skin_required(self, h: float) -> bool:
        """cl. 10.6.2: skin reinforcement where h exceeds 750 mm."""
        return h > 750.0

    def skin_ratio(self, exposure: str) -> float:
        """cl. 10.6.2 (from memory): ρsk = 0.008 interior, 0.010 exterior exposure."""
        return 0.008 if exposure == "interior" else 0.010

    def skin_max_spacing(self) -> float:
        """cl. 10.6.2 (from memory): skin bars at not more than 200 mm."""
        return 200.0

    # -- minimum depth ---------------------------------------------------------------------------
    def min_depth_divisor(self, left_end: str, right_end: str) -> tuple[float, str]:
        """cl. 9.8.2.1, Table 9.2, beams: ℓn/16 simply supported, ℓn/18 one end continuous, ℓn/21
        both ends continuous, ℓn/8 cantilever."""
        ends = {left_end, right_end}
        if "free" in ends:
            return 8.0, "cantilever"
        n = [left_end, right_end].count("continuous")
        return {0: (16.0, "simply supported"), 1: (18.0, "one end continuous"),
                2: (21.0, "both ends continuous")}[n]

    def min_depth_fy_factor(self, fy: float) -> float:
        """cl. 9.8.2.1, Table 9.2 note: for fy other than 400 MPa, multiply by (0.4 + fy/670)."""
        return 1.0 if fy == 400.0 else 0.4 + fy / 670.0

    def min_depth_density_factor(self, density_kg_m3: float | None) -> float:
        """cl. 9.8.2.1, Table 9.2 note (from memory): low- and semi-low-density concrete,
        multiply by (1.65 − 0.0003 γc) ≥ 1.00."""
        if density_kg_m3 is None:
            return 1.0
        return max(1.65 - 0.0003 * density_kg_m3, 1.0)

    # -- scope -----------------------------------------------------------------------------------
    def deep_member_span_ratio(self, continuous: bool) -> float:
        """cl. 10.7.1 (from memory): deep flexural members are those with h/ℓn > 2/5 (continuous
        spans) or > 4/5 (simple spans), i.e. ℓn/h < 2.5 or < 1.25."""
        return 2.5 if continuous else 1.25

    def deep_shear_span_ratio(self) -> float:
        """Deep shear span: shear span over d less than 2 (cl. 2.2 definition, designed by the
        strut-and-tie model of cl. 11.4; from memory)."""
        return 2.0

    def beam_column_axial_limit(self, fc: float, ag: float) -> float:
        """beamsched's limit (a policy, not a clause): factored axial compression above 0.1 f'c Ag
        makes the member a beam-column (the level below which Clause 21 treats frame members as
        flexural members, from memory)."""
        return 0.1 * fc * ag

    def density_kg_m3(self, density: str, lam: float) -> float | None:
        """cl. 8.6.5 classes (from memory): normal density 2300 kg/m³ used; semi-low-density
        1850–2150 and low-density 1400–1850 kg/m³, the class's lowest density used (conservative
        for Ec and for the Table 9.2 factor). None for normal density."""
        word = (density or "").lower()
        if "semi" in word or abs(lam - 0.85) < 1e-9:
            return 1850.0
        if "low" in word or abs(lam - 0.75) < 1e-9:
            return 1400.0
        return None
