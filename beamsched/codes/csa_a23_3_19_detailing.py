"""CSA A23.3-19 provisions beyond flexure: shear (11.2, 11.3), torsion threshold (11.2.9.1),
crack control and skin reinforcement (10.6), minimum depth (9.8.2.1), deep members (10.7.1)
and the project's scope limits.

Each method names its clause. Values recalled from memory rather than read from the clause text
are marked so here and in the tests that check them ("from memory").
"""

from __future__ import annotations

import math

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

    def shear_depth(self, d: float, h: float) -> float:
        """cl. 2.3 (notation): dv, the greater of 0.9 d and 0.72 h."""
        return max(0.9 * d, 0.72 * h)

    def shear_root_fc(self, fc: float) -> float:
        """cl. 11.3.4: √f'c not taken greater than 8 MPa."""
        return min(math.sqrt(fc), self.SQRT_FC_MAX)

    def shear_simplified_applies(self, fc: float, fy: float, axial_tension: bool) -> tuple[bool, str]:
        """cl. 11.3.6.3: f'c ≤ 60 MPa and longitudinal fy ≤ 400 MPa. beamsched also takes the
        general method under axial tension, so that Nf enters εx (a policy, conservative)."""
        out = []
        if fc > self.SIMPLIFIED_FC_MAX:
            out.append(f"f'c = {fc:g} MPa > {self.SIMPLIFIED_FC_MAX:g} MPa")
        if fy > self.SIMPLIFIED_FY_MAX:
            out.append(f"fy = {fy:g} MPa > {self.SIMPLIFIED_FY_MAX:g} MPa")
        if axial_tension:
            out.append("axial tension (Nf must enter εx)")
        if out:
            return False, "general method (cl. 11.3.6.4): " + ", ".join(out)
        return True, (f"simplified method (cl. 11.3.6.3): f'c ≤ {self.SIMPLIFIED_FC_MAX:g} MPa, "
                      f"fy ≤ {self.SIMPLIFIED_FY_MAX:g} MPa")

    def shear_special_member(self, shape: str, h: float, hf: float | None, bw: float) -> str | None:
        """cl. 11.3.6.2 (from memory): β = 0.21 for (c) beams with h ≤ 250 mm and (e) beams cast
        integrally with slabs whose depth below the slab is not more than half the web width or
        350 mm. beamsched reads (e) as the lesser of the two, the reading that admits fewer
        members. Slabs, footings and joist construction (a, b, d) are not beams of a schedule."""
        if h <= 250.0:
            return f"beam with h = {h:g} mm ≤ 250 mm (cl. 11.3.6.2)"
        if shape in ("T", "L") and hf is not None:
            below = h - hf
            limit = min(0.5 * bw, 350.0)
            if below <= limit:
                return (f"beam cast integrally with a slab, depth below the slab {below:g} mm ≤ "
                        f"{limit:g} mm = lesser of bw/2 and 350 mm (cl. 11.3.6.2)")
        return None

    def shear_special(self) -> ShearAngles:
        return ShearAngles(self.BETA_SPECIAL, None, "special member", "β = 0.21 for the special member types",
                           DETAILING_CLAUSES["shear_special"])

    def shear_simplified(self, dv: float, agg: float, min_stirrups: bool) -> ShearAngles:
        """cl. 11.3.6.3: (a) with at least minimum stirrups β = 0.18; (b) without, β = 230/(1000 + dv)
        for aggregate ≥ 20 mm; (c) for any aggregate, dv replaced by sze = 35 dv/(15 + ag). θ = 35°."""
        cl = DETAILING_CLAUSES["shear_simplified"]
        if min_stirrups:
            return ShearAngles(self.BETA_MIN_STIRRUPS, self.THETA_SIMPLIFIED, "simplified",
                               "β = 0.18 with at least the minimum stirrups", cl)
        if agg >= self.AGG_SIZE_EFFECT:
            return ShearAngles(230.0 / (1000.0 + dv), self.THETA_SIMPLIFIED, "simplified",
                               f"β = 230/(1000 + dv), aggregate {agg:g} mm ≥ 20 mm", cl, sze=dv)
        sze = 35.0 * dv / (15.0 + agg)
        return ShearAngles(230.0 / (1000.0 + sze), self.THETA_SIMPLIFIED, "simplified",
                           f"β = 230/(1000 + sze), sze = 35 dv/(15 + ag), aggregate {agg:g} mm < 20 mm", cl, sze=sze)

    def shear_general_moment(self, mf: float, vf: float, dv: float) -> float:
        """cl. 11.3.6.4: Mf in εx not taken less than (Vf − Vp) dv (Vp = 0: no prestress)."""
        return max(mf, vf * dv)

    def _ag_effective(self, agg: float, fc: float) -> float:
        """cl. 11.3.6.4 (from memory): ag taken as zero for f'c > 70 MPa and reduced linearly to
        zero from f'c = 60 to 70 MPa."""
        if fc <= 60.0:
            return agg
        if fc >= 70.0:
            return 0.0
        return agg * (70.0 - fc) / 10.0

    def shear_general(self, eps_x: float, dv: float, agg: float, fc: float, min_stirrups: bool) -> ShearAngles:
        """cl. 11.3.6.4: β = 0.40/(1 + 1500 εx) · 1300/(1000 + sze), θ = 29 + 7000 εx; εx taken as
        zero when negative (the conservative option) and not more than 3.0e-3; sze = 300 mm with at
        least minimum stirrups, else 35 sz/(15 + ag) ≥ 0.85 sz with sz = dv."""
        cl = DETAILING_CLAUSES["shear_general"]
        eps = min(max(eps_x, 0.0), self.EPS_X_MAX)
        if min_stirrups:
            sze, words = self.SZE_MIN_STIRRUPS, "sze = 300 mm (at least minimum stirrups)"
        else:
            ag = self._ag_effective(agg, fc)
            sze = max(35.0 * dv / (15.0 + ag), 0.85 * dv)
            words = f"sze = 35 dv/(15 + ag) ≥ 0.85 dv with ag = {ag:g} mm"
        beta = 0.40 / (1.0 + 1500.0 * eps) * 1300.0 / (1000.0 + sze)
        theta = 29.0 + 7000.0 * eps
        return ShearAngles(beta, theta, "general", f"β = 0.40/(1 + 1500 εx) · 1300/(1000 + sze), {words}", cl,
                           sze=sze, eps_x=eps)

    def shear_crushing_factor(self) -> float:
        """cl. 11.3.3: Vr ≤ 0.25 φc f'c bw dv (+ Vp)."""
        return self.CRUSHING

    def min_shear_reinforcement(self, fc: float, bw: float, s: float, fyt: float) -> float:
        """cl. 11.2.8.2, Eq. 11.1: Av,min = 0.06 √f'c bw s / fyt."""
        return 0.06 * math.sqrt(fc) * bw * s / fyt

    def min_stirrups_reasons(self, vf: float | None, vc: float, h: float) -> list[str]:
        """cl. 11.2.8.1: (a) where Vf > Vc; (b) beams with h > 750 mm; (c) where Tf > 0.25 Tcr
        (torsion above the threshold makes the span incomplete, see the torsion check)."""
        out = []
        if vf is not None and vf > vc:
            out.append(f"Vf = {vf / 1e3:.1f} kN > Vc = {vc / 1e3:.1f} kN (cl. 11.2.8.1(a))")
        if h > self.H_MIN_STIRRUPS:
            out.append(f"h = {h:g} mm > 750 mm (cl. 11.2.8.1(b))")
        return out

    def high_shear_limit(self, lam: float, phi_c: float, fc: float, bw: float, dv: float) -> float:
        """cl. 11.3.8.3: the spacing limits halve where Vf > 0.125 λ φc f'c bw dv."""
        return 0.125 * lam * phi_c * fc * bw * dv

    def stirrup_spacing_limit(self, dv: float, high_shear: bool) -> tuple[float, str]:
        """cl. 11.3.8.1: s ≤ 0.7 dv and ≤ 600 mm; cl. 11.3.8.3: half those at high shear."""
        k = 0.5 if high_shear else 1.0
        a, b = 0.7 * k * dv, 600.0 * k
        if a <= b:
            return a, f"{0.7 * k:g} dv"
        return b, f"{600 * k:g} mm"

    def long_steel_vs_cap(self, vs: float, vf: float) -> float:
        """cl. 11.3.9: beamsched does not take Vs greater than Vf in (Vf − 0.5 Vs) cot θ, so the
        shear term never falls below 0.5 Vf cot θ (from memory; conservative)."""
        return min(vs, vf)

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
