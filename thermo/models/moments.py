r"""Frequency moments of a DOS and the characteristic temperatures built on them.

Moments are averages over the normalised DOS,
:math:`\langle f\rangle = \int g f\,d\nu / \int g\,d\nu`, evaluated with
:func:`thermo.kernels.quadrature.mode_quadrature` (Gauss nodes on the analytic
:math:`A\nu^2` part, trapezoid on the table), so :math:`\langle\nu^{-2}\rangle`
is finite whenever the low-frequency ν² form is in place.

References
----------
.. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, "On the heat capacity of
   crystalline magnesium oxide", Proc. R. Soc. Lond. A 242, 478-492 (1957).
.. [2] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
"""

from __future__ import annotations

import numpy as np

from ..errors import OptionError
from ..kernels.quadrature import mode_quadrature
from ..kernels.planck import H_OVER_K_THZ


#: A node at ν = 0 carrying less than this share of the modes counts as empty
#: (e.g. the far tail of a Gaussian-smeared peak).
ZERO_NODE_SHARE = 1e-10


def _positive_nodes(dos):
    nodes, weights = mode_quadrature(dos)
    keep = (weights > 0) & ((nodes > 0) | (weights > ZERO_NODE_SHARE * weights.sum()))
    if not keep.any():
        raise OptionError("the DOS carries no modes")
    return nodes[keep], weights[keep]


def frequency_moment(dos, n):
    r"""Normalised frequency moment :math:`\langle\nu^n\rangle` [THzⁿ].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    n : float
        Order, n > −3 and n ≠ 0 (use :func:`log_frequency_moment` for 0).

    Returns
    -------
    float
        :math:`\langle\nu^n\rangle = \int g\nu^n d\nu/\int g\,d\nu` [THzⁿ];
        ``inf`` for n < 0 when modes sit at ν = 0 (a node at ν = 0 with
        less than :data:`ZERO_NODE_SHARE` of the modes counts as empty).

    Notes
    -----
    A Debye spectrum :math:`g\propto\nu^2` on :math:`[0,\nu_D]` has
    :math:`\langle\nu^n\rangle = 3\nu_D^n/(n+3)`.

    References
    ----------
    .. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> round(frequency_moment(d, 2), 12)   # 3/5 * 2^2
    2.4
    """
    if n == 0 or n <= -3:
        raise OptionError(f"moment order {n} must be > -3 and not 0")
    nodes, weights = _positive_nodes(dos)
    if n < 0 and np.any(nodes == 0):
        return float("inf")
    return float(np.sum(weights * nodes ** float(n)) / np.sum(weights))


def log_frequency_moment(dos):
    r"""Logarithmic moment :math:`\langle\ln(\nu/\mathrm{THz})\rangle` [1].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    float
        :math:`\int g\ln\nu\,d\nu/\int g\,d\nu`, ν in THz [1].

    Notes
    -----
    Debye spectrum: :math:`\langle\ln\nu\rangle = \ln\nu_D - 1/3`.
    A node at ν = 0 (a DOS that does not vanish there, e.g. smeared, with
    the ν² treatment off) stands for its half interval :math:`[0, \nu_1/2]`
    and carries the mean of ln ν over it, :math:`\ln(\nu_1/2) - 1` — the
    integral converges although ln ν does not.

    References
    ----------
    .. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> bool(abs(log_frequency_moment(d) - (np.log(2.0) - 1 / 3)) < 1e-9)
    True
    >>> from thermo.spectrum import PhononDOS
    >>> flat = PhononDOS(np.linspace(0.0, 1.0, 2001), np.full(2001, 3.0), atoms=1)
    >>> round(log_frequency_moment(flat), 4)     # ∫_0^1 ln ν dν = -1
    -1.0
    """
    nodes, weights = _positive_nodes(dos)
    logs = np.log(np.where(nodes > 0, nodes, 1.0))
    if np.any(nodes == 0):
        grid = np.asarray(dos.frequency_thz, float)
        logs[nodes == 0] = np.log(0.5 * grid[grid > 0].min()) - 1.0
    return float(np.sum(weights * logs) / np.sum(weights))


def debye_moment_temperature(dos, n):
    r"""Moment Debye temperature θ_D(n) [K].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    n : float
        Order, n > −3 (0 allowed: the logarithmic definition).

    Returns
    -------
    float
        θ_D(n) [K]; ``nan`` for n < 0 when modes sit at ν = 0 (the DOS
        does not vanish there and :math:`\langle\nu^n\rangle` diverges).

    Notes
    -----
    .. math::
        \theta_D(n) = \frac{h}{k_B}\left[\frac{n+3}{3}\langle\nu^n\rangle\right]^{1/n},
        \qquad
        \theta_D(0) = \frac{h}{k_B}\exp\left(\tfrac13 + \langle\ln\nu\rangle\right).

    Each equals θ_D for a Debye spectrum.  θ_D(−3) is the elastic limit,
    θ_D(2) governs the leading high-T correction of C_v,
    θ_D(0) the high-T entropy, θ_D(1) the zero-point energy, θ_D(−2) the
    leading correction to the mean-square displacement at high T.  For a
    real spectrum θ_D(n) rises with n where optical modes dominate.

    References
    ----------
    .. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957).
    .. [2] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> [round(debye_moment_temperature(d, k) / (2 * H_OVER_K_THZ), 10) for k in (-2, -1, 0, 1, 2)]
    [1.0, 1.0, 1.0, 1.0, 1.0]
    """
    if n == 0:
        return float(H_OVER_K_THZ * np.exp(1.0 / 3.0 + log_frequency_moment(dos)))
    moment = frequency_moment(dos, n)
    if not np.isfinite(moment):
        return float("nan")
    return float(H_OVER_K_THZ * ((n + 3.0) / 3.0 * moment) ** (1.0 / n))


def einstein_entropy_temperature(dos):
    r"""Einstein temperature with the DOS's high-T entropy [K].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    float
        :math:`\theta_E = (h/k_B)\exp\langle\ln\nu\rangle` [K].

    Notes
    -----
    At high T, :math:`S \to 3nR[1 + \ln(k_BT/h) - \langle\ln\nu\rangle]`;
    an Einstein solid has the same limit when
    :math:`\ln\nu_E = \langle\ln\nu\rangle`.  Equals
    :math:`e^{-1/3}\theta_D(0)`.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(4.9, 5.1, 201)
    >>> g = 3 * np.exp(-0.5 * ((nu - 5) / 0.01) ** 2) / (0.01 * np.sqrt(2 * np.pi))
    >>> d = PhononDOS(nu, g, atoms=1)     # 3 modes in a narrow peak at 5 THz
    >>> round(einstein_entropy_temperature(d) / (5 * H_OVER_K_THZ), 4)
    1.0
    """
    return float(H_OVER_K_THZ * np.exp(log_frequency_moment(dos)))


def einstein_mean_temperature(dos):
    r"""Einstein temperature of the mean frequency (same zero-point energy) [K].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    float
        :math:`\theta_E = (h/k_B)\langle\nu\rangle` [K].

    Notes
    -----
    The Einstein solid with this θ_E has the DOS's zero-point energy
    :math:`\tfrac12 h\int g\nu\,d\nu`, and its high-T energy
    :math:`U - 3nRT` agrees with the DOS to first order in 1/T.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 1.0, 1001)
    >>> d = PhononDOS(nu, 6.0 * nu, atoms=1)
    >>> round(einstein_mean_temperature(d) / H_OVER_K_THZ, 6)   # <ν> = 2/3 THz
    0.666667
    """
    return float(H_OVER_K_THZ * frequency_moment(dos, 1))
