"""Planck occupation and mean energy of single modes, for an occupation explorer.

References
----------
.. [1] M. Planck, "Ueber das Gesetz der Energieverteilung im Normalspectrum",
   Ann. Phys. 309, 553-563 (1901).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..kernels.planck import occupation, reduced_frequency, thermal_energy_kernel

#: k_B in meV/K and h in meV/THz (CODATA via scipy.constants).
_KB_MEV = sc.k / sc.electron_volt * 1e3
_H_MEV_PER_THZ = sc.h * 1e12 / sc.electron_volt * 1e3


def occupation_explorer(frequency_thz, temperatures):
    r"""Occupation n(ν, T) and mean energy per mode on the grid ν × T.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Mode frequencies [THz], >= 0.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict
        ``frequency_thz`` (N,) [THz], ``temperature_K`` (M,) [K],
        ``occupation`` (N, M) [1] (``inf`` at ν = 0, 0 at T = 0),
        ``mean_energy_meV`` (N, M): :math:`h\nu(n+\tfrac12)` [meV],
        ``zero_point_meV`` (N,): :math:`h\nu/2` [meV],
        ``classical_energy_meV`` (M,): :math:`k_BT` [meV].

    Notes
    -----
    .. math:: n = \frac{1}{e^{x}-1},\qquad
              \langle\varepsilon\rangle = h\nu\left(n + \tfrac12\right)
              = \frac{h\nu}{2} + k_BT\,\frac{x}{e^x-1},\qquad x = \frac{h\nu}{k_BT}.

    :math:`\langle\varepsilon\rangle \to k_BT` for :math:`x \ll 1`
    (equipartition) and :math:`\to h\nu/2` for :math:`x \gg 1` (frozen mode).

    References
    ----------
    .. [1] M. Planck, Ann. Phys. 309, 553-563 (1901).

    Examples
    --------
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> r = occupation_explorer([1.0], [H_OVER_K_THZ / np.log(2.0)])
    >>> round(float(r["occupation"][0, 0]), 12)     # x = ln 2: n = 1
    1.0
    """
    nu = np.atleast_1d(np.asarray(frequency_thz, dtype=float))
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    x = reduced_frequency(nu, t)
    thermal = _KB_MEV * t[None, :] * thermal_energy_kernel(x)
    zero_point = 0.5 * _H_MEV_PER_THZ * nu
    return {"frequency_thz": nu, "temperature_K": t, "occupation": occupation(x),
            "mean_energy_meV": zero_point[:, None] + thermal, "zero_point_meV": zero_point,
            "classical_energy_meV": _KB_MEV * t}
