"""Troubleshooting checklist: water in the oil.

Symptoms and readings (water content in ppm, % saturation from an inline sensor,
oil temperature) ranked over the ways water gets in; why each happens is told in
site_src/checklists/checklist-water.md.
"""

from __future__ import annotations

from ..kernel.grading import Band
from ..kernel.registry import Field, Output
from ..kernel.result import Q, Result
from ..methods.water import relative_saturation_pct
from ..tools import water
from .scoreboard import (AGAINST, MODERATE, READING_BASIS, STRONG, WEAK, Cause, Check,
                         Scoreboard, Symptom, checklist)

CAUSES = (
    Cause("condensation", 'Condensation from humid air through the breather',
          checks=(
              Check("look-inside", 'Look at the inside of the filler cap and lid for rust or '
                    'drops of water.'),
              Check("check-breather", 'Check that the breather is a desiccant or sealed type in '
                    'good order, not an open cap.'),
              Check("read-water", 'Read the water content against saturation at the coldest the '
                    'oil gets overnight.', tool="water-in-oil"),
          ),
          caution='Open the filler only with the machine stopped and the tank at atmospheric '
                  'pressure; a pressurised tank can spray hot oil.'),
    Cause("seal-ingress", 'Water getting in at seals, hatches or the filler',
          checks=(
              Check("walk-round", 'Walk round the machine: lid and hatch gaskets, filler cap, '
                    'cable glands, and cylinder rod wipers.'),
              Check("ask-how", 'Ask how and where the machine is cleaned; keep hoses and steam '
                    'lances off the tank and the cylinders.'),
              Check("renew-wipers", 'Renew wipers and gaskets that are cracked or missing.'),
          ),
          caution='Before work on cylinders, lower or block raised loads and relieve stored '
                  'pressure in accumulators; lock out the machine.'),
    Cause("cooler-leak", 'Leaking water-cooled oil cooler',
          checks=(
              Check("note-water", 'Note whether the water appears after stops, when the water '
                    'side keeps its pressure and the oil side has none.'),
              Check("check-cooling", 'Check the cooling water for an oil sheen, and the water '
                    'meter for unexplained use.'),
              Check("cooler-pressure", 'Have the cooler pressure-tested by someone qualified to '
                    'do it.'),
          ),
          caution='Isolate and relieve both the water and the oil circuits and lock them out '
                  'before opening a cooler; both may be hot.'),
    Cause("wet-topup", 'Wet new oil or dirty top-up containers',
          checks=(
              Check("see-where", 'See where drums are stored: on their side or under cover, '
                    'bungs tight.'),
              Check("sample-new", 'Have a sample of the new oil tested for water before it goes '
                    'in.', tool="water-in-oil"),
              Check("top-only", 'Top up only through a filter cart or a quick coupling with a '
                    'filter.'),
          ),
          caution='Handle drums with proper lifting gear; wipe up spills at once to avoid '
                  'slips.'),
    Cause("emulsion", 'Oil holding water instead of letting it settle',
          checks=(
              Check("leave-sample", 'Leave a sample standing warm overnight: water that settles '
                    'out is free water, a haze that stays is an emulsion.'),
              Check("ask-lab", "Ask for the lab's water separation test and check the oil's "
                    'condition.', tool="oil-condition"),
              Check("ask-else", 'Ask what else went into the tank lately.'),
          ),
          caution='Collect oily water in closed containers and dispose of it by local rules; it '
                  'must not go into drains.'),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
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
# A sensor's % saturation and a lab's ppm of one oil disagree past this many points of
# saturation (common practice: sensors read to about ±3 %, saturation lines to ±25 %).
INCONSISTENT_POINTS = 30.0
# Common practice: in-line sensors; above 80 % saturation free water is near, at 100 % present.
WATCH_SATURATION_PCT = 80.0
FREE_SATURATION_PCT = 100.0
# Common practice: oil that runs below about 40 degC does not drive off the water it takes in.
COOL_RUNNING_C = 40.0

PPM_BANDS = (
    Band("act", "Water content {ppm}, above {act}: find the way in and dry the oil before the "
                "pump and bearings suffer.", at_least=ACT_PPM),
    Band("watch", "Water content {ppm}, above the {watch} aimed for: watch the trend.",
         at_least=WATCH_PPM),
    Band("ok", "Water content {ppm}, under the {watch} aimed for."),
)
SATURATION_BANDS = (
    Band("act", "Water at {rh} of saturation: the oil holds all it can and free water is "
                "present; drain it and find the way in.", at_least=FREE_SATURATION_PCT),
    Band("watch", "Water at {rh} of saturation: free water forms when the oil cools; check "
                  "with the water-in-oil tool.", at_least=WATCH_SATURATION_PCT),
    Band("ok", "Water at {rh} of saturation: it stays dissolved at this temperature."),
)

INGRESS = ("condensation", "seal-ingress", "cooler-leak", "wet-topup")


@checklist(
    "checklist-water",
    title="Water in the oil: what to check first",
    summary="Tick what you see and enter the readings you have; the ways water gets in are "
            "ranked, each with its checks and cautions.",
    causes=CAUSES,
    symptoms=SYMPTOMS,
    readings=(
        Field("ppm", "Water content (lab, Karl Fischer)", "ppm", None, min=0.0, max=1.0e6,
              optional=True, tracks="water_ppm"),
        Field("rh", "Water sensor reading (% saturation)", "percent", None, min=0.0, max=100.0,
              optional=True, tracks="water_saturation", help="What an inline water sensor shows."),
        Field("temp", "Oil temperature in service", "temperature", None, min=-40.0, max=150.0,
              tracks="oil_temp",
              optional=True),
        Field("oil", "Oil type", "choice", "mineral-aw", choices=water.OIL_CHOICES,
              binds="oil_family", help="Sets how much water the oil holds dissolved (the "
                                       "water-in-oil tool's presets, or an own calibration)."),
        *water.calibration_fields(),
    ),
    outputs=(Output("saturation", "Water against saturation", "percent",
                    "The sensor's reading, or worked out from ppm and temperature.",
                    tracks="water_saturation"),),
    caution="Drain water only with the machine stopped, locked out and the tank at atmospheric "
            "pressure; oil may be hot. Stop a cooler's water supply and relieve both circuits "
            "before opening it. Collect oily water and dispose of it by local rules.",
    sources=("Saturation: the water-in-oil tool's preset lines, from memory",
             "Water limits 200 / 500 / 1000 ppm and 80 / 100 % saturation: common practice, "
             "from memory"),
)
def checklist_water(board: Scoreboard, found: Result, ppm, rh, temp, oil, cal_temp1, cal_ppm1,
                    cal_temp2, cal_ppm2):
    """Rank the ways water gets into the oil from the ticked SYMPTOMS and readings.

    Without a sensor reading, the % saturation is worked out from the ppm and the oil
    temperature with calc.water's saturation line for the oil type.
    """
    saturation = rh
    if rh is None and ppm is not None and temp is not None:
        line = water.saturation_line(oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
        saturation = relative_saturation_pct(ppm, temp, line.a, line.b)
    elif rh is not None and ppm is not None and temp is not None:
        # Both readings of one oil at one temperature: they should tell the same story.
        line = water.saturation_line(oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
        from_ppm = relative_saturation_pct(ppm, temp, line.a, line.b)
        if abs(from_ppm - rh) > INCONSISTENT_POINTS:
            found.note("The two water readings disagree: the lab's {ppm} is {from_ppm} of "
                       "saturation at {temp} for this oil, the sensor says {rh}. Check the "
                       "sensor's calibration, when and where each sample was taken, and the oil "
                       "type (or its own calibration) before trusting either.",
                       ppm=Q(ppm, "ppm"), from_ppm=Q(from_ppm, "percent"), temp=Q(temp, "temperature"),
                       rh=Q(rh, "percent"))
    found.values["saturation"] = saturation
    if ppm is not None:
        if ppm >= LARGE_PPM:
            board.add_each(("cooler-leak", "seal-ingress"), MODERATE,
                           "water content {0}, more than {1}: water coming in in quantity",
                           Q(ppm, "ppm"), Q(LARGE_PPM, "ppm"))
            board.add("condensation", AGAINST, "water content {0}: more than breathing alone "
                                               "usually brings in", Q(ppm, "ppm"))
        elif ppm >= WATCH_PPM:
            board.add_each(INGRESS, WEAK, "water content {0}, above the {1} common practice "
                                          "aims for", Q(ppm, "ppm"), Q(WATCH_PPM, "ppm"))
        found.grade(ppm, PPM_BANDS, READING_BASIS, ppm=Q(ppm, "ppm"),
                    watch=Q(WATCH_PPM, "ppm"), act=Q(ACT_PPM, "ppm"))
    if saturation is not None:
        if saturation >= FREE_SATURATION_PCT:
            board.add("emulsion", WEAK, "water at {0} of saturation: free water present",
                      Q(saturation, "percent"))
        found.grade(saturation, SATURATION_BANDS, READING_BASIS, rh=Q(saturation, "percent"))
    if temp is not None and temp < COOL_RUNNING_C:
        board.add("condensation", WEAK, "oil runs at {0}, below {1}: too cool to drive off water",
                  Q(temp, "temperature"), Q(COOL_RUNNING_C, "temperature"))
    if saturation is not None and rh is None:
        found.note("Saturation worked out from {0} at {1} with the saturation line of this oil "
                   "(a preset from memory, or the own calibration given).",
                   Q(ppm, "ppm"), Q(temp, "temperature"))
