"""ASTM D2161 Saybolt seconds against chemicals.viscosity (reference library, tests only)."""

import pytest

viscosity = pytest.importorskip("chemicals.viscosity")

from calc.methods.convert import kinematic_from_saybolt, saybolt_seconds  # noqa: E402
from calc.tools.convert import convert  # noqa: E402

F210_IN_C = (210.0 - 32.0) * 5.0 / 9.0
# ASTM D2161 temperature factor at 210 degF, 1 + 0.000061 (210 - 100) (from memory of the
# standard); chemicals implements the 100 degF equation only.
FACTOR_210F = 1.0 + 0.000061 * 110.0

VISCOSITIES_CST = [2.0, 2.5, 3.0, 4.0, 5.0, 7.5, 10.0, 15.0, 22.0, 32.0, 46.0, 68.0, 100.0,
                   150.0, 220.0, 320.0, 460.0, 500.0]


def _chemicals_sus(kv_cst):
    # chemicals.viscosity.viscosity_converter: ASTM D2161 equation at 100 degF (its reference [5]).
    return viscosity.viscosity_converter(kv_cst * 1e-6, "kinematic viscosity", "saybolt universal")


@pytest.mark.parametrize("kv", VISCOSITIES_CST)
def test_cst_to_sus_at_100f_matches_chemicals(kv):
    assert saybolt_seconds(kv, 100.0) == pytest.approx(_chemicals_sus(kv), rel=1e-12)
    assert convert(kv, "cst", "sus_100f") == pytest.approx(_chemicals_sus(kv), rel=1e-12)


@pytest.mark.parametrize("kv", VISCOSITIES_CST)
def test_sus_to_cst_at_100f_matches_chemicals(kv):
    sus = _chemicals_sus(kv)
    reference = viscosity.viscosity_converter(sus, "saybolt universal", "kinematic viscosity") * 1e6
    assert convert(sus, "sus_100f", "cst") == pytest.approx(reference, rel=1e-8)


@pytest.mark.parametrize("kv", VISCOSITIES_CST)
def test_both_directions_at_210f_match_chemicals_with_the_d2161_factor(kv):
    sus_210 = _chemicals_sus(kv) * FACTOR_210F
    assert convert(kv, "cst", "sus_210f") == pytest.approx(sus_210, rel=1e-12)
    assert convert(sus_210, "sus_210f", "cst") == pytest.approx(kv, rel=1e-10)
    assert convert(kv, "cst", "sus_at_temp", F210_IN_C) == pytest.approx(sus_210, rel=1e-12)
    assert kinematic_from_saybolt(sus_210, 210.0) == pytest.approx(kv, rel=1e-10)
