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

from .cold import _fill_cold, _relevant_nodes, frozen_sums  # noqa: F401 - frozen_sums: part of this interface
from .direct import KERNELS, SUM_KEYS, direct_grid_sums
from .planck import H_OVER_K_THZ

#: Step of the ln ν and ln T grids [1].
STEP = 0.002


#: Points of the Lagrange stencils (deposit and read-back); even.
ORDER = 8


#: A sum below this share of Σ|W|·max K (the scale of the FFT's rounding) is summed directly.
DYNAMIC_RANGE = 1e-6


#: Nodes below this share of the highest frequency are summed directly.
_LOW_NODE_SHARE = 1e-9


#: Below these sizes the direct sum is as fast (measured: fast ~0.6 ms, direct ~1 ms at 20,000 pairs).
MIN_TEMPERATURES = 16


MIN_PAIRS = 20_000


#: A spectrum of this many nodes takes the fast path from 2 temperatures on: its direct sums cost about
#: 50 ns per pair, the fast path about 1 ms once the spectrum is prepared (about 0.1 µs per node, once).
MANY_NODES = 50_000


#: Longest log grid accepted (ln-range / STEP), to bound memory and time.
MAX_GRID = 1 << 20


_STENCIL = np.arange(ORDER, dtype=float)
_OFFSETS = np.arange(ORDER)[None, :]


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
    return _lagrange_rows(np.asarray(offset, dtype=float).ravel()).T


def _lagrange_rows(t):
    """Lagrange weights of 1-D offsets ``t`` as rows (ORDER, N): row k holds L_k at every offset.

    Products over the stencil points before and after k, without dividing by t − k (exact at nodes);
    written into two (ORDER, N) blocks in place: a loop over the few stencil points is quicker than
    cumprod along a short axis, and rows are contiguous for the deposit and the read-back.
    """
    diff = t[None, :] - _STENCIL[:, None]
    before = np.empty((ORDER, t.size))
    after = np.empty((ORDER, t.size))
    before[0] = 1.0
    after[ORDER - 1] = 1.0
    for k in range(1, ORDER):
        np.multiply(before[k - 1], diff[k - 1], out=before[k])
        np.multiply(after[ORDER - k], diff[ORDER - k], out=after[ORDER - k - 1])
    before *= after
    before /= _DENOM[:, None]
    return before


