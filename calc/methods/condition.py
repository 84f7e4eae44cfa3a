"""Changes of an in-service oil from the new oil: the two differences an oil analysis trends.

Sources: definitions (a change from a reference value); ASTM D445 (kinematic viscosity) and
ASTM D664 / D974 (acid number) give the readings compared.
"""

from __future__ import annotations


def viscosity_change_pct(kv40_now_cst: float, kv40_new_cst: float) -> float:
    """Change of KV40 from the new oil [%]: (now - new) / new * 100.

    Rounded to 1e-9 % so that a reading exactly on a limit stays on it.

    >>> viscosity_change_pct(50.6, 46.0), viscosity_change_pct(41.4, 46.0)
    (10.0, -10.0)
    """
    return round((kv40_now_cst - kv40_new_cst) / kv40_new_cst * 100.0, 9)


def acid_number_rise(an_now: float, an_new: float) -> float:
    """Rise of the acid number over the new oil [mg KOH/g], rounded to 1e-9 as above.

    >>> acid_number_rise(0.6, 0.3)
    0.3
    """
    return round(an_now - an_new, 9)
