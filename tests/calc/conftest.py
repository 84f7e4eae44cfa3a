"""Hypothesis profiles: "ci" (CI is set) replays the same examples on every run and keeps no
example database; "dev", otherwise, draws new examples each run."""

import os

try:
    from hypothesis import settings
except ImportError:  # the property tests skip themselves without it
    pass
else:
    # No deadline in either: these machines are shared, and timings are never asserted.
    settings.register_profile("ci", derandomize=True, database=None, deadline=None)
    settings.register_profile("dev", deadline=None)
    settings.load_profile("ci" if os.environ.get("CI") else "dev")
