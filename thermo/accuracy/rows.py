"""Per-row error estimate of a harmonic table, as one absolute number per quantity and temperature.

The one entry point other capabilities use (the quasi-harmonic step carries
these errors from every volume into V, α, B_T, C_p, G).  Today it adds the
two parts of :func:`thermo.accuracy.breakdown.error_breakdown`; when the
harmonic estimate changes, only this function is re-pointed.
"""

from __future__ import annotations

import numpy as np

from .breakdown import QUANTITIES, error_column
from .reuse import table_breakdown

#: Factor from the breakdown's column units to SI (kJ/mol -> J/mol for the energies).
_TO_SI = {"heat_capacity_v": 1.0, "entropy": 1.0, "internal_energy": 1e3, "helmholtz_energy": 1e3}


def harmonic_row_errors(dos, temperatures):
    r"""Estimated error of C_v, S, U and F of a harmonic table at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (from :func:`thermo.load_dos`).
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity_v`` and ``entropy`` [J/(mol·K)], ``internal_energy``
        and ``helmholtz_energy`` [J/mol], per mole of formula units; each
        >= 0, an estimate of the largest error (not a standard deviation).

    Notes
    -----
    :math:`\delta Q = \delta_{num} + \delta_{lf}`, the numerical (grid-halving)
    and low-frequency parts of :func:`~thermo.accuracy.breakdown.error_breakdown`.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> e = harmonic_row_errors(PhononDOS(nu, 9 * nu**2 / 125, atoms=1), [300.0])
    >>> sorted(e), bool(e["entropy"][0] < 1e-3)
    (['entropy', 'heat_capacity_v', 'helmholtz_energy', 'internal_energy'], True)
    """
    b = table_breakdown(dos, temperatures)
    return {key: _TO_SI[key] * (b[error_column(key, "numerical")].to_numpy()
                                + b[error_column(key, "low_frequency")].to_numpy()) for key in QUANTITIES}
