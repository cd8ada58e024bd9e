r"""The one integral of the analytic low-frequency part :math:`A\nu^2`, in closed form.

Below the low-frequency cut-off :math:`\nu_c` the DOS is :math:`A\nu^2`
(a Debye spectrum is the special case :math:`\nu_c = \nu_D`).  Its sums
against the Planck kernels reduce to the Debye integral
:math:`J(X) = \int_0^X x^3/(e^x-1)\,dx`, evaluated to rounding, so the
:math:`T^3` law holds however coarse the table above the cut-off is.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [2] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
   (NBS, 1964), 27.1.1-27.1.3 (Debye functions) and 23.1.1 (Bernoulli
   numbers).
"""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
from scipy import special

from .direct import SUM_KEYS, direct_grid_sums
from .planck import X_MAX as _X_CLIP
from .planck import H_OVER_K_THZ, log_partition_kernel, thermal_energy_kernel

#: Below this X the Bernoulli series of J_m(X) is used, above it the e^{−kX} series.
_J_SPLIT = 1.0
_J_TERMS = np.arange(1, 41, dtype=float)


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


_BERNOULLI = _bernoulli_over_factorial(41)


def bose_integral(order, upper):
    r""":math:`J_m(X) = \int_0^X x^m/(e^x-1)\,dx` for a whole order m >= 1, to rounding.

    Parameters
    ----------
    order : int
        The power :math:`m` [1].
    upper : array_like
        Upper limit :math:`X` [1], >= 0.

    Returns
    -------
    numpy.ndarray
        :math:`J_m(X)` [1]; :math:`m!\,\zeta(m+1)` as :math:`X \to \infty`.

    Notes
    -----
    For :math:`X < 1`, the Bernoulli series
    :math:`J_m = \sum_n B_n X^{n+m} / (n!\,(n+m))` (radius :math:`2\pi`);
    above, :math:`J_m = m!\zeta(m+1) - \sum_{k=1}^{40} e^{-kX}
    \sum_{j=0}^{m} \frac{m!}{(m-j)!} \frac{X^{m-j}}{k^{j+1}}`.

    References
    ----------
    Abramowitz and Stegun (1964), 23.1.1 and 27.1.

    Examples
    --------
    >>> round(float(bose_integral(5, 1e3)) / (8 * np.pi ** 6 / 63), 15)
    1.0
    """
    m = int(order)
    x = np.asarray(upper, dtype=float)
    small = x < _J_SPLIT
    xs = np.where(small, x, 0.0)
    series = xs ** m * np.polynomial.polynomial.polyval(xs, _BERNOULLI / (np.arange(41) + m))
    # beyond X = 800 every e^{-kX} underflows: clip so that X^m stays finite
    big = np.clip(x, _J_SPLIT, 800.0)[..., None]
    poly = sum(math.factorial(m) / math.factorial(m - j) * big ** (m - j) / _J_TERMS ** (j + 1)
               for j in range(m + 1))
    tail = np.sum(np.exp(-big * _J_TERMS) * poly, axis=-1)
    return np.where(small, series, math.factorial(m) * special.zeta(m + 1) - tail)


