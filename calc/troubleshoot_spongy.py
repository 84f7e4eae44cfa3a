"""Troubleshooting checklist: spongy, jerky or sluggish motion.

Symptoms and readings (oil temperature, entrained air) ranked over the causes of
site_src/checklists/spongy.md. The air-stiffness tool turns an air content and a
pressure into the loss of stiffness; the viscosity tools tell how thick the oil
is at the temperature entered here.
"""

from __future__ import annotations

from . import air
from .checklists import (AGAINST, MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom,
                         checklist_result, count_entered, symptom_fields, RANKING_OUTPUTS)
from .registry import Field, Output, tool
from .result import Q

CAUSES = (
    ("entrained-air", "Air carried in the oil"),
    ("trapped-air", "Air trapped in cylinders or high points"),
    ("cold-oil", "Oil too thick while cold"),
    ("internal-leakage", "Leakage past seals or valve spools"),
    ("soft-lines", "Long or soft hoses swelling under pressure"),
    ("low-pressure", "Supply pressure too low for the load"),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
SYMPTOMS = (
    Symptom("foam_or_cloudy", "Foam in the tank or cloudy oil",
            (("entrained-air", STRONG, "foam or cloudy oil: air in the oil"),)),
    Symptom("after_repair", "Started after the circuit was opened or refilled",
            (("trapped-air", STRONG, "started after the circuit was opened: not bled"),)),
    Symptom("springy_stop", "Actuator bounces or springs back when it stops",
            ((("entrained-air", "trapped-air", "soft-lines"), WEAK,
              "springs back when stopped: something in the column gives"),)),
    Symptom("jerky_slow", "Jerky at low speed",
            ((("trapped-air", "entrained-air"), WEAK, "jerky at low speed"),)),
    Symptom("worse_cold", "Worse with cold oil, better once warm",
            (("cold-oil", STRONG, "worse cold, better warm"),)),
    Symptom("drifts", "A held cylinder creeps or drifts",
            (("internal-leakage", STRONG, "a held cylinder drifts: oil passes a seal or spool"),)),
    Symptom("slow_under_load", "Slow only under load",
            ((("internal-leakage", "low-pressure"), MODERATE, "slow only under load"),)),
    Symptom("long_hoses", "Long hoses between valve and actuator",
            (("soft-lines", MODERATE, "long hoses swell and store oil"),)),
    Symptom("pressure_drops", "Gauge pressure falls under load",
            (("low-pressure", STRONG, "pressure falls under load"),
             ("internal-leakage", WEAK, "pressure falls under load: the pump may leak inside"))),
)

# Common practice, from memory: well-deaerated oil in service carries well under 1 % air by
# volume; from about 1 % the column turns noticeably soft at low and medium pressure. Used
# when no working pressure is entered; with one, the stiffness loss of calc.air decides.
AIR_WATCH_PCT = 1.0
# Common practice: below about 15 degC most hydraulic oils are several times thicker than at
# working temperature; above 30 degC cold oil is not the cause.
COLD_C = 15.0
WARM_C = 30.0

CAUTION = ("Before bleeding air or opening a line, stop the machine, lower or block raised "
           "loads, relieve accumulators and lock out; bleed through the proper bleed screws "
           "only, never by loosening a fitting under pressure. Keep clear of moving parts.")


def stiffness_loss_pct(air_pct: float, pressure_bar: float) -> float:
    """Loss of stiffness [%] of oil holding `air_pct` free air (at atmospheric) at a gauge pressure.

    loss = 100 (1 - K_eff / K_oil), with the air compressed isothermally to the working
    pressure and K_eff from the mixture rule of calc.air (1/K = (1-x)/K_oil + x/p).

    >>> round(stiffness_loss_pct(1.0, 10.0), 1)
    57.4

    Source: calc.air (Boyle's law and the mixture rule, Merritt 1967, from memory).
    """
    p_abs = pressure_bar + air.P_ATM_BAR
    x = air.air_fraction_at_pressure(air_pct / 100.0, p_abs)
    return 100.0 * (1.0 - air.effective_bulk_modulus(air.K_OIL_BAR, x, p_abs) / air.K_OIL_BAR)


def _score_air(board: Scoreboard, air_content, pressure):
    """Points for an entered air content; the stiffness loss [%] when a pressure is known."""
    if air_content is None:
        return None
    if pressure is None:
        board.weigh("entrained-air", air_content >= AIR_WATCH_PCT, STRONG,
                    "{0} air in the oil, at or above {1}", "{0} air in the oil, under {1}",
                    Q(air_content, "percent"), Q(AIR_WATCH_PCT, "percent"))
        return None
    loss = stiffness_loss_pct(air_content, pressure)
    board.weigh("entrained-air", loss >= air.LOSS_WATCH_PCT, STRONG,
                "{0} air makes the oil {2} softer at {1}",
                "{0} air makes the oil only {2} softer at {1}",
                Q(air_content, "percent"), Q(pressure, "pressure"), Q(loss, "percent"))
    return loss


@tool(
    "checklist-spongy",
    title="Spongy or sluggish motion: what to check first",
    summary="Tick what you see and enter the readings you have; the causes of soft, jerky or "
            "slow motion are ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        *symptom_fields(SYMPTOMS),
        Field("temp", "Oil temperature", "temperature", None, min=-40.0, max=150.0,
              optional=True),
        Field("air_content", "Entrained air, by volume at atmospheric pressure", "percent", None,
              min=0.0, max=50.0, optional=True, help="From a sample or the air-stiffness tool."),
        Field("pressure", "Working pressure (gauge)", "pressure", None, min=0.0, max=1000.0,
              optional=True, help="With the air content, gives the loss of stiffness."),
    ),
    outputs=(*RANKING_OUTPUTS,
             Output("stiffness_loss", "Stiffness lost to the air", "percent")),
)
def checklist_spongy(temp=None, air_content=None, pressure=None, **symptoms):
    """Rank the causes of spongy or sluggish motion from the ticked SYMPTOMS and readings."""
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    if temp is not None:
        if temp < COLD_C:
            board.add("cold-oil", MODERATE, "oil at {0}, below {1}: several times thicker than "
                      "when warm", Q(temp, "temperature"), Q(COLD_C, "temperature"))
        elif temp > WARM_C:
            board.add("cold-oil", AGAINST, "oil at {0}: warm enough", Q(temp, "temperature"))
    loss = _score_air(board, air_content, pressure)
    entered = ticked + count_entered(temp, air_content)
    result = checklist_result(board, entered, CAUTION)
    result.values["stiffness_loss"] = loss
    result.sources += ["Air content 1 %, oil below 15 °C: common practice, from memory",
                       "Stiffness loss: calc.air mixture rule (air-stiffness tool)"]
    return result
