"""Viscosity index: ASTM D2270, both procedures, and its inverse.

The viscosity index (VI) compares how much an oil thins between 40 °C and
100 °C with two reference oil series of the same KV100 (Y): one that thins a
lot (VI 0, its KV40 is L) and one that thins little (VI 100, its KV40 is H).
U is the oil's own KV40.

    Procedure A (VI <= 100):  VI = 100 (L - U) / (L - H)
    Procedure B (VI > 100):   N = (log H - log U) / log Y
                              VI = (10^N - 1) / 0.00715 + 100

L and H come from the standard's Table 1 for Y from 2 to 70 cSt (linear
interpolation between rows), and from its equations above 70 cSt:

    L = 0.8353 Y^2 + 14.67 Y - 216        H = 0.1684 Y^2 + 11.85 Y - 97

VI is not defined for Y below 2 cSt. The result is rounded to the nearest
whole number, an exact half to the even number (ASTM E29, as D2270 asks).

Source: ASTM D2270-10 (reapproved 2016), "Standard Practice for Calculating
Viscosity Index from Kinematic Viscosity at 40 and 100 °C", sections 6 and 7
and Table 1.
"""

from __future__ import annotations

import math
from bisect import bisect_left

from ..kernel.errors import InputError
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import Q, Result
from ..kernel.solve import bisect

KV100_MIN_CST = 2.0  # D2270 does not define VI below this KV100
TABLE_TOP_CST = 70.0  # above this KV100, the standard's equations replace Table 1

