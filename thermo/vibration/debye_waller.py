r"""Mean-square displacement of the Debye model and the Debye–Waller temperature θ_M.

Conventions used throughout :mod:`thermo.vibration`: ⟨u²⟩ is the *total*
mean-square displacement of an atom (the sum over the three Cartesian
directions); the isotropic displacement parameter is
:math:`U_{iso} = \langle u^2\rangle/3` (per direction) and the Debye–Waller
factor :math:`B = 8\pi^2 U_{iso}`.

The low-frequency part :math:`A\nu^2(1+b\nu^2+c\nu^4)` of a DOS and the Debye
model share one closed form, :func:`nu2_displacement_integral`; the fitted
form's taper is added by :func:`analytic_displacement_integral`.

References
----------
.. [1] B. T. M. Willis, A. W. Pryor, *Thermal Vibrations in
   Crystallography* (Cambridge University Press, 1975), ch. 4.
.. [2] P. Debye, "Interferenz von Röntgenstrahlen und Wärmebewegung",
   Ann. Phys. 348, 49-92 (1913).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc
from scipy import special

from ..errors import OptionError
from ..kernels.nu2 import bose_integral
from ..kernels.planck import H_OVER_K_THZ, occupation, reduced_frequency

#: Below this X the series of I(X) is used (no cancellation), above it the dilogarithm form.
_SERIES_SPLIT = 0.5
_B = special.bernoulli(30)
_SERIES = _B / (special.factorial(np.arange(31)) * (np.arange(31) + 1.0))


def bose_first_moment(upper):
    r""":math:`I(X) = \int_0^X y/(e^y-1)\,dy` [1], to rounding.

    Parameters
    ----------
    upper : array_like
        Upper limit :math:`X` [1], >= 0 (``inf`` allowed).

    Returns
    -------
    numpy.ndarray
        :math:`I(X)` [1]; :math:`\pi^2/6` as :math:`X\to\infty`.

    Notes
    -----
    .. math:: I(X) = \frac{\pi^2}{6} + X\ln(1-e^{-X}) - \mathrm{Li}_2(e^{-X})

    and, for :math:`X < 0.5`, :math:`I = \sum_n B_n X^{n+1}/(n!\,(n+1))`.
    The Debye function of Willis and Pryor is :math:`\varphi(X) = I(X)/X`.

    References
    ----------
    .. [1] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
       (NBS, 1964), 27.1.1 and 27.7.1 (dilogarithm).

    Examples
    --------
    >>> round(float(bose_first_moment(np.inf)) / (np.pi ** 2 / 6), 15)
    1.0
    """
    x = np.asarray(upper, dtype=float)
    out = np.full(x.shape, np.pi ** 2 / 6.0)
    small = x < _SERIES_SPLIT
    xs = x[small]
    out[small] = np.polynomial.polynomial.polyval(xs, _SERIES) * xs
    mid = ~small & np.isfinite(x)
    xm = x[mid]
    q = -np.expm1(-xm)                      # 1 - e^{-X}
    out[mid] = np.pi ** 2 / 6.0 + xm * np.log(q) - special.spence(q)
    return out


def nu2_displacement_integral(coefficient, cutoff_thz, temperatures, curvature=0.0, quartic=0.0):
    r""":math:`\int_0^{\nu_c} A\nu^2(1+b\nu^2+c\nu^4)\,\coth(h\nu/2k_BT)/\nu\,d\nu` in closed form.

    Parameters
    ----------
    coefficient : float
        :math:`A` [modes / THz³].
    cutoff_thz : float
        :math:`\nu_c` [THz].
    temperatures : array_like
        Temperatures [K], >= 0.
    curvature, quartic : float
        :math:`b` [1/THz²] and :math:`c` [1/THz⁴] of the fitted form.

    Returns
    -------
    numpy.ndarray
        The integral [modes / THz].

    Notes
    -----
    With :math:`\coth(x/2) = 1 + 2/(e^x-1)`, :math:`\tau = k_BT/h` and
    :math:`X = \nu_c/\tau`, each power :math:`\nu^{m}` of the integrand
    (m = 1, 3, 5) gives

    .. math:: \int_0^{\nu_c}\nu^m\coth\frac{h\nu}{2k_BT}\,d\nu
              = \frac{\nu_c^{m+1}}{m+1} + 2\tau^{m+1} J_m(X),
              \qquad J_m(X) = \int_0^X \frac{y^m}{e^y-1}\,dy,

    with :math:`J_1 = I` from :func:`bose_first_moment` and :math:`J_3, J_5`
    from :func:`thermo.kernels.nu2.bose_integral` (Bose moments, to rounding).
    For m = 1 this is Willis and Pryor's :math:`A[\nu_c^2/2 + 2\tau^2 I(X)]`.

    References
    ----------
    Willis and Pryor (1975), eq. 4.64.

    Examples
    --------
    >>> float(nu2_displacement_integral(3.0, 2.0, [0.0])[0])   # A νc²/2 at T = 0
    6.0
    >>> float(nu2_displacement_integral(3.0, 2.0, [0.0], curvature=0.5)[0])   # + A b νc⁴/4
    12.0
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    kt_h = t / H_OVER_K_THZ                 # k_B T / h [THz]
    with np.errstate(divide="ignore"):
        x = np.where(t > 0, cutoff_thz / np.where(t > 0, kt_h, 1.0), np.inf)
    out = 0.5 * cutoff_thz ** 2 + 2.0 * kt_h ** 2 * bose_first_moment(x)
    for power, factor in ((3, curvature), (5, quartic)):
        if factor != 0.0:
            out = out + factor * (cutoff_thz ** (power + 1) / (power + 1)
                                  + 2.0 * kt_h ** (power + 1) * bose_integral(power, x))
    return coefficient * out


