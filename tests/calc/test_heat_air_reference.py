"""Air properties at 1 atm (Incropera Table A.4, carried in calc.convection) against the
Lemmon and Jacobsen (2004) transport formulation and Lemmon et al. (2000) equation of state
for air, as implemented in `chemicals` (tests only)."""

import pytest

chemicals = pytest.importorskip("chemicals")
from chemicals import air as lemmon  # noqa: E402

from calc.kernel.constants import ZERO_CELSIUS_K as KELVIN  # noqa: E402
from calc.methods.convection import AIR_1ATM, air_properties  # noqa: E402

ATM_PA = 101325.0


def _reference(temp_k):
    """(nu [m^2/s], k [W/(m K)], Pr) of air at 1 atm from the Lemmon formulations."""
    rho = lemmon.lemmon2000_rho(temp_k, ATM_PA)  # mol/m^3
    tau, delta = lemmon.lemmon2000_air_T_reducing / temp_k, rho / lemmon.lemmon2000_air_rho_reducing
    # Isobaric heat capacity from the Helmholtz energy derivatives (Lemmon et al. 2000, table 3).
    cv = -tau ** 2 * (lemmon.lemmon2000_air_d2A0_dtau2(tau, delta)
                      + lemmon.lemmon2000_air_d2Ar_dtau2(tau, delta))
    ar_d = lemmon.lemmon2000_air_dAr_ddelta(tau, delta)
    num = (1 + delta * ar_d - delta * tau * lemmon.lemmon2000_air_d2Ar_ddeltadtau(tau, delta)) ** 2
    den = 1 + 2 * delta * ar_d + delta ** 2 * lemmon.lemmon2000_air_d2Ar_ddelta2(tau, delta)
    cp = (cv + num / den) * lemmon.lemmon2000_air_R / lemmon.lemmon2000_air_MW * 1000.0  # J/(kg K)
    mu = chemicals.mu_air_lemmon(temp_k, rho)
    k = chemicals.k_air_lemmon(temp_k, rho)
    rho_kg = rho * lemmon.lemmon2000_air_MW / 1000.0
    return mu / rho_kg, k, mu * cp / k


@pytest.mark.parametrize("row", AIR_1ATM, ids=lambda r: f"{r[0]:g}K")
def test_table_rows_agree_with_lemmon(row):
    # Table A.4 rests on older data than Lemmon-Jacobsen: they agree to about 1 % in nu and 2 %
    # in k and Pr between 200 K and 700 K (measured here), enough for a film coefficient.
    nu, k, pr = air_properties(row[0] - KELVIN)
    ref_nu, ref_k, ref_pr = _reference(row[0])
    assert nu == pytest.approx(ref_nu, rel=0.015)
    assert k == pytest.approx(ref_k, rel=0.025)
    assert pr == pytest.approx(ref_pr, rel=0.03)


@pytest.mark.parametrize("temp_c", [-30.0, 12.5, 47.0, 88.0, 140.0])
def test_interpolated_values_agree_with_lemmon(temp_c):
    nu, k, pr = air_properties(temp_c)
    ref_nu, ref_k, ref_pr = _reference(temp_c + KELVIN)
    assert nu == pytest.approx(ref_nu, rel=0.015)
    assert k == pytest.approx(ref_k, rel=0.025)
    assert pr == pytest.approx(ref_pr, rel=0.03)
