"""Water-in-oil constants checked against the general reference library `chemicals`."""

import pytest

chemicals = pytest.importorskip("chemicals")

from calc.methods.water import WATER_DENSITY_KG_M3, water_volume_ml  # noqa: E402


def test_water_density_at_20c_matches_iapws95():
    # IAPWS-95 liquid water at 20 degC and 1 atm, chemicals.iapws95_rho: 998.2 kg/m3 to 0.05.
    rho = chemicals.iapws95_rho(293.15, 101325.0)
    assert WATER_DENSITY_KG_M3 == pytest.approx(rho, abs=0.05)


def test_tank_water_volume_with_iapws95_density():
    # 500 ppm by mass in 200 L of oil at 870 kg/m3: 87 g of water, volume by IAPWS-95 density.
    rho = chemicals.iapws95_rho(293.15, 101325.0)
    assert water_volume_ml(500.0, 200.0, 870.0) == pytest.approx(87.0 / rho * 1000.0, rel=1e-4)
