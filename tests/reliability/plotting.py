"""Bad-input rows for plotting functions."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


# (the plotting helpers check their input before matplotlib is touched)
row("wp.plotting.cycle_positions(order)", "text", "an array instead of a CyclicOrder",
    lambda: plotting.cycle_positions(np.zeros(3)), TypeError, "needs a CyclicOrder")
row("wp.plotting.cycle_positions(order)", "length", "intervals of 1 entry for 3 channels",
    lambda: plotting.cycle_positions(wp.cyclic_order(np.array([[0, 1, -1], [-1, 0, 1],
                                                               [1, -1, 0.0]])),
                                     low=[0.0], high=[1.0]),
    ValueError, "low and high need 3 entries")
row("wp.plotting.pair_chart(areas)", "ndim", "a 2x3 matrix",
    lambda: plotting.pair_chart(np.zeros((2, 3))), ValueError, "must be a square matrix")
row("wp.plotting.pair_chart(areas)", "length", "1 name for 2 channels",
    lambda: plotting.pair_chart(np.zeros((2, 2)), names=["a"]), ValueError,
    "names has 1 entries")
row("wp.plotting.band_leads(spectrum)", "text", "an AreaMatrix instead of a LeadSpectrum",
    lambda: plotting.band_leads(wp.area_matrix(loop(3))), TypeError, "needs a LeadSpectrum")
row("wp.plotting.rolling_pairs(rolling)", "text", "an array instead of a RollingAreas",
    lambda: plotting.rolling_pairs(np.zeros((2, 2, 2))), TypeError, "needs a RollingAreas")
row("wp.plotting.loop_faces(decomposition)", "text", "an array instead of a Decomposition",
    lambda: plotting.loop_faces(np.zeros((3, 2))), TypeError, "needs a Decomposition")
row("wp.plotting.loop_path(curve)", "ndim", "xy of shape (4, 3)",
    lambda: plotting.loop_path(np.zeros((4, 3))), ValueError, "xy must have shape (T, 2)")
row("wp.plotting.loop_path(curve)", "single", "one sample",
    lambda: plotting.loop_path(np.zeros((1, 2))), ValueError, "at least 2 samples")
row("wp.plotting.loop_path(curve)", "text", "text", lambda: plotting.loop_path([["a", "b"]]),
    TypeError, "xy holds text")
row("wp.plotting.cycle_values(cycles)", "ndim", "a 2-D array",
    lambda: plotting.cycle_values(np.zeros((2, 2))), ValueError, "values must be 1-dimensional")
row("wp.plotting.cycle_values(cycles)", "text", "text", lambda: plotting.cycle_values(["a"]),
    TypeError, "values holds text")
