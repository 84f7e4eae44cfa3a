"""The viscosity-index tool: ASTM D2270 both ways (calc.methods.viscosity_index)."""

from __future__ import annotations

from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import Q, Result
from ..methods.viscosity_index import (TABLE_TOP_CST, check_kv40_kv100, kv100_from_vi, lh_values,
                                       round_vi, viscosity_index)

_KV = "kinematic_viscosity"
MODES = (("vi", "VI from KV40 and KV100"), ("kv100", "KV100 from KV40 and VI"))


@tool(
    "viscosity-index",
    title="Viscosity index",
    summary="The oil's viscosity index from its viscosity at 40 °C and 100 °C (ASTM D2270), "
            "or the KV100 an oil of a given KV40 and VI has.",
    topic=VISCOSITY,
    inputs=(
        Field("mode", "Find", "choice", "vi", choices=MODES),
        Field("kv40", "KV at 40 °C", _KV, 46.0, min=2.0, max=1.0e6, binds="kv40_new",
              help="From the data sheet or lab report.", usual=(9.0, 750.0)),
        Field("kv100", "KV at 100 °C", _KV, 6.8, min=0.21, max=1.0e5, binds="kv100_new",
              help="Used when finding the VI. At least 2 cSt: D2270 does not go lower.", usual=(2.0, 60.0), when=("mode", "vi")),
        Field("vi", "Viscosity index", "vi", 100.0, min=-100.0, max=400.0, binds="vi",
              help="Used when finding KV100.", when=("mode", "kv100")),
    ),
    outputs=(
        Output("vi", "Viscosity index (rounded)", "vi", "Rounded to the nearest whole number, "
                                                        "as ASTM D2270 asks.", headline=True),
        Output("vi_exact", "Viscosity index before rounding", "vi_unrounded"),
        Output("kv100_found", "KV at 100 °C for this VI", _KV),
        Output("l_value", "L (reference oil of VI 0)", _KV,
               "KV40 of the reference oil of VI 0 with the same KV100."),
        Output("h_value", "H (reference oil of VI 100)", _KV,
               "KV40 of the reference oil of VI 100 with the same KV100."),
        Output("procedure", "D2270 procedure", "text"),
    ),
)
def viscosity_index_of_oil(mode: str, kv40: float, kv100: float, vi: float) -> Result:
    """ASTM D2270 VI of (KV40, KV100), or the KV100 of (KV40, VI)."""
    if mode == "kv100":
        kv100_found = kv100_from_vi(kv40, vi)
        vi_exact, kv100_used = vi, kv100_found
    else:
        check_kv40_kv100(kv40, kv100)
        vi_exact, kv100_used, kv100_found = viscosity_index(kv40, kv100), kv100, None
    low, high = lh_values(kv100_used)
    procedure = "A (VI up to 100)" if vi_exact <= 100.0 else "B (VI above 100)"
    result = Result(values={"vi": float(round_vi(vi_exact)), "vi_exact": vi_exact,
                            "kv100_found": kv100_found, "l_value": low, "h_value": high,
                            "procedure": procedure})
    if kv100_used > TABLE_TOP_CST:
        result.note("KV100 is above 70 cSt: L and H come from the standard's equations, not "
                    "its table.")
    result.note("Plain mineral hydraulic oils are usually near VI 95 to 105; high-VI (HV) oils "
                "and many synthetics are 140 and above. A VI that falls in service points to "
                "shear of the VI improver (from memory).")
    if mode == "kv100":
        result.note("An oil of KV40 {0} and VI {1} has KV100 {2}.",
                    Q(kv40, _KV), Q(vi, "vi"), Q(kv100_found, _KV))
    result.sources.append("ASTM D2270-10, sections 6 and 7, Table 1 (L and H), equations above "
                          "70 cSt")
    return result
