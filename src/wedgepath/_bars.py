"""Progress bars on standard error, by tqdm, with one meaning of ``progress=`` everywhere.

Every long computation takes ``progress: bool | None``:

``None`` (default, automatic)
    Shown only on a terminal and only once the run has lasted
    :data:`DELAY` seconds (tqdm's ``disable=None`` and ``delay``), so a quick
    call, a pipe, a log file or a notebook cell that finishes fast stays
    clean.  The environment variable ``WEDGEPATH_PROGRESS=0`` switches the
    automatic bars off.
``True``
    Shown from the start, wherever standard error goes.
``False``
    Never shown.

tqdm is imported when a bar is made, not on ``import wedgepath``.
"""

from __future__ import annotations

import os
import sys

__all__ = ["DELAY", "check_progress", "progress_bar", "Stages"]

#: seconds before an automatic (``progress=None``) bar appears
DELAY = 2.0


def check_progress(progress, name="progress"):
    """``progress`` if it is True, False or None; TypeError otherwise."""
    if progress is None or progress is True or progress is False:
        return progress
    raise TypeError(f"{name} must be True, False or None (automatic), got {progress!r}")


def _settings(progress):
    """tqdm's ``disable`` and ``delay`` for a ``progress`` value."""
    progress = check_progress(progress)
    if progress is None:
        if os.environ.get("WEDGEPATH_PROGRESS", "").strip() == "0":
            return True, 0.0
        return None, DELAY          # tqdm: off when stderr is not a terminal
    return (not progress), 0.0


def progress_bar(total, desc, progress=None, *, unit="it"):
    """A tqdm bar counting ``total`` steps (None: unknown) on standard error.

    Use as a context manager and call ``bar.update(k)``.
    """
    from tqdm import tqdm

    disable, delay = _settings(progress)
    return tqdm(total=total, desc=desc, unit=unit, disable=disable, delay=delay,
                file=sys.stderr, leave=True, dynamic_ncols=True)


class Stages:
    """Name the stage a long run is in, on one tqdm line of standard error.

    For runs made of a few long steps (decomposing a loop, drawing figures)
    where a counter would not move: ``start(name)`` announces the next stage.
    ``enabled`` is ``progress`` (True, False or None as above, without the
    delay: a stage is announced when it starts); it may be changed after the
    start, once the run turns out to be long: the line then appears at the
    next stage.

    Examples
    --------
    >>> with Stages("loop", ["faces", "cycles"], enabled=False) as st:
    ...     st.start("faces")
    ...     st.start("cycles")
    """

    def __init__(self, desc, names, enabled=None):
        self.desc = str(desc)
        self.names = [str(n) for n in names]
        self.enabled = check_progress(enabled, "enabled")
        self._bar = None
        self._done = 0

    def start(self, name):
        """Announce that stage ``name`` begins."""
        name = str(name)
        k = self.names.index(name) if name in self.names else self._done
        self._done = k
        text = f"{self.desc}: {name}"
        if self._bar is None:
            disable, _ = _settings(self.enabled)
            if disable is True:
                return
            from tqdm import tqdm

            self._bar = tqdm(total=len(self.names), desc=text, disable=disable, file=sys.stderr,
                             leave=True, initial=k, bar_format="{desc} ({n}/{total} done, {elapsed})")
            return
        self._bar.set_description_str(text, refresh=False)
        self._bar.n = max(self._bar.n, k)
        self._bar.refresh()                 # a stage change is always shown (no rate limit)

    def close(self):
        """Finish the line ("desc: done in ...") if one was shown."""
        if self._bar is not None:
            bar, self._bar = self._bar, None
            bar.bar_format = "{desc} in {elapsed}"
            bar.desc = f"{self.desc}: done"
            bar.update(bar.total - bar.n)
            bar.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False