# ASTM D2270-10, Table 1: (KV100 Y [cSt], L [cSt], H [cSt]) for Y from 2 to 70 cSt.
# Cross-checked row by row against chemicals.viscosity (VI_nus, VI_Ls, VI_Hs) in
# tests/calc/test_vi_reference.py.
D2270_TABLE = (
    (2.0, 7.994, 6.394), (2.1, 8.64, 6.894), (2.2, 9.309, 7.41), (2.3, 10.0, 7.944),
    (2.4, 10.71, 8.496), (2.5, 11.45, 9.063), (2.6, 12.21, 9.647), (2.7, 13.0, 10.25),
    (2.8, 13.8, 10.87), (2.9, 14.63, 11.5), (3.0, 15.49, 12.15), (3.1, 16.36, 12.82),
    (3.2, 17.26, 13.51), (3.3, 18.18, 14.21), (3.4, 19.12, 14.93), (3.5, 20.09, 15.66),
    (3.6, 21.08, 16.42), (3.7, 22.09, 17.19), (3.8, 23.13, 17.97), (3.9, 24.19, 18.77),
    (4.0, 25.32, 19.56), (4.1, 26.5, 20.37), (4.2, 27.75, 21.21), (4.3, 29.07, 22.05),
    (4.4, 30.48, 22.92), (4.5, 31.96, 23.81), (4.6, 33.52, 24.71), (4.7, 35.13, 25.63),
    (4.8, 36.79, 26.57), (4.9, 38.5, 27.53), (5.0, 40.23, 28.49), (5.1, 41.99, 29.46),
    (5.2, 43.76, 30.43), (5.3, 45.53, 31.4), (5.4, 47.31, 32.37), (5.5, 49.09, 33.34),
    (5.6, 50.87, 34.32), (5.7, 52.64, 35.29), (5.8, 54.42, 36.26), (5.9, 56.2, 37.23),
    (6.0, 57.97, 38.19), (6.1, 59.74, 39.17), (6.2, 61.52, 40.15), (6.3, 63.32, 41.13),
    (6.4, 65.18, 42.14), (6.5, 67.12, 43.18), (6.6, 69.16, 44.24), (6.7, 71.29, 45.33),
    (6.8, 73.48, 46.44), (6.9, 75.72, 47.51), (7.0, 78.0, 48.57), (7.1, 80.25, 49.61),
    (7.2, 82.39, 50.69), (7.3, 84.53, 51.78), (7.4, 86.66, 52.88), (7.5, 88.85, 53.98),
    (7.6, 91.04, 55.09), (7.7, 93.2, 56.2), (7.8, 95.43, 57.31), (7.9, 97.72, 58.45),
    (8.0, 100.0, 59.6), (8.1, 102.3, 60.74), (8.2, 104.6, 61.89), (8.3, 106.9, 63.05),
    (8.4, 109.2, 64.18), (8.5, 111.5, 65.32), (8.6, 113.9, 66.48), (8.7, 116.2, 67.64),
    (8.8, 118.5, 68.79), (8.9, 120.9, 69.94), (9.0, 123.3, 71.1), (9.1, 125.7, 72.27),
    (9.2, 128.0, 73.42), (9.3, 130.4, 74.57), (9.4, 132.8, 75.73), (9.5, 135.3, 76.91),
    (9.6, 137.7, 78.08), (9.7, 140.1, 79.27), (9.8, 142.7, 80.46), (9.9, 145.2, 81.67),
    (10.0, 147.7, 82.87), (10.1, 150.3, 84.08), (10.2, 152.9, 85.3), (10.3, 155.4, 86.51),
    (10.4, 158.0, 87.72), (10.5, 160.6, 88.95), (10.6, 163.2, 90.19), (10.7, 165.8, 91.4),
    (10.8, 168.5, 92.65), (10.9, 171.2, 93.92), (11.0, 173.9, 95.19), (11.1, 176.6, 96.45),
    (11.2, 179.4, 97.71), (11.3, 182.1, 98.97), (11.4, 184.9, 100.2), (11.5, 187.6, 101.5),
    (11.6, 190.4, 102.8), (11.7, 193.3, 104.1), (11.8, 196.2, 105.4), (11.9, 199.0, 106.7),
    (12.0, 201.9, 108.0), (12.1, 204.8, 109.4), (12.2, 207.8, 110.7), (12.3, 210.7, 112.0),
    (12.4, 213.6, 113.3), (12.5, 216.6, 114.7), (12.6, 219.6, 116.0), (12.7, 222.6, 117.4),
    (12.8, 225.7, 118.7), (12.9, 228.8, 120.1), (13.0, 231.9, 121.5), (13.1, 235.0, 122.9),
    (13.2, 238.1, 124.2), (13.3, 241.2, 125.6), (13.4, 244.3, 127.0), (13.5, 247.4, 128.4),
    (13.6, 250.6, 129.8), (13.7, 253.8, 131.2), (13.8, 257.0, 132.6), (13.9, 260.1, 134.0),
    (14.0, 263.3, 135.4), (14.1, 266.6, 136.8), (14.2, 269.8, 138.2), (14.3, 273.0, 139.6),
    (14.4, 276.3, 141.0), (14.5, 279.6, 142.4), (14.6, 283.0, 143.9), (14.7, 286.4, 145.3),
    (14.8, 289.7, 146.8), (14.9, 293.0, 148.2), (15.0, 296.5, 149.7), (15.1, 300.0, 151.2),
    (15.2, 303.4, 152.6), (15.3, 306.9, 154.1), (15.4, 310.3, 155.6), (15.5, 313.9, 157.0),
    (15.6, 317.5, 158.6), (15.7, 321.1, 160.1), (15.8, 324.6, 161.6), (15.9, 328.3, 163.1),
    (16.0, 331.9, 164.6), (16.1, 335.5, 166.1), (16.2, 339.2, 167.7), (16.3, 342.9, 169.2),
    (16.4, 346.6, 170.7), (16.5, 350.3, 172.3), (16.6, 354.1, 173.8), (16.7, 358.0, 175.4),
    (16.8, 361.7, 177.0), (16.9, 365.6, 178.6), (17.0, 369.4, 180.2), (17.1, 373.3, 181.7),
    (17.2, 377.1, 183.3), (17.3, 381.0, 184.9), (17.4, 384.9, 186.5), (17.5, 388.9, 188.1),
    (17.6, 392.7, 189.7), (17.7, 396.7, 191.3), (17.8, 400.7, 192.9), (17.9, 404.6, 194.6),
    (18.0, 408.6, 196.2), (18.1, 412.6, 197.8), (18.2, 416.7, 199.4), (18.3, 420.7, 201.0),
    (18.4, 424.9, 202.6), (18.5, 429.0, 204.3), (18.6, 433.2, 205.9), (18.7, 437.3, 207.6),
    (18.8, 441.5, 209.3), (18.9, 445.7, 211.0), (19.0, 449.9, 212.7), (19.1, 454.2, 214.4),
    (19.2, 458.4, 216.1), (19.3, 462.7, 217.7), (19.4, 467.0, 219.4), (19.5, 471.3, 221.1),
    (19.6, 475.7, 222.8), (19.7, 479.7, 224.5), (19.8, 483.9, 226.2), (19.9, 488.6, 227.7),
    (20.0, 493.2, 229.5), (20.2, 501.5, 233.0), (20.4, 510.8, 236.4), (20.6, 519.9, 240.1),
    (20.8, 528.8, 243.5), (21.0, 538.4, 247.1), (21.2, 547.5, 250.7), (21.4, 556.7, 254.2),
    (21.6, 566.4, 257.8), (21.8, 575.6, 261.5), (22.0, 585.2, 264.9), (22.2, 595.0, 268.6),
    (22.4, 604.3, 272.3), (22.6, 614.2, 275.8), (22.8, 624.1, 279.6), (23.0, 633.6, 283.3),
    (23.2, 643.4, 286.8), (23.4, 653.8, 290.5), (23.6, 663.3, 294.4), (23.8, 673.7, 297.9),
    (24.0, 683.9, 301.8), (24.2, 694.5, 305.6), (24.4, 704.2, 309.4), (24.6, 714.9, 313.0),
    (24.8, 725.7, 317.0), (25.0, 736.5, 320.9), (25.2, 747.2, 324.9), (25.4, 758.2, 328.8),
    (25.6, 769.3, 332.7), (25.8, 779.7, 336.7), (26.0, 790.4, 340.5), (26.2, 801.6, 344.4),
    (26.4, 812.8, 348.4), (26.6, 824.1, 352.3), (26.8, 835.5, 356.4), (27.0, 847.0, 360.5),
    (27.2, 857.5, 364.6), (27.4, 869.0, 368.3), (27.6, 880.6, 372.3), (27.8, 892.3, 376.4),
    (28.0, 904.1, 380.6), (28.2, 915.8, 384.6), (28.4, 927.6, 388.8), (28.6, 938.6, 393.0),
    (28.8, 951.2, 396.6), (29.0, 963.4, 401.1), (29.2, 975.4, 405.3), (29.4, 987.1, 409.5),
    (29.6, 998.9, 413.5), (29.8, 1011.0, 417.6), (30.0, 1023.0, 421.7), (30.5, 1055.0, 432.4),
    (31.0, 1086.0, 443.2), (31.5, 1119.0, 454.0), (32.0, 1151.0, 464.9), (32.5, 1184.0, 475.9),
    (33.0, 1217.0, 487.0), (33.5, 1251.0, 498.1), (34.0, 1286.0, 509.6), (34.5, 1321.0, 521.1),
    (35.0, 1356.0, 532.5), (35.5, 1391.0, 544.0), (36.0, 1427.0, 555.6), (36.5, 1464.0, 567.1),
    (37.0, 1501.0, 579.3), (37.5, 1538.0, 591.3), (38.0, 1575.0, 603.1), (38.5, 1613.0, 615.0),
    (39.0, 1651.0, 627.1), (39.5, 1691.0, 639.2), (40.0, 1730.0, 651.8), (40.5, 1770.0, 664.2),
    (41.0, 1810.0, 676.6), (41.5, 1851.0, 689.1), (42.0, 1892.0, 701.9), (42.5, 1935.0, 714.9),
    (43.0, 1978.0, 728.2), (43.5, 2021.0, 741.3), (44.0, 2064.0, 754.4), (44.5, 2108.0, 767.6),
    (45.0, 2152.0, 780.9), (45.5, 2197.0, 794.5), (46.0, 2243.0, 808.2), (46.5, 2288.0, 821.9),
    (47.0, 2333.0, 835.5), (47.5, 2380.0, 849.2), (48.0, 2426.0, 863.0), (48.5, 2473.0, 876.9),
    (49.0, 2521.0, 890.9), (49.5, 2570.0, 905.3), (50.0, 2618.0, 919.6), (50.5, 2667.0, 933.6),
    (51.0, 2717.0, 948.2), (51.5, 2767.0, 962.9), (52.0, 2817.0, 977.5), (52.5, 2867.0, 992.1),
    (53.0, 2918.0, 1007.0), (53.5, 2969.0, 1021.0), (54.0, 3020.0, 1036.0), (54.5, 3073.0, 1051.0),
    (55.0, 3126.0, 1066.0), (55.5, 3180.0, 1082.0), (56.0, 3233.0, 1097.0), (56.5, 3286.0, 1112.0),
    (57.0, 3340.0, 1127.0), (57.5, 3396.0, 1143.0), (58.0, 3452.0, 1159.0), (58.5, 3507.0, 1175.0),
    (59.0, 3563.0, 1190.0), (59.5, 3619.0, 1206.0), (60.0, 3676.0, 1222.0), (60.5, 3734.0, 1238.0),
    (61.0, 3792.0, 1254.0), (61.5, 3850.0, 1270.0), (62.0, 3908.0, 1286.0), (62.5, 3966.0, 1303.0),
    (63.0, 4026.0, 1319.0), (63.5, 4087.0, 1336.0), (64.0, 4147.0, 1352.0), (64.5, 4207.0, 1369.0),
    (65.0, 4268.0, 1386.0), (65.5, 4329.0, 1402.0), (66.0, 4392.0, 1419.0), (66.5, 4455.0, 1436.0),
    (67.0, 4517.0, 1454.0), (67.5, 4580.0, 1471.0), (68.0, 4645.0, 1488.0), (68.5, 4709.0, 1506.0),
    (69.0, 4773.0, 1523.0), (69.5, 4839.0, 1541.0), (70.0, 4905.0, 1558.0),
)
_TABLE_Y = tuple(row[0] for row in D2270_TABLE)


