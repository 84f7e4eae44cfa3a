"""Physical constants and exact unit factors, each defined once with its source.

>>> round(ZERO_CELSIUS_K + 40.0, 2)
313.15
>>> round(1.0 / PSI_IN_BAR, 4)
14.5038
"""

from __future__ import annotations

# Temperature: 0 degC is 273.15 K by the definition of the Celsius scale (SI Brochure, 9th ed.).
ZERO_CELSIUS_K = 273.15
ABSOLUTE_ZERO_C = -ZERO_CELSIUS_K

# Standard acceleration of gravity [m/s^2] (3rd CGPM, 1901).
STANDARD_GRAVITY = 9.80665
# Standard atmosphere [bar] (ISO 2533; 101 325 Pa).
STANDARD_ATMOSPHERE_BAR = 1.01325
# The standard atmosphere as pressure gauges and data sheets round it [bar absolute]: the
# default of the atmospheric-pressure fields (common practice).
ATMOSPHERE_ROUNDED_BAR = 1.013
# Stefan-Boltzmann constant [W/(m^2 K^4)] (CODATA 2018).
STEFAN_BOLTZMANN = 5.670374419e-8
# Molar gas constant [J/(mol K)] (CODATA 2018, exact).
GAS_CONSTANT = 8.314462618

# Exact conversion factors: NIST SP 811 (2008), appendix B. One US unit in metric units.
PSI_IN_BAR = 0.0689475729  # 1 psi = 6894.757 Pa
GAL_IN_L = 3.785411784  # US liquid gallon, exact
HP_IN_KW = 0.745699872  # mechanical horsepower
INCH_IN_MM = 25.4  # exact
FOOT_IN_M = 0.3048  # exact
LB_IN_KG = 0.45359237  # exact
LBF_IN_KN = 0.0044482216152605  # exact