def debye_integral(upper):
    r""":math:`J(X) = \int_0^X x^3/(e^x-1)\,dx`, to rounding.

    Parameters
    ----------
    upper : array_like
        Upper limit :math:`X` [1], >= 0.

    Returns
    -------
    numpy.ndarray
        :math:`J(X)` [1]; :math:`\pi^4/15` as :math:`X \to \infty`.

    Notes
    -----
    :math:`J = J_3` of :func:`bose_integral`.

    References
    ----------
    Abramowitz and Stegun (1964), 27.1.1-27.1.3 and 23.1.1.

    Examples
    --------
    >>> round(float(debye_integral(1e3)) / (np.pi ** 4 / 15), 15)
    1.0
    >>> round(float(debye_integral(1e-3)) / (1e-9 / 3), 6)   # x³/(eˣ−1) ≈ x²
    0.999625
    """
    return bose_integral(3, upper)


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
#: Taper zones narrower than this share of the cut-off stay on Gauss–Legendre nodes (the monomial
#: form of a steep cubic would cancel digits).
_NARROW_TAPER = 0.5


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
    :math:`\Phi_n(X) = X^{-n}J_n(X)` (:func:`bose_integral`), integrating by parts,

    .. math::
        \int_0^{\nu_L}\nu^m u = \nu_L^n\Phi_n,\quad
        \int_0^{\nu_L}\nu^m c = \nu_L^n[(m+2)\Phi_n - u(X)],\quad
        \int_0^{\nu_L}\nu^m \ell = \nu_L^n[\Phi_n + \ell(X)]/n .

    For :math:`X < 3`, :math:`\Phi_n = \sum_k B_k X^k/(k!(k+n))`; above,
    :math:`\Phi_n = n!\zeta(n+1)X^{-n} - \sum_{j=0}^{n}\frac{n!}{(n-j)!}X^{-j}\mathrm{Li}_{j+1}(e^{-X})`.
    Both are polynomials (in :math:`X`, resp. in :math:`1/X` and :math:`e^{-X}`) whose
    coefficients depend only on the DOS: they are summed over the powers and limits here, once,
    so a temperature costs one short polynomial and no quadrature.

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
        self._limits = []
        for nu_l, coefficients in limits:
            d = np.zeros(_MAX_POWER + 1)
            given = np.asarray(coefficients, dtype=float)
            d[:given.size] = given
            g = d * float(nu_l) ** _N                                    # modes carried by each power
            gw = np.array([(_N + 1.0) * g, g, g / _N])                   # (3 kernels, powers)
            const = np.zeros((3, _MAX_POWER + 2))
            const[:, 1:] = gw * _FACTORIAL_ZETA
            # tail[κ, j, k] = -Σ_{n >= j} gw[κ, n] n!/(n-j)! / k^{j+1}: rows (kernel, j), columns the power k of q
            tail = -(gw @ _FALLING)[:, :, None] * _LI_INVERSE[None, :, :]
            self._limits.append((float(nu_l), gw @ _SERIES, const, tail.reshape(-1, _LI_K.size),
                                 float(g.sum()) if heat_capacity_edges else 0.0, float(np.sum(g / _N))))
        # Where every limit is below the split, one series in X of the first limit serves all:
        # X_L = r_L X_0, so r_L^k joins the coefficients of X_0^k.
        self._limits = [entry for entry in self._limits if entry[0] > 0.0]
        self._first = self._limits[0][0] if self._limits else 0.0
        self._reach = max((entry[0] for entry in self._limits), default=0.0) / (self._first or 1.0)
        k = np.arange(_BETA.size)
        self._joint = sum(entry[1] * (entry[0] / self._first) ** k for entry in self._limits) \
            if self._limits else np.zeros((3, _BETA.size))

    def sums(self, temperatures):
        """``heat_capacity``, ``thermal_energy``, ``log_partition`` at each temperature (> 0) [1]."""
        t = np.asarray(temperatures, dtype=float).ravel()
        out = np.zeros((3, t.size))
        if not self._limits:
            return {key: out[i].reshape(np.shape(temperatures)) for i, key in enumerate(SUM_KEYS)}
        x0 = H_OVER_K_THZ * self._first / t
        joint = x0 * self._reach < _SPLIT
        if joint.any():
            xj = x0[joint]
            count = _terms(float(xj.max()) * self._reach)
            out[:, joint] = _apply(self._joint[:, :count], _powers(xj, count))
        rest = ~joint
        for nu_l, small, const, tail, c_edge, l_edge in self._limits:
            x = H_OVER_K_THZ * nu_l / t
            if rest.any():
                out[:, rest] += _one_limit(x[rest], small, const, tail)
            if c_edge:
                out[0] -= c_edge * thermal_energy_kernel(x)
            out[2] += l_edge * log_partition_kernel(x)
        return {key: out[i].reshape(np.shape(temperatures)) for i, key in enumerate(SUM_KEYS)}


