"""
Streaming and merging area matrices
===================================

Invented scenario: a made-up vibration rig logs 12 accelerometer channels
for hours; the recording arrives in blocks.  An ``AreaAccumulator`` takes the
blocks one by one (carrying the last sample across block borders), two
accumulators fed different halves merge into the state of the whole
recording (Chen's identity), and rolling windows show how the lead pattern
changes, at a cost independent of the window length.

Run it as a script: ``python examples/streaming.py``.
"""

import numpy as np

import wedgepath as wp

from _common import figure_path, have_matplotlib


def blocks(rng, n_blocks=40, rows=5000, n=12):
    phase = 0.0
    for _ in range(n_blocks):
        t = phase + np.arange(rows) * 0.01
        base = np.sin(2 * np.pi * 1.3 * t[:, None] - 0.4 * np.arange(n))
        yield base + 0.5 * rng.normal(size=(rows, n)) + 0.001 * t[:, None]  # slow drift
        phase = t[-1] + 0.01


rng = np.random.default_rng(5)
data = list(blocks(rng))
whole = np.concatenate(data)

# %%
# One accumulator, block by block
# -------------------------------

acc = wp.AreaAccumulator(12)
for b in data:
    acc.update(b)
A_stream = acc.result().values
A_direct = wp.area_matrix(whole).values
err = np.max(np.abs(A_stream - A_direct)) / np.max(np.abs(A_direct))
print(f"streamed {len(data)} blocks ({whole.shape[0]} samples): max relative difference "
      f"to the in-memory matrix {err:.1e}")
assert err < 1e-10

# %%
# Two accumulators, merged
# ------------------------
# Each half could run on its own machine; ``merge`` joins them in time order.

left, right = wp.AreaAccumulator(12), wp.AreaAccumulator(12)
for b in data[:17]:
    left.update(b)
for b in data[17:]:
    right.update(b)
merged = left.merge(right).result().values
err = np.max(np.abs(merged - A_direct)) / np.max(np.abs(A_direct))
print(f"two halves merged (Chen's identity): max relative difference {err:.1e}")
assert err < 1e-10

# %%
# Rolling windows
# ---------------

roll = wp.rolling_area_matrix(whole, window=20000, step=5000)
lead = roll.pair(0, 1)
print(f"rolling windows: {len(roll)}; A[0, 1] per window ranges "
      f"{lead.min():.1f} .. {lead.max():.1f}")

if have_matplotlib():
    import matplotlib.pyplot as plt
    from wedgepath import plotting
    # small multiples of the four strongest pairs, on one scale
    fig = plotting.rolling_pairs(roll, names=[f"acc_{k}" for k in range(12)], top=4,
                                 title="Rolling lead of the strongest pairs (windows of "
                                       "20,000 samples)",
                                 xlabel="window centre (sample number)")
    fig.savefig(figure_path("streaming.png"))
    print(f"figure: {figure_path('streaming.png').name}")
