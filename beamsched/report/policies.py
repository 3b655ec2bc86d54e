"""The policies the About sheet states, in words.

General statements hold for every run. The per-check statements are shown only when a check
with that id (or id prefix) appears in the results, so the sheet never describes a check that
was not made. Each names the clause of CSA A23.3-19 it rests on.
"""

from __future__ import annotations

GENERAL: tuple[str, ...] = (
    ("A span is PASS only when every check the tool requires of it was made and passed. A span with a "
    "required check that could not be made is INCOMPLETE, never a pass; a row that could not be read is "
    "NOT READ and nothing in it was checked."),
    "A blank demand is never read as zero: the check is reported as not checked, with the reason.",
    ("Utilisation is demand over capacity (for a limit, the value over the limit). The governing check of a "
    "span is the one with the largest utilisation; utilisations are shown to three decimals."),
    ("Factored moment resistance is found by strain compatibility with the equivalent rectangular stress "
    "block (cl. 10.1.7), a concrete strain of 0.0035 at the compression face (cl. 10.1.3) and the "
    "resistance factors of cl. 8.4.2 and 8.4.3; each bar's stress is Es εs, capped at fy."),
    "Compression bars are counted only where stirrups are scheduled to enclose them (cl. 7.6.5).",
    ("Hogging moment is checked at a continuous end, and wherever an Mf− is scheduled; sagging at a support "
    "only where an Mf+ at that support is scheduled."),
    ("The effective flange width of a T- or L-beam is the scheduled width cut back to the limits of cl. "
    "10.3.3 / 10.3.4, or those limits where no width is scheduled; the width used and why is listed per span."),
    "The workbook holds values only (no formulas). Inputs are in the units stated in the column headers.",
)

# check id, or id prefix ending in "_", -> the policy shown when such a check was made
BY_CHECK: dict[str, str] = {
    "cd_limit_": "A neutral-axis depth over d above 700 / (700 + fy) (cl. 10.5.2) is a FAIL: the resistance is "
                 "still found by strain compatibility, but an over-reinforced section is not accepted.",
    "min_steel_": "Minimum tension steel As,min = 0.2 √f'c bt h / fy (cl. 10.5.1.2), waived where the steel "
                  "provided is at least 4/3 of the steel the factored moment needs (cl. 10.5.1.3).",
    "shear": "Shear (cl. 11.3) is checked at each end against that end's Vf: the simplified method "
             "(cl. 11.3.6.3) where f'c ≤ 60 MPa and fy ≤ 400 MPa, the general method (cl. 11.3.6.4) beyond.",
    "torsion": ("Torsion (cl. 11.2.9.1): a scheduled Tf above the threshold makes the span INCOMPLETE (full "
                "torsion design, cl. 11.3.10, is not made). An L-beam with no Tf is INCOMPLETE (torsion not "
                "assessed); Tf = 0 states that torsion was assessed. Other beams with no Tf carry a reminder."),
    "min_depth": ("Minimum depth (cl. 9.8.2.1, Table 9.2): a pass only waives the deflection calculation, and only for "
                  "members not supporting or attached to partitions likely to be damaged by deflection; a shallower "
                  "member is INCOMPLETE (a deflection calculation is needed). Neither result means deflection is "
                  "acceptable."),
    "scope_": ("Scope: a member that sectional design does not cover (a deep member, cl. 10.7.1, or deep shear "
               "span, cl. 11.4; a member of the seismic force-resisting system, Clause 21; a beam-column) is "
               "INCOMPLETE with the reason, never PASS. Shear spans are estimated from the scheduled demands, so "
               "the engineer must still identify transfer girders."),
    "bar_fit": ("Bar fit: the bars of each layer are counted against the minimum clear spacing of CSA A23.1 "
                "(reproduced in A23.3 Annex A), with the cover, the stirrups and their bends at the corner bars."),
}


def policies_for(check_ids: list[str] | tuple[str, ...]) -> list[str]:
    out = list(GENERAL)
    for key, text in BY_CHECK.items():
        if key.endswith("_"):
            hit = any(cid.startswith(key) for cid in check_ids)
        else:
            hit = key in check_ids
        if hit:
            out.append(text)
    return out
