"""Oil oxidation life against temperature, life used by a temperature profile, and the
remaining life from a trend of oxidation-reserve readings.

Mineral oil oxidises faster when hotter. The trade's rule: the rate doubles for
every 10 K, so the life halves (common practice, sometimes credited to Arrhenius
and to van 't Hoff):

    L(T) = L_ref * 2 ** ((T_ref - T) / step)                       step = 10 K

The Arrhenius form with an activation energy Ea

    L(T) = L_ref * exp(Ea / R * (1 / T - 1 / T_ref))                T in kelvin

agrees with the doubling rule at T_ref in value and slope when
Ea = R * T_ref**2 * ln 2 / step; away from T_ref the two part slowly.

Life used by hours h_i at temperatures T_i is a Miner-style sum of the hours
weighted by the rate at each temperature, equivalent hours at T_ref:

    H_eq = sum(h_i * L_ref / L(T_i))         fraction used = H_eq / L_ref

Sources: doubling per 10 K, common practice; Arrhenius equation (IUPAC Gold Book,
"Arrhenius equation"); gas constant CODATA 2018 (exact since the 2019 SI).
"""

from __future__ import annotations

import math

from ..kernel.constants import GAS_CONSTANT, ZERO_CELSIUS_K


# The trade's rule of thumb: the oxidation rate doubles for every 10 K (common practice).
DOUBLING_STEP_K = 10.0


def life_doubling(temp_c: float, ref_life_h: float, ref_temp_c: float,
                  step_k: float = DOUBLING_STEP_K) -> float:
    """Life [h] at `temp_c` [degC] when it halves for every `step_k` [K] of heat.

    L = ref_life_h * 2 ** ((ref_temp_c - temp_c) / step_k)

    >>> life_doubling(70.0, 10000.0, 60.0), life_doubling(50.0, 10000.0, 60.0)
    (5000.0, 20000.0)

    Source: common practice (rate doubles per 10 K).
    """
    return ref_life_h * 2.0 ** ((ref_temp_c - temp_c) / step_k)


def activation_energy_for_doubling(ref_temp_c: float, step_k: float = DOUBLING_STEP_K) -> float:
    """Activation energy [J/mol] whose Arrhenius rate has the doubling rule's slope at T_ref.

    Ea = R * T_ref**2 * ln 2 / step_k, T_ref in kelvin.

    >>> round(activation_energy_for_doubling(60.0) / 1000.0, 2)
    63.96
    """
    t_ref = ref_temp_c + ZERO_CELSIUS_K
    return GAS_CONSTANT * t_ref ** 2 * math.log(2.0) / step_k


def life_arrhenius(temp_c: float, ref_life_h: float, ref_temp_c: float,
                   activation_j_mol: float) -> float:
    """Life [h] at `temp_c` [degC] for an Arrhenius rate of activation energy [J/mol].

    L = ref_life_h * exp(Ea / R * (1 / T - 1 / T_ref)), T in kelvin.

    >>> round(life_arrhenius(70.0, 10000.0, 60.0, activation_energy_for_doubling(60.0)))
    5102

    Source: Arrhenius equation (IUPAC Gold Book).
    """
    exponent = activation_j_mol / GAS_CONSTANT * (1.0 / (temp_c + ZERO_CELSIUS_K) - 1.0 / (ref_temp_c + ZERO_CELSIUS_K))
    return ref_life_h * math.exp(exponent)


def equivalent_hours(profile: list[tuple[float, float]], ref_temp_c: float, life_at) -> float:
    """Hours at `ref_temp_c` that age the oil as much as `profile` [(hours, degC), ...].

    `life_at(temp_c, ref_life_h)` is the life model; the sum is Miner-style.

    >>> model = lambda t, life: life_doubling(t, life, 60.0)
    >>> equivalent_hours([(1000.0, 70.0), (1000.0, 50.0)], 60.0, model)
    2500.0
    """
    return sum(hours * 1.0 / life_at(temp_c, 1.0) for hours, temp_c in profile)


def equivalent_temperature_doubling(total_h: float, equivalent_h: float, ref_temp_c: float,
                                    step_k: float = DOUBLING_STEP_K) -> float:
    """Steady temperature [degC] that ages the oil as much as the profile (doubling rule).

    T_eq = T_ref + step * log2(H_eq / H_total)

    >>> equivalent_temperature_doubling(1000.0, 2000.0, 60.0)
    70.0
    """
    return ref_temp_c + step_k * math.log2(equivalent_h / total_h)


def equivalent_temperature_arrhenius(total_h: float, equivalent_h: float, ref_temp_c: float,
                                     activation_j_mol: float) -> float:
    """Steady temperature [degC] that ages the oil as much as the profile (Arrhenius).

    1 / T_eq = 1 / T_ref - R / Ea * ln(H_eq / H_total)

    >>> round(equivalent_temperature_arrhenius(1000.0, 1000.0, 60.0, 64000.0), 6)
    60.0
    """
    inverse = 1.0 / (ref_temp_c + ZERO_CELSIUS_K) - GAS_CONSTANT / activation_j_mol * math.log(equivalent_h / total_h)
    return 1.0 / inverse - ZERO_CELSIUS_K


def hours_to_limit(reserve_now: float, reserve_before: float, interval_h: float,
                   limit: float) -> float | None:
    """Hours from now until a falling reading reaches `limit`, by a straight line.

    rate = (before - now) / interval;  hours = (now - limit) / rate.
    None when the reading is not falling; 0 when it is already at or below the limit.

    >>> hours_to_limit(62.0, 80.0, 2000.0, 25.0)
    4111.111111111111
    """
    if reserve_now <= limit:
        return 0.0
    rate = (reserve_before - reserve_now) / interval_h
    if rate <= 0.0:
        return None
    return (reserve_now - limit) / rate