def lh_values(kv100_cst: float) -> tuple[float, float]:
    """(L, H) [cSt] of ASTM D2270 for an oil of KV100 `kv100_cst` [cSt] (Y >= 2 cSt).

    Table 1, interpolated linearly, up to 70 cSt; the standard's equations above.

    >>> [round(v, 2) for v in lh_values(8.86)]
    [119.94, 69.48]
    >>> [round(v, 2) for v in lh_values(100.0)]
    [9604.0, 2772.0]
    """
    y = kv100_cst
    if y > TABLE_TOP_CST:
        return 0.8353 * y * y + 14.67 * y - 216.0, 0.1684 * y * y + 11.85 * y - 97.0
    i = bisect_left(_TABLE_Y, y)
    if _TABLE_Y[i] == y:
        return D2270_TABLE[i][1], D2270_TABLE[i][2]
    (y0, l0, h0), (y1, l1, h1) = D2270_TABLE[i - 1], D2270_TABLE[i]
    f = (y - y0) / (y1 - y0)
    return l0 + f * (l1 - l0), h0 + f * (h1 - h0)


def viscosity_index(kv40_cst: float, kv100_cst: float) -> float:
    """ASTM D2270 viscosity index, not rounded (procedure A or B, whichever applies).

    kv40_cst : kinematic viscosity at 40 °C, U [cSt]
    kv100_cst : kinematic viscosity at 100 °C, Y [cSt], at least 2 cSt

    >>> round(viscosity_index(73.30, 8.86), 2)
    92.43
    >>> round(viscosity_index(22.83, 5.05), 2)
    156.42
    """
    low, high = lh_values(kv100_cst)
    if kv40_cst >= high:
        return 100.0 * (low - kv40_cst) / (low - high)
    n = math.log10(high / kv40_cst) / math.log10(kv100_cst)
    return (10.0 ** n - 1.0) / 0.00715 + 100.0


