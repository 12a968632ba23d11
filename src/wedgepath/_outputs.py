"""Writing a run's output files: planned before the work, committed with a manifest.

The command line writes a fixed set of files into ``--out DIR``.  This module
makes that safe:

* **Plan first.**  :class:`OutputSet` is built from the complete list of file
  names the run will write, before any computation; :meth:`OutputSet.check`
  refuses at once a folder where one of them exists (without ``--force``),
  is a folder, or is the input itself (same file: compared by device and
  inode, so hard links and other paths to it count).  ``os.path.lexists``
  is used throughout: a dangling symbolic link occupies its name.
* **Replace only what the run writes.**  ``--force`` replaces the planned
  files and nothing else; no other file is ever removed.  A file is replaced
  by renaming a new file over its name, which replaces a symbolic link
  itself and never writes through it.
* **Commit with a manifest.**  The files are written into a temporary folder
  ``.wedgepath-tmp-*`` inside the output folder, then moved in one by one:
  first the previous ``manifest.json`` is removed, then every file is renamed
  into place, and the new ``manifest.json`` (name, size and SHA-256 of every
  file of the run) is renamed in last.  A reader who finds no manifest, or a
  file that does not match it, knows the folder does not hold one complete
  run.  The temporary folder is removed on errors and on SIGINT/SIGTERM
  (handlers installed for the commit only, and restored afterwards).

Text tables are written by :func:`csv_text` (the :mod:`csv` module, minimal
quoting, and text cells that a spreadsheet would run as a formula prefixed with
a single quote).
"""

from __future__ import annotations

import contextlib
import csv
import hashlib
import io
import json
import math
import os
import shutil
import signal
import stat
import tempfile
import threading

import numpy as np

__all__ = ["OutputSet", "OutputError", "Interrupted", "csv_text", "safe_cell", "frame_csv",
           "json_text", "encode", "MANIFEST", "MANIFEST_SCHEMA"]

MANIFEST = "manifest.json"
MANIFEST_SCHEMA = "wedgepath.manifest/1"
_TMP_PREFIX = ".wedgepath-tmp-"
#: first characters that make a spreadsheet treat a cell as a formula (OWASP, "CSV
#: Injection"), and the quote that marks a neutralised cell (so it is prefixed as well, which
#: makes the rule reversible: drop one leading ' from a text cell that starts with one)
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r", "'")


class OutputError(ValueError):
    """The output folder cannot take this run's files (one line; exit code 2)."""


class Interrupted(KeyboardInterrupt):
    """SIGINT or SIGTERM arrived while the files were written; ``signum`` says which."""

    def __init__(self, signum):
        super().__init__(signum)
        self.signum = signum


# --------------------------------------------------------------------------- CSV
def safe_cell(value) -> str:
    """One CSV cell: numbers as ``repr`` of a float (``nan`` for NaN), text neutralised.

    Text that starts with ``= + - @``, a tab, a carriage return or ``'`` gets a
    leading ``'``, so a spreadsheet shows it as text instead of running it as
    a formula; numbers are never changed (``-2.5`` stays a number).

    Examples
    --------
    >>> from wedgepath._outputs import safe_cell
    >>> safe_cell('=HYPERLINK("x")'), safe_cell("-a"), safe_cell(-2.5), safe_cell("a,b")
    ('\\'=HYPERLINK("x")', "'-a", '-2.5', 'a,b')
    >>> safe_cell(3), safe_cell(float("nan"))
    ('3', 'nan')
    """
    if isinstance(value, str):
        return "'" + value if value.startswith(_FORMULA_START) else value
    if isinstance(value, (bool, np.bool_)):
        raise TypeError("a CSV cell cannot be a boolean")
    if isinstance(value, (int, np.integer)):
        return str(int(value))
    v = float(value)
    return "nan" if math.isnan(v) else repr(v)


def csv_text(rows) -> str:
    """Rows of cells (text or numbers) as CSV text: the csv module, minimal quoting, ``\\n``."""
    buf = io.StringIO()
    w = csv.writer(buf, quoting=csv.QUOTE_MINIMAL, lineterminator="\n")
    for r in rows:
        w.writerow([safe_cell(c) for c in r])
    return buf.getvalue()


