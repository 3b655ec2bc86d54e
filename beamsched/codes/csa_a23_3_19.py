"""CSA A23.3-19, Design of concrete structures: the provisions beamsched uses.

Each method names its clause. Values were confirmed against the clause text where the project
had it; those still recalled from memory say so in the tests that check them.
"""

from __future__ import annotations

import math

from .base import DesignCode, FlangeWidth, MaterialError, StressBlock
from .csa_a23_3_19_detailing import DETAILING_CLAUSES, CSAA23319Detailing

CLAUSES = {
    "phi_c": "8.4.2",
    "phi_s": "8.4.3",
    "Es": "8.5.4.1",
    "fc_range": "8.6.1.1",
    "fy_limit": "8.5.1",
    "lambda": "8.6.5",
    "eps_cu": "10.1.3",
    "stress_block": "10.1.7",
    "strain_compat": "10.1.2",
    "flange_T": "10.3.3",
    "flange_L": "10.3.4",
    "min_steel": "10.5.1.2",
    "min_steel_exempt": "10.5.1.3",
    "cd_limit": "10.5.2",
    "flange_tension": "10.5.3.1",
    "bar_spacing": "A23.1 6.6.5.2 (Annex A)",
    "flexure": "10.1",
}
CLAUSES.update(DETAILING_CLAUSES)  # shear, detailing, serviceability and scope (issue 5)


KSI_IN_MPA = 6.894757  # 1 ksi in MPa (NIST SP 811: 1 psi = 6.894 757 kPa)


class CSAA23319(DesignCode, CSAA23319Detailing):
    id = "CSA A23.3-19"
    name = "CSA A23.3-19 Design of concrete structures"
    Es = 200_000.0  # cl. 8.5.4.1
    EPS_CU = 0.0035  # cl. 10.1.3
    FC_MIN, FC_MAX = 20.0, 80.0  # cl. 8.6.1.1
    FY_MAX = 500.0  # cl. 8.5.1
    # Not a limit of the standard: a plausibility floor. Reinforcing steel yields at well over
    # 200 MPa (CSA G30.18 grades are 400 and 500; older bars 300 and, rarely, about 230 —
    # common practice, from memory), so a smaller fy is a unit slip (ksi) or a typing error,
    # and checking with it would report a grossly wrong Mr.
    FY_PLAUSIBLE_MIN = 200.0
    min_steel_exemption = 4.0 / 3.0  # cl. 10.5.1.3
    clauses = CLAUSES

    def phi_c(self, precast: bool = False) -> float:
        """cl. 8.4.2 (0.70 for elements precast in a plant certified to CSA A23.4, cl. 16.1.3)."""
        return 0.70 if precast else 0.65

    def phi_s(self) -> float:
        """cl. 8.4.3: reinforcing bars."""
        return 0.85

    def stress_block(self, fc: float) -> StressBlock:
        """cl. 10.1.7: alpha1 = 0.85 - 0.0015 f'c >= 0.67; beta1 = 0.97 - 0.0025 f'c >= 0.67."""
        return StressBlock(
            alpha1=max(0.85 - 0.0015 * fc, 0.67),
            beta1=max(0.97 - 0.0025 * fc, 0.67),
            eps_cu=self.EPS_CU,
        )

    def material_errors(self, fc: float, fy: float, fyt: float | None) -> list[MaterialError]:
        out = []
        if not (self.FC_MIN <= fc <= self.FC_MAX):
            out.append(MaterialError("f'c", fc, f"{self.FC_MIN:g} to {self.FC_MAX:g} MPa (cl. 8.6.1.1)"))
        for name, value in (("fy", fy), ("fyt", fyt)):
            if value is None:
                continue
            if not value <= self.FY_MAX:
                out.append(MaterialError(name, value, f"at most {self.FY_MAX:g} MPa (cl. 8.5.1)"))
            elif not value >= self.FY_PLAUSIBLE_MIN:
                hint = (f"; {value:g} looks like ksi ({value:g} ksi = {value * KSI_IN_MPA:.0f} MPa): "
                        f"say so in the header, e.g. '{name} (ksi)'") if 30 <= value <= 100 else ""
                out.append(MaterialError(name, value, f"at least {self.FY_PLAUSIBLE_MIN:g} MPa: reinforcing steel "
                                                      f"yields well above that{hint}"))
        return out

    def effective_flange_width(
        self,
        shape: str,
        bw: float,
        hf: float,
        bf_scheduled: float | None,
        span: float | None,
        clear_to_next_web: float | None,
        continuous: bool,
    ) -> FlangeWidth:
        """cl. 10.3.3 (T: flanges both sides) and 10.3.4 (L: flange one side).

        Overhang limits: 12 hf (T) / 6 hf (L); half the clear distance to the next web; and,
        when the span is known, span/5 (simply supported T), span/10 (continuous T) or span/12
        (L). ``continuous`` is True when either end is continuous or free: for cantilevers and
        one-end-continuous spans beamsched takes the continuous limit, the smaller one.
        """
        if shape == "T":
            clause, sides = CLAUSES["flange_T"], 2
            limits = {"12 hf": 12 * hf}
            if span is not None:
                if continuous:
                    limits["span/10 (continuous)"] = span / 10
                else:
                    limits["span/5 (simply supported)"] = span / 5
        elif shape == "L":
            clause, sides = CLAUSES["flange_L"], 1
            limits = {"6 hf": 6 * hf}
            if span is not None:
                limits["span/12"] = span / 12
        else:
            raise ValueError(f"no flange on a {shape} section")
        if clear_to_next_web is not None:
            limits["half the clear distance to the next web"] = clear_to_next_web / 2
        governing = min(limits, key=limits.__getitem__)
        limit = limits[governing]
        if bf_scheduled is None:
            return FlangeWidth(bw + sides * limit, limit, governing, limits, False, True, clause)
        scheduled_overhang = (bf_scheduled - bw) / sides
        if scheduled_overhang > limit + 1e-9:
            return FlangeWidth(bw + sides * limit, limit, governing, limits, True, False, clause)
        return FlangeWidth(bf_scheduled, scheduled_overhang, "as scheduled", limits, False, False, clause)

    def min_tension_steel(self, fc: float, fy: float, bt: float, h: float) -> float:
        """cl. 10.5.1.2: As,min = 0.2 sqrt(f'c) bt h / fy."""
        return 0.2 * math.sqrt(fc) * bt * h / fy

    def min_steel_tension_width(self, shape: str, bw: float, bf: float, flange_in_tension: bool) -> float:
        """cl. 10.5.1.2: bt = bw with the web in tension; with the flange in tension, the flange
        width, not more than 2.5 bw (flanges both sides) or 1.5 bw (flange one side)."""
        if not flange_in_tension or shape == "rect":
            return bw
        cap = 2.5 * bw if shape == "T" else 1.5 * bw
        return min(bf, cap)

    def cd_limit(self, fy: float) -> float:
        """cl. 10.5.2: the tension steel may be taken to yield only where c/d <= 700/(700 + fy)."""
        return 700.0 / (700.0 + fy)

    def bar_clear_spacing(self, db: float, agg: float) -> float:
        """Clear distance between parallel bars: the greatest of 1.4 db, 1.4 x maximum aggregate
        and 30 mm (CSA A23.1 cl. 6.6.5.2, reproduced in A23.3 Annex A)."""
        return max(1.4 * db, 1.4 * agg, 30.0)
