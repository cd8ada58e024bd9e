r"""Mode sums over many temperatures as one correlation on logarithmic grids.

Every kernel depends on :math:`x = h\nu/(k_BT)` only.  With :math:`s = \ln\nu`
and :math:`\tau = \ln T`, :math:`K(x) = k(s - \tau)`, so on uniform grids of
:math:`s` and :math:`\tau` with the same step the sum over modes
:math:`\sum_i w_i K(h\nu_i/k_BT)` is a discrete correlation, evaluated with
FFTs in :math:`O((N+M)\log(N+M))` instead of :math:`O(NM)` kernel calls.

Steps of :func:`loggrid_sums`:

1. deposit the mode weights on the :math:`s` grid with the transpose of
   8-point Lagrange interpolation (exact for polynomials of degree 7 in s);
2. sample the three kernels on the grid of differences :math:`s - \tau`;
3. correlate (real FFTs of a fast length);
4. interpolate back to the requested temperatures with 8-point Lagrange
   interpolation in :math:`\ln T`;
5. temperatures where a sum is below 1e-6 of :math:`\sum|W|\max K` — the
   scale of the FFT's rounding error, about 1e-16 of it — are summed
   directly: the frozen, exponentially small end, summed over the nodes
   whose terms are not negligible.  So is a node at :math:`\nu = 0` (with
   its neighbour, see :func:`thermo.kernels.direct.direct_grid_sums`).

The step :math:`\Delta s = 0.002` keeps the interpolation error below 1e-9
of each sum while the kernel is resolved up to :math:`x \approx 30`; the
sums at colder temperatures are the ones step 5 sends to the direct path.

References
----------
.. [1] J. W. Cooley, J. W. Tukey, "An algorithm for the machine calculation
   of complex Fourier series", Math. Comp. 19, 297-301 (1965).
.. [2] L. Greengard, J.-Y. Lee, "Accelerating the nonuniform fast Fourier
   transform", SIAM Rev. 46, 443-454 (2004) (gridding by local deposit).
.. [3] J.-P. Berrut, L. N. Trefethen, "Barycentric Lagrange interpolation",
   SIAM Rev. 46, 501-517 (2004).
"""



from __future__ import annotations

import numpy as np

from .direct import KERNELS, SUM_KEYS, direct_grid_sums
from .planck import X_MAX as _X_CLIP
from .planck import H_OVER_K_THZ, log_partition_kernel, thermal_energy_kernel

#: Step of the ln ν and ln T grids [1].
STEP = 0.002


#: Points of the Lagrange stencils (deposit and read-back); even.
ORDER = 8


#: A sum below this share of Σ|W|·max K (the scale of the FFT's rounding) is summed directly.
DYNAMIC_RANGE = 1e-6


#: Nodes whose term is below e^-46 (1e-20) of the largest are left out of a cold sum.
_NEGLIGIBLE_LOG = 46.0


#: Nodes below this share of the highest frequency are summed directly.
_LOW_NODE_SHARE = 1e-9


#: Below these sizes the direct sum is as fast (measured: fast ~0.6 ms, direct ~1 ms at 20,000 pairs).
MIN_TEMPERATURES = 16


MIN_PAIRS = 20_000


#: Pairs evaluated at once by the direct sums of cold temperatures (memory bound).
_PAIRS_PER_PASS = 1_000_000


#: Longest log grid accepted (ln-range / STEP), to bound memory and time.
MAX_GRID = 1 << 20


_STENCIL = np.arange(ORDER, dtype=float)


#: Barycentric denominators Π_{j≠k}(k − j) of the equispaced stencil.
_DENOM = np.array([np.prod([k - j for j in range(ORDER) if j != k]) for k in range(ORDER)], dtype=float)


