r"""Direct sums at the cold end of a table, where the log-grid correlation's rounding would show.

A sum below :data:`thermo.kernels.loggrid.DYNAMIC_RANGE` of its scale is the frozen, exponentially
small end; it is summed directly over the nodes whose terms are not negligible
(:func:`frozen_sums`, three kernels from one exponential), or over the points of the log grid
when those are fewer.

References
----------
.. [1] M. Planck, "Ueber das Gesetz der Energieverteilung im Normalspectrum",
   Ann. Phys. 309, 553-563 (1901).
"""

from __future__ import annotations

import math

import numpy as np

from .direct import SUM_KEYS, direct_grid_sums  # noqa: F401 - direct_grid_sums: the doctest's reference
from .planck import X_MAX as _X_CLIP
from .planck import H_OVER_K_THZ

#: Nodes whose term is below e^-46 (1e-20) of the largest are left out of a cold sum.
_NEGLIGIBLE_LOG = 46.0
#: Pairs evaluated at once by the direct sums of cold temperatures (memory bound).
_PAIRS_PER_PASS = 1_000_000


def _relevant_nodes(nu, w, temperature, log_w=None, log_w_max=None):
    """Length of the prefix of ascending nodes whose terms are not negligible.

    Each kernel is at most about :math:`(1 + x)^2 e^{-x}` times a factor below
    3 for x >= 1; above the last node whose bound reaches within
    :data:`_NEGLIGIBLE_LOG` of the largest bound every term is < 1e-20 of it.
    The bounds are only formed up to :math:`x^*`: beyond it even the largest weight's
    bound falls short of the first node's (and so of the largest) by more than that.
    """
    if log_w is None:
        if np.any(np.diff(nu) < 0):
            return nu.size
        log_w = np.log(np.abs(w))
    scale = H_OVER_K_THZ / temperature
    end = nu.size
    if log_w_max is not None:
        x0 = min(scale * float(nu[0]), _X_CLIP)
        excess = log_w_max - (float(log_w[0]) + 2.0 * math.log1p(x0) - x0 - _NEGLIGIBLE_LOG)
        x_star = max(excess, 1.0)               # the root of x − 2 ln(1 + x) = excess, x >= 1, from below
        for _ in range(8):
            x_star = max(excess + 2.0 * math.log1p(x_star), 1.0)
        x_star += 2.0                            # above the root: x − 2 ln(1 + x) grows there
        if x_star - 2.0 * math.log1p(x_star) > excess and x_star < _X_CLIP:
            end = int(np.searchsorted(nu, x_star / scale, side="right"))
    # the kernels clip x at 700 (thermo.kernels.planck); bound what they compute
    x = np.minimum(scale * nu[:end], _X_CLIP)
    bound = log_w[:end] + 2.0 * np.log1p(x) - x
    last = np.flatnonzero(bound >= bound.max() - _NEGLIGIBLE_LOG)[-1]
    return int(last) + 1


def frozen_sums(nodes_thz, weights, temperatures):
    r"""Direct sums over every pair with the three kernels from one exponential.

    Parameters
    ----------
    nodes_thz : array_like, shape (N,)
        Frequencies [THz], > 0.
    weights : array_like, shape (N,)
        Mode weights [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        As :func:`thermo.kernels.direct.direct_grid_sums` (same clipping of x at
        700), to rounding.

    Notes
    -----
    With :math:`E = e^{-x}` and :math:`D = 1 - e^{-x}`:
    :math:`c = x^2E/D^2`, :math:`u = xE/D`, :math:`\ell = -\ln(1-E)`,
    two transcendental passes (exp, log1p) where every :math:`x \ge`
    :data:`_PLAIN_DIFFERENCE_X` (:math:`E \le 0.37`: :math:`D = 1 - E` loses no digit),
    three below (:math:`D` = ``-expm1(-x)``).  The pairs are laid out
    temperature × node, so each sum is a contiguous dot product.

    References
    ----------
    .. [1] M. Planck, "Ueber das Gesetz der Energieverteilung im
       Normalspectrum", Ann. Phys. 309, 553-563 (1901).

    Examples
    --------
    >>> s = frozen_sums([1.0, 2.0], [1.0, 1.0], [10.0])
    >>> r = direct_grid_sums([1.0, 2.0], [1.0, 1.0], [10.0])
    >>> all(abs(s[k][0] / r[k][0] - 1) < 1e-14 for k in SUM_KEYS)
    True
    """
    nu = np.asarray(nodes_thz, dtype=float)
    w = np.asarray(weights, dtype=float)
    t = np.asarray(temperatures, dtype=float)
    minus_x = np.multiply.outer(1.0 / t, -H_OVER_K_THZ * nu)          # −x, (M, N)
    if minus_x.size == 0:
        return {key: np.zeros(t.shape) for key in SUM_KEYS}
    x_least, x_most = H_OVER_K_THZ * nu.min() / t.max(), H_OVER_K_THZ * nu.max() / t.min()
    if x_most > _X_CLIP:
        np.maximum(minus_x, -_X_CLIP, out=minus_x)
    e = np.exp(minus_x)
    if x_least >= _PLAIN_DIFFERENCE_X:
        inverse = np.subtract(1.0, e)
    else:
        inverse = np.negative(np.expm1(minus_x))
    np.divide(1.0, inverse, out=inverse)                                # 1 / D
    u = e * inverse
    u *= minus_x                                                       # −u
    c = u * minus_x
    c *= inverse
    log_partition = np.log1p(np.negative(e, out=e), out=e)             # −ℓ
    # einsum, not c @ w: a threaded BLAS matrix-vector product stalled for milliseconds on a busy machine
    return {"heat_capacity": np.einsum("mn,n->m", c, w), "thermal_energy": -np.einsum("mn,n->m", u, w),
            "log_partition": -np.einsum("mn,n->m", log_partition, w)}


