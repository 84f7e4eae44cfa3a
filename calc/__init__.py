"""Sumpside calculators: hydraulic oil, water, tank and circuit, standard library only.

Every tool is declared in `calc.registry` beside the function that computes it;
`calc.bridge` answers JSON requests for the web worker and the command line.
"""

__version__ = "0.1.0"
