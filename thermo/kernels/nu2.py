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

import numpy as np
from scipy import special

from .direct import SUM_KEYS, direct_grid_sums
from .planck import X_MAX as _X_CLIP
from .planck import H_OVER_K_THZ, log_partition_kernel, thermal_energy_kernel

#: Below this X the Bernoulli series of J_m(X) is used, above it the e^{−kX} series.
_J_SPLIT = 1.0
_J_TERMS = np.arange(1, 41, dtype=float)
_BERNOULLI = special.bernoulli(40) / special.factorial(np.arange(41))


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
    :math:`s_{m+1} = A b (k_BT/h)^{m+1}` (resp. :math:`Ac`) and
    :math:`J_{m+1}` of :func:`bose_integral`; in general
    :math:`\int_0^X x^m c = (m+2)J_{m+1} - X^{m+1}u(X)`,
    :math:`\int_0^X x^m u = J_{m+1}`,
    :math:`\int_0^X x^m \ell = (X^{m+1}\ell(X) + J_{m+1})/(m+1)` at m = 4, 6.

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
    big_x = H_OVER_K_THZ * cutoff_thz / t
    # X^k u(X) and X^k ℓ(X) vanish beyond the kernels' clipping; keep X^k finite there
    inside = np.where(big_x < _X_CLIP, big_x, 0.0)
    u_edge, l_edge = thermal_energy_kernel(big_x), log_partition_kernel(big_x)
    out = {key: np.zeros_like(t) for key in SUM_KEYS}
    for power, factor in ((2, coefficient), (4, coefficient * curvature), (6, coefficient * quartic)):
        if factor == 0.0:
            continue
        scale = factor * (t / H_OVER_K_THZ) ** (power + 1)
        j = bose_integral(power + 1, big_x)
        edge = inside ** (power + 1)
        out["heat_capacity"] = out["heat_capacity"] + scale * ((power + 2) * j - edge * u_edge)
        out["thermal_energy"] = out["thermal_energy"] + scale * j
        out["log_partition"] = out["log_partition"] + scale * (edge * l_edge + j) / (power + 1)
    return out


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
    :math:`\int_0^{\nu_a} M K\,d\nu` in closed form (:func:`nu2_part_sums`)
    plus :math:`\int_{\nu_a}^{\nu_m} W M K\,d\nu` by 48-point
    Gauss–Legendre quadrature (smooth integrand, error far below rounding of
    the table).

    References
    ----------
    Abramowitz and Stegun (1964), 25.4.29.

    Examples
    --------
    >>> from thermo.spectrum import LowFrequencyFit
    >>> s = analytic_part_sums(LowFrequencyFit(9.0, 1.0, (0.0, 1.0)), [1e7])
    >>> round(float(s["heat_capacity"][0]), 6)
    3.0
    """
    t = np.asarray(temperatures, dtype=float)
    out = nu2_part_sums(fit.coefficient, fit.cutoff_thz, t, fit.curvature, fit.quartic)
    nodes, modes = fit.taper_nodes()
    if nodes.size:
        extra = direct_grid_sums(nodes, modes, t)
        out = {key: out[key] + extra[key] for key in SUM_KEYS}
    return out
