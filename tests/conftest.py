"""Hypothesis profiles for the suite.

``ci`` (the default) derandomises every property test: each run tries the
same examples, so ``make test`` on a clean checkout gives the same answer
every time and a red CI always means a change broke something.  ``explore``
draws fresh random examples on every run (and keeps failures in the local
example database) -- use it to hunt for new bugs, then pin what it finds
with ``@example``::

    .venv/bin/python -m pytest --hypothesis-profile=explore

The long fuzz runs of ``tests/test_fuzz_api.py`` have their own settings
(docs/reliability.md, section 4).
"""

from hypothesis import settings

settings.register_profile("ci", derandomize=True)
settings.register_profile("explore", derandomize=False)
settings.load_profile("ci")
