"""A small progress indicator for long runs, written to standard error.

Long computations (surrogate tests, bootstraps, and later the command line)
report their progress through :class:`Progress`.  It is quiet for short runs:
with ``enabled=None`` (automatic) nothing is printed until the run has lasted
``delay`` seconds, so a call that finishes quickly leaves the terminal clean.
``enabled=False`` silences it completely; ``enabled=True`` shows it from the
first update.  The environment variable ``WEDGEPATH_PROGRESS=0`` silences
automatic indicators everywhere (explicit ``enabled=True`` still shows).

The line is redrawn in place with a carriage return at most every
``interval`` seconds and finished with a newline by :meth:`Progress.close`
(or on leaving a ``with`` block).
"""

from __future__ import annotations

import os
import sys
import time

__all__ = ["Progress", "Stages"]


def _format_seconds(s: float) -> str:
    s = max(0.0, s)
    if s < 60:
        return f"{s:.0f}s"
    m, s = divmod(int(round(s)), 60)
    if m < 60:
        return f"{m}m{s:02d}s"
    h, m = divmod(m, 60)
    return f"{h}h{m:02d}m"


class Progress:
    """Count finished steps of a long run and show them on one line.

    Parameters
    ----------
    total : int
        Number of steps expected (at least 1).
    desc : str
        Short label printed before the counter.
    enabled : bool or None
        ``True``: always show; ``False``: never show; ``None`` (default):
        show only once the run has lasted ``delay`` seconds, and only when
        ``WEDGEPATH_PROGRESS`` is not set to ``0``.
    delay : float
        Seconds before an automatic indicator first appears.
    interval : float
        Minimum seconds between redraws.
    stream : file-like, optional
        Where to write; default ``sys.stderr`` (looked up at each write).

    Examples
    --------
    >>> import io
    >>> out = io.StringIO()
    >>> with Progress(3, "surrogates", enabled=True, interval=0, stream=out) as bar:
    ...     for _ in range(3):
    ...         bar.update()
    >>> out.getvalue().splitlines()[-1].split("\\r")[-1].startswith("surrogates: 3/3")
    True
    >>> quiet = io.StringIO()
    >>> with Progress(3, "quiet", enabled=False, stream=quiet) as bar:
    ...     bar.update(3)
    >>> quiet.getvalue()
    ''
    """

    def __init__(self, total, desc="", enabled=None, *, delay=2.0, interval=0.25, stream=None):
        if isinstance(total, bool) or not isinstance(total, int) or total < 1:
            raise ValueError(f"total must be a positive integer, got {total!r}")
        if enabled not in (None, True, False):
            raise TypeError(f"enabled must be True, False or None, got {enabled!r}")
        self.total = total
        self.desc = str(desc)
        if enabled is None and os.environ.get("WEDGEPATH_PROGRESS", "").strip() == "0":
            enabled = False
        self.enabled = enabled
        self.delay = float(delay)
        self.interval = float(interval)
        self._stream = stream
        self.done = 0
        self._t0 = time.perf_counter()
        self._last_draw = -float("inf")
        self._shown = False
        self._closed = False

    # ------------------------------------------------------------------
    @property
    def stream(self):
        return sys.stderr if self._stream is None else self._stream

    def _should_draw(self, now: float) -> bool:
        if self.enabled is False:
            return False
        if self.enabled is None and now - self._t0 < self.delay:
            return False
        return now - self._last_draw >= self.interval or self.done >= self.total

    def _line(self, now: float) -> str:
        elapsed = now - self._t0
        pct = 100.0 * self.done / self.total
        text = f"{self.desc}: {self.done}/{self.total} ({pct:.0f}%) {_format_seconds(elapsed)}"
        if 0 < self.done < self.total:
            eta = elapsed * (self.total - self.done) / self.done
            text += f", about {_format_seconds(eta)} left"
        return text

    def update(self, steps: int = 1) -> None:
        """Record ``steps`` more finished steps and redraw if due."""
        self.done = min(self.total, self.done + int(steps))
        now = time.perf_counter()
        if self._should_draw(now):
            stream = self.stream
            stream.write("\r" + self._line(now))
            stream.flush()
            self._last_draw = now
            self._shown = True

    def close(self) -> None:
        """Finish the line (only if something was shown)."""
        if self._closed:
            return
        self._closed = True
        if self._shown:
            stream = self.stream
            stream.write("\r" + self._line(time.perf_counter()) + "\n")
            stream.flush()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False


class Stages:
    """Name the stage a long run is in, on one line of standard error.

    For runs made of a few long steps (decomposing a loop, drawing figures)
    where a counter would not move.  ``enabled`` decides; the environment
    variable ``WEDGEPATH_PROGRESS=0`` silences it all the same.

    Examples
    --------
    >>> import io
    >>> out = io.StringIO()
    >>> with Stages("loop", ["faces", "cycles"], enabled=True, stream=out) as st:
    ...     st.start("faces")
    ...     st.start("cycles")
    >>> [part.split(",")[0] for part in out.getvalue().strip().split("\\r") if part][:2]
    ['loop: faces (1/2)', 'loop: cycles (2/2)']
    """

    def __init__(self, desc, names, enabled=False, *, stream=None):
        self.desc = str(desc)
        self.names = [str(n) for n in names]
        if os.environ.get("WEDGEPATH_PROGRESS", "").strip() == "0":
            enabled = False
        self.enabled = bool(enabled)
        self._stream = stream
        self._t0 = time.perf_counter()
        self._width = 0
        self._shown = False

    @property
    def stream(self):
        return sys.stderr if self._stream is None else self._stream

    def _draw(self, text):
        pad = " " * max(0, self._width - len(text))
        self._width = len(text)
        self.stream.write("\r" + text + pad)
        self.stream.flush()
        self._shown = True

    def start(self, name):
        """Announce that stage ``name`` begins."""
        if not self.enabled:
            return
        name = str(name)
        k = self.names.index(name) + 1 if name in self.names else len(self.names)
        elapsed = _format_seconds(time.perf_counter() - self._t0)
        self._draw(f"{self.desc}: {name} ({k}/{len(self.names)}), {elapsed} so far")

    def close(self):
        if self._shown:
            self._draw(f"{self.desc}: done in {_format_seconds(time.perf_counter() - self._t0)}")
            self.stream.write("\n")
            self.stream.flush()
            self._shown = False

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False