def round_vi(vi: float) -> int:
    """VI to the nearest whole number, an exact half to the even one (ASTM E29, per D2270).

    >>> round_vi(92.43), round_vi(156.5), round_vi(157.5)
    (92, 156, 158)
    """
    return int(round(vi))  # Python's round() rounds an exact half to even, as E29 does


def kv40_from_vi(kv100_cst: float, vi: float) -> float:
    """KV40 [cSt] of an oil with KV100 `kv100_cst` [cSt] and viscosity index `vi`.

    D2270 solved for U: U = L - VI (L - H) / 100 for VI <= 100, and
    U = H / Y^N with N = log10(1 + 0.00715 (VI - 100)) for VI > 100.

    >>> round(kv40_from_vi(8.86, 92.43), 2)
    73.3
    """
    low, high = lh_values(kv100_cst)
    if vi <= 100.0:
        return low - vi * (low - high) / 100.0
    n = math.log10(1.0 + 0.00715 * (vi - 100.0))
    return high / kv100_cst ** n


def find_root(f, lo: float, hi: float, steps: int = 400) -> float | None:
    """The first x in [lo, hi] (lo, hi > 0) where f(x) crosses from negative to >= 0.

    Brackets the crossing on a geometric grid of `steps` points, then bisects to
    machine precision; None when f never reaches 0 in the range. Robust where f is
    piecewise (as D2270's interpolated table is) or not monotonic.

    >>> round(find_root(lambda x: x * x - 2.0, 1.0, 10.0), 12)
    1.414213562373
    """
    ratio = (hi / lo) ** (1.0 / steps)
    left = lo
    if f(left) >= 0.0:
        return left
    for k in range(1, steps + 1):
        right = hi if k == steps else lo * ratio ** k
        if f(right) >= 0.0:
            break
        left = right
    else:
        return None
    return bisect(f, left, right, rel_tol=1e-14, max_iter=200)


