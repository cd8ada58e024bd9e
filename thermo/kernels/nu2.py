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
from .planck import H_OVER_K_THZ  # noqa: F401 - the doctests' reference
from .polybose import PolynomialBoseSums, _bernoulli_over_factorial  # noqa: F401 - part of this interface

#: Below this X the Bernoulli series of J_m(X) is used, above it the e^{−kX} series.
_J_SPLIT = 1.0
_J_TERMS = np.arange(1, 41, dtype=float)
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


#: Taper zones narrower than this share of the cut-off stay on Gauss–Legendre nodes (the monomial
#: form of a steep cubic would cancel digits).
_NARROW_TAPER = 0.5


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
