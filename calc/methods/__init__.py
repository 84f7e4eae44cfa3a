"""Published methods as pure functions: one method per function, its units in the
parameter names and docstring, a worked example that runs as a doctest, and its source.

Nothing here knows a form, a field or a verdict; calc.tools builds on these.
"""