def lagrange_weights(offset):
    r"""Weights of equispaced Lagrange interpolation on the stencil 0..ORDER-1.

    Parameters
    ----------
    offset : array_like, shape (N,)
        Position in grid steps relative to the first stencil point [1].

    Returns
    -------
    numpy.ndarray, shape (N, ORDER)
        :math:`L_k(t) = \prod_{j \ne k} (t-j)/(k-j)`; each row sums to 1.

    Notes
    -----
    .. math:: f(t) \approx \sum_{k=0}^{p-1} L_k(t) f(k)

    with error :math:`f^{(p)}(\xi) \prod_j (t-j) / p!`.

    References
    ----------
    .. [1] J.-P. Berrut, L. N. Trefethen, "Barycentric Lagrange interpolation",
       SIAM Rev. 46, 501-517 (2004).

    Examples
    --------
    >>> w = lagrange_weights([3.5])
    >>> round(float(w.sum()), 12), round(float((w @ _STENCIL ** 3)[0]), 9)
    (1.0, 42.875)
    """
    t = np.asarray(offset, dtype=float).ravel()
    diff = [t - k for k in range(ORDER)]
    # products over j < k and j > k, without dividing by t − k (exact at nodes);
    # a loop over the few stencil points is faster than cumprod along a short axis
    before = [np.ones_like(t)]
    for k in range(1, ORDER):
        before.append(before[-1] * diff[k - 1])
    out = np.empty((ORDER, t.size))         # filled row by row (contiguous), handed out as (N, ORDER)
    after = np.ones_like(t)
    for k in range(ORDER - 1, -1, -1):
        out[k] = before[k] * after / _DENOM[k]
        after = after * diff[k]
    return out.T


