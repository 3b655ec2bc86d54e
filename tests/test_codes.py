"""The design-code interface: the solver and checks take every factor from the code object."""

import pytest

from beamsched import check_beam
from beamsched.bars import parse_bars
from beamsched.codes import get_code, known_codes
from beamsched.codes.base import StressBlock
from beamsched.codes.csa_a23_3_19 import CSAA23319
from beamsched.model import BeamInput


def test_registry():
    assert known_codes() == ["CSA A23.3-19"]
    assert isinstance(get_code(), CSAA23319)
    assert isinstance(get_code("csa a23.3-19"), CSAA23319)
    with pytest.raises(KeyError, match="known codes are CSA A23.3-19"):
        get_code("ACI 318-19")


@pytest.mark.parametrize("fc, fy, fyt, fields", [
    (30, 400, None, []),
    (20, 500, 400, []),  # the ends of the ranges are allowed (CSA A23.3-19 cl. 8.6.1.1, 8.5.1)
    (19.9, 400, None, ["f'c"]),
    (80.1, 400, None, ["f'c"]),
    (30, 501, None, ["fy"]),
    (30, 400, 600, ["fyt"]),
    # not a limit of the standard: a plausibility floor of 200 MPa (reinforcing steel yields
    # well above it; CSA G30.18 grades are 400 and 500 — common practice, from memory)
    (30, 200, 200, []),
    (30, 199, None, ["fy"]),
    (30, 400, 60, ["fyt"]),
    (30, 0, None, ["fy"]),
    (30, -400, None, ["fy"]),
])
def test_material_limits(fc, fy, fyt, fields):
    assert [e.field for e in get_code().material_errors(fc, fy, fyt)] == fields


def test_fy_in_ksi_gets_a_unit_hint():
    (e,) = get_code().material_errors(30, 60, None)
    # NIST SP 811: 1 psi = 6.894 757 kPa, so 60 ksi = 413.7 MPa
    assert "at least 200 MPa" in e.expected and "60 ksi = 414 MPa" in e.expected and "'fy (ksi)'" in e.expected
    (e,) = get_code().material_errors(30, 400, 1.0)
    assert "at least 200 MPa" in e.expected and "ksi" not in e.expected  # 1 MPa is no ksi value either


class UnitFactors(CSAA23319):
    """A different standard's numbers behind the same interface: no resistance factors and a
    fixed stress block (the shape of an ultimate-strength code such as ACI 318, whose strength
    reduction factor applies to the nominal moment: from memory)."""

    id = "test-code"

    def phi_c(self, precast=False):
        return 1.0

    def phi_s(self):
        return 1.0

    def stress_block(self, fc):
        return StressBlock(alpha1=0.85, beta1=0.85, eps_cu=0.003)


def test_the_solver_takes_every_factor_from_the_code():
    inp = BeamInput("X", "rect", 300, 600, 30, 400, bottom_bars=parse_bars("4-25M"), d_bottom=540, Mf_pos=1e6)
    r = check_beam(inp, UnitFactors())
    # equilibrium of the stress block with unit factors: a = As fy / (0.85 f'c b), Mn = As fy (d - a/2)
    a = 2000 * 400 / (0.85 * 30 * 300)
    assert r.values["Mr_pos_kNm"] == pytest.approx(2000 * 400 * (540 - a / 2) / 1e6, rel=1e-6)
    csa = check_beam(inp)
    assert csa.values["Mr_pos_kNm"] < r.values["Mr_pos_kNm"]
