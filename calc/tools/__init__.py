"""The tools: one module per topic, each tool declared once with `calc.kernel.registry.tool`.

A declaration names the inputs (fields) and outputs; its function computes with
calc.methods and grades the result against bands of limits (calc.kernel.grading).
Modules here are found by the registry: adding one needs no list to be edited.
"""