def _stencil(position):
    """First stencil index and Lagrange weights (rows, ORDER × N) for positions in grid steps."""
    first = np.floor(position).astype(np.int64) - (ORDER // 2 - 1)
    return first, _lagrange_rows(position - first)


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
    :data:`MIN_TEMPERATURES` = 16 temperatures, or from 2 temperatures on a
    spectrum of :data:`MANY_NODES` nodes.

    Examples
    --------
    >>> suitable(np.linspace(0, 20, 5000), np.ones(5000), np.linspace(1, 1000, 1000))
    True
    >>> suitable([1.0, 2.0], [1.0, 1.0], [300.0])
    False
    """
    return LogGrid(nodes_thz, weights).suitable(temperatures)


def _deposit(s, w, s0, length):
    """Weights on the s grid: transpose of Lagrange interpolation."""
    first, rows = _stencil((s - s0) / STEP)          # rows (ORDER, N), contiguous: one bincount per point
    out = np.bincount(first, weights=rows[0] * w, minlength=length)
    for k in range(1, ORDER):
        out += np.bincount(first + k, weights=rows[k] * w, minlength=length)
    return out


#: Kernel table: the three kernels at x = (h/k_B) e^{jΔ} [1/THz·K] for j from _TABLE_FIRST on (built on first use).
_TABLE_FIRST, _TABLE_LAST = -int(40.0 / STEP), int(8.0 / STEP)
_TABLE = []


def _kernel_samples(first, count):
    """The three kernels at x = H_OVER_K_THZ·exp(jΔ), j = first … first + count − 1, shape (3, count).

    Read from a table built once (a pure function of j, shared by every caller); outside its range they
    are evaluated.
    """
    if first >= _TABLE_FIRST and first + count - 1 <= _TABLE_LAST:
        if not _TABLE:
            x = H_OVER_K_THZ * np.exp(STEP * np.arange(_TABLE_FIRST, _TABLE_LAST + 1))
            _TABLE.append(np.stack([KERNELS[key](x) for key in SUM_KEYS]))
        return _TABLE[0][:, first - _TABLE_FIRST:first - _TABLE_FIRST + count]
    x = H_OVER_K_THZ * np.exp(STEP * np.arange(first, first + count))
    return np.stack([KERNELS[key](x) for key in SUM_KEYS])


def _correlate(grid, shift, n_tau):
    """S_n = Σ_m W_m K(s_m − τ_n) for the three kernels, on the τ grid (τ₀ = s₀ − shift·Δ).

    Also returns, per kernel, Σ|W|·max|K|: the FFT's rounding error of any
    S_n is a small multiple of 1e-16 of it (each kernel falls with x, so its
    largest sample is the first).
    """
    from scipy import fft

    n_s = grid.deposit.size
    # a circular convolution of length >= n_s + n_tau − 1 holds every difference d = m − n once
    size = fft.next_fast_len(n_s + n_tau - 1, real=True)
    spectrum, largest = grid.kernel_spectrum(shift, n_tau, size)
    full = fft.irfft(grid.deposit_spectrum(size)[None, :] * spectrum, size, axis=1)
    return full[:, :n_tau], grid.total * largest


def _kernel_spectrum(shift, n_tau, n_s, size):
    """Real FFT (3, size // 2 + 1) of the three kernels wrapped for :func:`_correlate`, and their first
    (largest) samples (3,)."""
    from scipy import fft

    # kernel samples K_d at differences d = m − n from −(n_tau − 1) to n_s − 1: y = (shift + d)Δ;
    # K_{−j} at j = 0 … n_tau − 1, K_d at size − d for d = 1 … n_s − 1, zeros between
    kernels = _kernel_samples(shift - (n_tau - 1), n_tau - 1 + n_s)
    wrapped = np.zeros((3, size))
    wrapped[:, :n_tau] = kernels[:, n_tau - 1::-1]
    wrapped[:, size - n_s + 1:] = kernels[:, :n_tau - 1:-1]
    return fft.rfft(wrapped, axis=1), kernels[:, 0].copy()


def _read_back(values, tau0, tau):
    """8-point Lagrange interpolation of grid values (3, n) at ln T: one gather of the stencils' values
    (3, ORDER, M), weighted and summed by one einsum (several times quicker than per-point products)."""
    first, rows = _stencil((tau - tau0) / STEP)
    return np.einsum("rkm,km->rm", values.take(_OFFSETS.T + first[None, :], axis=1), rows)


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
    return LogGrid(nodes_thz, weights).sums(temperatures)


class LogGrid:
    """Nodes and weights prepared once for :func:`loggrid_sums` at any temperatures.

    Parameters
    ----------
    nodes_thz, weights : array_like, shape (N,)
        Frequencies [THz] and mode weights [1].

    Notes
    -----
    What depends on the spectrum only — the split of the nodes, their weights deposited
    on the ln ν grid and its Fourier transform, the bounds of the cold sums — is computed
    once (kept by :func:`thermo.kernels.sums.thermal_sums` on the DOS); so are the kernels'
    transforms of the last few temperature ranges.  A call of :meth:`sums` costs the kernels'
    transforms (none for a range seen before), one product, one inverse transform and the read-back.

    Examples
    --------
    >>> nu = np.linspace(0.0, 10.0, 2001)
    >>> grid = LogGrid(nu, np.full(nu.size, 3.0 / nu.size))
    >>> t = np.linspace(5.0, 800.0, 200)
    >>> a, b = grid.sums(t)["thermal_energy"], loggrid_sums(nu, np.full(nu.size, 3.0 / nu.size), t)["thermal_energy"]
    >>> bool(np.all(a == b))
    True
    """

    def __init__(self, nodes_thz, weights):
        nu = np.asarray(nodes_thz, dtype=float).ravel()
        w = np.asarray(weights, dtype=float).ravel()
        self.all_nu, self.all_w = nu, w
        self._valid = None

    @property
    def valid(self):
        """Whether the nodes suit the log grid at all (finite, ν >= 0, some weight); prepares them on first use."""
        if self._valid is None:
            self._valid = self._prepare()
        return self._valid

    def _prepare(self):
        nu, w = self.all_nu, self.all_w
        if not (nu.shape == w.shape and bool(np.all(np.isfinite(nu)) and np.all(np.isfinite(w)))
                and not np.any(nu < 0) and bool(np.any(w != 0))):
            return False
        (self.nu, self.w), (self.low_nu, self.low_w) = _split_nodes(nu, w)
        if self.nu.size == 0:
            return False
        s = np.log(self.nu)
        half = ORDER // 2 + 1
        self.s0 = s.min() - half * STEP
        self.deposit = _deposit(s, self.w, self.s0, int(np.ceil((s.max() - self.s0) / STEP)) + half + 1)
        self.total = float(np.sum(np.abs(self.deposit)))
        self.used = np.flatnonzero(self.deposit)
        self.used_nodes = np.exp(self.s0 + STEP * self.used)
        ascending = not np.any(np.diff(self.nu) < 0)
        self._log_w = np.log(np.abs(self.w)) if ascending else None
        self._log_w_max = None if self._log_w is None else float(self._log_w.max())
        self._spectra, self._kernel_spectra = {}, {}
        self.nu_min = float(self.nu.min())
        self._span = np.log(self.nu.max() / self.nu_min)
        return True

    def suitable(self, temperatures):
        """Whether the log-grid correlation is accurate and faster at these temperatures (see :func:`suitable`)."""
        t = np.asarray(temperatures, dtype=float).ravel()
        few = t.size < MIN_TEMPERATURES and (t.size < 2 or self.all_nu.size < MANY_NODES)
        if few or self.all_nu.size * t.size < MIN_PAIRS or not self.valid:
            return False
        if not np.all(np.isfinite(t)) or np.any(t <= 0):
            return False
        return int((self._span + np.log(t.max() / t.min())) / STEP) + 4 * ORDER <= MAX_GRID

    def deposit_spectrum(self, size):
        """Real FFT of the deposit, zero-padded to ``size`` (kept per size)."""
        if size not in self._spectra:
            from scipy import fft
            if len(self._spectra) > 4:
                self._spectra.clear()
            self._spectra[size] = fft.rfft(self.deposit, size)
        return self._spectra[size]

    def kernel_spectrum(self, shift, n_tau, size):
        """:func:`_kernel_spectrum` for this grid's nodes and a temperature range (kept per range: a later
        table of the same DOS over the same range reuses it; a handful of ranges at most)."""
        key = (shift, n_tau, size)
        if key not in self._kernel_spectra:
            if len(self._kernel_spectra) > 4:
                self._kernel_spectra.clear()
            self._kernel_spectra[key] = _kernel_spectrum(shift, n_tau, self.deposit.size, size)
        return self._kernel_spectra[key]

    def relevant(self, temperature):
        """Nodes needed by a cold sum at ``temperature`` (see :func:`thermo.kernels.cold._relevant_nodes`)."""
        if self._log_w is None:
            return self.nu.size
        return _relevant_nodes(self.nu, self.w, temperature, self._log_w, self._log_w_max)

    def sums(self, temperatures):
        """The sums of :func:`loggrid_sums` at ``temperatures`` [K] (> 0)."""
        t = np.asarray(temperatures, dtype=float).ravel()
        if not self.valid:
            return direct_grid_sums(self.all_nu, self.all_w, t)
        tau = np.log(t)
        half = ORDER // 2 + 1
        # τ₀ on the lattice of s₀ (a whole number of steps below it), so the kernels come from one table
        shift = int(np.ceil((self.s0 - tau.min() + half * STEP) / STEP))
        tau0 = self.s0 - shift * STEP
        n_tau = int(np.ceil((tau.max() - tau0) / STEP)) + half + 1
        on_grid, scale = _correlate(self, shift, n_tau)
        values = _read_back(on_grid, tau0, tau)
        out = dict(zip(SUM_KEYS, values))
        cold = ~np.all(values > DYNAMIC_RANGE * scale[:, None], axis=0)
        if cold.any():
            _fill_cold(out, self, t, np.flatnonzero(cold))
        if self.low_nu.size:
            extra = direct_grid_sums(self.low_nu, self.low_w, t)
            for key in SUM_KEYS:
                out[key] = out[key] + extra[key]
        return out
