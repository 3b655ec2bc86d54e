"""Properties of the unit conversion at the edge (hypothesis).

Factors: NIST SP 811 (2008) Appendix B.8, quoted from memory to 7 digits (1 in = 25.4 mm and
1 ft = 0.3048 m exactly; 1 lbf = 4.448222 N; 1 psi = 6.894757 kPa; 1 ft·lbf = 1.355818 N·m).
"""

from __future__ import annotations

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from beamsched.schedule import read_schedule
from beamsched.schedule.writer import write_schedule

UNITS = {  # header unit -> engine units per unit
    "bw": {"mm": 1.0, "in": 25.4, "m": 1000.0},
    "Span": {"m": 1000.0, "ft": 304.8, "mm": 1.0},
    "Mf+": {"kN·m": 1e6, "kNm": 1e6, "kip-ft": 1.355818e6, "kip·in": 1.355818e6 / 12},
    "Vf": {"kN": 1e3, "kip": 4.448222e3},
    "f'c": {"MPa": 1.0, "psi": 6.894757e-3, "ksi": 6.894757},
}


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(bw=st.floats(200, 1000), span=st.floats(1, 12), mf=st.floats(0, 2000), vf=st.floats(0, 2000),
       fc=st.floats(21, 79), pick=st.integers(0, 11))
def test_any_header_unit_gives_the_same_engine_value(tmp_path_factory, bw, span, mf, vf, fc, pick):
    units = {k: list(v)[pick % len(v)] for k, v in UNITS.items()}
    values = {"bw": bw, "Span": span * 1000, "Mf+": mf * 1e6, "Vf": vf * 1e3, "f'c": fc}  # engine units
    header = ["Mark", "h (mm)", "fy (MPa)"] + [f"{k} ({units[k]})" for k in UNITS]
    cells = ["X1", 2000, 400] + [values[k] / UNITS[k][units[k]] for k in UNITS]
    path = write_schedule(tmp_path_factory.mktemp("u") / "u.xlsx", header, [cells])
    (b,) = read_schedule(path).spans
    got = {"bw": b.bw, "Span": b.span, "Mf+": b.Mf_pos, "Vf": b.Vf_left, "f'c": b.fc}
    for k, v in values.items():
        # pint's factors against the 7-digit published ones: agree to 5e-7
        assert abs(got[k] - v) <= 5e-7 * abs(v) + 1e-9, (k, units[k], got[k], v)
