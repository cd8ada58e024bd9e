r"""Complete Fermi–Dirac integrals of order 0, 1, 2 and the occupation tails built on them.

The electronic sums of :mod:`thermo.electronic.segments` integrate a
piecewise-linear DOS against the Fermi–Dirac occupation exactly, segment by
segment.  Every antiderivative they need is a polynomial in the reduced energy
times one of the *tails*

.. math::
    f(x) = \frac{1}{e^x+1},\quad
    \mathcal{L}_1(x) = \ln(1+e^{-x}),\quad
    \mathcal{L}_2(x) = -\mathrm{Li}_2(-e^{-x}),\quad
    \mathcal{L}_3(x) = -\mathrm{Li}_3(-e^{-x}),

with :math:`d\mathcal{L}_{n}/dx = -\mathcal{L}_{n-1}` and
:math:`d\mathcal{L}_1/dx = -f`.  They are the complete Fermi–Dirac integrals
:math:`F_j(\eta) = \frac{1}{\Gamma(j+1)}\int_0^\infty \frac{t^j\,dt}{e^{t-\eta}+1}
= -\mathrm{Li}_{j+1}(-e^{\eta})` of order j = 0, 1, 2 at :math:`\eta = -x`.
Only :math:`x \ge 0` is ever evaluated (the sums mirror the part below the
chemical potential), so every argument of the polylogarithm lies in
:math:`[-1, 0]` and nothing overflows: :math:`e^{-x}` only underflows to 0.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart and
   Winston, 1976), ch. 2 and appendix C.
.. [2] NIST Digital Library of Mathematical Functions, release 1.2.1 (2024),
   §25.12 (polylogarithms, the series and the inversion formula) and §25.2
   (the Dirichlet eta function η(s) = (1 − 2^{1−s}) ζ(s)).
.. [3] J. S. Blakemore, "Approximations for Fermi-Dirac integrals, especially
   the function F_{1/2}(η) used to describe electron density in a
   semiconductor", Solid-State Electron. 25, 1067-1076 (1982).

Examples
--------
>>> round(float(fermi_dirac_integral(0, 0.0)), 12)     # ln 2
0.69314718056
>>> round(float(fermi_dirac_integral(2, 0.0)), 12)     # 3 ζ(3)/4
0.90154267737
"""

from __future__ import annotations

import math

import numpy as np
from scipy.special import bernoulli, expit, spence, zeta

#: Below this reduced energy L3 uses its Taylor series in x (radius π), above it the series in e^{-x}.
_SPLIT = math.log(2.0)
_TAYLOR_TERMS = 30
#: Above this reduced energy L2 and L3 come from their series in e^{-x} (at most 13 terms), below from spence.
_SERIES = 3.0


def _eta_coefficients(terms=_TAYLOR_TERMS):
    """η(3 − k)/k! for k = 0 … terms − 1: the Taylor coefficients of F_2 about 0 (DLMF 25.12 + 25.2)."""
    b = bernoulli(terms + 2)                       # B_n with B_1 = -1/2; only even n > 0 are used below
    values = []
    for k in range(terms):
        s = 3 - k
        if s >= 2:
            eta = (1.0 - 2.0 ** (1 - s)) * float(zeta(s))
        elif s == 1:
            eta = math.log(2.0)
        elif s == 0:
            eta = 0.5
        else:                                      # η(−n) = (2^{n+1} − 1) B_{n+1}/(n + 1)
            n = -s
            eta = (2.0 ** (n + 1) - 1.0) * float(b[n + 1]) / (n + 1)
        values.append(eta / math.factorial(k))
    return np.array(values)


_ETA = _eta_coefficients()
#: Values at x = 0: f, L1, L2, L3.
AT_ZERO = (0.5, math.log(2.0), math.pi ** 2 / 12.0, 0.75 * float(zeta(3)))


