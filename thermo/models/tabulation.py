"""Shared plumbing of the model modules: kernel sums to tables.

The models (Einstein, Debye, composite) produce the same dictionary of
mode-weighted kernel sums as :func:`thermo.kernels.sums.thermal_sums`; this
module turns such a dictionary into a table with exactly the columns of
:func:`thermo.tables.tabulate`, so model and DOS tables can be overlaid.
"""

from __future__ import annotations

import numpy as np

from ..kernels.direct import SUM_KEYS
from ..tables import table_from_sums

def sums_on_hot(evaluate, temperatures):
    r"""Evaluate kernel sums for T > 0 only; exact zeros at T = 0.

    Parameters
    ----------
    evaluate : callable
        ``evaluate(t_hot) -> dict`` of arrays keyed by
        :data:`thermo.kernels.direct.SUM_KEYS`, for temperatures > 0 [K].
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        The sums, plus ``entropy`` = thermal_energy + log_partition [1].

    Notes
    -----
    Every thermal kernel vanishes as :math:`T \to 0` (:math:`x\to\infty`).

    Examples
    --------
    >>> s = sums_on_hot(lambda t: {k: t for k in SUM_KEYS}, [0.0, 2.0])
    >>> s["entropy"].tolist()
    [0.0, 4.0]
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    hot = t > 0
    out = {key: np.zeros_like(t) for key in SUM_KEYS}
    if hot.any():
        part = evaluate(t[hot])
        for key in SUM_KEYS:
            out[key][hot] = part[key]
    out["entropy"] = out["thermal_energy"] + out["log_partition"]
    return out


def model_table(sums, temperatures, per="formula", atoms=None, formula=None, modes=None):
    r"""Table of C_v, S, U, F from kernel sums, columns as :func:`~thermo.tables.tabulate`.

    Parameters
    ----------
    sums : dict
        ``heat_capacity``, ``thermal_energy``, ``log_partition``, ``entropy``
        arrays (M,) [1] and ``zero_point_thz`` (Σ modes·ν/2) [THz].
    temperatures : array_like, shape (M,)
        Temperatures [K] the sums were evaluated at.
    per : {'formula', 'atom', 'gram'}
        Basis, as in :func:`thermo.tables.tabulate`.
    atoms : int, optional
        Atoms per formula unit (for ``per='atom'``/``'gram'``); taken as
        ``modes / 3`` when None.
    formula : str, optional
        Chemical formula (for ``per='gram'``).
    modes : float, optional
        Modes per formula unit of the model (3n), to infer ``atoms``.

    Returns
    -------
    pandas.DataFrame
        Columns :data:`thermo.tables.COLUMNS` ``[per]``; ``attrs`` holds
        ``per`` and ``zero_point_energy_J_per_mol``.

    Notes
    -----
    :math:`C_v = R\Sigma_c`, :math:`S = R\Sigma_s`,
    :math:`U = E_0 + RT\Sigma_u`, :math:`F = E_0 - RT\Sigma_\ell`,
    :math:`E_0 = N_A h \Sigma(\text{modes}\,\nu/2)`.

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, New York,
       1972), §4.

    Examples
    --------
    >>> s = {"heat_capacity": np.array([3.0]), "thermal_energy": np.array([3.0]),
    ...      "log_partition": np.array([0.0]), "entropy": np.array([3.0]), "zero_point_thz": 0.0}
    >>> round(float(model_table(s, [100.0]).heat_capacity_v_J_per_mol_K[0]), 6)
    24.943388
    """
    from ..errors import OptionError
    if atoms is None and modes is not None:
        atoms = modes / 3.0
    if per != "formula" and atoms is None:
        raise OptionError(f"basis {per!r} needs the atoms per formula unit")
    return table_from_sums(sums, temperatures, per, atoms, formula)


def check_theta(theta_k, name="theta"):
    """A characteristic temperature as a positive finite float [K].

    Examples
    --------
    >>> check_theta(300)
    300.0
    """
    from ..errors import OptionError
    try:
        value = float(theta_k)
    except (TypeError, ValueError):
        raise OptionError(f"{name} must be a number in kelvin") from None
    if not np.isfinite(value) or value <= 0:
        raise OptionError(f"{name} must be a positive finite temperature in kelvin, got {theta_k!r}")
    return value
