"""The suction check at a cold start against an independent computation with `fluids`.

fluids (used in tests only) gives Hooper's 2-K factors of the elbows and valve
(fluids.fittings.Hooper2K, Hooper 1981) and Churchill's friction factor
(fluids.friction.Churchill_1977); the entrance is Hooper's K = 160/Re + 0.5 by hand, and the
velocity head carries the laminar kinetic-energy factor 2.
"""

import math

import pytest

fluids = pytest.importorskip("fluids")
from fluids.fittings import Hooper, Hooper2K  # noqa: E402
from fluids.friction import Churchill_1977  # noqa: E402

from calc import bridge  # noqa: E402
from calc.methods import fittings  # noqa: E402
from calc.methods.viscosity import walther_fit, walther_viscosity  # noqa: E402


def _inlet_by_fluids(temp_c, flow_lpm=100.0, bore_mm=50.0, length_m=1.5, roughness_mm=0.045,
                     head_m=0.3, strainer_bar=0.05, density=870.0, atmosphere_bar=1.013):
    """p_inlet [bar abs]: a sharp entry, two screwed 90° elbows and a full-bore gate valve."""
    kv = walther_viscosity(temp_c, *walther_fit(40.0, 46.0, 100.0, 6.8)) * 1e-6
    d = bore_mm / 1000.0
    v = flow_lpm / 60000.0 / (math.pi / 4.0 * d * d)
    re = v * d / kv
    d_in = bore_mm / 25.4
    k = (160.0 / re + 0.5
         + 2 * Hooper2K(Di=d_in, Re=re, name="Elbow, 90°, Standard (R/D = 1), Screwed")
         + Hooper2K(Di=d_in, Re=re, name="Valve, Gate, Full line size, Beta = 1"))
    alpha = 2.0 if re <= 2300.0 else 1.0 if re >= 4000.0 else 2.0 - (re - 2300.0) / 1700.0
    f = Churchill_1977(re, roughness_mm / bore_mm)
    loss_pa = (alpha + k + f * length_m / d) * density * v * v / 2.0
    return atmosphere_bar + (density * 9.80665 * head_m - loss_pa) / 1e5 - strainer_bar


def test_hooper_constants_are_the_published_ones():
    # Hooper (1981) as carried by fluids.fittings.Hooper.
    assert fittings.ELBOW_90 == Hooper["Elbow, 90°, Standard (R/D = 1), Screwed"]
    assert fittings.BEND_90 == Hooper["Elbow, 90°, Long-radius (R/D = 1.5), All types"]
    assert fittings.ELBOW_45 == Hooper["Elbow, 45°, Standard (R/D = 1), All types"]
    assert fittings.FULL_BORE_VALVE == Hooper["Valve, Gate, Full line size, Beta = 1"]
    assert fittings.BUTTERFLY_VALVE == Hooper["Valve, Butterfly,"]
    # fluids files the tee used as an elbow under "Elbow, Used as, Standard, Screwed".
    assert fittings.TEE_BRANCH == Hooper["Elbow, Used as, Standard, Screwed"]


@pytest.mark.parametrize("re, bore_mm", [(50.0, 50.0), (1500.0, 25.0), (1.0e5, 100.0)])
def test_two_k_against_fluids(re, bore_mm):
    assert fittings.two_k(*fittings.ELBOW_90, re, bore_mm) == pytest.approx(
        Hooper2K(Di=bore_mm / 25.4, Re=re, name="Elbow, 90°, Standard (R/D = 1), Screwed"),
        rel=1e-12)


def test_cold_start_with_laminar_fittings():
    # The case of the engineering review: a sharp entry, two elbows and a gate valve at -5 degC
    # (strainer held constant) come to about 0.71 bar absolute, below the pump's 0.8: act.
    answer = bridge.run("suction-check", {"entry": "sharp", "elbows_90": 2, "suction_valve": "full_bore",
                                          "strainer_model": "constant", "temp_cold": -5}, examples=True)
    assert answer["ok"]
    assert answer["values"]["p_inlet_cold"] == pytest.approx(_inlet_by_fluids(-5.0), abs=1e-9)
    assert answer["values"]["p_inlet_cold"] == pytest.approx(0.71, abs=0.01)
    assert answer["level"] == "act"
    # At -5 degC the flow is laminar (Re about 47): the fittings lose more than ten times their
    # turbulent K (0.5 + 2 x 0.4 x 1.508 + 0.1 x 1.508 = 1.86 in a 50 mm bore), which a
    # constant-K model misses.
    assert answer["values"]["re_cold"] < 100.0
    assert answer["values"]["k_cold"] > 10 * 1.86


def test_warm_inlet_against_fluids():
    answer = bridge.run("suction-check", {"suction_valve": "full_bore", "strainer_model": "constant"}, examples=True)
    assert answer["values"]["p_inlet"] == pytest.approx(_inlet_by_fluids(50.0), abs=1e-9)


def test_a_breaking_column_reports_no_pressure_and_the_temperature_it_needs():
    # Without the model's guard the balance gives about -7 bar absolute at -20 degC: no such
    # pressure exists; the pump cannot fill, and the tool says how warm the oil must be.
    answer = bridge.run("suction-check", {"temp_cold": -20, "bypass": "no"}, examples=True)
    assert answer["values"]["p_inlet_cold"] is None
    assert answer["values"]["margin_cold"] is None
    cold = answer["verdicts"][-1]
    assert cold["level"] == "act" and "cannot fill" in cold["message"]
    assert answer["values"]["t_starve"] is not None and answer["values"]["t_starve"] > -20.0


def test_which_strainer_assumption_decides_is_said():
    # With no bypass the viscous strainer's cold drop alone breaks the column at 0 degC; a
    # bypass at 0.2 bar (common practice) would hold it there and change the verdict.
    answer = bridge.run("suction-check", {"temp_cold": 0, "bypass": "no"}, examples=True)
    notes = " ".join(answer["notes"])
    assert "The strainer decides the cold-start verdict" in notes
    with_bypass = bridge.run("suction-check", {"temp_cold": 0, "bypass": "yes"}, examples=True)
    assert with_bypass["values"]["strainer_cold"] == pytest.approx(0.2)
    assert with_bypass["values"]["p_inlet_cold"] is not None
