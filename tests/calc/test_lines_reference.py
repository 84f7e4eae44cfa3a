"""calc.methods.lines friction factors against the `fluids` library (used in tests only)."""

import pytest

fluids = pytest.importorskip("fluids")
from fluids.friction import Churchill_1977, friction_factor as fluids_friction  # noqa: E402

from calc.methods.lines import colebrook_friction, friction_factor  # noqa: E402

REYNOLDS = [1.0, 10.0, 100.0, 640.0, 1500.0, 2000.0, 2300.0, 3000.0, 4000.0, 1.0e4, 5.0e4,
            1.0e5, 1.0e6, 1.0e7, 1.0e8]
ROUGHNESS = [0.0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05]


@pytest.mark.parametrize("re", REYNOLDS)
@pytest.mark.parametrize("ed", ROUGHNESS)
def test_friction_is_churchill_1977_across_every_regime(re, ed):
    # fluids.friction.Churchill_1977: S. W. Churchill, Chem. Eng. 84 (1977) 91-92.
    assert friction_factor(re, ed) == pytest.approx(Churchill_1977(re, ed), rel=1e-12)


@pytest.mark.parametrize("re", [1.0, 10.0, 100.0, 640.0, 1000.0])
def test_laminar_against_fluids(re):
    # fluids.friction.friction_factor returns 64/Re below its laminar limit (Re 2040).
    assert friction_factor(re, 0.001) == pytest.approx(fluids_friction(Re=re, eD=0.001), rel=1e-12)


@pytest.mark.parametrize("re", [4000.0, 1.0e4, 5.0e4, 1.0e5, 1.0e6, 1.0e7, 1.0e8])
@pytest.mark.parametrize("ed", ROUGHNESS)
def test_colebrook_against_fluids(re, ed):
    # fluids' exact Colebrook (Lambert W solution) and its default Clamond (1998) solver.
    mine = colebrook_friction(re, ed)
    assert mine == pytest.approx(fluids_friction(Re=re, eD=ed, Method="Colebrook"), rel=1e-9)
    assert mine == pytest.approx(fluids_friction(Re=re, eD=ed), rel=1e-9)


@pytest.mark.parametrize("re", [1.0e4, 5.0e4, 1.0e5, 1.0e6, 1.0e7])
@pytest.mark.parametrize("ed", [0.0, 1e-6, 1e-5, 1e-4, 1e-3])
def test_churchill_keeps_close_to_colebrook_when_turbulent(re, ed):
    # Churchill's fit of the Moody chart: within 1.5 % of Colebrook from Re 1e4 to 1e7 on
    # smooth to moderately rough pipe (measured against fluids' exact Colebrook).
    colebrook = fluids_friction(Re=re, eD=ed, Method="Colebrook")
    assert friction_factor(re, ed) == pytest.approx(colebrook, rel=0.015)


def test_transition_is_churchill_not_a_straight_blend():
    # At Re 3000 a straight line from 64/2300 to Colebrook at 4000 reads 24 % low against
    # Churchill (1977); the line has to follow the one equation.
    assert friction_factor(3000.0, 1e-3) == pytest.approx(Churchill_1977(3000.0, 1e-3), rel=1e-12)
    blend = 64.0 / 2300.0 + (3000.0 - 2300.0) / 1700.0 * (colebrook_friction(4000.0, 1e-3)
                                                          - 64.0 / 2300.0)
    assert blend < 0.8 * Churchill_1977(3000.0, 1e-3)
