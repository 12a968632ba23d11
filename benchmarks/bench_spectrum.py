"""Benchmark of lead_spectrum (a script, not a test): ratios against area_matrix in the same run.

Rows:

* ``lead_spectrum`` with 8 bands on T = 10^6 samples of n = 64 channels against
  ``area_matrix`` of the same array (target: within 3x);
* the FFTs alone (scipy's rfft of the channels, no copies, no band sums), for
  information: no exact split over DFT frequencies can be faster than this floor;
* the same with 256 bands (the cost of the band sums does not grow with the
  number of bands: every DFT bin enters one GEMM chunk once);
* peak traced memory of ``lead_spectrum`` with 8 and with 256 bands, as a
  multiple of the input array's size (target under 2.5x for both: one
  spectrum the size of the input, a channel block being transformed, and the
  ``B n^2`` output; no per-bin ``n x n`` matrices are ever formed);
* peak memory at T / 4, as a multiple of that input (target under 2.5x too):
  memory is linear in the input, whatever the number of bins (T / 2) and bands.

Run:  .venv/bin/python benchmarks/bench_spectrum.py  [--quick]
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, interleaved_best, peak_memory  # noqa: E402

import wedgepath as wp  # noqa: E402



def main(quick=False):
    rng = np.random.default_rng(0)
    table = Table("wedgepath.lead_spectrum")
    T, n = (200_000 if quick else 1_000_000), 64
    X = rng.standard_normal((T, n)).cumsum(axis=0)
    few = np.geomspace(1e-4, 0.5, 9)
    few[0] = 0.0
    many = np.concatenate([[0.0], np.geomspace(1e-5, 0.5, 256)])
    # the floor of any exact split over DFT frequencies: the real FFTs of the channels alone
    # (channel-major, as lead_spectrum transforms them; the transposing copy is not timed)
    from scipy import fft as sfft
    Xt = np.ascontiguousarray(X.T)
    t_area, t_few, t_many, t_fft = interleaved_best(
        [lambda: wp.area_matrix(X), lambda: wp.lead_spectrum(X, bands=few),
         lambda: wp.lead_spectrum(X, bands=many),
         lambda: sfft.rfft(Xt, axis=1, workers=-1)], repeat=2 if quick else 3)
    table.ratio(f"lead_spectrum 8 bands vs area_matrix (T={T:.0e}, n={n})", t_few, t_area, 3.0,
                note=f"{t_few:.2f} s vs {t_area:.2f} s")
    table.ratio(f"lead_spectrum 256 bands vs area_matrix (T={T:.0e}, n={n})", t_many, t_area, 3.0,
                note=f"{t_many:.2f} s vs {t_area:.2f} s")
    table.info(f"floor: scipy rfft of the {n} channels alone vs area_matrix",
               f"{t_fft / t_area:.2f}x ({t_fft:.2f} s)")
    # the identity, checked on the benchmark data too
    s = wp.lead_spectrum(X, bands=few)
    A = wp.area_matrix(X).values
    rel = float(np.max(np.abs(s.total() - A)) / np.max(np.abs(A)))
    table.value("max |sum of bands - area_matrix| / max |A|", rel, 1e-12)
    size = X.nbytes
    m_few = peak_memory(lambda: wp.lead_spectrum(X, bands=few))
    m_many = peak_memory(lambda: wp.lead_spectrum(X, bands=many))
    table.value("peak memory, 8 bands, x input size", m_few / size, 2.5, unit="x",
                note=f"{m_few / 2**20:.0f} MB, input {size / 2**20:.0f} MB")
    table.value("peak memory, 256 bands, x input size", m_many / size, 2.5, unit="x",
                note=f"{m_many / 2**20:.0f} MB")
    Xq = X[: T // 4].copy()
    m_q = peak_memory(lambda: wp.lead_spectrum(Xq, bands=few))
    table.value("peak memory at T/4, x its input size", m_q / Xq.nbytes, 2.5, unit="x",
                note=f"{m_q / 2**20:.0f} MB, input {Xq.nbytes / 2**20:.0f} MB")
    return table.print()


if __name__ == "__main__":
    sys.exit(0 if main(quick="--quick" in sys.argv) else 1)
