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
import sys
from importlib import resources

import numpy as np

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


def _same_cycle(found, truth):
    """True when ``found`` is a rotation of ``truth``."""
    if sorted(found) != sorted(truth):
        return False
    k = found.index(truth[0])
    return found[k:] + found[:k] == truth


def run(out=None, force=False, figures=True, quiet=False) -> int:
    """Run the demo; print summaries and checks; return 0 when every check passes."""
    from .cli import LEADLAG_FILES, LOOP_FILES, Output, _dump_json, leadlag_report, \
        leadlag_summary, leadlag_tables, loop_report, loop_summary, loop_tables

    family = ("leadlag.json", "loop.json") + tuple(
        f for f in LEADLAG_FILES + LOOP_FILES if f != "result.json")
    output = Output(out, force, family)
    output.check_free(["leadlag.json", "loop.json", "area_matrix.csv"])
    ok = True

    ring = bundled("ring_sensors.csv")
    print("=" * 72)
    print("1. Lead and lag: eight taps around a duct (invented data, scrambled columns)")
    print("=" * 72)
    rep = leadlag_report(ring.values, ring.times, ring.names, window=600, step=150,
                         surrogates=199, surrogate_method="shift", seed=1,
                         progress=False if quiet else None)
    print("\n".join(leadlag_summary(rep)))
    found = rep["cyclic_order"]["order"]
    good = _same_cycle(found, RING_ORDER)
    ok &= good
    print(f"\ncheck: cyclic order {'recovered' if good else 'NOT recovered'} "
          f"(true order: {' -> '.join(RING_ORDER)})")
    rep["input"] = {"table": "wedgepath/data/ring_sensors.csv", "time_column": "time_s"}
    rep["units"] = {"time_s": "s"}
    output.add("leadlag.json", _dump_json(rep))
    for name, text in leadlag_tables(rep).items():
        output.add(name, text)

    load = bundled("load_test.csv")
    print()
    print("=" * 72)
    print("2. Loop: cyclic load test of an elastomer pad (invented data)")
    print("=" * 72)
    lrep = loop_report(load.values, load.times, load.names, energy="y_dx")
    print("\n".join(loop_summary(lrep)))
    omega = 2 * math.pi * LOAD["f"]
    truth = math.pi * LOAD["eta"] * omega * LOAD["e0"] ** 2
    mean, std, count = lrep["cycles"]["mean"], lrep["cycles"]["std"], lrep["cycles"]["count"]
    rel = abs(mean - truth) / truth
    good = rel < 0.01
    ok &= good
    print(f"\ncheck: energy per cycle {mean * 1e3:.4f} kJ/m^3 (mean of {count} cycles, std "
          f"{std * 1e3:.4f}); known value pi*eta*omega*e0^2 = {truth * 1e3:.4f} kJ/m^3 -> "
          f"{'recovered' if good else 'NOT recovered'} within {100 * rel:.2f}%")
    lrep["input"] = {"table": "wedgepath/data/load_test.csv", "time_column": "time_s"}
    lrep["units"] = {"strain": "mm/mm", "stress_MPa": "MPa", "time_s": "s"}
    output.add("loop.json", _dump_json(lrep))
    for name, text in loop_tables(lrep).items():
        output.add(name, text)

    if figures and out is not None:
        try:
            from . import plotting
        except ImportError:
            print("note: matplotlib is not installed; no figures drawn", file=sys.stderr)
        else:
            for name, png in plotting.leadlag_figures(rep, units=rep["units"]).items():
                output.add(name, png)
            xy = np.asarray(load.values)
            # the known energy per cycle, in the data's units (MPa x mm/mm = MJ/m^3)
            for name, png in plotting.loop_figures(xy, load.names, lrep, units=lrep["units"],
                                                   reference=truth,
                                                   reference_label="known value").items():
                output.add(name, png)
    written = output.write()
    if written:
        print(f"\nwrote {len(written)} file(s) to {out}")
    print("\nall checks passed" if ok else "\nSOME CHECKS FAILED")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(run())
