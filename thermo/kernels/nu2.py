"""The one integral of the analytic low-frequency part :math:`A\\nu^2`, in closed form.

Below the low-frequency cut-off :math:`\\nu_c` the DOS is :math:`A\\nu^2`
(a Debye spectrum is the special case :math:`\\nu_c = \\nu_D`).  Its sums
against the Planck kernels reduce to the Debye integral
:math:`J(X) = \\int_0^X x^3/(e^x-1)\\,dx`, evaluated to rounding, so the
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

import numpy as np
from scipy import special

from .direct import SUM_KEYS
from .planck import X_MAX as _X_CLIP
from .planck import H_OVER_K_THZ, log_partition_kernel, thermal_energy_kernel

#: ∫_0^∞ x³/(eˣ−1) dx = π⁴/15.
_J_INFINITE = np.pi ** 4 / 15.0


#: Below this X the Bernoulli series of J(X) is used, above it the e^{−kX} series.
_J_SPLIT = 1.0


_J_TERMS = np.arange(1, 41, dtype=float)


def _bernoulli_coefficients(count=40):
    """c_n = B_n / (n! (n + 3)) for n = 0..count (B_1 = −1/2)."""
    b = special.bernoulli(count)
    n = np.arange(count + 1)
    return b / (special.factorial(n) * (n + 3))


_J_SERIES = _bernoulli_coefficients()


def debye_integral(upper):
    """:math:`J(X) = \\int_0^X x^3/(e^x-1)\\,dx`, to rounding.

    Parameters
    ----------
    upper : array_like
        Upper limit :math:`X` [1], >= 0.

    Returns
    -------
    numpy.ndarray
        :math:`J(X)` [1]; :math:`\\pi^4/15` as :math:`X \\to \\infty`.

    Notes
    -----
    For :math:`X < 1`, the Bernoulli series
    :math:`J = \\sum_n B_n X^{n+3} / (n!\\,(n+3))` (radius :math:`2\\pi`);
    above, :math:`J = \\pi^4/15 - \\sum_{k \\ge 1} e^{-kX}
    (X^3/k + 3X^2/k^2 + 6X/k^3 + 6/k^4)` with 40 terms (error below
    :math:`e^{-41}`).

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
    x = np.asarray(upper, dtype=float)
    small = x < _J_SPLIT
    xs = np.where(small, x, 0.0)
    series = xs ** 3 * np.polynomial.polynomial.polyval(xs, _J_SERIES)
    # beyond X = 800 every e^{-kX} underflows: clip so that X³ stays finite
    z = np.clip(x, _J_SPLIT, 800.0)[..., None] * _J_TERMS          # z = kX
    tail = np.sum(np.exp(-z) * (((z + 3.0) * z + 6.0) * z + 6.0) / _J_TERMS ** 4, axis=-1)
    return np.where(small, series, _J_INFINITE - tail)


def nu2_part_sums(coefficient, cutoff_thz, temperatures):
    """Sums of the analytic part :math:`A\\nu^2` on :math:`[0, \\nu_c]`, in closed form.

    Parameters
    ----------
    coefficient : float
        :math:`A` [modes / THz³].
    cutoff_thz : float
        :math:`\\nu_c` [THz].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity``, ``thermal_energy`` and ``log_partition``, the
        integrals of :math:`A\\nu^2 K(h\\nu/k_BT)` over :math:`[0, \\nu_c]` [1].

    Notes
    -----
    With :math:`X = h\\nu_c/k_BT`, :math:`s = A(k_BT/h)^3` and
    :math:`J(X) = \\int_0^X x^3/(e^x-1)dx` (:func:`debye_integral`),
    integrating by parts:

    .. math::
        \\int_0^X x^2 u\\,dx = J,\\quad
        \\int_0^X x^2 c\\,dx = 4J - X^3 u(X),\\quad
        \\int_0^X x^2 \\ell\\,dx = \\frac{X^3 \\ell(X) + J}{3}.

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
    scale = coefficient * (t / H_OVER_K_THZ) ** 3
    big_x = H_OVER_K_THZ * cutoff_thz / t
    j = debye_integral(big_x)
    # X³ u(X) and X³ ℓ(X) vanish beyond the kernels' clipping; keep X³ finite there
    cube = np.where(big_x < _X_CLIP, big_x, 0.0) ** 3
    return {"heat_capacity": scale * (4.0 * j - cube * thermal_energy_kernel(big_x)),
            "thermal_energy": scale * j,
            "log_partition": scale * (cube * log_partition_kernel(big_x) + j) / 3.0}
