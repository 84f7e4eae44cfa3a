"""Troubleshooting checklist: water in the oil.

Symptoms and readings (water content in ppm, % saturation from an inline sensor,
oil temperature) ranked over the causes of site_src/checklists/water.md.
Without a sensor reading, the % saturation is worked out from the ppm and the oil
temperature with calc.water's saturation line for the oil type.
"""

from __future__ import annotations

from . import water
from .checklists import (AGAINST, MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom,
                         checklist_result, count_entered, symptom_fields, RANKING_OUTPUTS)
from .registry import Field, Output, tool
from .result import Q

CAUSES = (
    ("condensation", "Condensation from humid air through the breather"),
    ("seal-ingress", "Water getting in at seals, hatches or the filler"),
    ("cooler-leak", "Leaking water-cooled oil cooler"),
    ("wet-topup", "Wet new oil or dirty top-up containers"),
    ("emulsion", "Oil holding water instead of letting it settle"),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
SYMPTOMS = (
    Symptom("milky_oil", "Oil milky or hazy, does not clear from the bottom up",
            (("emulsion", MODERATE, "milky oil: the water stays mixed in"),
             (("cooler-leak", "seal-ingress"), WEAK, "milky oil: much water in the oil"))),
    Symptom("free_water", "Water found at the tank drain or sample bottom",
            ((("cooler-leak", "seal-ingress", "condensation"), WEAK, "free water at the drain"),
             ("emulsion", AGAINST, "free water settles out: the oil lets go of water"))),
    Symptom("cools_overnight", "Machine stands idle and cools, or the room is humid",
            (("condensation", STRONG, "the tank cools and breathes in humid air"),)),
    Symptom("rust_top", "Rust or drops on the inside of the tank lid or breather",
            (("condensation", MODERATE, "rust or drops inside the lid: condensation"),)),
    Symptom("washdown", "Machine is washed down, stands outdoors or near steam",
            (("seal-ingress", STRONG, "machine washed down or outdoors"),)),
    Symptom("seals_worn", "Rod wipers, hatch or filler seals worn or missing",
            (("seal-ingress", MODERATE, "worn wipers or seals let water past"),)),
    Symptom("water_cooler", "Machine has a water-cooled oil cooler",
            (("cooler-leak", WEAK, "a water-cooled cooler can leak into the oil"),)),
    Symptom("cooling_water_lost", "Cooling water used up, or water pressure above oil pressure "
            "in the cooler",
            (("cooler-leak", STRONG, "cooling water lost, or at a higher pressure than the oil"),)),
    Symptom("after_topup", "Started after a top-up or oil change",
            (("wet-topup", STRONG, "started after a top-up or oil change"),
             ("emulsion", WEAK, "a different oil may not shed water"))),
    Symptom("drums_outside", "Oil drums stored outside or left open",
            (("wet-topup", MODERATE, "drums outside breathe in rain water"),)),
)

# Common practice, from memory: a hydraulic oil is kept below about 200 ppm; above 500 ppm
# it is wet enough to act on; above 1000 ppm (0.1 %) water is coming in in quantity.
WATCH_PPM = 200.0
ACT_PPM = 500.0
LARGE_PPM = 1000.0
# Common practice: in-line sensors; above 80 % saturation free water is near, at 100 % present.
WATCH_SATURATION_PCT = 80.0
FREE_SATURATION_PCT = 100.0
# Common practice: oil that runs below about 40 degC does not drive off the water it takes in.
COOL_RUNNING_C = 40.0

OIL_CHOICES = tuple(c for c in water.OIL_CHOICES if c[0] != water.OWN_CALIBRATION)

CAUTION = ("Drain water only with the machine stopped, locked out and the tank at atmospheric "
           "pressure; oil may be hot. Stop a cooler's water supply and relieve both circuits "
           "before opening it. Collect oily water and dispose of it by local rules.")


def _score_readings(board: Scoreboard, ppm, rh, temp) -> list[tuple]:
    """Points for the readings; returns the (level, template, *Q) verdicts they call for."""
    verdicts = []
    ingress = ("condensation", "seal-ingress", "cooler-leak", "wet-topup")
    if ppm is not None:
        if ppm >= LARGE_PPM:
            board.add_each(("cooler-leak", "seal-ingress"), MODERATE,
                           "water content {0}, more than {1}: water coming in in quantity",
                           Q(ppm, "ppm"), Q(LARGE_PPM, "ppm"))
            board.add("condensation", AGAINST, "water content {0}: more than breathing alone "
                                               "usually brings in", Q(ppm, "ppm"))
        elif ppm >= WATCH_PPM:
            board.add_each(ingress, WEAK, "water content {0}, above the {1} common practice aims "
                                          "for", Q(ppm, "ppm"), Q(WATCH_PPM, "ppm"))
        if ppm >= ACT_PPM:
            verdicts.append(("act", "Water content {0}, above {1}: find the way in and dry the "
                             "oil before the pump and bearings suffer.", Q(ppm, "ppm"),
                             Q(ACT_PPM, "ppm")))
        elif ppm >= WATCH_PPM:
            verdicts.append(("watch", "Water content {0}, above the {1} aimed for: watch the "
                             "trend.", Q(ppm, "ppm"), Q(WATCH_PPM, "ppm")))
        else:
            verdicts.append(("ok", "Water content {0}, under the {1} aimed for.",
                             Q(ppm, "ppm"), Q(WATCH_PPM, "ppm")))
    if rh is not None:
        if rh >= FREE_SATURATION_PCT:
            board.add("emulsion", WEAK, "water at {0} of saturation: free water present",
                      Q(rh, "percent"))
            verdicts.append(("act", "Water at {0} of saturation: the oil holds all it can and "
                             "free water is present; drain it and find the way in.",
                             Q(rh, "percent")))
        elif rh >= WATCH_SATURATION_PCT:
            verdicts.append(("watch", "Water at {0} of saturation: free water forms when the "
                             "oil cools; check with the water-in-oil tool.", Q(rh, "percent")))
        else:
            verdicts.append(("ok", "Water at {0} of saturation: it stays dissolved at this "
                             "temperature.", Q(rh, "percent")))
    if temp is not None and temp < COOL_RUNNING_C:
        board.add("condensation", WEAK, "oil runs at {0}, below {1}: too cool to drive off water",
                  Q(temp, "temperature"), Q(COOL_RUNNING_C, "temperature"))
    return verdicts


@tool(
    "checklist-water",
    title="Water in the oil: what to check first",
    summary="Tick what you see and enter the readings you have; the ways water gets in are "
            "ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        *symptom_fields(SYMPTOMS),
        Field("ppm", "Water content (lab, Karl Fischer)", "ppm", None, min=0.0, max=1.0e6,
              optional=True),
        Field("rh", "Water sensor reading (% saturation)", "percent", None, min=0.0, max=100.0,
              optional=True, help="What an inline water sensor shows."),
        Field("temp", "Oil temperature in service", "temperature", None, min=-40.0, max=150.0,
              optional=True),
        Field("oil", "Oil type", "choice", "mineral-aw", choices=OIL_CHOICES,
              help="Sets how much water the oil holds dissolved (calc.water presets)."),
    ),
    outputs=(*RANKING_OUTPUTS,
             Output("saturation", "Water against saturation", "percent",
                    "The sensor's reading, or worked out from ppm and temperature.")),
)
def checklist_water(ppm=None, rh=None, temp=None, oil="mineral-aw", **symptoms):
    """Rank the ways water gets into the oil from the ticked SYMPTOMS and readings."""
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    saturation = rh
    if rh is None and ppm is not None and temp is not None:
        line = water.saturation_line(oil)
        saturation = water.relative_saturation_pct(ppm, temp, line.a, line.b)
    verdicts = _score_readings(board, ppm, saturation, temp)
    entered = ticked + count_entered(ppm, rh, temp)
    result = checklist_result(board, entered, CAUTION, verdicts)
    result.values["saturation"] = saturation
    if saturation is not None and rh is None:
        result.note("Saturation worked out from {0} at {1} with the preset line of this oil type "
                    "(from memory); the water-in-oil tool takes an own calibration.",
                    Q(ppm, "ppm"), Q(temp, "temperature"))
    result.sources += ["Saturation: calc.water preset lines, from memory"]
    result.sources.append("Water limits 200 / 500 / 1000 ppm and 80 / 100 % saturation: "
                          "common practice, from memory")
    return result
