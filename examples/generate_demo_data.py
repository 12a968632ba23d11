"""Write the bundled, invented demo recordings into ``src/wedgepath/data/``.

All three scenarios are made up; their ground truth is known by construction.

``gantry_loop.csv``
    The tool head of a made-up three-axis gantry sweeps the same elliptical
    loop three times, logged at irregular instants (about 50 Hz) with a
    dropout in the second sweep (rows kept, values empty).  Each sweep is
    x = 0.5 + 0.4 cos(2 pi t / 4), y = 0.3 + 0.25 sin(2 pi t / 4),
    z = 0.1 + 0.02 sin(4 pi t / 4): area pi * 0.4 * 0.25 per sweep.

``ring_sensors.csv``
    Eight pressure taps around a made-up circular duct see a disturbance that
    rotates about once every 2 s (a narrow-band random process); tap k lags
    tap 0 by k * 45 degrees.  Taps have
    different gains and offsets, noise, jittered time stamps, and a short
    dropout.  The columns are stored in a scrambled order; the true cyclic
    order is TAP_ORDER below.

``load_test.csv``
    A made-up elastomer pad in a cyclic tension-compression test: strain
    e(t) = e0 sin(2 pi f t), stress s = E e + eta de/dt (a Kelvin-Voigt
    solid) plus gauge noise, 200 samples per cycle, 12 cycles.  The energy
    dissipated per cycle and unit volume is the integral of s de around one
    cycle, pi * eta * omega * e0^2 (derived in docs/demo.md).
"""

from pathlib import Path

import numpy as np

DATA = Path(__file__).resolve().parents[1] / "src" / "wedgepath" / "data"
HEADER = "# invented demo data, written by examples/generate_demo_data.py\n"

# ring sensors: the taps in their true cyclic order (each leads the next)
TAP_ORDER = ["north", "northeast", "east", "southeast", "south", "southwest", "west", "northwest"]
STORED_ORDER = ["east", "north", "southwest", "south", "northwest", "northeast", "west",
                "southeast"]
# load test parameters (strain in mm/mm, stress in MPa, time in s)
LOAD = {"e0": 0.02, "E": 5.0, "eta": 0.4, "f": 0.5, "cycles": 12, "per_cycle": 200}


def _write(name, header, columns, fmt="{:.9f}"):
    path = DATA / name
    with path.open("w") as fh:
        fh.write(HEADER)
        fh.write(",".join(header) + "\n")
        for row in zip(*columns):
            fh.write(",".join("" if np.isnan(v) else fmt.format(v) for v in row) + "\n")
    print(f"wrote {path} ({len(columns[0])} rows)")


def gantry(rng):
    n = 3 * 200
    base = np.linspace(0.0, 12.0, n + 1)
    t = base + rng.uniform(-0.35, 0.35, n + 1) * (base[1] - base[0]) * np.r_[0, np.ones(n - 1), 0]
    w = 2 * np.pi * t / 4.0
    xyz = np.c_[0.5 + 0.4 * np.cos(w), 0.3 + 0.25 * np.sin(w), 0.1 + 0.02 * np.sin(2 * w)]
    xyz[(t > 5.1) & (t < 5.6)] = np.nan
    _write("gantry_loop.csv", ["time_s", "x_m", "y_m", "z_m"], [t, *xyz.T])


def ring(rng):
    period, T = 2.0, 3000
    t = np.cumsum(rng.uniform(0.005, 0.015, T))  # about 100 Hz, irregular
    # the disturbance: a narrow-band random process around one rotation per 2 s
    # (40 components within +-25% of the centre frequency, random amplitudes and
    # phases); tap k sees every component k * 45 degrees later than tap 0
    omegas = 2 * np.pi / period * rng.uniform(0.75, 1.25, 40)
    amps = rng.rayleigh(1.0, 40) / np.sqrt(40)
    thetas = rng.uniform(0, 2 * np.pi, 40)
    cols = {}
    for k, name in enumerate(TAP_ORDER):
        gain = rng.uniform(0.5, 2.0)
        offset = rng.uniform(-50, 50) + 101.3  # kPa around atmospheric
        phase = np.outer(t, omegas) + thetas - k * np.pi / 4
        signal = (amps * np.sin(phase)).sum(axis=1)
        cols[name] = offset + gain * signal + 0.3 * gain * rng.normal(size=T)
    drop = (t > 11.0) & (t < 11.4)
    for name in cols:
        cols[name][drop] = np.nan
    _write("ring_sensors.csv", ["time_s"] + STORED_ORDER, [t] + [cols[c] for c in STORED_ORDER])


def load_test(rng):
    p = LOAD
    omega = 2 * np.pi * p["f"]
    N = p["cycles"] * p["per_cycle"]
    t = np.arange(N + 1) / (p["f"] * p["per_cycle"])
    strain = p["e0"] * np.sin(omega * t)
    stress = p["E"] * strain + p["eta"] * p["e0"] * omega * np.cos(omega * t)
    stress = stress + 0.002 * rng.normal(size=t.size)
    strain = strain + 2e-5 * rng.normal(size=t.size)
    _write("load_test.csv", ["time_s", "strain", "stress_MPa"], [t, strain, stress],
           fmt="{:.10g}")


def main(argv=None):
    global DATA
    import argparse
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--out", default=str(DATA), help="folder to write into (default: the package data)")
    DATA = Path(ap.parse_args(argv).out)
    DATA.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(20261202)
    gantry(rng)
    ring(rng)
    load_test(rng)


if __name__ == "__main__":
    main()
