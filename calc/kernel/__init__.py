"""The kernel: what every tool is built from.

registry (tools, checklists, fields, outputs, topics), units and number parsing, the one
input error, results and verdicts, the grading of a value against its bands, shared
physical constants, the SVG chart kit and the solver. Nothing here knows a tool.
"""
