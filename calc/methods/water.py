"""Water in oil: saturation against temperature, % saturation <-> ppm, free water, water in the tank.

An oil holds water dissolved up to its saturation content S, which rises with
temperature; water beyond S is free water (haze, emulsion, a layer at the
bottom). Over the range a machine sees, log10 S falls on a straight line in 1/T
(the van 't Hoff form of a solubility):

    log10(S / ppm) = A - B / T            T = temp_c + 273.15  [K]

Inline sensors report the relative saturation (water activity x 100) at the
oil's own temperature; with the linear isotherm those sensors assume,

    ppm = (rh / 100) * S(T)               (definition of relative saturation)

A lab reports the content in ppm by mass by Karl Fischer titration (ASTM D6304).
Free water drops out when the oil cools below T_free, where S(T_free) equals the
content:  T_free = B / (A - log10(ppm)).

Sources: log-linear solubility in 1/T (van 't Hoff); hydraulic-oil preset
constants from memory; insulating-oil constants are Oommen's equation for new
mineral transformer oil (from memory, checked in the tests against a published
table).
"""

from __future__ import annotations

import math

from ..kernel.constants import ZERO_CELSIUS_K


# Water at 20 degC, 998.2 kg/m3: IAPWS-95 (checked in the tests against chemicals.iapws95).
WATER_DENSITY_KG_M3 = 998.2


# Oil presets: (key, label, A, B [K], covered from [degC], covered to [degC], source).
# The hydraulic presets are FROM MEMORY, chosen to give typical figures: plain mineral
# 100 ppm at 20 degC and 400 ppm at 65 degC; mineral with additives 200 ppm at 20 degC and
# 600 ppm at 65 degC; synthetic ester 1500 ppm at 20 degC and 3500 ppm at 65 degC.
# Insulating oil: Oommen's equation for new mineral transformer oil, log10 S = 7.0895 - 1567/T
# (constants from memory; reproduces a published saturation table, see the tests).
OIL_PRESETS = (
    ("mineral-aw", "Mineral hydraulic oil with additives (HM / HLP)", 5.8863, 1051.0, 0.0, 100.0,
     "Mineral hydraulic oil with additives: constants from memory (about 200 ppm at 20 °C, "
     "600 ppm at 65 °C)"),
    ("mineral-plain", "Mineral oil without additives (HH / HL, turbine R&O)", 6.5241, 1326.0,
     0.0, 100.0,
     "Mineral oil without additives: constants from memory (about 100 ppm at 20 °C, "
     "400 ppm at 65 °C)"),
    ("ester", "Synthetic ester (HEES)", 5.9412, 811.0, 0.0, 100.0,
     "Synthetic ester: constants from memory (about 1500 ppm at 20 °C, 3500 ppm at 65 °C)"),
    ("insulating", "Mineral insulating oil (transformer oil, new)", 7.0895, 1567.0, 0.0, 100.0,
     "Mineral insulating oil: Oommen's equation log10 S = 7.0895 − 1567/T (constants from memory)"),
)


def saturation_ppm(temp_c: float, a: float, b: float) -> float:
    """Water content at saturation [ppm by mass], log10(S) = a - b / T.

    Parameters
    ----------
    temp_c : oil temperature [degC]
    a, b : oil constants [-], [K]; presets in OIL_PRESETS, or fitted by `fit_saturation`

    >>> round(saturation_ppm(40.0, 7.0895, 1567.0))
    122

    Source: log-linear solubility in 1/T (van 't Hoff form); Oommen's constants from memory.
    """
    return 10.0 ** (a - b / (temp_c + ZERO_CELSIUS_K))


def fit_saturation(temp1_c: float, sat1_ppm: float, temp2_c: float,
                   sat2_ppm: float) -> tuple[float, float]:
    """Constants (A, B [K]) of the saturation line through two (temperature, saturation) points.

    B = (log10 S2 - log10 S1) / (1/T1 - 1/T2),  A = log10 S1 + B / T1

    >>> a, b = fit_saturation(20.0, 200.0, 65.0, 600.0)
    >>> round(a, 4), round(b)
    (5.8863, 1051)
    """
    t1, t2 = temp1_c + ZERO_CELSIUS_K, temp2_c + ZERO_CELSIUS_K
    b = (math.log10(sat2_ppm) - math.log10(sat1_ppm)) / (1.0 / t1 - 1.0 / t2)
    return math.log10(sat1_ppm) + b / t1, b


def relative_saturation_pct(ppm: float, temp_c: float, a: float, b: float) -> float:
    """Relative saturation [%] of a content `ppm` [ppm] at `temp_c` [degC]; above 100 % is free water.

    rh = 100 * ppm / S(T)

    >>> round(relative_saturation_pct(61.0, 40.0, 7.0895, 1567.0), 1)
    50.1
    """
    return 100.0 * ppm / saturation_ppm(temp_c, a, b)


def content_ppm(rh_pct: float, temp_c: float, a: float, b: float) -> float:
    """Water content [ppm] of a sensor reading `rh_pct` [%] taken at `temp_c` [degC].

    ppm = (rh / 100) * S(T)

    >>> round(content_ppm(50.0, 40.0, 7.0895, 1567.0), 1)
    60.9
    """
    return rh_pct / 100.0 * saturation_ppm(temp_c, a, b)


def free_water_temp_c(ppm: float, a: float, b: float) -> float | None:
    """Temperature [degC] below which a content `ppm` [ppm] no longer stays dissolved.

    T_free = B / (A - log10 ppm) - 273.15, where S(T_free) = ppm. None when the oil is dry
    (0 ppm) or when the line never holds that much (ppm >= 10**A).

    >>> round(free_water_temp_c(121.8, 7.0895, 1567.0), 1)
    40.0
    """
    if ppm <= 0.0:
        return None
    margin = a - math.log10(ppm)
    if margin <= 0.0:
        return None
    return b / margin - ZERO_CELSIUS_K


def free_water_ppm(ppm: float, temp_c: float, a: float, b: float) -> float:
    """Free (undissolved) water [ppm] at `temp_c` [degC]: the content above saturation, or 0.

    >>> round(free_water_ppm(300.0, 40.0, 7.0895, 1567.0))
    178
    """
    return max(0.0, ppm - saturation_ppm(temp_c, a, b))


def water_volume_ml(ppm: float, oil_volume_l: float, oil_density_kg_m3: float = 870.0) -> float:
    """Volume of water [mL] in `oil_volume_l` [L] of oil of density [kg/m3] at `ppm` [ppm by mass].

    mL = ppm * 1e-6 * V * rho_oil / rho_water, water at 998.2 kg/m3 (20 degC)

    >>> round(water_volume_ml(500.0, 200.0, 870.0), 1)
    87.2
    """
    return ppm * 1.0e-6 * oil_volume_l * oil_density_kg_m3 / WATER_DENSITY_KG_M3 * 1000.0


class SaturationLine:
    """An oil's saturation line with the temperature range it is trusted over, and its source."""

    def __init__(self, a: float, b: float, t_low: float, t_high: float, source: str, basis: str):
        self.a, self.b = a, b
        self.t_low, self.t_high = t_low, t_high
        self.source, self.basis = source, basis

    def saturation(self, temp_c: float) -> float:
        return saturation_ppm(temp_c, self.a, self.b)

    def covers(self, temp_c: float) -> bool:
        return self.t_low <= temp_c <= self.t_high

    def describe(self) -> str:
        return f"log10 S = {self.a:.4f} − {self.b:.0f}/T"
