"""Troubleshooting checklist: particle contamination and wear.

Symptoms and the oil's ISO 4406 code (three scale numbers, >= 4, >= 6, >= 14 um(c))
against a target for the most sensitive component, ranked over the causes of
site_src/checklists/contamination.md. The iso-4406 tool turns particle counts into
the code.
"""

from __future__ import annotations

from . import cleanliness
from .checklists import (MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom, checklist_result,
                         count_entered, symptom_fields, RANKING_OUTPUTS)
from .registry import Field, Output, tool
from .result import COMMON_PRACTICE, Q

CAUSES = (
    ("breather-ingress", "Dirt drawn in through the breather, hatches or rod seals"),
    ("filter-bypass", "Filter blocked, in bypass or of the wrong rating"),
    ("dirty-topup", "Unfiltered new oil or dirty top-up gear"),
    ("repair-dirt", "Dirt left in after a repair"),
    ("wear-debris", "Wear inside the pump, valves or cylinders"),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
SYMPTOMS = (
    Symptom("filter_indicator", "Filter indicator shows blocked or bypass",
            (("filter-bypass", STRONG, "filter indicator shows blocked or bypass"),)),
    Symptom("breather_open", "Breather missing, open or without a fine filter",
            (("breather-ingress", STRONG, "breather open or without a fine filter"),)),
    Symptom("dusty_site", "Dusty site, or rods exposed to dirt",
            (("breather-ingress", MODERATE, "dusty site or exposed rods"),)),
    Symptom("rods_scored", "Cylinder rods scored, wipers worn",
            (("breather-ingress", MODERATE, "scored rods and worn wipers let dirt in"),
             ("wear-debris", WEAK, "scored rods: something hard is in the oil"))),
    Symptom("after_topup", "Started after a top-up or oil change",
            (("dirty-topup", STRONG, "started after a top-up or oil change"),)),
    Symptom("after_repair", "Started after a repair or a new hose or part",
            (("repair-dirt", STRONG, "started after a repair or a new part"),)),
    Symptom("valves_sticking", "Valves stick or act erratically",
            ((("filter-bypass", "repair-dirt", "wear-debris"), WEAK,
              "sticking valves: fine dirt silting the spools"),)),
    Symptom("metal_seen", "Shiny metal on the filter element or a magnet",
            (("wear-debris", STRONG, "shiny metal on the filter or magnet"),)),
    Symptom("pump_louder", "Pump louder or slower than it used to be",
            (("wear-debris", MODERATE, "pump louder or slower: wear"),)),
)

CAUTION = ("Stop, lock out and relieve pressure (accumulators, raised loads) before changing a "
           "filter or opening a line; oil may be hot. Bag used filters and dispose of them and "
           "the oil by local rules.")


def _code_field(key: str, label: str) -> Field:
    return Field(key, label, "count", None, min=0.0, max=float(cleanliness.TOP_SCALE),
                 optional=True, help="One number of the code, e.g. 18 in 18/16/13; blank if "
                                     "the lab gives none for this size.")


def _code(code_4, code_6, code_14):
    """The entered code (blank sizes as None), or None when nothing was entered."""
    code = (code_4, code_6, code_14)
    if all(c is None for c in code):
        return None
    cleanliness.check_code_order(code, "code_6")
    return code


@tool(
    "checklist-contamination",
    title="Dirty oil and wear: what to check first",
    summary="Tick what you see and enter the oil's cleanliness code; the ways dirt gets in are "
            "ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        *symptom_fields(SYMPTOMS),
        Field("component", "Most dirt-sensitive component", "choice", "piston",
              choices=cleanliness.COMPONENT_CHOICES),
        Field("pressure", "Working pressure", "pressure", None, min=0.0, max=1000.0,
              optional=True, help="Above 140 bar the target is stricter; blank: up to 140 bar."),
        _code_field("code_4", "ISO 4406 code: first number (≥ 4 µm)"),
        _code_field("code_6", "ISO 4406 code: second number (≥ 6 µm)"),
        _code_field("code_14", "ISO 4406 code: third number (≥ 14 µm)"),
    ),
    outputs=(
        *RANKING_OUTPUTS,
        Output("target", "Target code", "text"),
        Output("steps_over", "Steps over the target", "count",
               "Each step doubles the particle count."),
    ),
)
def checklist_contamination(component="piston", pressure=None, code_4=None, code_6=None,
                            code_14=None, **symptoms):
    """Rank the ways dirt gets into the oil from the ticked SYMPTOMS and the cleanliness code."""
    code = _code(code_4, code_6, code_14)
    target = cleanliness.target_code(component, 0.0 if pressure is None else pressure)
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    over = None
    if code is not None:
        over = cleanliness.worst_excess(code, target)
    if over is not None:
        shown = "/".join("-" if c is None else f"{c:g}" for c in code)
        aim = "/".join(str(t) for t in target)
        if over >= 1:
            board.add_each(("breather-ingress", "filter-bypass", "dirty-topup", "repair-dirt"),
                           WEAK, f"code {shown} is {{0}} steps over the target {aim}",
                           Q(over, "count"))
        if over >= 3:
            board.add("filter-bypass", MODERATE, "{0} steps over target: eight times the "
                      "particles or more, the filter is not keeping up", Q(over, "count"))
    entered = ticked + count_entered(code)
    result = checklist_result(board, entered, CAUTION)
    result.values["target"] = "/".join(str(t) for t in target)
    result.values["steps_over"] = None if over is None else float(over)
    if over is not None:
        basis = COMMON_PRACTICE + ", target codes from memory (calc.cleanliness)"
        if over >= 3:
            result.add("act", basis, "The code is {0} steps over the target: clean the oil now "
                       "and find the way in.", Q(over, "count"))
        elif over >= 1:
            result.add("watch", basis, "The code is {0} steps over the target: find the way in "
                       "before wear starts.", Q(over, "count"))
        else:
            result.add("ok", basis, "The code meets the target for this component.")
    result.sources += ["ISO 4406 code: each scale step doubles the count",
                       "Target codes by component and pressure: common practice, from memory "
                       "(calc.cleanliness)"]
    return result
