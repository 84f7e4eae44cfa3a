"""calc.lines friction factors against the `fluids` library (used in tests only)."""

import pytest

fluids = pytest.importorskip("fluids")
from fluids.friction import friction_factor as fluids_friction  # noqa: E402

from calc.methods.lines import friction_factor  # noqa: E402


@pytest.mark.parametrize("re", [1.0, 10.0, 100.0, 640.0, 1500.0, 2000.0])
def test_laminar_against_fluids(re):
    # fluids.friction.friction_factor returns 64/Re below its laminar limit (Re 2040).
    assert friction_factor(re, 0.001) == pytest.approx(fluids_friction(Re=re, eD=0.001), rel=1e-12)


@pytest.mark.parametrize("re", [4000.0, 1.0e4, 5.0e4, 1.0e5, 1.0e6, 1.0e7, 1.0e8])
@pytest.mark.parametrize("ed", [0.0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05])
def test_turbulent_against_fluids_colebrook(re, ed):
    # fluids' exact Colebrook (Lambert W solution) and its default Clamond (1998) solver.
    mine = friction_factor(re, ed)
    assert mine == pytest.approx(fluids_friction(Re=re, eD=ed, Method="Colebrook"), rel=1e-9)
    assert mine == pytest.approx(fluids_friction(Re=re, eD=ed), rel=1e-9)