def _one_limit(x, small, const, tail):
    """Σ_m gw_m Φ_{m+1}(X) of one limit (3 kernels × X), each X on its own side of the split."""
    part = np.zeros((3, x.size))
    low = x < _SPLIT
    if low.any():
        count = _terms(float(x[low].max()))
        part[:, low] = _apply(small[:, :count], _powers(x[low], count))
    if not low.all():
        xl = x[~low]
        y = _powers(1.0 / xl, const.shape[1])                       # (11, M)
        q = _powers(np.exp(-xl), _LI_K.size + 1)[1:]                # q^1 … q^20
        part[:, ~low] = _apply(const, y) + np.einsum("kjm,jm->km", _apply(tail, q).reshape(3, -1, xl.size), y)
    return part


def _apply(coefficients, powers):
    """coefficients (R, K) times powers (K, M) [einsum: a BLAS product of this flat shape stalled
    for milliseconds on a busy machine]."""
    return np.einsum("rk,km->rm", coefficients, powers)


def _terms(largest):
    """Terms of the Bernoulli series for X <= ``largest``: (X/2π)^k below 1e-18 (at most 60)."""
    if largest <= 0.0:
        return 2
    return int(min(_BETA.size, max(2, math.ceil(18.0 * math.log(10.0) / math.log(2.0 * math.pi / largest)))))


#: Below this many entries :func:`_powers` takes one ``np.power.outer`` call.
_OUTER_POWERS = 2048
_EXPONENTS = np.arange(64, dtype=float)


def _powers(x, count):
    """Rows x⁰, x¹, …, x^(count-1) of a 1-D array (row-wise products: contiguous and quick; for a few
    values one power call, which a loop of short products would cost many times over)."""
    if x.size * count <= _OUTER_POWERS:
        return np.power(x[None, :], _EXPONENTS[:count, None])
    out = np.empty((count, x.size))
    out[0] = 1.0
    if count > 1:
        out[1] = x
    for k in range(2, count):
        np.multiply(out[k - 1], x, out=out[k])
    return out


def nu2_part_sums(coefficient, cutoff_thz, temperatures, curvature=0.0, quartic=0.0):
    r"""Sums of the analytic part :math:`A\nu^2` on :math:`[0, \nu_c]`, in closed form.

    Parameters
    ----------
    coefficient : float
        :math:`A` [modes / THz³].
    cutoff_thz : float
        :math:`\nu_c` [THz].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.
    curvature, quartic : float
        :math:`b` [1/THz²] and :math:`c` [1/THz⁴] of the form
        :math:`A\nu^2(1 + b\nu^2 + c\nu^4)`.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity``, ``thermal_energy`` and ``log_partition``, the
        integrals of :math:`A\nu^2 K(h\nu/k_BT)` over :math:`[0, \nu_c]` [1].

    Notes
    -----
    With :math:`X = h\nu_c/k_BT`, :math:`s = A(k_BT/h)^3` and
    :math:`J(X) = \int_0^X x^3/(e^x-1)dx` (:func:`debye_integral`),
    integrating by parts:

    .. math::
        \int_0^X x^2 u\,dx = J,\quad
        \int_0^X x^2 c\,dx = 4J - X^3 u(X),\quad
        \int_0^X x^2 \ell\,dx = \frac{X^3 \ell(X) + J}{3}.

    The :math:`Ab\nu^4` and :math:`Ac\nu^6` terms add the same with
    :math:`J_{m+1}` of :func:`bose_integral`; evaluated by
    :class:`PolynomialBoseSums`.

    References
    ----------
    Debye (1912); Abramowitz and Stegun (1964), 27.1.

    Examples
    --------
    >>> s = nu2_part_sums(9.0, 1.0, [0.01])   # deep T³ regime, 3 modes
    >>> x_d = H_OVER_K_THZ / 0.01
    >>> round(float(s["heat_capacity"][0]) / (12 * np.pi**4 / 5 / x_d**3), 12)
    1.0
    """
    t = np.asarray(temperatures, dtype=float)
    if coefficient == 0.0 or cutoff_thz <= 0.0:
        return {key: np.zeros_like(t) for key in SUM_KEYS}
    form = [0.0, 0.0, coefficient, 0.0, coefficient * curvature, 0.0, coefficient * quartic]
    return PolynomialBoseSums([(cutoff_thz, form)]).sums(t)


