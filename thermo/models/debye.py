r"""Debye model: :math:`g(\nu) = 3m\nu^2/\nu_D^3` up to ν_D = k_B θ_D / h.

The Debye spectrum is exactly the analytic ν² form the core already integrates
(:func:`thermo.kernels.nu2.nu2_part_sums`), so the model reuses it.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [2] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
   (NBS, Washington, 1964), 27.1 (Debye functions).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..kernels.nu2 import nu2_part_sums
from ..kernels.planck import H_OVER_K_THZ
from ..spectrum import LowFrequencyFit, PhononDOS
from .tabulation import check_theta, model_table, sums_on_hot


def debye_coefficient(theta_k, modes):
    r"""Coefficient A of the Debye spectrum :math:`g = A\nu^2` [modes/THz³].

    Parameters
    ----------
    theta_k : float
        θ_D [K].
    modes : float
        Modes carried by the spectrum (3n, or 3 for acoustic branches) [1].

    Returns
    -------
    float
        :math:`A = 3m/\nu_D^3` with :math:`\nu_D = \theta_D k_B/h` [1/THz³].

    Notes
    -----
    :math:`\int_0^{\nu_D} A\nu^2 d\nu = m`; for :math:`m = 3n`,
    :math:`A = 9n/\nu_D^3`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> round(debye_coefficient(H_OVER_K_THZ, 3), 12)
    9.0
    """
    nu_d = check_theta(theta_k, "the Debye temperature") / H_OVER_K_THZ
    return 3.0 * modes / nu_d ** 3


def debye_sums(theta_k, modes, temperatures):
    r"""Mode-weighted kernel sums of a Debye spectrum carrying ``modes`` modes.

    Parameters
    ----------
    theta_k : float
        θ_D [K].
    modes : float
        Modes per formula unit [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict
        As :func:`thermo.kernels.sums.thermal_sums` [1]; ``zero_point_thz`` [THz].

    Notes
    -----
    :math:`\Sigma_K = 3m\,(T/\theta_D)^3\int_0^{\theta_D/T} x^2K(x)\,dx`;
    zero point :math:`\int A\nu^2\,\nu/2 = 3m\nu_D/8`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> s = debye_sums(100.0, 3, [1e7])
    >>> round(float(s["heat_capacity"][0]), 9)
    3.0
    """
    theta = check_theta(theta_k, "the Debye temperature")
    nu_d = theta / H_OVER_K_THZ
    coefficient = debye_coefficient(theta, modes)
    out = sums_on_hot(lambda t: nu2_part_sums(coefficient, nu_d, t), temperatures)
    out["zero_point_thz"] = 3.0 * modes * nu_d / 8.0
    return out


def debye_table(theta_k, modes, temperatures, per="formula", atoms=None, formula=None):
    r"""C_v, S, U (with ZPE), F of a Debye solid, columns as ``tabulate``.

    Parameters
    ----------
    theta_k : float
        θ_D [K].
    modes : float
        Modes per formula unit (3n) [1].
    temperatures : array_like
        Temperatures [K], >= 0.
    per, atoms, formula
        Basis, as in :func:`thermo.tables.tabulate`; ``atoms`` defaults to
        ``modes / 3``.

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`thermo.tables.COLUMNS`.

    Notes
    -----
    With :math:`y = \theta_D/T` and :math:`m` modes:

    .. math::
        C_v = 3mR\,y^{-3}\int_0^{y}\frac{x^4e^x}{(e^x-1)^2}dx,\quad
        U = \tfrac{3}{8}mR\theta_D + 3mRT\,y^{-3}\int_0^y\frac{x^3}{e^x-1}dx,

        F = \tfrac{3}{8}mR\theta_D + 3mRT\,y^{-3}\int_0^y x^2\ln(1-e^{-x})dx,
        \quad S = (U-F)/T.

    Low-T limit: :math:`C_v \to \frac{4\pi^4}{5} mR (T/\theta_D)^3`
    (:math:`12\pi^4R/5\,(T/\theta_D)^3` per 3 modes).

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789-839 (1912).
    .. [2] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
       (NBS, 1964), 27.1.

    Examples
    --------
    >>> df = debye_table(400.0, 3, [4.0])
    >>> from math import pi
    >>> round(float(df.heat_capacity_v_J_per_mol_K[0]) / (12 * pi**4 / 5 * 8.314462618 * 1e-6), 9)
    1.0
    """
    return model_table(debye_sums(theta_k, modes, temperatures), temperatures, per, atoms, formula, modes)


def debye_heat_capacity(temperatures, theta_k, modes):
    r"""Debye C_v per mole of formula units [J/(mol K)].

    Parameters
    ----------
    temperatures : array_like
        Temperatures [K], >= 0.
    theta_k : float
        θ_D [K].
    modes : float
        Modes per formula unit [1].

    Returns
    -------
    numpy.ndarray
        :math:`C_v = 3mR\,y^{-3}\int_0^y x^4e^x/(e^x-1)^2dx`, y = θ_D/T [J/(mol K)].

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> round(float(debye_heat_capacity([1e8], 300.0, 3)[0]) / (3 * 8.314462618), 9)
    1.0
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    return sc.R * debye_sums(theta_k, modes, t)["heat_capacity"]


def debye_heat_capacity_fraction(y):
    r"""Debye heat capacity as a fraction of its classical limit, at y = θ_D/T.

    Parameters
    ----------
    y : array_like
        :math:`\theta_D/T` [1], > 0.

    Returns
    -------
    numpy.ndarray
        :math:`D_c(y) = 3y^{-3}\int_0^y x^4e^x/(e^x-1)^2dx` [1], decreasing
        from 1 (y → 0) to :math:`4\pi^4/(5y^3)` (y → ∞).

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).
    .. [2] M. Abramowitz, I. A. Stegun (NBS, 1964), 27.1.

    Examples
    --------
    >>> from math import pi
    >>> round(float(debye_heat_capacity_fraction(100.0)[0]) * 100.0**3 / (4 * pi**4 / 5), 12)
    1.0
    """
    y = np.atleast_1d(np.asarray(y, dtype=float))
    # One mode with ν_D = 1 THz at T = (h/k_B)(1 THz)/y.
    return nu2_part_sums(3.0, 1.0, H_OVER_K_THZ / y)["heat_capacity"]


def debye_spectrum(theta_k, atoms=1):
    r"""The Debye spectrum itself as a :class:`~thermo.spectrum.PhononDOS`.

    Parameters
    ----------
    theta_k : float
        θ_D [K].
    atoms : int
        Atoms per formula unit n; the spectrum carries 3n modes.

    Returns
    -------
    PhononDOS
        :math:`g = 9n\nu^2/\nu_D^3` on :math:`[0,\nu_D]` held as the
        analytic low-frequency part (exact in every core integral), zero
        above; for overlays and tests of the core against the model.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> d = debye_spectrum(300.0, atoms=2)
    >>> round(d.mode_count, 12), round(d.low_frequency_debye_temperature_k(), 9)
    (6.0, 300.0)
    """
    nu_d = check_theta(theta_k, "the Debye temperature") / H_OVER_K_THZ
    fit = LowFrequencyFit(coefficient=debye_coefficient(theta_k, 3 * atoms), cutoff_thz=nu_d,
                          window_thz=(0.0, nu_d))
    return PhononDOS(frequency_thz=np.array([nu_d, 1.5 * nu_d]), dos=np.zeros(2), atoms=int(atoms),
                     low_frequency=fit, source={"name": f"Debye spectrum, θ_D = {theta_k:g} K"})
