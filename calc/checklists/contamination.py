"""Troubleshooting checklist: particle contamination and wear.

Symptoms and the oil's ISO 4406 code (three scale numbers, >= 4, >= 6, >= 14 um(c))
against a target for the most sensitive component, ranked over the ways dirt gets in;
why each happens is told in site_src/checklists/checklist-contamination.md. The iso-4406 tool turns particle counts into
the code.
"""

from __future__ import annotations

from ..kernel.grading import Band
from ..kernel.registry import Field, Output
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.cleanliness import TOP_SCALE, format_code, worst_excess
from ..tools.cleanliness import USUAL_SCALE, COMPONENT_CHOICES, code_from_fields, target_code
from .scoreboard import MODERATE, STRONG, WEAK, Cause, Check, Scoreboard, Symptom, checklist

CAUSES = (
    Cause("breather-ingress", 'Dirt drawn in through the breather, hatches or rod seals',
          checks=(
              Check("read-cleanliness", 'Read the cleanliness code against the target for the '
                    'most sensitive component.', tool="iso-4406"),
              Check("look-breather", 'Look at the breather: a fine filter element fitted, '
                    'housing intact, not an open cap or a rag.'),
              Check("check-lid", 'Check lid and hatch gaskets and cable entries for gaps.'),
              Check("look-cylinder", 'Look at cylinder rods for scoring and at the wipers for '
                    'cracks.'),
          ),
          caution='Before work at cylinders, lower or block raised loads and relieve '
                  'accumulators; lock out the machine.'),
    Cause("filter-bypass", 'Filter blocked, in bypass or of the wrong rating',
          checks=(
              Check("read-filter", "Read the filter's clogging indicator with the oil at "
                    'working temperature (cold oil gives false alarms).'),
              Check("compare-fitted", "Compare the fitted element's part number and rating with "
                    "the machine's parts list."),
              Check("next-change", "At the next change, check the element's seal and bypass "
                    'valve seat, and cut the old element open to look at what it caught.'),
          ),
          caution='Stop, lock out and relieve pressure before opening a filter housing; oil may '
                  'be hot. Bag the used element and dispose of it by local rules.'),
    Cause("dirty-topup", 'Unfiltered new oil or dirty top-up gear',
          checks=(
              Check("watch-how", 'Watch how the machine is topped up: open can and funnel, or a '
                    'filter cart through a quick coupling.'),
              Check("sample-new", 'Have a sample of the new oil counted before it goes in.',
                    tool="iso-4406"),
              Check("check-drums", 'Check that drums are stored closed and under cover.'),
          ),
          caution='Handle drums with proper lifting gear and wipe up spills at once to avoid '
                  'slips.'),
    Cause("repair-dirt", 'Dirt left in after a repair',
          checks=(
              Check("ask-was", 'Ask what was opened and replaced lately, and whether ports were '
                    'capped during the work.'),
              Check("check-new", 'Check that new hoses and pipes were cleaned and capped before '
                    'fitting.'),
              Check("run-filter", 'Run a filter cart on the tank after any repair and recount '
                    'the oil.', tool="iso-4406"),
          ),
          caution='Before opening any part of the circuit, stop, lock out, lower loads and '
                  'relieve pressure; never feel for leaks with a hand, oil under pressure '
                  'injects through skin.'),
    Cause("wear-debris", 'Wear inside the pump, valves or cylinders',
          checks=(
              Check("look-used", 'Look at the used filter element and any magnetic plug for '
                    'shiny metal.'),
              Check("compare-trend", "Compare the trend of the code with the machine's hours; a "
                    'steady rise with clean top-ups points to wear.', tool="iso-4406"),
              Check("ask-lab", "Ask the lab for a wear-metal analysis and check the oil's "
                    'condition.', tool="oil-condition"),
          ),
          caution='Leave pump and valve repairs to people trained on them; the equipment '
                  "maker's manual comes first."),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
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

CODE_BANDS = (
    Band("act", "The code is {over} steps over the target: clean the oil now and find the way "
                "in.", at_least=3.0),
    Band("watch", "The code is {over} steps over the target: find the way in before wear "
                  "starts.", at_least=1.0),
    Band("ok", "The code meets the target for this component."),
)
CODE_BASIS = COMMON_PRACTICE + ", target codes from memory (as in the iso-4406 tool)"


def _code_field(key: str, label: str) -> Field:
    return Field(key, label, "count", None, min=0.0, max=float(TOP_SCALE), usual=USUAL_SCALE,
                 optional=True, help="One number of the code, e.g. 18 in 18/16/13; blank if "
                                     "the lab gives none for this size.")


def _code(code_4, code_6, code_14):
    """The entered code as whole scale numbers (blank sizes as None), None when none entered."""
    if all(c is None for c in (code_4, code_6, code_14)):
        return None
    return code_from_fields("code_", (code_4, code_6, code_14))


@checklist(
    "checklist-contamination",
    title="Dirty oil and wear: what to check first",
    summary="Tick what you see and enter the oil's cleanliness code; the ways dirt gets in are "
            "ranked, each with its checks and cautions.",
    causes=CAUSES,
    symptoms=SYMPTOMS,
    readings=(
        Field("component", "Most dirt-sensitive component", "choice", "piston", binds="component",
              choices=COMPONENT_CHOICES, group="machine"),
        Field("pressure", "Working pressure", "pressure", None, min=0.0, max=1000.0,
              binds="working_pressure",
              optional=True, group="machine",
              help="Above 140 bar the target is stricter; blank: up to 140 bar."),
        _code_field("code_4", "ISO 4406 code: first number (≥ 4 µm)"),
        _code_field("code_6", "ISO 4406 code: second number (≥ 6 µm)"),
        _code_field("code_14", "ISO 4406 code: third number (≥ 14 µm)"),
    ),
    outputs=(
        Output("target", "Target code", "text"),
        Output("steps_over", "Steps over the target", "count",
               "Each step doubles the particle count."),
    ),
    caution="Stop, lock out and relieve pressure (accumulators, raised loads) before changing a "
            "filter or opening a line; oil may be hot. Bag used filters and dispose of them and "
            "the oil by local rules.",
    sources=("ISO 4406 code: each scale step doubles the count",
             "Target codes by component and pressure: common practice, from memory (as in "
             "the iso-4406 tool)"),
)
def checklist_contamination(board: Scoreboard, found: Result, component, pressure, code_4,
                            code_6, code_14):
    """Rank the ways dirt gets into the oil from the ticked SYMPTOMS and the cleanliness code."""
    code = _code(code_4, code_6, code_14)
    target = target_code(component, 0.0 if pressure is None else pressure)
    over = None if code is None else worst_excess(code, target)
    found.values["target"] = "/".join(str(t) for t in target)
    found.values["steps_over"] = None if over is None else float(over)
    if over is None:
        return
    if over >= 1:
        board.add_each(("breather-ingress", "filter-bypass", "dirty-topup", "repair-dirt"),
                       WEAK, "code {code} is {over} steps over the target {target}",
                       code=Q(format_code(code), "text"), over=Q(over, "count"),
                       target=Q(format_code(target), "text"))
    if over >= 3:
        board.add("filter-bypass", MODERATE, "{0} steps over target: eight times the "
                  "particles or more, the filter is not keeping up", Q(over, "count"))
    found.grade(over, CODE_BANDS, CODE_BASIS, over=Q(over, "count"))