def prepared_analytic_part(fit):
    r"""The :class:`PolynomialBoseSums` of a fit's analytic part (form below the cut-off, taper above).

    Parameters
    ----------
    fit : LowFrequencyFit
        The fitted form, its cut-off and taper.

    Returns
    -------
    tuple
        ``(sums, taper_nodes, taper_modes)``: the prepared closed form, and the Gauss–Legendre
        nodes [THz] and modes [1] of a taper zone too narrow for it (empty otherwise).

    Notes
    -----
    On :math:`[\nu_a, \nu_m]` the DOS is :math:`W M` with the cubic step
    :math:`W = 1 - 3s^2 + 2s^3`, :math:`s = (\nu-\nu_a)/(\nu_m-\nu_a)`: a polynomial
    :math:`Q` of degree 9.  So :math:`\int_0^{\nu_a} M K + \int_{\nu_a}^{\nu_m} Q K`
    :math:`= \int_0^{\nu_a}(M - Q)K + \int_0^{\nu_m} Q K`; :math:`M(\nu_a) = Q(\nu_a)` and
    :math:`Q(\nu_m) = 0`, so the boundary terms of C_v cancel.

    Examples
    --------
    >>> from thermo.spectrum import LowFrequencyFit
    >>> sums, nodes, _ = prepared_analytic_part(LowFrequencyFit(9.0, 1.0, (1.0, 4.0), blend_top_thz=2.0))
    >>> round(float(sums.sums([1e7])["heat_capacity"][0]), 6), nodes.size   # 3 + 9 · 13/15 modes
    (10.8, 0)
    """
    poly = np.polynomial.polynomial
    form = np.array([0.0, 0.0, fit.coefficient, 0.0, fit.coefficient * fit.curvature, 0.0,
                     fit.coefficient * fit.quartic])
    cut = fit.cutoff_thz
    top = fit.blend_top_thz if fit.blend_top_thz is not None else cut
    if fit.coefficient == 0.0 or cut <= 0.0:
        form = np.zeros(1)
    if top <= cut or top - cut < _NARROW_TAPER * cut or getattr(fit, "smooth_taper", False):
        nodes, modes = fit.taper_nodes()
        return PolynomialBoseSums([(cut, form)]), nodes, modes
    half = top - cut
    s = np.array([-cut / half, 1.0 / half])
    step = poly.polyadd([1.0], poly.polyadd(-3.0 * poly.polypow(s, 2), 2.0 * poly.polypow(s, 3)))
    tapered = np.convolve(step, form)                      # degree 9 at most
    below = np.zeros(tapered.size)
    below[:form.size] = form
    return (PolynomialBoseSums([(cut, below - tapered), (top, tapered)], heat_capacity_edges=False),
            np.zeros(0), np.zeros(0))


def analytic_part_sums(fit, temperatures):
    r"""Sums of the whole analytic part of a :class:`~thermo.spectrum.LowFrequencyFit`.

    Parameters
    ----------
    fit : LowFrequencyFit
        The fitted form, its cut-off and taper.
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        As :func:`nu2_part_sums`.

    Notes
    -----
    :math:`\int_0^{\nu_a} M K\,d\nu + \int_{\nu_a}^{\nu_m} W M K\,d\nu` in closed form
    (:func:`prepared_analytic_part`, prepared once per fit and kept on it); a taper zone
    narrower than half the cut-off, or a smooth (not cubic) step, by 48-point Gauss–Legendre quadrature.

    References
    ----------
    Abramowitz and Stegun (1964), 25.4.29 and 27.1.

    Examples
    --------
    >>> from thermo.spectrum import LowFrequencyFit
    >>> s = analytic_part_sums(LowFrequencyFit(9.0, 1.0, (0.0, 1.0)), [1e7])
    >>> round(float(s["heat_capacity"][0]), 6)
    3.0
    """
    t = np.asarray(temperatures, dtype=float)
    sums, nodes, modes = fit.prepared_sums()
    out = sums.sums(t)
    if nodes.size:
        extra = direct_grid_sums(nodes, modes, t)
        out = {key: out[key] + extra[key] for key in SUM_KEYS}
    return out
