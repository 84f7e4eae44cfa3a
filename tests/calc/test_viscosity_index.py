"""ASTM D2270 viscosity index, its inverse, and the viscosity-index tool."""

import pytest

from calc import bridge
from calc.kernel.errors import InputError
from calc.methods.viscosity_index import (D2270_TABLE, kv100_from_vi, kv40_from_vi, lh_values,
                                          round_vi, viscosity_index)
from calc.tools.viscosity_index import viscosity_index_of_oil


def test_worked_example_procedure_a():
    # ASTM D2270, worked example for VI <= 100 (values from memory of the standard):
    # KV40 73.30, KV100 8.86 -> L 119.94, H 69.48, VI 92.43, reported 92.
    low, high = lh_values(8.86)
    assert (low, high) == (pytest.approx(119.94), pytest.approx(69.48))
    vi = viscosity_index(73.30, 8.86)
    assert vi == pytest.approx(92.43, abs=0.005)
    assert round_vi(vi) == 92


def test_worked_example_procedure_b():
    # ASTM D2270, worked example for VI > 100 (values from memory of the standard):
    # KV40 22.83, KV100 5.05 -> VI 156.
    assert round_vi(viscosity_index(22.83, 5.05)) == 156


def test_table_rows_are_used_as_printed():
    # ASTM D2270-10 Table 1, row Y = 2.0: L 7.994, H 6.394; row Y = 70.0: L 4905, H 1558.
    assert lh_values(2.0) == (7.994, 6.394)
    assert lh_values(70.0) == (4905.0, 1558.0)
    # Between rows the standard asks for linear interpolation.
    assert lh_values(2.05)[0] == pytest.approx((7.994 + 8.64) / 2)


def test_equations_above_70_cst():
    # ASTM D2270-10 section 7 equations (from memory, as in chemicals.viscosity):
    # L = 0.8353 Y^2 + 14.67 Y - 216, H = 0.1684 Y^2 + 11.85 Y - 97.
    low, high = lh_values(80.0)
    assert low == pytest.approx(0.8353 * 6400 + 14.67 * 80 - 216)
    assert high == pytest.approx(0.1684 * 6400 + 11.85 * 80 - 97)


def test_equations_join_the_table_at_70_cst():
    # Continuity: at 70 cSt the equations land within 0.1 % of the table's last row.
    eq = (0.8353 * 4900 + 14.67 * 70 - 216, 0.1684 * 4900 + 11.85 * 70 - 97)
    assert eq[0] == pytest.approx(D2270_TABLE[-1][1], rel=1e-3)
    assert eq[1] == pytest.approx(D2270_TABLE[-1][2], rel=1e-3)


def test_vi_0_and_100_reproduce_l_and_h():
    # Definition of L and H: the KV40 of the reference oils of VI 0 and VI 100.
    for y in (2.0, 5.55, 8.86, 33.3, 70.0, 150.0):
        low, high = lh_values(y)
        assert viscosity_index(low, y) == pytest.approx(0.0, abs=1e-9)
        assert viscosity_index(high, y) == pytest.approx(100.0, abs=1e-9)


@pytest.mark.parametrize("kv100", [2.0, 2.37, 4.1, 6.8, 8.86, 19.95, 45.0, 69.9, 71.0, 300.0])
@pytest.mark.parametrize("vi", [-30.0, 0.0, 50.0, 95.0, 100.0, 101.0, 140.0, 200.0, 350.0])
def test_inverse_returns_the_kv100_it_was_given(kv100, vi):
    # Round trip through the closed-form KV40 and the numerical inverse (definition of VI).
    kv40 = kv40_from_vi(kv100, vi)
    assert viscosity_index(kv40, kv100) == pytest.approx(vi, abs=1e-9)
    assert kv100_from_vi(kv40, vi) == pytest.approx(kv100, rel=1e-10)


def test_inverse_refuses_an_oil_too_thin_for_its_vi():
    # KV40 3 cSt is below L = 7.994 at the least KV100 of 2 cSt (Table 1): no VI 50 oil exists.
    with pytest.raises(InputError) as err:
        kv100_from_vi(3.0, 50.0)
    assert err.value.field == "kv40"


def test_below_2_cst_is_refused():
    with pytest.raises(InputError) as err:
        viscosity_index_of_oil("vi", 5.0, 1.5, 100.0)
    assert err.value.field == "kv100" and "2 cSt" in err.value.message


def test_tool_both_modes():
    forward = bridge.run("viscosity-index", {"kv40": "73,30", "kv100": 8.86}, examples=True)
    assert forward["values"]["vi"] == 92.0
    assert forward["values"]["procedure"].startswith("A")
    back = bridge.run("viscosity-index", {"mode": "kv100", "kv40": 73.30,
                                          "vi": forward["values"]["vi_exact"]}, examples=True)
    assert back["values"]["kv100_found"] == pytest.approx(8.86, rel=1e-9)
    high = bridge.run("viscosity-index", {"kv40": 22.83, "kv100": 5.05}, examples=True)
    assert high["values"]["vi"] == 156.0 and high["values"]["procedure"].startswith("B")