#: From this x on (every pair of a :func:`frozen_sums` call), 1 − e^{−x} is formed by a subtraction:
#: e^{−x} <= 0.37 then, so no digit cancels.
_PLAIN_DIFFERENCE_X = 1.0


#: Largest x = hν/k_BT of the lowest grid node at which cold sums run over the deposited log grid
#: instead of the nodes: every term that matters then changes by less than 0.15 per grid step, where the
#: 8-point interpolation behind the deposit is good to about 1e-10 relative (see :func:`_fill_cold`).
_GRID_COLD_X = 20.0


#: Cold temperatures per band of :func:`_fill_cold` (fewer: one band).
_BAND_TEMPERATURES = 16


def _fill_cold(out, grid, t, cold, groups=4):
    """Replace the sums at the cold temperatures by direct ones.

    Where x of the lowest node reaches the clip every term is the clipped
    kernel (Σw times it, exactly).  Temperatures whose lowest node has x below
    :data:`_GRID_COLD_X` sum over the points of the log grid (the weights
    deposited on it) when they are fewer than the nodes: the cost is then grid
    points × temperatures whatever the number of rows (a 10⁶-row DOS).  The
    others are split in up to ``groups`` bands (of at least
    :data:`_BAND_TEMPERATURES`); each band sums only the prefix of nodes its
    warmest temperature needs.
    """
    nu, w = grid.nu, grid.w
    x_low = H_OVER_K_THZ * grid.nu_min / t[cold]
    frozen = cold[x_low >= _X_CLIP]
    if frozen.size:
        _assign(out, frozen, frozen_sums(nu[:1], np.array([w.sum()]), t[frozen]))
    rest = cold[x_low < _X_CLIP]
    on_grid = rest[H_OVER_K_THZ * grid.nu_min / t[rest] < _GRID_COLD_X]
    needed = {}                   # nodes needed at a temperature, computed once each

    def relevant(temperature):
        if temperature not in needed:
            needed[temperature] = grid.relevant(temperature)
        return needed[temperature]
    if on_grid.size and grid.used.size < relevant(t[on_grid].max()) // 2:
        _sum_in_passes(out, grid.used_nodes, grid.deposit[grid.used], t, on_grid)
        rest = np.setdiff1d(rest, on_grid)
    if rest.size == 0:
        return
    order = rest[np.argsort(t[rest])]
    bands = max(1, min(groups, order.size // _BAND_TEMPERATURES))
    for band in (order,) if bands == 1 else np.array_split(order, bands):
        # where the kernels' clipping of x reaches the lowest node, every
        # clipped term is as large as any other: keep all nodes
        clipped = H_OVER_K_THZ * grid.nu_min / t[band].min() > _X_CLIP - _NEGLIGIBLE_LOG
        upto = nu.size if clipped else relevant(t[band].max())
        _sum_in_passes(out, nu[:upto], w[:upto], t, band)


def _sum_in_passes(out, nodes, weights, t, which):
    """Direct sums at ``t[which]`` with at most about _PAIRS_PER_PASS pairs in memory at once."""
    passes = -(-which.size * nodes.size // _PAIRS_PER_PASS)
    for part in (which,) if passes <= 1 else np.array_split(which, passes):
        _assign(out, part, frozen_sums(nodes, weights, t[part]))


def _assign(out, which, sums):
    for key in SUM_KEYS:
        out[key][which] = sums[key]
