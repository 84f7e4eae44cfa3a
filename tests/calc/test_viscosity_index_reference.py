"""ASTM D2270 against chemicals.viscosity (ASTM D2270-10(2016) implementation), tests only."""

import pytest

viscosity = pytest.importorskip("chemicals.viscosity")

from calc.methods.viscosity_index import D2270_TABLE, kv40_from_vi, lh_values, round_vi, viscosity_index  # noqa: E402


def test_table_matches_chemicals_row_by_row():
    # chemicals.viscosity VI_nus, VI_Ls, VI_Hs: ASTM D2270-10 Table 1.
    ours = [tuple(r) for r in D2270_TABLE]
    theirs = list(zip(viscosity.VI_nus, viscosity.VI_Ls, viscosity.VI_Hs))
    assert ours == theirs


def _kv100_sweep():
    # Whole table range in small steps, off the row values, then the equations above 70 cSt.
    # 70.0 itself is left out: chemicals switches to the equations there, the table row is used here.
    ys = [2.0 + 0.037 * k for k in range(1840)]
    ys = [y for y in ys if y < 70.0]
    return ys + [70.5, 75.0, 90.0, 120.0, 250.0, 600.0, 1500.0]


def test_sweep_against_chemicals():
    # VI 0 to 200 over the whole KV100 range; KV40 made from the D2270 L/H values.
    worst = 0.0
    for y in _kv100_sweep():
        for vi in range(0, 201, 10):
            kv40 = kv40_from_vi(y, float(vi))
            ref = viscosity.viscosity_index(kv40 * 1e-6, y * 1e-6)
            ours = viscosity_index(kv40, y)
            worst = max(worst, abs(ours - ref))
            assert ours == pytest.approx(ref, abs=0.1), (y, vi)
    assert worst < 0.1


@pytest.mark.parametrize("kv40, kv100", [(73.30, 8.86), (22.83, 5.05), (46.0, 6.8),
                                         (68.0, 8.7), (320.0, 24.0), (1000.0, 75.0)])
def test_rounded_vi_matches_chemicals(kv40, kv100):
    # chemicals.viscosity.viscosity_index(rounding=True): ASTM D2270 rounding.
    assert round_vi(viscosity_index(kv40, kv100)) == viscosity.viscosity_index(
        kv40 * 1e-6, kv100 * 1e-6, rounding=True)


def test_lh_between_rows_matches_chemicals_interpolation():
    for y in (2.05, 13.33, 29.9, 55.55, 69.99):
        low, high = lh_values(y)
        assert low == pytest.approx(viscosity.interp(y, viscosity.VI_nus, viscosity.VI_Ls), rel=1e-12)
        assert high == pytest.approx(viscosity.interp(y, viscosity.VI_nus, viscosity.VI_Hs), rel=1e-12)
