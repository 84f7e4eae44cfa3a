"""Ageing constants checked against a general reference library (fluids, tests only)."""

import math

import pytest

fluids_constants = pytest.importorskip("fluids.constants")

from calc.kernel.constants import GAS_CONSTANT  # noqa: E402
from calc.methods.ageing import activation_energy_for_doubling  # noqa: E402


def test_gas_constant_matches_codata():
    # fluids.constants.R: CODATA 2018 molar gas constant.
    assert GAS_CONSTANT == pytest.approx(fluids_constants.R, rel=1e-9)


def test_activation_energy_from_reference_constants():
    # Ea = R T^2 ln 2 / 10 K at 60 degC, with R and the kelvin offset from fluids.constants.
    t_ref = 60.0 + fluids_constants.zero_Celsius
    expected = fluids_constants.R * t_ref ** 2 * math.log(2.0) / 10.0
    assert activation_energy_for_doubling(60.0) == pytest.approx(expected, rel=1e-9)
