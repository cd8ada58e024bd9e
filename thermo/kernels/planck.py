r"""Planck-occupation kernels of one harmonic mode, overflow-safe.

Every thermodynamic function of a harmonic crystal is an integral of the DOS
against a kernel of the reduced frequency :math:`x = h\nu / (k_B T)` only.
The functions here evaluate those kernels for arrays of any shape, with
``expm1``/``log1p`` forms so that neither :math:`x \to 0` nor
:math:`x \to \infty` produces a warning, an overflow or a NaN.

References
----------
.. [1] M. Planck, "Ueber das Gesetz der Energieverteilung im Normalspectrum",
   Ann. Phys. 309, 553-563 (1901).
.. [2] A. A. Maradudin, E. W. Montroll, G. H. Weiss, I. P. Ipatova, *Theory
   of Lattice Dynamics in the Harmonic Approximation*, 2nd ed., Solid State
   Physics Suppl. 3 (Academic Press, New York, 1971), ch. 4.
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

#: h/k_B expressed in kelvin per THz: x = H_OVER_K_THZ * ν[THz] / T[K].
H_OVER_K_THZ = sc.h * 1e12 / sc.k

#: Above this reduced frequency every kernel is below 1e-290 and set to 0.
X_MAX = 700.0
_LN2 = float(np.log(2.0))


def reduced_frequency(frequency_thz, temperature_k):
    r"""Reduced frequency :math:`x = h\nu/(k_B T)` on the outer grid ν × T.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Frequencies [THz].
    temperature_k : array_like, shape (M,)
        Temperatures [K]; 0 gives ``inf`` (the kernels handle it).

    Returns
    -------
    numpy.ndarray, shape (N, M)
        Dimensionless :math:`x` [1].

    Notes
    -----
    :math:`x = h\nu / (k_B T)` with CODATA h and k_B.

    References
    ----------
    .. [1] CODATA 2018 via :mod:`scipy.constants`.

    Examples
    --------
    >>> float(reduced_frequency([1.0], [H_OVER_K_THZ])[0, 0])
    1.0
    """
    nu = np.asarray(frequency_thz, dtype=float).reshape(-1, 1)
    t = np.asarray(temperature_k, dtype=float).reshape(1, -1)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = H_OVER_K_THZ * nu / t
    return np.where(nu == 0.0, 0.0, x)


def _clip(x):
    return np.minimum(np.asarray(x, dtype=float), X_MAX)


def occupation(x):
    r"""Bose–Einstein (Planck) occupation number of a mode.

    Parameters
    ----------
    x : array_like
        Reduced frequency :math:`h\nu/(k_B T)` [1], ``x > 0``.

    Returns
    -------
    numpy.ndarray
        :math:`n = 1/(e^x - 1)` [1]; ``inf`` at ``x = 0``.

    Notes
    -----
    .. math:: n(x) = \frac{1}{e^{x} - 1}

    References
    ----------
    .. [1] M. Planck, Ann. Phys. 309, 553 (1901).

    Examples
    --------
    >>> round(float(occupation(np.log(2.0))), 12)
    1.0
    """
    xc = _clip(x)
    with np.errstate(divide="ignore"):
        return 1.0 / np.expm1(xc)


def heat_capacity_kernel(x):
    r"""Heat capacity of one mode in units of k_B (the Einstein function).

    Parameters
    ----------
    x : array_like
        Reduced frequency [1], ``x >= 0``; ``inf`` allowed (gives 0).

    Returns
    -------
    numpy.ndarray
        :math:`c(x)` [1], between 0 and 1.

    Notes
    -----
    .. math:: c(x) = \frac{x^2 e^{x}}{(e^{x}-1)^2}
              = \frac{x^2 e^{-x}}{(1-e^{-x})^2},\qquad c(0) = 1.

    References
    ----------
    .. [1] A. Einstein, "Die Plancksche Theorie der Strahlung und die Theorie
       der spezifischen Wärme", Ann. Phys. 327, 180-190 (1907).

    Examples
    --------
    >>> round(float(heat_capacity_kernel(1.0)), 10)
    0.9206735942
    """
    xc = _clip(x)
    em = np.exp(-xc)
    den = -np.expm1(-xc)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = xc * xc * em / (den * den)
    return np.where(xc < 1e-8, 1.0 - xc * xc / 12.0, out)


def thermal_energy_kernel(x):
    r"""Thermal energy of one mode above its zero point, in units of k_B T.

    Parameters
    ----------
    x : array_like
        Reduced frequency [1], ``x >= 0``.

    Returns
    -------
    numpy.ndarray
        :math:`u(x) = x\,n(x)` [1]; 1 at ``x = 0``.

    Notes
    -----
    .. math:: u(x) = \frac{x}{e^{x}-1}

    The zero-point energy :math:`h\nu/2` is added separately.

    References
    ----------
    .. [1] M. Planck, Ann. Phys. 309, 553 (1901).

    Examples
    --------
    >>> float(thermal_energy_kernel(0.0))
    1.0
    """
    xc = _clip(x)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = xc / np.expm1(xc)
    return np.where(xc < 1e-8, 1.0 - 0.5 * xc, out)


def log_partition_kernel(x):
    r""":math:`-\ln(1-e^{-x})`, the thermal part of :math:`-F/(k_B T)` per mode.

    Parameters
    ----------
    x : array_like
        Reduced frequency [1], ``x > 0``; ``x = 0`` gives ``inf``.

    Returns
    -------
    numpy.ndarray
        :math:`-\ln(1-e^{-x})` [1], positive.

    Notes
    -----
    .. math:: \ell(x) = -\ln\left(1-e^{-x}\right)

    evaluated as :math:`-\ln(-\operatorname{expm1}(-x))` below
    :math:`\ln 2` and :math:`-\operatorname{log1p}(-e^{-x})` above, so that the
    relative error stays at machine precision for every x.

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, New York,
       1972), §4.

    Examples
    --------
    >>> round(float(log_partition_kernel(np.log(2.0))), 12)
    0.69314718056
    """
    xc = _clip(x)
    small = xc < _LN2
    with np.errstate(divide="ignore"):
        # -log(-expm1(-x)) is exact for small x, -log1p(-exp(-x)) for large x.
        return np.where(small, -np.log(-np.expm1(-np.where(small, xc, 1.0))),
                        -np.log1p(-np.exp(-np.where(small, 1.0, xc))))


def entropy_kernel(x):
    r"""Entropy of one mode in units of k_B.

    Parameters
    ----------
    x : array_like
        Reduced frequency [1], ``x > 0``; ``x = 0`` gives ``inf``.

    Returns
    -------
    numpy.ndarray
        :math:`s(x)` [1].

    Notes
    -----
    .. math:: s(x) = \frac{x}{e^{x}-1} - \ln\left(1-e^{-x}\right)

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> round(float(entropy_kernel(1.0)), 10)
    1.0406518523
    """
    return thermal_energy_kernel(x) + log_partition_kernel(x)