def _stencil(position):
    """First stencil index and Lagrange weights for positions in grid steps."""
    first = np.floor(position).astype(np.int64) - (ORDER // 2 - 1)
    return first, lagrange_weights(position - first)


def _split_nodes(nu, w):
    """Nodes for the log grid, and the low ones (ν = 0 and neighbour) for direct."""
    keep = (w != 0.0)
    nu, w = nu[keep], w[keep]
    low = nu <= _LOW_NODE_SHARE * nu.max()
    if low.any() and not low.all():
        # direct_grid_sums needs the first positive node to size the ν = 0 interval
        first = np.argmin(np.where(low, np.inf, nu))
        low[first] = True
    return (nu[~low], w[~low]), (nu[low], w[low])


def _grid_length(nu, t):
    span = np.log(nu.max() / nu.min()) + np.log(t.max() / t.min())
    return int(span / STEP) + 4 * ORDER


def suitable(nodes_thz, weights, temperatures):
    """Whether the log-grid correlation is accurate and faster here.

    Parameters
    ----------
    nodes_thz, weights : array_like, shape (N,)
        Frequencies [THz] and mode weights [1].
    temperatures : array_like, shape (M,)
        Temperatures [K].

    Returns
    -------
    bool
        True when there are enough temperatures and pairs, every value is
        finite, temperatures are positive, frequencies non-negative and the
        log grid stays short.

    Notes
    -----
    Thresholds measured on a 2-core machine: the fast path costs about
    0.6 ms whatever the size, the direct sums about 50 ns per pair, so the
    fast path is taken from :data:`MIN_PAIRS` = 20,000 pairs and
    :data:`MIN_TEMPERATURES` = 16 temperatures.

    Examples
    --------
    >>> suitable(np.linspace(0, 20, 5000), np.ones(5000), np.linspace(1, 1000, 1000))
    True
    >>> suitable([1.0, 2.0], [1.0, 1.0], [300.0])
    False
    """
    nu = np.asarray(nodes_thz, dtype=float).ravel()
    w = np.asarray(weights, dtype=float).ravel()
    t = np.asarray(temperatures, dtype=float).ravel()
    if t.size < MIN_TEMPERATURES or nu.size * t.size < MIN_PAIRS or nu.shape != w.shape:
        return False
    if not (np.all(np.isfinite(nu)) and np.all(np.isfinite(w)) and np.all(np.isfinite(t))):
        return False
    if np.any(t <= 0) or np.any(nu < 0) or not np.any(w != 0):
        return False
    (grid_nu, _), _ = _split_nodes(nu, w)
    return grid_nu.size > 0 and _grid_length(grid_nu, t) <= MAX_GRID


def _deposit(s, w, s0, length):
    """Weights on the s grid: transpose of Lagrange interpolation."""
    first, lw = _stencil((s - s0) / STEP)
    contrib = lw * w[:, None]
    index = first[:, None] + np.arange(ORDER)[None, :]
    return np.bincount(index.ravel(), weights=contrib.ravel(), minlength=length)


def _correlate(deposit, tau0, s0, n_tau):
    """S_n = Σ_m W_m K(s_m − τ_n) for the three kernels, on the τ grid.

    Also returns, per kernel, Σ|W|·max|K|: the FFT's rounding error of any
    S_n is a small multiple of 1e-16 of it.
    """
    from scipy import fft

    n_s = deposit.size
    # kernel samples at differences d = m − n from −(n_tau − 1) to n_s − 1
    y = (s0 - tau0) + STEP * np.arange(-(n_tau - 1), n_s)
    x = H_OVER_K_THZ * np.exp(y)
    kernels = np.stack([KERNELS[key](x) for key in SUM_KEYS])
    size = fft.next_fast_len(n_s + y.size - 1, real=True)
    spectrum = fft.rfft(deposit[::-1], size) [None, :] * fft.rfft(kernels, size, axis=1)
    full = fft.irfft(spectrum, size, axis=1)
    # (reversed W ⊛ K)[n_s − 1 + (n_tau − 1) − n] = S_n
    index = (n_s - 1) + (n_tau - 1) - np.arange(n_tau)
    return full[:, index], np.sum(np.abs(deposit)) * np.max(np.abs(kernels), axis=1)


def _read_back(values, tau0, tau):
    """8-point Lagrange interpolation of grid values at ln T."""
    first, lw = _stencil((tau - tau0) / STEP)
    index = first[:, None] + np.arange(ORDER)[None, :]
    return np.einsum("kmj,mj->km", values[:, index], lw)


def _relevant_nodes(nu, w, temperature):
    """Length of the prefix of ascending nodes whose terms are not negligible.

    Each kernel is at most about :math:`(1 + x)^2 e^{-x}` times a factor below
    3 for x >= 1; above the last node whose bound reaches within
    :data:`_NEGLIGIBLE_LOG` of the largest bound every term is < 1e-20 of it.
    """
    if np.any(np.diff(nu) < 0):
        return nu.size
    # the kernels clip x at 700 (thermo.kernels.planck); bound what they compute
    x = np.minimum(H_OVER_K_THZ * nu / temperature, _X_CLIP)
    bound = np.log(np.abs(w)) + 2.0 * np.log1p(x) - x
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
    With :math:`E = e^{-x}` and :math:`D = 1 - e^{-x}` (``-expm1(-x)``):
    :math:`c = x^2E/D^2`, :math:`u = xE/D`, :math:`\ell = -\ln(1-E)`,
    three transcendental passes instead of five.

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
    x = np.minimum(np.multiply.outer(H_OVER_K_THZ * nu, 1.0 / t), _X_CLIP)
    e = np.exp(-x)
    d = -np.expm1(-x)
    u = x * e / d
    c = x * u / d
    return {"heat_capacity": w @ c, "thermal_energy": w @ u,
            "log_partition": -(w @ np.log1p(-e))}


#: Largest x = hν/k_BT of the lowest grid node at which cold sums run over the deposited log grid
#: instead of the nodes: every term that matters then changes by less than 0.15 per grid step, where the
#: 8-point interpolation behind the deposit is good to about 1e-10 relative (see :func:`_fill_cold`).
_GRID_COLD_X = 20.0


def _fill_cold(out, nu, w, t, cold, groups=4, grid=None):
    """Replace the sums at the cold temperatures by direct ones.

    Where x of the lowest node reaches the clip every term is the clipped
    kernel (Σw times it, exactly).  With ``grid`` ``(deposit, s0)`` (the weights
    deposited on the log grid), temperatures whose lowest node has x below
    :data:`_GRID_COLD_X` sum over the grid points when they are fewer than the
    nodes: the cost is then grid points × temperatures whatever the number of
    rows (a 10⁶-row DOS).  The others are split in up to ``groups`` bands;
    each band sums only the prefix of nodes its warmest temperature needs.
    """
    x_low = H_OVER_K_THZ * nu.min() / t[cold]
    frozen = cold[x_low >= _X_CLIP]
    if frozen.size:
        _assign(out, frozen, frozen_sums(nu[:1], np.array([w.sum()]), t[frozen]))
    rest = cold[x_low < _X_CLIP]
    if grid is not None:
        deposit, s0 = grid
        used = np.flatnonzero(deposit)
        on_grid = rest[H_OVER_K_THZ * nu.min() / t[rest] < _GRID_COLD_X]
        if on_grid.size and used.size < _relevant_nodes(nu, w, t[on_grid].max()) // 2:
            _sum_in_passes(out, np.exp(s0 + STEP * used), deposit[used], t, on_grid)
            rest = np.setdiff1d(rest, on_grid)
    if rest.size == 0:
        return
    order = rest[np.argsort(t[rest])]
    for band in np.array_split(order, min(groups, order.size)):
        # where the kernels' clipping of x reaches the lowest node, every
        # clipped term is as large as any other: keep all nodes
        clipped = H_OVER_K_THZ * nu.min() / t[band].min() > _X_CLIP - _NEGLIGIBLE_LOG
        upto = nu.size if clipped else _relevant_nodes(nu, w, t[band].max())
        _sum_in_passes(out, nu[:upto], w[:upto], t, band)


def _sum_in_passes(out, nodes, weights, t, which):
    """Direct sums at ``t[which]`` with at most about _PAIRS_PER_PASS pairs in memory at once."""
    for part in np.array_split(which, -(-which.size * nodes.size // _PAIRS_PER_PASS)):
        _assign(out, part, frozen_sums(nodes, weights, t[part]))


def _assign(out, which, sums):
    for key in SUM_KEYS:
        out[key][which] = sums[key]


def loggrid_sums(nodes_thz, weights, temperatures):
    r"""Sums :math:`\sum_i w_i K(h\nu_i/k_BT_j)` by log-grid correlation.

    Parameters
    ----------
    nodes_thz, weights, temperatures : array_like
        Frequencies (N,) [THz] >= 0, modes per node (N,) [1] and
        temperatures (M,) [K] > 0, as for the direct sums.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        The sums of :func:`thermo.kernels.direct.direct_grid_sums` (same keys) to
        about 1e-9 relative.

    Notes
    -----
    With :math:`s_m = s_0 + m\,\Delta`, :math:`\tau_n = \tau_0 + n\,\Delta`
    and deposited weights :math:`W_m`,

    .. math:: \Sigma_K(\tau_n) = \sum_m W_m\, K\!\left(\frac{h}{k_B}
              e^{s_0 - \tau_0 + (m-n)\Delta}\right),

    a correlation of :math:`W` with the sampled kernel.

    References
    ----------
    .. [1] J. W. Cooley, J. W. Tukey, "An algorithm for the machine calculation
       of complex Fourier series", Math. Comp. 19, 297-301 (1965).
    .. [2] J.-P. Berrut, L. N. Trefethen, "Barycentric Lagrange interpolation",
       SIAM Rev. 46, 501-517 (2004).

    Examples
    --------
    >>> nu = np.linspace(0.0, 10.0, 2001)
    >>> w = np.full(nu.size, 3.0 / nu.size)
    >>> t = np.linspace(5.0, 800.0, 200)
    >>> fast = loggrid_sums(nu, w, t)["heat_capacity"]
    >>> ref = direct_grid_sums(nu, w, t)["heat_capacity"]
    >>> bool(np.max(np.abs(fast / ref - 1)) < 1e-8)
    True
    """
    nu = np.asarray(nodes_thz, dtype=float).ravel()
    w = np.asarray(weights, dtype=float).ravel()
    t = np.asarray(temperatures, dtype=float).ravel()
    (grid_nu, grid_w), (low_nu, low_w) = _split_nodes(nu, w)
    if grid_nu.size == 0:
        return direct_grid_sums(nu, w, t)
    s = np.log(grid_nu)
    tau = np.log(t)
    half = ORDER // 2 + 1
    s0 = s.min() - half * STEP
    tau0 = tau.min() - half * STEP
    n_s = int(np.ceil((s.max() - s0) / STEP)) + half + 1
    n_tau = int(np.ceil((tau.max() - tau0) / STEP)) + half + 1
    deposit = _deposit(s, grid_w, s0, n_s)
    on_grid, scale = _correlate(deposit, tau0, s0, n_tau)
    values = _read_back(on_grid, tau0, tau)
    out = dict(zip(SUM_KEYS, values))
    cold = np.zeros(t.size, dtype=bool)
    for key in SUM_KEYS:
        cold |= ~(out[key] > DYNAMIC_RANGE * scale[SUM_KEYS.index(key)])
    if cold.any():
        _fill_cold(out, grid_nu, grid_w, t, np.flatnonzero(cold), grid=(deposit, s0))
    if low_nu.size:
        extra = direct_grid_sums(low_nu, low_w, t)
        for key in SUM_KEYS:
            out[key] = out[key] + extra[key]
    return out
