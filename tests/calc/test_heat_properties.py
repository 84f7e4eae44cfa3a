"""Property tests of the tank heat balance over random tanks, loads and climates."""

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import assume, given, settings, strategies as st  # noqa: E402

from calc.methods.heat import shed_kw, tank_surfaces  # noqa: E402
from calc.tools.heat import tank_heat  # noqa: E402

tanks = st.fixed_dictionaries({
    "shape": st.sampled_from(["rectangular", "vertical", "horizontal"]),
    "length": st.floats(200.0, 4000.0), "width": st.floats(200.0, 3000.0),
    "height": st.floats(200.0, 3000.0), "diameter": st.floats(200.0, 3000.0),
    "fill": st.floats(0.05, 1.0), "surfaces": st.sampled_from(["wetted", "all"]),
})


def _level(tank):
    depth = tank["diameter"] if tank["shape"] == "horizontal" else tank["height"]
    return tank["fill"] * depth


@settings(max_examples=150, deadline=None)
@given(tanks, st.floats(0.05, 1.0), st.floats(-40.0, 60.0), st.floats(0.5, 100.0),
       st.floats(0.5, 100.0))
def test_shedding_rises_with_temperature(tank, emissivity, air_c, rise1, rise2):
    faces = tank_surfaces(tank["shape"], tank["length"], tank["width"], tank["height"],
                          tank["diameter"], _level(tank), tank["surfaces"])
    low, high = sorted((rise1, rise2))
    assert 0.0 <= shed_kw(faces, emissivity, air_c + low, air_c) <= shed_kw(faces, emissivity, air_c + high, air_c)


@settings(max_examples=100, deadline=None)
@given(tanks, st.floats(0.1, 50.0), st.floats(0.05, 1.0), st.floats(-30.0, 45.0), st.floats(5.0, 80.0))
def test_steady_state_balances_and_cooler_closes_the_gap(tank, power, emissivity, ambient, rise):
    # The shedding is continuous in temperature (the hot-plate correlation switches where its
    # two forms meet), so a steady state always balances the load.
    target = ambient + rise
    assume(target <= 150.0)
    result = tank_heat("power", power, 50.0, 0.0, 0.0, tank["shape"], tank["length"], tank["width"],
                       tank["height"], tank["diameter"], _level(tank), tank["surfaces"],
                       emissivity, 3.0, ambient, target)
    v = result.values
    faces = tank_surfaces(tank["shape"], tank["length"], tank["width"], tank["height"],
                          tank["diameter"], _level(tank), tank["surfaces"])
    if v["steady"] is not None:
        assert shed_kw(faces, emissivity, v["steady"], ambient) == pytest.approx(v["load"], rel=1e-6)
        assert (v["cooler"] > 0.0) == (v["steady"] > target)
    assert v["cooler"] == pytest.approx(max(0.0, v["load"] - v["shed_target"]))
    if v["time_to_target"] is not None and v["time_to_90"] is not None and v["steady"] is not None:
        # Reaching a target nearer the steady temperature takes longer.
        near = (target - ambient) > 0.9 * (v["steady"] - ambient)
        assert (v["time_to_target"] >= v["time_to_90"]) == near
