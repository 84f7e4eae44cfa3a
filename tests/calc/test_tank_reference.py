"""Tank volumes against fluids.geometry.TANK (Caleb Bell's `fluids`, used in tests only)."""

import pytest

fluids = pytest.importorskip("fluids")
from fluids.geometry import TANK  # noqa: E402

from calc.methods.tank import level_for_volume_mm, volume_at_level_l  # noqa: E402


@pytest.mark.parametrize("level_m", [0.0, 0.01, 0.25, 0.5, 0.73, 0.99, 1.0])
def test_horizontal_cylinder_flat_ends(level_m):
    # fluids.geometry.TANK(D=1, L=2, horizontal=True): flat ends by default; 0.25 m gives 307.09 L.
    ref = TANK(D=1.0, L=2.0, horizontal=True).V_from_h(level_m) * 1000.0
    ours = volume_at_level_l("horizontal", 2000.0, 0.0, 0.0, 1000.0, level_m * 1000.0)
    assert ours == pytest.approx(ref, rel=1e-9, abs=1e-9)


@pytest.mark.parametrize("level_m", [0.0, 0.3, 1.2, 2.5])
def test_vertical_cylinder_flat_bottom(level_m):
    ref = TANK(D=1.4, L=2.5, horizontal=False).V_from_h(level_m) * 1000.0
    assert volume_at_level_l("vertical", 0.0, 0.0, 2500.0, 1400.0, level_m * 1000.0) == pytest.approx(ref, abs=1e-9)


@pytest.mark.parametrize("volume_l", [1.0, 307.0924, 800.0, 1500.0])
def test_horizontal_inverse_against_fluids(volume_l):
    # The level we solve for holds the asked volume by fluids' own V_from_h. (fluids' h_from_V
    # stops its solver early: up to 1 mm off at 1 L, so it is not the yardstick here.)
    level_mm = level_for_volume_mm("horizontal", 2000.0, 0.0, 0.0, 1000.0, volume_l)
    ref_l = TANK(D=1.0, L=2.0, horizontal=True).V_from_h(level_mm / 1000.0) * 1000.0
    assert ref_l == pytest.approx(volume_l, rel=1e-9)


def test_full_volumes_against_fluids():
    assert volume_at_level_l("horizontal", 3000.0, 0.0, 0.0, 1200.0, 1200.0) == pytest.approx(
        TANK(D=1.2, L=3.0, horizontal=True).V_total * 1000.0)