def analytic_displacement_integral(fit, temperatures):
    r""":math:`\int W M \coth(h\nu/2k_BT)/\nu\,d\nu` of the whole analytic low-frequency part.

    Parameters
    ----------
    fit : LowFrequencyFit
        The fitted form :math:`M = A\nu^2(1+b\nu^2+c\nu^4)`, its cut-off
        and its taper :math:`W` (1 below the cut-off).
    temperatures : array_like
        Temperatures [K], >= 0.

    Returns
    -------
    numpy.ndarray
        The integral [modes / THz].

    Notes
    -----
    The same split as the thermodynamic sums
    (:func:`thermo.kernels.nu2.analytic_part_sums`): :math:`[0, \nu_c]` in
    closed form (:func:`nu2_displacement_integral`), the tapered zone
    :math:`[\nu_c, \nu_m]` on the 48 Gauss–Legendre nodes of
    :meth:`~thermo.spectrum.LowFrequencyFit.taper_nodes` (smooth integrand).

    References
    ----------
    Willis and Pryor (1975), eq. 4.64; Abramowitz and Stegun (1964), 25.4.29.

    Examples
    --------
    >>> from thermo.spectrum import LowFrequencyFit
    >>> f = LowFrequencyFit(9.0, 1.0, (1.0, 4.0), blend_top_thz=2.0)
    >>> round(float(analytic_displacement_integral(f, [0.0])[0]), 10)   # 9/2 + ∫_1^2 9ν W dν = 4.5 + 9·0.65
    10.35
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    out = nu2_displacement_integral(fit.coefficient, fit.cutoff_thz, t, fit.curvature, fit.quartic)
    nodes, modes = fit.taper_nodes()
    if nodes.size:
        with np.errstate(divide="ignore"):
            coth = 1.0 + 2.0 * occupation(reduced_frequency(nodes, t))
        out = out + (modes / nodes) @ coth
    return out


def _check_positive(value, what):
    v = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(v)) or np.any(v <= 0):
        raise OptionError(f"{what} must be finite and > 0")
    return v


def debye_mean_square_displacement(temperatures, theta_k, mass_amu):
    r"""Total ⟨u²⟩ of an atom in a Debye crystal [Å²].

    Parameters
    ----------
    temperatures : array_like
        Temperatures [K], >= 0.
    theta_k : array_like
        Debye temperature θ [K] (broadcasts with ``temperatures``).
    mass_amu : float
        Atomic mass [u].

    Returns
    -------
    numpy.ndarray
        :math:`\langle u^2\rangle` [Å²], the sum over three directions.

    Notes
    -----
    Three modes per atom with :math:`g(\nu) = 9\nu^2/\nu_D^3`:

    .. math:: \langle u^2\rangle = \frac{9\hbar^2 T}{m k_B \theta^2}
              \left[\varphi(\theta/T) + \frac{\theta}{4T}\right],
              \qquad \langle u^2\rangle_{T=0} = \frac{9\hbar^2}{4 m k_B\theta}

    (Willis and Pryor's per-direction :math:`U` is one third of this).

    References
    ----------
    Willis and Pryor (1975), eqs. 4.64-4.66.

    Examples
    --------
    >>> u0 = debye_mean_square_displacement(0.0, 300.0, 50.0)
    >>> from scipy import constants as sc
    >>> ref = 9 * sc.hbar**2 / (4 * 50 * sc.atomic_mass * sc.k * 300.0) * 1e20
    >>> round(float(u0) / ref, 12)
    1.0
    """
    t = np.asarray(temperatures, dtype=float)
    theta = _check_positive(theta_k, "the Debye temperature")
    m = float(_check_positive(mass_amu, "the atomic mass")) * sc.atomic_mass
    t, theta = np.broadcast_arrays(t, theta)
    return _debye_msd_many(t, theta, m)


def _amplitude(integral_per_thz, mass_kg):
    """⟨u²⟩ [Å²] from ∫ g coth(x/2)/ν dν [modes/THz] of one atom."""
    return sc.hbar / (2.0 * mass_kg) * integral_per_thz / (2.0 * np.pi * 1e12) * 1e20


def debye_waller_temperature(msd_a2, temperatures, mass_amu):
    r"""θ_M: the Debye θ that gives the mean-square displacement ⟨u²⟩ at T [K].

    Parameters
    ----------
    msd_a2 : array_like
        Total ⟨u²⟩ [Å²], > 0.
    temperatures : array_like
        Temperatures [K], >= 0 (broadcasts with ``msd_a2``).
    mass_amu : float
        Atomic mass [u].

    Returns
    -------
    numpy.ndarray
        :math:`\theta_M` [K] solving
        ``debye_mean_square_displacement(T, θ_M, m) = ⟨u²⟩``.

    Notes
    -----
    The Debye ⟨u²⟩ falls strictly with θ, so the root is unique; it is found
    by bisection in :math:`\ln\theta` over :math:`[10^{-3}, 10^{6}]` K to
    relative precision :math:`10^{-12}`.

    References
    ----------
    Willis and Pryor (1975), §4.6 (the "X-ray" Debye temperature).

    Examples
    --------
    >>> u = debye_mean_square_displacement([0.0, 300.0], 250.0, 40.0)
    >>> np.round(debye_waller_temperature(u, [0.0, 300.0], 40.0), 6).tolist()
    [250.0, 250.0]
    """
    u = _check_positive(msd_a2, "⟨u²⟩")
    t = np.asarray(temperatures, dtype=float)
    u, t = np.broadcast_arrays(u, t)
    lo = np.full(u.shape, np.log(1e-3))
    hi = np.full(u.shape, np.log(1e6))
    m = float(_check_positive(mass_amu, "the atomic mass")) * sc.atomic_mass
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        too_soft = _debye_msd_many(t, np.exp(mid), m) > u   # θ too low
        lo = np.where(too_soft, mid, lo)
        hi = np.where(too_soft, hi, mid)
    return np.exp(0.5 * (lo + hi))


def _debye_msd_many(t, theta, mass_kg):
    """Vectorised Debye ⟨u²⟩ [Å²] on arrays of T and θ of one shape."""
    nu_d = theta / H_OVER_K_THZ
    kt_h = t / H_OVER_K_THZ
    with np.errstate(divide="ignore"):
        x = np.where(t > 0, nu_d / np.where(t > 0, kt_h, 1.0), np.inf)
    return _amplitude(9.0 / nu_d ** 3 * (0.5 * nu_d ** 2 + 2.0 * kt_h ** 2 * bose_first_moment(x)), mass_kg)
