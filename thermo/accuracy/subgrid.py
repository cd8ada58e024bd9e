r"""An error part over many temperatures from its values on a logarithmic sub-grid, never below them.

An error breakdown over :math:`10^6` temperatures does not need :math:`10^6`
re-preparations' worth of sums: each part is a smooth function of
:math:`\ln T` (Planck kernels vary on a scale of order 1 in :math:`\ln T`),
so it is evaluated on nodes :math:`s_k`: the grid's own temperatures, thinned
to about one per :data:`STEP` in :math:`\ln T` where they are denser (cold
temperatures, sparse in :math:`\ln T`, cost the most and are kept as they
are); a temperature at a node gets that node's value and one between
:math:`s_k` and :math:`s_{k+1}` (less than :data:`STEP` apart) the larger of
theirs, raised by :data:`MARGIN`.  The parts that are a window's largest value
(the smearing envelope, a mode list's long-wave spread) take one sample more
at each end of the window, whose ends fall between the nodes.

Why that is not below the value at :math:`T` itself: where the part is
monotone between two nodes it lies between their values; at a local maximum
between them it exceeds the larger by at most :math:`h^2 \max|f''|/8`
(Taylor's theorem at the maximum, :math:`h` = :data:`STEP`), which
:data:`MARGIN` covers for :math:`|f''|/f \le 8\,\mathrm{MARGIN}/h^2 = 8000`
(in :math:`\ln T`); a window's largest value at T is bounded by the larger of
its two nodes' windows outright (their union covers it).  Where a part is
no more than the rounding noise of two tables (C_v's numerical part near
:math:`10^5` K is :math:`4\cdot10^{-13}` of C_v) it is not smooth; :data:`ROUNDING`
of the value is added to every part for that (not to one that is 0 at every node).  The
tests compare the result with the breakdown on every temperature for coarse
meshes, clean, smeared and histogram DOS, and mode lists.

The cost is that of at most :math:`2\ln(T_{max}/T_{min})/h` temperatures plus
:math:`O(M\log M)` for the thinning and look-up.
"""

from __future__ import annotations

import numpy as np

#: Spacing of the sub-grid in ln T [1].
STEP = 1e-3
#: Relative raise of the envelope (covers the curvature between nodes, see the module notes).
MARGIN = 1e-3
#: Added to every part, relative to the value (F: to |U| + T|S|): where a part is the rounding noise of
#: two tables (at most 4e-13 of the value on a 10⁶-row DOS at 10⁵ K) it does not follow a smooth curve
#: the nodes bound, and this floor alone covers it.
ROUNDING = 1e-12
#: A grid of more temperatures than this uses the sub-grid when that has fewer than half its points
#: (the pages' 20,000 temperatures are always evaluated one by one).
EXACT_TEMPERATURES = 20_000


def sub_grid(temperatures):
    r"""Nodes for ``temperatures`` [K], or None when every temperature is about as cheap.

    The temperatures themselves, thinned where they lie closer than :data:`STEP` in ln T: of each
    interval :math:`[jh, (j+1)h)` of :math:`\ln T` the lowest and the highest are kept (0 too, when
    present).  Where the grid is sparser than the sub-grid, the nodes are its own temperatures.

    Examples
    --------
    >>> sub_grid(np.linspace(0.0, 1000.0, 11)) is None
    True
    >>> s = sub_grid(np.arange(0.0, 1000.0, 0.01))
    >>> float(s[0]), float(s[1]), float(s[-1]), s.size < 20_000
    (0.0, 0.01, 999.99, True)
    """
    t = np.unique(np.asarray(temperatures, dtype=float))
    hot = t[t > 0]
    if t.size <= EXACT_TEMPERATURES or hot.size == 0:
        return None
    bucket = np.floor(np.log(hot) / STEP)
    edge = np.flatnonzero(np.diff(bucket)) + 1
    keep = np.unique(np.concatenate([[0, hot.size - 1], edge, edge - 1]))
    if keep.size > t.size // 2:
        return None
    nodes = hot[keep]
    return np.concatenate([[0.0], nodes]) if t[0] == 0 else nodes


def envelope(nodes, values, temperatures):
    r"""Each temperature's bound from a part's values at the sub-grid ``nodes``.

    Parameters
    ----------
    nodes : numpy.ndarray, shape (K,)
        From :func:`sub_grid` [K], increasing.
    values : numpy.ndarray, shape (Q, K)
        A part (Q quantities) at the nodes, >= 0.
    temperatures : numpy.ndarray, shape (M,)
        Temperatures [K] within the nodes' range.

    Returns
    -------
    numpy.ndarray, shape (Q, M)
        :math:`(1+\mathrm{MARGIN})\max(v_k, v_{k+1})` for :math:`s_k < T < s_{k+1}`,
        :math:`(1+\mathrm{MARGIN})v_k` at :math:`T = s_k`.

    Examples
    --------
    >>> envelope(np.array([1.0, 2.0, 4.0]), np.array([[1.0, 3.0, 2.0]]), np.array([1.5, 4.0])).round(4).tolist()
    [[3.003, 2.002]]
    """
    from .resolution import window_max
    t = np.asarray(temperatures, dtype=float)
    values = np.asarray(values, dtype=float)
    k = np.clip(np.searchsorted(nodes, t, side="right") - 1, 0, nodes.size - 1)
    hi = np.minimum(k + np.where(nodes[k] == t, 1, 2), nodes.size)
    out = np.empty((values.shape[0], t.size))
    for i, row in enumerate(values):
        out[i] = (1.0 + MARGIN) * window_max(row, k, hi)
    return out
