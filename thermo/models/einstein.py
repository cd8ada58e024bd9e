"""Einstein model: every mode at one frequency ν_E = k_B θ_E / h.

References
----------
.. [1] A. Einstein, "Die Plancksche Theorie der Strahlung und die Theorie der
   spezifischen Wärme", Ann. Phys. 327, 180-190 (1907).
.. [2] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..kernels.planck import H_OVER_K_THZ, heat_capacity_kernel, log_partition_kernel, thermal_energy_kernel
from .tabulation import check_theta, model_table, sums_on_hot


def einstein_sums(theta_k, modes, temperatures):
    r"""Mode-weighted kernel sums of an Einstein solid.

    Parameters
    ----------
    theta_k : float
        Einstein temperature θ_E [K].
    modes : float
        Number of modes per formula unit (3n for the whole crystal) [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict
        Same keys as :func:`thermo.kernels.sums.thermal_sums`: arrays (M,) [1]
        and ``zero_point_thz`` [THz].

    Notes
    -----
    With :math:`x_E = \theta_E/T`, each sum is
    :math:`\Sigma_K = m\,K(x_E)`; :math:`\Sigma(\text{modes}\,\nu/2) = m\nu_E/2`.

    References
    ----------
    .. [1] A. Einstein, Ann. Phys. 327, 180 (1907).

    Examples
    --------
    >>> s = einstein_sums(300.0, 3, [300.0])
    >>> round(float(s["heat_capacity"][0]) / 3, 10)     # c(1) = e/(e-1)^2
    0.9206735942
    """
    theta = check_theta(theta_k, "the Einstein temperature")

    def evaluate(t):
        x = theta / t
        return {"heat_capacity": modes * heat_capacity_kernel(x),
                "thermal_energy": modes * thermal_energy_kernel(x),
                "log_partition": modes * log_partition_kernel(x)}

    out = sums_on_hot(evaluate, temperatures)
    out["zero_point_thz"] = modes * theta / H_OVER_K_THZ / 2.0
    return out


def einstein_table(theta_k, modes, temperatures, per="formula", atoms=None, formula=None):
    r"""C_v, S, U (with ZPE), F of an Einstein solid, columns as ``tabulate``.

    Parameters
    ----------
    theta_k : float
        Einstein temperature θ_E [K].
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
        Columns of :data:`thermo.tables.COLUMNS`; ``attrs['zero_point_energy_J_per_mol']``.

    Notes
    -----
    With :math:`x = \theta_E/T` and :math:`m` modes:

    .. math::
        C_v = mR\frac{x^2e^x}{(e^x-1)^2},\quad
        S = mR\left[\frac{x}{e^x-1} - \ln(1-e^{-x})\right],

        U = E_0 + mR\frac{\theta_E}{e^x-1},\quad
        F = E_0 + mRT\ln(1-e^{-x}),\quad E_0 = mR\theta_E/2.

    Low-T limit: :math:`C_v \to mR\,x^2e^{-x}` (exponential, not
    :math:`T^3`); at :math:`T=\theta_E`, :math:`C_v = mR\,e/(e-1)^2`.

    References
    ----------
    .. [1] A. Einstein, Ann. Phys. 327, 180-190 (1907).
    .. [2] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> df = einstein_table(200.0, 3, [0.0, 200.0])
    >>> round(float(df.heat_capacity_v_J_per_mol_K[1]) / (3 * 8.314462618), 4)
    0.9207
    >>> round(df.attrs["zero_point_energy_J_per_mol"] / (1.5 * 8.314462618 * 200.0), 9)
    1.0
    """
    return model_table(einstein_sums(theta_k, modes, temperatures), temperatures, per, atoms, formula, modes)


def einstein_heat_capacity(temperatures, theta_k, modes):
    r"""Einstein C_v per mole of formula units [J/(mol K)].

    Parameters
    ----------
    temperatures : array_like
        Temperatures [K], >= 0.
    theta_k : float
        θ_E [K].
    modes : float
        Modes per formula unit [1].

    Returns
    -------
    numpy.ndarray
        :math:`C_v = mR\,x^2e^x/(e^x-1)^2`, :math:`x=\theta_E/T` [J/(mol K)].

    References
    ----------
    .. [1] A. Einstein, Ann. Phys. 327, 180 (1907).

    Examples
    --------
    >>> round(float(einstein_heat_capacity([1e9], 100.0, 3)[0]) / (3 * 8.314462618), 9)
    1.0
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    return sc.R * einstein_sums(theta_k, modes, t)["heat_capacity"]