def frame_csv(frame) -> str:
    """A pandas DataFrame as CSV text by :func:`csv_text` (a named index is the first column).

    Booleans are written ``true``/``false``; numbers as :func:`safe_cell` writes them.
    """
    cols = list(frame.columns)
    named = frame.index.name is not None
    head = ([frame.index.name] if named else []) + [str(c) for c in cols]
    rows = [head]
    data = [frame[c].tolist() for c in cols]
    index = frame.index.tolist()
    for r in range(len(frame)):
        row = [index[r]] if named else []
        for col in data:
            v = col[r]
            row.append(("true" if v else "false") if isinstance(v, (bool, np.bool_)) else v)
        rows.append(row)
    return csv_text(rows)


def json_text(payload) -> str:
    """JSON text of a report's ``to_dict()``: indented, no NaN (they are ``null`` already)."""
    return json.dumps(payload, indent=2, allow_nan=False, ensure_ascii=False) + "\n"


def encode(data) -> bytes:
    """One output file's bytes: text, a DataFrame (CSV), a dict (JSON) or a matplotlib
    Figure (PNG, closed after)."""
    if isinstance(data, bytes):
        return data
    if isinstance(data, str):
        return data.encode("utf-8")
    if isinstance(data, dict):
        return json_text(data).encode("utf-8")
    if hasattr(data, "savefig"):
        from .plotting import png_bytes
        return png_bytes(data)
    if hasattr(data, "columns") and hasattr(data, "index"):
        return frame_csv(data).encode("utf-8")
    raise TypeError(f"cannot write a {type(data).__name__} as a file")


# --------------------------------------------------------------------------- plan and commit
def _file_mode():
    """0666 less the process umask: the mode ``open()`` would give a new file."""
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def _ident(st):
    return (st.st_dev, st.st_ino)