def occupation_tails(x, orders=3):
    r"""Fermi–Dirac occupation and its tails at reduced energies x ≥ 0.

    Parameters
    ----------
    x : array_like
        Reduced energy :math:`x = |E-\mu|/k_BT` [1], ≥ 0.
    orders : {2, 3}
        Highest tail returned (3 includes :math:`\mathcal{L}_3`).

    Returns
    -------
    tuple of numpy.ndarray
        :math:`(f, \mathcal{L}_1, \mathcal{L}_2[, \mathcal{L}_3])`, each shaped like x.

    Notes
    -----
    :math:`f = \mathrm{expit}(-x)`, :math:`\mathcal{L}_1 = \mathrm{log1p}(e^{-x})`,
    :math:`\mathcal{L}_n = \sum_k (-1)^{k+1} y^k/k^n` with :math:`y = e^{-x}`
    for :math:`x > 3` (n = 2, 3) and for :math:`\mathcal{L}_3` down to :math:`x = \ln 2`;
    :math:`\mathcal{L}_2 = -\mathrm{spence}(1+y)` for :math:`x \le 3` (scipy's spence is
    :math:`\mathrm{Li}_2(1-z)`); :math:`\mathcal{L}_3` below :math:`\ln 2` from its
    Taylor series :math:`\sum_k \eta(3-k)(-x)^k/k!` (radius π, DLMF 25.12).

    Examples
    --------
    >>> f, l1, l2, l3 = occupation_tails([0.0, 50.0])
    >>> [round(float(v), 6) for v in (f[0], l1[0], l2[0], l3[0])]
    [0.5, 0.693147, 0.822467, 0.901543]
    >>> bool(np.allclose([f[1], l1[1], l2[1], l3[1]], np.exp(-50.0), rtol=1e-12, atol=0))
    True
    """
    x = np.asarray(x, dtype=float)
    y = np.exp(-x)
    f = expit(-x)
    l1 = np.log1p(y)
    l2 = np.empty_like(x)
    l3 = np.empty_like(x) if orders >= 3 else None
    near = x <= _SPLIT
    mid = ~near & (x <= _SERIES)
    if near.any():
        l2[near] = -spence(1.0 + y[near])
        if l3 is not None:
            t = -x[near]
            acc = np.full(t.shape, _ETA[-1])
            for c in _ETA[-2::-1]:                 # Horner in t = −x
                acc = acc * t + c
            l3[near] = acc
    if mid.any():
        l2[mid] = -spence(1.0 + y[mid])            # y ≥ e^-3: spence's absolute error is far below y
        if l3 is not None:
            l3[mid] = _alternating_series(y[mid], 3)[-1]
    tiny = y < 1e-17                               # every series term after y itself is below 1e-17 y
    for out in (l2, l3):
        if out is not None:
            out[tiny] = y[tiny]
    far = ~near & ~mid & ~tiny
    if far.any():
        for out, series in zip((l2, l3), _alternating_series(y[far], 3 if l3 is not None else 2)):
            out[far] = series
    return (f, l1, l2) if l3 is None else (f, l1, l2, l3)


def _alternating_series(z, highest):
    r""":math:`\sum_k (-1)^{k+1} z^k/k^n` for n = 2 … highest, 0 ≤ z ≤ 1/2 (DLMF 25.12.10)."""
    top = float(z.max())
    terms = max(1, int(math.ceil(-39.0 / math.log(top)))) if top > 0 else 1   # z^k < 1e-17 beyond
    sums = [np.zeros_like(z) for _ in range(2, highest + 1)]
    power = np.ones_like(z)
    for k in range(1, terms + 1):
        power = power * z
        signed = power if k % 2 else -power
        for n, acc in enumerate(sums, start=2):
            acc += signed / k ** n
    return sums


def fermi_dirac_integral(order, eta):
    r"""Complete Fermi–Dirac integral :math:`F_j(\eta)` of order j = 0, 1, 2.

    Parameters
    ----------
    order : {0, 1, 2}
        Order j.
    eta : array_like
        Reduced chemical potential η [1], any real value.

    Returns
    -------
    numpy.ndarray
        :math:`F_j(\eta)` [1].

    Notes
    -----
    .. math:: F_j(\eta) = \frac{1}{\Gamma(j+1)}\int_0^\infty\frac{t^j\,dt}{e^{t-\eta}+1}
              = -\mathrm{Li}_{j+1}(-e^{\eta})

    For η > 0 the reflection formulas (from the polylogarithm inversion
    formula, DLMF 25.12)
    :math:`F_0(\eta) = \eta + F_0(-\eta)`,
    :math:`F_1(\eta) = \eta^2/2 + \pi^2/6 - F_1(-\eta)`,
    :math:`F_2(\eta) = \eta^3/6 + \pi^2\eta/6 + F_2(-\eta)` bring the argument to
    η ≤ 0, where :func:`occupation_tails` applies.

    Examples
    --------
    >>> round(float(fermi_dirac_integral(1, 30.0)), 9)     # η²/2 + π²/6 (Sommerfeld)
    451.644934067
    """
    if order not in (0, 1, 2):
        raise ValueError(f"order must be 0, 1 or 2, not {order!r}")
    eta = np.asarray(eta, dtype=float)
    tails = occupation_tails(np.abs(eta))
    base = tails[order + 1]
    above = eta > 0
    if order == 0:
        extra = np.where(above, eta, 0.0)
        return extra + base
    if order == 1:
        return np.where(above, eta ** 2 / 2 + math.pi ** 2 / 6 - base, base)
    return np.where(above, eta ** 3 / 6 + math.pi ** 2 * eta / 6 + base, base)