def kv100_from_vi(kv40_cst: float, vi: float) -> float:
    """KV100 [cSt] of an oil with KV40 `kv40_cst` [cSt] and viscosity index `vi`.

    The inverse of `viscosity_index` for a fixed KV40: the root of
    kv40_from_vi(Y, VI) = KV40 for Y between 2 cSt and KV40 (`find_root`).
    InputError when there is none.

    >>> round(kv100_from_vi(46.0, 100.0), 3)
    6.76
    """
    lowest = kv40_from_vi(KV100_MIN_CST, vi)
    if lowest > kv40_cst:
        raise InputError("kv40", f"an oil of VI {vi:g} with KV100 at least 2 cSt (the least D2270 "
                                 f"allows) has KV40 at least {lowest:.4g} cSt; {kv40_cst:.4g} cSt "
                                 "is too thin for that VI")
    found = find_root(lambda y: kv40_from_vi(y, vi) - kv40_cst, KV100_MIN_CST, kv40_cst)
    if found is None:
        raise InputError("vi", f"no KV100 below the KV40 of {kv40_cst:.4g} cSt gives a VI of "
                               f"{vi:g}; check the VI")
    return found


def check_kv40_kv100(kv40_cst: float, kv100_cst: float) -> None:
    """InputError unless the pair is in the standard's range: Y >= 2 cSt and U > Y.

    >>> check_kv40_kv100(46.0, 1.9)
    Traceback (most recent call last):
    calc.kernel.errors.InputError: kv100: ASTM D2270 defines VI only for KV100 of 2 cSt and above
    """
    if kv100_cst < KV100_MIN_CST:
        raise InputError("kv100", "ASTM D2270 defines VI only for KV100 of 2 cSt and above")
    if kv100_cst >= kv40_cst:
        raise InputError("kv100", "KV100 must be lower than KV40 (an oil thins as it warms)")


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
        Field("kv40", "KV at 40 °C", _KV, 46.0, min=2.0, max=1.0e6,
              help="From the data sheet or lab report."),
        Field("kv100", "KV at 100 °C", _KV, 6.8, min=0.21, max=1.0e5,
              help="Used when finding the VI. At least 2 cSt: D2270 does not go lower."),
        Field("vi", "Viscosity index", "vi", 100.0, min=-100.0, max=400.0,
              help="Used when finding KV100."),
    ),
    outputs=(
        Output("vi", "Viscosity index (rounded)", "vi", "Rounded to the nearest whole number, "
                                                        "as ASTM D2270 asks.", headline=True),
        Output("vi_exact", "Viscosity index before rounding", "vi"),
        Output("kv100_found", "KV at 100 °C for this VI", _KV),
        Output("l_value", "L (reference oil of VI 0)", _KV,
               "KV40 of the reference oil of VI 0 with the same KV100."),
        Output("h_value", "H (reference oil of VI 100)", _KV,
               "KV40 of the reference oil of VI 100 with the same KV100."),
        Output("procedure", "D2270 procedure", "text"),
    ),
)
def viscosity_index_tool(mode: str, kv40: float, kv100: float, vi: float) -> Result:
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