class OutputSet:
    """The files one run writes into ``folder`` (``None``: no folder, nothing written).

    Parameters
    ----------
    folder : str or None
        The ``--out`` folder.
    names : sequence of str
        Every file the run will write (plain names); ``manifest.json`` is added.
    force : bool
        Replace existing files of these names (and only those).
    inputs : sequence of str
        Files the run reads; an output that is one of them is always refused.
    command : str
        Recorded in the manifest.
    option : str
        How the folder was given, for messages (``"--out"``).
    """

    def __init__(self, folder, names, *, force=False, inputs=(), command="", option="--out"):
        self.folder = None if folder is None else os.fspath(folder)
        names = list(names)
        for n in names:
            if not n or os.sep in n or (os.altsep and os.altsep in n) or n in (".", ".."):
                raise ValueError(f"bad output file name {n!r}")
        if len(set(names)) != len(names) or MANIFEST in names:
            raise ValueError(f"output names repeat or include {MANIFEST}: {names}")
        self.names = tuple(names)
        self.force = bool(force)
        self.inputs = tuple(os.fspath(p) for p in inputs if p is not None)
        self.command = command
        self.option = option

    @property
    def all_names(self):
        return self.names + (MANIFEST,)

    # ------------------------------------------------------------ check
    def _input_ids(self):
        ids = {}
        for p in self.inputs:
            try:
                st = os.stat(p)
            except (OSError, ValueError):
                continue
            if stat.S_ISREG(st.st_mode):
                ids[_ident(st)] = p
        return ids

    def check(self):
        """Refuse now (OutputError) what the commit would refuse: call before computing."""
        if self.folder is None:
            return
        folder = self.folder
        if os.path.lexists(folder):
            if os.path.islink(folder) and not os.path.exists(folder):
                raise OutputError(f"{self.option} {folder} is a symbolic link to nothing; "
                                  "give an existing folder or a new name")
            if not os.path.isdir(folder):
                raise OutputError(f"{self.option} {folder} exists and is not a folder")
            if not os.access(folder, os.W_OK | os.X_OK):
                raise OutputError(f"cannot write to {folder}: permission denied")
        else:
            parent = os.path.dirname(os.path.abspath(folder))
            while not os.path.lexists(parent):
                parent = os.path.dirname(parent)
            if not os.path.isdir(parent):
                raise OutputError(f"cannot create {self.option} {folder}: {parent} is not a "
                                  "folder")
            if not os.access(parent, os.W_OK | os.X_OK):
                raise OutputError(f"cannot create {self.option} {folder}: permission denied "
                                  f"in {parent}")
            return
        inputs = self._input_ids()
        taken = []
        for name in self.all_names:
            path = os.path.join(folder, name)
            try:
                st = os.lstat(path)
            except FileNotFoundError:
                continue
            except OSError as exc:
                raise OutputError(f"cannot check {path}: {exc.strerror}") from None
            if _ident(st) in inputs:
                raise OutputError(f"{path} is the input table {inputs[_ident(st)]}; writing "
                                  f"this run's {name} there would destroy it: choose another "
                                  f"{self.option} folder")
            if stat.S_ISDIR(st.st_mode):
                raise OutputError(f"{path} is a folder; this run writes a file of that name")
            taken.append(path)
        if taken and not self.force:
            more = f" (and {len(taken) - 1} more of this run's files)" if len(taken) > 1 else ""
            raise OutputError(f"{taken[0]} exists{more}; use --force to replace this run's "
                              "files (no other file is touched)")

    # ------------------------------------------------------------ commit
    def manifest(self, files) -> bytes:
        from . import __version__
        entries = [{"name": n, "bytes": len(files[n]),
                    "sha256": hashlib.sha256(files[n]).hexdigest()} for n in self.names]
        payload = {"schema": MANIFEST_SCHEMA, "wedgepath_version": __version__,
                   "command": self.command, "files": entries}
        return (json.dumps(payload, indent=2) + "\n").encode("utf-8")

    def commit(self, files) -> list:
        """Write ``files`` (exactly the planned names; each bytes, text, a DataFrame, a dict
        or a Figure, see :func:`encode`); return the paths.

        Without a folder nothing is written and ``[]`` is returned.
        """
        if self.folder is None:
            return []
        if set(files) != set(self.names):
            extra = sorted(set(files) - set(self.names))
            missing = sorted(set(self.names) - set(files))
            raise RuntimeError(f"output files differ from the plan: extra {extra}, "
                               f"missing {missing}")
        files = {n: encode(d) for n, d in files.items()}
        self.check()                      # again: the folder may have changed meanwhile
        folder = self.folder
        created = not os.path.lexists(folder)
        mode = _file_mode()
        stage = None
        done = False
        with _signals_raise():
            try:
                try:
                    os.makedirs(folder, exist_ok=True)
                    stage = tempfile.mkdtemp(prefix=_TMP_PREFIX, dir=folder)
                    for name in self.all_names:
                        data = files[name] if name != MANIFEST else self.manifest(files)
                        _write_new(os.path.join(stage, name), data, mode)
                    # the previous manifest goes first: from here until the new one is in
                    # place, a reader sees no manifest and knows the set is incomplete
                    old = os.path.join(folder, MANIFEST)
                    if os.path.lexists(old):
                        os.unlink(old)
                    for name in self.all_names:     # the manifest is the last one
                        os.replace(os.path.join(stage, name), os.path.join(folder, name))
                    _sync_dir(folder)
                except OSError as exc:
                    where = exc.filename if isinstance(exc.filename, str) else folder
                    raise OutputError(f"cannot write to {folder}: {exc.strerror or exc}"
                                      + ("" if where == folder else
                                         f" ({os.path.basename(where)})")) from None
                done = True
            except Interrupted as exc:
                exc.folder = folder
                raise
            finally:
                if stage is not None:
                    shutil.rmtree(stage, ignore_errors=True)
                if not done and created:
                    with contextlib.suppress(OSError):
                        os.rmdir(folder)          # only if empty
        return [os.path.join(folder, n) for n in self.all_names]


def _write_new(path, data, mode):
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
    with os.fdopen(fd, "wb") as fh:
        fh.write(data)
        fh.flush()
        os.fsync(fh.fileno())
    os.chmod(path, mode)                  # results are ordinary files (umask applied)


def _sync_dir(folder):
    """Make the renames durable (best effort: not every system can open a folder)."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


@contextlib.contextmanager
def _signals_raise():
    """Turn SIGINT/SIGTERM into :class:`Interrupted` inside the block; restore the handlers."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def handler(signum, frame):
        raise Interrupted(signum)

    old = {}
    try:
        for s in (signal.SIGINT, signal.SIGTERM):
            old[s] = signal.signal(s, handler)
        yield
    finally:
        for s, h in old.items():
            signal.signal(s, h if h is not None else signal.SIG_DFL)
