"""The demo behind ``wedgepath demo``: both main jobs on bundled, invented data.

1. Lead and lag: eight pressure taps around a made-up duct see a rotating
   disturbance; the file stores them in a scrambled column order.  The demo
   recovers their cyclic order and checks it against the order the data
   were generated with.
2. Loop: a made-up elastomer pad in a cyclic load test (a Kelvin-Voigt
   solid).  The demo measures the energy dissipated per cycle and checks it
   against the closed form pi * eta * omega * e0^2.

The data files are written by ``examples/generate_demo_data.py``; their
ground truth is stated there and in ``docs/demo.md``.
"""

from __future__ import annotations

import math
import os
import sys
from importlib import resources

__all__ = ["run", "bundled", "RING_ORDER", "LOAD"]

#: the true cyclic order of the ring taps (each leads the next)
RING_ORDER = ["north", "northeast", "east", "southeast", "south", "southwest", "west", "northwest"]
#: parameters of the invented load test (strain mm/mm, stress MPa, time s)
LOAD = {"e0": 0.02, "E": 5.0, "eta": 0.4, "f": 0.5}


def bundled(name: str):
    """Read a bundled demo table (``ring_sensors.csv``, ``load_test.csv``, ``gantry_loop.csv``)."""
    from .io import read_table
    with resources.as_file(resources.files("wedgepath") / "data" / name) as f:
        return read_table(f, time_column="time_s")


def _bundled_path(name: str):
    """The bundled table's path on disk, or None (e.g. inside a zip)."""
    res = resources.files("wedgepath") / "data" / name
    return str(res) if isinstance(res, os.PathLike) or hasattr(res, "__fspath__") else None


#: the options of the demo's two reports (the files follow from them)
LEADLAG_OPTIONS = dict(window=600, step=150, n_surrogates=199, surrogate_method="shift",
                       seed=1, n_boot=199)


def planned_files(figures: bool) -> list:
    """The files ``wedgepath demo --out DIR`` writes (``manifest.json`` comes on top)."""
    from .report import leadlag_files, loop_files
    return (leadlag_files(figures, window=True, significance=True, json_name="leadlag.json")
            + loop_files(figures, json_name="loop.json"))


def _same_cycle(found, truth):
    """True when ``found`` is a rotation of ``truth``."""
    if sorted(found) != sorted(truth):
        return False
    k = found.index(truth[0])
    return found[k:] + found[:k] == truth


def run(out=None, force=False, figures=True, quiet=False) -> int:
    """Run the demo; print summaries and checks; return 0 when every check passes."""
    import dataclasses

    from . import report
    from ._outputs import OutputSet

    figures = bool(figures) and out is not None
    if figures:
        try:
            import matplotlib  # noqa: F401
        except ImportError:
            print("note: matplotlib is not installed; no figures drawn", file=sys.stderr)
            figures = False
    # every file is known and checked before the work: a taken name fails at once
    output = OutputSet(out, planned_files(figures), force=force, command="demo",
                       inputs=[_bundled_path(n) for n in ("ring_sensors.csv", "load_test.csv")])
    output.check()
    files = {}
    ok = True
    progress = False if quiet else None

    ring = bundled("ring_sensors.csv")
    print("=" * 72)
    print("1. Lead and lag: eight taps around a duct (invented data, scrambled columns)")
    print("=" * 72)
    rep = report.leadlag(ring, **LEADLAG_OPTIONS, progress=progress, time_name="time_s",
                         units={"time_s": "s"},
                         source={"table": "wedgepath/data/ring_sensors.csv",
                                 "time_column": "time_s"})
    rep = dataclasses.replace(rep, json_name="leadlag.json")
    print("\n".join(rep.summary()))
    found = [rep.names[k] for k in rep.order.order] if rep.order is not None else []
    good = _same_cycle(found, RING_ORDER)
    ok &= good
    print(f"\ncheck: cyclic order {'recovered' if good else 'NOT recovered'} "
          f"(true order: {' -> '.join(RING_ORDER)})")
    if out is not None:
        files.update(rep.files(figures))

    load = bundled("load_test.csv")
    print()
    print("=" * 72)
    print("2. Loop: cyclic load test of an elastomer pad (invented data)")
    print("=" * 72)
    lrep = report.loop(load, energy="y_dx", progress=progress, time_name="time_s",
                       units={"strain": "mm/mm", "stress_MPa": "MPa", "time_s": "s"},
                       source={"table": "wedgepath/data/load_test.csv", "time_column": "time_s"})
    lrep = dataclasses.replace(lrep, json_name="loop.json")
    print("\n".join(lrep.summary()))
    omega = 2 * math.pi * LOAD["f"]
    truth = math.pi * LOAD["eta"] * omega * LOAD["e0"] ** 2
    _, count, mean, std = lrep.cycle_stats()
    rel = abs(mean - truth) / truth
    good = rel < 0.01
    ok &= good
    print(f"\ncheck: energy per cycle {mean * 1e3:.4f} kJ/m^3 (mean of {count} cycles, std "
          f"{std * 1e3:.4f}); known value pi*eta*omega*e0^2 = {truth * 1e3:.4f} kJ/m^3 -> "
          f"{'recovered' if good else 'NOT recovered'} within {100 * rel:.2f}%")
    if out is not None:
        files.update(lrep.files(False))
        if figures:
            # the known energy per cycle, in the data's units (MPa x mm/mm = MJ/m^3)
            files.update(lrep.figures(reference=truth, reference_label="known value"))
    written = output.commit(files)
    if written:
        print(f"\nwrote {len(written)} files to {out}")
    print("\nall checks passed" if ok else "\nSOME CHECKS FAILED")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(run())
