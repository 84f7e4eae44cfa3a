"""Hypothesis profiles: "ci" (CI is set) replays the same examples on every run and keeps no
example database; "dev", otherwise, draws new examples each run."""

import os

try:
    from hypothesis import settings
except ImportError:  # the property tests skip themselves without it
    pass
else:
    settings.register_profile("ci", derandomize=True, database=None)
    settings.register_profile("dev")
    settings.load_profile("ci" if os.environ.get("CI") else "dev")
