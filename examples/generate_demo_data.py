"""Write the bundled demo recording ``src/wedgepath/data/gantry_loop.csv``.

Invented scenario: the tool head of a made-up three-axis gantry sweeps the
same elliptical loop three times while a tracker logs its position at
irregular instants (jittered around 50 Hz).  Part of the second sweep is lost
(a logging dropout: the rows are kept with empty values).  The ground truth is
known: each sweep is x = 0.5 + 0.4 cos(2 pi t / P), y = 0.3 + 0.25 sin(2 pi t / P),
z = 0.1 + 0.02 sin(4 pi t / P) with P = 4 s, so every full sweep encloses the
area pi * 0.4 * 0.25 in the (x, y) plane.
"""

from pathlib import Path

import numpy as np

PERIOD = 4.0
OUT = Path(__file__).resolve().parents[1] / "src" / "wedgepath" / "data" / "gantry_loop.csv"


def make(seed: int = 20261202):
    rng = np.random.default_rng(seed)
    n = 3 * 200  # about 200 samples per sweep
    base = np.linspace(0.0, 3 * PERIOD, n + 1)
    jitter = rng.uniform(-0.35, 0.35, n + 1) * (base[1] - base[0])
    jitter[[0, -1]] = 0.0
    t = base + jitter
    w = 2 * np.pi * t / PERIOD
    xyz = np.c_[0.5 + 0.4 * np.cos(w), 0.3 + 0.25 * np.sin(w), 0.1 + 0.02 * np.sin(2 * w)]
    drop = (t > 5.1) & (t < 5.6)  # the dropout in the second sweep
    xyz[drop] = np.nan
    return t, xyz


def main():
    t, xyz = make()
    OUT.parent.mkdir(parents=True, exist_ok=True)
    with OUT.open("w") as fh:
        fh.write("# invented demo data: gantry tool head, see examples/generate_demo_data.py\n")
        fh.write("time_s,x_m,y_m,z_m\n")
        for ti, row in zip(t, xyz):
            vals = ",".join("" if np.isnan(v) else f"{v:.9f}" for v in row)
            fh.write(f"{ti:.6f},{vals}\n")
    print(f"wrote {OUT} ({len(t)} rows)")


if __name__ == "__main__":
    main()
