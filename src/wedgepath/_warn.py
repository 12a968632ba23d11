"""Warnings reported at the caller's line.

``warnings.warn(..., stacklevel=n)`` needs the number of frames between the
call and the user's code, which differs from one entry point to another (and
changes whenever the code inside is reorganised).  :func:`warn` counts them:
it reports the warning at the first frame, going outwards, whose code lives
outside the wedgepath package -- the user's own line (a script, a notebook
cell, a test) however deep inside wedgepath the warning was raised.
"""

from __future__ import annotations

import os
import sys
import warnings

__all__ = ["warn", "caller_stacklevel"]

_PACKAGE = os.path.dirname(os.path.abspath(__file__)) + os.sep


def _inside(filename: str) -> bool:
    try:
        return os.path.abspath(filename).startswith(_PACKAGE)
    except (TypeError, ValueError):   # odd pseudo-file names such as "<string>"
        return False


def caller_stacklevel(skip: int = 1) -> int:
    """The ``stacklevel`` that points at the first frame outside wedgepath.

    ``skip`` frames (the caller of this function itself by default) count as
    level 1.
    """
    frame = sys._getframe(skip)
    level = 1
    while frame is not None and _inside(frame.f_code.co_filename):
        frame = frame.f_back
        level += 1
    return level


def warn(message: str, category: type = UserWarning) -> None:
    """Issue ``category(message)`` at the user's line (the first frame outside wedgepath).

    Examples
    --------
    >>> import warnings
    >>> from wedgepath._warn import warn
    >>> with warnings.catch_warnings(record=True) as seen:
    ...     warnings.simplefilter("always")
    ...     warn("look here")
    >>> seen[0].filename.endswith(".py")
    False
    """
    warnings.warn(message, category, stacklevel=caller_stacklevel(2) + 1)
