"""Well-mixed drying model and the water-drying tool."""

import math

import pytest

from calc import bridge
from calc.methods.drying import drying_time_min, halving_time_min, well_mixed_content_ppm
from calc.tools.drying import drying_target_ppm, water_drying
from calc.tools.water import saturation_line


def _run(**inputs):
    defaults = dict(reading="ppm", rh=30.0, ppm=400.0, temp=50.0, temp_cold=15.0, dryer_flow=20.0,
                    dryer_efficiency=40.0, oil_volume=1000.0, density=870.0, oil="mineral-aw")
    return water_drying(**{**defaults, **inputs})


def test_model_matches_its_differential_equation():
    # V dC/dt = -eta Q C integrated step by step (classical Runge-Kutta, 1 min steps) against
    # the closed form C0 exp(-eta Q t / V).
    c0, flow, eff, volume = 500.0, 15.0, 35.0, 800.0
    rate = lambda c: -eff / 100.0 * flow * c / volume  # noqa: E731
    c, h = c0, 1.0
    for _ in range(240):
        k1 = rate(c)
        k2 = rate(c + h / 2 * k1)
        k3 = rate(c + h / 2 * k2)
        k4 = rate(c + h * k3)
        c += h / 6 * (k1 + 2 * k2 + 2 * k3 + k4)
    assert well_mixed_content_ppm(c0, 240.0, flow, eff, volume) == pytest.approx(c, rel=1e-9)


@pytest.mark.parametrize("flow, eff, volume", [(20.0, 50.0, 600.0), (5.0, 10.0, 5000.0),
                                               (200.0, 90.0, 100.0)])
def test_content_halves_in_ln2_volume_over_eta_flow(flow, eff, volume):
    # Closed form: C(t) = C0 / 2 at t = ln(2) V / (eta Q).
    half = halving_time_min(flow, eff, volume)
    assert half == pytest.approx(math.log(2) * volume / (eff / 100 * flow), rel=1e-12)
    assert well_mixed_content_ppm(300.0, half, flow, eff, volume) == pytest.approx(150.0, rel=1e-12)
    assert drying_time_min(300.0, 150.0, flow, eff, volume) == pytest.approx(half, rel=1e-12)


def test_drying_time_reaches_the_target():
    minutes = drying_time_min(420.0, 95.0, 30.0, 25.0, 2500.0)
    assert well_mixed_content_ppm(420.0, minutes, 30.0, 25.0, 2500.0) == pytest.approx(95.0)
    assert drying_time_min(90.0, 95.0, 30.0, 25.0, 2500.0) == 0.0


def test_default_target_is_half_saturation_when_cold():
    # Common practice: at most 50 % of saturation at the coldest temperature.
    result = _run()
    sat_cold = saturation_line("mineral-aw").saturation(15.0)
    assert result.values["target_ppm"] == pytest.approx(0.5 * sat_cold)
    assert drying_target_ppm(sat_cold) == pytest.approx(0.5 * sat_cold)
    hours = result.values["hours"]
    assert hours * 60 == pytest.approx(drying_time_min(400.0, 0.5 * sat_cold, 20.0, 40.0, 1000.0))
    assert result.values["passes"] == pytest.approx(20.0 * hours * 60 / 1000.0)


def test_dry_oil_needs_no_drying():
    result = _run(ppm=50.0)
    assert result.values["hours"] == 0.0 and result.values["removed_ml"] == 0.0
    assert result.level == "ok"


def test_free_water_is_drained_first():
    result = _run(ppm=900.0, temp=30.0)
    assert result.verdicts[0].level == "act"
    assert any("used oil" in n.template for n in result.notes)


def test_target_above_cold_saturation_is_act():
    sat_cold = saturation_line("mineral-aw").saturation(15.0)
    assert _run(ppm=600.0, target_ppm=1.2 * sat_cold).level == "act"
    assert _run(ppm=600.0, temp=70.0, target_ppm=0.8 * sat_cold).level == "watch"


def test_bridge_names_bad_efficiency():
    answer = bridge.run("water-drying", {"dryer_efficiency": "0"}, examples=True)
    assert not answer["ok"] and answer["errors"][0]["field"] == "dryer_efficiency"
