r"""Closed-form kernel sums of a DOS made of polynomials in ν, prepared once per DOS.

The analytic low-frequency part of a spectrum (the fitted :math:`A\nu^2(1+b\nu^2+c\nu^4)` and
its cubic taper, :mod:`thermo.kernels.nu2`) is a sum of polynomials on :math:`[0, \nu_L]`.  Its
sums against the Planck kernels are series in :math:`X = h\nu_L/k_BT` whose coefficients depend
on the DOS only: :class:`PolynomialBoseSums` adds them up once, so a temperature costs one short
polynomial (a matrix product over all temperatures) and no quadrature.

References
----------
.. [1] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
   (NBS, 1964), 23.1.1 (Bernoulli numbers), 27.1 (Debye functions) and 27.7 (polylogarithm
   series).
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import NamedTuple

import numpy as np
from scipy import special

from .direct import SUM_KEYS
from .planck import H_OVER_K_THZ


def _bernoulli_over_factorial(count):
    r""":math:`B_k/k!` for k < ``count``, exact rationals rounded once (B₁ = −1/2).

    From :math:`\sum_{k=0}^{n} \beta_k/(n-k+1)! = 0` (n >= 1), the series of
    :math:`x/(e^x-1)`; scipy's floating B₄ is off by 2e-12 relative, which showed in the sums.

    Examples
    --------
    >>> _bernoulli_over_factorial(5).tolist() == [1.0, -0.5, 1 / 12, 0.0, -1 / 720]
    True
    """
    beta = [Fraction(1)]
    for n in range(1, count):
        beta.append(-sum(beta[k] / math.factorial(n - k + 1) for k in range(n)))
    return np.array([float(b) for b in beta])


#: Below this X the Bernoulli series (60 terms) of X^{-n} J_n(X) is used, above it the Li_p(e^{-X}) series.
_SPLIT = 3.0
_BETA = _bernoulli_over_factorial(60)
#: Terms of Li_p(q) = Σ_k q^k / k^p kept above the split (q <= e^{-3}: q^21 < 1e-27).
_LI_K = np.arange(1, 21, dtype=float)
#: Highest power m of ν in a prepared polynomial (Aν²(1+bν²+cν⁴) times the cubic taper).
_MAX_POWER = 9
#: n = m + 1 for the powers m = 0 … 9, and the tables that depend on n only.
_N = np.arange(1.0, _MAX_POWER + 2.0)
#: β_k / (k + n): row n, column k (the Bernoulli series of Φ_n).
_SERIES = _BETA[None, :] / (np.arange(_BETA.size)[None, :] + _N[:, None])
#: n! ζ(n + 1).
_FACTORIAL_ZETA = np.array([math.factorial(int(n)) for n in _N]) * special.zeta(_N + 1.0)
#: n!/(n - j)! for j <= n (0 above): row n, column j = 0 … 10.
_FALLING = np.array([[math.factorial(int(n)) / math.factorial(int(n) - j) if j <= n else 0.0
                      for j in range(_MAX_POWER + 2)] for n in _N])
#: 1 / k^{j+1}: row j, column k = 1 … 20.
_LI_INVERSE = 1.0 / _LI_K[None, :] ** (np.arange(_MAX_POWER + 2.0)[:, None] + 1.0)


class PolynomialBoseSums:
    r"""Kernel sums of a DOS made of polynomials in ν, prepared once, evaluated at any temperatures.

    Parameters
    ----------
    limits : sequence of (float, array_like)
        Pairs :math:`(\nu_L, d^L)`: the sum is
        :math:`\sum_L \int_0^{\nu_L} \sum_m d^L_m \nu^m K(h\nu/k_BT)\,d\nu`,
        :math:`\nu_L` [THz], :math:`d^L_m` [modes / THz^{m+1}] for powers m = 0…9 (m >= 2 used).
    heat_capacity_edges : bool
        False when the pieces join continuously and the polynomial vanishes at the last limit
        (the boundary terms of the C_v integrals cancel exactly and are left out).

    Notes
    -----
    With :math:`X = h\nu_L/k_BT`, :math:`n = m + 1` and
    :math:`\Phi_n(X) = X^{-n}J_n(X)` (:func:`thermo.kernels.nu2.bose_integral`), integrating by parts,

    .. math::
        \int_0^{\nu_L}\nu^m u = \nu_L^n\Phi_n,\quad
        \int_0^{\nu_L}\nu^m c = \nu_L^n[(m+2)\Phi_n - u(X)],\quad
        \int_0^{\nu_L}\nu^m \ell = \nu_L^n[\Phi_n + \ell(X)]/n .

    For :math:`X < 3`, :math:`\Phi_n = \sum_k B_k X^k/(k!(k+n))`; above,
    :math:`\Phi_n = n!\zeta(n+1)X^{-n} - \sum_{j=0}^{n}\frac{n!}{(n-j)!}X^{-j}\mathrm{Li}_{j+1}(e^{-X})`.
    The boundary terms too: below the split :math:`u(X) = \sum_k B_k X^k/k!` and
    :math:`\ell(X) = -\ln X - \sum_{k\ge1} B_k X^k/(k\,k!)`, above
    :math:`u = X e^{-X}/(1-e^{-X})` and :math:`\ell = \mathrm{Li}_1(e^{-X})`.
    All are polynomials (in :math:`X` and :math:`\ln X`, resp. in :math:`1/X` and :math:`e^{-X}`)
    whose coefficients depend only on the DOS: they are summed over the powers and limits here,
    once.  Where the highest :math:`X` is below :data:`_JOINT_SPLIT`, :math:`X_L = r_L X_0` puts
    every limit into one series in :math:`X_0`, so those temperatures cost one matrix product
    and one logarithm, and no quadrature.

    References
    ----------
    Abramowitz and Stegun (1964), 23.1.1, 27.1 and 27.7 (polylogarithm series).

    Examples
    --------
    >>> s = PolynomialBoseSums([(1.0, [0, 0, 9.0])]).sums([1e7])   # 9ν² on [0, 1]: 3 modes
    >>> round(float(s["heat_capacity"][0]), 6)
    3.0
    """

    def __init__(self, limits, heat_capacity_edges=True):
        k = np.arange(_BETA.size)
        self._limits = []
        for nu_l, coefficients in limits:
            if float(nu_l) <= 0.0:
                continue
            d = np.zeros(_MAX_POWER + 1)
            given = np.asarray(coefficients, dtype=float)
            d[:given.size] = given
            g = d * float(nu_l) ** _N                                    # modes carried by each power
            gw = np.array([(_N + 1.0) * g, g, g / _N])                   # (3 kernels, powers)
            const = np.zeros((3, _MAX_POWER + 2))
            const[:, 1:] = gw * _FACTORIAL_ZETA
            # tail[κ, j, k] = -Σ_{n >= j} gw[κ, n] n!/(n-j)! / k^{j+1}: rows (kernel, j), columns the power k of q
            tail = -(gw @ _FALLING)[:, :, None] * _LI_INVERSE[None, :, :]
            c_edge = float(g.sum()) if heat_capacity_edges else 0.0
            l_edge = float(np.sum(g / _N))
            # the boundary terms as series too: below the split u(X) = Σ β_k X^k and
            # ℓ(X) = −ln X − Σ_{k>=1} β_k X^k / k; above, ℓ(X) = Li_1(e^{−X}) joins the tail
            small = gw @ _SERIES
            small[0] -= c_edge * _BETA
            small[2, 1:] -= l_edge * _BETA[1:] / k[1:]
            tail[2, 0] += l_edge / _LI_K
            self._limits.append((float(nu_l), small, -l_edge, const, tail, c_edge))
        # Where every limit is below the joint split, one series in X of the first limit serves all:
        # X_L = r_L X_0, so r_L^k joins the coefficients of X_0^k, and −ln X_L = −ln r_L − ln X_0.
        self._first = self._limits[0][0] if self._limits else 0.0
        self._reach = max((entry[0] for entry in self._limits), default=0.0) / (self._first or 1.0)
        self._joint = np.zeros((3, _BETA.size))
        self._joint_log = 0.0
        for nu_l, small, log_coefficient, *_ in self._limits:
            ratio = nu_l / self._first
            self._joint += small * ratio ** k
            self._joint[2, 0] += log_coefficient * math.log(ratio)
            self._joint_log += log_coefficient
        # every limit at once below the joint split: coefficients stacked limit by limit
        self._scale = H_OVER_K_THZ * self._first
        self._nu_scale = np.array([H_OVER_K_THZ * entry[0] for entry in self._limits])[:, None]
        self._stacked = _Stacked(*(np.array([entry[i] for entry in self._limits]) for i in range(1, 6)))

    def sums(self, temperatures):
        """``heat_capacity``, ``thermal_energy``, ``log_partition`` at each temperature (> 0) [1]."""
        t = np.asarray(temperatures, dtype=float).ravel()
        if not self._limits:
            out = np.zeros((3, t.size))
            return {key: out[i].reshape(np.shape(temperatures)) for i, key in enumerate(SUM_KEYS)}
        x0 = self._scale / t
        joint = x0 * self._reach < _JOINT_SPLIT
        if joint.all():
            out = _series(x0, self._joint, self._joint_log, self._reach)
        else:
            out = np.empty((3, t.size))
            if joint.any():
                out[:, joint] = _series(x0[joint], self._joint, self._joint_log, self._reach)
            rest = ~joint
            out[:, rest] = _every_limit(self._nu_scale / t[rest], self._stacked)
        return {key: out[i].reshape(np.shape(temperatures)) for i, key in enumerate(SUM_KEYS)}


#: Below this X of the highest limit one series in X of the lowest serves every limit
#: (at most 29 terms; up to :data:`_SPLIT` it would take 52).
_JOINT_SPLIT = 1.5


def _series(x, coefficients, log_coefficient, reach=1.0):
    """Σ_k coefficients[:, k] x^k + log_coefficient · ln x in the third row (3 kernels × x), x·reach < 2π."""
    count = _terms(float(x.max()) * reach)
    part = _apply(coefficients[:, :count], _powers(x, count))
    if log_coefficient:
        part[2] += log_coefficient * np.log(x)
    return part


class _Stacked(NamedTuple):
    """The coefficients of every limit, stacked along a first axis of length L."""

    small: np.ndarray           # (L, 3, 60): the series below the split, boundary terms included
    log: np.ndarray             # (L,): coefficient of ln X in the ℓ row
    const: np.ndarray           # (L, 3, 11): n! ζ(n+1) X^{-n} above the split
    tail: np.ndarray            # (L, 3, 11, 20): the Li series above the split, ℓ's boundary term included
    c_edge: np.ndarray          # (L,): boundary term of C_v, −c_edge · u(X)


def _every_limit(x, stacked):
    """Σ over the limits of Σ_m gw_m Φ_{m+1}(X_L) and the boundary terms (3 kernels × R), X (L, R), each X on
    its own side of the split: each side one product for all limits at once, the block of its own limit
    picked from it."""
    limits, count = x.shape
    flat = x.ravel()
    owner = np.repeat(np.arange(limits), count)
    part = np.empty((3, flat.size))
    low = flat < _SPLIT
    if low.any():
        xs, own = flat[low], owner[low]
        terms = _terms(float(xs.max()))
        every = _apply(stacked.small[:, :, :terms].reshape(-1, terms), _powers(xs, terms))
        picked = every.reshape(limits, 3, xs.size)[own, :, np.arange(xs.size)].T
        picked[2] += stacked.log[own] * np.log(xs)
        part[:, low] = picked
    if not low.all():
        xl, own = flat[~low], owner[~low]
        columns = np.arange(xl.size)
        y = _powers(1.0 / xl, stacked.const.shape[2])                  # (11, n)
        q = _powers(np.exp(-xl), _LI_K.size + 1)[1:]                    # q^1 … q^20
        tail = _apply(stacked.tail.reshape(-1, _LI_K.size), q).reshape(limits, 3, -1, xl.size)
        coefficient = tail[own, :, :, columns] + stacked.const[own]    # (n, 3, 11)
        high = np.einsum("mkj,jm->km", coefficient, y)
        high[0] -= stacked.c_edge[own] * xl * q[0] / (1.0 - q[0])    # u(X) = X e^{−X} / (1 − e^{−X})
        part[:, ~low] = high
    return part.reshape(3, limits, count).sum(axis=1)


#: Largest m·n·k of one matrix product in :func:`_apply` (OpenBLAS multiplies below 2^18 on one thread).
_PRODUCT_SIZE = 1 << 17


def _apply(coefficients, powers):
    """coefficients (R, K) times powers (K, M), as matrix products of at most :data:`_PRODUCT_SIZE`
    multiplications each: a threaded BLAS product stalled for milliseconds on a busy 2-core machine
    (90th percentile 12 ms against 0.13 ms for a (3, 60) × (60, 10⁴) product), einsum is 3-5 times slower."""
    rows, inner = coefficients.shape
    columns = powers.shape[1]
    step = max(64, _PRODUCT_SIZE // max(1, rows * inner))
    if columns <= step:
        return coefficients @ powers
    out = np.empty((rows, columns))
    for start in range(0, columns, step):
        np.matmul(coefficients, powers[:, start:start + step], out=out[:, start:start + step])
    return out


def _terms(largest):
    """Terms of the Bernoulli series for X <= ``largest``: (X/2π)^k below 1e-18 (at most 60)."""
    if largest <= 0.0:
        return 2
    return int(min(_BETA.size, max(2, math.ceil(18.0 * math.log(10.0) / math.log(2.0 * math.pi / largest)))))


#: Below this many entries :func:`_powers` takes one ``np.power.outer`` call.
_OUTER_POWERS = 2048
_EXPONENTS = np.arange(64, dtype=float)


def _powers(x, count):
    """Rows x⁰, x¹, …, x^(count-1) of a 1-D array (for a few values one power call, which a loop of
    short products would cost many times over; else the first √count rows by products, the others a
    block at a time: rows k … k+b−1 = rows k−b … k−1 times x^b)."""
    if x.size * count <= _OUTER_POWERS:
        return np.power(x[None, :], _EXPONENTS[:count, None])
    out = np.empty((count, x.size))
    out[0] = 1.0
    if count > 1:
        out[1] = x
    block = max(2, math.isqrt(count))
    for k in range(2, min(block + 1, count)):
        np.multiply(out[k - 1], x, out=out[k])
    for start in range(block + 1, count, block):
        stop = min(start + block, count)
        np.multiply(out[start - block:stop - block], out[block], out=out[start:stop])
    return out
